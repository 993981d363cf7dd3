"""The HTML report (docs/design.md §3): one self-contained page, readable offline, printable.

:func:`render_html` turns a report (the one source of every writer) into the page, with the
checked member table and the engine's results when the front end has them (the pipeline
always does): they give each column's inputs in internal units and the intermediates the
report does not carry (Ag, Fe of each limit state, every combination's value, the capacity
curve).  :func:`write_html` writes it atomically.

The page holds the summary and design basis with the cautions, the worst columns, a
utilization histogram, a plan per storey (columns at their positions, coloured by
utilization and shaped by status; grid lines, slab outlines and tributary areas when a
:class:`~stanchion.service.reports.plan_data.PlanData` gives them), the column schedule
(grid locations, or tags or names, down; storeys across) and a detail per column, worst
first.  Pictures are inline SVG (:mod:`stanchion.service.reports.pictures`); the page uses
no script and refers to nothing outside itself; text from models is escaped by jinja2's
autoescape.
"""

from __future__ import annotations

import math
import re
from functools import cache
from pathlib import Path
from typing import Any

import numpy as np
from jinja2 import Environment, PackageLoader
from markupsafe import Markup

from stanchion.engine.check import CheckResults
from stanchion.engine.compression import LIMIT_STATE_NAMES, OMEGA_C, PHI_C
from stanchion.engine.curves import buckling_stresses, capacity_curve, length_ratios
from stanchion.engine.members import E_DEFAULT, G_DEFAULT, LOAD_TYPES, MemberTable
from stanchion.engine.sections import Kind
from stanchion.engine.units import force_factor, length_factor, stress_factor
from stanchion.service.reports import pictures
from stanchion.service.reports.colour_scale import colour_of
from stanchion.service.reports.files import write_atomic
from stanchion.service.reports.plan_data import PlanData

#: Columns given a detail (the worst first); the schedule lists every column.
DETAIL_LIMIT = 250
#: Rows of the "worst columns" table.
WORST = 10
#: Curve samples: the member's own effective lengths times these factors (1 included).
CURVE_FACTORS = np.unique(np.r_[np.linspace(0.0, 2.0, 49), 1.0])
NO_STOREY = "(no storey)"
STATUS_RANK = {"fail": 0, "not_checked": 1, "pass": 2, "skipped": 3}
STATUS_TEXT = {"pass": "pass", "fail": "FAIL", "not_checked": "not checked",
               "skipped": "skipped (not steel)"}
#: What the check covers and what it leaves to the engineer (shown beside the disclaimer).
CHECKED = (
    "the available axial compressive strength of each column by AISC 360-22 Chapter E: "
    "flexural buckling about both axes, torsional and flexural-torsional buckling, members "
    "with slender elements (E7)",
    "the required strength from the given loads by the ASCE 7-22 load combinations (or the "
    "combinations or required strength the input gives)",
)
NOT_CHECKED = (
    "bending and combined axial force and bending (Chapter H), tension, shear",
    "the effective length factors and unbraced lengths themselves: they are taken as given "
    "or defaulted as each column's notes say; frame stability (Chapter C) is not analysed",
    "single and double angles (E5), built-up members (E6), connections, splices and base "
    "plates",
    "the loads themselves: the check is only as good as the model's profiles, grades, "
    "lengths and loads",
)


def fmt(x: object, digits: int = 4) -> str:
    """A number for the page: ``digits`` significant digits, ``–`` for none."""
    if x is None or isinstance(x, str):
        return "–" if x in (None, "") else str(x)
    if isinstance(x, int | float) and math.isfinite(float(x)):
        return f"{float(x):.{digits}g}"
    return "–"


@cache
def _environment() -> Environment:
    env = Environment(loader=PackageLoader("stanchion.service.reports", "templates"),
                      autoescape=True, trim_blocks=True,
                      lstrip_blocks=True)
    env.filters["fmt"] = fmt
    env.globals["swatch"] = pictures.swatch
    return env


