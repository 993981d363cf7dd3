"""Writing output files safely: a temporary file in the target folder, then a rename.

Every writer here goes through :func:`write_atomic`, so a reader of the target never sees a
half-written file and a failure leaves the previous file (or none) in place.  The report dict
(docs/design.md §3) is the one source of the JSON, CSV and JUnit outputs.
"""

from __future__ import annotations

import json
import os
import tempfile
import xml.etree.ElementTree as ET
import zipfile
from collections import Counter
from collections.abc import Callable
from pathlib import Path
from typing import TYPE_CHECKING

from stanchion.service.reports.terminal import nothing_checked_line

if TYPE_CHECKING:
    import pandas as pd


NOT_CHECKED, SKIPPED = "not_checked", "skipped"
#: Suite and test case of the run itself: failed when no member got a verdict.
RUN_SUITE, RUN_CASE = "stanchion run", "members checked"
#: Suite name for members that carry no storey.
NO_STOREY = "(no storey)"


def _umask() -> int:
    mask = os.umask(0)
    os.umask(mask)
    return mask


def write_atomic(path: Path, write: Callable[[Path], None]) -> None:
    """Call ``write(tmp_path)`` and rename the result onto ``path`` (no partial files).

    The file gets the permissions a plain ``open(path, "w")`` would give (0666 less the
    umask), not the private mode of the temporary file.
    """
    path = Path(path)
    path.parent.mkdir(parents=True, exist_ok=True)
    fd, tmp = tempfile.mkstemp(prefix=f".{path.name}.", suffix=".tmp", dir=path.parent)
    os.close(fd)
    try:
        write(Path(tmp))
        os.chmod(tmp, 0o666 & ~_umask())
        os.replace(tmp, path)
    except BaseException:
        Path(tmp).unlink(missing_ok=True)
        raise


def write_json(path: Path, data: dict) -> None:
    """Write ``data`` as indented UTF-8 JSON, atomically."""

    def _w(tmp: Path) -> None:
        tmp.write_text(json.dumps(data, indent=2, ensure_ascii=False) + "\n", encoding="utf-8")

    write_atomic(path, _w)


# ---------------------------------------------------------------------------- CSV


def report_frame(report: dict) -> pd.DataFrame:
    """One row per member of the report; headers of dimensioned columns name their unit.

    Columns: id, name, [storey, grid], section, status, utilization, required_strength [F],
    available_strength [F], limit_state, combination, slenderness, critical_stress [S],
    reason, messages (joined with "; "), plus any further scalar member fields (tag ...).
    """
    import pandas as pd  # only for the CSV: keeps the job worker's start-up short

    units = report.get("units", {})
    force, stress = units.get("force", ""), units.get("stress", "")
    rows = report.get("members", [])
    dimensioned = {"required_strength": f"required_strength [{force}]",
                   "available_strength": f"available_strength [{force}]",
                   "critical_stress": f"critical_stress [{stress}]"}
    order = ["id", "name", "storey", "grid", "section", "status", "utilization",
             "required_strength", "available_strength", "limit_state", "combination", "slenderness",
             "critical_stress", "reason", "messages"]
    skip = {"combinations", "suggestions"}
    extra: list[str] = []
    for row in rows:
        for key, value in row.items():
            if key not in order and key not in skip and key not in extra and (
                    value is None or isinstance(value, str | int | float | bool)):
                extra.append(key)
    present = [k for k in order
               if k not in ("storey", "grid") or any(k in r for r in rows)]
    columns = present[:present.index("messages")] + extra + ["messages"]
    data = {
        k: [("; ".join(r.get(k) or []) if k == "messages" else r.get(k)) for r in rows]
        for k in columns
    }
    frame = pd.DataFrame(data, columns=columns)
    frame["reason"] = frame["reason"].fillna("")
    return frame.rename(columns=dimensioned)


def write_csv(path: Path, report: dict) -> None:
    """Write the report's members as CSV (UTF-8, one row per member), atomically."""
    frame = report_frame(report)
    write_atomic(path, lambda tmp: frame.to_csv(tmp, index=False, encoding="utf-8"))


# ---------------------------------------------------------------------------- JUnit XML


