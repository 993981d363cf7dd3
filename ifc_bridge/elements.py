"""Which elements the reader reads, and where they stand in plan.

Elements: every IfcColumn (subtypes such as IfcColumnStandardCase included); with
``include_members`` also every IfcMember whose PredefinedType -- its own, or its type's when
the occurrence's is unset / NOTDEFINED / USERDEFINED (always the type's in IFC2X3, where
IfcMember has none) -- is STRUT or POST; the others are counted by predefined type
(:func:`skipped_members`).

Analysis models: a model without a column to read whose IfcStructuralCurveMembers include
vertical ones (their edge within :data:`VERTICAL_DEGREES` of the z axis) has those checked as
columns (:func:`analysis_columns`); on request (``analysis_members``) also beside the columns,
then only the vertical analysis members tied to no column read.

Plan position: the origin of the element's IfcLocalPlacement in world coordinates, in the
model's length unit.  The parent placement chain is evaluated with
:func:`ifc_bridge.grids.placement_matrix` once per parent and cached; grid placements
(``IfcGridPlacement``) are evaluated there too; linear placements give NaN.
"""

from __future__ import annotations

import math

import ifcopenshell
import numpy as np

from stanchion.ifc_bridge.access import Entity, get
from stanchion.ifc_bridge.grids import placement_matrix
from stanchion.ifc_bridge.relations import RelationIndex

MEMBER_TYPES = ("STRUT", "POST")  # IfcMember predefined types read with include_members

#: An analysis member is a column when its edge is within this angle of the vertical
#: (common practice, no source: a plumb tolerance far above erection tolerances, far below
#: a brace's slope).
VERTICAL_DEGREES = 5.0


def _predefined(element: Entity, etype: Entity | None) -> str | None:
    value = getattr(element, "PredefinedType", None)
    if value in (None, "NOTDEFINED", "USERDEFINED") and etype is not None:
        value = getattr(etype, "PredefinedType", None) or value
    return value


def select_elements(model: ifcopenshell.file, index: RelationIndex,
                    include_members: bool) -> list[Entity]:
    """Every IfcColumn (subtypes included), then STRUT / POST IfcMembers if asked."""
    elements = list(model.by_type("IfcColumn"))
    if include_members:
        for m in model.by_type("IfcMember"):
            if _predefined(m, index.type_of.get(m.id())) in MEMBER_TYPES:
                elements.append(m)
    return elements


def skipped_members(model: ifcopenshell.file, index: RelationIndex) -> str | None:
    """The run message naming the IfcMembers ``include_members`` did not read, by type.

    Args:
        model: an opened model.
        index: its relation index (element types).

    Returns:
        ``"--include-members read 2 IfcMember (STRUT, POST) and skipped 40 of other types:
        30 MULLION, 10 no predefined type"``, or None when none was skipped.
    """
    kinds: dict[str, int] = {}
    read = 0
    for m in model.by_type("IfcMember"):
        value = _predefined(m, index.type_of.get(m.id()))
        if value in MEMBER_TYPES:
            read += 1
        else:
            label = _predefined_label(value)
            kinds[label] = kinds.get(label, 0) + 1
    if not kinds:
        return None
    parts = ", ".join(f"{n} {k}" for k, n in sorted(kinds.items(), key=lambda kv: (-kv[1], kv[0])))
    return (f"--include-members read {read} IfcMember of type {' or '.join(MEMBER_TYPES)} and "
            f"skipped {sum(kinds.values())} of other types: {parts}")


Point3 = tuple[float, float, float]


def edge_ends(member: Entity) -> tuple[Point3, Point3] | None:
    """Start and end point of an analysis member's first IfcEdge (model length units).

    Args:
        member: an IfcStructuralCurveMember.

    Returns:
        The two points (x, y, z), or None when the member has no edge between two points.
    """
    shape = get(member, "Representation")
    for rep in (get(shape, "Representations") if shape is not None else ()) or ():
        for item in get(rep, "Items") or ():
            try:
                edge = item.EdgeElement if item.is_a("IfcOrientedEdge") else item
                if not edge.is_a("IfcEdge"):
                    continue
                a, b = (list(map(float, v.VertexGeometry.Coordinates)) + [0.0, 0.0]
                        for v in (edge.EdgeStart, edge.EdgeEnd))
            except (AttributeError, RuntimeError, TypeError, ValueError):
                continue
            return (a[0], a[1], a[2]), (b[0], b[1], b[2])
    return None


def is_vertical(member: Entity) -> bool:
    """True for an analysis member whose edge is within :data:`VERTICAL_DEGREES` of plumb."""
    ends = edge_ends(member)
    if ends is None:
        return False
    (x0, y0, z0), (x1, y1, z1) = ends
    length = math.dist((x0, y0, z0), (x1, y1, z1))
    return length > 0 and abs(z1 - z0) >= length * math.cos(math.radians(VERTICAL_DEGREES))


