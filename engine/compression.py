"""Available axial compressive strength, AISC 360-22 Chapter E.

Every function is vectorized over members (numpy arrays, internal units kip, inch, ksi) and
implements one code equation, named after its symbol.  :func:`compressive_strength` combines
them: flexural buckling about both axes (E3), torsional buckling of doubly symmetric open
shapes (E4-2), flexural-torsional buckling of singly symmetric tees and channels (E4-3) and the
slender-element effective area (E7).

Scope notes:
- The critical stress of every buckling mode follows E3-2 / E3-3 with that mode's elastic
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

from engine.sections import Kind, SectionTable, class_coefficients

PHI_C = 0.90  # AISC 360-22 E1, LRFD resistance factor for compression
OMEGA_C = 1.67  # AISC 360-22 E1, ASD safety factor for compression
SLENDERNESS_ADVISORY = 200.0  # AISC 360-22 E2 user note: Lc/r preferably not over 200


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


# --- E3: flexural buckling -------------------------------------------------------------------


def Fe_flexural(E: np.ndarray, Lc_r: np.ndarray) -> np.ndarray:
    """Elastic flexural buckling stress Fe = π²E / (Lc/r)².

    AISC 360-22 Eq. E3-4 (the same expression gives Fex and Fey in Eqs. E4-5 and E4-6).
    """
    with np.errstate(divide="ignore"):
        return np.pi**2 * E / (Lc_r * Lc_r)


def Fcr_inelastic(Fy: np.ndarray, Fe: np.ndarray) -> np.ndarray:
    """Critical stress when Fy/Fe <= 2.25: Fcr = 0.658^(Fy/Fe) · Fy.  AISC 360-22 Eq. E3-2."""
    return np.power(0.658, Fy / Fe) * Fy


def Fcr_elastic(Fe: np.ndarray) -> np.ndarray:
    """Critical stress when Fy/Fe > 2.25: Fcr = 0.877 · Fe.  AISC 360-22 Eq. E3-3."""
    return 0.877 * Fe


def Fcr(Fy: np.ndarray, Fe: np.ndarray) -> np.ndarray:
    """Critical stress by E3-2 or E3-3 (the limit Lc/r = 4.71√(E/Fy) is Fy/Fe = 2.25).

    AISC 360-22 Section E3(a)/(b); also used by E4 and E7 with the governing Fe.
    """
    with np.errstate(divide="ignore", invalid="ignore"):
        ratio = Fy / Fe
        return np.where(ratio <= 2.25, Fcr_inelastic(Fy, Fe), Fcr_elastic(Fe))


def Pn(Fcr_: np.ndarray, area: np.ndarray) -> np.ndarray:
    """Nominal compressive strength Pn = Fcr · A.

    AISC 360-22 Eq. E3-1 and E4-1 with A = Ag; Eq. E7-1 with A = Ae.
    """
    return Fcr_ * area


# --- E4: torsional and flexural-torsional buckling --------------------------------------------


def Fe_torsional(
    E: np.ndarray, G: np.ndarray, Cw: np.ndarray, J: np.ndarray, Lcz: np.ndarray,
    Ix: np.ndarray, Iy: np.ndarray,
) -> np.ndarray:
    """Torsional buckling of doubly symmetric members: Fe = (π²ECw/Lcz² + GJ) / (Ix + Iy).

    AISC 360-22 Eq. E4-2.
    """
    with np.errstate(divide="ignore"):
        return (np.pi**2 * E * Cw / (Lcz * Lcz) + G * J) / (Ix + Iy)


def ro_bar_squared(xo: np.ndarray, yo: np.ndarray, Ix: np.ndarray, Iy: np.ndarray,
                   Ag: np.ndarray) -> np.ndarray:
    """Polar radius of gyration about the shear centre squared: r̄o² = xo² + yo² + (Ix+Iy)/Ag.

    AISC 360-22 Eq. E4-9.
    """
    return xo * xo + yo * yo + (Ix + Iy) / Ag


def H_flexural_constant(xo: np.ndarray, yo: np.ndarray, ro2: np.ndarray) -> np.ndarray:
    """Flexural constant H = 1 − (xo² + yo²) / r̄o².  AISC 360-22 Eq. E4-8."""
    return 1.0 - (xo * xo + yo * yo) / ro2


def Fez(
    E: np.ndarray, G: np.ndarray, Cw: np.ndarray, J: np.ndarray, Lcz: np.ndarray,
    Ag: np.ndarray, ro2: np.ndarray,
) -> np.ndarray:
    """Torsional buckling stress about the shear centre: Fez = (π²ECw/Lcz² + GJ) / (Ag r̄o²).

    AISC 360-22 Eq. E4-7.
    """
    with np.errstate(divide="ignore"):
        return (np.pi**2 * E * Cw / (Lcz * Lcz) + G * J) / (Ag * ro2)


def Fe_flexural_torsional(F_sym: np.ndarray, Fez_: np.ndarray, H: np.ndarray) -> np.ndarray:
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


def lambda_r(k: np.ndarray, E: np.ndarray, Fy: np.ndarray) -> np.ndarray:
    """Limiting width-to-thickness ratio λr = k·√(E/Fy) for compression elements.

    AISC 360-22 Table B4.1a, cases 1, 4, 5 and 6 (k = 0.56, 0.75, 1.49, 1.40).
    """
    return k * np.sqrt(E / Fy)


def Fel(c2: np.ndarray, lam_r: np.ndarray, lam: np.ndarray, Fy: np.ndarray) -> np.ndarray:
    """Elastic local buckling stress Fel = (c2·λr/λ)² · Fy.  AISC 360-22 Eq. E7-4."""
    with np.errstate(divide="ignore", invalid="ignore"):
        return (c2 * lam_r / lam) ** 2 * Fy


def be_full(b: np.ndarray) -> np.ndarray:
    """Effective width when λ <= λr·√(Fy/Fcr): be = b.  AISC 360-22 Eq. E7-2."""
    return b


def be_reduced(b: np.ndarray, c1: np.ndarray, Fel_: np.ndarray, Fcr_: np.ndarray) -> np.ndarray:
    """Effective width when λ > λr·√(Fy/Fcr): be = b·(1 − c1·√(Fel/Fcr))·√(Fel/Fcr).

    AISC 360-22 Eq. E7-3.
    """
    with np.errstate(invalid="ignore", divide="ignore"):
        q = np.sqrt(Fel_ / Fcr_)
    return b * (1.0 - c1 * q) * q


def element_deduction(
    b: np.ndarray, t: np.ndarray, n: np.ndarray, cls: np.ndarray,
    E: np.ndarray, Fy: np.ndarray, Fcr_: np.ndarray,
) -> np.ndarray:
    """Area lost to local buckling by one element group: n·(b − be)·t.

    AISC 360-22 Section E7.1: Ae is Ag less the ineffective part of each slender element.
    """
    k, c1, c2 = class_coefficients(cls)
    with np.errstate(divide="ignore", invalid="ignore"):
        lam = b / t
        lam_r = lambda_r(k, E, Fy)
        slender = (n > 0) & np.isfinite(lam_r) & (lam > lam_r * np.sqrt(Fy / Fcr_))
        be = np.where(slender, be_reduced(b, c1, Fel(c2, lam_r, lam, Fy), Fcr_), be_full(b))
    be = np.minimum(be, b)
    return np.where(slender, n * (b - be) * t, 0.0)


def Ae_round_compact(Ag: np.ndarray) -> np.ndarray:
    """Round HSS with D/t <= 0.11·E/Fy: Ae = Ag.  AISC 360-22 Eq. E7-6."""
    return Ag


def Ae_round_slender(E: np.ndarray, Fy: np.ndarray, D_t: np.ndarray,
                     Ag: np.ndarray) -> np.ndarray:
    """Round HSS with 0.11·E/Fy < D/t < 0.45·E/Fy: Ae = [0.038·E/(Fy·D/t) + 2/3]·Ag.

    AISC 360-22 Eq. E7-7.
    """
    return (0.038 * E / (Fy * D_t) + 2.0 / 3.0) * Ag


def Ae_round(E: np.ndarray, Fy: np.ndarray, D_t: np.ndarray, Ag: np.ndarray) -> np.ndarray:
    """Effective area of round HSS by E7-6 / E7-7 (NaN where D/t >= 0.45 E/Fy, out of scope)."""
    limit = D_t * Fy / E
    with np.errstate(divide="ignore", invalid="ignore"):
        slender = Ae_round_slender(E, Fy, D_t, Ag)
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

    Pn: np.ndarray
    Fcr: np.ndarray
    Fe: np.ndarray
    Ae: np.ndarray
    Ag: np.ndarray
    slenderness: np.ndarray
    limit_state: np.ndarray
    slender: np.ndarray
    in_scope: np.ndarray

    def limit_state_names(self) -> np.ndarray:
        """Readable names, with "(slender elements)" where Ae < Ag."""
        names = np.asarray(LIMIT_STATE_NAMES, dtype=object)[self.limit_state]
        return np.where(self.slender, names + " (slender elements)", names)


def compressive_strength(
    sec: SectionTable,
    Fy: np.ndarray,
    Lcx: np.ndarray,
    Lcy: np.ndarray,
    Lcz: np.ndarray,
    E: np.ndarray | float = 29000.0,
    G: np.ndarray | float = 11200.0,
) -> CompressionResult:
    """Nominal compressive strength Pn of every member (AISC 360-22 Chapter E).

    Args:
        sec: section rows, one per member (``catalog.take(index)``).
        Fy: yield stress, ksi.
        Lcx, Lcy, Lcz: effective lengths K·L for x, y and torsion, in.
        E, G: moduli, ksi.
    """
    Fy = np.asarray(Fy, dtype=float)
    n = len(sec)
    E = np.broadcast_to(np.asarray(E, dtype=float), (n,))
    G = np.broadcast_to(np.asarray(G, dtype=float), (n,))
    kind = sec.kind
    Ag = sec.A

    with np.errstate(divide="ignore", invalid="ignore"):
        Lcx_rx = Lcx / sec.rx
        Lcy_ry = Lcy / sec.ry
    Fex = Fe_flexural(E, Lcx_rx)
    Fey = Fe_flexural(E, Lcy_ry)

    is_i = kind == Kind.I_SHAPE
    is_tee = kind == Kind.TEE
    is_channel = kind == Kind.CHANNEL
    singly = is_tee | is_channel

    modes = np.full((n, 4), np.inf)
    modes[:, LimitState.FLEXURAL_X] = Fex
    modes[:, LimitState.FLEXURAL_Y] = Fey
    if is_i.any():
        modes[is_i, LimitState.TORSIONAL] = Fe_torsional(
            E[is_i], G[is_i], sec.Cw[is_i], sec.J[is_i], Lcz[is_i], sec.Ix[is_i], sec.Iy[is_i]
        )
    if singly.any():
        s = singly
        ro2 = ro_bar_squared(sec.xo[s], sec.yo[s], sec.Ix[s], sec.Iy[s], Ag[s])
        H = H_flexural_constant(sec.xo[s], sec.yo[s], ro2)
        fez = Fez(E[s], G[s], sec.Cw[s], sec.J[s], Lcz[s], Ag[s], ro2)
        f_sym = np.where(is_tee[s], Fey[s], Fex[s])
        modes[s, LimitState.FLEXURAL_TORSIONAL] = Fe_flexural_torsional(f_sym, fez, H)

    governing = np.argmin(modes, axis=1)
    Fe = np.take_along_axis(modes, governing[:, None], axis=1)[:, 0]
    Fcr_ = Fcr(Fy, Fe)

    # E7: effective area.
    is_round = kind == Kind.ROUND_HSS
    # Round walls have class ROUND_WALL (no λr of this form): handled by E7-6/E7-7 below.
    deduction = element_deduction(sec.b1, sec.t1, sec.n1, sec.cls1, E, Fy, Fcr_)
    deduction += element_deduction(sec.b2, sec.t2, sec.n2, sec.cls2, E, Fy, Fcr_)
    Ae = Ag - deduction
    in_scope = kind != Kind.UNSUPPORTED
    if is_round.any():
        with np.errstate(divide="ignore", invalid="ignore"):
            D_t = sec.b1[is_round] / sec.t1[is_round]
        Ae_r = Ae_round(E[is_round], Fy[is_round], D_t, Ag[is_round])
        Ae[is_round] = Ae_r
        in_scope[is_round] = np.isfinite(Ae_r)

    slender = Ae < Ag * (1.0 - 1e-12)
    return CompressionResult(
        Pn=Pn(Fcr_, Ae),
        Fcr=Fcr_,
        Fe=Fe,
        Ae=Ae,
        Ag=Ag,
        slenderness=np.fmax(Lcx_rx, Lcy_ry),
        limit_state=governing,
        slender=slender,
        in_scope=in_scope,
    )


def available_strength(Pn_: np.ndarray, method: str) -> np.ndarray:
    """φc·Pn (LRFD) or Pn/Ωc (ASD).  AISC 360-22 Section E1."""
    method = method.upper()
    if method == "LRFD":
        return PHI_C * Pn_
    if method == "ASD":
        return Pn_ / OMEGA_C
    raise ValueError(f"unknown design method {method!r}; expected LRFD or ASD")

