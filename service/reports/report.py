"""The JSON report (docs/design.md §3): results table -> plain dict, in the request's units."""

from __future__ import annotations

import json
import math
from collections import Counter
from functools import cache
from importlib import resources

import numpy as np

from stanchion.engine.check import NOT_CHECKED, SKIPPED, CheckResults
from stanchion.engine.masks import all_set
from stanchion.engine.members import MemberTable
from stanchion.engine.units import factor, force_factor, length_factor, stress_factor

SCHEMA_VERSION = "1"
DISCLAIMER = (
    "Axial compression only (AISC 360-22 Chapter E); an aid to, not a substitute for, the "
    "review of a licensed engineer. The locally adopted code edition and the engineer of "
    "record govern; the check is only as good as the profiles, grades, lengths and loads given."
)


def design_basis(method: str, custom_combinations: bool = False) -> str:
    """The one-line design basis carried by every report and checked model."""
    combos = "custom load combinations" if custom_combinations else "ASCE 7-22 combinations"
    return f"AISC 360-22 Chapter E, {method}; {combos}"


def _sig_columns(columns: list[np.ndarray], digits: list[int]) -> list[list[float | None]]:
    """Round each column to its significant digits (one array pass); NaN / inf -> None."""
    a = np.array(columns, dtype=float).reshape(len(columns), -1)
    d = np.asarray(digits, dtype=float)[:, None]
    finite = np.isfinite(a)
    every_finite = all_set(finite)
    nz = (a != 0) if every_finite else finite & (a != 0)
    every_nz = all_set(nz)
    safe = a if every_nz else np.where(nz, a, 1.0)
    with np.errstate(over="ignore"):
        exp10 = d - 1.0 - np.floor(np.log10(np.abs(safe)))
        p = 10.0 ** np.abs(exp10)
        # multiply by an exact power of ten, or divide by one: each step exact
        up = exp10 >= 0
        if all_set(up):
            r = np.round(safe * p) / p
        else:
            r = np.where(up, np.round(safe * p) / p, np.round(safe / p) * p)
        # 10**k is exact only up to k = 22: beyond, round through the decimal text (rare)
        far = (np.abs(exp10) > 22) & nz
        if far.any():
            for i, j in zip(*far.nonzero(), strict=True):
                r[i, j] = float(f"{a[i, j]:.{int(d[i, 0])}g}")
    rows = (r if every_nz else np.where(nz, r, 0.0)).tolist()
    if every_finite:
        return rows
    out = []
    for row, ok, all_ok in zip(rows, finite.tolist(), finite.all(axis=1).tolist(), strict=True):
        out.append(row if all_ok else [x if f else None for x, f in zip(row, ok, strict=True)])
    return out


def _sig(x: float, digits: int = 6) -> float | None:
    """One value rounded as :func:`_sig_columns` rounds the report's columns; NaN / inf -> None.

    The same rounding everywhere: ``summary.max_utilization`` is the largest row's
    ``utilization`` as written (``round`` gave 0.7047 for 0.70475 where the rows say 0.7048).
    """
    if x is None or not math.isfinite(x):
        return None
    return _sig_columns([np.array([x])], [digits])[0][0]


