"""Tests of engine.combinations (ASCE 7-22 load combinations on axial load effects).

Every expected value is hand-worked from the combination factors of ASCE 7-22 §2.3.1, §2.3.6,
§2.4.1 and §2.4.5 as recalled ("from memory": the snow factors 1.0S / 0.3S / 0.15S for LRFD
and 0.7S / 0.75(0.7S) for ASD are the 2022 strength-level snow recollection documented in
engine/combinations.py).  Loads are in the order D, L, Lr, S, R, W, E.
"""

from __future__ import annotations

import copy
import itertools
import math

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st
from hypothesis.extra import numpy as hnp

from stanchion.engine.combinations import (
    Combination,
    asd_combinations,
    custom_combinations,
    default_combinations,
    expand_signs,
    governing,
    lrfd_combinations,
)
from stanchion.engine.members import LOAD_TYPES
from stanchion.engine.units import force_factor

NAN = math.nan


def row(**kw: float) -> list[float]:
    """One member's loads by type name, NaN for the types not given."""
    return [kw.get(t, NAN) for t in LOAD_TYPES]


# One member with every load type: D=100, L=50, Lr=20, S=30, R=10, W=40, E=60 (kip).
ALL = row(D=100, L=50, Lr=20, S=30, R=10, W=40, E=60)

# Hand-worked value of every expanded LRFD combination for ALL.
LRFD_EXPECTED = {
    "1.4D": 140.0,  # ASCE 7-22 §2.3.1 comb. 1: 1.4(100)
    "1.2D+1.6L+0.5Lr": 210.0,  # §2.3.1 comb. 2: 120 + 80 + 0.5(20)=10
    "1.2D+1.6L+0.3S": 209.0,  # §2.3.1 comb. 2: 120 + 80 + 0.3(30)=9
    "1.2D+1.6L+0.5R": 205.0,  # §2.3.1 comb. 2: 120 + 80 + 0.5(10)=5
    "1.2D+1.6Lr+1.0L": 202.0,  # §2.3.1 comb. 3: 120 + 1.6(20)=32 + 50
    "1.2D+1.6Lr+0.5W": 172.0,  # §2.3.1 comb. 3: 120 + 32 + 0.5(40)=20
    "1.2D+1.6Lr-0.5W": 132.0,  # §2.3.1 comb. 3, W reversed: 120 + 32 - 20
    "1.2D+1.0S+1.0L": 200.0,  # §2.3.1 comb. 3: 120 + 30 + 50
    "1.2D+1.0S+0.5W": 170.0,  # §2.3.1 comb. 3: 120 + 30 + 20
    "1.2D+1.0S-0.5W": 130.0,  # §2.3.1 comb. 3, W reversed: 120 + 30 - 20
    "1.2D+1.6R+1.0L": 186.0,  # §2.3.1 comb. 3: 120 + 1.6(10)=16 + 50
    "1.2D+1.6R+0.5W": 156.0,  # §2.3.1 comb. 3: 120 + 16 + 20
    "1.2D+1.6R-0.5W": 116.0,  # §2.3.1 comb. 3, W reversed: 120 + 16 - 20
    "1.2D+1.0W+1.0L+0.5Lr": 220.0,  # §2.3.1 comb. 4: 120 + 40 + 50 + 10
    "1.2D-1.0W+1.0L+0.5Lr": 140.0,  # §2.3.1 comb. 4, W reversed: 120 - 40 + 50 + 10
    "1.2D+1.0W+1.0L+0.3S": 219.0,  # §2.3.1 comb. 4: 120 + 40 + 50 + 9
    "1.2D-1.0W+1.0L+0.3S": 139.0,  # §2.3.1 comb. 4, W reversed: 120 - 40 + 50 + 9
    "1.2D+1.0W+1.0L+0.5R": 215.0,  # §2.3.1 comb. 4: 120 + 40 + 50 + 5
    "1.2D-1.0W+1.0L+0.5R": 135.0,  # §2.3.1 comb. 4, W reversed: 120 - 40 + 50 + 5
    "0.9D+1.0W": 130.0,  # §2.3.1 comb. 5: 90 + 40
    "0.9D-1.0W": 50.0,  # §2.3.1 comb. 5, W reversed: 90 - 40
    "1.2D+1.0E+1.0L+0.15S": 234.5,  # §2.3.6 comb. 6: 120 + 60 + 50 + 0.15(30)=4.5
    "1.2D-1.0E+1.0L+0.15S": 114.5,  # §2.3.6 comb. 6, E reversed: 120 - 60 + 50 + 4.5
    "0.9D+1.0E": 150.0,  # §2.3.6 comb. 7 with E = Ev+Eh reversed: 90 + 60
    "0.9D-1.0E": 30.0,  # §2.3.6 comb. 7 (0.9D - Ev - Eh): 90 - 60
}

