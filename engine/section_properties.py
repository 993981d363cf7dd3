"""Section properties from dimensions, for parametric profiles that are not in the catalog.

Every builder takes scalars or numpy arrays (broadcast together), dimensions in inches, and
returns a :class:`~engine.sections.SectionTable` with one row per input row. Conventions match
the catalog (see ``engine.sections``): x is the major axis; for tees y is the axis of symmetry,
for channels x is. Shear-centre offsets ``xo``, ``yo`` are measured from the centroid and are
reported as positive distances: for a tee towards the flange, for a channel towards the web
(the shear centre lies on the far side of the web from the flange tips).

Bad dimensions raise :class:`ValueError` with a message naming the dimension (and the rows, for
arrays). :func:`dimension_problems` (``engine.profile_dimensions``, also importable from here)
gives the same diagnosis row by row without raising, so a reader can mark only the bad members
"not checked".

Approximations (also stated where used):

* A, Ix, Iy are exact for the idealised shape: rectangles, plus circular root fillets
  (I, T, U) or circular corners (rectangular HSS).
* J of I and T shapes: El Darwish and Johnston (1965), "Torsion of structural shapes", ASCE
  J. Struct. Div. 91(ST1) -- the rectangle terms of Roark plus a fillet-junction term
  (from memory; it reproduces J = 1.45 in⁴ of the AISC Shapes Database v16.0 for W14X48).
* J of channels: flange and web rectangles with Roark's end corrections plus the L-junction
  term of Roark's Formulas for Stress and Strain, 7th ed., Table 10.7 (L-section), at each
  web-flange corner (from memory; -4.4 %..-0.1 % against sectionproperties in our tests).
* J of rectangular HSS: Bredt's thin-walled closed-section formula on the wall midline;
  Cw = 0 for all closed and solid sections (torsional buckling is not checked for them).
* Cw: I shapes Iy·h0²/4 (AISC Design Guide 9); tees and channels by the thin-walled formulas
  used for the AISC Shapes Database (from memory), see :func:`tee` and :func:`channel`.

Checked (tests/engine/test_section_properties.py) against every W, WT, HSS and round HSS row
of the AISC Shapes Database v16.0 (worst: Cw of W 2.1 %, I of round HSS 1.9 %) and against
sectionproperties. Sloped-flange shapes (S, M, C, MC) are outside this parallel-flange model.
"""

from __future__ import annotations

from collections.abc import Iterable

import numpy as np
from numpy.typing import ArrayLike

from stanchion.engine.arrays import AnyArray, FloatArray, ObjectArray
from stanchion.engine.compression import H_flexural_constant, ro_bar_squared
from stanchion.engine.profile_dimensions import (
    checked_dimensions,
    dimension_problems,
    format_dimension,
)
from stanchion.engine.sections import ElementClass, Kind, SectionTable

#: Weight per unit area, lb/ft per in² (490 lb/ft³ steel / 144; common practice).
WEIGHT_PER_AREA = 3.40

#: Spandrel left by a circular fillet of radius r in a square corner (r × r minus a quarter
#: circle): area factor, centroid distance from each straight side, centroidal I factor.
_FILLET_AREA = 1.0 - np.pi / 4.0
_FILLET_CENTROID = (10.0 - 3.0 * np.pi) / (12.0 - 3.0 * np.pi)
_FILLET_INERTIA = (1.0 - 5.0 * np.pi / 16.0) - _FILLET_AREA * _FILLET_CENTROID**2

Array = FloatArray

#: Every builder runs under this: a damaged model's 1e300 dimension overflows to inf (then
#: caught by the plausibility limits, engine.plausibility), not a numpy warning on stderr.
_OVERFLOW_IS_INF = np.errstate(over="ignore", invalid="ignore")

__all__ = ["WEIGHT_PER_AREA", "channel", "circ_hollow", "dimension_problems", "i_section",
           "rect_hollow", "solid_circle", "solid_rect", "tee"]


# ---------------------------------------------------------------- labels


