"""``stanchion check INPUT``: check a members JSON file or an IFC model.

Exit codes (docs/design.md §4): 0 every member passes; 1 any member fails or is not checked
(``--allow-not-checked``: not-checked members are warnings; ``--fail-on new-failures``: only
regressions against ``--baseline`` count), and always 1 when no member got a verdict (a
model of concrete columns only, every one skipped, included); skipped members (not steel)
never count, but for one that failed in the baseline under ``--fail-on new-failures``: a
failure never vanishes by relabelling; 2 unusable input (a model with no column included),
one line on stderr, nothing written.
"""

from __future__ import annotations

import argparse
import sys
from pathlib import Path
from typing import Any

from pydantic import ValidationError

from stanchion.service.cli.progress import Progress
from stanchion.service.cli.suggest import family_list
from stanchion.service.errors import EXIT_FAILURES, EXIT_OK, InputError, validation_message
from stanchion.service.pipeline import CheckOptions, OutputPaths, check
from stanchion.service.reports.baseline import DEFAULT_THRESHOLD, regressions
from stanchion.service.reports.terminal import (
    format_run,
    nothing_checked,
    nothing_checked_line,
    warnings,
)
from stanchion.service.requirements import requirements_lines

FAIL_ON = ("any", "new-failures")


def exit_code(report: dict[str, Any], allow_not_checked: bool = False, fail_on: str = "any") -> int:
    """The exit code of a finished check (docs/design.md §4).

    A run in which no member got a verdict (none passed, none failed) is 1 whatever the
    options: nothing checked is never a green run.  Otherwise ``fail_on="any"``: 1 when any
    member fails or is not checked (not-checked members allowed on request), else 0;
    skipped members (not steel) never count.
    ``fail_on="new-failures"``: 1 only for regressions against the baseline
    (``report["changes"]``): new failures, members that failed in the baseline and are
    skipped now (allowed or not), and newly not-checked members unless allowed.
    """
    if nothing_checked(report):
        return EXIT_FAILURES
    if fail_on == "new-failures":
        changes = report.get("changes")
        if changes is None:
            raise InputError("--fail-on new-failures needs --baseline")
        return EXIT_FAILURES if regressions(changes, allow_not_checked) else EXIT_OK
    s = report["summary"]
    bad = s["fail"] + (0 if allow_not_checked else s["not_checked"])
    return EXIT_FAILURES if bad else EXIT_OK


def _check_options(args: argparse.Namespace) -> None:
    """Refuse option values that cannot work, naming the option, before anything is read."""
    if args.fail_on == "new-failures" and not args.baseline:
        raise InputError("--fail-on new-failures needs --baseline")
    if not args.change_threshold >= 0:
        raise InputError("--change-threshold must be zero or positive")
    if args.utilization_limit is not None and not args.utilization_limit > 0:
        raise InputError("--utilization-limit must be greater than zero")
    if args.oversized is not None and not args.oversized > 0:
        raise InputError("--oversized must be greater than zero")


def options_from(args: argparse.Namespace) -> tuple[CheckOptions, OutputPaths]:
    """The pipeline's options and outputs from the command line."""
    _check_options(args)
    try:
        options = CheckOptions(
            method=args.method, units=args.units,
            loads_table=Path(args.loads) if args.loads else None,
            takedown=Path(args.takedown) if args.takedown else None,
            force_unit=args.force_unit, lenient=args.lenient,
            default_grade=args.default_grade,
            include_members=args.include_members, analysis_members=args.analysis_members,
            suggest=args.suggest,
            utilization_limit=args.utilization_limit, oversized=args.oversized,
            families=tuple(args.families) if args.families else None,
            baseline=Path(args.baseline) if args.baseline else None,
            ids=Path(args.ids) if args.ids else None,
            change_threshold=args.change_threshold, allow_not_checked=args.allow_not_checked)
    except ValidationError as exc:  # pragma: no cover - argparse and the checks above refuse first
        raise InputError(validation_message(exc)) from None
    outputs = OutputPaths(model=args.out, report=args.report, csv=args.csv, junit=args.junit,
                          bcf=args.bcf, html=args.html)
    return options, outputs


def run_check(args: argparse.Namespace) -> int:
    """Run the check verb."""
    options, outputs = options_from(args)
    progress = None if args.quiet else Progress(sys.stderr)
    report = check(Path(args.input), options, outputs, progress).report
    code = exit_code(report, args.allow_not_checked, args.fail_on)
    if not args.quiet:
        for line in requirements_lines(report):
            print(line)
        print(format_run(report, fail_on=args.fail_on,
                         allow_not_checked=args.allow_not_checked))
        for line in warnings(report, args.allow_not_checked):
            print(f"stanchion: warning: {line}", file=sys.stderr)
    if nothing_checked(report):  # exit 1 whatever the options (docs/design.md §4)
        print(f"stanchion: {nothing_checked_line(report)}", file=sys.stderr)
    return code


