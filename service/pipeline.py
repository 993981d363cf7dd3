"""The one pipeline (docs/design.md §1): an input file in, a checked run out.

:func:`check` takes a members JSON file or an IFC model with :class:`CheckOptions` and
:class:`OutputPaths`, and returns a :class:`CheckRun`.  The command line and the HTTP job
worker both call it; what differs between the two inputs -- reading a members request
(:mod:`stanchion.service.members_check`) or a model (:mod:`stanchion.service.model_check`) --
is chosen here, and everything around it is done once for both: refusing unusable options
and output paths before anything is read, the comparison with a baseline, and writing the
outputs (each atomically; the input is never modified).
"""

from __future__ import annotations

import json
import os
from contextlib import AbstractContextManager, nullcontext
from dataclasses import dataclass
from datetime import datetime
from pathlib import Path
from typing import TYPE_CHECKING, Any, Literal, Protocol

from pydantic import BaseModel, ConfigDict, Field, ValidationError

from stanchion.engine.check import CheckResults
from stanchion.engine.members import MemberTable
from stanchion.service.default_grade import given_default_grade
from stanchion.service.errors import InputError, validation_message
from stanchion.service.load_table import given_force_unit
from stanchion.service.reports.baseline import DEFAULT_THRESHOLD, compare, load_baseline
from stanchion.service.reports.files import write_outputs
from stanchion.service.request import MembersRequest
from stanchion.service.requirements import apply_ids, load_ids

if TYPE_CHECKING:
    from stanchion.service import model_check
    from stanchion.service.reports.plan_data import PlanData

#: Inputs read as IFC models; anything else is read as a members JSON file.
MODEL_SUFFIXES = (".ifc", ".ifczip", ".ifcxml")
#: What a checked model may be written as.
MODEL_OUTPUT_SUFFIXES = (".ifc", ".ifczip")


class Progress(Protocol):
    """What the pipeline tells about long phases.

    The command line prints it (:class:`stanchion.service.cli.progress.Progress`); the HTTP
    worker and ``--quiet`` use :class:`Silent`.
    """

    def consider(self, *, size: int | None = None, items: int | None = None) -> bool:
        """Learn how big the job is (bytes of the input, members); True: phases are shown."""

    def phase(self, label: str) -> AbstractContextManager[object]:
        """A context manager around one phase."""

    def count(self, done: int, total: int) -> None:
        """How many items of the current phase are done."""


class Silent:
    """A :class:`Progress` that says nothing."""

    def consider(self, *, size: int | None = None, items: int | None = None) -> bool:
        """Ignore the size."""
        return False

    def phase(self, label: str) -> AbstractContextManager[object]:
        """A phase that says nothing."""
        return nullcontext()

    def count(self, done: int, total: int) -> None:
        """Ignore the count."""


class CheckOptions(BaseModel):
    """How to check (the command line's options; the HTTP worker sets a few).

    Options that apply to IFC models only (``units``, ``loads_table``, ``include_members``,
    ``suggest`` and its limits) are refused for a members file, which carries its own.
    """

    model_config = ConfigDict(frozen=True, extra="forbid")

    method: Literal["LRFD", "ASD"] | None = Field(
        None, description="design method; None: the members file's own, or LRFD")
    units: Literal["us", "si"] | None = Field(
        None, description="report units of a model check: us (kip, ft, ksi, the default) or "
        "si (kN, m, MPa)")
    loads_table: Path | None = Field(None, description="CSV load table for a model")
    ids: Path | None = Field(
        None, description="an IDS 1.0 document the model is validated against; what each "
        "column misses goes into the report (requirements)")
    takedown: Path | None = Field(
        None, description="load takedown project file (TOML) for a model: loads of the "
        "columns without any from the slabs (docs/design.md §5 'Load takedown')")
    force_unit: str | None = Field(
        None, description="force unit of a model that declares none and of the load "
        "table's columns whose header names none (kip, kN, N, lbf, MN or any force unit "
        "pint knows)")
    lenient: bool = Field(
        False, description="check a damaged model anyway, with a model-level warning")
    default_grade: str | None = Field(
        None, description="grade assumed for members whose material names steel but no "
        "grade (A992, S355, 345 MPa ...); stated in every output")
    include_members: bool = Field(False, description="also check IfcMember STRUT / POST")
    analysis_members: bool = Field(
        False, description="also check vertical IfcStructuralCurveMembers tied to no column")
    suggest: bool = Field(False, description="suggest sections for failing columns")
    utilization_limit: float | None = Field(
        None, gt=0, description="suggestions pass at this utilization (default 1.0)")
    oversized: float | None = Field(
        None, gt=0, description="also suggest for passing columns below this utilization")
    families: tuple[str, ...] | None = Field(
        None, description="candidate families or designations (default: the column's own)")
    baseline: Path | None = Field(None, description="a previous report to compare with")
    change_threshold: float = Field(
        DEFAULT_THRESHOLD, ge=0, description="utilization changes reported above this")
    allow_not_checked: bool = Field(
        False, description="not-checked members are warnings (JUnit: skipped)")
    checked_at: datetime | Literal["now"] | None = Field(
        "now", description="CheckedAt written into a checked model; None: not written")
    source_name: str | None = Field(
        None, description="the input's name in the report (default: the file's name)")
    front_end: Literal["command line", "HTTP job"] = Field(
        "command line", description="the front end whose names the messages give an "
        "option by (--force-unit on the command line, the job's force_unit field over HTTP)")

    def option_name(self, option: str) -> str:
        """How the messages name an option: ``--force-unit``, or ``the job's force_unit``.

        Args:
            option: the command line's spelling (``--force-unit``).
        """
        if self.front_end == "command line":
            return option
        return f"the job's {option.removeprefix('--').replace('-', '_')}"


