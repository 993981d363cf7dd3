"""Checking an IFC model end to end: read, check, report, write the checked copy.

:func:`check_model` is the core used by both the command line and the HTTP job worker (no
argparse here); :func:`check_model_file` is the thin glue for ``stanchion check model.ifc``.

The input file is only ever opened for reading.  The checked model is written to a temporary
file in the target folder and renamed into place (:func:`service.outputs.write_atomic`); every
output path is refused when it names the input.  Unusable input -- an unreadable model, a bad
load table, a malformed baseline -- raises :class:`service.errors.InputError` before anything
is written.
"""

from __future__ import annotations

import argparse
import math
import os
from datetime import datetime
from pathlib import Path

import numpy as np

from stanchion.engine.check import check_members
from stanchion.engine.selection import suggestion_family
from stanchion.engine.units import UNIT_SYSTEMS, length_factor
from stanchion.ifc_bridge.model import ModelReadError, open_model
from stanchion.ifc_bridge.write import checked_now, write_results
from stanchion.service.core import suggestions_for
from stanchion.service.errors import InputError
from stanchion.service.load_table import read_load_table
from stanchion.service.progress import Progress, Silent
from stanchion.service.reports.baseline import DEFAULT_THRESHOLD, compare, load_baseline
from stanchion.service.reports.files import write_model_checked, write_outputs
from stanchion.service.reports.report import DISCLAIMER, build_report

#: Member-table columns copied into the report rows when the reader provides them.
EXTRA_FIELDS = ("tag", "ifc_class", "profile_source", "length_source", "load_source",
                "fy_source")
MODEL_SUFFIXES = (".ifc", ".ifczip")


def _same_file(a: Path, b: Path) -> bool:
    try:
        if a.exists() and b.exists():
            return a.samefile(b)
    except OSError:
        pass
    return a.resolve() == b.resolve()


def check_output_paths(source: Path, outputs: dict[str, Path | None]) -> None:
    """Refuse outputs that would overwrite the input or each other (InputError)."""
    given = {k: Path(v) for k, v in outputs.items() if v is not None}
    for option, out in given.items():
        if _same_file(out, source):
            raise InputError(f"{option} {out} is the input file; the input is never "
                             "overwritten, choose another name")
        if out.is_dir():
            raise InputError(f"{option} {out} is a directory")
        folder = out.absolute().parent
        while not folder.exists() and folder != folder.parent:
            folder = folder.parent
        if not folder.is_dir() or not os.access(folder, os.W_OK | os.X_OK):
            raise InputError(f"{option} {out}: cannot write in {folder}")
    names = list(given.items())
    for i, (opt_a, a) in enumerate(names):
        for opt_b, b in names[i + 1:]:
            if _same_file(a, b):
                raise InputError(f"{opt_a} and {opt_b} name the same file {a}")
    model_out = given.get("--out")
    if model_out is not None and model_out.suffix.lower() not in MODEL_SUFFIXES:
        raise InputError(f"--out {model_out}: the checked model must end in .ifc or .ifczip")


def _read(path: Path, include_members: bool, loads_table: Path | None):
    from stanchion.ifc_bridge.read import read_columns

    table = read_load_table(loads_table) if loads_table is not None else None  # InputError
    try:
        model = open_model(path)
        return model, read_columns(model, include_members=include_members, loads_table=table)
    except ModelReadError as exc:
        raise InputError(str(exc)) from None


def _add_extra_fields(report: dict, members, length_unit_factor: float) -> None:
    """Copy reader columns (tag, IFC class, plan position, input sources) into the rows.

    Plan coordinates ``x``, ``y`` come in the model's length unit and are given in the
    report's length unit.
    """
    rows = report["members"]
    for key in EXTRA_FIELDS:
        column = members.extra.get(key)
        if column is not None:
            for row, value in zip(rows, column.tolist(), strict=True):
                row[key] = None if value is None else str(value)
    to_report = length_unit_factor / length_factor(report["units"]["length"])
    for key in ("x", "y"):
        column = members.extra.get(key)
        if column is not None:
            values = np.asarray(column, dtype=float) * to_report
            for row, value in zip(rows, values.tolist(), strict=True):
                row[key] = round(value, 4) if math.isfinite(value) else None


