"""Tributary areas of columns on one slab level, and where each column sits on the slab.

Pure geometry (numpy and shapely; nothing of IFC), plan coordinates in inches.

**Region.** The slab region of a level is the union of its slab outlines less the openings
(:func:`slab_region`); a polygon's holes are openings too.

**Cells.** The columns on the region (the column point within ``tolerance`` of it) are the
generators of a Voronoi diagram (``shapely.voronoi_polygons``, envelope well beyond the slab
and the columns); a column's cell clipped to the region is its tributary area: every point of
the slab goes to the nearest column, the cells tile the region exactly, and a regular grid
gives the familiar half-bay rectangles.  Columns whose points lie within ``tolerance`` of each
other are one position: the cell is computed once and *each* of them is given the whole cell
(conservative; a note says so).  A column farther than ``tolerance`` from the region gets area
0 and a reason (off the slab, or in an opening); it takes no part in the diagram.  A piece of
the region with no column on it still goes to the columns whose cells reach it (the load is
not lost) and that area is returned per column (``orphan_area``) so that callers can say so.

**Position** (for ASCE 7-22 Table 4.7-1, :func:`stanchion.engine.live_load_reduction.K_LL`),
from the *free edges* of the clipped cell: the parts of its boundary that lie on the slab's
outer edge (an opening cut into the edge is part of it), or on the edge of an opening inside
the slab whose area is at least the cell's (a void of a bay or more, e.g. an atrium).  A
smaller opening (stair, shaft, riser) only reduces AT: it no more changes the column's
influence area to tributary area ratio than it changes the bay (common practice; the
"at least the cell" limit is ours).  Free edges are found as the cell's boundary segments
whose midpoint and ends lie on such an edge.

* **interior**: the free edges total at most ``tolerance`` in length;
* **corner**: the outward normals of the free edges (each longer than ``tolerance``) spread over
  more than ``CORNER_SPREAD_DEG`` (30°): two edges meeting at a corner (90°), or both sides of
  a strip one column wide (180°);
* **edge**: otherwise;
* **cantilever** (edge and corner columns): some free edge lies farther than
  ``cantilever_tolerance`` (default 12 in) from the column point, i.e. the slab extends
  beyond the column line there.  Nearer edges are the column line itself (the column's half
  depth plus an edge distance).  A corner column with a cantilever on either side counts as a
  corner column with cantilever slabs (the smaller KLL, conservative).

The 30° and 12 in are our choice (common practice, no source); both err towards the smaller
KLL, i.e. less reduction.
"""

from __future__ import annotations

from collections.abc import Sequence
from dataclasses import dataclass, field
from typing import Any

import numpy as np
import shapely

from stanchion.engine.arrays import BoolArray, FloatArray, IntArray, ObjectArray
from stanchion.engine.live_load_reduction import CORNER, EDGE, INTERIOR, OUTSIDE

#: Default tolerance, in: columns this close to the slab are on it, positions this close are
#: one, free edges shorter than this carry no direction.
TOLERANCE = 1.0
#: Default distance, in, beyond which a free edge is a cantilever rather than the column line.
CANTILEVER_TOLERANCE = 12.0
#: Spread of the free edges' outward normals above which a column is a corner column, degrees.
CORNER_SPREAD_DEG = 30.0


@dataclass(frozen=True)
class Tributary:
    """Tributary areas of the columns of one level (inputs' order).

    Attributes:
        area: clipped Voronoi cell area, in² (0 for a column on no slab).
        position: ``INTERIOR``, ``EDGE``, ``CORNER`` or ``OUTSIDE`` (codes of
            :mod:`stanchion.engine.live_load_reduction`).
        cantilever: the slab cantilevers beyond the column line (edge and corner columns).
        orphan_area: part of ``area`` on slab pieces that hold no column, in².
        reason: None, or why the column carries nothing of this level.
        cells: the clipped cells (shapely geometries; empty polygon for none).
        coincident: for each column the index of the first column at its position (itself
            when alone).
        notes: level-wide notes (coincident columns, pieces without a column).
    """

    area: FloatArray
    position: IntArray
    cantilever: BoolArray
    orphan_area: FloatArray
    reason: ObjectArray
    cells: ObjectArray
    coincident: IntArray
    notes: list[str] = field(default_factory=list)


