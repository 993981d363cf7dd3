"""``stanchion check model.ifc --loads T.csv [--force-unit U]``: units are never guessed.

issue 13 item 3: 14 of 17 real models declare no force unit, and a load table without a unit
in its header (D = 100 meaning kN) was read in newtons: PASS at utilization 0.0001, exit 0.
The standard test model (tests/service/test_model_check_files.py): W14X48 columns, Fy 50 ksi,
16 ft; here in millimetres with no force unit declared and no loads of its own.
"""

from __future__ import annotations

import json

import pytest

from stanchion.service.cli import main
from tests.service.test_model_check_files import write_model

NO_LOADS = {"C1": None, "C2": None}


def _files(tmp_path, header: str = "element,D"):
    model = write_model(tmp_path / "model.ifc", units="mm_MPa", loads=NO_LOADS)
    table = tmp_path / "loads.csv"
    table.write_text(f"{header}\nC1,100\nC2,100\n")
    return model, table


def test_a_table_without_units_is_refused_with_the_fix(tmp_path, capsys) -> None:
    model, table = _files(tmp_path)
    report = tmp_path / "r.json"
    assert main(["check", str(model), "--loads", str(table), "--report", str(report)]) == 2
    err = capsys.readouterr().err.strip()
    assert len(err.splitlines()) == 1
    assert "name no unit and the model declares no force unit" in err
    assert "'D [kN]'" in err and "--force-unit" in err
    assert not report.exists()


@pytest.mark.parametrize("args", [["--force-unit", "kN"], []])
def test_the_unit_from_the_option_or_the_header_is_used(tmp_path, args) -> None:
    model, table = _files(tmp_path, "element,D" if args else "element,D [kN]")
    report = tmp_path / "r.json"
    assert main(["check", str(model), "--loads", str(table), "--report", str(report),
                 "--quiet", *args]) == 0
    members = json.loads(report.read_text())["members"]
    # 1.4D = 1.4 × 100 kN / 4.4482216 kN per kip = 31.47 kip (ASCE 7-22 §2.3.1 comb. 1);
    # φcPn = 303 kip (W14X48, Fy 50 ksi, Lc 16 ft: AISC Manual Table 4-1a, read-off).
    assert [m["utilization"] for m in members] == pytest.approx([31.47 / 303] * 2, rel=0.01)


def test_a_force_unit_that_is_not_a_force_is_refused(tmp_path, capsys) -> None:
    model, table = _files(tmp_path)
    assert main(["check", str(model), "--loads", str(table), "--force-unit", "m"]) == 2
    err = capsys.readouterr().err.strip()
    assert len(err.splitlines()) == 1 and "--force-unit: 'm' is not a force unit" in err, err


def test_a_members_file_refuses_force_unit(tmp_path, capsys) -> None:
    members = tmp_path / "m.json"
    members.write_text(json.dumps({"members": [
        {"id": "C1", "section": "W14X48", "fy": 50, "length": 16, "loads": {"D": 95}}]}))
    assert main(["check", str(members), "--force-unit", "kN"]) == 2
    assert "--force-unit applies to IFC models" in capsys.readouterr().err


def test_a_model_with_forces_and_no_force_unit_is_refused(tmp_path, capsys) -> None:
    # issue 13 item 3: its Stanchion_Loads were read in newtons (every column passed at
    # utilization <= 0.002); now exit 2, one line, nothing written.
    model = write_model(tmp_path / "model.ifc", units="mm_MPa")
    report = tmp_path / "r.json"
    assert main(["check", str(model), "--report", str(report)]) == 2
    err = capsys.readouterr().err.strip()
    assert len(err.splitlines()) == 1
    assert "model declares no force unit but carries forces" in err
    assert "--force-unit" in err  # the fix on the command line
    assert not report.exists()


#: Newtons per kip: 1000 lbf of 4.4482216152605 N (NIST SP 811, exact by definition).
N_PER_KIP = 4448.2216152605


