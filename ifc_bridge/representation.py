"""What a column's shape representations say about its profile and length (no tessellation).

Body: the representation whose RepresentationIdentifier is ``Body`` on any context (a Body
sub-context is not required), else any solid-model representation.  Its items are searched
for IfcExtrudedAreaSolid through IfcMappedItem (mapping scale applied), the first operand of
IfcBooleanResult / IfcBooleanClippingResult and the tree root of IfcCsgSolid.

Axis: the representation identified ``Axis``; its curve length (IfcPolyline, IfcIndexedPolyCurve
through its points, IfcTrimmedCurve of an IfcLine) is the member length.

Results are cached per representation, so occurrences sharing a mapped representation are
read once.
"""

from __future__ import annotations

import math
from collections.abc import Sequence
from dataclasses import dataclass

from stanchion.ifc_bridge.access import Entity, get

#: RepresentationType values of solid-model representations (IFC4 ADD2 TC1 list).
SOLID_TYPES = frozenset({
    "SweptSolid", "AdvancedSweptSolid", "Clipping", "CSG", "Brep", "AdvancedBrep",
    "SolidModel", "MappedRepresentation",
})

_MAX_DEPTH = 16  # nesting guard for mapped items / booleans


@dataclass(frozen=True)
class Extrusion:
    """One extruded solid found in the body.

    Attributes:
        profile: the SweptArea profile definition.
        depth: extrusion depth in model length units (mapping scale applied).
        scale: mapping scale applied to the profile's dimensions.
        oblique: the extrusion direction is not normal to the profile plane.
        tapered: an IfcExtrudedAreaSolidTapered (end profile differs).
    """

    profile: Entity
    depth: float
    scale: float = 1.0
    oblique: bool = False
    tapered: bool = False


@dataclass(frozen=True)
class ShapeInfo:
    """Profile- and length-relevant facts of one product's representations."""

    extrusions: tuple[Extrusion, ...] = ()
    axis_length: float | None = None
    notes: tuple[str, ...] = ()

    @property
    def main(self) -> Extrusion | None:
        """The longest extrusion (the column shaft when the body has several solids)."""
        if not self.extrusions:
            return None
        return max(self.extrusions, key=lambda e: e.depth)


def distance(a: Sequence[float], b: Sequence[float]) -> float:
    """Distance between two points given by their coordinates (the common dimensions).

    Args:
        a: coordinates of one point.
        b: coordinates of the other.

    Returns:
        The Euclidean distance.
    """
    return math.sqrt(sum((float(x) - float(y)) ** 2 for x, y in zip(a, b, strict=False)))


def _polyline_length(points: Sequence[Sequence[float]]) -> float:
    return sum(distance(points[i], points[i + 1]) for i in range(len(points) - 1))


def _mapping_scale(target: Entity | None) -> tuple[float, str | None]:
    if target is None:
        return 1.0, None
    s = getattr(target, "Scale", None)
    s = 1.0 if s is None else float(s)
    if target.is_a("IfcCartesianTransformationOperator3DnonUniform"):
        s2 = target.Scale2 if target.Scale2 is not None else s
        s3 = target.Scale3 if target.Scale3 is not None else s
        if not (math.isclose(s2, s) and math.isclose(s3, s)):
            return s, "non-uniform mapping scale; the uniform Scale was applied"
    return s, None


