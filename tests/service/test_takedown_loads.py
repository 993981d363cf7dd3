"""``check MODEL --takedown PROJECT.toml`` end to end (docs/design.md §5 "Load takedown").

The model (tests/service/takedown_model.py): 25 ft x 30 ft bays on grid lines x = 0, 300,
600 in and y = 0, 360, 720 in, a 60 in cantilever east of x = 600, three slab levels
(Level 2, Level 3, Roof; 6 in thick), a 60 x 100 in stair opening in the Level 2 slab inside
the interior column's cell, nine W10X49 columns per level stacked three high (12 ft each),
no loads.  Every expected load below is a hand takedown written out in this file.
"""

from __future__ import annotations

import csv
import json
import math

import ifcopenshell.api.material
import pytest

from stanchion.engine.members import LOAD_TYPES
from stanchion.service.cli import main
from stanchion.service.pipeline import CheckOptions, OutputPaths, check
from tests.ifc_bridge.conftest import SCHEMAS
from tests.service import takedown_model as tm

PROJECT = """\
units = "US"
[storeys.default]
D = 20.0
L = 50.0
[storeys."Roof"]
D = 15.0
Lr = 20.0
S = 30.0
[options]
slab_density = 150.0
live_load_reduction = true
"""

# ------------------------------------------------------------------ the hand takedown
# Tributary widths (in) of the column on grid line index i (x) and j (y): half bays, the
# east cell reaching the slab edge 60 in beyond x = 600.
WX = {0: 150.0, 1: 300.0, 2: 150.0 + 60.0}
WY = {0: 180.0, 1: 360.0, 2: 180.0}
OPENING_IN2 = 60.0 * 100.0  # the stair opening, Level 2, interior column (1, 1) only
# ASCE 7-22 Table 4.7-1 (from memory): interior 4, exterior without cantilever slabs 4,
# edge with cantilever slabs 3, corner with cantilever slabs 2.  Only the east line
# (i = 2) has the cantilever.
KLL = {(2, 0): 2.0, (2, 1): 3.0, (2, 2): 2.0}
SLAB_PSF = 150.0 * 6.0 / 12.0  # 150 pcf x 0.5 ft = 75 psf
FLOOR_D, FLOOR_L = 20.0 + SLAB_PSF, 50.0  # Level 2 and Level 3 (storeys.default)
ROOF_D, ROOF_LR, ROOF_S = 15.0 + SLAB_PSF, 20.0, 30.0
COLUMN_LB = 49.0 * 12.0  # W10X49: 49 lb/ft (AISC Shapes Database v16.0) x 12 ft


def hand(i: int, j: int, level: int) -> dict[str, float]:
    """Service loads (kip) and AT (ft²), factor of column (i, j) of ``level`` (1..3), by hand.

    Level 1 columns carry the Level 2, Level 3 and Roof slabs; Level 2 columns Level 3 and
    Roof; Level 3 columns the Roof.
    """
    cell = WX[i] * WY[j] / 144.0  # ft²
    floors = {1: ["Level 2", "Level 3"], 2: ["Level 3"], 3: []}[level]
    floor_areas = [cell - (OPENING_IN2 / 144.0 if (i, j, f) == (1, 1, "Level 2") else 0.0)
                   for f in floors]
    D = FLOOR_D * sum(floor_areas) + ROOF_D * cell + COLUMN_LB * (4 - level)
    Lo = FLOOR_L * sum(floor_areas)
    AT = sum(floor_areas)
    k = KLL.get((i, j), 4.0)
    factor = 1.0
    if floors and k * AT >= 400.0:  # ASCE 7-22 Eq. 4.7-1, limits 0.50 (one floor), 0.40
        factor = max(0.25 + 15.0 / math.sqrt(k * AT), 0.5 if len(floors) == 1 else 0.4)
    return {"D": D / 1000.0, "L": Lo * factor / 1000.0, "Lr": ROOF_LR * cell / 1000.0,
            "S": ROOF_S * cell / 1000.0, "area": cell + sum(floor_areas),
            "factor": factor if floors else math.nan}