def _labels(label: ArrayLike | None, prefix: str, dims: list[Array], r: Array | None = None
            ) -> ObjectArray:
    """Labels per row: the given ones (broadcast) or ``"PREFIX d1xd2x... [rR]"``."""
    n = len(dims[0])
    if label is not None:
        return np.broadcast_to(np.asarray(label, dtype=object), (n,)).astype(object)
    rows = zip(*(a.tolist() for a in dims), (np.zeros(n) if r is None else r).tolist(),
               strict=True)
    return np.array([f"{prefix} " + "x".join(map(format_dimension, row[:-1]))
                     + (f" r{format_dimension(row[-1])}" if row[-1] else "") for row in rows],
                    dtype=object)


# ---------------------------------------------------------------- geometry helpers


def _rect(b: Array, h: Array, x: Array, y: Array) -> tuple[Array, ...]:
    """Part tuple (area, x, y, Ix0, Iy0) of a b (horizontal) × h (vertical) rectangle."""
    return b * h, x, y, b * h**3 / 12.0, h * b**3 / 12.0


def _fillet(r: Array, x: Array, y: Array) -> tuple[Array, ...]:
    """Part tuple of one fillet spandrel of radius r with its centroid at (x, y)."""
    i0 = _FILLET_INERTIA * r**4
    return _FILLET_AREA * r**2, x, y, i0, i0


def _compose(parts: list[tuple[Array, ...]]) -> tuple[Array, Array, Array, Array, Array]:
    """Area, centroid (x, y) and centroidal Ix, Iy of a shape made of aligned parts.

    Parts are symmetric about a common axis in pairs, so products of inertia cancel.
    """
    A = _total(p[0] for p in parts)
    xc = _total(p[0] * p[1] for p in parts) / A
    yc = _total(p[0] * p[2] for p in parts) / A
    Ix = _total(p[3] + p[0] * p[2] ** 2 for p in parts) - A * yc**2
    Iy = _total(p[4] + p[0] * p[1] ** 2 for p in parts) - A * xc**2
    return A, xc, yc, Ix, Iy


def _total(terms: Iterable[Array]) -> Array:
    """Sum of arrays, added left to right as :func:`sum` does (at least one term)."""
    it = iter(terms)
    total = next(it)
    for term in it:
        total = total + term
    return total


def _rounded_rect(H: Array, B: Array, r: Array) -> tuple[Array, Array, Array]:
    """Area, Ix (about the axis parallel to B) and Iy of an H × B rectangle with corner radius r."""
    a_s = _FILLET_AREA * r**2
    c = _FILLET_CENTROID * r
    i0 = _FILLET_INERTIA * r**4
    A = B * H - 4.0 * a_s
    Ix = B * H**3 / 12.0 - 4.0 * (i0 + a_s * (H / 2.0 - c) ** 2)
    Iy = H * B**3 / 12.0 - 4.0 * (i0 + a_s * (B / 2.0 - c) ** 2)
    return A, Ix, Iy


def _j_rect_part(a: Array, b: Array, free_ends: int) -> Array:
    """Roark's torsion constant of a rectangle part, corrected for 2 or 1 free short ends.

    K = l t³ [1/3 - 0.21 (t/l)(1 - t⁴/(12 l⁴))] (two free ends; Roark's Formulas for Stress
    and Strain, 7th ed., Table 10.7) and the half correction 0.105 with 192 for one free end
    (Roark's stem term of the T-section). From memory.
    """
    long: Array = np.maximum(a, b)
    t: Array = np.minimum(a, b)
    k, q = (0.21, 12.0) if free_ends == 2 else (0.105, 192.0)
    return long * t**3 * (1.0 / 3.0 - k * (t / long) * (1.0 - t**4 / (q * long**4)))


def _j_tee_junction(tw: Array, tf: Array, r: Array) -> Array:
    """Fillet-junction term α·D⁴ of a web meeting a flange (T junction).

    El Darwish and Johnston (1965), as reproduced for the AISC Shapes Database (from memory):
    α = -0.042 + 0.2204 tw/tf + 0.1355 r/tf - 0.0865 r tw/tf² - 0.0725 tw²/tf²,
    D = ((tf + r)² + tw (r + tw/4)) / (2 r + tf).
    """
    alpha = (-0.042 + 0.2204 * tw / tf + 0.1355 * r / tf - 0.0865 * r * tw / tf**2
             - 0.0725 * tw**2 / tf**2)
    D = ((tf + r) ** 2 + tw * (r + tw / 4.0)) / (2.0 * r + tf)
    return alpha * D**4


