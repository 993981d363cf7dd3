"""Design grids (``IfcGrid``) and the grid location of each column: ``B-2``.

What is read (docs/design.md §5 "Grids"):

* every ``IfcGrid`` of the model, its ``UAxes``, ``VAxes`` and ``WAxes`` with their
  ``AxisTag`` and ``AxisCurve``.  Straight axes are read: an ``IfcPolyline`` or
  ``IfcIndexedPolyCurve`` whose points lie on one line, an ``IfcLine``, an
  ``IfcTrimmedCurve`` of either (the trimming does not matter: axes are taken as infinite
  lines); ``SameSense`` false reverses the axis.  Other curves (the circles of a radial grid)
  and axes without a tag are left out, with a run message.  The axes are in the grid's
  object coordinate system, taken to world coordinates by the grid's ``ObjectPlacement``
  (:func:`placement_matrix`), and then to plan (x, y).
* ``IfcGridPlacement`` (:func:`placement_matrix`): the origin is the intersection of the two
  ``IntersectingAxes`` of its ``PlacementLocation`` (an ``IfcVirtualGridIntersection``), each
  moved by its ``OffsetDistances`` entry to its left (the offset curve of ISO 10303-42, the
  IFC reading of "virtual axes parallel to the intersecting axes"), raised by the third
  distance; in the grid's coordinates, then through the grid's placement (the grid is found
  from the axes, ``PartOfU`` / ``PartOfV`` / ``PartOfW``, in every schema: IFC2X3 and IFC4
  have no ``PlacementRelTo`` on it).  Its x axis: ``PlacementRefDirection`` (a direction in
  the grid's coordinates, or towards a second intersection), else the grid's own x axis
  (ours: only elements placed relative to a grid-placed one depend on it).

Naming (:class:`GridNamer`): a column is named by the intersection of a U and a V axis
nearest its plan position: the U axis tag, a hyphen, the V axis tag (``B-2``).  When its
position is farther than :data:`ON_GRID_INCH` from that intersection along either axis, the
offsets follow in the model's length unit: ``B-2 (+600, -150 mm)`` -- the first number is
the displacement along the U axis's direction (along grid line B), the second along the V
axis's direction (along grid line 2), so on a grid whose axes run +x and +y they read as
(dx, dy).  Several grids: those contained in the column's storey are tried, else every grid;
the one with the nearest intersection names the column.  A model without a usable grid, or
a column without a plan position, gets no grid name (None).  ``WAxes`` are read but do not
name columns.
"""

from __future__ import annotations

import math
from collections.abc import Sequence
from dataclasses import dataclass, field

import ifcopenshell
import ifcopenshell.util.placement
import numpy as np

from stanchion.engine.arrays import FloatArray
from stanchion.ifc_bridge.access import Entity, get
from stanchion.ifc_bridge.relations import RelationIndex

#: A column within this distance of an intersection along both axes is on it (ours, common
#: practice, no source: a modelling deviation, not an offset an engineer would state; the
#: load takedown's "same position" is 1 in too).
ON_GRID_INCH = 1.0
#: Points of a polyline axis farther than this fraction of its length from the line through
#: its ends make it a bent axis (not read).
STRAIGHT = 1e-6
#: Columns named per numpy block (keeps the distance matrix small).
_BLOCK = 4096

Plan = tuple[float, float]


class GridError(ValueError):
    """A grid placement or axis that cannot be evaluated (the caller records why)."""


@dataclass(frozen=True)
class GridAxis:
    """One straight axis in world plan coordinates (model length unit).

    Attributes:
        tag: the AxisTag.
        point: a point on the axis (x, y).
        direction: unit vector of the axis's sense (SameSense applied).
    """

    tag: str
    point: Plan
    direction: Plan