class OutputPaths(BaseModel):
    """Where to write; None: not written."""

    model_config = ConfigDict(frozen=True, extra="forbid")

    model: Path | None = None
    report: Path | None = None
    csv: Path | None = None
    junit: Path | None = None
    bcf: Path | None = None
    html: Path | None = None

    def named(self) -> dict[str, Path]:
        """The given outputs by their command-line option."""
        options = {"model": "--out", "report": "--report", "csv": "--csv",
                   "junit": "--junit", "bcf": "--bcf", "html": "--html"}
        return {options[k]: Path(v) for k, v in self.model_dump().items() if v is not None}


@dataclass(frozen=True)
class CheckRun:
    """A finished check.

    Attributes:
        report: the report (docs/design.md §3), as written.
        members: the member table that was checked (kip, inch, ksi).
        results: the engine's results, one row per member.
        kind: ``"model"`` or ``"members"``.
    """

    report: dict[str, Any]
    members: MemberTable
    results: CheckResults
    kind: Literal["model", "members"]


def is_model(path: Path) -> bool:
    """True for the file names read as IFC models."""
    return Path(path).suffix.lower() in MODEL_SUFFIXES


def check(source: Path, options: CheckOptions | None = None,
          outputs: OutputPaths | None = None, progress: Progress | None = None) -> CheckRun:
    """Check every member of a members file or every column of an IFC model.

    Args:
        source: the members JSON file or IFC model; only ever opened for reading.
        options: how to check (default: LRFD, report units us, nothing optional).
        outputs: the files to write (default: none).
        progress: told about long phases (default: silent).

    Returns:
        The finished run; its report also went to ``outputs.report``.

    Raises:
        InputError: unusable options, output paths, input, load table or baseline -- raised
            before anything is written.
    """
    from stanchion.service import members_check, model_check

    source = Path(source)
    options = options or CheckOptions()
    outputs = outputs or OutputPaths()
    model = is_model(source)
    refuse_options(options, model)
    check_paths(source, options, outputs)
    baseline = load_baseline(options.baseline) if options.baseline is not None else None
    ids = load_ids(options.ids) if options.ids is not None else None  # InputError
    progress = progress or Silent()

    if model:
        run = model_check.check_model(source, options, progress)
        members, results, report = run.members, run.results, run.report
        if ids is not None:
            assert options.ids is not None
            with progress.phase(f"validating against {options.ids.name}"):
                apply_ids(report, run.model, ids, options.ids.name)
    else:
        request = load_members_request(source, options.method)
        members, results, report = members_check.check_members_request(request)
        report["source"] = {"file": options.source_name or source.name,
                            "members": len(members)}
    if baseline is not None:
        assert options.baseline is not None
        report["changes"] = compare(baseline, report, options.change_threshold,
                                    options.baseline.name)
    if model and outputs.model is not None:
        model_check.write_checked_model(run, outputs.model, options.checked_at, progress)
    write_outputs(report, report_path=outputs.report, csv_path=outputs.csv,
                  junit_path=outputs.junit, allow_not_checked=options.allow_not_checked)
    plans = (_plan_data(run) if model and (outputs.bcf is not None or outputs.html is not None)
             else None)
    if model and outputs.bcf is not None:
        _write_bcf(run, outputs.bcf, plans)
    if outputs.html is not None:
        _write_html(outputs.html, report, members,
                    _detailed(members, results, None if model else request), plans)
    return CheckRun(report, members, results, "model" if model else "members")


def _write_bcf(run: model_check.ModelCheck, path: Path, plans: PlanData | None = None
               ) -> None:
    """Write the BCF issues of a checked model (``--bcf``), atomically.

    The snapshots draw the plans' slab outlines and grid lines when ``plans`` gives them.
    """
    from stanchion.service.reports.bcf import scene_of, write_bcf
    from stanchion.service.reports.snapshots import StoreyDots

    try:
        write_bcf(path, run.report, scene_of(run), StoreyDots(run.report, plans))
    except OSError as exc:
        raise InputError(f"cannot write {path}: {exc.strerror or exc}") from None