def _j_l_junction(t1: Array, t2: Array, r: Array) -> Array:
    """Junction term α·D⁴ of an L corner (legs t1, t2, inner fillet r).

    Roark's Formulas for Stress and Strain, 7th ed., Table 10.7, L-section (from memory):
    α = (t/t1)(0.07 + 0.076 r/t1) with t the thinner and t1 the thicker leg,
    D = 2 (t1 + t2 + 3 r - sqrt(2 (2r + t1)(2r + t2))) (the inscribed-circle diameter).
    """
    thin, thick = np.minimum(t1, t2), np.maximum(t1, t2)
    alpha = thin / thick * (0.07 + 0.076 * r / thick)
    D = 2.0 * (t1 + t2 + 3.0 * r - np.sqrt(2.0 * (2.0 * r + t1) * (2.0 * r + t2)))
    return alpha * D**4


def _j_solid_rect(a: Array, b: Array, terms: int = 10) -> Array:
    """Saint-Venant series for the torsion constant of a solid rectangle.

    J = (l t³/3)[1 - (192/π⁵)(t/l) Σ_{n odd} tanh(nπl/(2t))/n⁵]
    (Timoshenko and Goodier, Theory of Elasticity, torsion of a rectangular bar; 10 terms).
    """
    long: Array = np.maximum(a, b)
    t: Array = np.minimum(a, b)
    n = (2.0 * np.arange(terms) + 1.0)[:, None]
    series: Array = np.sum(np.tanh(n * np.pi * long / (2.0 * t)) / n**5, axis=0)
    return long * t**3 / 3.0 * (1.0 - 192.0 / np.pi**5 * (t / long) * series)


def _table(n: int, **cols: ArrayLike) -> SectionTable:
    """SectionTable of n rows; scalars broadcast, absent numeric fields are 0."""
    ints = ("kind", "n1", "n2", "cls1", "cls2")
    data: dict[str, AnyArray] = {}
    for name in SectionTable.__dataclass_fields__:
        v = cols.get(name, 0)
        if name in ("designation", "family"):
            data[name] = np.broadcast_to(np.asarray(v, dtype=object), (n,)).astype(object)
        else:
            dtype = np.int64 if name in ints else float
            data[name] = np.broadcast_to(np.asarray(v, dtype=dtype), (n,)).astype(dtype)
    A = data["A"]
    data["weight"] = WEIGHT_PER_AREA * A
    data["rx"] = np.sqrt(data["Ix"] / A)
    data["ry"] = np.sqrt(data["Iy"] / A)
    ro2 = ro_bar_squared(data["xo"], data["yo"], data["Ix"], data["Iy"], A)
    data["ro"] = np.sqrt(ro2)
    data["H"] = H_flexural_constant(data["xo"], data["yo"], ro2)
    return SectionTable(**data)


# ---------------------------------------------------------------- builders


@_OVERFLOW_IS_INF
def i_section(
    d: ArrayLike, bf: ArrayLike, tw: ArrayLike, tf: ArrayLike, r: ArrayLike | None = 0.0,
    label: ArrayLike | None = None,
) -> SectionTable:
    """Doubly symmetric I (IfcIShapeProfileDef) with web-flange root fillets of radius r.

    J: El Darwish and Johnston (1965) (flange and web rectangles plus two fillet junctions).
    Cw = Iy·h0²/4 with h0 = d - tf (AISC Design Guide 9, 1997; common practice).
    Flanges: rolled (AISC 360-22 Table B4.1a case 1) with a root radius, built-up (case 2,
    λr with kc) without one: a welded plate I has no root fillet (docs/design.md §8
    "Built-up I sections"; conservative, case 2 never gives the larger λr).

    Args:
        d: overall depth, in.
        bf: flange width, in.
        tw: web thickness, in.
        tf: flange thickness, in.
        r: root fillet radius, in (0 or None: no fillets).
        label: designation per row; default ``"I dxbfxtwxtf"`` (``" rR"`` when r > 0).

    Raises:
        ValueError: non-positive or inconsistent dimensions, named in the message.
    """
    d, bf, tw, tf, r = checked_dimensions("I", d, bf, tw, tf, 0.0 if r is None else r)
    c = _FILLET_CENTROID * r
    xf, yf = tw / 2.0 + c, d / 2.0 - tf - c
    parts = [_rect(bf, tf, 0.0 * d, s * (d - tf) / 2.0) for s in (1.0, -1.0)]
    parts.append(_rect(tw, d - 2.0 * tf, 0.0 * d, 0.0 * d))
    parts += [_fillet(r, sx * xf, sy * yf) for sx in (1.0, -1.0) for sy in (1.0, -1.0)]
    A, _, _, Ix, Iy = _compose(parts)
    J = (2.0 * _j_rect_part(bf, tf, 2) + (d - 2.0 * tf) * tw**3 / 3.0
         + 2.0 * _j_tee_junction(tw, tf, r))
    return _table(
        len(d), designation=_labels(label, "I", [d, bf, tw, tf], r), family="I",
        kind=Kind.I_SHAPE, A=A, d=d, bf=bf, tw=tw, tf=tf, Ix=Ix, Iy=Iy, J=J,
        Cw=Iy * (d - tf) ** 2 / 4.0,
        b1=bf / 2.0, t1=tf, n1=4, cls1=i_flange_class(r > 0.0),
        b2=d - 2.0 * (tf + r), t2=tw, n2=1, cls2=ElementClass.STIFFENED_WEB,
    )


