"""The warnings of a damaged model checked with ``--lenient`` (docs/design.md §4, §5).

The run gets one model-level warning naming each problem (the first three, earliest first)
and the columns whose inputs it touches (:func:`stanchion.ifc_bridge.damage.touched_global_ids`);
each touched column's messages start with the problems that touch it; every other column
gets a short warning saying the model was damaged and that, as far as the parser's log shows,
the damage touches none of its inputs.  The messages travel into every output (terminal,
report, CSV, JUnit, the ``Notes`` property).
"""

from __future__ import annotations

from typing import TYPE_CHECKING

from stanchion.ifc_bridge.damage import Damage, touched_global_ids

if TYPE_CHECKING:
    import ifcopenshell

    from stanchion.engine.members import MemberTable

HEAD = "damaged model read with --lenient"
#: Problems named in one message; columns named per problem.
SHOWN = 3
NAMED = 5


def _label(members: MemberTable, i: int) -> str:
    """A column as the model names it: Tag, else Name, then its GlobalId."""
    tag = members.extra.get("tag")
    first = (tag[i] if tag is not None else None) or members.name[i]
    gid = str(members.id[i])
    return f"{first} ({gid})" if first and str(first) != gid else gid


def _touching(members: MemberTable, touched: frozenset[str] | None) -> list[int]:
    """Rows of the members a problem touches (every row when ``touched`` is None)."""
    if touched is None:
        return list(range(len(members)))
    if not touched:
        return []
    return [i for i, gid in enumerate(members.id.tolist()) if gid in touched]


def _what_it_touches(members: MemberTable, rows: list[int], everywhere: bool) -> str:
    if everywhere:
        return "touches any column: what it stands for is missing"
    if not rows:
        return "touches no column read"
    names = ", ".join(_label(members, i) for i in rows[:NAMED])
    more = f" and {len(rows) - NAMED} more" if len(rows) > NAMED else ""
    return f"touches {'column' if len(rows) == 1 else 'columns'} {names}{more}"


def add_lenient_warnings(model: ifcopenshell.file, members: MemberTable,
                         problems: list[Damage], messages: list[str]) -> None:
    """Put the warnings of a damaged model on the run and on its members.

    Args:
        model: the model as the parser read it.
        members: the member table; its messages are extended in place.
        problems: the damage :func:`stanchion.ifc_bridge.model.open_model` listed.
        messages: the run messages; the model-level warning is put first.
    """
    touched = touched_global_ids(model, problems)
    # problems touching the same elements share one set (touched_global_ids): one group each
    groups: dict[int, tuple[list[int], list[int]]] = {}  # id(set) -> (rows, problem indices)
    for k, t in enumerate(touched):
        if id(t) not in groups:
            groups[id(t)] = (_touching(members, t), [])
        groups[id(t)][1].append(k)
    rows = [groups[id(t)][0] for t in touched]
    parts = [f"{p} ({_what_it_touches(members, r, t is None)})"
             for p, r, t in zip(problems[:SHOWN], rows, touched, strict=False)]
    if len(problems) > SHOWN:
        hit = set().union(*(groups[key][0] for key in {id(t) for t in touched[SHOWN:]}))
        parts.append(f"and {len(problems) - SHOWN} more problems touching "
                     f"{len(hit)} column(s)")
    messages.insert(0, f"{HEAD}: {'; '.join(parts)}; what the parser skipped is missing, "
                       "so the results of the columns it touches may be wrong")
    first: dict[int, list[int]] = {}  # row -> the earliest problems touching it (a few)
    count: dict[int, int] = {}
    for found, indices in groups.values():
        for i in found:
            first.setdefault(i, []).extend(indices[:SHOWN])
            count[i] = count.get(i, 0) + len(indices)
    by_row = {i: [str(problems[k]) for k in sorted(ks)[:SHOWN]] for i, ks in first.items()}
    for i, own in enumerate(list(members.messages)):
        hits = by_row.get(i)
        if hits:
            shown = "; ".join(hits) + (f"; and {count[i] - SHOWN} more"
                                       if count[i] > SHOWN else "")
            note = (f"{HEAD}: this column's inputs are touched by {shown}; its results may "
                    "be wrong")
        else:
            note = (f"{HEAD} (see the run messages): none of the damage touches this "
                    "column's inputs, as far as the parser's log shows")
        members.messages[i] = [note, *own]
