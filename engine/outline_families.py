"""Which section family a closed outline is, in which orientation, with which dimensions.

Pure geometry on shapely polygons, dimensions in the outline's unit (inches in the engine).
:func:`recognise` turns a validated polygon into a :class:`Fit`: the family (the parametric
family names of ``engine.section_properties``: ``I``, ``U``, ``T``, ``HSS``, ``HSS_ROUND``,
``RECT``, ``ROUND``, and ``L`` for angles), the polygon moved to the family's canonical axes,
and the element dimensions Chapter E needs -- or the reason it fits no family.

Method (the same for every family):

1. **Align**: rotate so that the longest edge (and the edges within 1° of it or of its normal,
   length-weighted) lies along x or y; round outlines need no alignment.  Axes therefore
   follow the shape, never the drawing: an I drawn with its depth along x is turned.
2. **Symmetry**: mirror about the vertical and the horizontal line through the bounding-box
   centre; a mirror image differing by at most :data:`SYMMETRY_TOL` of the area counts as
   symmetric.
3. **Orient** to the AISC axes: I with its depth along y (x the major axis), channel with
   its web at the left and x its axis of symmetry, tee with its flange at the top and y its
   axis of symmetry, rectangular sections with the longer side along y, angle with its heel
   at the bottom left.
4. **Measure** the elements by cuts across the outline (:func:`_cut`): web thickness at
   mid-depth; flange thickness at the middle of the flange outstand (for sloped flanges the
   average thickness, as the AISC Shapes Database tabulates tf) and at three quarters of
   it, giving the flange slope; walls of tubes from the void's extent; the root (or
   corner) radius from the area the sharp-cornered shape lacks, A = A_sharp + n (1 - π/4) r².
5. **Fit**: build that idealised shape (rectangles and trapezoids, root fillets by a
   morphological closing with radius r, tube corners by an opening) and accept the family
   only when the symmetric difference with the outline is at most :data:`FIT_TOL` of the
   area.  Anything else: "outline fits no supported section family".
"""

from __future__ import annotations

import math
from collections.abc import Callable
from dataclasses import dataclass, field

from shapely import affinity
from shapely.errors import GEOSException
from shapely.geometry import LineString, Point, Polygon, box

#: Symmetric difference between an outline and its mirror image, as a fraction of its area,
#: below which the outline counts as symmetric (common practice, no source: rounding of
#: exported coordinates and discretised arcs stay far below it).
SYMMETRY_TOL = 0.01
#: Symmetric difference between an outline and the idealised family shape, as a fraction of
#: its area, up to which the family is accepted (common practice, no source; toe radii and
#: discretised fillets of rolled shapes stay below 1 %).
FIT_TOL = 0.025
#: Spandrel left by a circular fillet of radius r in a square corner, per r².
_SPANDREL = 1.0 - math.pi / 4.0
_QUAD_SEGS = 16

NO_FAMILY = "outline fits no supported section family"


@dataclass(frozen=True)
class Fit:
    """An outline recognised as a family.

    Attributes:
        family: ``I``, ``U``, ``T``, ``HSS``, ``HSS_ROUND``, ``RECT``, ``ROUND`` or ``L``.
        polygon: the outline on the family's canonical axes (see the module notes).
        dims: element dimensions by name: ``d, bf, tw, tf, r, k, slope`` (I, U, T), ``H, B,
            t, r_out, r_in`` (HSS), ``D, t`` (HSS_ROUND), ``H, B`` (RECT), ``D`` (ROUND),
            ``b, d, t, r`` (L: the legs along x and y).
        misfit: symmetric difference with the idealised shape / area.
    """

    family: str
    polygon: Polygon
    dims: dict[str, float] = field(default_factory=dict)
    misfit: float = 0.0


# ---------------------------------------------------------------- geometry helpers


def _edges(ring: Polygon) -> list[tuple[float, float]]:
    """(angle in [0, π/2), length) of every edge of the exterior."""
    xy = list(ring.exterior.coords)
    out = []
    for (x0, y0), (x1, y1) in zip(xy[:-1], xy[1:], strict=True):
        length = math.hypot(x1 - x0, y1 - y0)
        if length > 0:
            out.append((math.atan2(y1 - y0, x1 - x0) % (math.pi / 2.0), length))
    return out