def i_flange_class(rolled: ArrayLike) -> AnyArray:
    """Element class of I flanges: case 1 where ``rolled`` (a root radius), else case 2.

    AISC 360-22 Table B4.1a cases 1 (rolled I) and 2 (built-up I); the rule that tells them
    apart is docs/design.md §8 "Built-up I sections".

    Args:
        rolled: True per row where the section has a root radius.
    """
    return np.where(np.asarray(rolled, dtype=bool), int(ElementClass.UNSTIFFENED_FLANGE),
                    int(ElementClass.BUILT_UP_FLANGE))


@_OVERFLOW_IS_INF
def rect_hollow(
    H: ArrayLike, B: ArrayLike, t: ArrayLike, r_out: ArrayLike | None = None,
    label: ArrayLike | None = None,
) -> SectionTable:
    """Rectangular / square hollow section (IfcRectangleHollowProfileDef).

    Exact A, Ix, Iy for circular outer corners r_out and inner corners max(r_out - t, 0).
    J by Bredt's closed-section formula J = 4·Ap²·t/p on the wall midline (corner radius
    r_out - t/2); Cw = 0 (closed section). Element flat widths B - 3t and H - 3t (AISC 360-22
    B4.1b(d), corner radius unknown), floored at 0.

    Args:
        H: outside depth, in (Ix is about the axis parallel to B; x is the strong axis when
            H >= B).
        B: outside width, in.
        t: design wall thickness, in.
        r_out: outside corner radius, in; default 2t (AISC practice for HSS).
        label: designation per row; default ``"HSS HxBxt"``.

    Raises:
        ValueError: non-positive or inconsistent dimensions, named in the message.
    """
    if r_out is None:  # default 2t
        try:
            r_out = 2.0 * np.asarray(t, dtype=float)
        except (TypeError, ValueError):
            r_out = 0.0  # a non-numeric t is reported by checked_dimensions

    H, B, t, r_out = checked_dimensions("HSS", H, B, t, r_out)
    Ao, Ixo, Iyo = _rounded_rect(H, B, r_out)
    Ai, Ixi, Iyi = _rounded_rect(H - 2.0 * t, B - 2.0 * t, np.maximum(r_out - t, 0.0))
    rm = np.maximum(r_out - t / 2.0, 0.0)
    p = 2.0 * ((B - t) + (H - t)) - 2.0 * (4.0 - np.pi) * rm
    Ap = (B - t) * (H - t) - (4.0 - np.pi) * rm**2
    return _table(
        len(H), designation=_labels(label, "HSS", [H, B, t]), family="HSS",
        kind=Kind.RECT_HSS, A=Ao - Ai, d=H, bf=B, tw=t, tf=t, Ix=Ixo - Ixi, Iy=Iyo - Iyi,
        J=4.0 * Ap**2 * t / p, Cw=0.0,
        b1=np.maximum(B - 3.0 * t, 0.0), t1=t, n1=2, cls1=ElementClass.HSS_WALL,
        b2=np.maximum(H - 3.0 * t, 0.0), t2=t, n2=2, cls2=ElementClass.HSS_WALL,
    )