# Hand-worked value of every expanded ASD combination for ALL.
ASD_EXPECTED = {
    "1.0D": 100.0,  # ASCE 7-22 §2.4.1 comb. 1: 100
    "1.0D+1.0L": 150.0,  # §2.4.1 comb. 2: 100 + 50
    "1.0D+1.0Lr": 120.0,  # §2.4.1 comb. 3: 100 + 20
    "1.0D+0.7S": 121.0,  # §2.4.1 comb. 3: 100 + 0.7(30)=21
    "1.0D+1.0R": 110.0,  # §2.4.1 comb. 3: 100 + 10
    "1.0D+0.75L+0.75Lr": 152.5,  # §2.4.1 comb. 4: 100 + 37.5 + 15
    "1.0D+0.75L+0.525S": 153.25,  # §2.4.1 comb. 4: 100 + 37.5 + 0.75(0.7)(30)=15.75
    "1.0D+0.75L+0.75R": 145.0,  # §2.4.1 comb. 4: 100 + 37.5 + 7.5
    "1.0D+0.6W": 124.0,  # §2.4.1 comb. 5: 100 + 0.6(40)=24
    "1.0D-0.6W": 76.0,  # §2.4.1 comb. 5, W reversed: 100 - 24
    "1.0D+0.75L+0.45W+0.75Lr": 170.5,  # §2.4.1 comb. 6: 100 + 37.5 + 0.75(0.6)(40)=18 + 15
    "1.0D+0.75L-0.45W+0.75Lr": 134.5,  # §2.4.1 comb. 6, W reversed: 100 + 37.5 - 18 + 15
    "1.0D+0.75L+0.45W+0.525S": 171.25,  # §2.4.1 comb. 6: 100 + 37.5 + 18 + 15.75
    "1.0D+0.75L-0.45W+0.525S": 135.25,  # §2.4.1 comb. 6, W reversed: 100 + 37.5 - 18 + 15.75
    "1.0D+0.75L+0.45W+0.75R": 163.0,  # §2.4.1 comb. 6: 100 + 37.5 + 18 + 7.5
    "1.0D+0.75L-0.45W+0.75R": 127.0,  # §2.4.1 comb. 6, W reversed: 100 + 37.5 - 18 + 7.5
    "0.6D+0.6W": 84.0,  # §2.4.1 comb. 7: 60 + 24
    "0.6D-0.6W": 36.0,  # §2.4.1 comb. 7, W reversed: 60 - 24
    "1.0D+0.7E": 142.0,  # §2.4.5 comb. 8: 100 + 0.7(60)=42
    "1.0D-0.7E": 58.0,  # §2.4.5 comb. 8, E reversed: 100 - 42
    "1.0D+0.525E+0.75L+0.525S": 184.75,  # §2.4.5 comb. 9: 100 + 31.5 + 37.5 + 15.75
    "1.0D-0.525E+0.75L+0.525S": 121.75,  # §2.4.5 comb. 9, E reversed: 100 - 31.5 + 37.5 + 15.75
    "0.6D+0.7E": 102.0,  # §2.4.5 comb. 10 with E reversed: 60 + 42
    "0.6D-0.7E": 18.0,  # §2.4.5 comb. 10 (0.6D - 0.7Ev - 0.7Eh): 60 - 42
}


# --- every default combination, hand-worked ---------------------------------------------


@pytest.mark.parametrize(
    ("method", "expected", "top_name", "top_value"),
    [
        # LRFD governing: §2.3.6 comb. 6 = 234.5, the largest entry of LRFD_EXPECTED.
        ("LRFD", LRFD_EXPECTED, "1.2D+1.0E+1.0L+0.15S", 234.5),
        # ASD governing: §2.4.5 comb. 9 = 184.75, the largest entry of ASD_EXPECTED.
        ("ASD", ASD_EXPECTED, "1.0D+0.525E+0.75L+0.525S", 184.75),
    ],
)
def test_every_default_combination_hand_worked(method, expected, top_name, top_value):
    g = governing(np.array([ALL]), default_combinations(method))
    assert set(g.names) == set(expected)  # no combination missing, none extra
    assert len(g.names) == len(expected)  # and no duplicates
    for name, value in expected.items():
        assert g.values[0, g.names.index(name)] == pytest.approx(value, abs=1e-9), name
    assert g.required[0] == pytest.approx(top_value)
    assert g.combination[0] == top_name
    assert g.max_tension[0] == 0.0  # every value above is positive
    assert g.tension_index[0] == -1 and g.tension_combination[0] is None
    assert not g.no_loads[0]