def align(polygon: Polygon) -> Polygon:
    """The polygon rotated so its longest edges lie along the axes, bounding box centred.

    Args:
        polygon: a valid polygon.

    Returns:
        The rotated polygon with its bounding-box centre at the origin.
    """
    edges = _edges(polygon)
    base = max(edges, key=lambda e: e[1])[0]
    quarter = math.pi / 2.0
    near = [((a - base + quarter / 2.0) % quarter - quarter / 2.0, w) for a, w in edges]
    near = [(d, w) for d, w in near if abs(d) <= math.radians(1.0)]
    angle = base + sum(d * w for d, w in near) / sum(w for _, w in near)
    if angle > quarter / 2.0:
        angle -= quarter
    turned = affinity.rotate(polygon, -angle, origin=(0.0, 0.0), use_radians=True)
    return _centred(turned)


def _centred(polygon: Polygon) -> Polygon:
    x0, y0, x1, y1 = polygon.bounds
    return affinity.translate(polygon, -(x0 + x1) / 2.0, -(y0 + y1) / 2.0)


def _misfit(a: Polygon, b: Polygon) -> float:
    return float(a.symmetric_difference(b).area / a.area)


def _symmetric(polygon: Polygon, about: str) -> bool:
    """Mirror symmetry about the vertical (``"y"``) or horizontal (``"x"``) axis at 0."""
    xs, ys = (-1.0, 1.0) if about == "y" else (1.0, -1.0)
    mirrored = affinity.scale(polygon, xfact=xs, yfact=ys, origin=(0.0, 0.0))
    return _misfit(polygon, mirrored) <= SYMMETRY_TOL


def _cut(polygon: Polygon, axis: str, at: float) -> list[float]:
    """Lengths of the pieces of the line x = at (``axis="x"``) or y = at inside the polygon."""
    x0, y0, x1, y1 = polygon.bounds
    pad = max(x1 - x0, y1 - y0)
    line = (LineString([(at, y0 - pad), (at, y1 + pad)]) if axis == "x"
            else LineString([(x0 - pad, at), (x1 + pad, at)]))
    hit = polygon.intersection(line)
    parts = getattr(hit, "geoms", [hit])
    return sorted((float(p.length) for p in parts if p.length > 0), reverse=True)


def _turn(polygon: Polygon, quarters: int) -> Polygon:
    return _centred(affinity.rotate(polygon, 90.0 * quarters, origin=(0.0, 0.0)))


def _mirror(polygon: Polygon, xs: float, ys: float) -> Polygon:
    return _centred(affinity.scale(polygon, xfact=xs, yfact=ys, origin=(0.0, 0.0)))


def _closing(shape: Polygon, r: float) -> Polygon:
    """Concave corners filled with fillets of radius r (convex corners kept sharp)."""
    if r <= 0:
        return shape
    return shape.buffer(r, quad_segs=_QUAD_SEGS).buffer(-r, quad_segs=_QUAD_SEGS)


def _rounded_box(b: float, h: float, r: float) -> Polygon:
    """A b × h rectangle centred at the origin with convex corners of radius r."""
    r = min(max(r, 0.0), 0.499 * min(b, h))
    core = box(-b / 2.0 + r, -h / 2.0 + r, b / 2.0 - r, h / 2.0 - r)
    return core.buffer(r, quad_segs=_QUAD_SEGS) if r > 0 else core


def _fillet_radius(area: float, sharp: Polygon, n: int) -> float:
    """Radius of n equal fillets that make up the area the sharp shape lacks."""
    return math.sqrt(max(area - sharp.area, 0.0) / (n * _SPANDREL))


# ---------------------------------------------------------------- open shapes


