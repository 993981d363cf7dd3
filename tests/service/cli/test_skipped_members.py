"""Non-steel columns are skipped, not failed (issue 13 item 4; docs/design.md §3, §4, §5).

Measured on main before this rule (issue 13): concrete, timber and aluminium columns came out
"not checked: no yield strength", so every mixed model exited 1 unless --allow-not-checked.
The models here are built with ``ifcopenshell.api`` (tests/ifc_bridge/conftest.py); the
expected counts are the ones each model is built with.
"""

from __future__ import annotations

import csv
import json
import xml.etree.ElementTree as ET
from pathlib import Path

import ifcopenshell
import ifcopenshell.api.material
import ifcopenshell.util.element
import pytest

from stanchion.service.cli import main
from stanchion.service.jobs import store as jobs
from stanchion.service.jobs.worker import run_job
from stanchion.service.report_model import Report
from tests.service.test_model_check_files import builder_module

W14X48 = {"d": 13.8, "bf": 8.03, "tw": 0.340, "tf": 0.595}  # AISC Shapes Database v16.0
SQUARE = {"H": 16.0, "B": 16.0}
NON_STEEL = {"K1": "Beton C30/37", "K2": "Glulam GL24h", "K3": "Aluminium"}


def _model(path: Path, schema: str = "IFC4", steel: bool = True,
           steel_loads: dict | None = None) -> Path:
    """Three non-steel columns (:data:`NON_STEEL`) and, with ``steel``, a W14X48 in A992.

    The steel column carries D = 100, L = 50 kip over 12 ft: 1.2*100 + 1.6*50 = 200 kip (by
    hand) against phi_c Pn > 303 kip (its 16 ft value, AISC Manual Table 4-1a, read-off): a
    pass.
    """
    b = builder_module().ModelBuilder(schema, "mm_N")
    for name, material in NON_STEEL.items():
        mat = ifcopenshell.api.material.add_material(b.model, name=material)
        col = b.column(name, profile=b.profile("RECT", None, **SQUARE), material=mat,
                       via="body")
        b.loads(col, D=100.0, L=50.0)
    if steel:
        mat = ifcopenshell.api.material.add_material(b.model, name="ASTM A992")
        col = b.column("S1", profile=b.profile("I", "W14X48", **W14X48), material=mat)
        b.loads(col, **(steel_loads or {"D": 100.0, "L": 50.0}))
    return b.write(path)


def _outputs(tmp_path: Path) -> tuple[list[str], dict[str, Path]]:
    paths = {k: tmp_path / n for k, n in (("out", "checked.ifc"), ("report", "r.json"),
                                          ("csv", "r.csv"), ("junit", "j.xml"))}
    return [a for k, p in paths.items() for a in (f"--{k}", str(p))], paths


@pytest.mark.parametrize("schema", ["IFC2X3", "IFC4", "IFC4X3"])
def test_mixed_model_exits_0_when_the_steel_passes(tmp_path, capsys, schema) -> None:
    src = _model(tmp_path / "model.ifc", schema)
    args, paths = _outputs(tmp_path)
    assert main(["check", str(src), *args]) == 0
    out = capsys.readouterr().out
    assert "members 4: 1 pass, 0 fail, 0 not checked, 3 skipped (not steel)" in out
    assert out.rstrip().endswith("result: PASS (3 skipped, not steel)")

    report = json.loads(paths["report"].read_text())
    Report.model_validate(report)
    s = report["summary"]
    assert (s["pass"], s["fail"], s["not_checked"], s["skipped"]) == (1, 0, 0, 3)
    rows = {m["name"]: m for m in report["members"]}
    assert rows["K1"]["status"] == "skipped" and rows["K1"]["reason"] == "not steel: concrete"
    assert rows["K2"]["reason"] == "not steel: timber"
    assert rows["K3"]["reason"] == "not steel: aluminium"
    assert rows["K1"]["utilization"] is None and rows["K1"]["available_strength"] is None

    with paths["csv"].open(encoding="utf-8") as fh:
        table = list(csv.DictReader(fh))
    assert [(r["name"], r["status"], r["reason"]) for r in table] == [
        ("K1", "skipped", "not steel: concrete"), ("K2", "skipped", "not steel: timber"),
        ("K3", "skipped", "not steel: aluminium"), ("S1", "pass", "")]

    root = ET.parse(paths["junit"]).getroot()
    assert (root.get("tests"), root.get("failures"), root.get("skipped")) == ("4", "0", "3")
    skipped = [c for c in root.iter("testcase") if c.find("skipped") is not None]
    assert sorted(c.get("name").split(" [")[0] for c in skipped) == ["K1", "K2", "K3"]
    assert skipped[0].find("skipped").get("message").startswith("skipped: not steel: ")

    model = ifcopenshell.open(str(paths["out"]))
    written = {c.Name: ifcopenshell.util.element.get_psets(c)["Stanchion_ColumnCheck"]
               for c in model.by_type("IfcColumn")}
    assert written["K1"]["Status"] == "SKIPPED"
    assert written["K1"]["Reason"] == "not steel: concrete"
    assert "Utilization" not in written["K1"]
    assert written["S1"]["Status"] == "PASS"


