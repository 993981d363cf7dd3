"""Damage a lenient read lets through, and the elements whose inputs it touches.

A model read with ``--lenient`` (:func:`ifc_bridge.model.open_model` with ``problems``) may
miss lines the parser skipped, hold references to instances that are not in the file, or be
cut short.  Each problem is a :class:`Damage`: its line, the instance written on that line
(the parser logs the byte offset of the statement it could not use) and the instances that
statement names.  :func:`touched_global_ids` then finds the elements whose inputs reach that
instance -- the same relationships the reader follows (docs/design.md §5):

* everything an element refers to, directly or through other instances (placement,
  representation, profile, material, type, property sets through their relationships);
* the far side of the relationships the reader reads through: material
  (``IfcRelAssociatesMaterial``), property sets and quantities
  (``IfcRelDefinesByProperties``), type (``IfcRelDefinesByType``), spatial container, the
  analysis members tied by ``IfcRelAssignsToProduct``, their structural activities
  (``IfcRelConnectsStructuralActivity``) and the activities' result groups
  (``IfcRelAssignsToGroup`` of an ``IfcStructuralResultGroup``); material and profile
  properties that point at their material or profile.

The search walks from the damaged instance towards the elements that use it, never across
an ``IfcOwnerHistory``, the project or an analysis model (shared by everything, never read
for a column).  Damage to the project's units touches every element; so does damage that
cannot be placed (a file cut short: whatever followed is missing, or a log entry without a
position).  Damage the parser reads without complaint is not in its log and not found here.
"""

from __future__ import annotations

import re
from collections import deque
from collections.abc import Iterable
from dataclasses import dataclass, field
from pathlib import Path

import ifcopenshell

from stanchion.ifc_bridge.access import Entity, get_opt

#: Bytes read on either side of a logged offset to find the statement it falls in (an
#: instance with a long list of references fits; common practice, no source).
_WINDOW = 256 * 1024
#: The first, smaller look around an offset (most statements are one short line).
_FIRST_WINDOW = 4 * 1024
#: Problems located in the file one by one; beyond this many, the rest touch every element.
MAX_LOCATED = 1000
_STATEMENT_START = re.compile(rb"(?:^|[;\n])\s*#(\d+)\s*=", re.MULTILINE)
_REFERENCE = re.compile(rb"#(\d+)")
_END = re.compile(rb";\s*(?:\n|$)")
#: ifcopenshell's words for a reference to an instance that is not in the file.
_DANGLING = re.compile(r"Instance reference #(\d+) used by instance #(\d+) at attribute "
                       r"index (\d+)")

#: Relationship class -> (attributes of the objects it gives inputs to, attributes of the
#: inputs it gives them).  ``IfcRelAssignsToProduct`` ties both ways (handled apart).
_FOLLOWED: dict[str, tuple[str, str]] = {
    "IfcRelAssociatesMaterial": ("RelatedObjects", "RelatingMaterial"),
    "IfcRelDefinesByProperties": ("RelatedObjects", "RelatingPropertyDefinition"),
    "IfcRelDefinesByType": ("RelatedObjects", "RelatingType"),
    "IfcRelContainedInSpatialStructure": ("RelatedElements", "RelatingStructure"),
    "IfcRelConnectsStructuralActivity": ("RelatingElement", "RelatedStructuralActivity"),
    "IfcRelAssignsToGroup": ("RelatedObjects", "RelatingGroup"),
}
#: Instances shared by everything and never read for one column: the search stops there.
_STOP = ("IfcOwnerHistory", "IfcProject", "IfcStructuralAnalysisModel")


@dataclass(frozen=True)
class Damage:
    """One problem of a damaged model.

    Attributes:
        text: ``"line N: what"`` (the parser's words), as printed.
        line: the line it is on (None when the log gives no position).
        step_id: the instance written on the damaged statement (None when not found).
        refs: the instances that statement names.
        everywhere: the damage cannot be tied to instances (a file cut short, a log entry
            without a position): any element may be touched.
    """

    text: str
    line: int | None = None
    step_id: int | None = None
    refs: tuple[int, ...] = field(default=())
    everywhere: bool = False

    def __str__(self) -> str:
        """The problem as printed (``"line N: what"``)."""
        return self.text