def slab_region(outlines: Sequence[Any], openings: Sequence[Any] = ()) -> Any:
    """The slab region of a level: union of the outlines less the openings, made valid.

    Args:
        outlines: shapely polygons (holes are openings), plan coordinates, in.
        openings: further shapely polygons to subtract (openings cut through the slabs).

    Returns:
        A shapely (Multi)Polygon; empty when there is no slab.
    """
    parts = [shapely.make_valid(g) for g in outlines if g is not None and not g.is_empty]
    if not parts:
        return shapely.Polygon()
    region = shapely.union_all(parts)
    holes = [shapely.make_valid(g) for g in openings if g is not None and not g.is_empty]
    if holes:
        region = shapely.difference(region, shapely.union_all(holes))
    polys = [g for g in shapely.get_parts(region)
             if shapely.get_type_id(g) in (3, 6) and g.area > 0]  # polygons only
    return shapely.union_all(polys) if polys else shapely.Polygon()


def _groups(points: FloatArray, tolerance: float) -> IntArray:
    """Index of the first point of each point's cluster (points within ``tolerance``)."""
    n = len(points)
    label = np.arange(n)
    if n < 2:  # noqa: PLR2004 - nothing to cluster
        return label
    tree = shapely.STRtree(shapely.points(points))
    i, j = tree.query(shapely.points(points), predicate="dwithin", distance=tolerance)
    keep = i != j
    i, j = i[keep], j[keep]
    while True:  # propagate the smallest index through the pairs (few pairs, few rounds)
        low = np.minimum(label[i], label[j])
        new = label.copy()
        np.minimum.at(new, i, low)
        np.minimum.at(new, j, low)
        new = new[new]
        if np.array_equal(new, label):
            return label
        label = new


def _cells(points: FloatArray, region: Any) -> ObjectArray:
    """Voronoi cells of ``points`` (distinct) clipped to ``region``, in the points' order."""
    lo = np.minimum(points.min(axis=0), shapely.bounds(region)[:2])
    hi = np.maximum(points.max(axis=0), shapely.bounds(region)[2:])
    pad = 10.0 * float(np.max(hi - lo)) + 1.0
    envelope = shapely.box(lo[0] - pad, lo[1] - pad, hi[0] + pad, hi[1] + pad)
    multipoint = shapely.multipoints(points)
    try:
        raw = shapely.voronoi_polygons(multipoint, extend_to=envelope, ordered=True)
        cells = shapely.get_parts(raw)
    except TypeError:  # shapely < 2.1 has no ``ordered``: match cells to points
        cells = shapely.get_parts(shapely.voronoi_polygons(multipoint, extend_to=envelope))
        pt, cell = shapely.STRtree(cells).query(shapely.points(points), predicate="within")
        ordered = np.empty(len(points), dtype=object)
        ordered[pt] = cells[cell]
        cells = ordered
    return np.asarray(shapely.intersection(cells, region), dtype=object)


def _segments(cells: ObjectArray) -> tuple[IntArray, FloatArray, FloatArray, FloatArray]:
    """Boundary segments of the cells: owner cell, start, end, outward unit normal."""
    parts, owner = shapely.get_parts(cells, return_index=True)
    polygon = shapely.get_type_id(parts) == 3  # noqa: PLR2004 - GEOS type id of Polygon
    parts, owner = parts[polygon], owner[polygon]
    rings, ring_part = shapely.get_rings(parts, return_index=True)
    exterior = np.r_[True, ring_part[1:] != ring_part[:-1]]  # the first ring of each polygon
    xy, ring = shapely.get_coordinates(rings, return_index=True)
    seg = np.flatnonzero(ring[:-1] == ring[1:])
    a, b, seg_ring = xy[seg], xy[seg + 1], ring[seg]
    cross = a[:, 0] * b[:, 1] - b[:, 0] * a[:, 1]
    ccw = np.bincount(seg_ring, weights=cross, minlength=len(rings)) > 0
    # material on the left of travel: outer ring counter-clockwise or hole clockwise
    left = (exterior == ccw)[seg_ring]
    d = b - a
    length = np.hypot(d[:, 0], d[:, 1])
    with np.errstate(invalid="ignore", divide="ignore"):
        right = np.column_stack([d[:, 1], -d[:, 0]]) / length[:, None]
    normal = np.where(left[:, None], right, -right)
    return owner[ring_part[seg_ring]], a, b, normal


def _point_segment_distance(p: FloatArray, a: FloatArray, b: FloatArray) -> FloatArray:
    d = b - a
    dd = np.einsum("ij,ij->i", d, d)
    with np.errstate(invalid="ignore", divide="ignore"):
        t = np.clip(np.einsum("ij,ij->i", p - a, d) / dd, 0.0, 1.0)
    t = np.where(dd > 0, t, 0.0)
    gap = p - (a + t[:, None] * d)
    return np.asarray(np.hypot(gap[:, 0], gap[:, 1]), dtype=float)