def test_hand_takedown_worked_once():
    # The interior column at the bottom, by hand: cells 25 ft x 30 ft = 750 ft²; Level 2
    # less the opening 6,000 in² = 41.67 ft² -> 708.33 ft².  D = 95 psf x (708.33 + 750)
    # + 90 psf x 750 + 3 x 588 lb = 138,541.7 + 67,500 + 1,764 = 207,805.7 lb.
    # L: KLL AT = 4 x 1,458.33 = 5,833.3 ft², factor 0.25 + 15 / 76.376 = 0.4464 (>= 0.40
    # for two floors): 0.4464 x 50 x 1,458.33 = 32,550 lb.
    got = hand(1, 1, 1)
    assert got["D"] == pytest.approx(207.8057, rel=1e-5)
    assert got["factor"] == pytest.approx(0.44640, rel=1e-4)
    assert got["L"] == pytest.approx(32.550, rel=1e-3)


def _write(tmp_path, schema: str, text: str = PROJECT, edit=None):
    b, columns = tm.build(schema)
    if edit is not None:
        edit(b, columns)
    model = b.write(tmp_path / f"takedown_{schema}.ifc")
    project = tmp_path / "project.toml"
    project.write_text(text, encoding="utf-8")
    return model, project


@pytest.mark.parametrize("schema", SCHEMAS)
def test_every_column_gets_the_hand_takedown_within_one_percent(tmp_path, schema):
    model, project = _write(tmp_path, schema)
    run = check(model, CheckOptions(takedown=project),
                OutputPaths(report=tmp_path / "r.json", csv=tmp_path / "r.csv"))
    members, report = run.members, run.report
    assert len(members) == 27
    rows = {r["name"]: r for r in report["members"]}
    for n, name in enumerate(members.name):
        i, j, level = int(name[2]), int(name[3]), int(name[5])
        want = hand(i, j, level)
        got = dict(zip(LOAD_TYPES, members.loads[n], strict=True))
        for kind in ("D", "L", "Lr", "S"):
            assert got[kind] == pytest.approx(want[kind], rel=0.01, abs=1e-9), (name, kind)
        row = rows[name]
        assert row["status"] == "pass", (name, row.get("reason"))
        assert row["load_source"] == "takedown"
        assert row["tributary_area"] == pytest.approx(want["area"], rel=0.01)  # ft² (us)
        if math.isnan(want["factor"]):
            assert row["llr_factor"] is None
        else:
            assert row["llr_factor"] == pytest.approx(want["factor"], rel=0.01)
        text = " ".join(row["messages"])
        assert "gravity load takedown" in text and "Lr not reduced (ASCE 7-22 §4.8" in text
    assert "L reduced by ASCE 7-22 §4.7: factor 0.45 (KLL = 4, AT = 1,458 ft² over 2 floors)" \
        in rows["C-11-1"]["messages"]
    assert report["source"]["takedown"] == "project.toml"
    assert any(m.startswith("load takedown project.toml: loads of 27 of the 27")
               for m in report["messages"])
    saved = json.loads((tmp_path / "r.json").read_text(encoding="utf-8"))
    assert {m["load_source"] for m in saved["members"]} == {"takedown"}
    with (tmp_path / "r.csv").open(encoding="utf-8") as f:
        table = list(csv.DictReader(f))
    assert {r["load_source"] for r in table} == {"takedown"}


def test_si_report_gives_the_area_in_square_metres(tmp_path):
    model, project = _write(tmp_path, "IFC4")
    report = check(model, CheckOptions(takedown=project, units="si")).report
    row = next(r for r in report["members"] if r["name"] == "C-11-1")
    # 2,208.33 ft² x 0.09290304 m²/ft² (exact definition of the foot) = 205.16 m²
    assert row["tributary_area"] == pytest.approx(hand(1, 1, 1)["area"] * 0.09290304,
                                                  rel=1e-4)


def test_a_column_with_its_own_loads_keeps_them(tmp_path):
    def own(b, columns):
        b.loads(columns["C-11-3"], D=10.0, L=5.0)

    model, project = _write(tmp_path, "IFC4", edit=own)
    run = check(model, CheckOptions(takedown=project))
    rows = {r["name"]: r for r in run.report["members"]}
    n = list(run.members.name).index("C-11-3")
    assert run.members.loads[n][LOAD_TYPES.index("D")] == pytest.approx(10.0)
    assert run.members.loads[n][LOAD_TYPES.index("L")] == pytest.approx(5.0)
    assert rows["C-11-3"]["load_source"] == "pset"
    assert "tributary_area" not in rows["C-11-3"]
    # the column below still gets the takedown of the slabs, and says it ignores those loads
    below = rows["C-11-2"]
    assert below["load_source"] == "takedown"
    assert any("the column above (C-11-3) has loads of its own" in m
               for m in below["messages"])
    n2 = list(run.members.name).index("C-11-2")
    assert run.members.loads[n2][LOAD_TYPES.index("D")] == pytest.approx(
        hand(1, 1, 2)["D"], rel=0.01)