def _fmt(x: float | None, digits: int = 4) -> str:
    return "n/a" if x is None else f"{x:.{digits}g}"


def failure_message(member: dict, force_unit: str) -> str:
    """One line: why a member failed, was not checked or was skipped, with its numbers."""
    if member["status"] == NOT_CHECKED:
        return f"not checked: {member.get('reason') or 'no reason given'}"
    if member["status"] == SKIPPED:
        return f"skipped: {member.get('reason') or 'no reason given'}"
    text = (
        f"utilization {_fmt(member['utilization'])} > 1.0: required "
        f"{_fmt(member['required_strength'])} {force_unit}, available "
        f"{_fmt(member['available_strength'])} {force_unit}"
    )
    details = [d for d in (member.get("limit_state"), member.get("combination")) if d]
    return text + (f" ({'; '.join(details)})" if details else "")


def _case_name(member: dict) -> str:
    """``Name [id]``, with the grid location when known: ``C-12 at B-2 [id]``."""
    name, ident = member.get("name") or "", member["id"]
    grid = f" at {member['grid']}" if member.get("grid") else ""
    if not name or name == ident:
        return f"{ident}{grid}"
    return f"{name}{grid} [{ident}]"


def _case_detail(member: dict, force_unit: str) -> str:
    lines = [
        f"id: {member['id']}",
        *([f"grid: {member['grid']}"] if member.get("grid") else []),
        f"section: {member.get('section') or 'n/a'}",
        f"status: {member['status']}",
    ]
    if member.get("utilization") is not None:
        lines += [
            f"utilization: {_fmt(member['utilization'])}",
            f"required strength: {_fmt(member.get('required_strength'))} {force_unit}",
            f"available strength: {_fmt(member.get('available_strength'))} {force_unit}",
        ]
    for key, label in (("limit_state", "limit state"), ("combination", "combination"),
                       ("reason", "reason")):
        if member.get(key):
            lines.append(f"{label}: {member[key]}")
    lines.extend(f"note: {m}" for m in member.get("messages") or [])
    return "\n".join(lines)


def _case_properties(case: ET.Element, member: dict) -> None:
    """A test case's ``properties``: the IFC location of the member (storey, grid).

    Args:
        case: the ``testcase`` element.
        member: the report row.
    """
    where = [(key, member[key]) for key in ("storey", "grid") if member.get(key)]
    if where:
        props = ET.SubElement(case, "properties")
        for key, value in where:
            ET.SubElement(props, "property", name=key, value=str(value))


def junit_tree(report: dict, allow_not_checked: bool = False) -> ET.ElementTree:
    """JUnit XML: one testsuite per storey, one testcase per member.

    FAIL members are failures; NOT CHECKED members are failures too, or skipped (with the
    reason) when ``allow_not_checked``; SKIPPED members (not steel) are skipped test cases.
    Members of reports without storeys (members files) form one suite named "members".  A
    run in which no member got a verdict (none passed, none failed) adds the failing test
    case :data:`RUN_CASE` in the suite :data:`RUN_SUITE`, whatever ``allow_not_checked``
    says: a CI reading only the JUnit file never goes green on it (docs/design.md §4).
    """
    force = report.get("units", {}).get("force", "")
    rows = report.get("members", [])
    has_storeys = any("storey" in r for r in rows)
    suites: dict[str, list[dict]] = {}
    for row in rows:
        key = (row.get("storey") or NO_STOREY) if has_storeys else "members"
        suites.setdefault(key, []).append(row)

    root = ET.Element("testsuites", name="stanchion")
    totals = {"tests": 0, "failures": 0, "skipped": 0}
    for suite_name, members in suites.items():
        suite = ET.SubElement(root, "testsuite", name=suite_name)
        props = ET.SubElement(suite, "properties")
        ET.SubElement(props, "property", name="design_basis", value=report.get("design_basis", ""))
        counts = {"tests": 0, "failures": 0, "skipped": 0}
        for m in members:
            counts["tests"] += 1
            case = ET.SubElement(suite, "testcase", name=_case_name(m),
                                 classname=f"stanchion.{suite_name}", time="0")
            _case_properties(case, m)
            detail = _case_detail(m, force)
            if m["status"] == "fail" or (m["status"] == NOT_CHECKED and not allow_not_checked):
                counts["failures"] += 1
                el = ET.SubElement(case, "failure", message=failure_message(m, force),
                                   type="FAIL" if m["status"] == "fail" else "NOT CHECKED")
                el.text = detail
            elif m["status"] in (NOT_CHECKED, SKIPPED):
                counts["skipped"] += 1
                ET.SubElement(case, "skipped", message=failure_message(m, force))
            else:
                ET.SubElement(case, "system-out").text = detail
        for k, v in counts.items():
            suite.set(k, str(v))
            totals[k] += v
        suite.set("errors", "0")
        suite.set("time", "0")
    by_status = Counter(m["status"] for m in rows)
    if not (by_status["pass"] or by_status["fail"]):
        _run_failure(root, by_status, totals)
    for k, v in totals.items():
        root.set(k, str(v))
    root.set("errors", "0")
    ET.indent(root)
    return ET.ElementTree(root)


