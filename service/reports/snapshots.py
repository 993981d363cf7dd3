"""Small pictures of where a column stands: the snapshot of its BCF topic.

A snapshot source is any callable ``(member row) -> PNG bytes or None`` built from a report
(docs/design.md §3); :func:`stanchion.service.reports.bcf.write_bcf` takes one.

:class:`StoreyDots` draws, per storey, every column of the report that has a plan position
(``x``, ``y``) as a small grey dot and the topic's column as a large ringed mark with its
label, axes in the report's length unit; given the HTML plans' layers, the slab outlines and
grid lines with their tags are drawn beneath, once per storey.  matplotlib's object
interface with the Agg canvas is used (no pyplot state, no display needed); each storey's
dots are drawn once and only the highlighted mark is drawn per picture and saved as an RGB
PNG (about 7 ms a picture against 30 ms for a full redraw, measured with 400 dots a
storey; 2,000 topics with their snapshots took 18-20 s and 25 MB on two shared cores).
"""

from __future__ import annotations

import io
import math
from collections.abc import Callable
from typing import Any

from stanchion.service.reports.plan_data import PlanData, StoreyPlan

#: A snapshot source: a member row in, PNG bytes out (None: no picture for this member).
SnapshotSource = Callable[[dict[str, Any]], bytes | None]

#: Picture size, inches at :data:`DPI` (320 x 320 pixels).
SIZE_IN, DPI = 3.2, 100
#: The file signature every PNG starts with (PNG specification, section 5.2).
PNG_SIGNATURE = b"\x89PNG\r\n\x1a\n"
#: Colours of our own choosing: the other columns, the topic's column by status.
OTHER_COLOUR = "#9a9a9a"
MARK_COLOUR = {"fail": "#b3001b", "not_checked": "#5b3fa8"}
NO_STOREY = "(no storey)"
#: The plan layers' colours (those of the HTML plans, reports.pictures).
GRID_INK, SLAB_INK = "#8a94a3", "#aab3bf"
#: Grid tags are written up to this many axes a storey (beyond, a 320 px picture is crowded
#: by them and each PNG grows about threefold: measured 8 -> 24 KB with 30 axes).
TAGS_UP_TO = 16


def _position(row: dict[str, Any]) -> tuple[float, float] | None:
    x, y = row.get("x"), row.get("y")
    if isinstance(x, int | float) and isinstance(y, int | float) and math.isfinite(x) \
            and math.isfinite(y):
        return float(x), float(y)
    return None


def member_label(row: dict[str, Any]) -> str:
    """The short label of a member: its Tag, else its name, else its id."""
    return str(row.get("tag") or row.get("name") or row.get("id") or "")


def _draw_layers(ax: Any, layers: StoreyPlan) -> list[tuple[float, float]]:
    """Slab outlines (with their openings) and grid lines with tags; their points."""
    from matplotlib.patches import PathPatch
    from matplotlib.path import Path

    pts: list[tuple[float, float]] = []
    for slab in layers.slabs:
        rings = [list(slab.outer), *(list(h) for h in slab.holes)]
        rings = [r for r in rings if len(r) >= 3]
        if not rings:
            continue
        path = Path.make_compound_path(*(Path([*r, r[0]], closed=True) for r in rings))
        # outlines only: a filled slab made each PNG about three times larger
        ax.add_patch(PathPatch(path, facecolor="none", edgecolor=SLAB_INK, linewidth=0.8,
                               zorder=0))
        pts += list(slab.outer)
    tags = len(layers.grid_axes) <= TAGS_UP_TO
    for axis in layers.grid_axes:
        (x1, y1), (x2, y2) = axis.start, axis.end
        ax.plot([x1, x2], [y1, y2], color=GRID_INK, linewidth=0.5, zorder=0.5)
        if tags:
            for x, y in (axis.start, axis.end):
                ax.text(x, y, axis.tag, fontsize=5.5, ha="center", va="center", zorder=2,
                        bbox={"boxstyle": "circle,pad=0.25", "facecolor": "white",
                              "edgecolor": GRID_INK, "linewidth": 0.5})
        pts += [axis.start, axis.end]
    return pts