def _flange(polygon: Polygon, at_root: float, outstand: float, axis: str, pick: int
            ) -> tuple[float, float] | None:
    """Flange thickness at mid-outstand and its slope (thickening towards the root).

    ``at_root`` is the coordinate of the web face, ``outstand`` the signed outstand;
    ``pick`` the piece of the cut taken (0: the longest).
    """
    cuts = [_cut(polygon, axis, at_root + f * outstand) for f in (0.5, 0.75)]
    if any(len(c) <= pick for c in cuts):
        return None
    mid, toe = cuts[0][pick], cuts[1][pick]
    return mid, (mid - toe) / (0.25 * abs(outstand))


def _i_template(d: float, bf: float, tw: float, t_root: float, t_toe: float) -> Polygon:
    """Sharp-cornered I, depth along y, flanges thinning linearly from root to toe."""
    a, b = d / 2.0 - t_root, d / 2.0 - t_toe
    return Polygon([
        (bf / 2, b), (bf / 2, d / 2), (-bf / 2, d / 2), (-bf / 2, b), (-tw / 2, a),
        (-tw / 2, -a), (-bf / 2, -b), (-bf / 2, -d / 2), (bf / 2, -d / 2), (bf / 2, -b),
        (tw / 2, -a), (tw / 2, a),
    ])


def _open_dims(d: float, bf: float, tw: float, tf: float, slope: float, r: float,
               t_root: float) -> dict[str, float]:
    """Dimensions of I, U, T: k = flange thickness at the web (tf if parallel) + r."""
    return {"d": d, "bf": bf, "tw": tw, "tf": tf, "r": r, "k": t_root + r, "slope": slope}


def _fit_open(kind: str, p: Polygon, sharp: Polygon, fillets: int,
              measured: tuple[float, float, float, float, float, float]) -> Fit | None:
    """The fit of an I, U or T to its sharp-cornered template with ``fillets`` root fillets.

    Args:
        kind: "I", "U" or "T".
        p: the outline.
        sharp: the template without fillets.
        fillets: how many root fillets the shape has.
        measured: (d, bf, tw, tf, slope, flange thickness at the web) read off ``p``.

    Returns:
        The fit; None when the template is not a valid polygon or the closed template
        misses ``p`` by more than :data:`FIT_TOL`.
    """
    if not sharp.is_valid:
        return None
    d, bf, tw, tf, slope, t_root = measured
    r = _fillet_radius(p.area, sharp, fillets)
    dims = _open_dims(d, bf, tw, tf, slope, r, t_root)
    fit = Fit(kind, p, dims, _misfit(p, _closing(sharp, r)))
    return fit if fit.misfit <= FIT_TOL else None


def _fit_i(p: Polygon) -> Fit | None:
    """Doubly symmetric I with its depth along y (flanges horizontal)."""
    x0, y0, x1, y1 = p.bounds
    bf, d = x1 - x0, y1 - y0
    web = _cut(p, "y", 0.0)
    if len(web) != 1 or web[0] >= 0.5 * bf:
        return None
    tw = web[0]
    outstand = (bf - tw) / 2.0
    flange = _flange(p, tw / 2.0, outstand, "x", 0)
    if flange is None:
        return None
    tf, slope = flange
    half = slope * outstand / 2.0  # thickness change from mid-outstand to root or toe
    if tf - half <= 0:
        return None
    sharp = _i_template(d, bf, tw, tf + half, tf - half)
    return _fit_open("I", p, sharp, 4, (d, bf, tw, tf, slope, tf + half))


def _fit_channel(p: Polygon) -> Fit | None:
    """Channel, web at the left (x = x0), flanges along +x, symmetric about y = 0."""
    x0, y0, x1, y1 = p.bounds
    bf, d = x1 - x0, y1 - y0
    web = _cut(p, "y", 0.0)
    if len(web) != 1 or web[0] >= 0.5 * bf:
        return None
    tw = web[0]
    outstand = bf - tw
    flange = _flange(p, x0 + tw, outstand, "x", 0)
    if flange is None:
        return None
    tf, slope = flange
    half = slope * outstand / 2.0
    t_root, t_toe = tf + half, tf - half
    if t_toe <= 0 or 2 * t_root >= d:
        return None
    a, b = d / 2.0 - t_root, d / 2.0 - t_toe
    sharp = Polygon([(x1, b), (x1, d / 2), (x0, d / 2), (x0, -d / 2), (x1, -d / 2), (x1, -b),
                     (x0 + tw, -a), (x0 + tw, a)])
    return _fit_open("U", p, sharp, 2, (d, bf, tw, tf, slope, t_root))