def analysis_columns(model: ifcopenshell.file, index: RelationIndex,
                     read: list[Entity]) -> list[Entity]:
    """Vertical IfcStructuralCurveMembers tied to none of the elements already ``read``.

    Args:
        model: an opened model.
        index: its relation index (``linked``: IfcRelAssignsToProduct both ways).
        read: the elements read already (columns, members).

    Returns:
        The analysis members to check as columns, in file order.
    """
    taken = {e.id() for e in read}
    return [m for m in model.by_type("IfcStructuralCurveMember")
            if is_vertical(m) and not any(o.id() in taken for o in index.linked.get(m.id(), ()))]


class PlanPositions:
    """Plan position of elements, parent placements cached (util.placement)."""

    def __init__(self) -> None:
        self._parents: dict[int, tuple[tuple[float, ...], ...]] = {}  # first two matrix rows

    def xy(self, element: Entity) -> tuple[float, float]:
        """Plan position (x, y) of ``element`` in model length units.

        Args:
            element: a product with an ObjectPlacement.

        Returns:
            (x, y); NaN, NaN when there is no placement or it is of a kind not evaluated.
        """
        placement = get(element, "ObjectPlacement")
        if placement is None:
            ends = edge_ends(element) if element.is_a("IfcStructuralCurveMember") else None
            if ends is None:
                return math.nan, math.nan
            low = min(ends, key=lambda p: p[2])  # the foot of an analysis member
            return low[0], low[1]
        try:  # numpy's warnings off: a damaged zero or 1e300 direction gives NaN, not stderr
            with np.errstate(all="ignore"):
                return self._placed(placement)
        except Exception:  # linear placements this reader does not evaluate, damage
            return math.nan, math.nan

    def _placed(self, placement: Entity) -> tuple[float, float]:
        """Plan position of an ObjectPlacement (raises for kinds not evaluated)."""
        if placement.is_a("IfcLocalPlacement"):
            location = get(get(placement, "RelativePlacement"), "Location")
            coords = list(get(location, "Coordinates"))
            parent = get(placement, "PlacementRelTo")
            x, y, z = (list(map(float, coords)) + [0.0, 0.0, 0.0])[:3]
            if parent is None:
                return x, y
            key = parent.id()
            if key not in self._parents:
                m = placement_matrix(parent)
                self._parents[key] = tuple(tuple(float(v) for v in m[r]) for r in (0, 1))
            (a, b, c, d), (e, f, g, h) = self._parents[key]
            return a * x + b * y + c * z + d, e * x + f * y + g * z + h
        matrix = placement_matrix(placement)  # IfcGridPlacement; raises for other kinds
        return float(matrix[0, 3]), float(matrix[1, 3])


def _predefined_label(value: str | None) -> str:
    return "no predefined type" if value in (None, "NOTDEFINED") else str(value)


def found_instead(model: ifcopenshell.file, include_members: bool) -> list[str]:
    """What a model without a column to read holds that could have been one.

    Counted once over the model's own indices (no per-element scans of the file):
    IfcMember by predefined type (own, else its type's), IfcStructuralCurveMember (analysis
    members), IfcBeam, and IfcColumnType with no occurrence.

    Args:
        model: an opened model.
        include_members: the run read STRUT / POST IfcMembers too (then every IfcMember
            counted here is of another type).

    Returns:
        Phrases such as ``"3 IfcMember (2 BRACE, 1 no predefined type)"``, most telling
        first; empty when the model holds none of them.
    """
    import ifcopenshell.util.element

    found: list[str] = []
    members = list(model.by_type("IfcMember"))
    if members:
        kinds: dict[str, int] = {}
        for m in members:
            label = _predefined_label(_predefined(m, ifcopenshell.util.element.get_type(m)))
            kinds[label] = kinds.get(label, 0) + 1
        parts = ", ".join(f"{n} {k}" for k, n in sorted(kinds.items(), key=lambda kv: -kv[1]))
        hint = ("" if include_members or not any(k in MEMBER_TYPES for k in kinds)
                else "; --include-members reads STRUT and POST")
        found.append(f"{len(members)} IfcMember ({parts}{hint})")
    analysis = model.by_type("IfcStructuralCurveMember")
    if analysis:
        found.append(f"{len(analysis)} IfcStructuralCurveMember (analysis members; none has "
                     f"an edge within {VERTICAL_DEGREES:g} degrees of vertical, so none is "
                     "read as a column)")
    beams = len(model.by_type("IfcBeam"))
    if beams:
        found.append(f"{beams} IfcBeam")
    typed = {get(rel, "RelatingType").id() for rel in model.by_type("IfcRelDefinesByType")
             if get(rel, "RelatingType") is not None and get(rel, "RelatedObjects")}
    unused = sum(1 for t in model.by_type("IfcColumnType") if t.id() not in typed)
    if unused:
        found.append(f"{unused} IfcColumnType without occurrences")
    return found
