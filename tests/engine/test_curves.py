"""Capacity curves and per-limit-state elastic buckling stresses (engine/curves.py).

Section properties from the project catalog (AISC Shapes Database v16.0).
"""

from __future__ import annotations

import numpy as np
import pytest

from stanchion.engine import catalog
from stanchion.engine.compression import LimitState, available_strength, compressive_strength
from stanchion.engine.curves import buckling_stresses, capacity_curve, length_ratios

FT = 12.0


def _rows(*names: str) -> np.ndarray:
    idx = catalog.lookup(list(names))
    assert (idx >= 0).all(), names
    return idx


def test_curve_of_W14X132_passes_through_design_example_E1A() -> None:
    # AISC Design Examples (v15.0) Example E.1A, from memory: W14X132, A992, Lc = 30 ft,
    # LRFD φcPn = 893 kips, ASD Pn/Ωc = 594 kips (the same values test_compression uses).
    sec = catalog.load_catalog()
    idx = _rows("W14X132")
    lrfd = capacity_curve(sec, idx, np.array([50.0]), 29000.0, 11200.0,
                          np.array([10.0, 30.0, 40.0]) * FT, "LRFD")
    asd = capacity_curve(sec, idx, np.array([50.0]), 29000.0, 11200.0,
                         np.array([30.0]) * FT, "ASD")
    assert lrfd.shape == (3, 1)
    assert lrfd[1, 0] == pytest.approx(893.0, abs=1.5)
    assert asd[0, 0] == pytest.approx(594.0, abs=1.5)


def test_curve_decreases_with_length_and_is_phi_Fy_Ag_at_zero() -> None:
    # AISC 360-22 Eq. E3-2: Fcr -> Fy as Lc -> 0, so φcPn -> 0.9·Fy·Ag (W14X48: A = 14.1 in²,
    # Shapes Database v16.0; 0.9·50·14.1 = 634.5 kips, hand computation); Fe falls as Lc
    # grows, so does Fcr (common practice: a column curve never rises with length).
    sec = catalog.load_catalog()
    Lc = np.linspace(0.0, 60.0, 61) * FT
    curve = capacity_curve(sec, _rows("W14X48"), np.array([50.0]), 29000.0, 11200.0, Lc,
                           "LRFD")[:, 0]
    assert curve[0] == pytest.approx(0.9 * 50.0 * 14.1, rel=1e-3)
    assert np.all(np.diff(curve) < 0)


def test_member_point_lies_on_its_own_curve_with_unequal_lengths() -> None:
    # A member's curve at its own largest effective length, with its own proportions, is
    # the check's own available strength (the same Chapter E functions; common practice).
    sec = catalog.load_catalog()
    idx = _rows("W14X48", "WT7X15", "HSS6X6X1/4", "C10X15.3")
    Fy = np.array([50.0, 50.0, 46.0, 36.0])
    Lcx = np.array([32.0, 10.0, 14.0, 9.0]) * FT
    Lcy = np.array([8.0, 10.0, 14.0, 4.5]) * FT
    Lcz = np.array([8.0, 12.0, 14.0, 9.0]) * FT
    own = available_strength(compressive_strength(sec, Fy, Lcx, Lcy, Lcz, index=idx).Pn,
                             "LRFD")
    Lc, ratios = length_ratios(Lcx, Lcy, Lcz)
    curves = capacity_curve(sec, idx, Fy, 29000.0, 11200.0, np.unique(Lc), "LRFD", ratios)
    at_own = curves[np.searchsorted(np.unique(Lc), Lc), np.arange(4)]
    np.testing.assert_allclose(at_own, own, rtol=1e-12)


def test_buckling_stresses_by_hand_and_smallest_is_the_governing_Fe() -> None:
    # W14X48 (Lcx = Lcy = 4 ft, Lcz = 40 ft): Fe torsional 35.5 ksi by AISC 360-22 Eq. E4-2
    # (hand computation in test_compression.py); Fey = π²·29000/(48/1.91)² = 453 ksi (Eq.
    # E3-4, ry = 1.91 in). WT7X15 at 10 ft: Fey = 44.13 ksi and Fe of Eq. E4-3 = 33.46 ksi
    # (hand computation in test_compression.py). HSS: no torsional modes (E4 user note).
    sec = catalog.load_catalog()
    idx = _rows("W14X48", "WT7X15", "HSS6X6X1/4")
    Lcx = np.array([4.0, 10.0, 12.0]) * FT
    Lcy = np.array([4.0, 10.0, 12.0]) * FT
    Lcz = np.array([40.0, 10.0, 12.0]) * FT
    Fe = buckling_stresses(sec, idx, Lcx, Lcy, Lcz, 29000.0, 11200.0)
    assert Fe[0, LimitState.TORSIONAL] == pytest.approx(35.5, rel=0.01)
    assert Fe[0, LimitState.FLEXURAL_Y] == pytest.approx(453.0, rel=0.01)
    assert np.isnan(Fe[0, LimitState.FLEXURAL_TORSIONAL])
    assert Fe[1, LimitState.FLEXURAL_Y] == pytest.approx(44.13, rel=0.005)
    assert Fe[1, LimitState.FLEXURAL_TORSIONAL] == pytest.approx(33.46, rel=0.005)
    assert np.isnan(Fe[1, LimitState.TORSIONAL])
    assert np.isnan(Fe[2, [LimitState.TORSIONAL, LimitState.FLEXURAL_TORSIONAL]]).all()
    governing = compressive_strength(sec, np.full(3, 50.0), Lcx, Lcy, Lcz, index=idx).Fe
    np.testing.assert_allclose(np.nanmin(Fe, axis=1), governing, rtol=1e-12)