def _fit_tee(p: Polygon) -> Fit | None:
    """Tee, flange at the top (y = y1), stem down, symmetric about x = 0."""
    x0, y0, x1, y1 = p.bounds
    bf, d = x1 - x0, y1 - y0
    top = _cut(p, "x", x1 - 0.02 * bf)
    if len(top) != 1:
        return None
    stem = _cut(p, "y", y0 + 0.5 * (d - top[0]))
    if len(stem) != 1 or stem[0] >= 0.5 * bf:
        return None
    tw = stem[0]
    outstand = (bf - tw) / 2.0
    flange = _flange(p, tw / 2.0, outstand, "x", 0)
    if flange is None:
        return None
    tf, slope = flange
    half = slope * outstand / 2.0
    t_root, t_toe = tf + half, tf - half
    if t_toe <= 0 or t_root >= d:
        return None
    sharp = Polygon([(x1, y1 - t_toe), (x1, y1), (x0, y1), (x0, y1 - t_toe),
                     (-tw / 2, y1 - t_root), (-tw / 2, y0), (tw / 2, y0), (tw / 2, y1 - t_root)])
    return _fit_open("T", p, sharp, 2, (d, bf, tw, tf, slope, t_root))


def _fit_angle(p: Polygon) -> Fit | None:
    """Angle with its heel at the bottom left and its legs along +x and +y."""
    x0, y0, x1, y1 = p.bounds
    b, d = x1 - x0, y1 - y0
    legs = _cut(p, "x", x0 + 0.75 * b), _cut(p, "y", y0 + 0.75 * d)
    if any(len(c) != 1 for c in legs):
        return None
    t1, t2 = legs[0][0], legs[1][0]
    if t1 >= 0.5 * d or t2 >= 0.5 * b:
        return None
    sharp = box(x0, y0, x1, y0 + t1).union(box(x0, y0, x0 + t2, y1))
    r = _fillet_radius(p.area, sharp, 1)
    dims = {"b": b, "d": d, "t": (t1 + t2) / 2.0, "r": r}
    fit = Fit("L", p, dims, _misfit(p, _closing(sharp, r)))
    return fit if fit.misfit <= FIT_TOL and abs(t1 - t2) <= 0.02 * max(t1, t2) else None


# ---------------------------------------------------------------- closed and solid shapes


def _circle_like(ring: Polygon) -> tuple[float, Polygon] | None:
    """(diameter, circle) when the polygon is a disc centred on its bounding box."""
    x0, y0, x1, y1 = ring.bounds
    D = ((x1 - x0) + (y1 - y0)) / 2.0
    if abs((x1 - x0) - (y1 - y0)) > 0.01 * D:
        return None
    cx, cy = (x0 + x1) / 2.0, (y0 + y1) / 2.0
    circle = affinity.translate(_disc(D), cx, cy)
    return (D, circle) if _misfit(ring, circle) <= FIT_TOL else None


def _disc(D: float) -> Polygon:
    return Point(0.0, 0.0).buffer(D / 2.0, quad_segs=64)


def _fit_round(p: Polygon) -> Fit | None:
    outer = Polygon(p.exterior)
    found = _circle_like(outer)
    if found is None:
        return None
    D, disc = found
    if not p.interiors:
        return Fit("ROUND", p, {"D": D}, _misfit(p, disc))
    inner = _circle_like(Polygon(p.interiors[0]))
    if inner is None:
        return None
    t = (D - inner[0]) / 2.0
    template = disc.difference(affinity.translate(_disc(inner[0]), *_centre(disc)))
    fit = Fit("HSS_ROUND", p, {"D": D, "t": t}, _misfit(p, template))
    return fit if fit.misfit <= FIT_TOL else None


