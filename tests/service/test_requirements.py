"""The IDS of the data a check needs (`stanchion requirements`) and `check MODEL --ids`
(service/requirements.py, ifc_bridge/ids_check.py; docs/design.md §3, §4)."""

from __future__ import annotations

import json
import re
from pathlib import Path

import pytest
from elementpath.regex import translate_pattern
from ifctester import ids as ids_module

from stanchion.engine.grades import GRADES
from stanchion.service.cli import main
from stanchion.service.reports.report import report_schema
from stanchion.service.requirements import GRADE_NAMES, STEEL_WORDS, requirements_text
from tests.ifc_bridge.conftest import SCHEMAS
from tests.service.test_model_check_files import LENGTH, W14X48, builder_module

SAMPLES = Path(__file__).resolve().parents[2] / "sample_models"


def _xsd(pattern: str) -> re.Pattern[str]:
    """An IDS pattern as ifctester matches it (XML Schema regex, whole value)."""
    return re.compile(translate_pattern(pattern, back_references=False,
                                        lazy_quantifiers=False, anchors=False))


def test_requirements_prints_an_ids_that_the_ids_1_0_schema_accepts(tmp_path, capsys) -> None:
    assert main(["requirements"]) == 0
    text = capsys.readouterr().out
    assert text.startswith("<?xml")
    printed = tmp_path / "printed.ids"
    printed.write_text(text, encoding="utf-8")
    # ifctester's copy of the IDS 1.0 XSD; raises when the document is not valid against it.
    ids_module.get_schema().validate(str(printed))
    document = ids_module.open(str(printed), validate=True)
    assert [s.name for s in document.specifications] == [
        "Columns carry a material", "Steel columns name a grade or a stress",
        "Steel columns' load properties are forces", "Column design inputs are typed"]
    assert text.count('identifier="stanchion-') == 4
    loads = document.specifications[2]
    assert {f.baseName: f.cardinality for f in loads.requirements}["D"] == "optional"


def test_loads_in_psets_requires_D_and_o_writes_the_same_text(tmp_path, capsys) -> None:
    out = tmp_path / "needs.ids"
    assert main(["requirements", "--loads-in-psets", "-o", str(out)]) == 0
    assert capsys.readouterr().out == ""
    assert out.read_text(encoding="utf-8") == requirements_text(loads_required=True)
    document = ids_module.open(str(out), validate=True)
    loads = document.specifications[2]
    assert {f.baseName: f.cardinality for f in loads.requirements}["D"] == "required"
    assert not list(tmp_path.glob(".*.tmp"))  # atomic: no temporary file left


def test_requirements_into_a_folder_is_one_line_exit_2(tmp_path, capsys) -> None:
    assert main(["requirements", "-o", str(tmp_path)]) == 2
    err = capsys.readouterr().err
    assert err.startswith("stanchion: cannot write") and err.count("\n") == 1


@pytest.mark.parametrize("grade", GRADES, ids=lambda g: g.name)
def test_every_grade_of_the_grade_table_matches_the_grade_pattern(grade) -> None:
    # The IDS pattern approximates engine/grades.py: each row's own name must pass it.
    assert _xsd(GRADE_NAMES).fullmatch(grade.name), grade.name


@pytest.mark.parametrize("name, steel, graded", [
    ("Steel", True, False), ("Structural Steel", True, False),
    ("Metal - Steel", True, False), ("Metal - Steel - 345 MPa", True, True),
    ("Baustahl S235", True, True), ("ASTM A992", False, True), ("Concrete C30/37", False, False),
    ("Aluminum", False, False), ("STEEL/S275J0", True, True), ("Steel 50 ksi", True, True),
])
def test_steel_and_grade_patterns(name, steel, graded) -> None:
    # Common practice, no source: names seen in models (docs/design.md §5, material class).
    assert bool(_xsd(STEEL_WORDS).fullmatch(name)) is steel
    assert bool(_xsd(GRADE_NAMES).fullmatch(name)) is graded


def _model(tmp_path: Path, schema: str) -> tuple[Path, dict[str, str]]:
    """C1 meets everything (ASTM A992, Stanchion_Loads); C2's material says only 'Steel';
    C3 has no material; C4's Stanchion_Design.UnbracedLengthX is an IfcReal."""
    b = builder_module().ModelBuilder(schema, "mm_N")
    profile = b.profile("I", "W14X48", **W14X48)
    graded, plain = b.material("ASTM A992", fy=50.0), b.material("Steel")
    c1 = b.column("C1", profile=profile, material=graded, length=LENGTH)
    c2 = b.column("C2", profile=profile, material=plain, length=LENGTH, at=(240.0, 0.0))
    b.column("C3", profile=profile, material=None, length=LENGTH, at=(480.0, 0.0), via="body")
    c4 = b.column("C4", profile=profile, material=graded, length=LENGTH, at=(720.0, 0.0))
    for col in (c1, c2, c4):
        b.loads(col, D=95.0, L=60.0)
    b.pset(c4, "Stanchion_Design", {"UnbracedLengthX": b.measure("IfcReal", 100.0)})
    guids = {c.Name: c.GlobalId for c in b.model.by_type("IfcColumn")}
    return b.write(tmp_path / f"ids_{schema}.ifc"), guids


