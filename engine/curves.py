"""Capacity curves and the elastic buckling stress of every limit state (AISC 360-22 Ch. E).

Both serve the detail of a column in a report (docs/design.md §3, HTML): what the member
carries over a range of effective lengths, with its own point on the curve, and the Fe of
each buckling mode that applies to its section, not only the governing one.  Both run the
equation functions of :mod:`stanchion.engine.compression`, so they agree with the check
itself; internal units (kip, inch, ksi).
"""

from __future__ import annotations

import numpy as np

from stanchion.engine.arrays import FloatArray, IntArray
from stanchion.engine.compression import (
    Fe_flexural,
    Fe_flexural_torsional,
    Fe_torsional,
    Fez,
    H_flexural_constant,
    LimitState,
    available_strength,
    compressive_strength,
    ro_bar_squared,
)
from stanchion.engine.sections import Kind, SectionTable


def capacity_curve(  # noqa: PLR0913 - the inputs of Chapter E that a curve keeps fixed
    sections: SectionTable,
    index: IntArray,
    Fy: FloatArray,
    E: FloatArray | float,
    G: FloatArray | float,
    Lc: FloatArray,
    method: str,
    ratios: FloatArray | None = None,
) -> FloatArray:
    """Available strength of each member over a range of effective lengths.

    The member's section, Fy, E and G stay fixed; its three effective lengths are
    ``Lc · ratios`` (Lcx, Lcy, Lcz in proportion to the largest, which is ``Lc``).  With a
    member's own ratios, the curve at its own largest effective length is its own available
    strength: the point of the member lies on its curve.  One :func:`compressive_strength`
    call over every (Lc, member) pair (AISC 360-22 Chapter E, Section E1 for φc and Ωc).

    Args:
        sections: the section table the members point into.
        index: (m,) row of ``sections`` of each member.
        Fy: (m,) yield stress, ksi.
        E: modulus of elasticity, ksi (one value or one per member).
        G: shear modulus, ksi (one value or one per member).
        Lc: (k,) the effective lengths, in (the largest of the three axes).
        method: ``"LRFD"`` (φc·Pn) or ``"ASD"`` (Pn/Ωc).
        ratios: (m, 3) Lcx, Lcy, Lcz over their largest; default 1, 1, 1 (equal lengths).

    Returns:
        (k, m) available strength, kip: one row per ``Lc``, one column per member.
    """
    index = np.asarray(index, dtype=np.int64).reshape(-1)
    m = len(index)
    Lc = np.asarray(Lc, dtype=float).reshape(-1)
    k = len(Lc)
    r = np.ones((m, 3)) if ratios is None else np.asarray(ratios, dtype=float).reshape(m, 3)
    Fy_m = np.broadcast_to(np.asarray(Fy, dtype=float), (m,))
    E_ = np.broadcast_to(np.asarray(E, dtype=float), (m,))
    G_ = np.broadcast_to(np.asarray(G, dtype=float), (m,))
    # Row-major (Lc, member) pairs, flattened.
    lengths = Lc[:, None, None] * r[None, :, :]  # (k, m, 3)
    comp = compressive_strength(
        sections, np.tile(Fy_m, k), lengths[..., 0].ravel(), lengths[..., 1].ravel(),
        lengths[..., 2].ravel(), np.tile(E_, k), np.tile(G_, k), index=np.tile(index, k))
    Pn = np.where(comp.in_scope, comp.Pn, np.nan)
    return available_strength(Pn, method).reshape(k, m)


def length_ratios(Lcx: FloatArray, Lcy: FloatArray, Lcz: FloatArray
                  ) -> tuple[FloatArray, FloatArray]:
    """The largest effective length of each member and its three lengths over it.

    Args:
        Lcx: (m,) effective length about x, in.
        Lcy: (m,) effective length about y, in.
        Lcz: (m,) effective length for torsion, in.

    Returns:
        (Lc, ratios): (m,) the largest of the three and (m, 3) each over it, the
        arguments :func:`capacity_curve` takes for a member's own proportions.
    """
    stacked = np.stack([np.asarray(a, dtype=float) for a in (Lcx, Lcy, Lcz)], axis=1)
    Lc = stacked.max(axis=1)
    with np.errstate(divide="ignore", invalid="ignore"):
        ratios = stacked / Lc[:, None]
    return Lc, ratios


def buckling_stresses(  # noqa: PLR0913 - the inputs of Chapter E for the elastic stresses
    sections: SectionTable,
    index: IntArray,
    Lcx: FloatArray,
    Lcy: FloatArray,
    Lcz: FloatArray,
    E: FloatArray | float,
    G: FloatArray | float,
) -> FloatArray:
    """The elastic buckling stress Fe of every limit state that applies, per member.

    Columns in :class:`~stanchion.engine.compression.LimitState` order: flexural about x
    and about y (Eq. E3-4, every supported section), torsional (Eq. E4-2, doubly symmetric
    open I shapes) and flexural-torsional (Eq. E4-3 with Eqs. E4-7 to E4-9, tees about y
    and channels about x); NaN where the mode does not apply (closed and solid sections
    have no torsional mode here, AISC 360-22 E4 user note) or the section is unsupported.
    The smallest entry of a row is the Fe :func:`compressive_strength` takes.

    Args:
        sections: the section table the members point into.
        index: (m,) row of ``sections`` of each member.
        Lcx: (m,) effective length about x, in.
        Lcy: (m,) effective length about y, in.
        Lcz: (m,) effective length for torsion, in.
        E: modulus of elasticity, ksi (one value or one per member).
        G: shear modulus, ksi (one value or one per member).

    Returns:
        (m, 4) Fe, ksi.
    """
    index = np.asarray(index, dtype=np.int64).reshape(-1)
    m = len(index)
    sec = sections.take(index)
    E_ = np.broadcast_to(np.asarray(E, dtype=float), (m,))
    G_ = np.broadcast_to(np.asarray(G, dtype=float), (m,))
    Lcx, Lcy, Lcz = (np.asarray(a, dtype=float).reshape(m) for a in (Lcx, Lcy, Lcz))
    out = np.full((m, len(LimitState)), np.nan)
    with np.errstate(divide="ignore", invalid="ignore"):
        out[:, LimitState.FLEXURAL_X] = Fe_flexural(E_, Lcx / sec.rx)
        out[:, LimitState.FLEXURAL_Y] = Fe_flexural(E_, Lcy / sec.ry)
        i_shape = sec.kind == Kind.I_SHAPE
        Ft = Fe_torsional(E_, G_, sec.Cw, sec.J, Lcz, sec.Ix, sec.Iy)
        out[:, LimitState.TORSIONAL] = np.where(i_shape, Ft, np.nan)
        tee, channel = sec.kind == Kind.TEE, sec.kind == Kind.CHANNEL
        ro2 = ro_bar_squared(sec.xo, sec.yo, sec.Ix, sec.Iy, sec.A)
        fez = Fez(E_, G_, sec.Cw, sec.J, Lcz, sec.A, ro2)
        f_sym = np.where(tee, out[:, LimitState.FLEXURAL_Y], out[:, LimitState.FLEXURAL_X])
        ftb = Fe_flexural_torsional(f_sym, fez, H_flexural_constant(sec.xo, sec.yo, ro2))
        out[:, LimitState.FLEXURAL_TORSIONAL] = np.where(tee | channel, ftb, np.nan)
    out[sec.kind == Kind.UNSUPPORTED] = np.nan
    return out
