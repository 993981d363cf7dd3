"""``check MODEL --takedown PROJECT.toml``: takedown loads for the columns that have none.

The rules: docs/design.md §5 "Load takedown".

:func:`apply_takedown` runs after the reader and before the check:

1. the slabs per storey (:func:`stanchion.ifc_bridge.slabs.storey_slabs`) and the columns'
   Body extents (:func:`stanchion.ifc_bridge.slabs.vertical_extents`), in inches;
2. each member's **level**: the storey whose elevation is nearest the top of its Body,
   within :data:`TOP_TOLERANCE` (24 in, ours: a floor's beams and slab); a member whose top
   is at no storey's elevation, or whose Body is not a vertical extrusion, gets no takedown;
3. one :class:`stanchion.engine.takedown.Level` per storey with columns, its loads from the
   project file, its slabs (openings subtracted) and the problems of slabs not read;
4. :func:`stanchion.engine.takedown.takedown` over all members (every column shares the
   slab, and the stack needs the columns above);
5. the loads go to the members that have **no loads of their own** (no analysis result, load
   table row or ``Stanchion_Loads``): their ``no loads`` reason is replaced, ``load_source``
   becomes ``takedown`` and their messages say where the loads came from.  A member with
   loads of its own keeps them.

Column self-weight: the section's weight (catalog, else 490 lb/ft³ × A) for steel members;
another material gives an unknown weight, so the columns beneath get a reason.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field
from typing import TYPE_CHECKING, Any

import numpy as np
import shapely

from stanchion.engine.materials import NOT_STEEL, STEEL
from stanchion.engine.members import MemberTable
from stanchion.engine.takedown import Level, SlabPiece, Takedown, takedown
from stanchion.engine.units import length_factor
from stanchion.ifc_bridge.slabs import StoreySlabs, storey_slabs, vertical_extents

if TYPE_CHECKING:
    import ifcopenshell

    from stanchion.ifc_bridge.read import ReadResult
    from stanchion.service.takedown_project import TakedownProject

#: A column carries the storey whose elevation is within this of its top, in (ours: the
#: depth of a floor's beams and slab, common practice, no source).
TOP_TOLERANCE = 24.0
NO_LOADS = "no loads"
SOURCE = "takedown"


@dataclass
class TakedownApplied:
    """What the takedown gave.

    Attributes:
        used: indices of the members whose loads now come from the takedown.
        area: tributary area carried by each member, in² (NaN: none).
        llr_factor: L / Lo of each member (NaN: no L).
        messages: run messages.
        cells: each member's tributary cell on the level it carries (shapely polygon, in;
            members on a level only), from the takedown's own run, for the plans.
        storeys: the slabs read per storey (model length unit), for the plans.
        carried: the storey each member carries (its top at its elevation), by member.
    """

    used: list[int] = field(default_factory=list)
    area: dict[int, float] = field(default_factory=dict)
    llr_factor: dict[int, float] = field(default_factory=dict)
    messages: list[str] = field(default_factory=list)
    cells: dict[int, Any] = field(default_factory=dict)
    storeys: list[StoreySlabs] = field(default_factory=list)
    carried: dict[int, str] = field(default_factory=dict)


def _has_no_loads(members: MemberTable, i: int) -> bool:
    """The member has no loads of its own (its reason names them missing)."""
    source = members.extra.get("load_source")
    if source is not None and str(source[i]) != "none":
        return False
    text = members.reason[i]
    return bool(text) and any(p.startswith(NO_LOADS) for p in str(text).split("; "))


def _not_steel(material: object) -> bool:
    """The member's material class is one or more classes other than steel (skipped)."""
    return material is not None and all(c in NOT_STEEL for c in str(material).split(", "))


def _polygon(outer: Any, holes: Any, scale: float) -> Any:
    poly = shapely.Polygon(np.asarray(outer) * scale,
                           [np.asarray(h) * scale for h in holes])
    return shapely.make_valid(poly)


def _weights(members: MemberTable) -> Any:
    """lb/ft of each member: its section's weight for steel members, NaN otherwise."""
    weight = np.full(len(members), np.nan)
    has = members.section_index >= 0
    weight[has] = np.asarray(members.sections.weight, float)[members.section_index[has]]
    if members.material is not None:
        weight[np.asarray(members.material, dtype=object) != STEEL] = np.nan
    return weight


