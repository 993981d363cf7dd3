"""The HTML report's pictures as inline SVG (docs/design.md §3).

Plans, legend, capacity curve and histogram.
Plain SVG written here: every text and attribute value goes through ``markupsafe.escape``
(names come from models), numbers are written with two decimals at most, and nothing
refers to a file or address outside the page.  The functions return ``Markup`` for the
page template.  Colours come from :mod:`stanchion.service.reports.colour_scale`; the status
of a column is told by the shape of its mark as well: a circle passes, a triangle fails,
a diamond is not checked, a square is skipped (not steel).
"""

from __future__ import annotations

import math
from collections.abc import Iterable, Sequence
from dataclasses import astuple, dataclass

import numpy as np
from markupsafe import Markup, escape

from stanchion.engine.sections import Kind
from stanchion.service.reports.colour_scale import NO_VALUE, STOPS, TOP, colour_of
from stanchion.service.reports.plan_data import Point, StoreyPlan

#: Largest drawing of a plan, SVG user units (about CSS pixels at full width).
PLAN_WIDTH, PLAN_HEIGHT, PLAN_MARGIN = 960.0, 640.0, 44.0
#: Mark radius limits, user units; labels are written beside marks up to this many columns.
MARK_MIN, MARK_MAX, LABELS_UP_TO = 2.5, 11.0, 150
#: Status order in which marks are drawn: failures last, on top.
DRAW_ORDER = {"pass": 0, "skipped": 1, "not_checked": 2, "fail": 3}
STATUS_TEXT = {"pass": "passes", "fail": "fails", "not_checked": "not checked",
               "skipped": "skipped (not steel)"}
INK, GRID_INK, SLAB_FILL, SLAB_INK, CELL_INK = ("#1a1a1a", "#8a94a3", "#eef1f4", "#aab3bf",
                                                "#6f7f96")


def num(x: float) -> str:
    """A coordinate as short text: two decimals at most, no trailing zeros."""
    text = f"{x:.2f}".rstrip("0").rstrip(".")
    return "0" if text in ("-0", "") else text


def element(name: str, text: str | None = None, /, **attrs: object) -> str:
    """One SVG element; attribute names with ``_`` become ``-`` (a trailing ``_`` is dropped).

    Args:
        name: the tag.
        text: its text content (escaped), or None for an empty element.
        **attrs: the attributes (None values are left out; floats via :func:`num`).
    """
    parts = [name]
    for key, value in attrs.items():
        if value is None:
            continue
        shown = num(value) if isinstance(value, float) else str(value)
        parts.append(f'{key.rstrip("_").replace("_", "-")}="{escape(shown)}"')
    opening = " ".join(parts)
    if text is None:
        return f"<{opening}/>"
    return f"<{opening}>{escape(text)}</{name}>"


def _points(points: Iterable[tuple[float, float]]) -> str:
    return " ".join(f"{num(x)},{num(y)}" for x, y in points)


def mark_shape(status: str, cx: float, cy: float, r: float, fill: str) -> str:
    """The mark of a column: its shape tells the status, its fill the utilization.

    Args:
        status: ``pass``, ``fail``, ``not_checked`` or ``skipped``.
        cx: centre x, user units.
        cy: centre y, user units.
        r: size (the circle's radius; the other shapes are as large to the eye).
        fill: the fill colour.
    """
    if status == "fail":
        return element("polygon", points=_points(((cx, cy - 1.45 * r),
                                                  (cx + 1.3 * r, cy + 0.85 * r),
                                                  (cx - 1.3 * r, cy + 0.85 * r))),
                       fill=fill, stroke=INK, stroke_width=1.6, stroke_linejoin="round")
    if status == "not_checked":
        return element("polygon", points=_points(((cx, cy - 1.3 * r), (cx + 1.3 * r, cy),
                                                  (cx, cy + 1.3 * r), (cx - 1.3 * r, cy))),
                       fill=NO_VALUE, stroke=INK, stroke_width=1.2)
    if status == "skipped":
        return element("rect", x=cx - 0.9 * r, y=cy - 0.9 * r, width=1.8 * r, height=1.8 * r,
                       fill="#ffffff", stroke="#6b6b6b", stroke_width=1.2)
    return element("circle", cx=cx, cy=cy, r=r, fill=fill, stroke=INK, stroke_width=0.9)


