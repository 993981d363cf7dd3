"""The pipeline on IFC models end to end, real files: lossless output, validity, reruns, outputs.

Expected values: 1.4D = 1.4 x 300 = 420 kips (ASCE 7-22 §2.3.1, combination 1); φcPn of a
W14X48, Fy = 50 ksi, Lc = 16 ft is 303 kips (AISC Manual Table 4-1a, 16th ed.).  Unit
conversions use pint (common practice, no source).
"""

from __future__ import annotations

import json
import xml.etree.ElementTree as ET
import zipfile

import ifcopenshell
import ifcopenshell.util.element
import ifcopenshell.validate
import jsonschema
import pandas as pd
import pytest

from stanchion.engine.units import factor
from stanchion.ifc_bridge.write import PSET_NAME
from stanchion.service.errors import InputError
from stanchion.service.members_check import check_request
from stanchion.service.reports.report import report_schema
from stanchion.service.request import MembersRequest
from tests.service.checking import check_file as check_model
from tests.service.test_model_check_files import (
    LENGTH,
    build_model,
    class_counts,
    column_guids,
    digest,
    guids,
    write_model,
)

SCHEMAS = ("IFC2X3", "IFC4", "IFC4X3")
ADDED_CLASSES = {"IfcPropertySet", "IfcPropertySingleValue", "IfcRelDefinesByProperties",
                 "IfcOwnerHistory", "IfcApplication", "IfcOrganization", "IfcSIUnit"}


def _errors(path) -> list[dict]:
    logger = ifcopenshell.validate.json_logger()
    ifcopenshell.validate.validate(str(path), logger)
    return [s for s in logger.statements if s["level"] in ("error", "ERROR")]


def _check_sets(model) -> dict[str, dict]:
    return {c.GlobalId: ifcopenshell.util.element.get_psets(c).get(PSET_NAME)
            for c in model.by_type("IfcColumn")}


@pytest.mark.parametrize("schema", SCHEMAS)
def test_checked_model_is_lossless_valid_and_rerunnable(tmp_path, schema) -> None:
    src = write_model(tmp_path / "model.ifc", schema)
    before_hash = digest(src)
    assert _errors(src) == []  # a valid input ...
    original = ifcopenshell.open(str(src))
    out = tmp_path / "checked.ifc"

    report = check_model(src, out_model=out)

    assert digest(src) == before_hash  # the input is never modified
    checked = ifcopenshell.open(str(out))
    assert guids(original).items() <= guids(checked).items()  # every GlobalId, same class
    before, after = class_counts(original), class_counts(checked)
    assert not (before - after)  # no entity of the input is lost
    assert set(after - before) <= ADDED_CLASSES
    assert (after - before)["IfcPropertySet"] == 3
    assert _errors(out) == []  # ... gives a valid output
    assert not list(tmp_path.glob(".*.tmp"))  # no temporary file left behind

    sets = _check_sets(checked)
    rows = {m["id"]: m for m in report["members"]}
    assert set(sets) == set(rows)
    for gid, props in sets.items():
        assert props["Status"] == {"pass": "PASS", "fail": "FAIL",
                                   "not_checked": "NOT CHECKED"}[rows[gid]["status"]]
    names = column_guids(checked)
    failing = sets[names["C2"]]
    # 420 kip in newton (model force unit); the report rounds to 6 significant digits
    assert failing["RequiredStrength"] == pytest.approx(420.0 * factor("kip", "newton"),
                                                        rel=1e-5)
    # the report rounds utilization to 4 significant digits
    assert failing["Utilization"] == pytest.approx(rows[names["C2"]]["utilization"], abs=1e-3)
    assert failing["DesignBasis"] == report["design_basis"]
    assert "CheckedAt" in failing
    assert sets[names["C3"]]["Reason"].startswith("no loads")

    # rerun on its own output: values replaced, nothing duplicated
    again = tmp_path / "checked2.ifc"
    check_model(out, out_model=again)
    rerun = ifcopenshell.open(str(again))
    assert class_counts(rerun) == after
    assert _errors(again) == []