def build_report(
    members: MemberTable,
    results: CheckResults,
    units: dict[str, str],
    *,
    detail: bool = False,
    custom_combinations: bool = False,
    messages: list[str] | None = None,
    suggestions: dict[int, list[dict]] | None = None,
) -> dict:
    """Assemble the report dict: summary, one entry per member, in ``units``.

    ``suggestions`` (by member row, kip and lb/ft) become each row's ``suggestions`` with
    strengths in the report's force unit and ``weight`` in its force per length unit.
    """
    to_force = 1.0 / force_factor(units["force"])
    to_stress = 1.0 / stress_factor(units["stress"])
    req = results.required_strength * to_force
    avail = results.available_strength * to_force
    tension = (results.max_tension if results.max_tension is not None
               else np.zeros(len(results))) * to_force
    storey = members.extra.get("storey")
    grid = members.extra.get("grid")  # IFC inputs only: members files have none
    # lb/ft -> report force per report length (e.g. kip/ft, kN/m).
    weight_factor = (factor("lbf", "kip") * to_force) / (length_factor("ft") / length_factor(
        units["length"]))

    req_l, avail_l, util_l, slender_l, fcr_l = _sig_columns(
        [req, avail, results.utilization, results.slenderness, results.Fcr * to_stress],
        [6, 6, 4, 4, 6])
    force_unit = units["force"]
    tension_at = (tension > 0).nonzero()[0].tolist()
    storey_l = list(storey) if storey is not None else None
    # Text columns as Python strings in C-level passes (map(str, ...)), then one dict per row.
    # (The engine's own columns -- status, limit state, combination -- are strings already.)
    ids, names, sections = (list(map(str, c.tolist()))
                            for c in (members.id, members.name, members.section_label))
    statuses, limit_states, combinations = (
        c.tolist() for c in (results.status, results.limit_state, results.combination))
    rows = [
        {"id": i_, "name": n_, "section": s_, "status": st,
         "required_strength": rq, "available_strength": av, "utilization": ut,
         "limit_state": ls, "combination": cb, "slenderness": sl,
         "critical_stress": fc, "messages": ms}
        for i_, n_, s_, st, rq, av, ut, ls, cb, sl, fc, ms in zip(
            ids, names, sections, statuses, req_l, avail_l, util_l, limit_states,
            combinations, slender_l, fcr_l, results.messages, strict=True)
    ]
    # The message lists are the results' own: a row that gains a message gets a new list.
    for i in tension_at:
        rows[i]["messages"] = [
            *rows[i]["messages"],
            f"a load combination gives net tension of {_sig(float(tension[i]), 4)} "
            f"{force_unit}; tension is not checked here"]
    if storey_l is not None:
        for row, storey_i in zip(rows, storey_l, strict=True):
            row["storey"] = None if storey_i is None else str(storey_i)
    if grid is not None:
        for row, grid_i in zip(rows, grid.tolist(), strict=True):
            row["grid"] = None if grid_i is None else str(grid_i)
    for i in (i for i, st in enumerate(statuses) if st in (NOT_CHECKED, SKIPPED)):
        rows[i]["reason"] = str(results.reason[i])
    for i, found in (suggestions or {}).items():
        rows[i]["suggestions"] = [
            {"section": s["section"],
             "available_strength": _sig(s["available_strength"] * to_force),
             "utilization": _sig(s["utilization"], 4),
             "weight": _sig(s["weight"] * weight_factor)}
            for s in found
        ]
    if detail and results.combination_values is not None:
        combos = results.combination_values * to_force
        # A member given its required strength has no load combinations: null, not 0.
        given = ~np.isnan(members.required_strength)
        if given.any():
            combos = np.where(given[:, None], np.nan, combos)
        values = _sig_columns(list(combos.T), [6] * len(results.combination_names))
        for j, name in enumerate(results.combination_names):
            for i, v in enumerate(values[j]):
                rows[i].setdefault("combinations", {})[name] = v

    status = results.status
    util = results.utilization[(status != NOT_CHECKED) & (status != SKIPPED)]
    util = util[np.isfinite(util)]
    return {
        "schema_version": SCHEMA_VERSION,
        "design_basis": design_basis(results.method, custom_combinations),
        "disclaimer": DISCLAIMER,
        "units": dict(units),
        "summary": {
            "members": len(results),
            "pass": statuses.count("pass"),
            "fail": statuses.count("fail"),
            "not_checked": statuses.count(NOT_CHECKED),
            "skipped": statuses.count(SKIPPED),
            "max_utilization": _sig(float(util.max()), 4) if util.size else None,
        },
        "messages": list(messages or []),
        "members": rows,
    }


@cache
def report_schema() -> dict:
    """The JSON Schema of the report, shipped with the package."""
    text = resources.files("stanchion.service").joinpath("schemas/report.schema.json").read_text()
    return json.loads(text)


def format_summary(report: dict, worst: int = 5) -> str:
    """A short terminal summary: counts and the highest utilizations."""
    s = report["summary"]
    lines = [
        f"{report['design_basis']}",
        f"members {s['members']}: {s['pass']} pass, {s['fail']} fail, "
        f"{s['not_checked']} not checked"
        + (f", {s['skipped']} skipped (not steel)" if s.get("skipped") else ""),
    ]
    ranked = sorted(
        (m for m in report["members"] if m["utilization"] is not None),
        key=lambda m: -m["utilization"],
    )[:worst]
    grids = any(m.get("grid") for m in report["members"])
    if ranked:
        lines.append(f"highest utilizations ({report['units']['force']}):")
        for m in ranked:
            where = f"{(m.get('grid') or '-')[:24]:<24} " if grids else ""
            lines.append(
                f"  {m['name'][:24]:<24} {where}{m['section'][:18]:<18} "
                f"{m['utilization']:>6.3f}  "
                f"{m['required_strength']:>10.4g} / {m['available_strength']:<10.4g} "
                f"{m['status'].upper()}"
            )
    nc = [m for m in report["members"] if m["status"] == NOT_CHECKED][:worst]
    for m in nc:
        where = f" ({m['grid']})" if m.get("grid") else ""
        lines.append(f"  not checked: {m['name']}{where}: {m.get('reason', '')}")
    skipped = Counter(m.get("reason", "") for m in report["members"] if m["status"] == SKIPPED)
    for why, n in skipped.most_common():
        lines.append(f"  skipped: {n} x {why}")
    lines.append("Results are an aid; they must be reviewed by a licensed engineer.")
    return "\n".join(lines)