def mark_fill(status: str, utilization: float | None) -> str:
    """The fill of a mark: the scale's colour for checked columns, grey otherwise."""
    if status in ("pass", "fail"):
        return colour_of(utilization)
    return NO_VALUE


# ---------------------------------------------------------------------------- plans


@dataclass(frozen=True)
class PlanMark:
    """One column on a storey plan.

    Attributes:
        anchor: the page anchor of its detail (without ``#``), or "" when it has none.
        member_id: the report row's ``id`` (written as ``data-member``).
        label: the short text beside the mark (tag or name).
        x: plan position x, report length unit.
        y: plan position y, report length unit.
        status: the row's status.
        utilization: the row's utilization (None when not checked or skipped).
        title: the tooltip (name, section, utilization or reason).
    """

    anchor: str
    member_id: str
    label: str
    x: float
    y: float
    status: str
    utilization: float | None
    title: str
    section: SectionShape | None = None
    rotation: float | None = None


@dataclass(frozen=True)
class SectionShape:
    """The outline of a column's section for a plan, report length unit.

    Attributes:
        kind: the :class:`stanchion.engine.sections.Kind` code.
        d: depth, along the section's y axis (across its x axis: an I's web direction).
        bf: width along x (flanges; the outside width of a tube).
        tw: web (or wall) thickness.
        tf: flange thickness.
    """

    kind: int
    d: float
    bf: float
    tw: float
    tf: float

    def rings(self) -> list[list[Point]]:
        """Closed rings in the section's axes, centred on its box (holes after the outer)."""
        b, d, tw, tf = self.bf / 2, self.d / 2, self.tw, self.tf
        if self.kind in (Kind.ROUND_HSS, Kind.SOLID_ROUND):
            circle = [(d * math.cos(a), d * math.sin(a))
                      for a in np.linspace(0, 2 * math.pi, 24, endpoint=False)]
            inner = [(x * (1 - 2 * tw / self.d), y * (1 - 2 * tw / self.d)) for x, y in circle]
            return [circle, inner] if self.kind == Kind.ROUND_HSS and tw < d else [circle]
        box = [(-b, -d), (b, -d), (b, d), (-b, d)]
        if self.kind == Kind.SOLID_RECT:
            return [box]
        if self.kind == Kind.RECT_HSS:
            return [box, [(-b + tw, -d + tw), (b - tw, -d + tw), (b - tw, d - tw),
                          (-b + tw, d - tw)]] if tw < min(b, d) else [box]
        if self.kind == Kind.CHANNEL:
            return [[(-b, -d), (b, -d), (b, -d + tf), (-b + tw, -d + tf), (-b + tw, d - tf),
                     (b, d - tf), (b, d), (-b, d)]]
        if self.kind == Kind.TEE:
            return [[(-b, d), (b, d), (b, d - tf), (tw / 2, d - tf), (tw / 2, -d),
                     (-tw / 2, -d), (-tw / 2, d - tf), (-b, d - tf)]]
        return [[(-b, -d), (b, -d), (b, -d + tf), (tw / 2, -d + tf), (tw / 2, d - tf),
                 (b, d - tf), (b, d), (-b, d), (-b, d - tf), (-tw / 2, d - tf),
                 (-tw / 2, -d + tf), (-b, -d + tf)]]


def section_path(shape: SectionShape, cx: float, cy: float, scale: float,
                 rotation: float) -> str:
    """The SVG path data of a section at (cx, cy), ``scale`` user units per length unit.

    Args:
        shape: the section.
        cx: centre x, user units.
        cy: centre y, user units.
        scale: user units per report length unit (exaggeration included).
        rotation: the section's x axis, degrees counter-clockwise from plan x.
    """
    c, s = math.cos(math.radians(rotation)), math.sin(math.radians(rotation))
    parts = []
    for ring in shape.rings():
        pts = [(cx + scale * (x * c - y * s), cy - scale * (x * s + y * c)) for x, y in ring]
        parts.append("M" + " L".join(f"{num(x)},{num(y)}" for x, y in pts) + " Z")
    return " ".join(parts)


