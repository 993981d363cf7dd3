"""Gravity load takedown down a stack of levels (engine.takedown), checked by hand."""

from __future__ import annotations

import dataclasses

import numpy as np
import pytest
import shapely

from stanchion.engine.members import LOAD_TYPES
from stanchion.engine.takedown import (
    Level,
    LevelLoads,
    SlabPiece,
    TakedownOptions,
    steel_weight,
    takedown,
)

FT = 12.0  # in per ft
PSF = 1.0 / 144_000.0  # ksi per psf (1 lbf/ft² = 1/144 psi)
PCF = 1.0 / 1000.0 / 1728.0  # kip/in³ per lbf/ft³
LINES = np.array([0.0, 30.0, 60.0, 90.0]) * FT
GRID = np.array([(x, y) for y in LINES for x in LINES])  # index = 4 * row + column
CORNER, EDGE, INTERIOR = 0, 1, 5  # (0, 0), (30, 0), (30, 30) ft
SLAB = SlabPiece(shapely.box(0, 0, 90 * FT, 90 * FT), 6.0)  # 6 in: 150 pcf x 0.5 ft = 75 psf
FLOOR = LevelLoads(D=15 * PSF, L=50 * PSF, slab_density=150 * PCF, live_load_reduction=True)
ROOF = LevelLoads(D=10 * PSF, Lr=20 * PSF, S=30 * PSF, slab_density=150 * PCF,
                  live_load_reduction=True)
D, L, LR, S = (LOAD_TYPES.index(k) for k in ("D", "L", "Lr", "S"))


def level(name, elevation_ft, loads, xy=GRID, length_ft=14.0, weight=65.0):
    n = len(xy)
    return Level(name, elevation_ft * FT, [SLAB], [f"{name}-{i}" for i in range(n)],
                 np.asarray(xy, float), np.full(n, weight), np.full(n, length_ft * FT), loads)


def three_storeys(**floor_changes):
    floor = dataclasses.replace(FLOOR, **floor_changes)
    # given out of order on purpose: levels are sorted by elevation
    return [level("Roof", 42, ROOF), level("L1", 14, floor), level("L2", 28, floor)]


def row(t, name):
    return int(np.flatnonzero(t.ids == name)[0])


def test_three_storeys_with_self_weight_by_hand():
    t = takedown(three_storeys())
    assert t.level_names == ("L1", "L2", "Roof")
    # Interior column under L1 (30, 30) ft carries L1, L2 and the roof, 900 ft² each.
    # Hand computation (lb):
    #   D  = (15 + 75) x 900 x 2 floors + (10 + 75) x 900 roof + 65 lb/ft x 14 ft x 3 columns
    #      = 162,000 + 76,500 + 2,730 = 241,230 lb = 241.23 kip
    #   L  : Lo AT = 50 x 900 x 2 = 90,000 lb; KLL AT = 4 x 1,800 = 7,200 ft²;
    #        0.25 + 15 / sqrt(7,200) = 0.42678 (ASCE 7-22 Eq. 4.7-1, >= 0.40 for 2 floors)
    #        L = 90,000 x 0.42678 = 38,410 lb
    #   Lr = 20 x 900 = 18,000 lb (not reduced); S = 30 x 900 = 27,000 lb
    i = row(t, "L1-5")
    assert t.loads[i, D] == pytest.approx(241.23)
    assert t.loads[i, L] == pytest.approx(90.0 * (0.25 + 15 / np.sqrt(7200)))
    assert t.loads[i, L] == pytest.approx(38.410, abs=1e-3)
    assert t.loads[i, LR] == pytest.approx(18.0)
    assert t.loads[i, S] == pytest.approx(27.0)
    assert np.isnan(t.loads[i, [LOAD_TYPES.index(k) for k in ("R", "W", "E")]]).all()
    assert t.area_total[i] / 144 == pytest.approx(2700.0)
    assert (t.area[i] / 144).tolist() == pytest.approx([900.0, 900.0, 900.0])
    assert t.floors[i] == 3
    assert t.KLL[i] == 4.0
    assert t.llr_factor[i] == pytest.approx(0.426777, rel=1e-5)
    assert ("L reduced by ASCE 7-22 §4.7: factor 0.43 (KLL = 4, AT = 1,800 ft² over 2 floors)"
            in t.messages[i])
    assert "Lr not reduced (ASCE 7-22 §4.8 not applied)" in t.messages[i]
    assert t.reason[i] is None