def test_sources_name_the_standard():
    _, sources, _ = expand_signs(lrfd_combinations())
    # The seven numbered combinations of ASCE 7-22 §2.3.1 (1-5) and §2.3.6 (6-7).
    assert sorted(set(sources)) == sorted(
        [f"ASCE 7-22 §2.3.1 combination {i}" for i in range(1, 6)]
        + [f"ASCE 7-22 §2.3.6 combination {i}" for i in (6, 7)]
    )
    _, sources, _ = expand_signs(asd_combinations())
    # ASCE 7-22 §2.4.1 (1-7) and §2.4.5 (8-10).
    assert sorted(set(sources)) == sorted(
        [f"ASCE 7-22 §2.4.1 combination {i}" for i in range(1, 8)]
        + [f"ASCE 7-22 §2.4.5 combination {i}" for i in (8, 9, 10)]
    )


def test_gravity_only_lrfd_combination_2_governs():
    # D=95, L=60, S=12: §2.3.1 comb. 2 with 0.3S: 1.2(95)=114 + 1.6(60)=96 + 0.3(12)=3.6
    # = 213.6; comb. 3 with S: 114 + 12 + 60 = 186; comb. 1: 133.
    g = governing(np.array([row(D=95, L=60, S=12)]), lrfd_combinations())
    assert g.required[0] == pytest.approx(213.6)
    assert g.combination[0] == "1.2D+1.6L+0.3S"
    assert g.sources[g.index[0]] == "ASCE 7-22 §2.3.1 combination 2"


def test_dead_only_lrfd_combination_1_governs():
    # D=100 only: §2.3.1 comb. 1 1.4(100) = 140 > 1.2(100) = 120 (combs. 2-4).
    g = governing(np.array([row(D=100)]), lrfd_combinations())
    assert g.required[0] == pytest.approx(140.0)
    assert g.combination[0] == "1.4D"


# --- wind reversal, seismic --------------------------------------------------------------


def test_wind_reversal_reports_tension_and_compression_governs():
    # D=10, W=30 (kip).  §2.3.1 comb. 5 reversed: 0.9(10) - 30 = -21 (net tension 21);
    # comb. 4 reversed: 12 - 30 = -18; comb. 3: 12 - 15 = -3.  Compression: comb. 4,
    # 1.2(10) + 30 = 42, equal for its three roof alternatives (L, Lr, S, R absent) -> the
    # first one in list order, the Lr alternative; comb. 5 gives 9 + 30 = 39.
    g = governing(np.array([row(D=10, W=30)]), lrfd_combinations())
    assert g.max_tension[0] == pytest.approx(21.0)
    assert g.tension_combination[0] == "0.9D-1.0W"
    assert g.required[0] == pytest.approx(42.0)
    assert g.combination[0] == "1.2D+1.0W+1.0L+0.5Lr"
    assert g.values[0, g.names.index("0.9D-1.0W")] == pytest.approx(-21.0)


def test_wind_reversal_asd():
    # D=10, W=30, ASD.  §2.4.1 comb. 7 reversed: 0.6(10) - 0.6(30) = 6 - 18 = -12 -> 12;
    # comb. 5 reversed: 10 - 18 = -8.  Compression: comb. 5, 10 + 18 = 28 (comb. 6 gives
    # 10 + 0.45(30) = 23.5).
    g = governing(np.array([row(D=10, W=30)]), asd_combinations())
    assert g.max_tension[0] == pytest.approx(12.0)
    assert g.tension_combination[0] == "0.6D-0.6W"
    assert g.required[0] == pytest.approx(28.0)
    assert g.combination[0] == "1.0D+0.6W"


def test_all_tension_member_has_no_governing_compression():
    # D=-5 (an uplift dead load effect), nothing else: every factor on D is positive, so
    # every value is negative; largest tension §2.3.1 comb. 1: 1.4(5) = 7.
    g = governing(np.array([row(D=-5)]), lrfd_combinations())
    assert g.required[0] == 0.0 and g.index[0] == -1 and g.combination[0] is None
    assert g.max_tension[0] == pytest.approx(7.0)
    assert g.tension_combination[0] == "1.4D"


