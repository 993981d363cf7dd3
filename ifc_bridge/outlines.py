"""Outlines of arbitrary IFC profiles: the outer boundary and voids as 2D point lists.

:func:`outline_of` reads ``IfcArbitraryClosedProfileDef`` and
``IfcArbitraryProfileDefWithVoids`` (also as the parent of an ``IfcDerivedProfileDef``) into
an :class:`engine.outlines.Outline` in the **model's length unit** (the caller scales it to
inches, :meth:`Outline.scaled`).  Curves read:

* ``IfcPolyline``;
* ``IfcIndexedPolyCurve`` (IFC4+) over ``IfcCartesianPointList2D`` / ``3D``, with
  ``IfcLineIndex`` and ``IfcArcIndex`` segments (an arc through its three points) or none;
* ``IfcCompositeCurve`` of ``IfcCompositeCurveSegment`` s, each segment's points reversed
  when SameSense is false, and consecutive segments required to meet;
* ``IfcTrimmedCurve`` on an ``IfcCircle`` (Position with its RefDirection: rotation) or on
  an ``IfcLine``, trimmed by ``IfcParameterValue`` -- for a circle an angle in the model's
  plane-angle unit (degrees or radians; radians when the model declares none) -- or by
  ``IfcCartesianPoint``, the MasterRepresentation preferred; SenseAgreement false runs
  clockwise.  Where the segments meet only with the parameters read in the other of degrees
  and radians (an exporter's mistake), that reading is taken and the outline's ``notes`` say
  so; where they meet in neither, the gap is the reason;
* a whole ``IfcCircle``.

Arcs are discretised with a chord tolerance: the largest distance between an arc and its
chords (the sagitta) is at most :data:`CHORD_TOL` times the radius, i.e. steps of at most
3.6° (a full circle in 100 chords: its area 0.07 % low, its second moment 0.13 % low).

ifcopenshell.geom was measured for this (ifcopenshell 0.9.0): it returns a profile's
curve in metres with each ``IfcArcIndex`` arc as two chords through its three points and a
fillet of a trimmed circle as two chords whatever the deflection settings, so it is not
used: the arcs here follow the tolerance above.

Anything else (B-splines, ellipses, ``IfcCurveSegment`` of IFC4X3, open curves, gaps) gives
no outline and the reason, e.g. ``"outline of type IfcBSplineCurveWithKnots not
supported"``.
"""

from __future__ import annotations

import math
from collections.abc import Callable
from dataclasses import replace

import ifcopenshell
import ifcopenshell.util.unit
import numpy as np

from stanchion.engine.arrays import FloatArray
from stanchion.engine.outlines import Outline
from stanchion.ifc_bridge.access import Entity, get, get_opt

#: Largest sagitta of a chord, as a fraction of the arc's radius (see the module notes).
CHORD_TOL = 5e-4
#: Largest angle step of a discretised arc, radians: 2·acos(1 - CHORD_TOL) (3.62°).
ARC_STEP = 2.0 * math.acos(1.0 - CHORD_TOL)
#: Largest gap between consecutive segments of a composite curve (and at its closure), as a
#: fraction of the curve's extent (common practice, no source: exporters round to ~1e-6).
GAP_TOL = 1e-3


class OutlineError(ValueError):
    """A profile whose outline cannot be read; the message is the reason."""


class OutlineGapError(OutlineError):
    """Segments of an outline that do not meet, or a curve that does not close."""


def plane_angle_scale(model: ifcopenshell.file) -> float:
    """Radians per the model's plane-angle unit (1.0 when the model declares none).

    Args:
        model: the IFC model.

    Returns:
        The factor: 0.01745... for degrees, 1.0 for radians.
    """
    if not model.by_type("IfcProject"):
        return 1.0
    return float(ifcopenshell.util.unit.calculate_unit_scale(model, "PLANEANGLEUNIT"))


def outline_of(model: ifcopenshell.file, profile: Entity, angle_scale: float | None = None
               ) -> tuple[Outline | None, str | None]:
    """Outer boundary and voids of an arbitrary profile, in the model's length unit.

    The caller converts to inches with :meth:`Outline.scaled` (the model's length factor,
    times a mapped representation's scale where there is one).

    Args:
        model: the IFC model (for its plane-angle unit).
        profile: an IfcProfileDef.
        angle_scale: :func:`plane_angle_scale` of the model, when the caller has it (it costs
            about 0.1 ms to find; a reader of many profiles finds it once).

    Returns:
        (the outline, None), or (None, the reason the profile has no readable outline).
    """
    angle = plane_angle_scale(model) if angle_scale is None else angle_scale
    try:
        return _profile_outline(profile, angle), None
    except OutlineGapError as problem:
        gap = problem
    except OutlineError as problem:
        return None, str(problem)
    return _other_angle_unit(profile, angle, gap)