def add_parser(sub: argparse._SubParsersAction) -> None:
    """Register ``check``."""
    c = sub.add_parser(
        "check", help="check the members of a members JSON file or IFC model",
        description="Check the columns of an IFC model (.ifc, .ifczip, .ifcxml) or a members "
        "JSON file. Columns whose material is not steel (concrete, timber, aluminium, "
        "masonry) are skipped, which is not a failure. Exit 0: every member passes; 1: a "
        "member fails or is not checked, or nothing was checked; 2: unusable input (a model "
        "with no column included).")
    c.add_argument("input", help="members .json file or IFC model")
    c.add_argument("--method", type=str.upper, choices=["LRFD", "ASD"],
                   help="design method (overrides the file; default LRFD)")
    out = c.add_argument_group("outputs")
    out.add_argument("--out", metavar="CHECKED.ifc",
                     help="write a copy of the model with a Stanchion_ColumnCheck property "
                     "set on every column (IFC input; the input is never modified)")
    out.add_argument("--report", metavar="R.json", help="write the JSON report here")
    out.add_argument("--csv", metavar="R.csv", help="write one CSV row per member here")
    out.add_argument("--junit", metavar="J.xml",
                     help="write JUnit XML here: one test case per member, a suite per storey")
    out.add_argument("--html", metavar="REPORT.html",
                     help="write a self-contained HTML report here: summary, plans by "
                     "storey, column schedule, a detail with the capacity curve per column")
    out.add_argument("--bcf", metavar="ISSUES.bcf",
                     help="write BCF 3.0 issues here (IFC input): one topic per failing or "
                     "not-checked column, selecting it by its IfcGuid, with a snapshot of "
                     "its place on its storey")
    out.add_argument("--units", choices=["us", "si"],
                     help="report units for IFC input: us = kip/ft/ksi (default), "
                     "si = kN/m/MPa")
    inp = c.add_argument_group("IFC input")
    inp.add_argument("--loads", metavar="LOADS.csv",
                     help="CSV load table: element,D [kN],L [kN],... (element = GlobalId, "
                     "Tag or Name), or a schedule grid,level,D [kN],... ('stanchion "
                     "loads-template' writes one)")
    inp.add_argument("--takedown", metavar="PROJECT.toml",
                     help="load takedown project file: columns without loads get estimated "
                     "service loads from the slabs of the storeys they carry (tributary "
                     "areas, ASCE 7-22 section 4.7 live load reduction)")
    inp.add_argument("--force-unit", metavar="UNIT",
                     help="force unit (kip, kN, N, lbf, MN) of a model that declares none "
                     "and of the load table's columns whose header names none; without it "
                     "they take the model's declared force unit, and a model that declares "
                     "none but carries forces is refused")
    inp.add_argument("--lenient", action="store_true",
                     help="check a damaged model anyway (cut short, lines the parser "
                     "skipped, references to missing instances) with a warning naming the "
                     "columns it touches; refused by default")
    inp.add_argument("--default-grade", metavar="GRADE",
                     help="grade assumed for columns whose material names steel but no "
                     "grade ('Steel', 'Structural Steel'), e.g. A992, S355, '345 MPa'; "
                     "stated in every output; never for columns without a material. "
                     "Without it such columns are not checked")
    inp.add_argument("--ids", metavar="FILE.ids",
                     help="validate the model against this IDS 1.0 document first (e.g. the "
                     "one 'stanchion requirements' prints); what each column misses is "
                     "printed and given in the report; it does not change the exit code")
    inp.add_argument("--include-members", action="store_true",
                     help="also check IfcMember elements")
    inp.add_argument("--analysis-members", action="store_true",
                     help="also check the vertical IfcStructuralCurveMembers tied to no "
                     "column (a model without columns has them checked anyway)")
    gate = c.add_argument_group("pass / fail")
    gate.add_argument("--baseline", metavar="OLD.json",
                      help="compare with a previous report: new failures, fixed, added, "
                      "removed, utilization changes")
    gate.add_argument("--change-threshold", type=float, default=DEFAULT_THRESHOLD,
                      metavar="X", help="report utilization changes larger than X "
                      f"(absolute; default {DEFAULT_THRESHOLD})")
    gate.add_argument("--fail-on", choices=FAIL_ON, default="any",
                      help="any (default): exit 1 on any failing or not-checked member; "
                      "new-failures: exit 1 only on regressions against --baseline (new "
                      "failures, newly not checked, failing before and skipped now)")
    gate.add_argument("--allow-not-checked", action="store_true",
                      help="not-checked members are warnings, not failures (skipped, "
                      "non-steel members never are failures)")
    sug = c.add_argument_group("section suggestions (IFC input)")
    sug.add_argument("--suggest", action="store_true",
                     help="suggest the lightest adequate catalog section for failing columns "
                     "(SuggestedSection in the model, suggestions in the report)")
    sug.add_argument("--utilization-limit", type=float, metavar="U",
                     help="suggestions must pass at this utilization (default 1.0)")
    sug.add_argument("--oversized", type=float, metavar="U",
                     help="also suggest for passing columns below this utilization")
    sug.add_argument("--families", type=family_list,
                     metavar="W10,W12", help="candidate families or designations (default: "
                     "each column's own family)")
    c.add_argument("--quiet", action="store_true",
                   help="print nothing but errors (no progress, summary or warnings)")
    c.set_defaults(func=run_check)
