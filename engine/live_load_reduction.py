"""ASCE 7-22 §4.7: reduction of uniformly distributed floor live loads L, vectorised over members.

Written from memory of ASCE 7-22 Chapter 4 (to be confirmed against the printed standard).
Cross-checked against older printings of the same rules: the KLL table matches ASCE 7-02
Table 4-2 as reproduced in Brockenbrough & Merritt, *Structural Steel Designer's Handbook*,
4th ed., Table 4.4, and the 400 ft², 0.50 / 0.40 and "20 %, but not less than L by the
equation" rules match IBC §1607.11.1 / §1607.10.1 (the building code's copy of ASCE 7 §4.7):

* §4.7.2, Eq. 4.7-1: L = Lo (0.25 + 15 / sqrt(KLL AT)) in US units (AT in ft²), or
  L = Lo (0.25 + 4.57 / sqrt(KLL AT)) in SI units (AT in m²); permitted only for members with
  KLL AT >= 400 ft² (37.16 m²).  L shall not be less than 0.50 Lo for members supporting one
  floor, nor less than 0.40 Lo for members supporting two or more floors.
* §4.7.3 heavy live loads: live loads exceeding 100 psf (4.79 kPa) are not reduced, except
  that members supporting two or more floors may be reduced by up to 20 % (L >= 0.80 Lo), and
  never below L of §4.7.2.
* §4.7.4 passenger vehicle garages: not reduced, except members supporting two or more floors,
  up to 20 % (L >= 0.80 Lo), and never below L of §4.7.2.
* §4.7.5 assembly uses: not reduced.
* Table 4.7-1, live load element factor KLL for columns: interior columns 4; exterior columns
  without cantilever slabs 4; edge columns with cantilever slabs 3; corner columns with
  cantilever slabs 2 (all other members 1).

Roof live load Lr is not reduced here: the roof reduction of §4.8 is not applied (Lr is
carried at its full value, and the takedown says so per member).

A member supporting several floors: the influence area KLL AT is the sum over the floors it
supports of each floor's KLL AT, and "floors supported" counts those floors (ASCE 7-22
Commentary C4.7, from memory; common practice).
"""

from __future__ import annotations

import numpy as np

from stanchion.engine.arrays import BoolArray, FloatArray, IntArray

#: Column positions on a slab (how :mod:`stanchion.engine.tributary` classifies them).
OUTSIDE, INTERIOR, EDGE, CORNER = -1, 0, 1, 2
POSITION_NAMES: dict[int, str] = {OUTSIDE: "outside", INTERIOR: "interior", EDGE: "edge",
                                  CORNER: "corner"}

#: Occupancy classes of §4.7.2-§4.7.5 (a floor's ``use``).
NORMAL, HEAVY, GARAGE, ASSEMBLY = 0, 1, 2, 3
USE_CODES: dict[str, int] = {"normal": NORMAL, "heavy": HEAVY, "garage": GARAGE,
                             "assembly": ASSEMBLY}

#: §4.7.2: smallest influence area KLL AT for which Eq. 4.7-1 is permitted, ft² (37.16 m²).
KLL_AT_MIN_FT2 = 400.0
KLL_AT_MIN_M2 = 37.16
#: §4.7.2: lower limits of L / Lo, one floor and two or more floors.
LIMIT_ONE_FLOOR = 0.50
LIMIT_TWO_FLOORS = 0.40
#: §4.7.3 / §4.7.4: the most a heavy live load or a garage load may be reduced (20 %).
LIMIT_HEAVY_GARAGE = 0.80
#: §4.7.3: a live load above this is heavy, psf.
HEAVY_LIVE_LOAD_PSF = 100.0


