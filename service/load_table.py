"""The CSV load table (``stanchion check model.ifc --loads LOADS.csv``): parsed here, at the edge.

::

    element,D,L,Lr [kip],S [kN]
    2O2Fr$t4X7Zf8NOew3FLOH,95,60,,12
    C-12,100,55,4,

``element`` is a GlobalId, Tag or Name (matched to the model's columns by
:func:`ifc_bridge.loads.match_table`); columns ``grid``, ``level``, ``GlobalId``, ``Tag``
and ``Name`` may follow for the reader and are not matched on.  A column load schedule is
keyed by grid location and level instead (``stanchion loads-template`` writes one)::

    grid,level,GlobalId,Tag,Name,D [kN],L [kN]
    B-2,Level 1,2O2Fr$t4X7Zf8NOew3FLOH,C-12,C-12,400,250

``grid`` is the column's grid location as the reports name it (``B-2``), ``level`` its
storey's name; ``GlobalId``, ``Tag`` and ``Name`` are for the reader, never matched on.
Load columns are ``D L Lr S R W E`` (case-insensitive), optionally with a unit in brackets
-- any force unit pint understands (``kip``, ``kN``, ``lbf``, ``N``, ``MN`` ...); without
one, values are in the force unit given apart (``--force-unit``), else in the model's force
unit where the model declares one (converted by the reader, which knows it; a model that
declares none refuses such a table, :func:`stanchion.ifc_bridge.read.read_columns`: units
are never guessed, issue 13).  Empty cells mean "not given".  Anything else (unknown
column, text in a number cell, a unit that is not a force) makes the whole table unusable:
:class:`LoadTableError`, one line naming the problem (exit 2).
"""

from __future__ import annotations

import math
import re
from pathlib import Path
from typing import TYPE_CHECKING

from stanchion.engine.loads import LoadTable
from stanchion.engine.members import LOAD_TYPES
from stanchion.engine.units import FORCE_UNITS, factor
from stanchion.service.errors import InputError

if TYPE_CHECKING:
    import pandas as pd

__all__ = ["LoadTable", "LoadTableError", "read_load_table"]

_HEADER = re.compile(r"^\s*([A-Za-z]+)\s*(?:\[\s*([^\]]*?)\s*\])?\s*$")
_TYPES_BY_LOWER = {t.lower(): t for t in LOAD_TYPES}


class LoadTableError(InputError):
    """The CSV load table cannot be used (message is one line)."""


def _force_factor(unit: str, label: str) -> float:
    expr = FORCE_UNITS.get(unit, unit)
    try:
        return factor(expr, "kip")
    except ValueError:
        raise LoadTableError(f"load table {label}: '{unit}' is not a force unit") from None


def given_force_unit(force_unit: str | None, option: str = "--force-unit"
                     ) -> tuple[str, float] | None:
    """The ``--force-unit`` option (an HTTP job's ``force_unit``), None when not given.

    Returns:
        (the unit as written, kip per unit), or None.

    Args:
        force_unit: kip, kN, N, lbf, MN or any force unit pint knows (no scaling factor).
        option: how the message names the option.

    Raises:
        LoadTableError: not a force unit (one line naming ``option``).
    """
    if force_unit is None:
        return None
    name = force_unit.strip()
    try:
        to_kip = factor(FORCE_UNITS.get(name, name), "kip") if 0 < len(name) <= 40 else 0.0
    except ValueError:
        to_kip = 0.0
    if not (0 < to_kip < math.inf):
        raise LoadTableError(f"{option}: {force_unit[:40]!r} is not a force unit (kip, kN, "
                             "N, lbf, MN or another force unit)")
    return name, to_kip


def _given_unit(force_unit: str | None) -> float | None:
    """The ``--force-unit`` option in kip per unit (None when not given)."""
    given = given_force_unit(force_unit)
    return None if given is None else given[1]


def _frame(path: str | Path, label: str) -> pd.DataFrame:
    import pandas as pd  # only when a table is given: the import costs a third of a second

    try:
        # header=None keeps repeated column names as written (pandas would rename them)
        return pd.read_csv(path, dtype=str, keep_default_na=False, skipinitialspace=True,
                           header=None)
    except FileNotFoundError:
        raise LoadTableError(f"cannot read load table {label}: no such file") from None
    except (OSError, UnicodeDecodeError, pd.errors.ParserError, pd.errors.EmptyDataError) as exc:
        detail = str(exc).strip().splitlines()[0] if str(exc).strip() else type(exc).__name__
        raise LoadTableError(f"cannot read load table {label}: {detail}") from None


