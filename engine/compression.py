"""Available axial compressive strength, AISC 360-22 Chapter E.

Every function is vectorized over members (numpy arrays, internal units kip, inch, ksi) and
implements one code equation, named after its symbol.  :func:`compressive_strength` combines
them: flexural buckling about both axes (E3), torsional buckling of doubly symmetric open
shapes, flexural-torsional buckling of singly symmetric tees and channels and the
slender-element effective area (E7).

Scope notes:
- The critical stress of every buckling mode follows :func:`Fcr` with that mode's elastic
  buckling stress Fe.  As Fcr is increasing in Fe, the governing mode is the one with the
  smallest Fe and Fcr is computed once.
- Torsional buckling is not evaluated for closed and solid sections (HSS, pipe, solid bars):
  their torsional stiffness makes it non-governing (AISC 360-22 E4 user note).
- Round HSS with D/t >= 0.45 E/Fy are outside Section E7's scope and are not checked.
"""

from __future__ import annotations

from dataclasses import dataclass
from enum import IntEnum

import numpy as np
from numpy.typing import NDArray

from stanchion.engine.arrays import BoolArray, FloatArray, IntArray, ObjectArray
from stanchion.engine.sections import ElementClass, Kind, SectionTable, class_coefficients

PHI_C = 0.90  # AISC 360-22 E1, LRFD resistance factor for compression
OMEGA_C = 1.67  # AISC 360-22 E1, ASD safety factor for compression
SLENDERNESS_ADVISORY = 200.0
_LN_0658 = float(np.log(0.658))  # AISC 360-22 E2 user note: Lc/r preferably not over 200


class LimitState(IntEnum):
    """Buckling modes considered, in the order of the Fe matrix columns."""

    FLEXURAL_X = 0
    FLEXURAL_Y = 1
    TORSIONAL = 2
    FLEXURAL_TORSIONAL = 3


LIMIT_STATE_NAMES = (
    "flexural buckling about x",
    "flexural buckling about y",
    "torsional buckling",
    "flexural-torsional buckling",
)
_LIMIT_STATE_NAMES = np.asarray(LIMIT_STATE_NAMES, dtype=object)


# --- E3: flexural buckling -------------------------------------------------------------------


def Fe_flexural(E: FloatArray, Lc_r: FloatArray) -> FloatArray:
    """Elastic flexural buckling stress Fe = π²E / (Lc/r)².

    AISC 360-22 Eq. E3-4 (the same expression gives Fex and Fey in Eqs. E4-5 and E4-6).
    """
    with np.errstate(divide="ignore", over="ignore"):  # zero / tiny length: Fe = inf
        return np.pi**2 * E / (Lc_r * Lc_r)


def Fcr_inelastic(Fy: FloatArray, Fe: FloatArray) -> FloatArray:
    """Critical stress when Fy/Fe <= 2.25: Fcr = 0.658^(Fy/Fe) · Fy.  AISC 360-22 Eq. E3-2.

    Evaluated as exp(ln 0.658 · Fy/Fe), the same number, faster than a power.
    """
    return np.exp(_LN_0658 * (Fy / Fe)) * Fy


def Fcr_elastic(Fe: FloatArray) -> FloatArray:
    """Critical stress when Fy/Fe > 2.25: Fcr = 0.877 · Fe.  AISC 360-22 Eq. E3-3."""
    return 0.877 * Fe


def Fcr(Fy: FloatArray, Fe: FloatArray) -> FloatArray:
    """Critical stress, inelastic or elastic branch (the limit Lc/r = 4.71√(E/Fy) is Fy/Fe = 2.25).

    AISC 360-22 Section E3(a)/(b); also used by E4 and E7 with the governing Fe.
    """
    with np.errstate(divide="ignore", invalid="ignore"):
        out = Fcr_inelastic(Fy, Fe)
        elastic = np.flatnonzero(Fy > 2.25 * Fe)
        if len(elastic):
            out[elastic] = Fcr_elastic(np.take(Fe, elastic))
        return out


def Pn(Fcr_: FloatArray, area: FloatArray) -> FloatArray:
    """Nominal compressive strength Pn = Fcr · A.

    AISC 360-22 Eq. E3-1 and E4-1 with A = Ag; Eq. E7-1 with A = Ae.
    """
    return Fcr_ * area


