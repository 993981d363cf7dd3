"""The HTML report's plan layers from the checked model (docs/design.md §3, HTML).

:func:`plan_data` fills a :class:`~stanchion.service.reports.plan_data.PlanData` per storey
of the report rows, in the report's length unit and the rows' plan frame:

* **grid lines** (:func:`stanchion.ifc_bridge.grids.read_grids`): the U and V axes of the
  grids contained in the storey, else of every grid; each infinite axis drawn across the
  storey's extent (its columns, slabs and grid intersections) and a margin;
* **slab outlines** (:func:`stanchion.ifc_bridge.slabs.storey_slabs`): the floors the storey's
  columns carry -- with ``--takedown`` the storeys the takedown found their tops at (a
  double-height column's floor too), else the slabs of the lowest storey above it (by
  elevation) that has any, else its own -- each piece less the openings through it;
* **tributary cells** with ``--takedown``: each column's cell from the takedown's own run
  (:class:`stanchion.service.takedown_loads.TakedownApplied`, never recomputed), drawn on
  the plan of the column's storey.
"""

from __future__ import annotations

from collections import Counter
from typing import TYPE_CHECKING, Any

import numpy as np
import shapely
import shapely.affinity

from stanchion.engine.units import length_factor
from stanchion.ifc_bridge.grids import Grid, read_grids
from stanchion.ifc_bridge.relations import RelationIndex
from stanchion.ifc_bridge.slabs import StoreySlabs, storey_slabs
from stanchion.service.reports.plan_data import (
    GridAxis,
    PlanData,
    Point,
    SlabOutline,
    StoreyPlan,
    TributaryCell,
)
from stanchion.service.reports.snapshots import NO_STOREY

if TYPE_CHECKING:
    from stanchion.service.model_check import ModelCheck

#: Grid lines run past the storey's extent by this fraction of its larger side.
MARGIN = 0.08


def _ring(coords: Any, scale: float) -> tuple[Point, ...]:
    pts = np.asarray(coords, dtype=float)[:, :2] * scale
    if len(pts) > 1 and np.allclose(pts[0], pts[-1]):
        pts = pts[:-1]
    return tuple((float(x), float(y)) for x, y in pts)


def _outlines(storey: StoreySlabs, scale: float) -> list[Any]:
    """The storey's slab pieces less its openings, as shapely polygons (report unit)."""
    openings = [shapely.Polygon(np.asarray(o, float)[:, :2] * scale) for o in storey.openings]
    cut = shapely.make_valid(shapely.union_all(openings)) if openings else None
    out = []
    for part in storey.parts:
        poly = shapely.make_valid(shapely.Polygon(
            np.asarray(part.outer, float)[:, :2] * scale,
            [np.asarray(h, float)[:, :2] * scale for h in part.holes]))
        if cut is not None:
            poly = shapely.difference(poly, cut)
        out += [p for p in shapely.get_parts(poly) if p.geom_type == "Polygon" and p.area > 0]
    return out


def _axes(grids: list[Grid], box: tuple[float, float, float, float], scale: float
          ) -> tuple[GridAxis, ...]:
    x0, y0, x1, y1 = box
    pad = MARGIN * max(x1 - x0, y1 - y0, 1e-9)
    frame = shapely.box(x0 - pad, y0 - pad, x1 + pad, y1 + pad)
    reach = 10 * (max(x1 - x0, y1 - y0) + pad)
    out = []
    for grid in grids:
        for axis in (*grid.u, *grid.v):
            p = np.asarray(axis.point) * scale
            d = np.asarray(axis.direction)
            seg = shapely.intersection(shapely.LineString([p - reach * d, p + reach * d]), frame)
            if seg.is_empty or seg.geom_type != "LineString":
                continue
            (ax, ay), (bx, by) = list(seg.coords)[0], list(seg.coords)[-1]
            out.append(GridAxis(axis.tag, (float(ax), float(ay)), (float(bx), float(by))))
    return tuple(out)


def _grid_box(grids: list[Grid], scale: float) -> list[Point]:
    pts: list[Point] = []
    for grid in grids:
        inter = grid.intersections()[0] * scale
        pts += [(float(x), float(y)) for x, y in inter]
    return pts


def plan_data(run: ModelCheck) -> PlanData:
    """Grid lines, slab outlines and tributary cells per storey of a checked model.

    Args:
        run: the checked model (its report rows name the storeys and positions).

    Returns:
        The plan layers, in the report's length unit.
    """
    rows = run.report["members"]
    unit = run.report["units"]["length"]
    scale = run.read.length_unit_factor / length_factor(unit)  # model unit -> report unit
    per_in = 1.0 / length_factor(unit)
    grids, _ = read_grids(run.model, RelationIndex.build(run.model))
    storeys = run.takedown.storeys if run.takedown is not None else storey_slabs(run.model)
    outlines = {st.name: _outlines(st, scale) for st in storeys}
    floor: dict[str, list[str]] = {}
    for k, st in enumerate(storeys):
        floor[st.name] = [next((s for s in storeys[k + 1:] if s.parts), st).name]
    if run.takedown is not None:  # the levels the storey's columns carry, as the takedown found
        by_storey: dict[str, dict[str, None]] = {}
        for i, name in run.takedown.carried.items():
            by_storey.setdefault(rows[i].get("storey") or NO_STOREY, {})[name] = None
        floor.update({k: list(v) for k, v in by_storey.items()})
    cells: dict[str, list[TributaryCell]] = {}
    if run.takedown is not None:
        for i, cell in run.takedown.cells.items():
            if cell is None or cell.is_empty:
                continue
            poly = shapely.affinity.scale(cell, per_in, per_in, origin=(0, 0))
            for part in shapely.get_parts(poly):
                if part.geom_type == "Polygon":
                    cells.setdefault(rows[i].get("storey") or NO_STOREY, []).append(TributaryCell(
                        str(rows[i]["id"]), _ring(part.exterior.coords, 1.0),
                        round(float(cell.area) * per_in ** 2, 4)))
    names = Counter(r.get("storey") or NO_STOREY for r in rows)
    out: dict[str, StoreyPlan] = {}
    for name in names:
        own = [g for g in grids if g.storey == name] or grids
        polys = [p for level in floor.get(name, []) for p in outlines.get(level, [])]
        pts = [(float(r["x"]), float(r["y"])) for r in rows
               if (r.get("storey") or NO_STOREY) == name and r.get("x") is not None
               and r.get("y") is not None]
        pts += _grid_box(own, scale)
        for poly in polys:
            pts += [(float(x), float(y)) for x, y in poly.exterior.coords]
        if not pts:
            continue
        xy = np.asarray(pts)
        box = (*xy.min(axis=0).tolist(), *xy.max(axis=0).tolist())
        out[name] = StoreyPlan(
            grid_axes=_axes(own, (box[0], box[1], box[2], box[3]), scale),
            slabs=tuple(SlabOutline(_ring(p.exterior.coords, 1.0),
                                    tuple(_ring(h.coords, 1.0) for h in p.interiors))
                        for p in polys),
            tributary=tuple(cells.get(name, ())))
    return PlanData(out, unit)