_ANGLE_UNITS = {"radians": 1.0, "degrees": math.pi / 180.0}


def _other_angle_unit(profile: Entity, angle: float, gap: OutlineGapError
                      ) -> tuple[Outline | None, str | None]:
    """An outline whose segments meet only with circle parameters in the other angle unit.

    Some exporters write trimming angles in degrees under a model in radians (or the
    reverse).  Segments that meet in one reading and not in the other decide it; the
    outline then carries a note saying so.  Otherwise the gap is the reason.
    """
    declared = next((k for k, v in _ANGLE_UNITS.items() if math.isclose(v, angle)),
                    "not degrees or radians")
    for name, other in _ANGLE_UNITS.items():
        if math.isclose(other, angle):
            continue
        try:
            outline = _profile_outline(profile, other)
        except OutlineError:
            continue
        note = (f"circle trimming parameters read in {name}: in the model's plane-angle unit "
                f"({declared}) the outline's segments do not meet, in {name} they do")
        return replace(outline, notes=(note,)), None
    return None, str(gap)


def _profile_outline(profile: Entity, angle: float) -> Outline:
    if profile.is_a("IfcDerivedProfileDef"):
        return _derived(_profile_outline(get(profile, "ParentProfile"), angle),
                        get(profile, "Operator"))
    if not profile.is_a("IfcArbitraryClosedProfileDef"):
        raise OutlineError(f"profile type {profile.is_a()} has no outline to read")
    kind = get(profile, "ProfileType")
    if kind != "AREA":
        raise OutlineError(f"profile {profile.is_a()} is a {kind} profile, "
                           "not an area")
    outer = ring_points(get(profile, "OuterCurve"), angle)
    inner = get_opt(profile, "InnerCurves") or ()
    return Outline(outer, tuple(ring_points(c, angle) for c in inner))


def _derived(parent: Outline, operator: Entity) -> Outline:
    """The parent's outline through an IfcCartesianTransformationOperator2D(nonUniform)."""
    ax1 = _direction(operator.Axis1, (1.0, 0.0))
    ax2 = _direction(operator.Axis2, (-ax1[1], ax1[0]))
    scale = operator.Scale if operator.Scale is not None else 1.0
    scale2 = getattr(operator, "Scale2", None)
    scale2 = scale if scale2 is None else scale2
    origin = np.asarray(operator.LocalOrigin.Coordinates[:2], dtype=float)

    def move(points: FloatArray) -> FloatArray:
        out: FloatArray = (origin + np.outer(points[:, 0] * scale, ax1)
                           + np.outer(points[:, 1] * scale2, ax2))
        return out

    return Outline(move(parent.outer), tuple(move(v) for v in parent.voids))


# ---------------------------------------------------------------- curves


def ring_points(curve: Entity, angle: float) -> FloatArray:
    """Points of a closed curve (closing point not repeated).

    Args:
        curve: an IfcCurve bounding an area.
        angle: radians per model plane-angle unit.

    Returns:
        (n, 2) points in the model's length unit.

    Raises:
        OutlineError: unsupported curve type, gap, or a curve that does not close.
    """
    pts = curve_points(curve, angle)
    if len(pts) < 3:
        raise OutlineError(f"outline {curve.is_a()} has fewer than 3 points")
    extent = float(np.ptp(pts, axis=0).max())
    gap = float(np.hypot(*(pts[-1] - pts[0])))
    if gap <= GAP_TOL * extent:
        return pts[:-1]
    if curve.is_a() in _IMPLICITLY_CLOSED:
        return pts  # a point list bounding an area closes from its last point to its first
    raise OutlineGapError(f"outline {curve.is_a()} does not close (gap {gap:.4g} in the "
                     "model's length unit)")