# --- E4: torsional and flexural-torsional buckling --------------------------------------------


def Fe_torsional(
    E: FloatArray, G: FloatArray, Cw: FloatArray, J: FloatArray, Lcz: FloatArray,
    Ix: FloatArray, Iy: FloatArray,
) -> FloatArray:
    """Torsional buckling of doubly symmetric members: Fe = (π²ECw/Lcz² + GJ) / (Ix + Iy).

    AISC 360-22 Eq. E4-2.
    """
    with np.errstate(divide="ignore", over="ignore"):  # zero / tiny length: Fe = inf
        return (np.pi**2 * E * Cw / (Lcz * Lcz) + G * J) / (Ix + Iy)


def ro_bar_squared(xo: FloatArray, yo: FloatArray, Ix: FloatArray, Iy: FloatArray,
                   Ag: FloatArray) -> FloatArray:
    """Polar radius of gyration about the shear centre squared: r̄o² = xo² + yo² + (Ix+Iy)/Ag.

    AISC 360-22 Eq. E4-9.
    """
    return xo * xo + yo * yo + (Ix + Iy) / Ag


def H_flexural_constant(xo: FloatArray, yo: FloatArray, ro2: FloatArray) -> FloatArray:
    """Flexural constant H = 1 − (xo² + yo²) / r̄o².  AISC 360-22 Eq. E4-8."""
    return 1.0 - (xo * xo + yo * yo) / ro2


def Fez(
    E: FloatArray, G: FloatArray, Cw: FloatArray, J: FloatArray, Lcz: FloatArray,
    Ag: FloatArray, ro2: FloatArray,
) -> FloatArray:
    """Torsional buckling stress about the shear centre: Fez = (π²ECw/Lcz² + GJ) / (Ag r̄o²).

    AISC 360-22 Eq. E4-7.
    """
    with np.errstate(divide="ignore", over="ignore"):  # zero / tiny length: Fe = inf
        return (np.pi**2 * E * Cw / (Lcz * Lcz) + G * J) / (Ag * ro2)


def Fe_flexural_torsional(F_sym: FloatArray, Fez_: FloatArray, H: FloatArray) -> FloatArray:
    """Flexural-torsional buckling of singly symmetric members about the axis of symmetry.

    Fe = (F_sym + Fez)/(2H) · [1 − √(1 − 4·F_sym·Fez·H / (F_sym + Fez)²)], with F_sym = Fey
    when y is the axis of symmetry (tees) and Fex when x is (channels).  AISC 360-22 Eq. E4-3.
    """
    s = F_sym + Fez_
    with np.errstate(invalid="ignore", divide="ignore"):
        # 4·F_sym·Fez·H/(F_sym+Fez)² written with ratios <= 1, so no overflow at tiny lengths.
        root = np.sqrt(np.clip(1.0 - 4.0 * H * (F_sym / s) * (Fez_ / s), 0.0, None))
        out = s / (2.0 * H) * (1.0 - root)
    # Both stresses infinite (zero length): no buckling.
    return np.where(np.isfinite(s), out, np.inf)


# --- E7: members with slender elements --------------------------------------------------------


def lambda_r(k: FloatArray, E: FloatArray, Fy: FloatArray) -> FloatArray:
    """Limiting width-to-thickness ratio λr = k·√(E/Fy) for compression elements.

    AISC 360-22 Table B4.1a, cases 1, 4, 5 and 6 (k = 0.56, 0.75, 1.49, 1.40); case 2
    (flanges of built-up I sections, λr = 0.64·√(kc·E/Fy)) with k = 0.64·√kc (:func:`kc`).
    """
    return k * np.sqrt(E / Fy)


KC_MIN = 0.35  # AISC 360-22 Table B4.1a note [a]: kc not taken less than 0.35 ...
KC_MAX = 0.76  # ... nor greater than 0.76 for calculation purposes