def _layer_points(layers: StoreyPlan | None) -> list[Point]:
    if layers is None:
        return []
    pts: list[Point] = []
    for axis in layers.grid_axes:
        pts += [axis.start, axis.end]
    for slab in layers.slabs:
        pts += list(slab.outer)
    for cell in layers.tributary:
        pts += list(cell.outline)
    return pts


def nearest_spacing(xy: np.ndarray, block: int = 512) -> float | None:
    """A typical distance between neighbouring marks.

    The 10th percentile of each mark's nearest distinct neighbour; None with fewer than two
    distinct positions.

    Args:
        xy: (n, 2) positions.
        block: rows compared at once (memory stays n × block).
    """
    n = len(xy)
    if n < 2:
        return None
    nearest = np.full(n, np.inf)
    for start in range(0, n, block):
        d = np.hypot(xy[start:start + block, None, 0] - xy[None, :, 0],
                     xy[start:start + block, None, 1] - xy[None, :, 1])
        d[d <= 1e-9] = np.inf
        nearest[start:start + block] = d.min(axis=1)
    finite = nearest[np.isfinite(nearest)]
    return float(np.percentile(finite, 10)) if finite.size else None


class _Frame:
    """Plan coordinates to SVG user units (y up in plan, down in SVG)."""

    def __init__(self, points: Sequence[Point]) -> None:
        xs = [p[0] for p in points]
        ys = [p[1] for p in points]
        self.x0, self.y1 = min(xs), max(ys)
        ex, ey = max(xs) - self.x0, self.y1 - min(ys)
        room_x, room_y = PLAN_WIDTH - 2 * PLAN_MARGIN, PLAN_HEIGHT - 2 * PLAN_MARGIN
        scales = [room_x / ex] if ex > 0 else []
        scales += [room_y / ey] if ey > 0 else []
        self.s = min(scales) if scales else 1.0
        self.width = max(ex * self.s + 2 * PLAN_MARGIN, 240.0)
        self.height = max(ey * self.s + 2 * PLAN_MARGIN, 140.0)
        # centre a narrow plan in its minimum box
        self.dx = (self.width - ex * self.s) / 2
        self.dy = (self.height - ey * self.s) / 2

    def __call__(self, p: Point) -> tuple[float, float]:
        return (self.dx + (p[0] - self.x0) * self.s, self.dy + (self.y1 - p[1]) * self.s)


def _grid_layer(layers: StoreyPlan, frame: _Frame) -> list[str]:
    out = ['<g class="grid">']
    for axis in layers.grid_axes:
        (x1, y1), (x2, y2) = frame(axis.start), frame(axis.end)
        out.append(element("line", x1=x1, y1=y1, x2=x2, y2=y2, stroke=GRID_INK,
                           stroke_width=0.9, stroke_dasharray="8 4 2 4"))
        for bx, by in ((x1, y1), (x2, y2)):
            out.append(element("circle", cx=bx, cy=by, r=9.0, fill="#ffffff", stroke=GRID_INK,
                               stroke_width=0.9))
            out.append(element("text", axis.tag, x=bx, y=by + 3.5, font_size=10.0,
                               text_anchor="middle", fill="#3d4550"))
    out.append("</g>")
    return out


def _ring_path(rings: Iterable[Sequence[Point]], frame: _Frame) -> str:
    parts = []
    for ring in rings:
        pts = [frame(p) for p in ring]
        if len(pts) >= 3:
            parts.append("M" + " L".join(f"{num(x)},{num(y)}" for x, y in pts) + " Z")
    return " ".join(parts)


def _area_layers(layers: StoreyPlan, frame: _Frame) -> list[str]:
    out = []
    if layers.slabs:
        out.append('<g class="slabs">')
        for slab in layers.slabs:
            out.append(element("path", d=_ring_path((slab.outer, *slab.holes), frame),
                               fill=SLAB_FILL, fill_opacity=0.7, fill_rule="evenodd",
                               stroke=SLAB_INK, stroke_width=1.0))
        out.append("</g>")
    if layers.tributary:
        out.append('<g class="tributary">')
        for cell in layers.tributary:
            area = "" if cell.area is None else f" {cell.area:.4g}"
            out.append(element("path", d=_ring_path((cell.outline,), frame), fill="none",
                               stroke=CELL_INK, stroke_width=0.8, stroke_dasharray="3 3",
                               data_tributary=cell.member_id, data_area=area.strip() or None))
        out.append("</g>")
    return out