#: Header of a column load schedule: its first two columns, case-insensitive.
GRID_KEYS = ("grid", "level")
#: Columns kept for the reader of the spreadsheet, never matched on (``stanchion
#: loads-template`` writes them), case-insensitive: in a schedule keyed by grid and level,
#: and in a table keyed by element (where grid and level are then for reference too).
REFERENCE_COLUMNS = {2: ("globalid", "tag", "name"),
                     1: ("grid", "level", "globalid", "tag", "name")}


def _key_count(columns: list[str], label: str) -> int:
    """1 for a table keyed by element, 2 for a schedule keyed by grid and level."""
    lower = [c.lower() for c in columns]
    if lower[:1] == ["element"]:
        return 1
    if tuple(lower[:2]) == GRID_KEYS:
        return 2
    raise LoadTableError(f"load table {label}: the first column must be 'element', or the "
                         f"first two 'grid,level' (header is {','.join(columns)})")


def _load_columns(columns: list[str], keys: int, label: str, given: float | None
                  ) -> tuple[list[tuple[int, str]], dict[str, float | None]]:
    """(position, load type) of each load column and each type's factor to kip."""
    plan: list[tuple[int, str]] = []
    to_kip: dict[str, float | None] = {}
    seen: set[str] = set()
    for pos, col in enumerate(columns[keys:], start=keys):
        if col.lower() in REFERENCE_COLUMNS[keys]:
            if col.lower() in seen:
                raise LoadTableError(f"load table {label}: column '{col}' appears twice")
            seen.add(col.lower())
            continue
        m = _HEADER.match(col)
        kind = _TYPES_BY_LOWER.get(m.group(1).lower()) if m else None
        if kind is None:
            extra = (", or GlobalId, Tag, Name for reference" if keys == 2
                     else ", or grid, level, GlobalId, Tag, Name for reference")
            raise LoadTableError(f"load table {label}: column '{col}' is not a load type "
                                 f"({', '.join(LOAD_TYPES)}, optionally with a [unit]{extra})")
        if kind in to_kip:
            raise LoadTableError(f"load table {label}: load type {kind} appears twice")
        assert m is not None  # a load type was recognised in it
        unit = m.group(2)
        to_kip[kind] = _force_factor(unit, label) if unit else given
        plan.append((pos, kind))
    return plan, to_kip


def _row_loads(values: tuple[str, ...], plan: list[tuple[int, str]], where: str
               ) -> dict[str, float]:
    """The load cells of one row (empty cells are "not given")."""
    loads: dict[str, float] = {}
    for pos, kind in plan:
        cell = str(values[pos]).strip()
        if not cell:
            continue
        try:
            number = float(cell)
        except ValueError:
            raise LoadTableError(f"{where}, column {kind}: '{cell}' is not a number") from None
        if not math.isfinite(number):
            raise LoadTableError(f"{where}, column {kind}: '{cell}' is not a finite number")
        loads[kind] = number
    return loads


def read_load_table(path: str | Path, force_unit: str | None = None) -> LoadTable:
    """Parse the CSV load table: keyed by element, or a column load schedule.

    A schedule's header starts ``grid,level`` (the grid location, ``B-2``, and the storey
    name); columns ``GlobalId``, ``Tag`` and ``Name`` may follow for the reader and are not
    matched on.  A schedule row whose grid location and level are both empty and that gives
    no load (a template row of a column without a grid location) is left out.

    Args:
        path: the CSV file.
        force_unit: the unit of columns whose header names none (``--force-unit``); None:
            such columns take the model's declared force unit.

    Returns:
        The table; values of columns with a unit (or with ``force_unit``) are converted to
        kip when the reader asks (:meth:`engine.loads.LoadTable.in_kip`), the others take
        the model's force unit.  A schedule's rows carry their levels
        (:attr:`engine.loads.LoadTable.levels`).

    Raises:
        LoadTableError: unreadable file or bad content, one line naming the problem.
    """
    label = str(path)
    given = _given_unit(force_unit)
    frame = _frame(path, label)
    columns = [str(c).strip() for c in frame.iloc[0]] if len(frame) else []
    keys = _key_count(columns, label)
    plan, to_kip = _load_columns(columns, keys, label, given)
    rows: list[tuple[str, dict[str, float]]] = []
    levels: list[str] = []
    for line, values in enumerate(frame.iloc[1:].itertuples(index=False, name=None), start=2):
        element = str(values[0]).strip()
        loads = _row_loads(values, plan, f"load table {label}, line {line}")
        if keys == 2:
            level = str(values[1]).strip()
            if not (element or level or loads):
                continue
            levels.append(level)
        elif not element:
            raise LoadTableError(f"load table {label}, line {line}: no element")
        rows.append((element, loads))
    return LoadTable(tuple(rows), to_kip, label, tuple(levels) if keys == 2 else None)