def test_edge_and_corner_columns_of_the_stack_by_hand():
    t = takedown(three_storeys())
    e = row(t, "L1-1")  # (30, 0) ft, 450 ft² per level
    # D = 90 x 450 x 2 + 85 x 450 + 2,730 = 81,000 + 38,250 + 2,730 = 121,980 lb
    assert t.loads[e, D] == pytest.approx(121.98)
    # L: KLL AT = 4 x 900 = 3,600 -> 0.25 + 15/60 = 0.50 (>= 0.40): 45,000 x 0.5 = 22,500 lb
    assert t.loads[e, L] == pytest.approx(22.5)
    c = row(t, "L1-0")  # (0, 0) ft, 225 ft² per level
    # L: KLL AT = 4 x 450 = 1,800 -> 0.25 + 15/42.426 = 0.60355: 22,500 x 0.60355 = 13,580 lb
    assert t.loads[c, L] == pytest.approx(22.5 * (0.25 + 15 / np.sqrt(1800)))
    assert t.loads[c, L] == pytest.approx(13.580, abs=1e-3)


def test_one_floor_and_the_roof_level():
    t = takedown(three_storeys())
    i = row(t, "L2-5")  # interior under L2: L2 and the roof
    # D = 90 x 900 + 85 x 900 + 65 x 14 x 2 = 81,000 + 76,500 + 1,820 = 159,320 lb
    assert t.loads[i, D] == pytest.approx(159.32)
    # L: one floor, KLL AT = 3,600 -> 0.50, the one-floor limit 0.50: 45,000 x 0.5 = 22,500
    assert t.loads[i, L] == pytest.approx(22.5)
    r = row(t, "Roof-5")  # interior under the roof: 85 x 900 + 65 x 14 = 77,410 lb; no L
    assert t.loads[r, D] == pytest.approx(77.41)
    assert t.loads[r, L] == 0.0
    assert np.isnan(t.llr_factor[r])
    assert t.above[r] == -1 and t.ids[t.above[i]] == "Roof-5"


def test_heavy_floor_under_two_floors():
    levels = three_storeys()
    levels[1] = dataclasses.replace(levels[1], loads=dataclasses.replace(FLOOR, L=125 * PSF))
    t = takedown(levels)
    i = row(t, "L1-5")
    # L1 125 psf > 100 psf: heavy (ASCE 7-22 §4.7.3), two floors: max(0.80, 0.42678) = 0.80;
    # L2 normal: 0.42678 (KLL AT = 7,200 over the 2 floors).  Hand computation:
    #   125 x 900 x 0.80 + 50 x 900 x 0.42678 = 90,000 + 19,205 = 109,205 lb
    assert t.loads[i, L] == pytest.approx(90.0 + 45.0 * (0.25 + 15 / np.sqrt(7200)))
    assert t.loads[i, L] == pytest.approx(109.205, abs=1e-3)
    # heavy on one floor only (L1 columns under L1 alone would be 1.0): the L2 column is normal
    j = row(t, "L2-5")
    assert t.loads[j, L] == pytest.approx(22.5)


def test_reduction_not_allowed_or_assembly_on_a_floor():
    for change in ({"live_load_reduction": False}, {"use": "assembly"}):
        levels = three_storeys()
        levels[1] = dataclasses.replace(levels[1], loads=dataclasses.replace(FLOOR, **change))
        t = takedown(levels)
        i = row(t, "L1-5")
        # L1 at full L: 45,000; L2 alone reduced: one floor, KLL AT 3,600 -> 0.50: 22,500
        assert t.loads[i, L] == pytest.approx(45.0 + 22.5)
        assert any("not reduced" in m for m in t.messages[i])


def test_reduction_off_everywhere():
    t = takedown(three_storeys(live_load_reduction=False))
    i = row(t, "L1-5")
    assert t.loads[i, L] == pytest.approx(90.0)  # 50 x 900 x 2, no reduction
    assert t.llr_factor[i] == 1.0


def test_transfer_column_is_not_guessed():
    # An extra roof column at (40, 40) ft standing on L2 (14 ft long, base at 28 ft) with no
    # column below it: the L2 column whose cell holds it, (30, 30) ft, and the L1 column
    # beneath that one are not given loads (a reason), never an underestimate.
    xy = np.vstack([GRID, [[40 * FT, 40 * FT]]])
    levels = [level("L1", 14, FLOOR), level("L2", 28, FLOOR), level("Roof", 42, ROOF, xy=xy)]
    t = takedown(levels)
    assert "Roof-16" in t.reason[row(t, "L2-5")]
    assert "L2-5" in t.reason[row(t, "L1-5")]  # inherited down the stack
    assert np.isnan(t.loads[row(t, "L1-5")]).all()
    assert any("transfer" in m for m in t.messages[row(t, "Roof-16")])
    assert t.reason[row(t, "L1-6")] is None  # others untouched