def K_LL(position: IntArray, cantilever: BoolArray) -> FloatArray:
    """Live load element factor KLL of columns, ASCE 7-22 Table 4.7-1 (from memory).

    Interior columns 4; exterior (edge or corner) columns without cantilever slabs 4; edge
    columns with cantilever slabs 3; corner columns with cantilever slabs 2.  A column on no
    slab (``OUTSIDE``) gets 1, the table's "all other members".

    Args:
        position: ``INTERIOR``, ``EDGE``, ``CORNER`` or ``OUTSIDE`` per column.
        cantilever: the slab cantilevers beyond the column line.

    Returns:
        KLL per column.
    """
    position = np.asarray(position)
    cantilever = np.asarray(cantilever, dtype=bool)
    out = np.full(position.shape, 4.0)
    out[(position == EDGE) & cantilever] = 3.0
    out[(position == CORNER) & cantilever] = 2.0
    out[position == OUTSIDE] = 1.0
    return out


def L_reduced(Lo: FloatArray | float, KLL: FloatArray | float, AT: FloatArray | float
              ) -> FloatArray:
    """Reduced live load, ASCE 7-22 §4.7.2 Eq. 4.7-1 (US units): Lo (0.25 + 15 / sqrt(KLL AT)).

    The bare equation: its applicability (KLL AT >= 400 ft²) and lower limits are applied by
    :func:`reduction_factor`.

    Args:
        Lo: unreduced design live load (any pressure or force unit; L comes out in it).
        KLL: live load element factor (Table 4.7-1).
        AT: tributary area, ft².

    Returns:
        L in the unit of ``Lo``.
    """
    return np.asarray(Lo, dtype=float) * (0.25 + 15.0 / np.sqrt(np.multiply(KLL, AT)))


def L_reduced_SI(Lo: FloatArray | float, KLL: FloatArray | float, AT: FloatArray | float
                 ) -> FloatArray:
    """Reduced live load, ASCE 7-22 §4.7.2 Eq. 4.7-1 (SI form): Lo (0.25 + 4.57 / sqrt(KLL AT)).

    Args:
        Lo: unreduced design live load (any unit; L comes out in it).
        KLL: live load element factor (Table 4.7-1).
        AT: tributary area, m².

    Returns:
        L in the unit of ``Lo``.
    """
    return np.asarray(Lo, dtype=float) * (0.25 + 4.57 / np.sqrt(np.multiply(KLL, AT)))


def reduction_factor(KLL_AT: FloatArray | float, floors: IntArray | int,
                     use: IntArray | int = NORMAL) -> FloatArray:
    """L / Lo of members by ASCE 7-22 §4.7.2-§4.7.5.

    * ``NORMAL``: Eq. 4.7-1 where KLL AT >= 400 ft² (§4.7.2), not below 0.50 for one floor
      or 0.40 for two or more floors (§4.7.2); 1 below 400 ft².
    * ``HEAVY`` (§4.7.3) and ``GARAGE`` (§4.7.4): 1 for a member supporting one floor; for
      two or more floors the larger of 0.80 and the §4.7.2 value.
    * ``ASSEMBLY`` (§4.7.5): 1.

    Args:
        KLL_AT: influence area KLL AT, ft² (the sum over the floors supported).
        floors: number of floors supported.
        use: occupancy class per member (``NORMAL``, ``HEAVY``, ``GARAGE``, ``ASSEMBLY``).

    Returns:
        The factor L / Lo per member, in (0, 1].
    """
    ka = np.asarray(KLL_AT, dtype=float)
    floors = np.asarray(floors)
    use = np.asarray(use)
    applicable = ka >= KLL_AT_MIN_FT2
    eq = L_reduced(1.0, 1.0, np.where(applicable, ka, KLL_AT_MIN_FT2))
    eq = np.where(applicable, np.minimum(eq, 1.0), 1.0)
    several = floors >= 2  # "two or more floors", §4.7.2
    normal = np.maximum(eq, np.where(several, LIMIT_TWO_FLOORS, LIMIT_ONE_FLOOR))
    limited = np.where(several, np.maximum(eq, LIMIT_HEAVY_GARAGE), 1.0)
    out = np.where((use == HEAVY) | (use == GARAGE), limited, normal)
    out = np.where(use == ASSEMBLY, 1.0, out)
    return np.broadcast_to(out, np.broadcast_shapes(ka.shape, floors.shape, use.shape)).astype(
        float)