def test_seismic_lrfd_and_asd():
    loads = np.array([row(D=50, L=20, S=10, E=100)])
    g = governing(loads, lrfd_combinations())
    # §2.3.6 comb. 6: 1.2(50)=60 + 100 + 20 + 0.15(10)=1.5 = 181.5 (comb. 2: 60 + 32 + 3 = 95).
    assert g.required[0] == pytest.approx(181.5)
    assert g.combination[0] == "1.2D+1.0E+1.0L+0.15S"
    # §2.3.6 comb. 7, 0.9D - Ev - Eh: 45 - 100 = -55 -> 55 (comb. 6 reversed: -18.5).
    assert g.max_tension[0] == pytest.approx(55.0)
    assert g.tension_combination[0] == "0.9D-1.0E"

    g = governing(loads, asd_combinations())
    # §2.4.5 comb. 9: 50 + 0.525(100)=52.5 + 0.75(20)=15 + 0.525(10)=5.25 = 122.75
    # (comb. 8: 50 + 70 = 120).
    assert g.required[0] == pytest.approx(122.75)
    assert g.combination[0] == "1.0D+0.525E+0.75L+0.525S"
    # §2.4.5 comb. 10: 0.6(50) - 0.7(100) = 30 - 70 = -40 -> 40.
    assert g.max_tension[0] == pytest.approx(40.0)
    assert g.tension_combination[0] == "0.6D-0.7E"


# --- the 0.5L exception -----------------------------------------------------------------


def test_half_live_changes_exactly_combinations_3_4_and_6():
    # L=10 only.  ASCE 7-22 §2.3.1 exception: factor on L in combs. 3, 4 (and §2.3.6 comb. 6)
    # becomes 0.5: 1.0(10)=10 -> 0.5(10)=5.  Comb. 2 keeps 1.6L = 16.
    loads = np.array([row(L=10)])
    full = governing(loads, lrfd_combinations())
    half = governing(loads, lrfd_combinations(half_live=True))
    assert len(full.names) == len(half.names) and full.sources == half.sources
    changed = np.flatnonzero(full.values[0] != half.values[0])
    expected = [i for i, name in enumerate(full.names) if "1.0L" in name]
    assert changed.tolist() == expected
    # 3 alternatives of comb. 3 with L, 3 roof alternatives x 2 W signs of comb. 4, 2 E signs
    # of comb. 6 = 11 columns.
    assert len(expected) == 11
    assert {full.sources[i] for i in expected} == {
        "ASCE 7-22 §2.3.1 combination 3",
        "ASCE 7-22 §2.3.1 combination 4",
        "ASCE 7-22 §2.3.6 combination 6",
    }
    assert np.allclose(full.values[0, expected], 10.0)
    assert np.allclose(half.values[0, expected], 5.0)
    # Comb. 2 unchanged, and governs both ways: 1.6(10) = 16.
    assert full.required[0] == half.required[0] == pytest.approx(16.0)
    assert "1.2D+0.5W+0.5L+0.5Lr" not in half.names  # the wind term stays 1.0W
    assert "1.2D+1.0W+0.5L+0.5Lr" in half.names
    assert default_combinations("LRFD")[4].factors["L"] == 1.0  # off by default


def test_half_live_rejected_for_asd():
    with pytest.raises(ValueError, match="ASD"):
        default_combinations("ASD", half_live=True)


def test_unknown_method():
    assert len(default_combinations("lrfd")) == len(lrfd_combinations())
    with pytest.raises(ValueError, match="WSD"):
        default_combinations("WSD")


# --- custom combinations -----------------------------------------------------------------


def test_custom_combinations_replace_defaults():
    spec = [
        {"name": "service", "factors": {"D": 1.0, "L": 1.0}},
        {"name": "uplift", "factors": {"D": 0.6, "W": 0.6}, "source": "project spec 4.2"},
    ]
    before = copy.deepcopy(spec)
    combos = custom_combinations(spec)
    assert spec == before  # the request is not modified
    g = governing(np.array([row(D=100, L=50, W=200), row(D=100, L=50, S=1000)]), combos)
    # Only the custom ones (W reversed in "uplift"), no ASCE 7-22 defaults.
    assert g.names == ["service", "uplift (+0.6W)", "uplift (-0.6W)"]
    assert g.sources == ["custom combination (request)", "project spec 4.2", "project spec 4.2"]
    # Member 1: service 100 + 50 = 150; uplift 60 + 120 = 180 / 60 - 120 = -60 (hand-worked).
    assert g.values[0].tolist() == pytest.approx([150.0, 180.0, -60.0])
    assert g.required[0] == pytest.approx(180.0) and g.combination[0] == "uplift (+0.6W)"
    assert g.max_tension[0] == pytest.approx(60.0)
    # Member 2: S has no factor in either custom combination -> 150, 60, 60.
    assert g.required[1] == pytest.approx(150.0) and g.combination[1] == "service"