def curve_points(curve: Entity, angle: float) -> FloatArray:
    """Points along a 2D curve, from its start to its end.

    Args:
        curve: an IfcCurve (see the module notes for the types read).
        angle: radians per model plane-angle unit.

    Returns:
        (n, 2) points in the model's length unit.

    Raises:
        OutlineError: an unsupported curve type or a broken curve.
    """
    reader = _READERS.get(curve.is_a())
    if reader is None:
        raise OutlineError(f"outline of type {curve.is_a()} not supported")
    return reader(curve, angle)


def _coords(point: Entity) -> FloatArray:
    return np.asarray(get(point, "Coordinates")[:2], dtype=float)


def _direction(direction: Entity | None, default: tuple[float, float]) -> FloatArray:
    if direction is None:
        return np.asarray(default, dtype=float)
    v = np.asarray(get(direction, "DirectionRatios")[:2], dtype=float)
    norm = float(np.hypot(*v))
    if not norm > 0:
        raise OutlineError("outline has a direction of zero length")
    out: FloatArray = v / norm
    return out


def _polyline(curve: Entity, angle: float) -> FloatArray:
    points = [get(p, "Coordinates")[:2] for p in get(curve, "Points")]
    return np.array(points, dtype=float).reshape(-1, 2)


def _arc(centre: FloatArray, radius: float, start: float, sweep: float,
         axes: tuple[FloatArray, FloatArray]) -> FloatArray:
    """Points of an arc from angle ``start`` through ``sweep`` (radians, signed) in a frame."""
    n = max(1, math.ceil(abs(sweep) / ARC_STEP - 1e-9))
    a = start + sweep * np.arange(n + 1) / n
    out: FloatArray = (centre + radius * (np.outer(np.cos(a), axes[0])
                                          + np.outer(np.sin(a), axes[1])))
    return out


def _circle_frame(circle: Entity) -> tuple[FloatArray, float, tuple[FloatArray, FloatArray]]:
    """Centre, radius and (x, y) axes of an IfcCircle's Position."""
    place = get(circle, "Position")
    x = _direction(get_opt(place, "RefDirection"), (1.0, 0.0))
    axis = get_opt(place, "Axis")
    flip = axis is not None and float(axis.DirectionRatios[2]) < 0
    y = np.array([x[1], -x[0]]) if flip else np.array([-x[1], x[0]])
    radius = float(get(circle, "Radius"))
    if not radius > 0:
        raise OutlineError(f"outline IfcCircle has radius {radius:.4g}")
    return _coords(get(place, "Location")), radius, (x, y)


def _circle(curve: Entity, angle: float) -> FloatArray:
    centre, radius, axes = _circle_frame(curve)
    return _arc(centre, radius, 0.0, 2.0 * math.pi, axes)[:-1]


def _trim(trims: tuple[Entity, ...], master: str) -> Entity:
    """The trimming value of the MasterRepresentation (else the one given)."""
    wanted = "IfcCartesianPoint" if master == "CARTESIAN" else "IfcParameterValue"
    for t in trims:
        if t.is_a(wanted):
            return t
    if not trims:
        raise OutlineError("outline IfcTrimmedCurve has no trimming value")
    return trims[0]


def _circle_angle(trim: Entity, angle: float, centre: FloatArray,
                  axes: tuple[FloatArray, FloatArray]) -> float:
    if trim.is_a("IfcParameterValue"):
        return float(trim.wrappedValue) * angle
    v = _coords(trim) - centre
    return math.atan2(float(v @ axes[1]), float(v @ axes[0]))


def _trimmed(curve: Entity, angle: float) -> FloatArray:
    basis, master = get(curve, "BasisCurve"), str(get(curve, "MasterRepresentation"))
    t1, t2 = _trim(get(curve, "Trim1"), master), _trim(get(curve, "Trim2"), master)
    if basis.is_a("IfcLine"):
        return np.array([_line_point(basis, t) for t in (t1, t2)]).reshape(2, 2)
    if not basis.is_a("IfcCircle"):
        raise OutlineError(f"outline IfcTrimmedCurve on {basis.is_a()} not supported")
    centre, radius, axes = _circle_frame(basis)
    a1, a2 = (_circle_angle(t, angle, centre, axes) for t in (t1, t2))
    full = 2.0 * math.pi
    if get(curve, "SenseAgreement"):
        sweep = (a2 - a1) % full or (full if a1 != a2 else 0.0)
    else:
        sweep = -((a1 - a2) % full or (full if a1 != a2 else 0.0))
    if sweep == 0.0:
        raise OutlineError("outline IfcTrimmedCurve trims its circle to a point")
    return _arc(centre, radius, a1, sweep, axes)


