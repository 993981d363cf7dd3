"""A column load schedule keyed by grid and level (issue 15 item 2; ifc_bridge/loads.py).

Model: the 3 x 3 grid of test_grids.py in a millimetre / newton model; values in kip
(the table's columns name kip, so no model unit enters the numbers).
"""

from __future__ import annotations

import math

import ifcopenshell.api.material
import numpy as np

from stanchion.engine.loads import LoadTable
from stanchion.engine.members import LOAD_TYPES
from stanchion.ifc_bridge.read import read_columns
from tests.ifc_bridge.test_grids import add_grid

KIP = {"D": 1.0, "L": 1.0}  # both columns in kip: factor 1 to the engine's kip


def _model(b, twin: bool = False):
    add_grid(b)
    profile = b.profile("I", "W12X65", d=12.1, bf=12.0, tw=0.39, tf=0.605, r=0.6)
    steel = b.material("ASTM A992", fy=50.0)
    b.column("C1", profile=profile, material=steel, at=(360.0, 240.0))  # B-2, Level 1
    b.column("C2", profile=profile, material=steel, at=(0.0, 0.0), storey="Level 2")
    b.column("C3", profile=profile, material=steel, at=(720.0, 0.0))  # A-3, Level 1
    concrete = ifcopenshell.api.material.add_material(
        b.model, name="Structural Concrete",
        category=None if b.schema == "IFC2X3" else "concrete")
    b.column("K1", profile=b.profile("RECT", H=12.0, B=12.0), material=concrete,
             at=(720.0, 480.0), via="body")  # C-3, skipped: never listed as unmatched
    if twin:
        b.column("C1 twin", profile=profile, material=steel, at=(360.0, 240.0))
    return b


def _loads(members, name):
    i = members.name.tolist().index(name)
    return dict(zip(LOAD_TYPES, members.loads[i].tolist(), strict=True)), i


def _schedule(rows, levels):
    return LoadTable(tuple(rows), dict(KIP), "schedule.csv", tuple(levels))


def test_rows_match_by_grid_and_level(builder):
    b = _model(builder)
    table = _schedule([("B-2", {"D": 100.0, "L": 40.0}), ("A-1", {"D": 80.0})],
                      ["Level 1", "Level 2"])
    result = read_columns(b.model, loads_table=table)
    m = result.members
    c1, i1 = _loads(m, "C1")
    assert (c1["D"], c1["L"]) == (100.0, 40.0)
    assert m.extra["load_source"][i1] == "table"
    c2, _ = _loads(m, "C2")
    assert c2["D"] == 80.0 and math.isnan(c2["L"])
    c3, i3 = _loads(m, "C3")
    assert np.isnan(m.loads[i3]).all()
    # C3 matched no row; K1 (concrete, skipped) needs no loads and is not named
    assert result.messages == ["load table schedule.csv: 1 column(s) match no row: "
                               "C3 (A-3, Level 1)"]


def test_a_pair_at_the_wrong_level_or_grid_is_listed(builder):
    b = _model(builder)
    table = _schedule([("B-2", {"D": 100.0}), ("B-2", {"D": 5.0}), ("A-1", {"D": 80.0}),
                       ("Z-9", {"D": 1.0}), ("", {"D": 2.0})],
                      ["Level 2", "Level 1", "Level 2", "Level 1", "Level 1"])
    result = read_columns(b.model, loads_table=table)
    assert _loads(result.members, "C1")[0]["D"] == 5.0
    assert result.messages == [
        "load table schedule.csv: no column stands at grid / level B-2 / Level 2, "
        "Z-9 / Level 1; those rows are ignored",
        "load table schedule.csv: row(s) (no grid) / Level 1 give loads without a grid "
        "location or level; those rows are ignored",
        "load table schedule.csv: 1 column(s) match no row: C3 (A-3, Level 1)",
    ]


def test_a_pair_shared_by_two_columns_is_refused(builder):
    b = _model(builder, twin=True)
    table = _schedule([("B-2", {"D": 100.0}), ("A-1", {"D": 80.0}), ("A-3", {"D": 60.0})],
                      ["Level 1", "Level 2", "Level 1"])
    result = read_columns(b.model, loads_table=table)
    m = result.members
    for name in ("C1", "C1 twin"):  # never spread over the two, never given to one
        loads, i = _loads(m, name)
        assert math.isnan(loads["D"])
        assert m.reason[i].startswith("no loads")
    assert _loads(m, "C3")[0]["D"] == 60.0
    assert result.messages == [
        "load table schedule.csv: grid / level B-2 / Level 1 (2 columns: C1, C1 twin) match "
        "several columns; those rows are refused (loads are never spread over columns): "
        "give those columns' loads in a table keyed by element (GlobalId)"]


def test_element_tables_also_name_the_columns_without_a_row(builder):
    b = _model(builder)
    table = LoadTable((("C1", {"D": 10.0}), ("C2", {"D": 10.0})), dict(KIP), "loads.csv")
    result = read_columns(b.model, loads_table=table)
    assert result.messages == ["load table loads.csv: 1 column(s) match no row: "
                               "C3 (A-3, Level 1)"]