class _StoreyFigure:
    """One storey's plan: the dots drawn once, the highlighted mark moved per picture."""

    def __init__(self, storey: str, points: list[tuple[float, float]], unit: str,
                 layers: StoreyPlan | None = None) -> None:
        from matplotlib.backends.backend_agg import FigureCanvasAgg
        from matplotlib.figure import Figure

        self.figure = Figure(figsize=(SIZE_IN, SIZE_IN), dpi=DPI)
        self.canvas = FigureCanvasAgg(self.figure)
        ax = self.figure.add_subplot()
        xs, ys = [p[0] for p in points], [p[1] for p in points]
        ax.scatter(xs, ys, s=10, c=OTHER_COLOUR, zorder=1)
        extra = _draw_layers(ax, layers) if layers is not None else []
        xs += [p[0] for p in extra]
        ys += [p[1] for p in extra]
        pad = max(max(xs) - min(xs), max(ys) - min(ys), 1.0) * 0.08
        ax.set_xlim(min(xs) - pad, max(xs) + pad)
        ax.set_ylim(min(ys) - pad, max(ys) + pad)
        ax.set_aspect("equal", adjustable="box")
        ax.tick_params(labelsize=6)
        ax.set_xlabel(f"x [{unit}]", fontsize=7)
        ax.set_ylabel(f"y [{unit}]", fontsize=7)
        self.title = ax.set_title(storey, fontsize=8)
        self.axes = ax
        self.mark = ax.scatter([xs[0]], [ys[0]], s=90, facecolors="none", linewidths=2.0,
                               edgecolors=MARK_COLOUR["fail"], zorder=3, animated=True)
        self.dot = ax.scatter([xs[0]], [ys[0]], s=18, c=MARK_COLOUR["fail"], zorder=4,
                              animated=True)
        self.text = ax.annotate("", (xs[0], ys[0]), xytext=(6, 6),
                                textcoords="offset points", fontsize=7, zorder=5,
                                animated=True)
        self.figure.tight_layout()
        self.canvas.draw()  # the storey's dots, once; the marks are drawn per picture
        self.background = self.canvas.copy_from_bbox(self.figure.bbox)

    def draw(self, point: tuple[float, float], label: str, colour: str) -> bytes:
        from PIL import Image

        self.mark.set_offsets([point])
        self.mark.set_edgecolor(colour)
        self.dot.set_offsets([point])
        self.dot.set_color(colour)
        self.text.xy = point
        self.text.set_text(label)
        self.text.set_color(colour)
        self.canvas.restore_region(self.background)
        for artist in (self.mark, self.dot, self.text):
            self.axes.draw_artist(artist)
        rgba = self.canvas.buffer_rgba()
        buffer = io.BytesIO()
        Image.frombuffer("RGBA", (rgba.shape[1], rgba.shape[0]), bytes(rgba), "raw",
                         "RGBA", 0, 1).convert("RGB").save(buffer, format="PNG")
        return buffer.getvalue()


class StoreyDots:
    """Snapshots of a column's place on its storey plan (columns as dots).

    Args:
        report: the report (docs/design.md §3); its member rows' ``storey``, ``x``, ``y``
            and its length unit are read.
        plans: the HTML plans' layers (:mod:`stanchion.service.plan_geometry`): slab outlines
            and grid lines with their tags are drawn under the dots, once per storey.
    """

    def __init__(self, report: dict[str, Any], plans: PlanData | None = None) -> None:
        self.unit = str(report.get("units", {}).get("length", ""))
        self.plans = plans
        self.points: dict[str, list[tuple[float, float]]] = {}
        for row in report.get("members", []):
            point = _position(row)
            if point is not None:
                self.points.setdefault(row.get("storey") or NO_STOREY, []).append(point)
        self._figures: dict[str, _StoreyFigure] = {}

    def __call__(self, row: dict[str, Any]) -> bytes | None:
        """The PNG of ``row``'s place on its storey; None when it has no plan position."""
        point = _position(row)
        if point is None:
            return None
        storey = row.get("storey") or NO_STOREY
        if storey not in self._figures:
            layers = self.plans.storeys.get(storey) if self.plans is not None else None
            self._figures[storey] = _StoreyFigure(storey, self.points[storey], self.unit,
                                                  layers)
        colour = MARK_COLOUR.get(str(row.get("status")), MARK_COLOUR["fail"])
        return self._figures[storey].draw(point, member_label(row), colour)
