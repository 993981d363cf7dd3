"""``stanchion check model.ifc --default-grade GRADE`` (issue 14, Grades).

A column whose material names steel but no grade ("Steel") is not checked, the reason naming
the material; with ``--default-grade A992`` it is checked at Fy = 50 ksi (ASTM A992/A992M)
and the assumption is stated in the terminal, the report (run messages, design basis, the
member's messages and ``fy_source``), the CSV, the JUnit file and the checked model's Notes
and DesignBasis.  A column without a material is never assumed steel.  An unknown grade is
refused before anything is read: exit 2, one line.
"""

from __future__ import annotations

import csv
import json
import xml.etree.ElementTree as ET

import ifcopenshell
import ifcopenshell.api.material
import ifcopenshell.util.element
import pytest

from stanchion.service.cli import main
from tests.service.test_model_check_files import W14X48, builder_module

ASSUMED = "Fy = 50 ksi from --default-grade A992 (assumed: the material names no grade"


def _model(tmp_path):
    """C1 'Steel' (no grade), C2 'ASTM A36', C3 without material; D = 100 kip each, 16 ft."""
    b = builder_module().ModelBuilder("IFC4", "mm_N")
    profile = b.profile("I", "W14X48", **W14X48)
    steel = ifcopenshell.api.material.add_material(b.model, name="Steel")
    a36 = ifcopenshell.api.material.add_material(b.model, name="ASTM A36")
    for k, (name, mat) in enumerate((("C1", steel), ("C2", a36), ("C3", None))):
        col = b.column(name, profile=profile, material=mat, length=192.0, at=(240.0 * k, 0))
        b.loads(col, D=100.0)
    return b.write(tmp_path / "model.ifc")


def _outputs(tmp_path):
    return {"--report": tmp_path / "r.json", "--csv": tmp_path / "r.csv",
            "--junit": tmp_path / "j.xml", "--out": tmp_path / "checked.ifc"}


def test_without_it_steel_naming_no_grade_is_not_checked(tmp_path) -> None:
    outs = _outputs(tmp_path)
    args = [x for kv in outs.items() for x in map(str, kv)]
    assert main(["check", str(_model(tmp_path)), *args, "--quiet"]) == 1
    members = {m["name"]: m for m in json.loads(outs["--report"].read_text())["members"]}
    assert members["C1"]["status"] == "not_checked"
    assert members["C1"]["reason"].startswith(
        "no yield strength: material 'Steel' names no grade")


def test_default_grade_is_applied_and_stated_everywhere(tmp_path, capsys) -> None:
    outs = _outputs(tmp_path)
    args = [x for kv in outs.items() for x in map(str, kv)]
    main(["check", str(_model(tmp_path)), *args, "--default-grade", "A992"])
    terminal = capsys.readouterr().out
    report = json.loads(outs["--report"].read_text())
    members = {m["name"]: m for m in report["members"]}
    c1 = members["C1"]
    # W14X48, Fy 50 ksi, Lc 16 ft: φcPn = 303 kip (AISC Manual Table 4-1a, read-off);
    # 1.4D = 140 kip (ASCE 7-22 §2.3.1 comb. 1): a pass at 140 / 303 = 0.46
    assert c1["status"] == "pass"
    assert c1["utilization"] == pytest.approx(140 / 303, rel=0.01)
    assert c1["fy_source"] == "default_grade"
    assert any(m.startswith(ASSUMED) for m in c1["messages"])
    # a material naming its grade keeps it (ASTM A36: 36 ksi); no material: not assumed
    assert members["C2"]["fy_source"] == "grade"
    assert members["C3"]["status"] == "not_checked"
    assert members["C3"]["fy_source"] == "none"
    # the run: a message and the design basis
    assert any(m.startswith("--default-grade A992 assumed for 1 member(s)")
               for m in report["messages"])
    assert report["design_basis"].endswith("assumed from --default-grade A992")
    assert "--default-grade A992 assumed for 1 member(s)" in terminal
    # CSV and JUnit carry the member's messages; JUnit the design basis too
    rows = {r["name"]: r for r in csv.DictReader(outs["--csv"].open(encoding="utf-8"))}
    assert ASSUMED in rows["C1"]["messages"]
    junit = outs["--junit"].read_text(encoding="utf-8")
    assert ASSUMED in junit and "assumed from --default-grade A992" in junit
    ET.fromstring(junit)  # well formed
    # the checked model: Notes and DesignBasis
    model = ifcopenshell.open(str(outs["--out"]))
    col = next(c for c in model.by_type("IfcColumn") if c.Name == "C1")
    check = ifcopenshell.util.element.get_psets(col)["Stanchion_ColumnCheck"]
    assert ASSUMED in check["Notes"]
    assert check["DesignBasis"].endswith("assumed from --default-grade A992")


def test_a_default_grade_no_member_needs_is_said_unused(tmp_path, capsys) -> None:
    b = builder_module().ModelBuilder("IFC4", "mm_N")
    col = b.column("C1", profile=b.profile("I", "W14X48", **W14X48),
                   material=b.material("ASTM A992"), length=192.0)
    b.loads(col, D=100.0)
    report = tmp_path / "r.json"
    main(["check", str(b.write(tmp_path / "m.ifc")), "--report", str(report), "--quiet",
          "--default-grade", "S355"])
    data = json.loads(report.read_text())
    assert any(m.startswith("--default-grade S355 was not used") for m in data["messages"])
    assert "default-grade" not in data["design_basis"]


@pytest.mark.parametrize("grade", ["A999", "Steel", "", "S999"])
def test_an_unknown_grade_is_refused_in_one_line(tmp_path, capsys, grade) -> None:
    report = tmp_path / "r.json"
    code = main(["check", str(_model(tmp_path)), "--report", str(report),
                 "--default-grade", grade])
    err = capsys.readouterr().err.strip()
    assert code == 2 and len(err.splitlines()) == 1
    assert err.startswith(f"stanchion: --default-grade: {grade!r} names no grade"), err
    assert not report.exists()


def test_a_members_file_refuses_it(tmp_path, capsys) -> None:
    members = tmp_path / "m.json"
    members.write_text(json.dumps({"members": [
        {"id": "C1", "section": "W14X48", "fy": 50, "length": 16, "loads": {"D": 95}}]}))
    assert main(["check", str(members), "--default-grade", "A992"]) == 2
    assert "--default-grade applies to IFC models" in capsys.readouterr().err