@dataclass
class Grid:
    """One IfcGrid with its straight, tagged axes in world plan coordinates.

    Attributes:
        name: the grid's Name (or ``#id``).
        storey: the name of the storey the grid is in (None: not in a storey).
        u, v, w: the axes read, in the order of the model.
    """

    name: str
    storey: str | None
    u: list[GridAxis] = field(default_factory=list)
    v: list[GridAxis] = field(default_factory=list)
    w: list[GridAxis] = field(default_factory=list)

    def intersections(self) -> tuple[FloatArray, np.ndarray, np.ndarray]:
        """Every U-V intersection: points (n, 2) and the U and V axis index of each.

        Parallel U and V axes have no intersection and give no row.
        """
        points, iu, iv = [], [], []
        for i, a in enumerate(self.u):
            for j, b in enumerate(self.v):
                p = _meet(a.point, a.direction, b.point, b.direction)
                if p is not None:
                    points.append(p)
                    iu.append(i)
                    iv.append(j)
        return (np.array(points, dtype=float).reshape(-1, 2), np.array(iu, dtype=np.intp),
                np.array(iv, dtype=np.intp))


def _meet(p: Plan, d: Plan, q: Plan, e: Plan) -> Plan | None:
    """Intersection of the lines p + t d and q + s e (None when parallel)."""
    det = d[0] * -e[1] - d[1] * -e[0]
    if abs(det) < 1e-9:
        return None
    rx, ry = q[0] - p[0], q[1] - p[1]
    t = (rx * -e[1] - ry * -e[0]) / det
    return p[0] + t * d[0], p[1] + t * d[1]


def _unit(x: float, y: float) -> Plan:
    n = math.hypot(x, y)
    if not (n > 0 and math.isfinite(n)):
        raise GridError("zero or undefined direction")
    return x / n, y / n


def _xy(point: Entity) -> Plan:
    coords = [float(c) for c in get(point, "Coordinates")] + [0.0, 0.0]
    return coords[0], coords[1]


def _straight(points: Sequence[Plan], what: str) -> tuple[Plan, Plan]:
    """(first point, unit direction to the last) of points that lie on one line."""
    first, last = points[0], points[-1]
    length = math.dist(first, last)
    if not length > 0:
        raise GridError(f"{what} has no length")
    d = _unit(last[0] - first[0], last[1] - first[1])
    for p in points[1:-1]:
        off = abs((p[0] - first[0]) * d[1] - (p[1] - first[1]) * d[0])
        if off > STRAIGHT * length:
            raise GridError(f"{what} is not straight")
    return first, d


def axis_line(curve: Entity) -> tuple[Plan, Plan]:
    """A straight axis curve as (point, unit direction) in the grid's plan coordinates.

    Args:
        curve: the AxisCurve (IfcPolyline, IfcIndexedPolyCurve, IfcLine, IfcTrimmedCurve).

    Returns:
        A point on the axis and its direction (the curve's own sense).

    Raises:
        GridError: not a straight curve of a kind read here.
    """
    kind = curve.is_a()
    if curve.is_a("IfcTrimmedCurve"):
        point, d = axis_line(get(curve, "BasisCurve"))
        if get(curve, "SenseAgreement") is False:
            d = (-d[0], -d[1])
        return point, d
    if curve.is_a("IfcPolyline"):
        return _straight([_xy(p) for p in get(curve, "Points")], kind)
    if curve.is_a("IfcIndexedPolyCurve"):
        coords = [(float(c[0]), float(c[1])) for c in get(get(curve, "Points"), "CoordList")]
        if len(coords) < 2:
            raise GridError(f"{kind} has fewer than two points")
        return _straight(coords, kind)
    if curve.is_a("IfcLine"):
        ratios = [float(r) for r in get(get(get(curve, "Dir"), "Orientation"),
                                        "DirectionRatios")]
        return _xy(get(curve, "Pnt")), _unit(ratios[0], ratios[1])
    raise GridError(f"{kind} (only straight axes are read)")


def _grid_of(axis: Entity) -> Entity | None:
    for inverse in ("PartOfU", "PartOfV", "PartOfW"):
        for grid in getattr(axis, inverse, None) or ():
            return grid
    return None


