"""No columns is not a pass (issue 13, item 2; docs/design.md §4).

Measured on main before this rule (issue 13): ``head -c 2000`` of a model gave 0 columns,
``result: PASS``, exit 0, and fourteen real models without a single IfcColumn exited 0 -- one
of them an analysis model of three IfcStructuralCurveMembers and nothing else (IfcOpenShell's
analysis-models ``portal_01.ifc``).  The column-less models here reproduce those patterns
with ``ifcopenshell.api`` (the builders of tests/ifc_bridge/conftest.py): analysis members,
IfcMembers of other predefined types, beams and a column type no column uses.  The counts
expected in the messages are those the test model is built with.
"""

from __future__ import annotations

import json
import os
import subprocess
import sys
from pathlib import Path

import pytest

from stanchion.service.cli import main
from stanchion.service.cli.check import exit_code
from stanchion.service.jobs import store as jobs
from stanchion.service.jobs.worker import run_job
from tests.service.test_model_check_files import builder_module, write_model

SCHEMAS = ("IFC2X3", "IFC4", "IFC4X3")
# Every column of the standard model without loads: "not checked: no loads" (test_model_check_files)
ALL_UNCHECKED = {"C1": None, "C2": None, "C3": None}


def columnless_model(path: Path, schema: str = "IFC4", strut: bool = True,
                     empty: bool = False) -> Path:
    """A model with no IfcColumn: what an analysis or a framing export holds instead.

    Args:
        path: where to write it.
        schema: IFC2X3, IFC4 or IFC4X3.
        strut: add an IfcMember typed STRUT (read with --include-members).
        empty: only the project, storey and units (nothing that could be a column).

    Contents (unless ``empty``): 3 IfcStructuralCurveMember (the analysis_portal.ifc
    pattern), 2 IfcMember typed BRACE (plus 1 typed STRUT when ``strut``), 1 IfcBeam and 1
    IfcColumnType with no occurrence.
    """
    b = builder_module().ModelBuilder(schema, "mm_N")
    b.storey("Level 1")
    if not empty:
        for i in range(3):
            kw = {"predefined_type": "RIGID_JOINED_MEMBER"} if schema != "IFC2X3" else {}
            member = b._create("IfcStructuralCurveMember", name=f"Curve Member #{i + 1}", **kw)
            if schema == "IFC2X3":
                member.PredefinedType = "RIGID_JOINED_MEMBER"
        brace = b.column_type("Brace type", ifc_class="IfcMemberType", predefined_type="BRACE")
        for name in ("B1", "B2"):
            b.column(name, ifc_class="IfcMember", column_type=brace, length=None)
        if strut:
            struts = b.column_type("Strut type", ifc_class="IfcMemberType",
                                   predefined_type="STRUT")
            b.column("S1", ifc_class="IfcMember", column_type=struts, length=None)
        b.column("G1", ifc_class="IfcBeam", length=None)
        b.column_type("HEB 200")
    return b.write(path)


def _outputs(tmp_path: Path) -> tuple[list[str], list[Path]]:
    paths = [tmp_path / n for n in ("checked.ifc", "r.json", "r.csv", "j.xml")]
    args = []
    for option, p in zip(("--out", "--report", "--csv", "--junit"), paths, strict=True):
        args += [option, str(p)]
    return args, paths


@pytest.mark.parametrize("schema", SCHEMAS)
def test_model_without_columns_exits_2_naming_what_it_has(tmp_path, capsys, schema) -> None:
    src = columnless_model(tmp_path / "model.ifc", schema)
    args, paths = _outputs(tmp_path)
    assert main(["check", str(src), *args]) == 2  # issue 13 item 2: exit 2
    err = capsys.readouterr().err
    # One line (docs/design.md §4); the counts are the test model's own (columnless_model).
    assert err == (
        "stanchion: no columns found in model.ifc: the model has no IfcColumn; found "
        "instead: 3 IfcMember (2 BRACE, 1 STRUT; --include-members reads STRUT and POST); "
        "3 IfcStructuralCurveMember (analysis members; none has an edge within 5 degrees of "
        "vertical, so none is read as a column); "
        "1 IfcBeam; 1 IfcColumnType without occurrences\n")
    assert not any(p.exists() for p in paths)  # nothing written