def _centre(shape: Polygon) -> tuple[float, float]:
    x0, y0, x1, y1 = shape.bounds
    return (x0 + x1) / 2.0, (y0 + y1) / 2.0


def _fit_rect(p: Polygon) -> Fit | None:
    """Solid rectangle or rectangular tube with the longer side along y."""
    x0, y0, x1, y1 = p.bounds
    B, H = x1 - x0, y1 - y0
    outer = Polygon(p.exterior)
    r_out = math.sqrt(max(B * H - outer.area, 0.0) / (4.0 * _SPANDREL))
    if not p.interiors:
        fit = Fit("RECT", p, {"H": H, "B": B}, _misfit(p, _rounded_box(B, H, r_out)))
        return fit if fit.misfit <= FIT_TOL and r_out <= 0.05 * B else None
    inner = Polygon(p.interiors[0])
    ix0, iy0, ix1, iy1 = inner.bounds
    b_in, h_in = ix1 - ix0, iy1 - iy0
    r_in = math.sqrt(max(b_in * h_in - inner.area, 0.0) / (4.0 * _SPANDREL))
    t = ((B - b_in) + (H - h_in)) / 4.0
    template = _rounded_box(B, H, r_out).difference(_rounded_box(b_in, h_in, r_in))
    dims = {"H": H, "B": B, "t": t, "r_out": r_out, "r_in": r_in}
    fit = Fit("HSS", p, dims, _misfit(p, template))
    return fit if fit.misfit <= FIT_TOL else None


# ---------------------------------------------------------------- recognition


def _first(candidates: list[tuple[Polygon, Callable[[Polygon], Fit | None]]]) -> Fit | None:
    """The first candidate orientation its family fits.

    A template GEOS cannot handle is no fit: the dimensions measured in a wrong orientation
    can make a degenerate shape.
    """
    for polygon, fitter in candidates:
        try:
            fit = fitter(polygon)
        except GEOSException:
            fit = None
        if fit is not None:
            return fit
    return None


def _tall(p: Polygon) -> Polygon:
    """The polygon turned so that its bounding box is at least as tall as it is wide."""
    x0, y0, x1, y1 = p.bounds
    return _turn(p, 1) if x1 - x0 > y1 - y0 else p


def _open_family(p: Polygon, sym_x: bool, sym_y: bool) -> Fit | None:
    """I (both symmetries), channel or tee (one), angle (none), in every orientation."""
    if sym_x and sym_y:
        return _first([(p, _fit_i), (_turn(p, 1), _fit_i)])
    if sym_x or sym_y:
        up = p if sym_y else _turn(p, 1)  # symmetric about the vertical axis
        # channel: web at the top or bottom, turned to the left; tee: flange up or down.
        return _first([(_turn(up, 1), _fit_channel), (_turn(up, -1), _fit_channel),
                       (up, _fit_tee), (_mirror(up, 1.0, -1.0), _fit_tee)])
    return _first([(_mirror(p, xs, ys), _fit_angle)
                   for xs in (1.0, -1.0) for ys in (1.0, -1.0)])


def recognise(polygon: Polygon) -> Fit | str:
    """The section family of a valid outline, on its canonical axes.

    Args:
        polygon: a valid shapely polygon (any position and rotation).

    Returns:
        The :class:`Fit`, or the reason no family fits (:data:`NO_FAMILY`).
    """
    if len(polygon.interiors) > 1:
        return f"{NO_FAMILY} (it has {len(polygon.interiors)} voids)"
    try:
        fit = _recognise(polygon)
    except GEOSException as error:  # never a traceback for an odd outline
        return f"{NO_FAMILY} (geometry error: {error})"
    return fit if fit is not None else NO_FAMILY


def _recognise(polygon: Polygon) -> Fit | None:
    round_fit = _fit_round(_centred(polygon))
    if round_fit is not None:
        return round_fit
    p = align(polygon)
    if polygon.interiors or Polygon(p.exterior).area >= 0.95 * box(*p.bounds).area:
        fit = _fit_rect(_tall(p))
    else:
        fit = _open_family(p, _symmetric(p, "x"), _symmetric(p, "y"))
    return fit
