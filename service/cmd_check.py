"""``stanchion check INPUT``: check a members JSON file or an IFC model."""

from __future__ import annotations

import argparse
import json
from pathlib import Path

from pydantic import ValidationError

from service.core import check_request
from service.errors import EXIT_FAILURES, EXIT_OK, InputError, validation_message
from service.outputs import write_json
from service.report import format_summary
from service.request import MembersRequest


def load_members_request(path: Path, method: str | None = None) -> MembersRequest:
    """Read and validate a members JSON file (InputError on any problem)."""
    try:
        text = path.read_text(encoding="utf-8")
    except (OSError, UnicodeDecodeError) as exc:
        raise InputError(f"cannot read {path}: {getattr(exc, 'strerror', None) or exc}") from None
    try:
        data = json.loads(text)
    except json.JSONDecodeError as exc:
        raise InputError(
            f"cannot read {path}: not valid JSON (line {exc.lineno}, column {exc.colno}: "
            f"{exc.msg})"
        ) from None
    if isinstance(data, dict) and method:
        data["design_method"] = method
    try:
        return MembersRequest.model_validate(data)
    except ValidationError as exc:
        raise InputError(f"{path}: {validation_message(exc)}") from None


def exit_code(report: dict, allow_not_checked: bool = False) -> int:
    """0 when every member passes (not-checked members allowed on request), else 1."""
    s = report["summary"]
    bad = s["fail"] + (0 if allow_not_checked else s["not_checked"])
    return EXIT_FAILURES if bad else EXIT_OK


def run_check(args: argparse.Namespace) -> int:
    """Run the check verb."""
    path = Path(args.input)
    if path.suffix.lower() == ".ifc":
        from service.model_check import check_model_file

        report = check_model_file(path, args)
    else:
        report = check_request(load_members_request(path, args.method))
    if args.report:
        write_json(Path(args.report), report)
    if not args.quiet:
        print(format_summary(report))
    return exit_code(report, getattr(args, "allow_not_checked", False))


def add_parser(sub: argparse._SubParsersAction) -> None:
    """Register ``check``."""
    c = sub.add_parser("check", help="check the members of a members JSON file or IFC model")
    c.add_argument("input", help="members .json file or .ifc model")
    c.add_argument("--method", type=str.upper, choices=["LRFD", "ASD"],
                   help="design method (overrides the file)")
    c.add_argument("--report", metavar="R.json", help="write the JSON report here")
    c.add_argument("--quiet", action="store_true", help="print nothing but errors")
    c.set_defaults(func=run_check)