class ShapeReader:
    """Reads :class:`ShapeInfo` for products, caching per representation."""

    def __init__(self) -> None:
        self._body: dict[int, tuple[tuple[Extrusion, ...], tuple[str, ...]]] = {}
        self._axis: dict[int, float | None] = {}

    # ------------------------------------------------------------------ public

    def read(self, product: Entity) -> ShapeInfo:
        """Extrusions and axis length of ``product`` (empty info when it has no shape)."""
        shape = get(product, "Representation")
        if shape is None:
            return ShapeInfo()
        reps = [(get(r, "RepresentationIdentifier"), r) for r in get(shape, "Representations")
                or ()]
        body_reps = [r for ident, r in reps if ident == "Body"]
        body_reps += [r for ident, r in reps if ident not in ("Body", "Axis")
                      and get(r, "RepresentationType") in SOLID_TYPES]
        extrusions: tuple[Extrusion, ...] = ()
        notes: tuple[str, ...] = ()
        for rep in body_reps:
            extrusions, notes = self._body_of(rep)
            if extrusions:
                break
        axis_length = None
        for ident, rep in reps:
            if ident == "Axis":
                axis_length = self._axis_of(rep)
                if axis_length:
                    break
        return ShapeInfo(extrusions, axis_length, notes)

    def read_type(self, etype: Entity | None) -> ShapeInfo:
        """Extrusions of an element type's Body representation maps.

        Used for occurrences that carry no representation of their own.

        Args:
            etype: the element type, or None.

        Returns:
            The shape facts (empty when the type has no usable Body map).
        """
        maps = getattr(etype, "RepresentationMaps", None) if etype is not None else None
        for rmap in maps or ():
            rep = rmap.MappedRepresentation
            if rep is None or rep.RepresentationIdentifier not in ("Body", None):
                continue
            extrusions, notes = self._body_of(rep)
            if extrusions:
                return ShapeInfo(extrusions, None, notes + ("shape taken from the element "
                                                            "type's representation map",))
        return ShapeInfo()

    # ------------------------------------------------------------------ body

    def _body_of(self, rep: Entity) -> tuple[tuple[Extrusion, ...], tuple[str, ...]]:
        key = rep.id()
        if key not in self._body:
            found: list[Extrusion] = []
            notes: list[str] = []
            for item in get(rep, "Items") or ():
                self._walk(item, 1.0, found, notes, 0)
            self._body[key] = (tuple(found), tuple(dict.fromkeys(notes)))
        return self._body[key]

    def _walk(self, item: Entity, scale: float, found: list[Extrusion], notes: list[str],
              level: int) -> None:
        if item is None or level > _MAX_DEPTH:
            return
        if item.is_a("IfcExtrudedAreaSolid"):
            direction = get(item, "ExtrudedDirection")
            ratios = get(direction, "DirectionRatios") if direction is not None else None
            oblique = False
            if ratios:
                norm = math.sqrt(sum(float(r) ** 2 for r in ratios)) or 1.0
                oblique = abs(float(ratios[2]) / norm) < 0.9999 if len(ratios) > 2 else True
            raw = get(item, "Depth")
            depth = float(raw) * scale if raw is not None else float("nan")
            found.append(Extrusion(get(item, "SweptArea"), depth, scale, oblique,
                                   item.is_a("IfcExtrudedAreaSolidTapered")))
        elif item.is_a("IfcMappedItem"):
            s, note = _mapping_scale(item.MappingTarget)
            if note:
                notes.append(note)
            source = item.MappingSource
            mapped = source.MappedRepresentation if source is not None else None
            for sub in (mapped.Items if mapped is not None else ()) or ():
                self._walk(sub, scale * s, found, notes, level + 1)
        elif item.is_a("IfcBooleanResult"):
            self._walk(item.FirstOperand, scale, found, notes, level + 1)
        elif item.is_a("IfcCsgSolid"):
            self._walk(item.TreeRootExpression, scale, found, notes, level + 1)

    # ------------------------------------------------------------------ axis

    def _axis_of(self, rep: Entity) -> float | None:
        key = rep.id()
        if key not in self._axis:
            total = 0.0
            for item in rep.Items or ():
                total += self._curve_length(item, 1.0, 0) or 0.0
            self._axis[key] = total if total > 0 else None
        return self._axis[key]

    def _curve_length(self, item: Entity, scale: float, level: int) -> float | None:
        if item is None or level > _MAX_DEPTH:
            return None
        if item.is_a("IfcPolyline"):
            return _polyline_length([p.Coordinates for p in item.Points]) * scale
        if item.is_a("IfcIndexedPolyCurve"):
            coords = list(item.Points.CoordList)
            return _polyline_length(coords) * scale
        if item.is_a("IfcTrimmedCurve") and item.BasisCurve.is_a("IfcLine"):
            t1 = [t for t in item.Trim1 if getattr(t, "is_a", None) and
                  t.is_a("IfcCartesianPoint")]
            t2 = [t for t in item.Trim2 if getattr(t, "is_a", None) and
                  t.is_a("IfcCartesianPoint")]
            if t1 and t2:
                return distance(t1[0].Coordinates, t2[0].Coordinates) * scale
            p1 = [t.wrappedValue for t in item.Trim1 if t.is_a("IfcParameterValue")]
            p2 = [t.wrappedValue for t in item.Trim2 if t.is_a("IfcParameterValue")]
            if p1 and p2:
                return float(abs(p2[0] - p1[0])) * float(item.BasisCurve.Dir.Magnitude) * scale
            return None
        if item.is_a("IfcMappedItem"):
            s, _ = _mapping_scale(item.MappingTarget)
            mapped = item.MappingSource.MappedRepresentation
            return sum(self._curve_length(sub, scale * s, level + 1) or 0.0
                       for sub in mapped.Items or ()) or None
        return None