def _run_failure(root: ET.Element, by_status: Counter[str], totals: dict[str, int]) -> None:
    """The failing test case of a run in which no member got a verdict.

    Args:
        root: the ``testsuites`` element.
        by_status: the members counted by status.
        totals: the run's counts, updated.
    """
    line = nothing_checked_line({"summary": {"not_checked": by_status[NOT_CHECKED],
                                             "skipped": by_status[SKIPPED]}})
    suite = ET.SubElement(root, "testsuite", name=RUN_SUITE, tests="1", failures="1",
                          skipped="0", errors="0", time="0")
    case = ET.SubElement(suite, "testcase", name=RUN_CASE, classname="stanchion.run",
                         time="0")
    ET.SubElement(case, "failure", message=line, type="NOTHING CHECKED").text = line
    totals["tests"] += 1
    totals["failures"] += 1


def write_junit(path: Path, report: dict, allow_not_checked: bool = False) -> None:
    """Write the JUnit XML of :func:`junit_tree`, atomically."""
    tree = junit_tree(report, allow_not_checked)

    def _w(tmp: Path) -> None:
        tree.write(tmp, encoding="utf-8", xml_declaration=True)
        with open(tmp, "a", encoding="utf-8") as fh:
            fh.write("\n")

    write_atomic(path, _w)


# ---------------------------------------------------------------------------- IFC models


def write_model(path: Path, model) -> None:
    """Write an ifcopenshell model as ``.ifc`` (STEP) or ``.ifczip``, atomically."""
    path = Path(path)
    if path.suffix.lower() == ".ifczip":
        inner = path.with_suffix(".ifc").name

        def _zip(tmp: Path) -> None:
            with tempfile.TemporaryDirectory(dir=path.parent) as folder:
                step = Path(folder) / inner
                model.write(str(step), format=".ifc")
                with zipfile.ZipFile(tmp, "w", compression=zipfile.ZIP_DEFLATED) as zf:
                    zf.write(step, inner)

        write_atomic(path, _zip)
    else:
        write_atomic(path, lambda tmp: model.write(str(tmp), format=".ifc"))


def write_model_checked(path: Path, model) -> None:
    """:func:`write_model`, with a file-system failure as one-line InputError."""
    from stanchion.service.errors import InputError

    try:
        write_model(path, model)
    except OSError as exc:
        raise InputError(f"cannot write {path}: {exc.strerror or exc}") from None


def write_outputs(
    report: dict,
    *,
    report_path: Path | None = None,
    csv_path: Path | None = None,
    junit_path: Path | None = None,
    allow_not_checked: bool = False,
) -> None:
    """Write whichever of the JSON report, CSV and JUnit XML files are asked for.

    Raises:
        InputError: a file cannot be written (one line naming it).
    """
    from stanchion.service.errors import InputError

    jobs = [(report_path, lambda p: write_json(p, report)),
            (csv_path, lambda p: write_csv(p, report)),
            (junit_path, lambda p: write_junit(p, report, allow_not_checked))]
    for path, write in jobs:
        if path is None:
            continue
        try:
            write(Path(path))
        except OSError as exc:
            raise InputError(f"cannot write {path}: {exc.strerror or exc}") from None