def _spread(owner: IntArray, angle: FloatArray, n: int) -> FloatArray:
    """Per owner, the smallest arc (radians) holding all its angles (0 for none or one)."""
    out = np.zeros(n)
    if len(owner) == 0:
        return out
    order = np.lexsort((angle, owner))
    owner, angle = owner[order], angle[order]
    start = np.flatnonzero(np.r_[True, owner[1:] != owner[:-1]])
    end = np.r_[start[1:], len(owner)] - 1
    gaps = np.diff(angle)
    gaps[owner[1:] != owner[:-1]] = -np.inf  # no gap across owners
    wrap = angle[start] + 2 * np.pi - angle[end]
    biggest = wrap.copy()
    inner = end > start
    if inner.any():
        inner_max = np.maximum.reduceat(np.r_[gaps, -np.inf], start)[inner]
        biggest[inner] = np.maximum(wrap[inner], inner_max)
    out[owner[start]] = np.where(inner, 2 * np.pi - biggest, 0.0)
    return out


def _on_ring(rings: Any, a: FloatArray, b: FloatArray, eps: float) -> BoolArray:
    """Segments whose ends and midpoint lie within ``eps`` of ``rings`` (one geometry)."""
    shapely.prepare(rings)
    on = np.ones(len(a), dtype=bool)
    for p in (a, b, (a + b) / 2.0):
        on &= shapely.dwithin(rings, shapely.points(p), eps)
    return on


def _free_segments(cells: ObjectArray, region: Any
                   ) -> tuple[IntArray, FloatArray, FloatArray, FloatArray]:
    """The cells' free edges (segment owner, ends and outward normal; module docstring).

    On the region's outer boundary, or on a hole of the region at least as large as the cell.
    """
    owner, a, b, normal = _segments(cells)
    parts = shapely.get_parts(region)
    extent = float(np.max(np.ptp(np.asarray(shapely.bounds(region)).reshape(2, 2), axis=0)))
    eps = 1e-7 * extent + 1e-9
    free = _on_ring(shapely.multilinestrings(shapely.get_exterior_ring(parts)), a, b, eps)
    rings, ring_part = shapely.get_rings(parts, return_index=True)
    holes = rings[np.r_[False, ring_part[1:] == ring_part[:-1]]]
    rest = np.flatnonzero(~free)
    if len(holes) and len(rest):
        seg, hole = shapely.STRtree(holes).query(shapely.points((a[rest] + b[rest]) / 2.0),
                                                 predicate="dwithin", distance=eps)
        seg = rest[seg]
        big = shapely.area(shapely.polygons(holes[hole])) >= shapely.area(cells[owner[seg]])
        seg, hole = seg[big], hole[big]
        ends = (shapely.dwithin(holes[hole], shapely.points(a[seg]), eps)
                & shapely.dwithin(holes[hole], shapely.points(b[seg]), eps))
        free[seg[ends]] = True
    return owner[free], a[free], b[free], normal[free]


def _classify(points: FloatArray, cells: ObjectArray, region: Any, tolerance: float,
              cantilever_tolerance: float) -> tuple[IntArray, BoolArray]:
    """Position and cantilever of each cell's column (the rule of the module docstring)."""
    n = len(points)
    owner, a, b, normal = _free_segments(cells, region)
    length = np.hypot(*(b - a).T)
    free_length = np.bincount(owner, weights=length, minlength=n)
    exterior = free_length > tolerance
    long = length > tolerance
    angle = np.arctan2(normal[long, 1], normal[long, 0])
    spread = _spread(owner[long], angle, n)
    far = _point_segment_distance(points[owner], a, b) > cantilever_tolerance
    cantilever = np.bincount(owner[far & long], minlength=n) > 0
    position = np.where(exterior, np.where(spread > np.radians(CORNER_SPREAD_DEG), CORNER, EDGE),
                        INTERIOR)
    return position.astype(np.int64), cantilever & exterior


