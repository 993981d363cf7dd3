"""What a column's shape representations say about its profile and length (no tessellation).

Body: the representation whose RepresentationIdentifier is ``Body`` on any context (a Body
sub-context is not required), else any solid-model representation.  Its items are searched
for IfcExtrudedAreaSolid through IfcMappedItem (mapping scale applied), the first operand of
IfcBooleanResult / IfcBooleanClippingResult and the tree root of IfcCsgSolid.

Axis: the representation identified ``Axis``; its curve length (IfcPolyline, IfcIndexedPolyCurve
through its points, IfcTrimmedCurve of an IfcLine) is the member length.

Bodies that are not extrusions (faceted or advanced Brep, triangulated or polygonal face sets,
shell- and face-based surface models, through mapped items with their full transformation and
the first operand of booleans) give no profile, but their vertices give the body's extent along
the element's local z axis -- the column axis of a column placed the usual way (IFC4
IfcColumnStandardCase: "the extrusion direction ... along the positive z axis of the object
coordinate system"); :attr:`ShapeInfo.body_extent`.  It is computed only for a body without an
extrusion.

Results are cached per representation, so occurrences sharing a mapped representation are
read once.
"""

from __future__ import annotations

import math
from collections.abc import Iterator, Sequence
from dataclasses import dataclass

import numpy as np

from stanchion.ifc_bridge.access import Entity, get
from stanchion.ifc_bridge.orientation import mapping_turn, solid_angle

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
        angle: plan angle of the profile's x axis in the product's coordinates, degrees
            (:mod:`stanchion.ifc_bridge.orientation`).
    """

    profile: Entity
    depth: float
    scale: float = 1.0
    oblique: bool = False
    tapered: bool = False
    angle: float = 0.0


@dataclass(frozen=True)
class ShapeInfo:
    """Profile- and length-relevant facts of one product's representations."""

    extrusions: tuple[Extrusion, ...] = ()
    axis_length: float | None = None
    notes: tuple[str, ...] = ()
    body_extent: float | None = None
    body_kind: str | None = None

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
        self._extent: dict[int, tuple[float | None, str | None]] = {}

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
        extent, kind = (None, None) if extrusions else self._extent_of(body_reps)
        return ShapeInfo(extrusions, axis_length, notes, extent, kind)

    def read_type(self, etype: Entity | None) -> ShapeInfo:
        """Extrusions of an element type's Body representation maps.

        Used for occurrences that carry no representation of their own.

        Args:
            etype: the element type, or None.

        Returns:
            The shape facts (empty when the type has no usable Body map).
        """
        maps = getattr(etype, "RepresentationMaps", None) if etype is not None else None
        bodies = [rmap.MappedRepresentation for rmap in maps or ()
                   if rmap.MappedRepresentation is not None
                   and rmap.MappedRepresentation.RepresentationIdentifier in ("Body", None)]
        for rep in bodies:
            extrusions, notes = self._body_of(rep)
            if extrusions:
                return ShapeInfo(extrusions, None, notes + ("shape taken from the element "
                                                            "type's representation map",))
        extent, kind = self._extent_of(bodies)
        return ShapeInfo(body_extent=extent, body_kind=kind)

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
              level: int, angle: float = 0.0) -> None:
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
                                   item.is_a("IfcExtrudedAreaSolidTapered"),
                                   angle + solid_angle(item)))
        elif item.is_a("IfcMappedItem"):
            s, note = _mapping_scale(item.MappingTarget)
            if note:
                notes.append(note)
            source = item.MappingSource
            mapped = source.MappedRepresentation if source is not None else None
            turn = angle + mapping_turn(item)
            for sub in (mapped.Items if mapped is not None else ()) or ():
                self._walk(sub, scale * s, found, notes, level + 1, turn)
        elif item.is_a("IfcBooleanResult"):
            self._walk(item.FirstOperand, scale, found, notes, level + 1, angle)
        elif item.is_a("IfcCsgSolid"):
            self._walk(item.TreeRootExpression, scale, found, notes, level + 1, angle)

    # ------------------------------------------------------------------ body extent

    def _extent_of(self, reps: list[Entity]) -> tuple[float | None, str | None]:
        """Extent along local z of the first body representation with vertices, and its kind."""
        for rep in reps:
            key = rep.id()
            if key not in self._extent:
                self._extent[key] = _vertex_extent(rep)
            if self._extent[key][0] is not None:
                return self._extent[key]
        kinds = [k for k in (self._extent.get(r.id(), (None, None))[1] for r in reps) if k]
        return None, (kinds[0] if kinds else None)

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