def kc(h_tw: FloatArray) -> FloatArray:
    """Flange local buckling coefficient kc = 4/√(h/tw), 0.35 ≤ kc ≤ 0.76.

    AISC 360-22 Table B4.1a note [a], used by case 2 (flanges of built-up I-shaped
    sections).  An unknown or non-positive h/tw gives the lower limit 0.35 (the smaller
    λr: conservative).
    """
    h_tw = np.asarray(h_tw, dtype=float)
    with np.errstate(divide="ignore", invalid="ignore"):
        value = 4.0 / np.sqrt(h_tw)
    return np.where(np.isfinite(value) & (h_tw > 0), np.clip(value, KC_MIN, KC_MAX), KC_MIN)


def Fel(c2: FloatArray, lam_r: FloatArray, lam: FloatArray, Fy: FloatArray) -> FloatArray:
    """Elastic local buckling stress Fel = (c2·λr/λ)² · Fy.  AISC 360-22 Eq. E7-4."""
    with np.errstate(divide="ignore", invalid="ignore"):
        return (c2 * lam_r / lam) ** 2 * Fy


def be_full(b: FloatArray) -> FloatArray:
    """Effective width when λ <= λr·√(Fy/Fcr): be = b.  AISC 360-22 Eq. E7-2."""
    return b


def be_reduced(b: FloatArray, c1: FloatArray, Fel_: FloatArray, Fcr_: FloatArray) -> FloatArray:
    """Effective width when λ > λr·√(Fy/Fcr): be = b·(1 − c1·√(Fel/Fcr))·√(Fel/Fcr).

    AISC 360-22 Eq. E7-3.
    """
    with np.errstate(invalid="ignore", divide="ignore"):
        q = np.sqrt(Fel_ / Fcr_)
    return b * (1.0 - c1 * q) * q


def element_deduction(  # noqa: PLR0913 - the symbols of Section E7.1 and Table E7.1
    b: FloatArray, t: FloatArray, n: IntArray, k: FloatArray, c1: FloatArray,
    c2: FloatArray, E: FloatArray, Fy: FloatArray, Fcr_: FloatArray,
) -> FloatArray:
    """Area lost to local buckling by one element group: n·(b − be)·t.

    AISC 360-22 Section E7.1: Ae is Ag less the ineffective part of each slender element;
    ``k``, ``c1``, ``c2`` are the element's λr coefficient (Table B4.1a) and Table E7.1
    factors.  be is reduced (be_reduced) where λ > λr·√(Fy/Fcr), else the full width.
    """
    with np.errstate(divide="ignore", invalid="ignore"):
        lam = b / t
        lam_r = lambda_r(k, E, Fy)
        slender = (n > 0) & (lam > lam_r * np.sqrt(Fy / Fcr_))
        be = np.minimum(be_reduced(b, c1, Fel(c2, lam_r, lam, Fy), Fcr_), be_full(b))
        lost = n * (b - be) * t
    return np.where(slender, lost, 0.0)


def Ae_round_compact(Ag: FloatArray) -> FloatArray:
    """Round HSS with D/t <= 0.11·E/Fy: Ae = Ag.  AISC 360-22 Eq. E7-6."""
    return Ag


def Ae_round_slender(E: FloatArray, Fy: FloatArray, D_t: FloatArray,
                     Ag: FloatArray) -> FloatArray:
    """Round HSS with 0.11·E/Fy < D/t < 0.45·E/Fy: Ae = [0.038·E/(Fy·D/t) + 2/3]·Ag.

    AISC 360-22 Eq. E7-7.
    """
    return (0.038 * E / (Fy * D_t) + 2.0 / 3.0) * Ag


def Ae_round(E: FloatArray, Fy: FloatArray, D_t: FloatArray, Ag: FloatArray) -> FloatArray:
    """Effective area of round HSS (NaN where D/t >= 0.45 E/Fy, out of E7's scope).

    Ae_round_slender exceeds Ag just past D/t = 0.11 E/Fy (1.012·Ag at the limit); an
    effective area is a reduction of the gross one, so it is capped at Ag.
    """
    limit = D_t * Fy / E
    with np.errstate(divide="ignore", invalid="ignore"):
        slender = np.minimum(Ae_round_slender(E, Fy, D_t, Ag), Ag)
    return np.where(limit <= 0.11, Ae_round_compact(Ag), np.where(limit < 0.45, slender, np.nan))


# --- the whole chapter --------------------------------------------------------------------