def tributary_areas(points: FloatArray, region: Any, *, tolerance: float = TOLERANCE,
                    cantilever_tolerance: float = CANTILEVER_TOLERANCE) -> Tributary:
    """Tributary areas and positions of columns on one slab region (module docstring rules).

    Args:
        points: (n, 2) column positions in plan, in.
        region: the slab region (:func:`slab_region`), in.
        tolerance: columns within it of the slab are on it; positions within it are one, in.
        cantilever_tolerance: free edges farther than this from the column are cantilevers, in.

    Returns:
        The :class:`Tributary` of the columns, in the order of ``points``.
    """
    pts = np.asarray(points, dtype=float).reshape(-1, 2)
    n = len(pts)
    area, orphan = np.zeros(n), np.zeros(n)
    position = np.full(n, OUTSIDE, dtype=np.int64)
    cantilever = np.zeros(n, dtype=bool)
    reason = np.full(n, None, dtype=object)
    cells = np.array([shapely.Polygon()] * n + [None], dtype=object)[:n]
    coincident = np.arange(n)
    notes: list[str] = []
    if n == 0:
        return Tributary(area, position, cantilever, orphan, reason, cells, coincident, notes)
    if region is None or region.is_empty:
        reason[:] = "the level has no slab"
        return Tributary(area, position, cantilever, orphan, reason, cells, coincident, notes)
    shapely.prepare(region)
    known = np.isfinite(pts).all(axis=1)
    gap = np.full(n, np.inf)
    gap[known] = shapely.distance(region, shapely.points(pts[known]))
    on = gap <= tolerance
    filled = shapely.union_all(shapely.polygons(shapely.get_exterior_ring(
        shapely.get_parts(region))))
    in_opening = ~on & known
    in_opening[in_opening] = shapely.contains_xy(filled, *pts[in_opening].T)
    for i in np.flatnonzero(~on):
        reason[i] = ("no plan position" if not known[i] else "in an opening of the slab"
                     if in_opening[i] else
                     f"not on a slab of the level ({gap[i]:.0f} in from the nearest)")
    idx = np.flatnonzero(on)
    if len(idx) == 0:
        return Tributary(area, position, cantilever, orphan, reason, cells, coincident, notes)
    first = idx[_groups(pts[idx], tolerance)]
    coincident[idx] = first
    reps = np.unique(first)
    rep_cells = _cells(pts[reps], region)
    rep_pos, rep_cant = _classify(pts[reps], rep_cells, region, tolerance, cantilever_tolerance)
    where = np.searchsorted(reps, first)
    area[idx] = shapely.area(rep_cells)[where]
    cells[idx] = rep_cells[where]
    position[idx] = rep_pos[where]
    cantilever[idx] = rep_cant[where]
    orphan[idx] = _orphan_area(pts[reps], rep_cells, region, tolerance)[where]
    shared = idx[first != idx]
    if len(shared):
        notes.append(f"{len(shared)} column(s) stand within {tolerance:g} in of another: "
                     "each of them is given the whole tributary area (conservative)")
    return Tributary(area, position, cantilever, orphan, reason, cells, coincident, notes)


def _orphan_area(points: FloatArray, cells: ObjectArray, region: Any, tolerance: float
                 ) -> FloatArray:
    """Per cell, its area on region pieces that hold no column point."""
    pieces = shapely.get_parts(region)
    out = np.zeros(len(points))
    if len(pieces) < 2:  # noqa: PLR2004 - one piece holds every column on the region
        return out
    hit, _ = shapely.STRtree(shapely.points(points)).query(pieces, predicate="dwithin",
                                                           distance=tolerance)
    empty = np.setdiff1d(np.arange(len(pieces)), hit)
    if len(empty) == 0:
        return out
    lonely = shapely.union_all(pieces[empty])
    return np.asarray(shapely.area(shapely.intersection(cells, lonely)), dtype=float)


def cell_volumes(cells: ObjectArray, slabs: Sequence[Any], thickness: FloatArray) -> FloatArray:
    """Slab volume over each cell: sum over slabs of area(cell ∩ slab) × thickness, in³.

    Args:
        cells: tributary cells (:attr:`Tributary.cells`), in.
        slabs: slab outlines (shapely polygons), in.
        thickness: thickness of each slab, in.

    Returns:
        Volume per cell, in³.  Overlapping slabs both count (each was modelled).
    """
    out = np.zeros(len(cells))
    if len(slabs) == 0 or len(cells) == 0:
        return out
    geoms = np.array([shapely.make_valid(s) for s in slabs] + [None], dtype=object)[:-1]
    t = np.asarray(thickness, dtype=float).reshape(len(geoms))
    ci, si = shapely.STRtree(geoms).query(cells, predicate="intersects")
    part = shapely.area(shapely.intersection(cells[ci], geoms[si]))
    np.add.at(out, ci, part * t[si])
    return out