def _scale_bar(frame: _Frame, unit: str) -> list[str]:
    plan_width = (frame.width - 2 * PLAN_MARGIN) / frame.s
    length = nice_step(plan_width / 4)
    if not length > 0:
        return []
    x, y = 12.0, frame.height - 12.0
    w = length * frame.s
    return [element("line", x1=x, y1=y, x2=x + w, y2=y, stroke=INK, stroke_width=1.5),
            element("line", x1=x, y1=y - 4, x2=x, y2=y + 1, stroke=INK, stroke_width=1.5),
            element("line", x1=x + w, y1=y - 4, x2=x + w, y2=y + 1, stroke=INK,
                    stroke_width=1.5),
            element("text", f"{length:g} {unit}", x=x + w + 6, y=y + 3.5, font_size=10.0,
                    fill=INK)]


def _section_scale(marks: Sequence[PlanMark], s: float, r: float) -> float:
    """User units per length unit of the sections on one plan.

    The plan's scale, enlarged (one factor for the plan) so that the median section spans
    at least 3.2 mark radii.
    """
    sizes = [max(m.section.d, m.section.bf) for m in marks if m.section is not None
             and max(m.section.d, m.section.bf) > 0]
    if not sizes:
        return s
    return s * max(1.0, 3.2 * r / (float(np.median(sizes)) * s))


def storey_plan(marks: Sequence[PlanMark], layers: StoreyPlan | None, unit: str,
                caption: str = "") -> Markup:
    """One storey's plan.

    Slabs, tributary cells and grid lines when given, then a mark per column at its
    position, sized to the spacing of the columns.

    Args:
        marks: the storey's columns that have a plan position.
        layers: grid lines, slab outlines and tributary cells of the storey, or None.
        unit: the report's length unit (of every coordinate).
        caption: the picture's accessible name.
    """
    pts = [(m.x, m.y) for m in marks] + _layer_points(layers)
    if not pts:
        return Markup("")
    frame = _Frame(pts)
    canvas = np.array([frame((m.x, m.y)) for m in marks]).reshape(-1, 2)
    spacing = nearest_spacing(canvas)
    r = MARK_MAX if spacing is None else min(max(0.3 * spacing, MARK_MIN), MARK_MAX)
    out = [element("svg", None, viewBox=f"0 0 {num(frame.width)} {num(frame.height)}",
                   class_="plan", role="img", aria_label=caption or None,
                   data_marks=str(len(marks)))[:-2] + ">"]
    out.append(element("rect", x=0.0, y=0.0, width=frame.width, height=frame.height,
                       fill="#ffffff"))
    if layers is not None:
        out += _area_layers(layers, frame)
        if layers.grid_axes:
            out += _grid_layer(layers, frame)
    labels = len(marks) <= LABELS_UP_TO
    font = min(max(r * 1.05, 7.5), 11.0)
    k = _section_scale(marks, frame.s, r)
    glyph = max(MARK_MIN, 0.55 * r)
    order = sorted(range(len(marks)), key=lambda i: DRAW_ORDER.get(marks[i].status, 0))
    out.append('<g class="marks">')
    for i in order:
        m = marks[i]
        cx, cy = (float(v) for v in canvas[i])
        fill = mark_fill(m.status, m.utilization)
        body = [element("title", m.title)]
        if m.section is not None:
            turn = m.rotation if m.rotation is not None else 0.0
            if m.section.kind in (Kind.RECT_HSS, Kind.ROUND_HSS):
                # a tube's inside tinted, so that it is not read as the skipped glyph
                outer = SectionShape(Kind.SOLID_RECT if m.section.kind == Kind.RECT_HSS
                                     else Kind.SOLID_ROUND, *astuple(m.section)[1:])
                body.append(element("path", d=section_path(outer, cx, cy, k, turn),
                                    fill=fill, fill_opacity=0.35, stroke="none"))
            body.append(element("path", d=section_path(m.section, cx, cy, k, turn),
                                fill=fill, fill_rule="evenodd", stroke=INK,
                                stroke_width=0.7, stroke_linejoin="round", class_="section",
                                data_rotation=None if m.rotation is None
                                else f"{m.rotation:g}"))
            half = 0.5 * k * math.hypot(m.section.d, m.section.bf)
            cx, cy = cx + 0.75 * half + glyph, cy - 0.75 * half - glyph
            body.append(mark_shape(m.status, cx, cy, glyph, fill))
            r_label = glyph
        else:
            body.append(mark_shape(m.status, cx, cy, r, fill))
            r_label = r
        if labels:
            # beside the mark, on its left where the right side has no room for the text
            right = cx + 1.5 * r_label + 1 + 0.62 * font * len(m.label) < frame.width - 2
            body.append(element("text", m.label,
                                x=cx + (1.5 * r_label + 1) * (1 if right else -1),
                                y=cy - 1.2 * r_label, font_size=font, fill=INK,
                                text_anchor=None if right else "end"))
        util = None if m.utilization is None else f"{m.utilization:.4g}"
        group = (element("g", None, class_="mark", data_member=m.member_id,
                         data_status=m.status, data_utilization=util)[:-2] + ">"
                 + "".join(body) + "</g>")
        if m.anchor:
            group = element("a", None, href=f"#{m.anchor}")[:-2] + ">" + group + "</a>"
        out.append(group)
    out.append("</g>")
    out += _scale_bar(frame, unit)
    if k > frame.s * 1.05 and any(m.section is not None for m in marks):
        out.append(element("text", f"sections drawn {k / frame.s:.3g}× their size",
                           x=frame.width - 12, y=frame.height - 8.5, font_size=10.0,
                           text_anchor="end", fill=INK, class_="exaggeration"))
    out.append("</svg>")
    return Markup("".join(out))