def test_report_values_agree_with_the_members_path_and_handbook(tmp_path) -> None:
    src = write_model(tmp_path / "model.ifc")
    out_report = tmp_path / "r.json"
    report = check_model(src, out_report=out_report)
    written = json.loads(out_report.read_text())
    jsonschema.validate(written, report_schema())
    assert written["summary"] == {"members": 3, "pass": 1, "fail": 1, "not_checked": 1,
                                  "skipped": 0,
                                  "max_utilization": report["summary"]["max_utilization"]}
    assert written["units"] == {"force": "kip", "length": "ft", "stress": "ksi"}
    src_info = written["source"]
    assert (src_info["file"], src_info["schema"], src_info["columns"]) == ("model.ifc", "IFC4",
                                                                           3)
    by_name = {m["name"]: m for m in written["members"]}
    c2 = by_name["C2"]
    assert c2["required_strength"] == pytest.approx(420.0, abs=0.05)  # ASCE 7-22 §2.3.1 (1)
    assert c2["available_strength"] == pytest.approx(303.0, abs=1.0)  # Manual Table 4-1a
    assert c2["combination"] == "1.4D" and c2["storey"] == "Level 2" and c2["tag"] == "T1"
    assert c2["x"] == pytest.approx(20.0)  # placed at 240 in = 20 ft
    # the same member through the members-file path gives the same numbers
    req = MembersRequest.model_validate({"members": [
        {"id": "C1", "section": "W14X48", "fy": 50, "length": 16,
         "loads": {"D": 95.0, "L": 60.0, "S": 12.0}}]})
    direct = check_request(req)["members"][0]
    c1 = by_name["C1"]
    for key in ("required_strength", "available_strength", "utilization", "combination",
                "limit_state"):
        assert c1[key] == pytest.approx(direct[key], rel=1e-4) if isinstance(
            direct[key], float) else c1[key] == direct[key]


def test_si_units_convert_the_report(tmp_path) -> None:
    src = write_model(tmp_path / "model.ifc")
    us = {m["name"]: m for m in check_model(src)["members"]}
    si_report = check_model(src, units="si")
    si = {m["name"]: m for m in si_report["members"]}
    assert si_report["units"] == {"force": "kN", "length": "m", "stress": "MPa"}
    assert si["C2"]["required_strength"] == pytest.approx(
        us["C2"]["required_strength"] * factor("kip", "kilonewton"), rel=1e-5)
    assert si["C2"]["critical_stress"] == pytest.approx(
        us["C2"]["critical_stress"] * factor("ksi", "megapascal"), rel=1e-5)
    assert si["C2"]["utilization"] == us["C2"]["utilization"]


def test_csv_and_junit_read_back(tmp_path) -> None:
    src = write_model(tmp_path / "model.ifc")
    csv, junit = tmp_path / "r.csv", tmp_path / "j.xml"
    report = check_model(src, out_csv=csv, out_junit=junit)
    df = pd.read_csv(csv)
    assert list(df["id"]) == [m["id"] for m in report["members"]]
    assert list(df["status"]) == ["pass", "fail", "not_checked"]
    assert list(df["storey"]) == ["Level 1", "Level 2", "Level 2"]
    # 1.4 x 300 kip D (ASCE 7-22 §2.3.1 combination 1)
    assert df["required_strength [kip]"][1] == pytest.approx(420.0, abs=0.05)
    root = ET.parse(junit).getroot()
    suites = {s.get("name"): s for s in root.findall("testsuite")}
    assert list(suites) == ["Level 1", "Level 2"]
    assert suites["Level 2"].get("failures") == "2"  # C2 fails, C3 not checked
    assert suites["Level 1"].get("failures") == "0"
    allowed = tmp_path / "j2.xml"
    check_model(src, out_junit=allowed, allow_not_checked=True)
    level2 = [s for s in ET.parse(allowed).getroot() if s.get("name") == "Level 2"][0]
    assert (level2.get("failures"), level2.get("skipped")) == ("1", "1")


def test_load_table_supplies_missing_loads(tmp_path) -> None:
    src = write_model(tmp_path / "model.ifc")
    table = tmp_path / "loads.csv"
    table.write_text("element,D [kip]\nC3,10\n")
    report = check_model(src, loads_table=table)
    c3 = next(m for m in report["members"] if m["name"] == "C3")
    assert c3["status"] == "pass"
    assert c3["required_strength"] == pytest.approx(14.0, abs=0.01)  # 1.4 x 10, §2.3.1 (1)
    assert report["source"]["loads_table"] == "loads.csv"


def test_bad_load_table_is_one_line_and_writes_nothing(tmp_path) -> None:
    src = write_model(tmp_path / "model.ifc")
    table = tmp_path / "loads.csv"
    table.write_text("element,D [ft]\nC3,10\n")
    out, report = tmp_path / "checked.ifc", tmp_path / "report.json"
    with pytest.raises(InputError) as err:
        check_model(src, loads_table=table, out_model=out, out_report=report)
    assert "'ft' is not a force unit" in str(err.value) and "\n" not in str(err.value)
    assert not out.exists() and not report.exists()


def test_zipped_output(tmp_path) -> None:
    src = write_model(tmp_path / "model.ifc")
    out = tmp_path / "checked.ifczip"
    check_model(src, out_model=out)
    with zipfile.ZipFile(out) as zf:
        assert zf.namelist() == ["checked.ifc"]
        inner = tmp_path / "inner.ifc"
        inner.write_bytes(zf.read("checked.ifc"))
    assert all(_check_sets(ifcopenshell.open(str(inner))).values())