def _line_point(line: Entity, trim: Entity) -> FloatArray:
    if trim.is_a("IfcCartesianPoint"):
        return _coords(trim)
    direction = line.Dir
    step = _direction(direction.Orientation, (1.0, 0.0)) * float(direction.Magnitude)
    out: FloatArray = _coords(line.Pnt) + float(trim.wrappedValue) * step
    return out


def _indexed(curve: Entity, angle: float) -> FloatArray:
    coords = np.asarray(curve.Points.CoordList, dtype=float)[:, :2]
    segments = curve.Segments
    if not segments:
        return coords
    parts = []
    for seg in segments:
        index = [int(i) - 1 for i in seg.wrappedValue]
        if min(index) < 0 or max(index) >= len(coords):
            raise OutlineError(f"outline IfcIndexedPolyCurve segment {seg.wrappedValue} "
                               f"points beyond its {len(coords)} points")
        if seg.is_a("IfcArcIndex"):
            parts.append(_three_point_arc(*(coords[i] for i in index)))
        else:
            parts.append(coords[index])
    return _joined(parts, "IfcIndexedPolyCurve")


def _three_point_arc(p1: FloatArray, pm: FloatArray, p2: FloatArray) -> FloatArray:
    """The arc from p1 through pm to p2 (a straight segment if they are collinear)."""
    ax, ay = p1
    bx, by = pm
    cx, cy = p2
    det = 2.0 * (ax * (by - cy) + bx * (cy - ay) + cx * (ay - by))
    scale = max(float(np.ptp([ax, bx, cx])), float(np.ptp([ay, by, cy])), 1e-300)
    if abs(det) <= 1e-12 * scale * scale:
        return np.array([p1, p2])
    a2, b2, c2 = ax * ax + ay * ay, bx * bx + by * by, cx * cx + cy * cy
    centre = np.array([(a2 * (by - cy) + b2 * (cy - ay) + c2 * (ay - by)) / det,
                       (a2 * (cx - bx) + b2 * (ax - cx) + c2 * (bx - ax)) / det])
    radius = float(np.hypot(*(p1 - centre)))
    start, mid, end = (math.atan2(*(p - centre)[::-1]) for p in (p1, pm, p2))
    full = 2.0 * math.pi
    ccw = (end - start) % full
    sweep = ccw if (mid - start) % full <= ccw else ccw - full
    axes = (np.array([1.0, 0.0]), np.array([0.0, 1.0]))
    return _arc(centre, radius, start, sweep, axes)


def _composite(curve: Entity, angle: float) -> FloatArray:
    parts = []
    for seg in get(curve, "Segments"):
        if not seg.is_a("IfcCompositeCurveSegment"):
            raise OutlineError(f"outline segment of type {seg.is_a()} not supported")
        pts = curve_points(get(seg, "ParentCurve"), angle)
        parts.append(pts if get(seg, "SameSense") else pts[::-1])
    return _joined(parts, "IfcCompositeCurve")


def _joined(parts: list[FloatArray], what: str) -> FloatArray:
    """Consecutive segments joined end to start; a gap is an error."""
    if not parts:
        raise OutlineError(f"outline {what} has no segments")
    allpts = np.vstack(parts)
    extent = float(np.ptp(allpts, axis=0).max())
    out = [parts[0]]
    for k, part in enumerate(parts[1:], start=1):
        gap = float(np.hypot(*(part[0] - out[-1][-1])))
        if gap > GAP_TOL * extent:
            raise OutlineGapError(f"outline {what} has a gap of {gap:.4g} (model length unit) "
                             f"before segment {k + 1}")
        out.append(part[1:])
    return np.vstack(out)


#: Curves whose closing edge (last point to first) may be left implicit.
_IMPLICITLY_CLOSED = ("IfcPolyline", "IfcIndexedPolyCurve", "IfcCircle")

_READERS: dict[str, Callable[[Entity, float], FloatArray]] = {
    "IfcPolyline": _polyline,
    "IfcIndexedPolyCurve": _indexed,
    "IfcCompositeCurve": _composite,
    "IfcTrimmedCurve": _trimmed,
    "IfcCircle": _circle,
}

__all__ = ["ARC_STEP", "CHORD_TOL", "OutlineError", "OutlineGapError", "curve_points", "outline_of",
           "plane_angle_scale", "ring_points"]
