"""Plausibility limits: a member outside them is not checked, never passed (engine.plausibility).

issue 13 item 3: `"fy": 1e300` passed; a model read in the wrong length unit made a W12X40
990 ft deep and passed. The limits are engine/plausibility.py's, each with its source there
(docs/design.md §8).
"""

from __future__ import annotations

import dataclasses

import numpy as np
import pytest

from stanchion.engine import catalog, plausibility
from stanchion.engine.check import NOT_CHECKED, PASS, check_members
from stanchion.engine.members import LOAD_TYPES, MemberTable

FT = 12.0  # in per ft


def _members(n: int, sections=None, **columns) -> MemberTable:
    """``n`` W14X48 members, Fy 50 ksi, 16 ft, D = 95 and L = 60 kip, with columns replaced."""
    loads = np.full((n, len(LOAD_TYPES)), np.nan)
    loads[:, 0], loads[:, 1] = 95.0, 60.0
    table = sections if sections is not None else catalog.load_catalog()
    args = dict(section_index=np.zeros(n, dtype=np.int64) if sections is not None
                else catalog.lookup(["W14X48"] * n),
                Fy=np.full(n, 50.0), length=np.full(n, 16 * FT), loads=loads)
    args.update(columns)
    return MemberTable.build(ids=[f"C{i}" for i in range(n)], sections=table, **args)


def _one_bad(column: str, good: float, bad: float) -> dict:
    arr = np.full(3, good)
    arr[1] = bad
    return {column: arr}


def _loads(bad: float) -> np.ndarray:
    loads = np.full((3, len(LOAD_TYPES)), np.nan)
    loads[:, 0], loads[:, 1] = 95.0, 60.0
    loads[1, 1] = bad
    return loads


@pytest.mark.parametrize(("columns", "reason"), [
    # Fy 20–120 ksi (engine/plausibility.py FY_MIN, FY_MAX; common practice):
    (_one_bad("Fy", 50.0, 1e300), "implausible yield stress 1e+300 ksi: check the units"),
    (_one_bad("Fy", 50.0, 345e3), "implausible yield stress 3.45e+05 ksi: check the units"),
    (_one_bad("Fy", 50.0, 0.345), "implausible yield stress 0.345 ksi: check the units"),
    (_one_bad("Fy", 50.0, 19.9), "implausible yield stress 19.9 ksi: check the units"),
    (_one_bad("Fy", 50.0, 120.1), "implausible yield stress 120.1 ksi: check the units"),
    # E within ±20 % of 29,000 ksi (E_MIN, E_MAX): 200 GPa read as MPa·1000, or ksi as MPa.
    (_one_bad("E", 29000.0, 2.0e8),
     "implausible modulus of elasticity E 2e+08 ksi: check the units"),
    (_one_bad("E", 29000.0, 200.0),
     "implausible modulus of elasticity E 200 ksi: check the units"),
    # Lengths 1 ft to 200 ft (LENGTH_MIN, LENGTH_MAX): a 16 ft column read in m as mm, in mm as m.
    (_one_bad("lx", 16 * FT, 16 * FT / 304.8), "implausible unbraced length x 0.05249 ft: "
     "check the units"),
    (_one_bad("lx", 16 * FT, 4877.0 * 39.37), "implausible unbraced length x 1.6e+04 ft: "
     "check the units"),
    (_one_bad("ly", 16 * FT, 201 * FT), "implausible unbraced length y 201 ft: check the units"),
    (_one_bad("lz", 16 * FT, 0.9 * FT), "implausible unbraced length z 0.9 ft: check the units"),
    # Loads and required strengths up to 100,000 kip (LOAD_MAX): 100 kN read as N·1000.
    ({"loads": _loads(100_001.0)}, "implausible load 1e+05 kip: check the units"),
    ({"loads": _loads(-2.0e6)}, "implausible load -2e+06 kip: check the units"),
    (_one_bad("required_strength", 100.0, 1.0e6),
     "implausible required strength 1e+06 kip: check the units"),
    # K at least 0.5, fixed at both ends (K_MIN, AISC 360-22 Commentary Table C-A-7.1); the
    # fuzz test (issue 13 item 6) found KX = 1E-300 passing a failing column.
    (_one_bad("kx", 1.0, 1e-300), "implausible effective length factor KX 1e-300: check the "
     "units"),
    (_one_bad("ky", 1.0, 0.49), "implausible effective length factor KY 0.49: check the units"),
    (_one_bad("kz", 1.0, 0.25), "implausible effective length factor KZ 0.25: check the "
     "units"),
])
def test_each_limit_makes_only_its_member_not_checked(columns: dict, reason: str) -> None:
    r = check_members(_members(3, **columns))
    assert r.status.tolist() == [PASS, NOT_CHECKED, PASS]
    assert r.reason.tolist() == [None, reason, None]
    assert np.isnan(r.utilization[1])


def test_values_at_the_limits_are_checked() -> None:
    # The limits themselves are plausible (closed intervals; engine/plausibility.py).
    n = 2
    r = check_members(_members(
        n, Fy=np.array([plausibility.FY_MIN, plausibility.FY_MAX]),
        E=np.array([plausibility.E_MIN, plausibility.E_MAX]),
        length=np.array([plausibility.LENGTH_MIN, 16 * FT]),
        kx=np.array([plausibility.K_MIN, 10.0])))
    assert r.reason.tolist() == [None, None]


def _scaled_w12x40(factor: float) -> catalog.SectionTable:
    """The W12X40 catalog row with every length dimension scaled by ``factor``."""
    row = catalog.load_catalog().take(catalog.lookup(["W12X40"]))
    return dataclasses.replace(row, A=row.A * factor**2, d=row.d * factor,
                               bf=row.bf * factor, rx=row.rx * factor, ry=row.ry * factor)


@pytest.mark.parametrize(("factor", "reason"), [
    # W12X40: A = 11.7 in², d = 11.9 in (AISC Shapes Database v16.0). Read in m as if mm
    # (× 1/1000): area 1.17e-05 in² under AREA_MIN (half of PIPE1/2STD's 0.234 in²).
    (1e-3, "implausible section area 1.17e-05 in²: check the units"),
    # In mm as if m (× 1000, issue 13: "990 ft deep"): area 1.17e+07 in² over
    # AREA_MAX = 4 × 272 in² (W36X925, AISC Shapes Database v16.0).
    (1e3, "implausible section area 1.17e+07 in²: check the units"),
])
def test_a_section_scaled_by_a_wrong_length_unit_is_not_checked(
        factor: float, reason: str) -> None:
    r = check_members(_members(1, sections=_scaled_w12x40(factor)))
    assert r.status.tolist() == [NOT_CHECKED]
    assert r.reason.tolist() == [reason]


def test_a_deep_section_of_plausible_area_is_not_checked() -> None:
    # A thin-walled section 150 in deep over DEPTH_MAX = 120 in (common practice), its area
    # within the limits: only the depth is implausible.
    row = catalog.load_catalog().take(catalog.lookup(["W12X40"]))
    deep = dataclasses.replace(row, d=row.d * 0 + 150.0)
    r = check_members(_members(1, sections=deep))
    assert r.reason.tolist() == ["implausible section depth 150 in: check the units"]


def test_other_reasons_come_first() -> None:
    # The reasons table of engine/check.py applies before the plausibility limits.
    r = check_members(_members(1, Fy=np.array([1e300]), lx=np.array([-1.0])))
    assert r.reason.tolist() == ["unbraced length x must be a finite number greater than zero"]