def test_force_unit_is_added_when_the_model_has_none(tmp_path) -> None:
    # loads from a table with units: a model without a force unit carrying forces of its own
    # is refused (tests/ifc_bridge/test_read_loads.py)
    src = write_model(tmp_path / "model.ifc", units="mm_MPa", loads={"C1": None})
    (tmp_path / "loads.csv").write_text("element,D [kip]\nC1,95\n")
    out = tmp_path / "checked.ifc"
    report = check_model(src, out_model=out, loads_table=tmp_path / "loads.csv")
    assert any("NEWTON was added" in m for m in report["messages"])
    checked = ifcopenshell.open(str(out))
    unit = ifcopenshell.util.unit.get_project_unit(checked, "FORCEUNIT")
    assert unit.Name == "NEWTON"
    assert _errors(out) == []


def test_unreadable_model_is_an_input_error_and_nothing_is_written(tmp_path) -> None:
    bad = tmp_path / "model.ifc"
    bad.write_text("this is not STEP\n")
    outs = {"out_model": tmp_path / "o.ifc", "out_report": tmp_path / "r.json",
            "out_csv": tmp_path / "r.csv", "out_junit": tmp_path / "j.xml"}
    with pytest.raises(InputError, match=r"^cannot read .*model.ifc: not an IFC file"):
        check_model(bad, **outs)
    assert not any(p.exists() for p in outs.values())


def test_output_over_the_input_is_refused(tmp_path) -> None:
    src = write_model(tmp_path / "model.ifc")
    h = digest(src)
    with pytest.raises(InputError, match="is the input file"):
        check_model(src, out_model=tmp_path / "." / "model.ifc")
    with pytest.raises(InputError, match="is the input file"):
        check_model(src, out_report=src)
    with pytest.raises(InputError, match="same file"):
        check_model(src, out_csv=tmp_path / "x.csv", out_junit=tmp_path / "x.csv")
    with pytest.raises(InputError, match=r"\.ifc or \.ifczip"):
        check_model(src, out_model=tmp_path / "checked.json")
    assert digest(src) == h


def test_baseline_adds_changes(tmp_path) -> None:
    first = tmp_path / "r1.json"
    src = write_model(tmp_path / "model.ifc")
    check_model(src, out_report=first)
    revised = write_model(tmp_path / "model2.ifc",
                          loads={"C1": {"D": 300.0}, "C2": {"D": 300.0}, "C3": None})
    # a different file has different GlobalIds: compare a file with itself revised in place
    report = check_model(revised, baseline=first)
    changes = report["changes"]
    assert changes["baseline"] == "r1.json"
    assert changes["counts"]["added"] == 3 and changes["counts"]["removed"] == 3
    jsonschema.validate(report, report_schema())


def test_include_members_checks_struts_and_writes_their_sets(tmp_path) -> None:
    b = build_model()
    profile = b.model.by_type("IfcIShapeProfileDef")[0]
    steel = b.model.by_type("IfcMaterial")[0]
    strut = b.column("S1", profile=profile, material=steel, length=LENGTH,
                     ifc_class="IfcMember", predefined_type="STRUT")
    b.loads(strut, D=10.0)
    src = b.write(tmp_path / "model.ifc")
    assert len(check_model(src)["members"]) == 3  # columns only by default
    out = tmp_path / "checked.ifc"
    report = check_model(src, include_members=True, out_model=out)
    s1 = next(m for m in report["members"] if m["name"] == "S1")
    assert s1["ifc_class"] == "IfcMember" and s1["status"] == "pass"
    assert s1["required_strength"] == pytest.approx(14.0, abs=0.01)  # 1.4D, §2.3.1 (1)
    assert report["source"]["include_members"] is True
    checked = ifcopenshell.open(str(out))
    props = ifcopenshell.util.element.get_psets(checked.by_guid(s1["id"]))[PSET_NAME]
    assert props["Status"] == "PASS"


def test_models_with_owner_histories_get_ours_in_ifc4(tmp_path) -> None:
    b = build_model("IFC4")
    person = b.model.create_entity("IfcPerson", FamilyName="Author")
    org = b.model.create_entity("IfcOrganization", Name="Office")
    user = b.model.create_entity("IfcPersonAndOrganization", ThePerson=person,
                                 TheOrganization=org)
    app = b.model.create_entity("IfcApplication", ApplicationDeveloper=org, Version="1",
                                ApplicationFullName="authoring", ApplicationIdentifier="auth")
    history = b.model.create_entity("IfcOwnerHistory", OwningUser=user, OwningApplication=app,
                                    ChangeAction="ADDED", CreationDate=0)
    b.project.OwnerHistory = history
    src = b.write(tmp_path / "model.ifc")
    out = tmp_path / "checked.ifc"
    check_model(src, out_model=out)
    checked = ifcopenshell.open(str(out))
    sets = [p for p in checked.by_type("IfcPropertySet") if p.Name == PSET_NAME]
    assert all(p.OwnerHistory.OwningApplication.ApplicationIdentifier == "stanchion"
               for p in sets)
    assert sets[0].OwnerHistory.OwningUser.ThePerson.FamilyName == "Author"
    assert _errors(out) == []