def legend() -> Markup:
    """The legend of the plans: the colour scale with its ticks and the four mark shapes."""
    w, bar_x, bar_y, bar_w, bar_h = 760.0, 16.0, 24.0, 360.0, 16.0
    out = [element("svg", None, viewBox=f"0 0 {num(w)} 120", class_="legend", role="img",
                   aria_label="legend: utilization colour scale and mark shapes")[:-2] + ">"]
    out.append(element("text", "utilization (required / available strength)", x=bar_x,
                       y=15.0, font_size=12.0, fill=INK))
    steps = 64
    for k in range(steps):
        u0 = k / steps * TOP
        out.append(element("rect", x=bar_x + bar_w * k / steps, y=bar_y,
                           width=bar_w / steps + 0.6, height=bar_h,
                           fill=colour_of(u0 + TOP / (2 * steps)), data_scale=f"{u0:.4g}"))
    out.append(element("rect", x=bar_x, y=bar_y, width=bar_w, height=bar_h, fill="none",
                       stroke=INK, stroke_width=0.6))
    for t in (0.0, 0.25, 0.5, 0.75, 1.0):
        x = bar_x + bar_w * t
        out.append(element("line", x1=x, y1=bar_y + bar_h, x2=x, y2=bar_y + bar_h + 4,
                           stroke=INK, stroke_width=0.8))
        out.append(element("text", f"{t * TOP:g}" + (" and above" if t == 1.0 else ""), x=x,
                           y=bar_y + bar_h + 16, font_size=12.0, text_anchor="middle"
                           if t < 1.0 else "start", fill=INK))
    items = (("pass", 0.5, "passes (colour: utilization)"),
             ("fail", 1.0, "fails (over 1.0)"),
             ("not_checked", None, "not checked (see why)"),
             ("skipped", None, "skipped: not steel"))
    for k, (status, u, text) in enumerate(items):
        x, y = bar_x + k * 188.0, 82.0
        out.append(mark_shape(status, x + 7, y - 4, 6.5, mark_fill(status, u)))
        out.append(element("text", text, x=x + 19, y=y, font_size=12.0, fill=INK))
    icon = SectionShape(int(Kind.I_SHAPE), 10.0, 8.0, 1.4, 1.8)
    out.append(element("path", d=section_path(icon, bar_x + 7, 106.0, 1.1, 0.0),
                       fill=colour_of(0.5), stroke=INK, stroke_width=0.7))
    out.append(element("text", "a column's section, turned as modelled (shown larger where "
                       "the plan says so); the status glyph beside it", x=bar_x + 19,
                       y=110.0, font_size=12.0, fill=INK))
    out.append("</svg>")
    return Markup("".join(out))