def _levels(storeys: list[StoreySlabs], level_of: Any, members: MemberTable, xy: Any,
            length: Any, project: TakedownProject, to_in: float, notes: list[str]
            ) -> tuple[list[Level], list[int]]:
    """One Level per storey with columns, and the storey index of each (by elevation)."""
    weight = _weights(members)
    levels, ks = [], []
    for k, st in enumerate(storeys):
        idx = np.flatnonzero(level_of == k)
        if len(idx) == 0:
            continue
        loads = project.level_loads(st.name)
        if loads is None:
            notes.append(f"takedown: storey {st.name} has no loads in the project file "
                         "(neither its own table nor storeys.default): its slabs carry none")
            loads = project.slab_only_loads()
        if not st.parts and not st.problems:
            notes.append(f"takedown: storey {st.name} has no slab read, yet "
                         f"{len(idx)} column(s) end at its elevation")
        levels.append(Level(
            name=st.name, elevation=st.elevation * to_in,
            slabs=[SlabPiece(_polygon(p.outer, p.holes, to_in), p.thickness * to_in)
                   for p in st.parts],
            ids=[str(members.name[i]) for i in idx], xy=xy[idx], weight=weight[idx],
            length=length[idx],
            loads=loads, openings=[_polygon(o, (), to_in) for o in st.openings],
            problems=list(st.problems)))
        ks.append(k)
        notes.extend(f"takedown: {st.name}: {n}" for n in st.notes)
        notes.extend(f"takedown: {st.name}: {p} (the columns carrying it, and those below "
                     "them, get no takedown)" for p in st.problems)
    return levels, ks


def _level_of(storeys: list[StoreySlabs], top: Any, to_in: float) -> Any:
    """Index of the storey each member's top carries (-1: none within TOP_TOLERANCE)."""
    out = np.full(len(top), -1, dtype=np.int64)
    if not storeys:
        return out
    elev = np.array([s.elevation for s in storeys]) * to_in
    ok = np.isfinite(top)
    gap = np.abs(top[ok, None] - elev[None, :])
    nearest = np.argmin(gap, axis=1)
    close = gap[np.arange(len(nearest)), nearest] <= TOP_TOLERANCE
    out[np.flatnonzero(ok)[close]] = nearest[close]
    return out


def _why_not(top: float, storeys: list[StoreySlabs], to_in: float, unit: str,
             per_unit: float) -> str:
    if not math.isfinite(top):
        return ("no takedown: the column's Body is not a vertical extrusion, so its top is "
                "not known")
    near = min(storeys, key=lambda s: abs(s.elevation * to_in - top), default=None)
    where = (f"; the nearest storey, {near.name}, is at {near.elevation * to_in / per_unit:,.2f}"
             f" {unit}" if near is not None else "; the model has no storey")
    return (f"no takedown: the column's top ({top / per_unit + 0.0:,.2f} {unit}) is at no "
            f"storey's elevation (within {TOP_TOLERANCE:g} in){where}")