@pytest.mark.parametrize("schema", SCHEMAS)
def test_check_with_ids_reports_what_each_column_misses(tmp_path, schema, capsys) -> None:
    model, _ = _model(tmp_path, schema)
    needs, report_path = tmp_path / "needs.ids", tmp_path / "r.json"
    assert main(["requirements", "-o", str(needs)]) == 0
    without = main(["check", str(model), "--quiet"])
    code = main(["check", str(model), "--ids", str(needs), "--report", str(report_path)])
    assert code == without  # the IDS never changes the exit code
    report = json.loads(report_path.read_text())
    import jsonschema

    jsonschema.validate(report, report_schema())
    section = report["requirements"]
    assert section["ids"] == "needs.ids"
    passed = [s["passed"] for s in section["specifications"]]
    assert passed == [False, False, True, False]  # material, grade, loads, design inputs
    missing = {m["name"]: m["requirements"] for m in report["members"]}
    assert missing["C1"] == []
    assert [t.split(":")[0] for t in missing["C2"]] == ["Steel columns name a grade or a stress"]
    assert [t.split(":")[0] for t in missing["C3"]] == ["Columns carry a material"]
    assert [t.split(":")[0] for t in missing["C4"]] == ["Column design inputs are typed"]
    assert "UnbracedLengthX" in missing["C4"][0]
    assert section["members_missing"] == 3
    printed = capsys.readouterr().out
    assert "IDS needs.ids: 1 of 4 specifications met, 3 member(s) miss data" in printed
    assert "  C2: Steel columns name a grade or a stress" in printed


def test_sample_model_misses_exactly_the_grade_of_its_ungraded_column(tmp_path) -> None:
    # workshop_annex.ifc (sample_models/README.md) has one column of plain 'Steel' (grade to
    # be confirmed): the check leaves it not checked for its grade, the IDS names it.
    needs, report_path = tmp_path / "needs.ids", tmp_path / "r.json"
    main(["requirements", "-o", str(needs)])
    main(["check", str(SAMPLES / "workshop_annex.ifc"), "--ids", str(needs), "--report",
          str(report_path), "--quiet"])
    report = json.loads(report_path.read_text())
    flagged = {m["id"] for m in report["members"] if m["requirements"]}
    ungraded = {m["id"] for m in report["members"] if "names no grade" in (m.get("reason") or "")}
    assert flagged == ungraded and len(flagged) == 1


def test_ids_is_refused_for_members_files_and_bad_documents(tmp_path, capsys) -> None:
    members = tmp_path / "m.json"
    members.write_text('{"members": [{"id": "C1", "section": "W14X48", "fy": 50, '
                       '"length": 16, "loads": {"D": 10}}]}')
    needs = tmp_path / "needs.ids"
    main(["requirements", "-o", str(needs)])
    capsys.readouterr()
    assert main(["check", str(members), "--ids", str(needs)]) == 2
    assert "--ids applies to IFC models" in capsys.readouterr().err
    model, _ = _model(tmp_path, "IFC4")
    out = tmp_path / "r.json"
    bad = tmp_path / "bad.ids"
    bad.write_text("<ids><nothing/></ids>")
    for given, words in ((bad, "not a valid IDS 1.0 document"), (tmp_path / "none.ids",
                                                                 "no such file")):
        assert main(["check", str(model), "--ids", str(given), "--report", str(out)]) == 2
        err = capsys.readouterr().err
        assert words in err and err.count("\n") == 1, err
        assert not out.exists()


def test_an_ifctester_failure_is_one_line(tmp_path, capsys, monkeypatch) -> None:
    model, _ = _model(tmp_path, "IFC4")
    needs = tmp_path / "needs.ids"
    main(["requirements", "-o", str(needs)])

    def broken(model, ids):
        raise KeyError("IfcSomething")

    monkeypatch.setattr("stanchion.ifc_bridge.ids_check.validate_ids", broken)
    out = tmp_path / "r.json"
    assert main(["check", str(model), "--ids", str(needs), "--report", str(out)]) == 2
    err = capsys.readouterr().err
    assert "ifctester could not validate the model" in err and err.count("\n") == 1
    assert not out.exists()