def _local_axis(axis: Entity) -> tuple[Plan, Plan]:
    """An axis in its grid's coordinates, SameSense applied."""
    point, d = axis_line(get(axis, "AxisCurve"))
    if get(axis, "SameSense") is False:
        d = (-d[0], -d[1])
    return point, d


def _grid_placement_matrix(placement: Entity, depth: int) -> FloatArray:
    """4x4 matrix of an IfcGridPlacement (see the module notes)."""
    where = get(placement, "PlacementLocation")
    origin = _grid_placement_origin(where)
    offsets = [float(o) for o in (get(where, "OffsetDistances") or ())] + [0.0, 0.0, 0.0]
    axes = list(get(where, "IntersectingAxes"))
    grid = _grid_of(axes[0])
    parent = (placement_matrix(get(grid, "ObjectPlacement"), depth + 1)
              if grid is not None and get(grid, "ObjectPlacement") is not None else np.eye(4))
    x_dir: Plan = (1.0, 0.0)
    ref = get(placement, "PlacementRefDirection")
    if ref is not None and ref.is_a("IfcDirection"):
        ratios = [float(r) for r in get(ref, "DirectionRatios")]
        x_dir = _unit(ratios[0], ratios[1])
    elif ref is not None and ref.is_a("IfcVirtualGridIntersection"):
        other = _grid_placement_origin(ref)
        x_dir = _unit(other[0] - origin[0], other[1] - origin[1])
    local = np.eye(4)
    local[:2, 0] = x_dir
    local[:2, 1] = (-x_dir[1], x_dir[0])
    local[:3, 3] = (origin[0], origin[1], offsets[2])
    return np.asarray(parent @ local, dtype=float)


def _grid_placement_origin(where: Entity) -> Plan:
    """Plan origin (grid coordinates) of an IfcVirtualGridIntersection."""
    axes = list(get(where, "IntersectingAxes") or ())
    if len(axes) != 2:
        raise GridError("IfcVirtualGridIntersection needs two axes")
    offsets = [float(o) for o in (get(where, "OffsetDistances") or ())] + [0.0, 0.0]
    lines = []
    for axis, offset in zip(axes, offsets, strict=False):
        point, d = _local_axis(axis)
        left = (-d[1], d[0])  # ISO 10303-42 offset_curve_2d: positive to the left
        lines.append(((point[0] + offset * left[0], point[1] + offset * left[1]), d))
    origin = _meet(lines[0][0], lines[0][1], lines[1][0], lines[1][1])
    if origin is None:
        raise GridError("the two axes of the grid placement are parallel")
    return origin


def placement_matrix(placement: Entity, depth: int = 0) -> FloatArray:
    """The 4x4 world matrix of an IfcLocalPlacement or IfcGridPlacement chain.

    Args:
        placement: an IfcObjectPlacement.
        depth: recursion guard (a cyclic chain in a damaged model).

    Returns:
        The matrix (model length unit).

    Raises:
        GridError: a placement of another kind (IfcLinearPlacement ...), a cycle, or a
            grid placement that cannot be evaluated.
    """
    if depth > 64:
        raise GridError("placement chain too deep (cyclic?)")
    if placement.is_a("IfcGridPlacement"):
        return _grid_placement_matrix(placement, depth)
    if placement.is_a("IfcLocalPlacement"):
        parent = get(placement, "PlacementRelTo")
        base = np.eye(4) if parent is None else placement_matrix(parent, depth + 1)
        own = ifcopenshell.util.placement.get_axis2placement(get(placement,
                                                                 "RelativePlacement"))
        return np.asarray(base @ own, dtype=float)
    raise GridError(f"{placement.is_a()} is not evaluated")


def _world_axis(axis: Entity, matrix: FloatArray) -> GridAxis:
    point, d = _local_axis(axis)
    p = matrix @ np.array([point[0], point[1], 0.0, 1.0])
    v = matrix[:3, :3] @ np.array([d[0], d[1], 0.0])
    return GridAxis(str(get(axis, "AxisTag")), (float(p[0]), float(p[1])),
                    _unit(float(v[0]), float(v[1])))


