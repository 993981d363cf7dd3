"""Column loads: matching a load table to the columns, and merging the three load sources.

Sources, in order of precedence (per load type; ``load_source`` lists those used):

1. ``analysis`` -- analysis results in the model (:mod:`ifc_bridge.load_cases`);
2. ``table`` -- a load table (:class:`engine.loads.LoadTable`, parsed by the front end:
   ``service.load_table``) passed to the reader;
3. ``pset`` -- the column's ``Stanchion_Loads`` property set.

For each load type the first source that gives a value is used; a lower source giving a
different value (by more than 0.5 %) is reported in the member's messages and ignored.

A table row's ``element`` is a GlobalId, Tag or Name (tried in that order; a Tag or Name
shared by several columns is refused as ambiguous).  A column load schedule's row is keyed
by grid location and level (``B-2``, a storey name; :mod:`ifc_bridge.grids`): a pair that
several columns share is refused for those rows, never spread over them.  Rows matching no
column and columns matching no row are named in the run messages.
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
    """Load-table rows matched to members.

    Attributes:
        by_member: {member row: {load type: kip}}.
        messages: run messages (rows matching nothing or several columns ...).
        refused: members whose rows were refused (their key matched several members).
    """

    by_member: dict[int, dict[str, float]] = field(default_factory=dict)
    messages: list[str] = field(default_factory=list)
    refused: set[int] = field(default_factory=set)


def _listing(items: list[str], limit: int = 20) -> str:
    shown = ", ".join(items[:limit])
    return shown + (f" ... ({len(items)} in all)" if len(items) > limit else "")


@dataclass(frozen=True)
class Places:
    """Where each member stands, for a column load schedule keyed by grid and level.

    Attributes:
        grids: each member's grid location (``B-2``; None without one).
        storeys: each member's storey name ("" without one).
        needs_loads: False for a member that takes no loads (skipped: not steel); such
            members are not listed as matching no row.
    """

    grids: list[str | None]
    storeys: list[str]
    needs_loads: list[bool]


def match_table(
    table: LoadTable, force_to_kip: float, global_ids: list[str], tags: list[str | None],
    names: list[str | None], places: Places | None = None,
) -> TableMatch:
    """Match table rows to members: by GlobalId, then Tag, then Name; or by grid and level.

    Args:
        table: the parsed load table (a schedule when ``table.levels`` is set).
        force_to_kip: the model's force unit in kip (for the table's columns without a unit).
        global_ids: GlobalId per member.
        tags: Tag per member (or None).
        names: Name per member (or None).
        places: grid location and storey per member (needed for a schedule; also names
            the members that match no row).

    Returns:
        The loads per member and the run messages: rows matching no column, rows matching
        several (refused, never spread), repeated rows, and members matching no row.
    """
    if table.levels is not None:
        out = _match_places(table, force_to_kip, names, places)
    else:
        out = _match_elements(table, force_to_kip, global_ids, tags, names)
    if places is not None:
        _unmatched_members(out, table.label, names, global_ids, places)
    return out


def _match_elements(table: LoadTable, force_to_kip: float, global_ids: list[str],
                    tags: list[str | None], names: list[str | None]) -> TableMatch:
    """Rows keyed by element: GlobalId, then Tag, then Name."""
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
            out.refused.update(hits)
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


def _match_places(table: LoadTable, force_to_kip: float, names: list[str | None],
                  places: Places | None) -> TableMatch:
    """Rows of a column load schedule, keyed by (grid location, level = storey name)."""
    by_place = _place_index(places)
    levels = table.levels or ()
    out = TableMatch()
    unknown: list[str] = []
    unkeyed: list[str] = []
    ambiguous: list[str] = []
    repeated: list[str] = []
    for (grid, loads), level in zip(table.in_kip(force_to_kip), levels, strict=True):
        place = f"{grid or '(no grid)'} / {level or '(no level)'}"
        if not grid or not level:
            unkeyed.append(place)
            continue
        hits = by_place.get((grid, level), [])
        if not hits:
            unknown.append(place)
        elif len(hits) > 1:
            which = ", ".join(str(names[i]) for i in hits[:5])
            ambiguous.append(f"{place} ({len(hits)} columns: {which})")
            out.refused.update(hits)
        elif hits[0] in out.by_member:
            repeated.append(place)
        else:
            out.by_member[hits[0]] = loads
    texts = {
        "no column stands at grid / level {}; those rows are ignored": unknown,
        "row(s) {} give loads without a grid location or level; those rows are ignored":
            unkeyed,
        "grid / level {} match several columns; those rows are refused (loads are never "
        "spread over columns): give those columns' loads in a table keyed by element "
        "(GlobalId)": ambiguous,
        "grid / level {} appear more than once; the first row is used": repeated,
    }
    out.messages.extend(f"load table {table.label}: {text.format(_listing(items))}"
                        for text, items in texts.items() if items)
    return out


def _place_index(places: Places | None) -> dict[tuple[str, str], list[int]]:
    """(grid location, storey name) -> the members standing there."""
    by_place: dict[tuple[str, str], list[int]] = {}
    if places is not None:
        for i, (grid, storey) in enumerate(zip(places.grids, places.storeys, strict=True)):
            if grid:
                by_place.setdefault((str(grid), str(storey or "")), []).append(i)
    return by_place


def _unmatched_members(out: TableMatch, label: str, names: list[str | None],
                       global_ids: list[str], places: Places) -> None:
    """Add the message naming the members that need loads and matched no row."""
    missing = []
    for i, gid in enumerate(global_ids):
        if i in out.by_member or i in out.refused or not places.needs_loads[i]:
            continue
        where = ", ".join(w for w in (places.grids[i], places.storeys[i]) if w)
        missing.append(f"{names[i] or gid} ({where or gid})")
    if missing:
        out.messages.append(f"load table {label}: {len(missing)} column(s) match no row: "
                            f"{_listing(missing)}")


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