@dataclass
class CompressionResult:
    """Chapter E results, one entry per member (kip, ksi).

    Attributes:
        Pn: nominal compressive strength.
        Fcr: critical stress of the governing mode.
        Fe: elastic buckling stress of the governing mode.
        Ae: effective area (equals Ag when no element is slender).
        Ag: gross area.
        slenderness: the larger of Lcx/rx and Lcy/ry.
        limit_state: :class:`LimitState` code of the governing mode.
        slender: True where Ae < Ag.
        in_scope: False where Chapter E as implemented does not apply (see ``scope_reason``).
    """

    Pn: FloatArray
    Fcr: FloatArray
    Fe: FloatArray
    Ae: FloatArray
    Ag: FloatArray
    slenderness: FloatArray
    limit_state: IntArray
    slender: BoolArray
    in_scope: BoolArray

    def limit_state_names(self) -> ObjectArray:
        """Readable names, with "(slender elements)" where Ae < Ag."""
        names = _LIMIT_STATE_NAMES[self.limit_state]
        slender = self.slender.nonzero()[0]
        if len(slender):
            names[slender] = names[slender] + " (slender elements)"
        return names


CHUNK = 65536  # members per block: keeps the temporaries in cache
# Kind codes as plain ints (comparing an array with an IntEnum member is slower).
_I_SHAPE, _TEE, _CHANNEL, _UNSUPPORTED = (
    int(k) for k in (Kind.I_SHAPE, Kind.TEE, Kind.CHANNEL, Kind.UNSUPPORTED))


@dataclass
class _RowConstants:
    """Per-section-row constants used by every block (computed once per call)."""

    kind: NDArray[np.int8]  # Kind codes
    inv_rx: FloatArray  # 1/rx, 1/ry
    inv_ry: FloatArray
    ro2: FloatArray  # r̄o² and H (ro_bar_squared, H_flexural_constant): tees, channels
    H: FloatArray
    groups: tuple[tuple[FloatArray, ...], ...]  # per element group: (λ, λ², k², k, c1, c2)
    round_: BoolArray

    @classmethod
    def cached(cls, sec: SectionTable) -> _RowConstants:
        """Constants of ``sec``, kept on the table when its arrays are read-only (catalog)."""
        hit: _RowConstants | None = getattr(sec, "_chapter_e_constants", None)
        if hit is not None:
            return hit
        out = cls.of(sec)
        if not sec.A.flags.writeable:
            # A private cache on the shared read-only table, not a field of SectionTable (its
            # fields are columns that take() and concat() gather).
            sec._chapter_e_constants = out  # type: ignore[attr-defined]
        return out

    @classmethod
    def of(cls, sec: SectionTable) -> _RowConstants:
        """Compute the constants of ``sec``, one entry per row."""
        with np.errstate(divide="ignore", invalid="ignore"):
            inv_rx, inv_ry = 1.0 / sec.rx, 1.0 / sec.ry
            ro2 = ro_bar_squared(sec.xo, sec.yo, sec.Ix, sec.Iy, sec.A)
            H = H_flexural_constant(sec.xo, sec.yo, ro2)
        groups = []
        for b, t, n, c in ((sec.b1, sec.t1, sec.n1, sec.cls1), (sec.b2, sec.t2, sec.n2, sec.cls2)):
            with np.errstate(divide="ignore", invalid="ignore", over="ignore"):
                lam = np.where(n > 0, b / t, 0.0)
                lam2 = lam * lam  # a damaged model's 1e300 dimension: inf, not a warning
            k, c1, c2 = class_coefficients(c)
            built_up = (c == ElementClass.BUILT_UP_FLANGE).nonzero()[0]
            if len(built_up):  # Table B4.1a case 2: k = 0.64·√kc, kc from the web's h/tw
                with np.errstate(divide="ignore", invalid="ignore"):
                    h_tw = sec.b2[built_up] / sec.t2[built_up]
                k[built_up] *= np.sqrt(kc(h_tw))
            groups.append((lam, lam2, k * k, k, c1, c2))
        return cls(sec.kind.astype(np.int8), inv_rx, inv_ry, ro2, H, tuple(groups),
                   sec.kind == Kind.ROUND_HSS)


