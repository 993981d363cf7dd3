"""Checking an IFC model: read, check, suggest, report, and the checked copy of the model.

The pipeline (:func:`stanchion.service.pipeline.check`) calls :func:`check_model` for a model
and, when a checked model is asked for, :func:`write_checked_model`; the paths, the baseline
and the report files are the pipeline's.  The input file is only ever opened for reading;
the checked copy is written to a temporary file beside its target and renamed into place.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from datetime import datetime
from pathlib import Path
from typing import TYPE_CHECKING, Any, Literal

import numpy as np

from stanchion.engine.check import CheckResults, check_members
from stanchion.engine.members import MemberTable
from stanchion.engine.selection import suggestion_family
from stanchion.engine.units import UNIT_SYSTEMS, length_factor
from stanchion.ifc_bridge.damage import Damage
from stanchion.ifc_bridge.elements import found_instead
from stanchion.ifc_bridge.errors import ModelReadError
from stanchion.ifc_bridge.model import open_model
from stanchion.ifc_bridge.read import ReadResult, read_columns
from stanchion.ifc_bridge.units import GivenUnit
from stanchion.ifc_bridge.write import checked_now, write_results
from stanchion.service.default_grade import state_default_grade
from stanchion.service.errors import InputError
from stanchion.service.lenient import add_lenient_warnings
from stanchion.service.load_table import given_force_unit, read_load_table
from stanchion.service.reports.files import write_model_checked
from stanchion.service.reports.report import DISCLAIMER, build_report
from stanchion.service.suggestions import suggest
from stanchion.service.takedown_loads import TakedownApplied, apply_takedown, report_fields
from stanchion.service.takedown_project import load_project

if TYPE_CHECKING:
    import ifcopenshell

    from stanchion.service.pipeline import CheckOptions, Progress

#: Member-table columns copied into the report rows when the reader provides them.
EXTRA_FIELDS = ("tag", "ifc_class", "profile_source", "length_source", "load_source",
                "fy_source")


@dataclass
class ModelCheck:
    """A checked model, kept open for writing the checked copy.

    Attributes:
        model: the model as read (never written back to its file).
        read: what the reader found (members, messages, unit factors).
        results: the engine's results.
        report: the report (docs/design.md §3) with the IFC row fields and ``source``.
        suggestions: suggested sections by member row (kip, lb/ft).
        takedown: what ``--takedown`` gave (cells and slabs for the plans), or None.
    """

    model: ifcopenshell.file
    read: ReadResult
    results: CheckResults
    report: dict[str, Any]
    suggestions: dict[int, list[dict[str, Any]]]
    takedown: TakedownApplied | None = None

    @property
    def members(self) -> MemberTable:
        """The member table that was checked."""
        return self.read.members


def _read(path: Path, options: CheckOptions, problems: list[Damage] | None = None
          ) -> tuple[ifcopenshell.file, ReadResult]:
    """Open the model and read its columns (the load table first: it is smaller).

    With ``problems`` (``--lenient``) a damaged model is read and its damage listed there.
    """
    loads_table, force_unit = options.loads_table, options.force_unit
    table = (read_load_table(loads_table, force_unit)  # InputError
             if loads_table is not None else None)
    given = given_force_unit(force_unit)
    try:
        model = open_model(path, problems=problems)
        return model, read_columns(model, include_members=options.include_members,
                                   loads_table=table,
                                   analysis_members=options.analysis_members,
                                   force_unit=GivenUnit(
                                       *given, options.option_name("--force-unit"))
                                   if given else None,
                                   default_grade=options.default_grade,
                                   default_grade_option=options.option_name("--default-grade"))
    except ModelReadError as exc:
        raise InputError(str(exc)) from None


def _add_extra_fields(report: dict[str, Any], members: MemberTable,
                      length_unit_factor: float) -> None:
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
    rotation = members.extra.get("rotation")
    if rotation is not None:
        for row, value in zip(rows, np.asarray(rotation, dtype=float).tolist(), strict=True):
            row["rotation"] = round(value, 2) if math.isfinite(value) else None


def no_columns_message(name: str, model: ifcopenshell.file, include_members: bool) -> str:
    """The one line refusing a model with no column to read, naming what it has instead.

    A model in which no column is found is unusable input (docs/design.md §4), never a pass.

    Args:
        name: the model's name as the user knows it.
        model: the opened model.
        include_members: STRUT / POST IfcMembers were read too.
    """
    wanted = "IfcColumn or STRUT / POST IfcMember" if include_members else "IfcColumn"
    found = found_instead(model, include_members)
    instead = ("found instead: " + "; ".join(found) if found else
               "nor any IfcMember, IfcBeam, IfcStructuralCurveMember or IfcColumnType")
    return f"no columns found in {name}: the model has no {wanted}; {instead}"


def check_model(path: Path, options: CheckOptions, progress: Progress) -> ModelCheck:
    """Read every column of an IFC model, check it, suggest sections, build the report.

    Args:
        path: the model (``.ifc``, ``.ifczip``, ``.ifcxml``).
        options: the pipeline's options (method, units, load table, members, suggestions).
        progress: told about long phases.

    Raises:
        InputError: an unreadable model or load table, or a model with no column to read
            (:func:`no_columns_message`).
    """
    units = options.units or "us"
    try:
        progress.consider(size=path.stat().st_size)
    except OSError:
        pass  # open_model names the problem
    project = load_project(options.takedown) if options.takedown is not None else None
    with progress.phase(f"reading {path.name}"):
        problems: list[Damage] | None = [] if options.lenient else None
        model, read = _read(path, options, problems)
    members = read.members
    if problems:
        add_lenient_warnings(model, members, problems, read.messages)
    if not len(members):
        raise InputError(no_columns_message(options.source_name or path.name, model,
                                            options.include_members))
    progress.consider(items=len(members))
    applied: TakedownApplied | None = None
    if project is not None and options.takedown is not None:
        with progress.phase("gravity load takedown"):
            applied = apply_takedown(model, read, project, options.takedown.name,
                                     UNIT_SYSTEMS[units]["length"])
        read.messages.extend(applied.messages)
    with progress.phase(f"checking {len(members):,} members"):
        results = check_members(members, options.method or "LRFD")
    suggestions: dict[int, list[dict[str, Any]]] = {}
    if options.suggest:
        with progress.phase("suggesting sections"):
            suggestions = _suggest(members, results, options)
    report = build_report(members, results, dict(UNIT_SYSTEMS[units]),
                          messages=list(read.messages), suggestions=suggestions or None)
    _add_extra_fields(report, members, read.length_unit_factor)
    if applied is not None:
        report_fields(applied, report["members"], report["units"]["length"])
    if options.default_grade:
        state_default_grade(report, members, options.default_grade,
                            options.option_name("--default-grade"))
    report["source"] = {
        "file": options.source_name or path.name,
        "schema": model.schema_identifier,
        "columns": len(model.by_type("IfcColumn")),
        "members": len(members),
        "include_members": options.include_members,
        "analysis_members": options.analysis_members,
        "loads_table": options.loads_table.name if options.loads_table else None,
    }
    if options.takedown is not None:
        report["source"]["takedown"] = options.takedown.name
    return ModelCheck(model, read, results, report, suggestions, applied)


def write_checked_model(run: ModelCheck, out: Path,
                        checked_at: datetime | Literal["now"] | None, progress: Progress
                        ) -> None:
    """Write the results into the model and the model to ``out`` (atomically).

    Args:
        run: the checked model.
        out: the checked copy's path (``.ifc`` or ``.ifczip``).
        checked_at: CheckedAt: "now", a time, or None (not written).
        progress: told about long phases.
    """
    members, report = run.members, run.report
    stamp = checked_now() if checked_at == "now" else checked_at
    with progress.phase(f"writing results into {len(members):,} elements"):
        summary = write_results(
            run.model, members, run.results, design_basis=report["design_basis"],
            disclaimer=DISCLAIMER, force_unit_factor=run.read.force_unit_factor,
            force_unit_given=run.read.unit_given.get("force"),
            checked_at=stamp, progress=progress.count,
            suggested={i: (s[0]["section"], s[0]["utilization"])
                       for i, s in run.suggestions.items() if s})
    if summary.added_force_unit:
        given = (f", the unit given {run.read.unit_given_as},"
                 if run.read.unit_given.get("force") else "")
        report["messages"].append(
            f"the model declared no force unit; {summary.force_unit}{given} was added to "
            "its units and the strengths are written in it")
    if summary.missing:
        report["messages"].append(
            f"{len(summary.missing)} members have no element in the model; nothing "
            "written for them")
    with progress.phase(f"writing {out.name}"):
        write_model_checked(out, run.model)


def _suggest(members: MemberTable, results: CheckResults, options: CheckOptions
             ) -> dict[int, list[dict[str, Any]]]:
    """Suggestions for failing columns and for passing ones below ``options.oversized``.

    Candidates: ``options.families``, else each column's own family
    (:func:`stanchion.engine.selection.suggestion_family`).
    """
    status = results.status
    wanted = status == "fail"
    if options.oversized is not None:
        wanted |= (status == "pass") & (results.utilization < options.oversized)
    own = np.full(len(members), None, dtype=object)
    has = members.section_index >= 0
    own[has] = members.sections.family[members.section_index[has]]
    specs: list[list[str] | None] = [None] * len(members)
    for i in np.flatnonzero(wanted).tolist():
        if options.families:
            specs[i] = list(options.families)
        elif own[i]:
            specs[i] = [suggestion_family(str(own[i]))]
    limit = options.utilization_limit or 1.0
    return suggest(members, results, specs, [limit] * len(members))