# ---------------------------------------------------------------------------- charts


def nice_step(raw: float, integer: bool = False) -> float:
    """The round number (1, 2, 2.5 or 5 × 10ⁿ) nearest above ``raw``; 0 for ``raw`` ≤ 0.

    Args:
        raw: the step wanted.
        integer: only whole steps (counts): 1, 2, 5 × 10ⁿ, at least 1.
    """
    if not raw > 0 or not math.isfinite(raw):
        return 0.0
    if integer and raw < 1:
        return 1.0
    mag = 10.0 ** math.floor(math.log10(raw))
    for m in (1.0, 2.0, 5.0, 10.0) if integer else (1.0, 2.0, 2.5, 5.0, 10.0):
        if m * mag >= raw * (1 - 1e-9):
            return m * mag
    return 10.0 * mag  # pragma: no cover - the loop ends at 10


def ticks(hi: float, count: int = 5, integer: bool = False) -> list[float]:
    """Round tick values from 0 to at least ``hi``, about ``count`` of them.

    Args:
        hi: the largest value to show.
        count: about how many steps.
        integer: whole steps only (counts).
    """
    step = nice_step(hi / count, integer) or 1.0
    n = max(1, math.ceil(hi / step - 1e-9))
    return [round(i * step, 10) for i in range(n + 1)]


@dataclass(frozen=True)
class Axes:
    """A chart's plotting box in user units and the data ranges it shows."""

    left: float
    top: float
    width: float
    height: float
    x_max: float
    y_max: float

    def at(self, x: float, y: float) -> tuple[float, float]:
        """Data (x, y) to user units."""
        return (self.left + self.width * x / self.x_max,
                self.top + self.height * (1 - y / self.y_max))


def _axes_lines(ax: Axes, xt: Sequence[float], yt: Sequence[float], x_label: str,
                y_label: str) -> list[str]:
    out = []
    bottom = ax.top + ax.height
    for v in yt:
        _, y = ax.at(0.0, v)
        out.append(element("line", x1=ax.left, y1=y, x2=ax.left + ax.width, y2=y,
                           stroke="#e3e6ea", stroke_width=0.8))
        out.append(element("text", f"{v:g}", x=ax.left - 5, y=y + 3.5, font_size=10.0,
                           text_anchor="end", fill=INK))
    for v in xt:
        x, _ = ax.at(v, 0.0)
        out.append(element("line", x1=x, y1=bottom, x2=x, y2=bottom + 4, stroke=INK,
                           stroke_width=0.8))
        out.append(element("text", f"{v:g}", x=x, y=bottom + 15, font_size=10.0,
                           text_anchor="middle", fill=INK))
    out.append(element("polyline", points=_points(((ax.left, ax.top), (ax.left, bottom),
                                                   (ax.left + ax.width, bottom))),
                       fill="none", stroke=INK, stroke_width=1.0))
    out.append(element("text", x_label, x=ax.left + ax.width / 2, y=bottom + 31,
                       font_size=11.0, text_anchor="middle", fill=INK))
    out.append(element("text", y_label, x=12.0, y=ax.top - 10, font_size=11.0, fill=INK))
    return out


