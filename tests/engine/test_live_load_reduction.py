"""ASCE 7-22 §4.7 live load reduction (engine.live_load_reduction), worked by hand."""

from __future__ import annotations

import numpy as np
import pytest

from stanchion.engine.live_load_reduction import (
    ASSEMBLY,
    CORNER,
    EDGE,
    GARAGE,
    HEAVY,
    INTERIOR,
    K_LL,
    NORMAL,
    OUTSIDE,
    L_reduced,
    L_reduced_SI,
    reduction_factor,
)


def test_K_LL_table_4_7_1():
    # ASCE 7-22 Table 4.7-1 (from memory): interior columns 4; exterior columns without
    # cantilever slabs 4; edge columns with cantilever slabs 3; corner columns with cantilever
    # slabs 2; all other members 1
    position = np.array([INTERIOR, EDGE, CORNER, EDGE, CORNER, OUTSIDE])
    cantilever = np.array([False, False, False, True, True, False])
    assert K_LL(position, cantilever).tolist() == [4.0, 4.0, 4.0, 3.0, 2.0, 1.0]


def test_eq_4_7_1_one_floor_by_hand():
    # ASCE 7-22 Eq. 4.7-1: L = Lo (0.25 + 15 / sqrt(KLL AT)).  Interior column, one floor,
    # Lo = 50 psf, AT = 400 ft²: KLL AT = 4 x 400 = 1,600 ft², sqrt = 40,
    # L = 50 (0.25 + 15/40) = 50 x 0.625 = 31.25 psf (above 0.50 Lo = 25 psf: governs)
    assert L_reduced(50.0, 4.0, 400.0) == pytest.approx(31.25)
    assert reduction_factor(1600.0, 1) == pytest.approx(0.625)


def test_one_floor_limit_0_50():
    # KLL AT = 4 x 2,500 = 10,000 ft², sqrt = 100: 0.25 + 15/100 = 0.40 < 0.50, so the
    # §4.7.2 limit for members supporting one floor governs: 0.50
    assert L_reduced(1.0, 4.0, 2500.0) == pytest.approx(0.40)
    assert reduction_factor(10_000.0, 1) == pytest.approx(0.50)
    # exactly at the limit: KLL AT = 3,600, sqrt = 60: 0.25 + 15/60 = 0.50
    assert reduction_factor(3600.0, 1) == pytest.approx(0.50)


def test_two_floors_by_hand_and_the_0_40_limit():
    # Interior column under two floors of 900 ft² each: KLL AT = 4 x (900 + 900) = 7,200 ft²
    # (the sum over the floors, ASCE 7-22 Commentary C4.7 from memory), sqrt = 84.853:
    # 0.25 + 15 / 84.853 = 0.25 + 0.17678 = 0.42678 (above 0.40: Eq. 4.7-1 governs)
    assert reduction_factor(7200.0, 2) == pytest.approx(0.426777, rel=1e-5)
    # Three floors of 2,500 ft²: KLL AT = 30,000, sqrt = 173.21: 0.25 + 0.0866 = 0.3366 <
    # 0.40, the §4.7.2 limit for two or more floors governs
    assert reduction_factor(30_000.0, 3) == pytest.approx(0.40)
    # the same influence area on one floor stops at 0.50
    assert reduction_factor(30_000.0, 1) == pytest.approx(0.50)


def test_below_400_square_feet_no_reduction():
    # §4.7.2: only for KLL AT >= 400 ft²; at 400 the equation gives 0.25 + 15/20 = 1.0
    assert reduction_factor(np.array([100.0, 399.9, 400.0]), 1).tolist() == [1.0, 1.0, 1.0]
    # e.g. a corner column with cantilever slabs, KLL 2, AT 150 ft²: 300 < 400
    assert reduction_factor(2 * 150.0, 1) == 1.0


def test_si_form():
    # ASCE 7-22 Eq. 4.7-1 (SI): Lo (0.25 + 4.57 / sqrt(KLL AT)), AT in m².  900 ft² =
    # 83.6127 m² (0.3048² x 900); KLL AT = 334.45 m², sqrt = 18.288: 0.25 + 4.57/18.288 =
    # 0.49989, the US value 0.50 within the rounding of 4.57 (= 15 x 0.3048 = 4.572)
    assert L_reduced_SI(1.0, 4.0, 900 * 0.3048**2) == pytest.approx(0.49989, abs=1e-5)
    assert L_reduced(1.0, 4.0, 900.0) == pytest.approx(0.50)


def test_heavy_live_load_and_garage():
    # §4.7.3 / §4.7.4: not reduced for one floor; two or more floors up to 20 %, and not
    # below §4.7.2: KLL AT 7,200 over 2 floors gives 0.4268 by Eq. 4.7-1 -> 0.80 governs
    for use in (HEAVY, GARAGE):
        assert reduction_factor(7200.0, 1, use) == 1.0
        assert reduction_factor(7200.0, 2, use) == pytest.approx(0.80)
        # small influence area: Eq. 4.7-1 value 1.0 (below 400 ft²) governs over 0.80
        assert reduction_factor(300.0, 2, use) == 1.0
        # KLL AT = 900: 0.25 + 15/30 = 0.75 < 0.80 -> 0.80; KLL AT = 1,600: 0.625 -> 0.80
        assert reduction_factor(900.0, 3, use) == pytest.approx(0.80)
    # KLL AT = 500, 2 floors: 0.25 + 15/22.36 = 0.9208 > 0.80: the §4.7.2 value governs
    assert reduction_factor(500.0, 2, HEAVY) == pytest.approx(0.25 + 15 / np.sqrt(500.0))


def test_assembly_never_reduced():
    # §4.7.5
    assert reduction_factor(30_000.0, 4, ASSEMBLY) == 1.0


def test_vectorised_over_members():
    ka = np.array([1600.0, 7200.0, 7200.0, 30_000.0])
    floors = np.array([1, 2, 2, 1])
    use = np.array([NORMAL, NORMAL, HEAVY, ASSEMBLY])
    # 0.625 (hand, above), 0.42678 (hand, above), 0.80 (§4.7.3), 1.0 (§4.7.5)
    assert reduction_factor(ka, floors, use) == pytest.approx([0.625, 0.426777, 0.80, 1.0],
                                                              rel=1e-5)
