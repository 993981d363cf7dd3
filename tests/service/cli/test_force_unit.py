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
    model = write_model(tmp_path / "model.ifc", units="mm_only", loads=NO_LOADS)
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


def test_a_force_unit_without_a_load_table_is_refused(tmp_path, capsys) -> None:
    # it would be used nowhere: the model's own forces need their declared unit
    model, _ = _files(tmp_path)
    assert main(["check", str(model), "--force-unit", "kN"]) == 2
    err = capsys.readouterr().err.strip()
    assert len(err.splitlines()) == 1 and "--force-unit goes with --loads" in err, err


def test_a_members_file_refuses_force_unit(tmp_path, capsys) -> None:
    members = tmp_path / "m.json"
    members.write_text(json.dumps({"members": [
        {"id": "C1", "section": "W14X48", "fy": 50, "length": 16, "loads": {"D": 95}}]}))
    assert main(["check", str(members), "--force-unit", "kN"]) == 2
    assert "--force-unit applies to IFC models" in capsys.readouterr().err


def test_a_model_with_forces_and_no_force_unit_is_refused(tmp_path, capsys) -> None:
    # issue 13 item 3: its Stanchion_Loads were read in newtons (every column passed at
    # utilization <= 0.002); now exit 2, one line, nothing written.
    model = write_model(tmp_path / "model.ifc", units="mm_only")
    report = tmp_path / "r.json"
    assert main(["check", str(model), "--report", str(report)]) == 2
    err = capsys.readouterr().err.strip()
    assert len(err.splitlines()) == 1
    assert "model declares no force unit but carries forces" in err
    assert not report.exists()