def statement_at(path: Path, offset: int) -> tuple[int | None, tuple[int, ...]]:
    """The instance written at byte ``offset`` of a STEP file and the instances it names.

    Args:
        path: the STEP file.
        offset: a byte offset inside one statement (``#12=IFCWALL(...);``).

    Returns:
        (the statement's instance id or None, the ids it references, in order).
    """
    window = _FIRST_WINDOW
    while True:
        start = max(0, offset - window)
        with path.open("rb") as fh:
            fh.seek(start)
            data = fh.read(offset - start + window)
        here = offset - start
        heads = list(_STATEMENT_START.finditer(data, 0, here + 1))
        end = _END.search(data, max(here, heads[-1].end())) if heads else None
        found = heads and (end is not None or len(data) < offset - start + window)
        if found or window >= _WINDOW:
            break
        window *= 8  # a long statement: look further
    if not heads:
        return None, ()
    head = heads[-1]
    body = data[head.end():end.start() if end else len(data)]
    return int(head.group(1)), tuple(int(r) for r in _REFERENCE.findall(body))


def _by_id(model: ifcopenshell.file, step_id: int) -> Entity | None:
    try:
        return model.by_id(step_id)
    except RuntimeError:
        return None


def _ids(value: object) -> list[int]:
    """The ids of the entities in an attribute value (an entity, a list of them, or none)."""
    items = value if isinstance(value, list | tuple) else [value]
    return [v.id() for v in items if isinstance(v, ifcopenshell.entity_instance)]


def _users(model: ifcopenshell.file, node: Entity) -> Iterable[Entity]:
    """The instances whose inputs include ``node``, one step up (see the module notes)."""
    nid = node.id()
    referring: list[Entity] = list(model.get_inverse(node))
    for user in referring:
        if not user.is_a("IfcRelationship"):
            yield user
            continue
        yield from _relationship_users(user, nid)
    for cls, attr in (("IfcMaterialProperties", "Material"),
                      ("IfcProfileProperties", "ProfileDefinition")):
        if node.is_a(cls) and (owner := get_opt(node, attr)) is not None:
            yield owner


def _relationship_users(rel: Entity, nid: int) -> Iterable[Entity]:
    """The objects ``rel`` gives instance ``nid`` to as an input (none if it does not)."""
    if rel.is_a("IfcRelAssignsToProduct"):
        related = get_opt(rel, "RelatedObjects") or ()
        product = get_opt(rel, "RelatingProduct")
        if product is not None and product.id() == nid:
            yield rel
            yield from related
        elif nid in _ids(related) and product is not None:
            yield rel
            yield product
        return
    for cls, (near, far) in _FOLLOWED.items():
        if not rel.is_a(cls):
            continue
        source = get_opt(rel, far)
        if cls == "IfcRelAssignsToGroup" and not (
                source is not None and source.is_a("IfcStructuralResultGroup")):
            return
        if nid in _ids(source):
            yield rel
            value = get_opt(rel, near)
            yield from (value if isinstance(value, list | tuple) else
                        [value] if value is not None else [])
        return


def _kept(entity: Entity) -> list[Entity]:
    """Where the search starts from a damaged instance the parser kept.

    The instance itself; a damaged relationship is also an input of the objects it relates.
    """
    if entity.is_a("IfcRelationship"):
        return [entity, *_relationship_users_all(entity)]
    return [entity]


def _near_side(user: Entity, index: int) -> bool:
    """Whether attribute ``index`` of ``user`` lists the objects a relationship serves.

    A reference missing there costs only the missing object its link (its siblings keep
    theirs); relationships the reader does not follow count the same.
    """
    if not user.is_a("IfcRelationship") or user.is_a("IfcRelAssignsToProduct"):
        return False
    name = user.attribute_name(index)
    for cls, (near, _far) in _FOLLOWED.items():
        if user.is_a(cls):
            return bool(name == near)
    return True


def _missing_users(model: ifcopenshell.file, damage: list[Damage]) -> dict[int, list[Entity]]:
    """A missing instance -> the kept instances that read it as an input.

    From the parser's "Instance reference #X used by instance #Y at attribute index K not
    found" entries, leaving out a relationship's list of the objects it serves.
    """
    users: dict[int, list[Entity]] = {}  # each user with what a damaged one feeds (_kept)
    for item in damage:
        found = _DANGLING.search(item.text)
        if found is None:
            continue
        missing, user_id, index = (int(g) for g in found.groups())
        user = _by_id(model, user_id)
        if user is not None and not _near_side(user, index):
            users.setdefault(missing, []).extend(_kept(user))
    return users