@_OVERFLOW_IS_INF
def circ_hollow(D: ArrayLike, t: ArrayLike, label: ArrayLike | None = None) -> SectionTable:
    """Round hollow section (IfcCircleHollowProfileDef): exact A, I; J = 2I; Cw = 0.

    Args:
        D: outside diameter, in.
        t: design wall thickness, in.
        label: designation per row; default ``"HSS_ROUND Dxt"``.

    Raises:
        ValueError: non-positive or inconsistent dimensions, named in the message.
    """
    D, t = checked_dimensions("HSS_ROUND", D, t)
    Di = D - 2.0 * t
    A = np.pi / 4.0 * (D**2 - Di**2)
    inertia = np.pi / 64.0 * (D**4 - Di**4)
    return _table(
        len(D), designation=_labels(label, "HSS_ROUND", [D, t]), family="HSS_ROUND",
        kind=Kind.ROUND_HSS, A=A, d=D, bf=D, tw=t, tf=t, Ix=inertia, Iy=inertia,
        J=2.0 * inertia, Cw=0.0, b1=D, t1=t, n1=1, cls1=ElementClass.ROUND_WALL,
    )


@_OVERFLOW_IS_INF
def tee(
    d: ArrayLike, bf: ArrayLike, tw: ArrayLike, tf: ArrayLike, r: ArrayLike | None = 0.0,
    label: ArrayLike | None = None,
) -> SectionTable:
    """Tee (IfcTShapeProfileDef), flange at the top, stem down; y is the axis of symmetry.

    Shear centre at the flange/stem centreline intersection: yo = ȳ - tf/2 with ȳ the
    centroid depth below the flange top (thin-walled theory). J: El Darwish and Johnston
    (1965) (flange with two free ends, stem with one, one fillet junction). Cw by the
    thin-walled tee formula of the AISC Shapes Database (from memory):
    Cw = bf³tf³/144 + (d - tf/2)³tw³/36.

    Args:
        d: overall depth, in.
        bf: flange width, in.
        tw: stem thickness, in.
        tf: flange thickness, in.
        r: root fillet radius, in (0 or None: none).
        label: designation per row; default ``"T dxbfxtwxtf"``.

    Raises:
        ValueError: non-positive or inconsistent dimensions, named in the message.
    """
    d, bf, tw, tf, r = checked_dimensions("T", d, bf, tw, tf, 0.0 if r is None else r)
    c = _FILLET_CENTROID * r
    zero = 0.0 * d
    parts = [_rect(bf, tf, zero, -tf / 2.0), _rect(tw, d - tf, zero, -(d + tf) / 2.0)]
    parts += [_fillet(r, s * (tw / 2.0 + c), -(tf + c)) for s in (1.0, -1.0)]
    A, _, yc, Ix, Iy = _compose(parts)
    J = _j_rect_part(bf, tf, 2) + _j_rect_part(d - tf, tw, 1) + _j_tee_junction(tw, tf, r)
    return _table(
        len(d), designation=_labels(label, "T", [d, bf, tw, tf], r), family="T",
        kind=Kind.TEE, A=A, d=d, bf=bf, tw=tw, tf=tf, Ix=Ix, Iy=Iy, J=J,
        Cw=bf**3 * tf**3 / 144.0 + (d - tf / 2.0) ** 3 * tw**3 / 36.0,
        xo=0.0, yo=-yc - tf / 2.0, ybar=-yc,
        b1=bf / 2.0, t1=tf, n1=2, cls1=ElementClass.UNSTIFFENED_FLANGE,
        b2=d, t2=tw, n2=1, cls2=ElementClass.TEE_STEM,
    )