def test_custom_combination_named_by_formula_and_both_reversible():
    combos = custom_combinations(
        [{"name": "1.2D+1.0W+1.0E", "factors": {"D": 1.2, "W": 1.0, "E": 1.0}}]
    )
    names, _, factors = expand_signs(combos)
    # Both signs of W and of E: ++, +-, -+, -- (common practice, no source).
    assert names == ["1.2D+1.0W+1.0E", "1.2D+1.0W-1.0E", "1.2D-1.0W+1.0E", "1.2D-1.0W-1.0E"]
    w, e = LOAD_TYPES.index("W"), LOAD_TYPES.index("E")
    assert factors[:, w].tolist() == [1.0, 1.0, -1.0, -1.0]
    assert factors[:, e].tolist() == [1.0, -1.0, 1.0, -1.0]


@pytest.mark.parametrize(
    ("spec", "match"),
    [
        ([{"name": "x", "factors": {"D": 1.2, "Snow": 1.6}}], "Snow"),
        ([{"name": "x", "factors": {"D": 1.2, "LR": 1.6}}], "LR"),
        ([{"name": "x", "factors": {"D": "1.2"}}], "number"),
        ([{"name": "x", "factors": {"D": True}}], "number"),
        ([{"name": "x", "factors": {"D": float("nan")}}], "finite"),
        ([{"name": "x", "factors": {}}], "factors"),
        ([{"name": "", "factors": {"D": 1.0}}], "name"),
        ([{"factors": {"D": 1.0}}], "name"),
        ([{"name": "x", "factors": {"D": 1}}, {"name": "x", "factors": {"L": 1}}], "twice"),
        ([{"name": "x", "factors": {"D": 1}, "weights": {}}], "weights"),
        (["1.2D+1.6L"], "object"),
        ([], "non-empty"),
    ],
)
def test_custom_combinations_rejected(spec, match):
    with pytest.raises(ValueError, match=match):
        custom_combinations(spec)


def test_combination_rejects_unknown_type_directly():
    with pytest.raises(ValueError, match="'T'"):
        Combination("x", {"D": 1.0, "T": 1.0})


# --- missing loads -----------------------------------------------------------------------


def test_all_nan_is_no_loads():
    g = governing(np.array([row(), row(D=10)]), lrfd_combinations())
    assert g.no_loads.tolist() == [True, False]
    assert g.required[0] == 0.0 and g.index[0] == -1 and g.combination[0] is None
    assert g.max_tension[0] == 0.0 and np.all(g.values[0] == 0.0)
    assert g.required[1] == pytest.approx(14.0)  # §2.3.1 comb. 1: 1.4(10)


def test_nan_counts_as_zero():
    with_nan = np.array([row(D=80, L=40, W=25)])
    zeros = np.nan_to_num(with_nan, nan=0.0)
    for combos in (lrfd_combinations(), asd_combinations()):
        a, b = governing(with_nan, combos), governing(zeros, combos)
        assert np.array_equal(a.values, b.values)
        assert a.required[0] == b.required[0] and a.index[0] == b.index[0]
        assert not a.no_loads[0] and not b.no_loads[0]
    assert np.isnan(with_nan).sum() == 4  # input not modified


def test_zero_loads_are_loads():
    # Explicit zeros (not NaN) are given loads: not "no loads", but nothing compresses.
    g = governing(np.zeros((1, 7)), lrfd_combinations())
    assert not g.no_loads[0] and g.required[0] == 0.0 and g.index[0] == -1


@pytest.mark.parametrize(
    "loads", [np.zeros((3, 6)), np.zeros(7), np.array([[np.inf, 0, 0, 0, 0, 0, 0]])]
)
def test_bad_loads_rejected(loads):
    with pytest.raises(ValueError, match="loads"):
        governing(loads, lrfd_combinations())


def test_no_combinations_rejected():
    with pytest.raises(ValueError, match="combinations"):
        governing(np.zeros((1, 7)), [])