def _natural(text: str) -> list[Any]:
    """Sort key: digits compare as numbers (A-2 before A-10)."""
    return [int(part) if part.isdigit() else part.lower() for part in re.split(r"(\d+)", text)]


def _label(row: dict[str, Any]) -> str:
    return str(row.get("tag") or row.get("name") or row.get("id") or "")


def _finite(x: object) -> bool:
    return isinstance(x, int | float) and math.isfinite(float(x))


class _Units:
    """Internal units (kip, in, ksi) to the report's."""

    def __init__(self, units: dict[str, str]) -> None:
        self.force, self.length, self.stress = units["force"], units["length"], units["stress"]
        self.to_force = 1.0 / force_factor(self.force)
        self.to_length = 1.0 / length_factor(self.length)
        self.to_stress = 1.0 / stress_factor(self.stress)
        small = "in" if self.length in ("ft", "in") else "mm"
        self.area = f"{small}²"
        self.to_area = (1.0 / length_factor(small)) ** 2


def _order(rows: list[dict[str, Any]]) -> list[int]:
    """Row indices, worst first: failing, not checked, passing, skipped; by utilization."""
    def key(i: int) -> tuple[int, float, int]:
        u = rows[i].get("utilization")
        return (STATUS_RANK.get(rows[i]["status"], 4), -u if isinstance(u, int | float) and
                math.isfinite(u) else 1.0, i)

    return sorted(range(len(rows)), key=key)


# ---------------------------------------------------------------------------- detail


def _inputs(i: int, row: dict[str, Any], m: MemberTable, u: _Units
            ) -> list[tuple[str, str, str]]:
    """(quantity, value, source) rows of one member's inputs, in the report's units."""
    src = {k: str(row[k]) if row.get(k) else None
           for k in ("profile_source", "fy_source", "length_source", "load_source")}
    given = "as given"
    out = [("section", str(row.get("section") or "–"), src["profile_source"] or given),
           ("Fy", f"{fmt(m.Fy[i] * u.to_stress)} {u.stress}", src["fy_source"] or given),
           ("E, G", f"{fmt(m.E[i] * u.to_stress, 6)}, {fmt(m.G[i] * u.to_stress, 6)} "
            f"{u.stress}",
            "default for steel" if (m.E[i], m.G[i]) == (E_DEFAULT, G_DEFAULT)
            else "request" if m.material is None else "model")]
    for axis, length, k in (("x", m.lx, m.kx), ("y", m.ly, m.ky), ("z", m.lz, m.kz)):
        lc = k[i] * length[i]
        out.append((f"L{axis}, K{axis} → Lc{axis}",
                    f"{fmt(length[i] * u.to_length)} {u.length}, {fmt(k[i])} → "
                    f"{fmt(lc * u.to_length)} {u.length}", src["length_source"] or given))
    if math.isfinite(m.required_strength[i]):
        out.append(("required strength", f"{fmt(m.required_strength[i] * u.to_force)} "
                    f"{u.force}", "as given (factored)"))
    for j, name in enumerate(LOAD_TYPES):
        value = m.loads[i, j]
        if math.isfinite(value):
            out.append((f"load {name}", f"{fmt(value * u.to_force)} {u.force}",
                        src["load_source"] or given))
    if _finite(row.get("tributary_area")):  # loads from the takedown (docs/design.md §5)
        out.append(("tributary area", f"{fmt(row['tributary_area'])} {u.length}²",
                    "load takedown"))
        out.append(("live load factor L/Lo", fmt(row.get("llr_factor")),
                    "load takedown (ASCE 7-22 §4.7)"))
    return out