def check_model(
    path: Path,
    *,
    method: str = "LRFD",
    loads_table: Path | None = None,
    include_members: bool = False,
    units: str = "us",
    out_model: Path | None = None,
    out_report: Path | None = None,
    out_csv: Path | None = None,
    out_junit: Path | None = None,
    baseline: Path | dict | None = None,
    change_threshold: float = DEFAULT_THRESHOLD,
    allow_not_checked: bool = False,
    checked_at: datetime | str | None = "now",
    progress: Progress | None = None,
    source_name: str | None = None,
    suggest: bool = False,
    max_utilization: float = 1.0,
    oversized: float | None = None,
    families: list[str] | None = None,
) -> dict:
    """Check every column of an IFC model and write the requested outputs.

    Args:
        path: the model (``.ifc``, ``.ifczip``, ``.ifcxml``); never modified.
        method: "LRFD" or "ASD".
        loads_table: CSV load table (docs/design.md §5; parsed by :mod:`service.load_table`
            before the model is opened), or None.
        include_members: also check IfcMember elements.
        units: report units, "us" (kip / ft / ksi) or "si" (kN / m / MPa).
        out_model: the checked copy of the model (None: not written).
        out_report: the JSON report (None: not written).
        out_csv: the CSV report (None: not written).
        out_junit: the JUnit XML report (None: not written).
        baseline: a previous report (path or dict) to compare with; adds ``changes``.
        change_threshold: utilization change reported against the baseline (absolute).
        allow_not_checked: JUnit lists not-checked members as skipped instead of failed.
        checked_at: CheckedAt written into the model: "now" (default), a time, or None.
        progress: phase reporter (default: silent).
        source_name: the file name shown in the report's ``source`` (default: the path's
            name; the HTTP service passes the uploaded file's name).
        suggest: suggest the lightest adequate section for failing columns (and, with
            ``oversized``, for passing columns below that utilization).
        max_utilization: the reserve margin suggestions must meet.
        oversized: utilization below which a passing column counts as oversized.
        families: candidate families / designations (default: each column's own family).

    Returns:
        The report dict (docs/design.md §3) with ``source`` (and ``changes`` with a baseline).

    Raises:
        InputError: unreadable model or load table, malformed baseline, bad output paths.
    """
    path = Path(path)
    if units not in UNIT_SYSTEMS:
        raise InputError(f"units must be one of {', '.join(UNIT_SYSTEMS)}, not {units!r}")
    check_output_paths(path, {"--out": out_model, "--report": out_report, "--csv": out_csv,
                              "--junit": out_junit})
    if loads_table is not None and _same_file(Path(loads_table), path):
        raise InputError("--loads names the model itself")
    base = baseline
    if isinstance(baseline, str | Path):
        base = load_baseline(Path(baseline))
    progress = progress or Silent()
    try:
        progress.consider(size=path.stat().st_size)
    except OSError:
        pass  # open_model names the problem

    with progress.phase(f"reading {path.name}"):
        model, read = _read(path, include_members, Path(loads_table) if loads_table else None)
    members = read.members
    progress.consider(items=len(members))
    with progress.phase(f"checking {len(members):,} members"):
        results = check_members(members, method)

    suggestions: dict[int, list[dict]] | None = None
    if suggest:
        with progress.phase("suggesting sections"):
            suggestions = _suggest(members, results, max_utilization, oversized, families)
    report = build_report(members, results, dict(UNIT_SYSTEMS[units]),
                          messages=list(read.messages), suggestions=suggestions)
    _add_extra_fields(report, members, read.length_unit_factor)
    report["source"] = {
        "file": source_name or path.name,
        "schema": model.schema_identifier,
        "columns": len(model.by_type("IfcColumn")),
        "members": len(members),
        "include_members": include_members,
        "loads_table": Path(loads_table).name if loads_table else None,
    }
    if base is not None:
        name = Path(baseline).name if isinstance(baseline, str | Path) else None
        report["changes"] = compare(base, report, change_threshold, name)

    if out_model is not None:
        stamp = checked_now() if checked_at == "now" else checked_at
        with progress.phase(f"writing results into {len(members):,} elements"):
            summary = write_results(
                model, members, results, design_basis=report["design_basis"],
                disclaimer=DISCLAIMER, force_unit_factor=read.force_unit_factor,
                checked_at=stamp, progress=progress.count,
                suggested={i: (s[0]["section"], s[0]["utilization"])
                           for i, s in (suggestions or {}).items() if s})
        if summary.added_force_unit:
            report["messages"].append(
                f"the model declared no force unit; {summary.force_unit} was added to its "
                "units and the strengths are written in it")
        if summary.missing:
            report["messages"].append(
                f"{len(summary.missing)} members have no element in the model; nothing "
                "written for them")
        with progress.phase(f"writing {Path(out_model).name}"):
            write_model_checked(Path(out_model), model)
    write_outputs(report, report_path=out_report, csv_path=out_csv, junit_path=out_junit,
                  allow_not_checked=allow_not_checked)
    return report


def _suggest(members, results, max_utilization: float, oversized: float | None,
             families: list[str] | None) -> dict[int, list[dict]]:
    """Suggestions for failing columns and for passing ones below ``oversized``."""
    status = results.status
    wanted = status == "fail"
    if oversized is not None:
        wanted |= (status == "pass") & (results.utilization < oversized)
    own = np.full(len(members), None, dtype=object)
    has = members.section_index >= 0
    own[has] = members.sections.family[members.section_index[has]]
    specs: list[list[str] | None] = [None] * len(members)
    for i in np.flatnonzero(wanted):
        fam = families or ([suggestion_family(str(own[i]))] if own[i] else None)
        specs[i] = fam
    found, problems = suggestions_for(
        members, results, specs, [max_utilization] * len(members))
    for i, text in problems.items():
        results.messages[i] = [*results.messages[i], text]
    for i in np.flatnonzero(wanted):
        if specs[i] and int(i) not in problems and not found.get(int(i)):
            results.messages[i] = [*results.messages[i],
                                   f"no section of {', '.join(specs[i])} passes at "
                                   f"utilization <= {max_utilization:g}"]
    return found


def check_model_file(path: Path, args: argparse.Namespace) -> dict:
    """``stanchion check model.ifc``: :func:`check_model` with the command-line options."""
    return check_model(
        Path(path),
        method=args.method or "LRFD",
        loads_table=getattr(args, "loads", None),
        include_members=getattr(args, "include_members", False),
        units=getattr(args, "units", None) or "us",
        out_model=getattr(args, "out", None),
        out_report=getattr(args, "report", None),
        out_csv=getattr(args, "csv", None),
        out_junit=getattr(args, "junit", None),
        baseline=getattr(args, "baseline", None),
        change_threshold=getattr(args, "change_threshold", DEFAULT_THRESHOLD),
        allow_not_checked=getattr(args, "allow_not_checked", False),
        progress=getattr(args, "progress", None),
        suggest=getattr(args, "suggest", False),
        max_utilization=getattr(args, "utilization_limit", None) or 1.0,
        oversized=getattr(args, "oversized", None),
        families=getattr(args, "families", None),
    )