# --- vectorized vs a per-member reference loop --------------------------------------------


def reference(member: list[float], combos: list[Combination]):
    """Per-member Python loop: (values, required, index, max tension), independent code."""
    loads = {t: (0.0 if math.isnan(v) else v) for t, v in zip(LOAD_TYPES, member, strict=True)}
    values = []
    for c in combos:
        rev = [t for t in ("W", "E") if c.factors.get(t, 0.0) != 0.0]
        for signs in itertools.product((1, -1), repeat=len(rev)):
            sign = dict(zip(rev, signs, strict=True))
            values.append(math.fsum(f * sign.get(t, 1) * loads[t] for t, f in c.factors.items()))
    best, index = 0.0, -1
    top = max(values)
    if top > 0:
        index = next(i for i, v in enumerate(values) if abs(v - top) <= 1e-9 * abs(top))
        best = top
    return values, best, index, max(0.0, -min(values))


@pytest.mark.parametrize("method", ["LRFD", "ASD"])
def test_vectorized_equals_reference_loop(method):
    rng = np.random.default_rng(20240611)
    n = 10_000
    loads = rng.uniform(-50.0, 300.0, size=(n, 7))
    loads[rng.random((n, 7)) < 0.3] = np.nan  # absent types; some rows end up all NaN
    loads[:5] = np.nan
    combos = default_combinations(method)
    g = governing(loads, combos)
    for i in range(n):
        values, best, index, tension = reference(loads[i].tolist(), combos)
        assert np.allclose(g.values[i], values, rtol=1e-12, atol=1e-9)
        assert g.required[i] == pytest.approx(best, rel=1e-12, abs=1e-9)
        assert g.index[i] == index
        assert g.max_tension[i] == pytest.approx(tension, rel=1e-12, abs=1e-9)
        assert g.no_loads[i] == all(math.isnan(v) for v in loads[i])
    assert g.no_loads.sum() >= 5


def load_values(bound: float) -> st.SearchStrategy[float]:
    """Finite load effects in [-bound, bound], or NaN (an absent type)."""
    return st.one_of(st.floats(-bound, bound), st.just(math.nan))


# --- units --------------------------------------------------------------------------------


def test_si_and_us_agree():
    # The same member given in kN and in kip: combinations are linear, so the kN result
    # converted to kip equals the kip result (pint's kN -> kip factor, engine.units).
    kn = np.array([row(D=400.0, L=250.0, S=80.0, W=120.0), row(D=90.0, W=300.0, E=150.0)])
    to_kip = force_factor("kN")
    for combos in (lrfd_combinations(), asd_combinations()):
        a, b = governing(kn, combos), governing(kn * to_kip, combos)
        assert np.allclose(a.required * to_kip, b.required, rtol=1e-12)
        assert np.allclose(a.max_tension * to_kip, b.max_tension, rtol=1e-12)
        assert a.index.tolist() == b.index.tolist()


@given(
    loads=hnp.arrays(float, (4, 7), elements=load_values(1e4)),
    scale=st.floats(1e-3, 1e3),
)
@settings(max_examples=60, deadline=None)
def test_linear_scaling(loads, scale):
    g1 = governing(loads, lrfd_combinations())
    g2 = governing(loads * scale, lrfd_combinations())
    assert np.allclose(g2.required, g1.required * scale, rtol=1e-9, atol=1e-9)
    assert np.allclose(g2.max_tension, g1.max_tension * scale, rtol=1e-9, atol=1e-9)


# --- property: required is the max of the compressive values ----------------------------


@given(
    loads=hnp.arrays(float, (5, 7), elements=load_values(1e5)),
    method=st.sampled_from(["LRFD", "ASD"]),
    half_live=st.booleans(),
)
@settings(max_examples=100, deadline=None)
def test_required_is_max_of_compressive_values(loads, method, half_live):
    half_live = half_live and method == "LRFD"
    g = governing(loads, default_combinations(method, half_live=half_live))
    for i in range(len(loads)):
        compressive = [v for v in g.values[i] if v > 0.0]
        assert all(g.required[i] >= v for v in compressive)
        assert g.required[i] == (max(compressive) if compressive else 0.0)
        if compressive:
            assert g.combination[i] == g.names[g.index[i]]
            assert g.values[i, g.index[i]] == pytest.approx(g.required[i], rel=1e-12)
        else:
            assert g.index[i] == -1 and g.combination[i] is None
        assert g.max_tension[i] == max(0.0, -min(g.values[i]))
