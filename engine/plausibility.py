"""Plausibility limits: values no real steel column has, the mark of a unit mistake.

A model whose length unit is wrong by 1000 (mm read as m), a load table in kN read as N or a
yield stress typed in Pa instead of MPa gives numbers far outside any steel column; such a
member is not checked ("implausible <what> <value>: check the units"), never passed.
Internal units: kip, inch, ksi. Each limit names its source beside it (docs/design.md §8).
"""

from __future__ import annotations

from typing import TYPE_CHECKING

import numpy as np

from stanchion.engine.masks import any_set

if TYPE_CHECKING:
    from stanchion.engine.arrays import BoolArray, FloatArray, ObjectArray
    from stanchion.engine.members import MemberTable

#: Yield stress, ksi. The grades of engine/materials.py span 35–100 ksi (ASTM A53 Gr B 35 ksi,
#: EN S235 34 ksi, ASTM A514 / EN S690 about 100 ksi); 20–120 ksi leaves a margin on both
#: sides (common practice, no source).
FY_MIN, FY_MAX = 20.0, 120.0
#: Modulus of elasticity, ksi: 29,000 ksi (AISC 360-22 §B4 nomenclature, E) and 210,000 MPa
#: = 30,458 ksi (EN 1993-1-1 §3.2.6); ±20 % around 29,000 ksi (common practice, no source).
E_MIN, E_MAX = 23_200.0, 34_800.0
#: Largest rolled area, in²: W36X925, A = 272 in² (AISC Shapes Database v16.0).
LARGEST_ROLLED_AREA = 272.0
#: Built-up columns (box and plated sections) up to four times the largest rolled area
#: (common practice, no source).
BUILT_UP_MARGIN = 4.0
#: Smallest catalog area, in²: PIPE1/2STD, A = 0.234 in² (AISC Shapes Database v16.0); half
#: of it as the floor (common practice, no source).
AREA_MIN, AREA_MAX = 0.117, LARGEST_ROLLED_AREA * BUILT_UP_MARGIN
#: Section depth, in: the deepest rolled shape is W44X408, d = 44.8 in, the shallowest
#: PIPE1/2STD, d = 0.84 in (AISC Shapes Database v16.0); built-up columns up to 120 in
#: (10 ft), and half the shallowest as the floor (common practice, no source).
DEPTH_MIN, DEPTH_MAX = 0.42, 120.0
#: Member and unbraced lengths, in: 1 ft to 200 ft (common practice, no source).
LENGTH_MIN, LENGTH_MAX = 12.0, 2400.0
#: Magnitude of a load or a required strength, kip (common practice, no source).
LOAD_MAX = 100_000.0
#: Effective length factor K: 0.5 is the theoretical value of a column fixed at both ends,
#: the smallest of AISC 360-22 Commentary Table C-A-7.1; no upper limit (a larger K only
#: lowers the capacity).  The fuzz test (issue 13 item 6) found KX = 1E-300 passing a
#: failing column.
K_MIN, K_MAX = 0.5, np.inf

#: (what, unit shown, internal units per unit shown) of each test, in the order they apply
#: (a member gets the first); lengths are shown in ft.
_TESTS = (
    ("yield stress", "ksi", 1.0),
    ("modulus of elasticity E", "ksi", 1.0),
    ("section area", "in²", 1.0),
    ("section depth", "in", 1.0),
    ("unbraced length x", "ft", 12.0),
    ("unbraced length y", "ft", 12.0),
    ("unbraced length z", "ft", 12.0),
    ("load", "kip", 1.0),
    ("required strength", "kip", 1.0),
    ("effective length factor KX", "", 1.0),
    ("effective length factor KY", "", 1.0),
    ("effective length factor KZ", "", 1.0),
)


def _outside(values: FloatArray, low: float, high: float) -> BoolArray:
    """True where a known value lies outside [low, high] (NaN is never outside)."""
    with np.errstate(invalid="ignore"):
        return (values < low) | (values > high)


def _largest_load(loads: FloatArray) -> float:
    """The load of largest magnitude in one member's row (loads given)."""
    known = loads[~np.isnan(loads)]
    return float(known[np.abs(known).argmax()]) if len(known) else float("nan")


def implausible_reasons(m: MemberTable, candidates: BoolArray) -> ObjectArray:
    """The first plausibility limit each candidate member breaks, as a reason, or None.

    Args:
        m: the members (kip, inch, ksi).
        candidates: members to test (those without another reason).

    Returns:
        One entry per member: "implausible <what> <value> <unit>: check the units", or None.
    """
    n = len(m)
    reason = np.full(n, None, dtype=object)
    if not any_set(candidates):
        return reason
    if len(m.sections):
        idx = m.section_index
        has_section = idx >= 0
        safe = np.where(has_section, idx, 0)
        area = np.where(has_section, m.sections.A.take(safe), np.nan)
        depth = np.where(has_section, m.sections.d.take(safe), np.nan)
    else:
        area = depth = np.full(n, np.nan)
    masks = np.empty((len(_TESTS), n), dtype=bool)
    with np.errstate(invalid="ignore"):
        for row, (values, low, high) in enumerate((
                (m.Fy, FY_MIN, FY_MAX), (m.E, E_MIN, E_MAX), (area, AREA_MIN, AREA_MAX),
                (depth, DEPTH_MIN, DEPTH_MAX), (m.lx, LENGTH_MIN, LENGTH_MAX),
                (m.ly, LENGTH_MIN, LENGTH_MAX), (m.lz, LENGTH_MIN, LENGTH_MAX))):
            masks[row] = _outside(values, low, high)
        masks[7] = (np.abs(m.loads) > LOAD_MAX).any(axis=1) if m.loads.shape[1] else False
        masks[8] = np.abs(m.required_strength) > LOAD_MAX
        for row, k in enumerate((m.kx, m.ky, m.kz), start=9):
            masks[row] = _outside(k, K_MIN, K_MAX)
    hit = masks.any(axis=0) & candidates
    if any_set(hit):
        first = masks.argmax(axis=0)
        columns = (m.Fy, m.E, area, depth, m.lx, m.ly, m.lz, None, m.required_strength,
                   m.kx, m.ky, m.kz)
        for i in hit.nonzero()[0].tolist():
            what, unit, per = _TESTS[first[i]]
            column = columns[first[i]]
            value = _largest_load(m.loads[i]) if column is None else float(column[i])
            shown = f"{value / per:.4g} {unit}".rstrip()
            reason[i] = f"implausible {what} {shown}: check the units"
    return reason