@pytest.mark.parametrize("schema", SCHEMAS)
def test_include_members_names_the_member_types_not_read(tmp_path, capsys, schema) -> None:
    src = columnless_model(tmp_path / "model.ifc", schema, strut=False)
    assert main(["check", str(src), "--include-members", "--quiet"]) == 2
    err = capsys.readouterr().err
    assert err.startswith("stanchion: no columns found in model.ifc: the model has no "
                          "IfcColumn or STRUT / POST IfcMember; found instead: 2 IfcMember "
                          "(2 BRACE); ")
    assert "--include-members reads" not in err and err.count("\n") == 1


def test_include_members_reads_the_strut_and_is_not_refused(tmp_path, capsys) -> None:
    """The refusal is for models with nothing to read: the STRUT is read (not checked)."""
    src = columnless_model(tmp_path / "model.ifc")
    # The STRUT has no profile, so it is not checked; nothing checked still exits 1 (§4).
    assert main(["check", str(src), "--include-members", "--quiet"]) == 1
    assert "no columns found" not in capsys.readouterr().err


@pytest.mark.parametrize("schema", SCHEMAS)
def test_empty_model_says_nothing_was_found(tmp_path, capsys, schema) -> None:
    src = columnless_model(tmp_path / "empty.ifc", schema, empty=True)
    assert main(["check", str(src), "--quiet", "--report", str(tmp_path / "r.json")]) == 2
    assert capsys.readouterr().err == (
        "stanchion: no columns found in empty.ifc: the model has no IfcColumn; nor any "
        "IfcMember, IfcBeam, IfcStructuralCurveMember or IfcColumnType\n")
    assert not (tmp_path / "r.json").exists()


def test_truncated_model_is_not_a_pass(tmp_path, capsys) -> None:
    """The issue's measurement: ``head -c 2000`` of a model gave 0 columns, PASS, exit 0."""
    whole = Path(__file__).resolve().parents[2] / "sample_models" / "workshop_annex.ifc"
    cut = tmp_path / "cut.ifc"
    cut.write_bytes(whole.read_bytes()[:2000])
    assert main(["check", str(cut), "--quiet"]) == 2
    err = capsys.readouterr().err
    assert err.startswith("stanchion: ") and err.count("\n") == 1 and "Traceback" not in err


def test_allow_not_checked_with_nothing_checked_exits_1(tmp_path, capsys) -> None:
    src = write_model(tmp_path / "model.ifc", loads=ALL_UNCHECKED)
    # docs/design.md §4: no member got a verdict -> never 0, whatever the options.
    assert main(["check", str(src), "--allow-not-checked"]) == 1
    captured = capsys.readouterr()
    assert "result: FAIL (nothing was checked: all 3 members are not checked)" in captured.out
    assert "stanchion: nothing was checked: all 3 members are not checked\n" in captured.err
    assert main(["check", str(src), "--allow-not-checked", "--quiet"]) == 1
    assert capsys.readouterr() == (
        "", "stanchion: nothing was checked: all 3 members are not checked\n")


def test_baseline_comparison_with_nothing_checked_is_not_green(tmp_path, capsys) -> None:
    src = write_model(tmp_path / "model.ifc", loads=ALL_UNCHECKED)
    first = tmp_path / "first.json"
    assert main(["check", str(src), "--quiet", "--report", str(first)]) == 1
    capsys.readouterr()
    # No regressions against a baseline that was not checked either, but nothing was
    # checked: 1 (docs/design.md §4).
    for extra in ([], ["--allow-not-checked"]):
        code = main(["check", str(src), "--quiet", "--baseline", str(first),
                     "--fail-on", "new-failures", *extra])
        assert code == 1
    assert capsys.readouterr().err.count("nothing was checked") == 2