def test_a_model_without_a_force_unit_is_read_in_the_given_unit(tmp_path, capsys) -> None:
    # Stanchion_Loads D = 100 in a millimetre model without a force unit, meaning kN
    import ifcopenshell
    import ifcopenshell.util.element
    import ifcopenshell.util.unit

    model = write_model(tmp_path / "model.ifc", units="mm_MPa",
                        loads={"C1": {"D": 100 / N_PER_KIP}, "C2": {"D": 100 / N_PER_KIP}})
    report, csv, out = tmp_path / "r.json", tmp_path / "r.csv", tmp_path / "checked.ifc"
    junit = tmp_path / "j.xml"
    assert main(["check", str(model), "--force-unit", "kN", "--report", str(report),
                 "--csv", str(csv), "--junit", str(junit), "--out", str(out)]) == 0
    terminal = capsys.readouterr().out
    body = json.loads(report.read_text())
    # 1.4D = 1.4 x 100 kN / 4.4482216 kN per kip = 31.47 kip (ASCE 7-22 §2.3.1 comb. 1);
    # φcPn = 303 kip (W14X48, Fy 50 ksi, Lc 16 ft: AISC Manual Table 4-1a, read-off)
    assert [m["utilization"] for m in body["members"]] == pytest.approx([31.47 / 303] * 2,
                                                                         rel=0.01)
    said = "read in kN, the unit given on the command line (--force-unit)"
    assert any(said in m for m in body["messages"]) and said in terminal
    note = "force read in kN, given on the command line (--force-unit)"
    assert all(note in m["messages"] for m in body["members"])
    assert csv.read_text().count(note) == 2 and junit.read_text().count(note) == 2
    assert any("KILO NEWTON, the unit given on the command line (--force-unit), was added"
               in m for m in body["messages"])
    checked = ifcopenshell.open(str(out))
    unit = ifcopenshell.util.unit.get_project_unit(checked, "FORCEUNIT")
    assert (unit.Prefix, unit.Name) == ("KILO", "NEWTON")
    col = next(c for c in checked.by_type("IfcColumn") if c.Name == "C1")
    props = ifcopenshell.util.element.get_psets(col)["Stanchion_ColumnCheck"]
    # the required strength written in the added unit: 1.4 x 100 kN = 140 kN
    assert props["RequiredStrength"] == pytest.approx(140.0, rel=1e-6)
    assert note in props["Notes"]
    # the model's own forces keep the meaning they were read with
    loads = ifcopenshell.util.element.get_psets(col)["Stanchion_Loads"]
    assert loads["D"] == pytest.approx(100.0, rel=1e-9)


def test_a_given_unit_beyond_n_kn_mn_is_added_as_a_conversion_unit(tmp_path) -> None:
    import ifcopenshell
    import ifcopenshell.util.unit

    model = write_model(tmp_path / "model.ifc", units="mm_MPa",
                        loads={"C1": {"D": 100 / N_PER_KIP}, "C2": None})
    out = tmp_path / "checked.ifc"
    assert main(["check", str(model), "--force-unit", "kip", "--out", str(out),
                 "--quiet"]) == 1  # C2 has no loads: not checked
    unit = ifcopenshell.util.unit.get_project_unit(ifcopenshell.open(str(out)), "FORCEUNIT")
    assert unit.is_a("IfcConversionBasedUnit") and unit.Name == "kip"
    # 1 kip = 4448.2216152605 N (NIST SP 811)
    assert unit.ConversionFactor.ValueComponent.wrappedValue == pytest.approx(N_PER_KIP)
    assert ifcopenshell.util.unit.get_unit_scale(unit) == pytest.approx(N_PER_KIP)


def test_a_model_that_declares_its_force_unit_is_read_in_it(tmp_path) -> None:
    # --force-unit never overrides a declared unit: the run says the option was not used
    model = write_model(tmp_path / "model.ifc", units="mm_N")
    report = tmp_path / "r.json"
    plain = tmp_path / "plain.json"
    main(["check", str(model), "--force-unit", "kip", "--report", str(report), "--quiet"])
    main(["check", str(model), "--report", str(plain), "--quiet"])
    body = json.loads(report.read_text())
    assert ("the model declares its force unit (NEWTON): its forces are read in it, not in "
            "kip (--force-unit)") in body["messages"]
    # the same strengths as without the option (the loads were read in newtons both times)
    without = json.loads(plain.read_text())["members"]
    assert [m["required_strength"] for m in body["members"]] == [
        m["required_strength"] for m in without]
    assert body["members"][0]["required_strength"] > 100  # kip: newtons read as kip are not