# ---------------------------------------------------------------------- vertex extent

def _face_points(faces: Sequence[Entity]) -> Iterator[Sequence[float]]:
    for face in faces or ():
        for bound in get(face, "Bounds") or ():
            loop = get(bound, "Bound")
            if loop is None:
                continue
            if loop.is_a("IfcPolyLoop"):
                for p in loop.Polygon or ():
                    yield p.Coordinates
            elif loop.is_a("IfcEdgeLoop"):
                for edge in loop.EdgeList or ():
                    element = get(edge, "EdgeElement") or edge
                    for v in (get(element, "EdgeStart"), get(element, "EdgeEnd")):
                        geometry = get(v, "VertexGeometry") if v is not None else None
                        if geometry is not None and geometry.is_a("IfcCartesianPoint"):
                            yield geometry.Coordinates


def _item_points(item: Entity, level: int) -> tuple[list[Sequence[float]], str | None]:
    """Vertices of one body item in its representation's coordinates, and the item kind."""
    if item is None or level > _MAX_DEPTH:
        return [], None
    if item.is_a("IfcTriangulatedFaceSet") or item.is_a("IfcPolygonalFaceSet"):
        coords = get(item, "Coordinates")
        return list(get(coords, "CoordList") or ()), item.is_a()
    if item.is_a("IfcManifoldSolidBrep"):  # faceted and advanced Brep (voids lie inside)
        kind = "IfcFacetedBrep" if item.is_a("IfcFacetedBrep") else item.is_a()
        return list(_face_points(get(get(item, "Outer"), "CfsFaces"))), kind
    if item.is_a("IfcShellBasedSurfaceModel") or item.is_a("IfcFaceBasedSurfaceModel"):
        shells = getattr(item, "SbsmBoundary", None) or getattr(item, "FbsmFaces", None) or ()
        return [p for shell in shells for p in _face_points(get(shell, "CfsFaces"))], item.is_a()
    if item.is_a("IfcBooleanResult"):
        return _item_points(item.FirstOperand, level + 1)
    if item.is_a("IfcMappedItem"):
        import ifcopenshell.util.placement

        source = item.MappingSource
        mapped = source.MappedRepresentation if source is not None else None
        points: list[Sequence[float]] = []
        kind = None
        for sub in (mapped.Items if mapped is not None else ()) or ():
            sub_points, sub_kind = _item_points(sub, level + 1)
            points += sub_points
            kind = kind or sub_kind
        if not points:
            return [], kind
        matrix = np.asarray(ifcopenshell.util.placement.get_mappeditem_transformation(item),
                            dtype=float)
        xyz = _as_xyz(points)
        moved = xyz @ matrix[:3, :3].T + matrix[:3, 3]
        return [tuple(p) for p in moved.tolist()], kind
    return [], None


def _as_xyz(points: Sequence[Sequence[float]]) -> np.ndarray:
    xyz = np.zeros((len(points), 3))
    for i, p in enumerate(points):
        c = [float(v) for v in p][:3]
        xyz[i, : len(c)] = c
    return xyz


def _vertex_extent(rep: Entity) -> tuple[float | None, str | None]:
    """Extent along z of every vertex of ``rep`` (model length units) and the first item kind.

    Args:
        rep: a body shape representation.

    Returns:
        (max z - min z, or None when there are fewer than two vertices or no extent; the
        item kind such as ``IfcFacetedBrep``, or None when no item has vertices).
    """
    points: list[Sequence[float]] = []
    kind = None
    try:
        for item in get(rep, "Items") or ():
            item_points, item_kind = _item_points(item, 0)
            points += item_points
            kind = kind or item_kind
    except (AttributeError, RuntimeError, TypeError, ValueError):
        return None, kind
    if len(points) < 2:
        return None, kind
    z = _as_xyz(points)[:, 2]
    extent = float(z.max() - z.min())
    return (extent if math.isfinite(extent) and extent > 0 else None), kind