def test_mixed_model_fails_when_the_steel_fails(tmp_path, capsys) -> None:
    # D = 600 kip: 1.4*600 = 840 kip (ASCE 7-22 §2.3.1 combination 1, by hand) > phi_c Pn
    # of W14X48 at any length (at most phi_c Fy Ag = 0.9*50*14.1 = 635 kip, AISC 360-22
    # Eq. E3-1 with Fcr <= Fy, Ag from the AISC Shapes Database v16.0): a fail; the skipped
    # columns change nothing.
    src = _model(tmp_path / "model.ifc", steel_loads={"D": 600.0})
    assert main(["check", str(src)]) == 1
    assert "result: FAIL (1 failing; 3 skipped, not steel)" in capsys.readouterr().out


@pytest.mark.parametrize("allow", [[], ["--allow-not-checked"]])
def test_concrete_only_model_exits_1_nothing_checked(tmp_path, capsys, allow) -> None:
    src = _model(tmp_path / "model.ifc", steel=False)
    args, paths = _outputs(tmp_path)
    assert main(["check", str(src), *args, *allow]) == 1  # docs/design.md §4
    captured = capsys.readouterr()
    line = "nothing was checked: all 3 members are skipped (not steel)"
    assert f"stanchion: {line}\n" in captured.err
    assert f"result: FAIL ({line})" in captured.out
    # The JUnit file alone must not read green (a failing run-level test case).
    root = ET.parse(paths["junit"]).getroot()
    assert root.get("failures") == "1" and root.get("skipped") == "3"
    failure = next(root.iter("failure"))
    assert failure.get("message") == line


def test_junit_nothing_checked_under_allow_not_checked_is_a_failure(tmp_path, capsys) -> None:
    # A steel column without loads: not checked; --allow-not-checked made it a skipped test
    # case and the JUnit file read green although the run exits 1 (item 4's JUnit case).
    b = builder_module().ModelBuilder("IFC4", "mm_N")
    mat = ifcopenshell.api.material.add_material(b.model, name="ASTM A992")
    b.column("S1", profile=b.profile("I", "W14X48", **W14X48), material=mat)
    src = b.write(tmp_path / "model.ifc")
    junit = tmp_path / "j.xml"
    assert main(["check", str(src), "--quiet", "--allow-not-checked", "--junit",
                 str(junit)]) == 1
    root = ET.parse(junit).getroot()
    assert root.get("failures") == "1"
    suite = next(s for s in root.iter("testsuite") if s.get("name") == "stanchion run")
    failure = suite.find("testcase").find("failure")
    assert failure.get("type") == "NOTHING CHECKED"
    assert failure.get("message") == "nothing was checked: the only member is not checked"


def test_skipped_is_not_a_regression_against_a_baseline(tmp_path, capsys) -> None:
    src = _model(tmp_path / "model.ifc")
    first = tmp_path / "first.json"
    assert main(["check", str(src), "--quiet", "--report", str(first)]) == 0
    # The same model again: the skipped members are no new failures nor newly not checked.
    again = tmp_path / "again.json"
    assert main(["check", str(src), "--quiet", "--baseline", str(first), "--fail-on",
                 "new-failures", "--report", str(again)]) == 0
    counts = json.loads(again.read_text())["changes"]["counts"]
    assert counts["new_failures"] == counts["new_not_checked"] == 0


def test_job_summary_counts_skipped(tmp_path) -> None:
    """The HTTP job path (worker): the summary and the report carry the skipped count."""
    job = tmp_path / "job"
    job.mkdir()
    _model(job / "model.ifc")
    (job / jobs.PARAMS_FILE).write_text(json.dumps(
        {"model": "model.ifc", "filename": "mixed.ifc", "design_method": "LRFD",
         "loads": None, "loads_filename": None}))
    result = run_job(job)
    assert result["status"] == "done", result
    assert result["summary"]["skipped"] == 3 and result["summary"]["pass"] == 1
    report = json.loads((job / jobs.REPORT_FILE).read_text())
    assert [m["status"] for m in report["members"]].count("skipped") == 3


def test_skipped_members_get_no_suggestion(tmp_path, capsys) -> None:
    # --oversized 10 asks a suggestion for every passing column: the steel one gets one, the
    # skipped ones none (they have no capacity and no demand).
    src = _model(tmp_path / "model.ifc")
    report_path = tmp_path / "r.json"
    assert main(["check", str(src), "--quiet", "--suggest", "--oversized", "10",
                 "--report", str(report_path)]) == 0
    rows = {m["name"]: m for m in json.loads(report_path.read_text())["members"]}
    assert rows["S1"].get("suggestions")
    assert all("suggestions" not in rows[k] for k in NON_STEEL)