def _detailed(members: MemberTable, results: CheckResults,
              request: MembersRequest | None) -> CheckResults:
    """The results with every combination's value kept (the HTML report lists them).

    The same check again with ``detail``: a members file's own combinations and options
    (:func:`stanchion.service.members_check.run_request`), or the model check's (the
    default combinations of the method).
    """
    if results.combination_values is not None:
        return results
    if request is not None:
        from stanchion.service.members_check import run_request

        return run_request(request.model_copy(update={"detail": True}))[1]
    from stanchion.engine.check import check_members

    return check_members(members, results.method, detail=True)


def _plan_data(run: model_check.ModelCheck) -> PlanData:
    """The plans' grid lines, slab outlines and tributary cells of a checked model."""
    from stanchion.service.plan_geometry import plan_data

    return plan_data(run)


def _write_html(path: Path, report: dict[str, Any], members: MemberTable,
                results: CheckResults, plans: PlanData | None = None) -> None:
    """Write the HTML report (``--html``), atomically.

    ``plans``: grid lines, slab outlines and tributary cells for a model
    (:mod:`stanchion.service.plan_geometry`); None for members files.
    """
    from stanchion.service.reports.html import write_html

    try:
        write_html(path, report, members, results, plans=plans)
    except OSError as exc:
        raise InputError(f"cannot write {path}: {exc.strerror or exc}") from None


def refuse_options(options: CheckOptions, model: bool) -> None:
    """Refuse option combinations that cannot work (InputError), before anything is read."""
    if not model:
        for name, value in (("--loads", options.loads_table),
                            ("--include-members", options.include_members),
                            ("--analysis-members", options.analysis_members),
                            ("--units", options.units), ("--suggest", options.suggest),
                            ("--force-unit", options.force_unit),
                            ("--lenient", options.lenient),
                            ("--default-grade", options.default_grade),
                            ("--takedown", options.takedown), ("--ids", options.ids)):
            if value:
                raise InputError(f"{name} applies to IFC models; a members file carries "
                                 "its own loads, units, grades and candidates")
    given_force_unit(options.force_unit)  # InputError: not a force unit
    given_default_grade(options.default_grade)  # InputError: names no grade
    if (options.utilization_limit is not None or options.oversized is not None
            or options.families) and not options.suggest:
        raise InputError("--utilization-limit, --oversized and --families go with --suggest")


def _same_file(a: Path, b: Path) -> bool:
    try:
        if a.exists() and b.exists():
            return a.samefile(b)
    except OSError:
        pass
    return a.resolve() == b.resolve()


def _writable(option: str, out: Path) -> None:
    """Refuse an output that is a folder or whose folder cannot be written in."""
    if out.is_dir():
        raise InputError(f"{option} {out} is a directory")
    folder = out.absolute().parent
    while not folder.exists() and folder != folder.parent:
        folder = folder.parent
    if not folder.is_dir() or not os.access(folder, os.W_OK | os.X_OK):
        raise InputError(f"{option} {out}: cannot write in {folder}")


def check_paths(source: Path, options: CheckOptions, outputs: OutputPaths) -> None:
    """Refuse outputs that would overwrite an input or each other, or cannot be written.

    The inputs are the source, the load table and the baseline: none is ever written.

    Raises:
        InputError: naming the option and the file.
    """
    given = outputs.named()
    if given.get("--out") is not None and not is_model(source):
        raise InputError("--out applies to IFC models: a checked model is written only for "
                         "a model")
    if given.get("--bcf") is not None and not is_model(source):
        raise InputError("--bcf applies to IFC models: its topics select columns by their "
                         "IfcGuid")
    inputs = {"the input file": source, "the --loads table": options.loads_table,
              "the --takedown project": options.takedown, "the --ids document": options.ids,
              "the --baseline report": options.baseline}
    if options.loads_table is not None and _same_file(Path(options.loads_table), source):
        raise InputError("--loads names the model itself")
    for option, out in given.items():
        for what, path in inputs.items():
            if path is not None and _same_file(out, Path(path)):
                raise InputError(f"{option} {out} is {what}; inputs are never overwritten, "
                                 "choose another name")
        _writable(option, out)
    names = list(given.items())
    for i, (opt_a, a) in enumerate(names):
        for opt_b, b in names[i + 1:]:
            if _same_file(a, b):
                raise InputError(f"{opt_a} and {opt_b} name the same file {a}")
    model_out = given.get("--out")
    if model_out is not None and model_out.suffix.lower() not in MODEL_OUTPUT_SUFFIXES:
        raise InputError(f"--out {model_out}: the checked model must end in .ifc or .ifczip")


def load_members_request(path: Path, method: str | None = None) -> MembersRequest:
    """Read and validate a members JSON file.

    Args:
        path: the file.
        method: a design method that overrides the file's.

    Raises:
        InputError: unreadable, not JSON, or not a valid members request; one line.
    """
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
    except RecursionError:  # a members request is at most a few levels deep
        raise InputError(f"cannot read {path}: JSON nested too deeply") from None
    if isinstance(data, dict) and method:
        data["design_method"] = method
    try:
        return MembersRequest.model_validate(data)
    except ValidationError as exc:
        raise InputError(f"{path}: {validation_message(exc)}") from None