def read_grids(model: ifcopenshell.file, index: RelationIndex
               ) -> tuple[list[Grid], list[str]]:
    """Every IfcGrid of the model with its straight, tagged axes (world plan).

    Args:
        model: an opened model.
        index: its relation index (the storey each grid is in).

    Returns:
        (grids, run messages naming what was left out).
    """
    grids: list[Grid] = []
    messages: list[str] = []
    for entity in model.by_type("IfcGrid"):
        label = get(entity, "Name") or f"#{entity.id()}"
        placement = get(entity, "ObjectPlacement")
        try:
            with np.errstate(all="ignore"):  # a damaged zero direction: NaN, then refused
                matrix = np.eye(4) if placement is None else placement_matrix(placement)
            if not np.isfinite(matrix).all():
                raise GridError("a direction of zero length")
        except (GridError, AttributeError, TypeError, ValueError, RuntimeError) as exc:
            messages.append(f"grid {label}: its placement cannot be evaluated ({exc}); its "
                            "axes name no column")
            continue
        storey = index.storey_of(entity)
        grid = Grid(label, (get(storey, "Name") or "") if storey is not None else None)
        left_out: list[str] = []
        for attr, axes in (("UAxes", grid.u), ("VAxes", grid.v), ("WAxes", grid.w)):
            for axis in get(entity, attr) or ():
                tag = get(axis, "AxisTag")
                if not tag:
                    left_out.append(f"an axis of {attr} without a tag")
                    continue
                try:
                    axes.append(_world_axis(axis, matrix))
                except (GridError, AttributeError, TypeError, ValueError, IndexError,
                        RuntimeError) as exc:
                    left_out.append(f"axis {tag} ({exc})")
        if left_out:
            messages.append(f"grid {label}: left out {', '.join(left_out[:5])}"
                            + (f" and {len(left_out) - 5} more" if len(left_out) > 5 else ""))
        if grid.u and grid.v:
            grids.append(grid)
        elif grid.u or grid.v:
            messages.append(f"grid {label} has no straight tagged "
                            f"{'V' if grid.u else 'U'} axis; it names no column")
    return grids, messages


def length_symbol(to_inch: float) -> str:
    """The usual symbol of a model length unit given in inches (``mm``, ``m``, ``ft`` ...)."""
    for symbol, inches in (("mm", 1 / 25.4), ("cm", 1 / 2.54), ("m", 1000 / 25.4),
                           ("in", 1.0), ("ft", 12.0)):
        if math.isclose(to_inch, inches, rel_tol=1e-9):
            return symbol
    return f"x {to_inch:.6g} in"


def _decimals(to_inch: float) -> int:
    """Decimals that show an offset to about a millimetre (mm 0, m 3, in 2, ft 3)."""
    mm = to_inch * 25.4
    return max(0, math.ceil(math.log10(mm) - 1e-9)) if mm > 0 else 0


def _offset_text(value: float, decimals: int) -> str:
    text = f"{value:+.{decimals}f}"
    if decimals:
        text = text.rstrip("0").rstrip(".")
    return "0" if text.lstrip("+-").strip("0.") == "" else text


