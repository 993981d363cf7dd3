"""Column loads: the CSV load table, and merging the three load sources.

Sources, in order of precedence (per load type; ``load_source`` lists those used):

1. ``analysis`` -- analysis results in the model (:mod:`ifc_bridge.load_cases`);
2. ``table`` -- the CSV load table passed to the reader;
3. ``pset`` -- the column's ``Stanchion_Loads`` property set.

For each load type the first source that gives a value is used; a lower source giving a
different value (by more than 0.5 %) is reported in the member's messages and ignored.

CSV load table (read with pandas)::

    element,D,L,Lr [kip],S [kN]
    2O2Fr$t4X7Zf8NOew3FLOH,95,60,,12
    C-12,100,55,4,

``element`` is a GlobalId, Tag or Name (tried in that order; a Tag or Name shared by several
columns is refused as ambiguous).  Load columns are ``D L Lr S R W E`` (case-insensitive),
optionally with a unit in brackets -- any force unit pint understands (``kip``, ``kN``,
``lbf``, ``N``, ``MN`` ...); without one, values are in the model's force unit.  Empty cells
mean "not given".  Anything else (unknown column, text in a number cell, a unit that is not a
force) makes the whole table unusable: :class:`LoadTableError`.
"""

from __future__ import annotations

import math
import re
from dataclasses import dataclass, field
from pathlib import Path

import pandas as pd
import pint

from stanchion.engine.members import LOAD_TYPES
from stanchion.engine.units import FORCE_UNITS, factor
from stanchion.ifc_bridge.model import ModelReadError
from stanchion.ifc_bridge.units import ModelUnits

SOURCES: tuple[str, ...] = ("analysis", "table", "pset")
CONFLICT = 0.005  # relative difference reported as a conflict
_HEADER = re.compile(r"^\s*([A-Za-z]+)\s*(?:\[\s*([^\]]*?)\s*\])?\s*$")
_TYPES_BY_LOWER = {t.lower(): t for t in LOAD_TYPES}


class LoadTableError(ModelReadError):
    """The CSV load table cannot be used (message is one line)."""


@dataclass
class LoadTable:
    """A parsed load table: rows keyed by the ``element`` text, values in kip."""

    rows: list[tuple[str, dict[str, float]]]
    used_model_unit: bool
    path: str


def _force_factor(unit: str, label: str) -> float:
    expr = FORCE_UNITS.get(unit, unit)
    try:
        return factor(expr, "kip")
    except (pint.errors.UndefinedUnitError, pint.errors.DimensionalityError, AttributeError,
            TypeError, ValueError, AssertionError):
        raise LoadTableError(f"load table {label}: '{unit}' is not a force unit") from None


def read_load_table(path: str | Path, units: ModelUnits) -> LoadTable:
    """Parse the CSV load table.

    Args:
        path: the CSV file.  units: the model's units (for columns without a unit).

    Raises:
        LoadTableError: unreadable file or bad content, one line naming the problem.
    """
    label = str(path)
    try:
        # header=None keeps repeated column names as written (pandas would rename them)
        frame = pd.read_csv(path, dtype=str, keep_default_na=False, skipinitialspace=True,
                            header=None)
    except FileNotFoundError:
        raise LoadTableError(f"cannot read load table {label}: no such file") from None
    except (OSError, UnicodeDecodeError, pd.errors.ParserError, pd.errors.EmptyDataError) as exc:
        detail = str(exc).strip().splitlines()[0] if str(exc).strip() else type(exc).__name__
        raise LoadTableError(f"cannot read load table {label}: {detail}") from None
    columns = [str(c).strip() for c in frame.iloc[0]] if len(frame) else []
    if not columns or columns[0].lower() != "element":
        raise LoadTableError(f"load table {label}: the first column must be 'element' "
                             f"(header is {','.join(columns)})")
    plan: list[tuple[int, str, float, bool]] = []
    seen: set[str] = set()
    for pos, col in enumerate(columns[1:], start=1):
        m = _HEADER.match(col)
        kind = _TYPES_BY_LOWER.get(m.group(1).lower()) if m else None
        if kind is None:
            raise LoadTableError(f"load table {label}: column '{col}' is not a load type "
                                 f"({', '.join(LOAD_TYPES)}, optionally with a [unit])")
        if kind in seen:
            raise LoadTableError(f"load table {label}: load type {kind} appears twice")
        seen.add(kind)
        unit = m.group(2)
        if unit:
            plan.append((pos, kind, _force_factor(unit, label), False))
        else:
            plan.append((pos, kind, units.force, True))
    rows: list[tuple[str, dict[str, float]]] = []
    used_model_unit = False
    body = frame.iloc[1:]
    for line, values in enumerate(body.itertuples(index=False, name=None), start=2):
        element = str(values[0]).strip()
        if not element:
            raise LoadTableError(f"load table {label}, line {line}: no element")
        loads: dict[str, float] = {}
        for pos, kind, f, model_unit in plan:
            cell = str(values[pos]).strip()
            if not cell:
                continue
            try:
                number = float(cell)
            except ValueError:
                raise LoadTableError(f"load table {label}, line {line}, column {kind}: "
                                     f"'{cell}' is not a number") from None
            if not math.isfinite(number):
                raise LoadTableError(f"load table {label}, line {line}, column {kind}: "
                                     f"'{cell}' is not a finite number")
            loads[kind] = number * f
            used_model_unit |= model_unit
        rows.append((element, loads))
    return LoadTable(rows, used_model_unit, label)


@dataclass
class TableMatch:
    """Load-table rows matched to members: {member row: {type: kip}} and model messages."""

    by_member: dict[int, dict[str, float]] = field(default_factory=dict)
    messages: list[str] = field(default_factory=list)


def _listing(items: list[str], limit: int = 20) -> str:
    shown = ", ".join(items[:limit])
    return shown + (f" ... ({len(items)} in all)" if len(items) > limit else "")


def match_table(
    table: LoadTable, global_ids: list[str], tags: list[str | None], names: list[str | None]
) -> TableMatch:
    """Match table rows to members by GlobalId, then Tag, then Name."""
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
    for element, loads in table.rows:
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
        out.messages.append(f"load table {table.path}: no column matches element(s) "
                            f"{_listing(unknown)}; those rows are ignored")
    if ambiguous:
        out.messages.append(f"load table {table.path}: element(s) {_listing(ambiguous)} "
                            "match several columns by Tag or Name; use the GlobalId; "
                            "those rows are ignored")
    if repeated:
        out.messages.append(f"load table {table.path}: element(s) {_listing(repeated)} "
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