def apply_takedown(model: ifcopenshell.file, read: ReadResult, project: TakedownProject,
                   project_name: str, report_length: str) -> TakedownApplied:
    """Give the members without loads the takedown's loads (module notes); in place.

    Args:
        model: the opened model.
        read: the reader's result; its member table is changed in place.
        project: the takedown project file.
        project_name: the file's name, for messages.
        report_length: the report's length unit (``ft`` or ``m``), for messages.

    Returns:
        The members that got loads, their tributary areas and factors, run messages.
    """
    members = read.members
    out = TakedownApplied()
    n = len(members)
    if n == 0:
        return out
    to_in = read.length_unit_factor
    per_unit = length_factor(report_length)  # inches per report length unit
    storeys = storey_slabs(model)
    out.storeys = storeys
    bottom, top = (a * to_in for a in vertical_extents(model, [str(i) for i in members.id]))
    xy = np.column_stack([np.asarray(members.extra["x"], float) * to_in,
                          np.asarray(members.extra["y"], float) * to_in])
    level_of = _level_of(storeys, top, to_in)
    out.carried = {int(i): storeys[int(k)].name for i, k in enumerate(level_of) if k >= 0}
    notes: list[str] = []
    levels, ks = _levels(storeys, level_of, members, xy, top - bottom, project, to_in, notes)
    result = takedown(levels, project.takedown_options())
    # the engine's rows: levels by rising elevation (as ``storeys``; a stable sort), members
    # in order within each
    order = [int(i) for k in ks for i in np.flatnonzero(level_of == k)]
    row = {m: j for j, m in enumerate(order)}
    if result.cells is not None:
        out.cells = {m: result.cells[j] for m, j in row.items()}
    material = members.material if members.material is not None else [None] * n
    wanted = [i for i in range(n)
              if not _not_steel(material[i]) and _has_no_loads(members, i)]
    for i in wanted:
        j = row.get(i)
        why = (_takedown_reason(result, j) if j is not None else
               _why_not(float(top[i]), storeys, to_in, report_length, per_unit))
        if why is None and j is not None:
            _give(members, i, result, j, order, project_name, out)
        else:
            _refuse(members, i, str(why))
    unused = project.unused_storeys([s.name for s in storeys])
    out.messages.append(
        f"load takedown {project_name}: loads of {len(out.used)} of the {len(wanted)} member(s) "
        "without loads (members not of steel left out) from the gravity load takedown "
        "(estimated service loads; docs/design.md §5)")
    if unused:
        out.messages.append(f"takedown: storeys named in {project_name} but not in the "
                            f"model: {', '.join(unused)}")
    out.messages.extend(dict.fromkeys(notes))
    out.messages.extend(f"takedown: {note}" for note in result.notes)
    return out


def _takedown_reason(result: Takedown, j: int) -> str | None:
    """Why the takedown gives member row ``j`` no load (None: it gives one)."""
    if result.reason[j] is not None:
        return f"no takedown: {result.reason[j]}"
    if not result.area_total[j] > 0:
        storey = result.level_names[int(result.level[j])]
        return (f"no takedown: the column carries no slab (its top is at {storey}, but no "
                "slab of that storey or above reaches it)")
    return None


def _strip_no_loads(text: object) -> list[str]:
    return [p for p in str(text).split("; ") if p and not p.startswith(NO_LOADS)]


def _give(members: MemberTable, i: int, result: Takedown, j: int, order: list[int],
          project_name: str, out: TakedownApplied) -> None:
    members.loads[i] = result.loads[j]
    rest = _strip_no_loads(members.reason[i])
    members.reason[i] = "; ".join(rest) if rest else None
    members.extra["load_source"][i] = SOURCE
    levels_carried = [result.level_names[k] for k in np.flatnonzero(result.area[j] > 0)]
    members.messages[i].append(
        f"loads from the gravity load takedown ({project_name}): estimated service loads of "
        f"{int(result.floors[j])} slab level(s) ({', '.join(reversed(levels_carried))}) and "
        "the self-weight of this column and those above it")
    members.messages[i].extend(result.messages[j])
    k = int(result.above[j])
    while k >= 0:
        m = order[k]
        if not _has_no_loads(members, m) and str(members.extra["load_source"][m]) != SOURCE:
            members.messages[i].append(
                f"the column above ({members.name[m]}) has loads of its own; this takedown "
                "does not use them (it takes the slabs down)")
            break
        k = int(result.above[k])
    out.used.append(i)
    out.area[i] = float(result.area_total[j])
    out.llr_factor[i] = float(result.llr_factor[j])


def _refuse(members: MemberTable, i: int, why: str) -> None:
    text = members.reason[i]
    members.reason[i] = f"{text}; {why}" if text else why


def report_fields(applied: TakedownApplied, rows: list[dict[str, Any]], length_unit: str
                  ) -> None:
    """Add ``tributary_area`` (report length² unit) and ``llr_factor`` to the takedown rows.

    Args:
        applied: what the takedown gave.
        rows: the report's member rows (the member table's order).
        length_unit: the report's length unit.
    """
    per = length_factor(length_unit) ** 2  # in² per report area unit
    for i in applied.used:
        area = applied.area[i] / per
        factor = applied.llr_factor[i]
        rows[i]["tributary_area"] = round(area, 4)
        rows[i]["llr_factor"] = round(factor, 4) if math.isfinite(factor) else None