@dataclass(frozen=True)
class _MemberInputs:
    """Per-member inputs of Chapter E (ksi, in), one entry per member."""

    Fy: FloatArray
    Lcx: FloatArray
    Lcy: FloatArray
    Lcz: FloatArray
    E: FloatArray
    G: FloatArray

    def __getitem__(self, sl: slice) -> _MemberInputs:
        return _MemberInputs(self.Fy[sl], self.Lcx[sl], self.Lcy[sl], self.Lcz[sl], self.E[sl],
                             self.G[sl])


def compressive_strength(
    sec: SectionTable,
    Fy: FloatArray,
    Lcx: FloatArray,
    Lcy: FloatArray,
    Lcz: FloatArray,
    E: FloatArray | float = 29000.0,
    G: FloatArray | float = 11200.0,
    index: IntArray | None = None,
) -> CompressionResult:
    """Nominal compressive strength Pn of every member (AISC 360-22 Chapter E).

    Members are processed in blocks of :data:`CHUNK`; within a block every limit state is
    evaluated on the members it applies to (torsional on open I shapes, flexural-torsional on
    tees and channels, E7 on members whose elements exceed λr) with the equation functions
    above.

    Args:
        sec: section rows: one per member, or (with ``index``) the table members point into.
        Fy: yield stress, ksi.
        Lcx: effective length K·L for flexural buckling about x, in.
        Lcy: effective length K·L for flexural buckling about y, in.
        Lcz: effective length K·L for torsional buckling, in.
        E: modulus of elasticity, ksi (one value or one per member).
        G: shear modulus, ksi (one value or one per member).
        index: optional row of ``sec`` for each member (avoids gathering whole rows).

    Returns:
        The results, one entry per member.
    """
    Fy = np.asarray(Fy, dtype=float)
    n = len(Fy)
    members = _MemberInputs(Fy, *(_per_member(a, n) for a in (Lcx, Lcy, Lcz, E, G)))
    limits = _RowConstants.cached(sec)
    if n <= CHUNK:  # one block: its arrays are the result
        rows = index if index is not None else np.arange(n)
        return _block(sec, limits, rows, members)
    out = CompressionResult(
        Pn=np.empty(n), Fcr=np.empty(n), Fe=np.empty(n), Ae=np.empty(n), Ag=np.empty(n),
        slenderness=np.empty(n), limit_state=np.empty(n, dtype=np.int64),
        slender=np.empty(n, dtype=bool), in_scope=np.empty(n, dtype=bool),
    )
    for start in range(0, n, CHUNK):
        sl = slice(start, min(n, start + CHUNK))
        rows = index[sl] if index is not None else np.arange(sl.start, sl.stop)
        _block(sec, limits, rows, members[sl], out, sl)
    return out


def _per_member(a: FloatArray | float, n: int) -> FloatArray:
    """``a`` as a float array of length ``n`` (a scalar is repeated; arrays are not copied)."""
    a = np.asarray(a, dtype=float)
    return a if a.shape == (n,) else np.broadcast_to(a, (n,))