def _starts(model: ifcopenshell.file, damage: Damage, users: dict[int, list[Entity]]
            ) -> list[Entity] | None:
    """Where the search for one problem starts; None when it cannot be placed.

    A reference to a missing instance: the kept instances that read the missing one (all
    the entries naming it then touch the same columns).  An instance the parser kept
    (an invalid enumeration ...): itself.  A line the parser skipped: the instances that
    read it and the instances the line names.
    """
    found = _DANGLING.search(damage.text)
    if found is not None:  # every entry naming the same missing instance: the same list
        return users.get(int(found.group(1)), [])
    if damage.step_id is None:
        return None
    kept = _by_id(model, damage.step_id)
    if kept is not None:
        return _kept(kept)
    named = (_by_id(model, r) for r in damage.refs)
    return [*users.get(damage.step_id, []),
            *(e for e in named if e is not None and not e.is_a("IfcOwnerHistory"))]


def _relationship_users_all(rel: Entity) -> list[Entity]:
    """The objects a damaged relationship gives inputs to (its near side; both for links)."""
    if rel.is_a("IfcRelAssignsToProduct"):
        product = get_opt(rel, "RelatingProduct")
        return [*(get_opt(rel, "RelatedObjects") or ()), *([product] if product else [])]
    for cls, (near, _far) in _FOLLOWED.items():
        if rel.is_a(cls):
            value = get_opt(rel, near)
            return list(value) if isinstance(value, list | tuple) else (
                [value] if value is not None else [])
    return []


def _unit_ids(model: ifcopenshell.file) -> set[int]:
    """The project's unit assignment and everything it refers to."""
    found: set[int] = set()
    for project in model.by_type("IfcProject"):
        units = get_opt(project, "UnitsInContext")
        if units is not None:
            found.update(e.id() for e in model.traverse(units))
    return found


def _reach(model: ifcopenshell.file, starts: list[Entity]) -> set[int]:
    """Ids of every instance whose inputs include one of ``starts`` (``starts`` included)."""
    seen = {s.id() for s in starts}
    queue = deque(starts)
    while queue:
        node = queue.popleft()
        if any(node.is_a(cls) for cls in _STOP):
            continue
        for user in _users(model, node):
            uid = user.id()
            if uid not in seen:
                seen.add(uid)
                queue.append(user)
    return seen


def touched_global_ids(model: ifcopenshell.file, damage: list[Damage]
                       ) -> list[frozenset[str] | None]:
    """For each problem, the GlobalIds of the elements whose inputs it touches.

    Args:
        model: the model as the parser read it.
        damage: the problems :func:`ifc_bridge.model.open_model` listed.

    Returns:
        Per problem: the GlobalIds of the ``IfcProduct`` instances it touches (columns,
        members, analysis members; empty when none), or None when it touches every
        element (cut short, not placed, the units).
    """
    units = _unit_ids(model)
    users = _missing_users(model, damage)
    out: list[frozenset[str] | None] = []
    known: dict[frozenset[int], frozenset[str] | None] = {}  # problems sharing their starts
    known_lists: dict[int, tuple[list[Entity], frozenset[int]]] = {}  # key of a list, once
    for item in damage:
        starts = None if item.everywhere else _starts(model, item, users)
        if starts is None:
            out.append(None)
            continue
        held = known_lists.get(id(starts))
        if held is None:  # the list is kept alive with its key, so its id stays its own
            held = known_lists[id(starts)] = (starts, frozenset(s.id() for s in starts))
        key = held[1]
        if key not in known:
            known[key] = _touched(model, starts, units)
        out.append(known[key])
    return out


def _touched(model: ifcopenshell.file, starts: list[Entity], units: set[int]
             ) -> frozenset[str] | None:
    """The GlobalIds of the elements reached from ``starts``; None: the units, so all."""
    reached = _reach(model, starts)
    if reached & units or any(s.is_a("IfcProject") for s in starts):
        return None  # the units (or the project holding them) are read for every element
    gids = set()
    for rid in reached:
        entity: Entity = model.by_id(rid)
        if entity.is_a("IfcProduct"):
            gids.add(str(entity.GlobalId))
    return frozenset(gids)