def _intermediates(i: int, m: MemberTable, r: CheckResults, Fe: np.ndarray | None,
                   u: _Units) -> list[tuple[str, str]]:
    """(quantity, value) rows: Ag, Ae, Fe per limit state, Fcr, Pn and the available one."""
    out: list[tuple[str, str]] = []
    idx = int(m.section_index[i])
    if idx >= 0:
        out.append(("Ag", f"{fmt(m.sections.A[idx] * u.to_area)} {u.area}"))
    if math.isfinite(r.Ae[i]):
        out.append(("Ae", f"{fmt(r.Ae[i] * u.to_area)} {u.area}"))
    if Fe is not None:
        for name, value in zip(LIMIT_STATE_NAMES, Fe, strict=True):
            if math.isfinite(value):
                out.append((f"Fe, {name}", f"{fmt(value * u.to_stress)} {u.stress}"))
    if math.isfinite(r.Fcr[i]):
        out.append(("Fcr", f"{fmt(r.Fcr[i] * u.to_stress)} {u.stress}"))
        out.append(("Pn = Fcr·Ae", f"{fmt(r.Fcr[i] * r.Ae[i] * u.to_force)} {u.force}"))
    if math.isfinite(r.available_strength[i]):
        label = f"φcPn (φc = {PHI_C})" if r.method == "LRFD" else f"Pn/Ωc (Ωc = {OMEGA_C})"
        out.append((label, f"{fmt(r.available_strength[i] * u.to_force)} {u.force}"))
    return out


def _combinations(i: int, r: CheckResults, governing: str, u: _Units
                  ) -> list[tuple[str, str, bool]]:
    """(name, value, governs) of every combination, compression positive."""
    if r.combination_values is None or not r.combination_names:
        return []
    values = r.combination_values[i]
    if not np.isfinite(values).any():
        return []
    return [(name, f"{fmt(v * u.to_force)}", name == governing)
            for name, v in zip(r.combination_names, values.tolist(), strict=True)]


class _Curves:
    """Capacity curves of the detailed members, one engine call for all of them."""

    def __init__(self, chosen: list[int], m: MemberTable, r: CheckResults, u: _Units) -> None:
        Lcx, Lcy, Lcz = m.kx * m.lx, m.ky * m.ly, m.kz * m.lz
        ok = [i for i in chosen if m.section_index[i] >= 0 and math.isfinite(
            r.available_strength[i]) and math.isfinite(m.Fy[i])
            and all(math.isfinite(a[i]) and a[i] > 0 for a in (Lcx, Lcy, Lcz))]
        self.index = {i: k for k, i in enumerate(ok)}
        self.u = u
        if not ok:
            self.values = np.empty((len(CURVE_FACTORS), 0))
            self.Fe = np.empty((0, 4))
            self.Lc = np.empty(0)
            return
        rows = np.asarray(ok)
        own = np.stack([Lcx[rows], Lcy[rows], Lcz[rows]], axis=1)
        # Lc values are the factors, the "ratios" each member's own lengths: Lc·ratios is then
        # the factor times the member's lengths, and factor 1 is the member itself.
        self.values = capacity_curve(m.sections, m.section_index[rows], m.Fy[rows],
                                     m.E[rows], m.G[rows], CURVE_FACTORS, r.method, own)
        self.Lc = length_ratios(own[:, 0], own[:, 1], own[:, 2])[0]
        self.Fe = buckling_stresses(m.sections, m.section_index[rows], own[:, 0], own[:, 1],
                                    own[:, 2], m.E[rows], m.G[rows])

    def fe(self, i: int) -> np.ndarray | None:
        k = self.index.get(i)
        return None if k is None else self.Fe[k]

    def chart(self, i: int, row: dict[str, Any], r: CheckResults) -> Markup:
        k = self.index.get(i)
        if k is None:
            return Markup("")
        u = self.u
        lc = (CURVE_FACTORS * self.Lc[k] * u.to_length).tolist()
        strength = (self.values[:, k] * u.to_force).tolist()
        point = (float(self.Lc[k] * u.to_length), float(r.available_strength[i] * u.to_force))
        required = r.required_strength[i] * u.to_force
        symbol = "φcPn" if r.method == "LRFD" else "Pn/Ωc"
        return pictures.capacity_chart(
            lc, strength, point, float(required) if math.isfinite(required) else None,
            f"Lc, the largest of Lcx, Lcy, Lcz (the others in proportion) [{u.length}]",
            f"{symbol} [{u.force}]", row["status"])

    def curve_points(self, i: int) -> tuple[list[float], list[float]] | None:
        """The curve of member ``i`` in report units (Lc, strength), or None."""
        k = self.index.get(i)
        if k is None:
            return None
        return ((CURVE_FACTORS * self.Lc[k] * self.u.to_length).tolist(),
                (self.values[:, k] * self.u.to_force).tolist())