def capacity_chart(lc: Sequence[float], strength: Sequence[float], point: tuple[float, float],
                   required: float | None, x_label: str, y_label: str,
                   point_status: str = "pass") -> Markup:
    """The capacity curve of one column with its own point and its required strength.

    Args:
        lc: effective lengths of the curve, report length unit (the member's own included).
        strength: the available strength at each, report force unit (NaN: not drawn).
        point: the member's (Lc, available strength).
        required: the member's required strength (a dashed line), or None.
        x_label: the horizontal axis' label (with its unit).
        y_label: the vertical axis' label (with its unit).
        point_status: the member's status (the point's shape).
    """
    pairs = [(x, y) for x, y in zip(lc, strength, strict=True) if math.isfinite(y)]
    if not pairs:
        return Markup("")
    top = max([y for _, y in pairs] + [required or 0.0, point[1]])
    xt, yt = ticks(max(x for x, _ in pairs)), ticks(top * 1.05)
    ax = Axes(58.0, 26.0, 380.0, 190.0, xt[-1], yt[-1])
    out = [element("svg", None, viewBox="0 0 460 262", class_="curve", role="img",
                   aria_label="capacity curve")[:-2] + ">"]
    out += _axes_lines(ax, xt, yt, x_label, y_label)
    curve = [ax.at(x, y) for x, y in pairs]
    out.append(element("polyline", points=_points(curve), fill="none", stroke="#2c728e",
                       stroke_width=2.0, class_="capacity"))
    if required is not None and math.isfinite(required) and required > 0:
        _, y = ax.at(0.0, required)
        out.append(element("line", x1=ax.left, y1=y, x2=ax.left + ax.width, y2=y,
                           stroke="#7a1f3d", stroke_width=1.2, stroke_dasharray="6 4",
                           class_="required"))
        out.append(element("text", f"required {required:.4g}", x=ax.left + ax.width - 2,
                           y=y - 5, font_size=10.0, text_anchor="end", fill="#7a1f3d"))
    px, py = ax.at(*point)
    out.append(element("g", None, class_="member-point", data_x=num(px), data_y=num(py))[:-2]
               + ">" + mark_shape(point_status, px, py, 5.0, "#ffffff") + "</g>")
    out.append("</svg>")
    return Markup("".join(out))


#: Histogram bins: 0-0.1, ..., 0.9-1.0 and "over 1.0".
BIN_EDGES = tuple(round(0.1 * k, 1) for k in range(11))


def histogram(utilizations: Sequence[float]) -> Markup:
    """Counts of checked columns per utilization band, bars in the scale's colours.

    Args:
        utilizations: the utilizations of the checked (pass or fail) columns.
    """
    values = np.asarray([u for u in utilizations if math.isfinite(u)], dtype=float)
    inner = np.histogram(np.clip(values[values <= 1.0], 0.0, 1.0), bins=BIN_EDGES)[0]
    counts = [*inner.tolist(), int((values > 1.0).sum())]
    labels = [f"{a:g}–{b:g}" for a, b in zip(BIN_EDGES[:-1], BIN_EDGES[1:], strict=True)]
    labels.append("over 1")
    yt = ticks(max(max(counts), 1), integer=True)
    ax = Axes(44.0, 24.0, 620.0, 170.0, float(len(counts)), yt[-1])
    out = [element("svg", None, viewBox="0 0 690 250", class_="histogram", role="img",
                   aria_label="utilization histogram")[:-2] + ">"]
    out += _axes_lines(ax, [], yt, "utilization", "columns")
    for k, (n, label) in enumerate(zip(counts, labels, strict=True)):
        x0, y0 = ax.at(k + 0.1, n)
        x1, _ = ax.at(k + 0.9, 0.0)
        centre = TOP * 1.0 if k == len(counts) - 1 else (k + 0.5) / 10
        status = "fail" if k == len(counts) - 1 else "pass"
        out.append(element("rect", x=x0, y=y0, width=x1 - x0, height=ax.top + ax.height - y0,
                           fill=colour_of(centre), stroke=INK, stroke_width=0.6,
                           data_bin=label, data_count=str(n), class_=f"bar {status}"))
        if n:
            out.append(element("text", str(n), x=(x0 + x1) / 2, y=y0 - 4, font_size=10.0,
                               text_anchor="middle", fill=INK))
        out.append(element("text", label, x=(x0 + x1) / 2, y=ax.top + ax.height + 15,
                           font_size=10.0, text_anchor="middle", fill=INK))
    out.append("</svg>")
    return Markup("".join(out))


def swatch(status: str, utilization: float | None) -> Markup:
    """A small mark (shape and colour) for a table cell."""
    return Markup(element("svg", None, viewBox="0 0 16 16", class_="swatch",
                          aria_hidden="true")[:-2] + ">"
                  + mark_shape(status, 8.0, 8.5, 4.6, mark_fill(status, utilization))
                  + "</svg>")


__all__ = ["STOPS", "PlanMark", "capacity_chart", "histogram", "legend", "storey_plan",
           "swatch"]
