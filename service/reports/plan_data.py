"""What a storey plan of the HTML report may draw besides the columns (docs/design.md §3).

The columns themselves come from the report (each row's ``storey``, ``x``, ``y``, status and
utilization).  Grid lines, slab outlines and tributary areas come from readers of the model
(grids, slabs, the load takedown); a front end that has them passes a :class:`PlanData`
to :func:`stanchion.service.reports.html.render_html`, and a plan draws each layer only when
its storey has data for it.  Every coordinate is a plan position in the report's length
unit, in the same frame as the member rows' ``x`` and ``y``.
"""

from __future__ import annotations

from collections.abc import Mapping
from dataclasses import dataclass, field

#: A plan point (x, y), report length unit.
Point = tuple[float, float]


@dataclass(frozen=True)
class GridAxis:
    """One grid line: its tag and two points it is drawn between.

    Attributes:
        tag: the axis tag (``A``, ``3``), drawn in a bubble at both ends.
        start: one end.
        end: the other end.
    """

    tag: str
    start: Point
    end: Point


@dataclass(frozen=True)
class SlabOutline:
    """A slab's outline on a storey.

    Attributes:
        outer: the outer boundary, a closed ring (the last point need not repeat the first).
        holes: openings, each a ring.
    """

    outer: tuple[Point, ...]
    holes: tuple[tuple[Point, ...], ...] = ()


@dataclass(frozen=True)
class TributaryCell:
    """The tributary area of one column on a storey.

    Attributes:
        member_id: the report row's ``id`` of the column it belongs to.
        outline: the cell, a closed ring.
        area: its area in the report's length unit squared, when known.
    """

    member_id: str
    outline: tuple[Point, ...]
    area: float | None = None


@dataclass(frozen=True)
class StoreyPlan:
    """The layers of one storey's plan beyond its columns (each may be empty)."""

    grid_axes: tuple[GridAxis, ...] = ()
    slabs: tuple[SlabOutline, ...] = ()
    tributary: tuple[TributaryCell, ...] = ()


@dataclass(frozen=True)
class PlanData:
    """Plan layers by storey name (the report rows' ``storey``).

    Attributes:
        storeys: storey name -> its layers; a storey not named draws its columns only.
        unit: the length unit of every coordinate; must be the report's.
    """

    storeys: Mapping[str, StoreyPlan] = field(default_factory=dict)
    unit: str = ""