class GridNamer:
    """Names plan positions by their grid intersection (see the module notes).

    Args:
        grids: the model's grids (:func:`read_grids`).
        length_to_inch: the model's length unit in inches (tolerance and offset text).
    """

    def __init__(self, grids: list[Grid], length_to_inch: float) -> None:
        self.grids = grids
        self.tolerance = ON_GRID_INCH / length_to_inch
        self.symbol = length_symbol(length_to_inch)
        self.decimals = _decimals(length_to_inch)
        self._crossings = [g.intersections() for g in grids]

    def _nearest(self, g: int, xy: FloatArray) -> tuple[FloatArray, np.ndarray]:
        """Distance to the nearest intersection of grid ``g`` and its index, per point."""
        points = self._crossings[g][0]
        n = len(xy)
        which = np.zeros(n, dtype=np.intp)
        if not len(points):
            return np.full(n, np.inf), which
        centre = points.mean(axis=0)  # small numbers: |p|^2 - 2 p.q + |q|^2 stays exact
        q = points - centre
        q2 = (q**2).sum(axis=1)
        for start in range(0, n, _BLOCK):
            block = xy[start:start + _BLOCK] - centre
            d2 = q2[None, :] - 2.0 * (block @ q.T)  # + |p|^2, the same for every q
            which[start:start + _BLOCK] = np.argmin(d2, axis=1)
        dist = np.hypot(*(xy - points[which]).T)
        return dist, which

    def names(self, x: Sequence[float], y: Sequence[float],
              storeys: Sequence[str | None]) -> list[str | None]:
        """The grid location of each position.

        Args:
            x: plan x of each position, model length unit (NaN: no position).
            y: plan y, likewise.
            storeys: each position's storey name (None or "" when none).

        Returns:
            ``"B-2"`` / ``"B-2 (+600, -150 mm)"`` per position, None without a grid or a
            position.
        """
        n = len(x)
        out: list[str | None] = [None] * n
        if not self.grids or not n:
            return out
        xy = np.column_stack([np.asarray(x, dtype=float), np.asarray(y, dtype=float)])
        known = np.isfinite(xy).all(axis=1)
        xy = np.where(known[:, None], xy, 0.0)
        found = [self._nearest(g, xy) for g in range(len(self.grids))]
        dist = np.array([f[0] for f in found])  # (grids, n)
        which = np.array([f[1] for f in found])
        choice = self._choose(dist, storeys)
        for g in range(len(self.grids)):
            cols = np.flatnonzero((choice == g) & known)
            if len(cols):
                for i, name in zip(cols.tolist(), self._names(g, which[g, cols], xy[cols]),
                                   strict=True):
                    out[i] = name
        return out

    def _choose(self, dist: FloatArray, storeys: Sequence[str | None]) -> np.ndarray:
        """Per position, the grid that names it (-1: none): the storey's grids, else all."""
        n = dist.shape[1]
        choice = np.full(n, -1, dtype=np.intp)
        groups: dict[str | None, list[int]] = {}
        for i, storey in enumerate(storeys):
            groups.setdefault(storey or None, []).append(i)
        for storey, members in groups.items():
            own = [g for g, grid in enumerate(self.grids)
                   if storey is not None and grid.storey == storey]
            pool = np.array(own or range(len(self.grids)), dtype=np.intp)
            idx = np.array(members, dtype=np.intp)
            sub = dist[np.ix_(pool, idx)]
            best = np.argmin(sub, axis=0)
            finite = np.isfinite(sub[best, np.arange(len(idx))])
            choice[idx[finite]] = pool[best[finite]]
        return choice

    def _names(self, g: int, k: np.ndarray, p: FloatArray) -> list[str]:
        """Names of positions ``p`` whose nearest intersection of grid ``g`` is ``k``."""
        grid = self.grids[g]
        points, iu, iv = self._crossings[g]
        u_axes, v_axes = iu[k], iv[k]
        u = np.array([a.direction for a in grid.u])[u_axes]
        v = np.array([a.direction for a in grid.v])[v_axes]
        d = p - points[k]
        det = u[:, 0] * v[:, 1] - u[:, 1] * v[:, 0]  # the two directions as a basis
        a = (d[:, 0] * v[:, 1] - d[:, 1] * v[:, 0]) / det
        b = (u[:, 0] * d[:, 1] - u[:, 1] * d[:, 0]) / det
        on = (np.abs(a) <= self.tolerance) & (np.abs(b) <= self.tolerance)
        names = []
        for iu_, iv_, a_, b_, on_ in zip(u_axes.tolist(), v_axes.tolist(), a.tolist(),
                                         b.tolist(), on.tolist(), strict=True):
            name = f"{grid.u[iu_].tag}-{grid.v[iv_].tag}"
            if not on_:
                name += (f" ({_offset_text(a_, self.decimals)}, "
                         f"{_offset_text(b_, self.decimals)} {self.symbol})")
            names.append(name)
        return names