def _details(rows: list[dict[str, Any]], order: list[int], members: MemberTable | None,
             results: CheckResults | None, u: _Units) -> tuple[list[dict[str, Any]],
                                                                _Curves | None]:
    chosen = order[:DETAIL_LIMIT]
    curves = (_Curves(chosen, members, results, u)
              if members is not None and results is not None else None)
    out = []
    for i in chosen:
        row = rows[i]
        d: dict[str, Any] = {"row": row, "anchor": f"m{i}", "inputs": [], "intermediates": [],
                             "combinations": [], "chart": Markup(""),
                             "status_text": STATUS_TEXT.get(row["status"], row["status"])}
        if members is not None and results is not None and curves is not None:
            d["inputs"] = _inputs(i, row, members, u)
            d["intermediates"] = _intermediates(i, members, results, curves.fe(i), u)
            d["combinations"] = _combinations(i, results, str(row.get("combination") or ""),
                                              u)
            d["chart"] = curves.chart(i, row, results)
        out.append(d)
    return out, curves


# ---------------------------------------------------------------------------- plans, schedule


def _storeys(rows: list[dict[str, Any]]) -> list[str]:
    seen: dict[str, None] = {}
    for row in rows:
        seen.setdefault(row.get("storey") or NO_STOREY, None)
    return list(seen)


def _shape(i: int, members: MemberTable | None, to_length: float
           ) -> pictures.SectionShape | None:
    """Member ``i``'s section outline in the report's length unit (None: no section row)."""
    if members is None or i >= len(members) or members.section_index[i] < 0:
        return None
    t, k = members.sections, int(members.section_index[i])
    dims = [float(t.d[k]), float(t.bf[k]), float(t.tw[k]), float(t.tf[k])]
    if int(t.kind[k]) == Kind.UNSUPPORTED or not all(math.isfinite(v) for v in dims) \
            or not min(dims[:2]) > 0:
        return None
    d, bf, tw, tf = (v * to_length for v in dims)
    return pictures.SectionShape(int(t.kind[k]), d, bf, tw, tf)


def _plans(rows: list[dict[str, Any]], anchors: set[int], plans: PlanData | None,
           unit: str, members: MemberTable | None = None, to_length: float = 1.0
           ) -> list[dict[str, Any]]:
    if not any(_finite(r.get("x")) and _finite(r.get("y")) for r in rows):
        return []
    out = []
    for storey in _storeys(rows):
        marks, missing = [], []
        for i, row in enumerate(rows):
            if (row.get("storey") or NO_STOREY) != storey:
                continue
            if not (_finite(row.get("x")) and _finite(row.get("y"))):
                missing.append(_label(row))
                continue
            util = row.get("utilization")
            state = (f"utilization {util:.3f}" if _finite(util)
                     else str(row.get("reason") or STATUS_TEXT.get(row["status"], "")))
            marks.append(pictures.PlanMark(
                anchor=f"m{i}" if i in anchors else "", member_id=str(row["id"]),
                label=_label(row), x=float(row["x"]), y=float(row["y"]),
                status=row["status"], utilization=util if _finite(util) else None,
                title=f"{row.get('name') or row['id']} · {row.get('section') or '–'} · "
                      f"{STATUS_TEXT.get(row['status'], row['status'])} · {state}",
                section=_shape(i, members, to_length),
                rotation=float(row["rotation"]) if _finite(row.get("rotation")) else None))
        layers = plans.storeys.get(storey) if plans is not None else None
        out.append({"storey": storey, "count": len(marks), "missing": missing,
                    "svg": pictures.storey_plan(marks, layers, unit, f"plan of {storey}"),
                    "layers": [name for name, present in (
                        ("grid lines", layers is not None and bool(layers.grid_axes)),
                        ("slab outlines", layers is not None and bool(layers.slabs)),
                        ("tributary areas", layers is not None and bool(layers.tributary)))
                        if present]})
    return out


