"""Column loads: matching a load table to the columns, and merging the three load sources.

Sources, in order of precedence (per load type; ``load_source`` lists those used):

1. ``analysis`` -- analysis results in the model (:mod:`ifc_bridge.load_cases`);
2. ``table`` -- a load table (:class:`engine.loads.LoadTable`, parsed by the front end:
   ``service.load_table``) passed to the reader;
3. ``pset`` -- the column's ``Stanchion_Loads`` property set.

For each load type the first source that gives a value is used; a lower source giving a
different value (by more than 0.5 %) is reported in the member's messages and ignored.

A table row's ``element`` is a GlobalId, Tag or Name (tried in that order; a Tag or Name
shared by several columns is refused as ambiguous).
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field

from stanchion.engine.loads import LoadTable
from stanchion.engine.members import LOAD_TYPES

SOURCES: tuple[str, ...] = ("analysis", "table", "pset")
CONFLICT = 0.005  # relative difference reported as a conflict


@dataclass
class TableMatch:
    """Load-table rows matched to members: {member row: {type: kip}} and model messages."""

    by_member: dict[int, dict[str, float]] = field(default_factory=dict)
    messages: list[str] = field(default_factory=list)


def _listing(items: list[str], limit: int = 20) -> str:
    shown = ", ".join(items[:limit])
    return shown + (f" ... ({len(items)} in all)" if len(items) > limit else "")


def match_table(
    table: LoadTable, force_to_kip: float, global_ids: list[str], tags: list[str | None],
    names: list[str | None],
) -> TableMatch:
    """Match table rows to members by GlobalId, then Tag, then Name.

    Args:
        table: the parsed load table.
        force_to_kip: the model's force unit in kip (for the table's columns without a unit).
        global_ids: GlobalId per member.
        tags: Tag per member (or None).
        names: Name per member (or None).
    """
    by_gid = {g: i for i, g in enumerate(global_ids)}
    by_tag: dict[str, list[int]] = {}
    by_name: dict[str, list[int]] = {}
    for i, (tag, name) in enumerate(zip(tags, names, strict=True)):
        if tag:
            by_tag.setdefault(str(tag), []).append(i)
        if name:
            by_name.setdefault(str(name), []).append(i)
    out = TableMatch()
    unknown: list[str] = []
    ambiguous: list[str] = []
    repeated: list[str] = []
    for element, loads in table.in_kip(force_to_kip):
        if element in by_gid:
            hits = [by_gid[element]]
        else:
            hits = by_tag.get(element) or by_name.get(element) or []
        if not hits:
            unknown.append(element)
            continue
        if len(hits) > 1:
            ambiguous.append(f"{element} ({len(hits)} elements)")
            continue
        row = hits[0]
        if row in out.by_member:
            repeated.append(element)
            continue
        out.by_member[row] = loads
    if unknown:
        out.messages.append(f"load table {table.label}: no column matches element(s) "
                            f"{_listing(unknown)}; those rows are ignored")
    if ambiguous:
        out.messages.append(f"load table {table.label}: element(s) {_listing(ambiguous)} "
                            "match several columns by Tag or Name; use the GlobalId; "
                            "those rows are ignored")
    if repeated:
        out.messages.append(f"load table {table.label}: element(s) {_listing(repeated)} "
                            "appear more than once; the first row is used")
    return out


def merge_loads(
    by_source: dict[str, dict[str, float]],
) -> tuple[list[float], list[str], list[str]]:
    """Combine the sources for one member by precedence.

    Args:
        by_source: {source name (:data:`SOURCES`): {load type: kip}}.

    Returns:
        (values in :data:`LOAD_TYPES` order with NaN where absent, sources used, notes).
    """
    values = [math.nan] * len(LOAD_TYPES)
    used: list[str] = []
    notes: list[str] = []
    for pos, kind in enumerate(LOAD_TYPES):
        chosen: tuple[str, float] | None = None
        for source in SOURCES:
            value = by_source.get(source, {}).get(kind)
            if value is None or not math.isfinite(value):
                continue
            if chosen is None:
                chosen = (source, value)
                values[pos] = value
                if source not in used:
                    used.append(source)
                continue
            first_source, first = chosen
            scale = max(abs(first), abs(value), 1e-9)
            if abs(first - value) > CONFLICT * scale:
                notes.append(f"{kind}: {first_source} gives {first:.4g} kip, {source} gives "
                             f"{value:.4g} kip; {first_source} is used")
    return values, [s for s in SOURCES if s in used], notes