def test_double_height_column_and_matching_tolerance():
    # L2 has no column at (30, 30) ft: the roof column there is 28 ft long and reaches down
    # to L1 (base 42 - 28 = 14 ft): it stands on the L1 column (not a transfer).
    l2_xy = np.delete(GRID, INTERIOR, axis=0)
    roof_xy = GRID.copy()
    roof_xy[6] += [6.0, 0.0]  # 6 in off its column below: still the column above (< 12 in)
    roof = level("Roof", 42, ROOF, xy=roof_xy)
    length = roof.length.copy()
    length[INTERIOR] = 28 * FT
    roof = dataclasses.replace(roof, length=length)
    t = takedown([level("L1", 14, FLOOR), level("L2", 28, FLOOR, xy=l2_xy), roof])
    assert t.ids[t.above[row(t, "L1-5")]] == "Roof-5"
    assert t.reason[row(t, "L1-5")] is None
    assert t.ids[t.above[row(t, "L2-5")]] == "Roof-6"  # L2-5 is (60, 30) ft after the delete
    # 18 in off: no longer the column above; it stands on L2 -> a transfer
    roof_xy[6] += [12.0, 0.0]
    t = takedown([level("L1", 14, FLOOR), level("L2", 28, FLOOR, xy=l2_xy),
                  dataclasses.replace(roof, xy=roof_xy)])
    assert t.above[row(t, "L2-5")] == -1
    assert "Roof-6" in t.reason[row(t, "L2-5")]


def test_unknown_weight_makes_the_stack_below_unknown():
    levels = three_storeys()
    roof = levels[0]
    weight = roof.weight.copy()
    weight[INTERIOR] = np.nan
    levels[0] = dataclasses.replace(roof, weight=weight)
    t = takedown(levels)
    for name in ("Roof-5", "L2-5", "L1-5"):
        assert "self-weight unknown" in t.reason[row(t, name)]
        assert np.isnan(t.loads[row(t, name)]).all()
    assert t.reason[row(t, "L1-6")] is None


def test_steel_weight():
    # 490 lb/ft³ x A / 144: W14X90 A = 26.5 in² -> 90.2 lb/ft (AISC Shapes Database v16.0:
    # 90 lb/ft nominal)
    assert steel_weight(26.5) == pytest.approx(90.17, abs=0.01)


def test_messages_in_si_units():
    t = takedown(three_storeys(), TakedownOptions(units="SI"))
    i = row(t, "L1-5")
    # 1,800 ft² = 1,800 x 0.3048² = 167.2 m²
    assert any("AT = 167 m² over 2 floors" in m for m in t.messages[i])


def test_empty():
    t = takedown([])
    assert t.loads.shape == (0, len(LOAD_TYPES))


def test_small_area_and_heavy_single_floor_messages():
    # a single 10 ft x 10 ft bay with 4 corner columns: AT = 25 ft² each, KLL AT = 100 < 400
    xy = np.array([[0, 0], [120, 0], [0, 120], [120, 120]], dtype=float)
    small = Level("L1", 168.0, [SlabPiece(shapely.box(0, 0, 120, 120), 6.0)],
                  ["a", "b", "c", "d"], xy, np.full(4, 20.0), np.full(4, 168.0), FLOOR)
    t = takedown([small])
    assert t.loads[0, L] == pytest.approx(50 * 25 / 1000)  # 1.25 kip, not reduced
    assert any("below 400 ft²" in m for m in t.messages[0])
    heavy = dataclasses.replace(small, loads=dataclasses.replace(FLOOR, L=150 * PSF))
    t = takedown([dataclasses.replace(heavy, slabs=[SlabPiece(shapely.box(0, 0, 9e3, 9e3),
                                                              6.0)], xy=xy * 40)])
    # 150 psf > 100 psf on one floor: never reduced (ASCE 7-22 §4.7.3)
    assert t.llr_factor[0] == 1.0
    assert any("§4.7.3" in m for m in t.messages[0])


def test_column_without_plan_position_gets_a_reason():
    levels = three_storeys()
    xy = levels[1].xy.copy()
    xy[INTERIOR] = np.nan
    levels[1] = dataclasses.replace(levels[1], xy=xy)
    t = takedown(levels)
    assert t.reason[row(t, "L1-5")] == "no plan position: no takedown"
    assert np.isnan(t.loads[row(t, "L1-5")]).all()
    assert t.reason[row(t, "L2-5")] is None  # the column above is unaffected


def test_column_in_an_opening_of_one_level():
    # L2 has a 4 ft x 4 ft opening around (30, 30) ft: its column there carries none of L2
    # (the neighbours' cells take that slab), but still carries the roof through the stack.
    levels = three_storeys()
    hole = shapely.box(28 * FT, 28 * FT, 32 * FT, 32 * FT)
    levels[2] = dataclasses.replace(levels[2], openings=[hole])
    t = takedown(levels)
    i = row(t, "L1-5")
    assert (t.area[i] / 144).tolist() == pytest.approx([900.0, 0.0, 900.0])
    assert t.floors[i] == 2  # L1 and the roof
    # L: only L1's 900 ft² reduced: one floor, KLL AT 3,600 -> 0.50: 45,000 x 0.5 = 22,500 lb
    assert t.loads[i, L] == pytest.approx(22.5)
    assert any("carries nothing of L2: in an opening" in m for m in t.messages[row(t, "L2-5")])