@_OVERFLOW_IS_INF
def channel(
    d: ArrayLike, bf: ArrayLike, tw: ArrayLike, tf: ArrayLike, r: ArrayLike | None = 0.0,
    label: ArrayLike | None = None,
) -> SectionTable:
    """Channel with parallel flanges (IfcUShapeProfileDef); x is the axis of symmetry.

    Thin-walled channel formulas on centreline dimensions b' = bf - tw/2, h' = d - tf
    (Galambos, Structural Members and Frames, 1968; the AISC Shapes Database uses the same
    forms -- from memory): shear centre eo = 3b'²tf/(6b'tf + h'tw) behind the web
    centreline, Cw = tf b'³ h'²/12 · (3b'tf + 2h'tw)/(6b'tf + h'tw). xo = x̄ - tw/2 + eo is the
    distance from the centroid to the shear centre (x̄ from the back of the web). J: see the
    module notes (Roark rectangles plus two L junctions).

    Args:
        d: overall depth, in.
        bf: flange width including the web, in.
        tw: web thickness, in.
        tf: flange thickness, in.
        r: root fillet radius, in (0 or None: none).
        label: designation per row; default ``"U dxbfxtwxtf"``.

    Raises:
        ValueError: non-positive or inconsistent dimensions, named in the message.
    """
    d, bf, tw, tf, r = checked_dimensions("U", d, bf, tw, tf, 0.0 if r is None else r)
    c = _FILLET_CENTROID * r
    parts = [_rect(tw, d, tw / 2.0, 0.0 * d)]
    parts += [_rect(bf - tw, tf, (bf + tw) / 2.0, s * (d - tf) / 2.0) for s in (1.0, -1.0)]
    parts += [_fillet(r, tw + c, s * (d / 2.0 - tf - c)) for s in (1.0, -1.0)]
    A, xc, _, Ix, Iy = _compose(parts)
    bp, hp = bf - tw / 2.0, d - tf
    eo = 3.0 * bp**2 * tf / (6.0 * bp * tf + hp * tw)
    Cw = tf * bp**3 * hp**2 / 12.0 * (3.0 * bp * tf + 2.0 * hp * tw) / (6.0 * bp * tf + hp * tw)
    J = (2.0 * _j_rect_part(bf - tw, tf, 1) + _j_rect_part(d, tw, 2)
         + 2.0 * _j_l_junction(tw, tf, r))
    return _table(
        len(d), designation=_labels(label, "U", [d, bf, tw, tf], r), family="U",
        kind=Kind.CHANNEL, A=A, d=d, bf=bf, tw=tw, tf=tf, Ix=Ix, Iy=Iy, J=J, Cw=Cw,
        xo=xc - tw / 2.0 + eo, yo=0.0, xbar=xc,
        b1=bf, t1=tf, n1=2, cls1=ElementClass.UNSTIFFENED_FLANGE,
        b2=d - 2.0 * (tf + r), t2=tw, n2=1, cls2=ElementClass.STIFFENED_WEB,
    )


@_OVERFLOW_IS_INF
def solid_rect(H: ArrayLike, B: ArrayLike, label: ArrayLike | None = None) -> SectionTable:
    """Solid rectangle (IfcRectangleProfileDef): exact A, I; J by the Saint-Venant series.

    Args:
        H: depth, in (Ix about the axis parallel to B).
        B: width, in.
        label: designation per row; default ``"RECT HxB"``.

    Raises:
        ValueError: non-positive dimensions, named in the message.
    """
    H, B = checked_dimensions("RECT", H, B)
    return _table(
        len(H), designation=_labels(label, "RECT", [H, B]), family="RECT",
        kind=Kind.SOLID_RECT, A=H * B, d=H, bf=B, Ix=B * H**3 / 12.0, Iy=H * B**3 / 12.0,
        J=_j_solid_rect(H, B), Cw=0.0,
    )


@_OVERFLOW_IS_INF
def solid_circle(D: ArrayLike, label: ArrayLike | None = None) -> SectionTable:
    """Solid circle (IfcCircleProfileDef): A = πD²/4, I = πD⁴/64, J = πD⁴/32, Cw = 0.

    Args:
        D: diameter, in.
        label: designation per row; default ``"ROUND D"``.

    Raises:
        ValueError: non-positive diameter.
    """
    (D,) = checked_dimensions("ROUND", D)
    inertia = np.pi * D**4 / 64.0
    return _table(
        len(D), designation=_labels(label, "ROUND", [D]), family="ROUND",
        kind=Kind.SOLID_ROUND, A=np.pi * D**2 / 4.0, d=D, bf=D, Ix=inertia, Iy=inertia,
        J=2.0 * inertia, Cw=0.0,
    )