def test_an_unreadable_slab_leaves_its_columns_and_those_below_not_checked(tmp_path):
    def tilt(b, columns):
        slab = next(s for s in b.model.by_type("IfcSlab") if s.Name == "slab Level 3")
        solid = slab.Representation.Representations[0].Items[0]
        solid.ExtrudedDirection = b.model.create_entity("IfcDirection", (0.0, 0.6, 0.8))

    model, project = _write(tmp_path, "IFC4", edit=tilt)
    rows = {r["name"]: r for r in check(model, CheckOptions(takedown=project)
                                        ).report["members"]}
    for name, r in rows.items():
        if name.endswith("-3"):  # carry the Roof only
            assert r["status"] == "pass" and r["load_source"] == "takedown"
        else:  # Level 2 columns carry the unread slab; Level 1 columns stand beneath them
            assert r["status"] == "not_checked" and r["load_source"] == "none"
            assert "no loads" in r["reason"] and "slab Level 3" in r["reason"]
            assert "a slab of Level 3 could not be read" in r["reason"]
            assert "not vertical" in r["reason"]


def test_a_column_whose_top_is_at_no_storey_gets_no_takedown(tmp_path):
    def post(b, columns):
        profile = b.model.by_type("IfcIShapeProfileDef")[0]
        col = b.column("P-1", profile=profile, material=b.model.by_type("IfcMaterial")[0],
                       length=100.0, storey="Level 1", at=(150.0, 180.0))
        col.ObjectPlacement = tm._placement(b, 150.0, 180.0, 0.0)

    model, project = _write(tmp_path, "IFC4", edit=post)
    rows = {r["name"]: r for r in check(model, CheckOptions(takedown=project)
                                        ).report["members"]}
    assert rows["P-1"]["status"] == "not_checked"
    assert "is at no storey's elevation" in rows["P-1"]["reason"]
    assert rows["C-11-1"]["status"] == "pass"  # the post takes no part in the cells


def test_bad_project_file_exits_2_with_one_line(tmp_path, capsys):
    model, project = _write(tmp_path, "IFC4", text='units = "SI"\n[storeys.default]\nL = "x"\n'
                            '[options]\nslab_density = 24.0\n')
    report = tmp_path / "r.json"
    code = main(["check", str(model), "--takedown", str(project), "--report", str(report)])
    err = capsys.readouterr().err
    assert code == 2
    assert len(err.strip().splitlines()) == 1
    assert err.startswith("stanchion: takedown project project.toml: storeys.default.L")
    assert not report.exists()


def test_missing_project_file_and_members_file_are_refused(tmp_path, capsys):
    model, _ = _write(tmp_path, "IFC4")
    assert main(["check", str(model), "--takedown", str(tmp_path / "none.toml")]) == 2
    err = capsys.readouterr().err
    assert len(err.strip().splitlines()) == 1 and "none.toml" in err
    members = tmp_path / "members.json"
    members.write_text("{}", encoding="utf-8")
    assert main(["check", str(members), "--takedown", str(tmp_path / "p.toml")]) == 2
    assert "--takedown applies to IFC models" in capsys.readouterr().err


def test_members_not_of_steel_are_left_out(tmp_path):
    def concrete(b, columns):
        profile = b.profile("RECT", "300x300", H=12.0, B=12.0)
        mat = ifcopenshell.api.material.add_material(b.model, name="Concrete C30/37")
        col = b.column("K-1", profile=profile, material=mat,
                       length=tm.HEIGHT, storey="Level 1", at=(150.0, 180.0), via="body")
        col.ObjectPlacement = tm._placement(b, 150.0, 180.0, 0.0)  # on the foundation

    model, project = _write(tmp_path, "IFC4", edit=concrete)
    report = check(model, CheckOptions(takedown=project)).report
    rows = {r["name"]: r for r in report["members"]}
    assert rows["K-1"]["status"] == "skipped" and rows["K-1"]["load_source"] == "none"
    # (it shares the Level 2 slab with the steel columns beside it, which still get loads)
    assert any(m.startswith("load takedown project.toml: loads of 27 of the 27 member(s)")
               for m in report["messages"])