def test_one_checked_member_is_enough_for_a_verdict(tmp_path) -> None:
    """Only the all-not-checked case changed: one pass and the rest allowed still exits 0."""
    src = write_model(tmp_path / "model.ifc", loads={"C1": {"D": 10.0}, "C2": None, "C3": None})
    assert main(["check", str(src), "--allow-not-checked", "--quiet"]) == 0


@pytest.mark.parametrize("fail_on, changes", [("any", None), ("new-failures", {})])
@pytest.mark.parametrize("allow", [False, True])
def test_exit_code_rule(fail_on, changes, allow) -> None:
    """docs/design.md §4: no pass and no fail -> 1; a pass alone -> 0 under these options."""
    def report(passed: int, not_checked: int) -> dict:
        r: dict = {"summary": {"members": passed + not_checked, "pass": passed, "fail": 0,
                               "not_checked": not_checked}}
        if changes is not None:
            r["changes"] = {"new_failures": [], "new_not_checked": [], "new_skipped": []}
        return r
    assert exit_code(report(0, 2), allow, fail_on) == 1
    assert exit_code(report(0, 0), allow, fail_on) == 1
    assert exit_code(report(1, 0), allow, fail_on) == 0


def test_model_job_without_columns_fails_with_the_message(tmp_path) -> None:
    """The job worker's real pipeline: failed with the one line, no report (docs/design.md §6)."""
    job_dir = tmp_path / "job"
    job_dir.mkdir()
    columnless_model(job_dir / "model.ifc", strut=False)
    (job_dir / jobs.PARAMS_FILE).write_text(json.dumps(
        {"model": "model.ifc", "filename": "portal.ifc", "design_method": "LRFD",
         "loads": None, "loads_filename": None}))
    result = run_job(job_dir)
    assert result["status"] == "failed"
    assert result["error"].startswith(
        "no columns found in portal.ifc: the model has no IfcColumn; found instead: "
        "2 IfcMember (2 BRACE); 3 IfcStructuralCurveMember")
    assert str(tmp_path) not in result["error"]
    for name in (jobs.REPORT_FILE, jobs.MODEL_OUT_FILE, jobs.CSV_FILE):
        assert not (job_dir / name).exists()


def _readme_ci_script() -> str:
    """The shell script of the README's "In a CI pipeline" section, as printed there."""
    readme = (Path(__file__).resolve().parents[2] / "README.md").read_text(encoding="utf-8")
    section = readme.split("## In a CI pipeline", 1)[1]
    return section.split("```sh\n", 1)[1].split("```", 1)[0]


def test_readme_ci_script_first_run_no_columns_and_last_good(tmp_path) -> None:
    """The README's CI script: first run without a baseline, exit 2, last good kept on 0 only."""
    script = tmp_path / "ci.sh"
    script.write_text(_readme_ci_script())
    env = {**os.environ, "PATH": f"{Path(sys.executable).parent}{os.pathsep}"
           f"{os.environ.get('PATH', '')}"}
    model, last_good = tmp_path / "model.ifc", tmp_path / "last-good" / "report.json"

    def run() -> subprocess.CompletedProcess:
        return subprocess.run(["sh", str(script)], cwd=tmp_path, env=env, capture_output=True,
                              text=True, timeout=120, check=False)

    columnless_model(model)
    first = run()
    assert first.returncode == 2 and "no columns found in model.ifc" in first.stderr
    assert not last_good.exists()  # exit 2 wrote nothing and kept nothing
    write_model(model, loads={"C1": {"D": 10.0}})  # one passing column (test_model_check_files)
    second = run()  # no last good report yet: --fail-on any, no --baseline
    assert second.returncode == 0, second.stderr
    assert json.loads(last_good.read_text())["summary"]["pass"] == 1
    kept = last_good.read_bytes()
    write_model(model, loads={"C1": None})  # the column lost its loads: nothing checked
    third = run()
    assert third.returncode == 1 and "nothing was checked" in third.stderr
    assert last_good.read_bytes() == kept  # a run that is not 0 keeps the last good report