def _schedule(rows: list[dict[str, Any]], anchors: set[int]) -> dict[str, Any]:
    """Grid locations (else tags or names) down, storeys across; cells list their columns."""
    storeys = _storeys(rows)
    by_grid = any(r.get("grid") for r in rows)
    cells: dict[str, dict[str, list[dict[str, Any]]]] = {}
    for i, row in enumerate(rows):
        key = str(row.get("grid") or _label(row)) if by_grid else _label(row)
        cell = cells.setdefault(key, {}).setdefault(row.get("storey") or NO_STOREY, [])
        util = row.get("utilization")
        cell.append({"anchor": f"m{i}" if i in anchors else "", "row": row,
                     "utilization": util if _finite(util) else None,
                     "colour": colour_of(util if _finite(util) else None)})
    keys = sorted(cells, key=_natural)
    return {"storeys": storeys, "by_grid": by_grid,
            "rows": [{"key": k, "cells": [cells[k].get(s, []) for s in storeys]} for k in keys]}


# ---------------------------------------------------------------------------- page


def page_context(report: dict[str, Any], members: MemberTable | None = None,
                 results: CheckResults | None = None, plans: PlanData | None = None
                 ) -> dict[str, Any]:
    """Everything the template shows (report units throughout).

    Args:
        report: the report (docs/design.md §3).
        members: the checked member table (internal units), aligned with the report rows.
        results: the engine's results for ``members``; with ``detail`` kept, the page lists
            every combination's value.
        plans: grid lines, slab outlines and tributary areas per storey, or None.
    """
    import stanchion

    rows: list[dict[str, Any]] = report.get("members", [])
    u = _Units(report["units"])
    order = _order(rows)
    details, curves = _details(rows, order, members, results, u)
    anchors = {int(d["anchor"][1:]) for d in details}
    checked = [r["utilization"] for r in rows
               if r["status"] in ("pass", "fail") and _finite(r.get("utilization"))]
    worst = [{"row": rows[i], "anchor": f"m{i}" if i in anchors else ""}
             for i in order if rows[i]["status"] in ("pass", "fail")][:WORST]
    not_checked = [{"row": rows[i], "anchor": f"m{i}" if i in anchors else ""}
                   for i in order if rows[i]["status"] == "not_checked"]
    return {
        "report": report, "summary": report["summary"], "units": report["units"],
        "source": report.get("source") or {}, "version": stanchion.__version__,
        "checked_items": CHECKED, "not_checked_items": NOT_CHECKED,
        "worst": worst, "not_checked": not_checked,
        "histogram": pictures.histogram(checked), "legend": pictures.legend(),
        "plans": _plans(rows, anchors, plans, u.length, members, u.to_length),
        "schedule": _schedule(rows, anchors),
        "details": details, "detail_limit": DETAIL_LIMIT,
        "more": max(0, len(rows) - len(details)),
        "changes": report.get("changes"),
        "curves": curves,
    }


def render_html(report: dict[str, Any], members: MemberTable | None = None,
                results: CheckResults | None = None, plans: PlanData | None = None) -> str:
    """The HTML page of a report (see :func:`page_context` for the arguments)."""
    context = page_context(report, members, results, plans)
    context.pop("curves")
    return _environment().get_template("report.html").render(**context)


def write_html(path: Path, report: dict[str, Any], members: MemberTable | None = None,
               results: CheckResults | None = None, plans: PlanData | None = None) -> None:
    """Write :func:`render_html`'s page to ``path`` as UTF-8, atomically.

    Args:
        path: the file.
        report: the report.
        members: the checked member table, or None.
        results: its results (with every combination's value when kept), or None.
        plans: plan layers per storey, or None.
    """
    text = render_html(report, members, results, plans)

    def _w(tmp: Path) -> None:
        tmp.write_text(text, encoding="utf-8")

    write_atomic(Path(path), _w)