def _block(sec: SectionTable, lim: _RowConstants, rows: IntArray, members: _MemberInputs,
           out: CompressionResult | None = None, sl: slice | None = None) -> CompressionResult:
    """Chapter E for one block of members.

    Written for speed: integer gathers (ndarray.take) and masked updates on the members a limit
    state applies to, no boolean-mask copies of whole blocks.

    Args:
        sec: the section rows members point into.
        lim: the constants of those rows.
        rows: the row of ``sec`` of each member of the block.
        members: the block's per-member inputs.
        out: results of all the members, when there are several blocks.
        sl: the block's members within ``out``.

    Returns:
        ``out`` with the block's results written into ``out[sl]``; without ``out``, the
        block's own results.
    """
    Fy, Lcx, Lcy, Lcz, E, G = (members.Fy, members.Lcx, members.Lcy, members.Lcz, members.E,
                               members.G)
    kind = lim.kind.take(rows)
    Ag = sec.A.take(rows)
    with np.errstate(invalid="ignore"):
        Lcx_rx = Lcx * lim.inv_rx.take(rows)
        Lcy_ry = Lcy * lim.inv_ry.take(rows)
    Fex = Fe_flexural(E, Lcx_rx)
    Fey = Fe_flexural(E, Lcy_ry)
    # E3: the smaller of the two axes (x wins ties).
    Fe = np.minimum(Fex, Fey)
    mode = (Fey < Fex).astype(np.int64)

    def lower(sub: IntArray, F: FloatArray, code: LimitState, ties: bool = False) -> None:
        low = (F <= Fe.take(sub) if ties else F < Fe.take(sub)).nonzero()[0]
        if len(low):
            at = sub.take(low)
            Fe[at] = F.take(low)
            mode[at] = code

    # Torsional buckling of doubly symmetric open shapes (Fe_torsional).
    sub = (kind == _I_SHAPE).nonzero()[0]
    if len(sub):
        r = rows.take(sub)
        Ft = Fe_torsional(E.take(sub), G.take(sub), sec.Cw.take(r), sec.J.take(r),
                          Lcz.take(sub), sec.Ix.take(r), sec.Iy.take(r))
        lower(sub, Ft, LimitState.TORSIONAL)

    # Flexural-torsional buckling of tees (about y) and channels (about x).
    sub = ((kind == _TEE) | (kind == _CHANNEL)).nonzero()[0]
    if len(sub):
        r = rows.take(sub)
        fez = Fez(E.take(sub), G.take(sub), sec.Cw.take(r), sec.J.take(r),
                  Lcz.take(sub), Ag.take(sub), lim.ro2.take(r))
        f_sym = np.where(kind.take(sub) == _TEE, Fey.take(sub), Fex.take(sub))
        lower(sub, Fe_flexural_torsional(f_sym, fez, lim.H.take(r)),
              LimitState.FLEXURAL_TORSIONAL, ties=True)

    Fcr_ = Fcr(Fy, Fe)

    # E7: only elements beyond λr can lose area (λ > λr ⇔ λ²·Fy > k²·E).
    EF = E / Fy
    Ae = Ag.copy()
    in_scope = kind != _UNSUPPORTED
    groups = ((sec.b1, sec.t1, sec.n1), (sec.b2, sec.t2, sec.n2))
    for (b, t, n), (_, lam2, k2, k, c1, c2) in zip(groups, lim.groups, strict=True):
        sub = (lam2.take(rows) > k2.take(rows) * EF).nonzero()[0]
        if len(sub):
            r = rows.take(sub)
            Ae[sub] -= element_deduction(b.take(r), t.take(r), n.take(r), k.take(r),
                                         c1.take(r), c2.take(r), E.take(sub),
                                         Fy.take(sub), Fcr_.take(sub))
    sub = (lim.round_.take(rows)).nonzero()[0]
    if len(sub):
        Ae_r = Ae_round(E.take(sub), Fy.take(sub), lim.groups[0][0].take(rows.take(sub)),
                        Ag.take(sub))
        Ae[sub] = Ae_r
        in_scope[sub] = np.isfinite(Ae_r)

    slender = Ae < Ag * (1.0 - 1e-12)
    if out is None:
        return CompressionResult(
            Pn=Pn(Fcr_, Ae), Fcr=Fcr_, Fe=Fe, Ae=Ae, Ag=Ag, slenderness=np.fmax(Lcx_rx, Lcy_ry),
            limit_state=mode, slender=slender, in_scope=in_scope,
        )
    # Written in place while the block's arrays are still in cache.
    out.Pn[sl] = Pn(Fcr_, Ae)
    out.Fcr[sl] = Fcr_
    out.Fe[sl] = Fe
    out.Ae[sl] = Ae
    out.Ag[sl] = Ag
    np.fmax(Lcx_rx, Lcy_ry, out=out.slenderness[sl])
    out.limit_state[sl] = mode
    out.slender[sl] = slender
    out.in_scope[sl] = in_scope
    return out


def available_strength(Pn_: FloatArray, method: str) -> FloatArray:
    """φc·Pn (LRFD) or Pn/Ωc (ASD).  AISC 360-22 Section E1."""
    method = method.upper()
    if method == "LRFD":
        return PHI_C * Pn_
    if method == "ASD":
        return Pn_ / OMEGA_C
    raise ValueError(f"unknown design method {method!r}; expected LRFD or ASD")

