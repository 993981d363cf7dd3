"""Slab footprints per storey, for the gravity load takedown (docs/design.md §5 "Load takedown").

:func:`storey_slabs` gives, for every ``IfcBuildingStorey``, its elevation and the plan
footprints and modelled thicknesses of the ``IfcSlab`` elements it holds -- contained in it
(``IfcRelContainedInSpatialStructure``), aggregated into it, or aggregated into an element
it holds (an ``IfcRoof`` of slabs) -- in the **model's length unit**, world plan
coordinates.  Profiles are read directly (ifcopenshell.geom was measured to build none of the
13 slabs of a public house model; the profiles themselves read fine):

* the Body's ``IfcExtrudedAreaSolid`` items (through ``IfcMappedItem``; an
  ``IfcBooleanClippingResult`` / ``IfcBooleanResult`` DIFFERENCE by its first operand, with a
  note: the clipped part stays in the footprint, which errs towards more load); each item is
  one piece of the slab (stacked layers add their thicknesses, pieces side by side each
  their own);
* profiles ``IfcRectangleProfileDef`` (with its Position), ``IfcArbitraryClosedProfileDef``
  and ``IfcArbitraryProfileDefWithVoids`` (curves by :func:`ifc_bridge.outlines.outline_of`;
  inner curves are holes);
* placed by the slab's ObjectPlacement and the extrusion's Position; the extrusion must be
  vertical and its profile plane horizontal (within 1e-3 rad): the thickness is its Depth;
* openings: ``IfcOpeningElement`` voiding the slab (``IfcRelVoidsElement``) whose Body is a
  vertical extrusion through the whole thickness are subtracted; an opening that stops
  inside the slab (a recess) is not, nor one whose Body is not read -- both with a note
  (the slab's load over it is kept, which errs towards more load).

A slab whose footprint cannot be read gives a *problem* naming it and why (the takedown then
gives the columns of that level and those below it a reason; nothing is guessed).

:func:`vertical_extents` gives the world z of the bottom and top of columns' Body
extrusions: a column carries the storey whose elevation is nearest its top
(``service.takedown``; docs/design.md §5).
"""

from __future__ import annotations

import math
from collections.abc import Sequence
from dataclasses import dataclass, field

import ifcopenshell
import ifcopenshell.util.element
import ifcopenshell.util.placement
import numpy as np

from stanchion.engine.arrays import FloatArray
from stanchion.ifc_bridge.access import Entity, get, get_opt
from stanchion.ifc_bridge.outlines import outline_of, plane_angle_scale

#: Largest angle, radians, between an extrusion (or a profile's normal) and the vertical
#: for the slab to be read as a vertical extrusion (common practice, no source).
VERTICAL_TOL = 1e-3
#: Depth of the representation tree followed (mapped items, booleans) before giving up.
_MAX_DEPTH = 8


@dataclass(frozen=True)
class SlabPart:
    """One extruded piece of a slab, model length unit, world plan coordinates.

    Attributes:
        global_id: the slab's GlobalId.
        name: the slab's Name (or GlobalId).
        outer: (n, 2) outer boundary.
        holes: (m, 2) boundaries of the profile's voids.
        thickness: the extrusion's depth.
        bottom: world z of the piece's underside.
    """

    global_id: str
    name: str
    outer: FloatArray
    holes: tuple[FloatArray, ...]
    thickness: float
    bottom: float


@dataclass
class StoreySlabs:
    """The slabs of one storey.

    Attributes:
        name: the storey's Name.
        global_id: the storey's GlobalId.
        elevation: world z of the storey (its placement, else its Elevation), model units.
        parts: the readable slab pieces.
        openings: (n, 2) footprints of openings through the slabs.
        problems: slabs whose footprint cannot be read, each "slab NAME (GlobalId): why".
        notes: what was read with a caveat (clipped bodies, recesses, unread openings).
    """

    name: str
    global_id: str
    elevation: float
    parts: list[SlabPart] = field(default_factory=list)
    openings: list[FloatArray] = field(default_factory=list)
    problems: list[str] = field(default_factory=list)
    notes: list[str] = field(default_factory=list)


class SlabError(ValueError):
    """A slab or opening body that cannot be read as vertical extrusions; the message says why."""


@dataclass(frozen=True)
class _Extrusion:
    """A vertical extrusion in world coordinates."""

    outer: FloatArray
    holes: tuple[FloatArray, ...]
    depth: float
    bottom: float
    top: float


def _body(product: Entity) -> list[Entity]:
    """The items of the product's Body representation(s)."""
    shape = get_opt(product, "Representation")
    if shape is None:
        return []
    items: list[Entity] = []
    for rep in get(shape, "Representations") or ():
        if get(rep, "RepresentationIdentifier") == "Body":
            items.extend(get(rep, "Items") or ())
    return items


def _placement(product: Entity) -> FloatArray:
    placement = get_opt(product, "ObjectPlacement")
    if placement is None:
        return np.eye(4)
    return np.asarray(ifcopenshell.util.placement.get_local_placement(placement), dtype=float)


def _is_vertical(v: FloatArray) -> bool:
    norm = float(np.linalg.norm(v))
    return norm > 0 and abs(float(v[2])) / norm >= math.cos(VERTICAL_TOL)


def _rectangle(profile: Entity) -> tuple[FloatArray, tuple[FloatArray, ...]]:
    hx, hy = float(get(profile, "XDim")) / 2.0, float(get(profile, "YDim")) / 2.0
    if not (hx > 0 and hy > 0):
        raise SlabError(f"IfcRectangleProfileDef of {2 * hx:g} x {2 * hy:g}")
    pts = np.array([(-hx, -hy), (hx, -hy), (hx, hy), (-hx, hy)])
    position = get_opt(profile, "Position")
    if position is not None:
        m = np.asarray(ifcopenshell.util.placement.get_axis2placement(position), dtype=float)
        pts = pts @ m[:2, :2].T + m[:2, 3]
    return pts, ()


def _profile(model: ifcopenshell.file, profile: Entity, angle: float
             ) -> tuple[FloatArray, tuple[FloatArray, ...]]:
    """Outer boundary and holes of a profile in its own plane (model length unit)."""
    if profile.is_a("IfcRectangleProfileDef") and not profile.is_a(
            "IfcRectangleHollowProfileDef"):
        return _rectangle(profile)
    if profile.is_a("IfcArbitraryClosedProfileDef"):
        outline, why = outline_of(model, profile, angle)
        if outline is None:
            raise SlabError(why or "profile outline not read")
        return np.asarray(outline.outer, float), tuple(np.asarray(v, float)
                                                     for v in outline.voids)
    raise SlabError(f"profile {profile.is_a()} is not read for slabs")


def _extrusions(model: ifcopenshell.file, item: Entity, frame: FloatArray, angle: float | None,
                notes: list[str], depth: int = 0) -> list[_Extrusion]:
    """The vertical extrusions of one Body item placed by ``frame`` (4 x 4).

    ``angle`` None: the profile is not read (only the heights are wanted).
    """
    if depth > _MAX_DEPTH:
        raise SlabError("representation nested too deeply")
    if item.is_a("IfcMappedItem"):
        m = np.asarray(ifcopenshell.util.placement.get_mappeditem_transformation(item), float)
        source = get(get(item, "MappingSource"), "MappedRepresentation")
        return [e for sub in get(source, "Items") or ()
                for e in _extrusions(model, sub, frame @ m, angle, notes, depth + 1)]
    if item.is_a("IfcBooleanResult"):
        if get(item, "Operator") != "DIFFERENCE":
            raise SlabError(f"{item.is_a()} {get(item, 'Operator')} is not read")
        notes.append(f"{item.is_a()}: the footprint of its first operand is used (the part "
                     "cut away stays in the slab's load)")
        return _extrusions(model, get(item, "FirstOperand"), frame, angle, notes, depth + 1)
    if not item.is_a("IfcExtrudedAreaSolid") or item.is_a("IfcExtrudedAreaSolidTapered"):
        raise SlabError(f"the Body is an {item.is_a()}, not a vertical extrusion")
    position = get_opt(item, "Position")
    m = frame @ (np.asarray(ifcopenshell.util.placement.get_axis2placement(position), float)
                 if position is not None else np.eye(4))
    direction = m[:3, :3] @ np.asarray(get(get(item, "ExtrudedDirection"), "DirectionRatios"),
                                       float)[:3]
    if not _is_vertical(direction) or not _is_vertical(m[:3, 2]):
        raise SlabError("the Body's extrusion is not vertical (a sloped or tilted slab)")
    outer, holes = ((np.zeros((0, 2)), ()) if angle is None else
                    _profile(model, get(item, "SweptArea"), angle))
    depth_value = float(get(item, "Depth"))
    if not depth_value > 0:
        raise SlabError(f"the extrusion's depth is {depth_value:g}")

    def world(points: FloatArray) -> FloatArray:
        out: FloatArray = points @ m[:2, :2].T + m[:2, 3]
        return out

    z0 = float(m[2, 3])
    z1 = z0 + depth_value * math.copysign(1.0, float(direction[2]))
    return [_Extrusion(world(outer), tuple(world(h) for h in holes), depth_value,
                       min(z0, z1), max(z0, z1))]


def _product_extrusions(model: ifcopenshell.file, product: Entity, angle: float | None,
                        notes: list[str]) -> list[_Extrusion]:
    items = _body(product)
    if not items:
        raise SlabError("no Body representation")
    frame = _placement(product)
    return [e for item in items for e in _extrusions(model, item, frame, angle, notes)]


def _label(element: Entity) -> str:
    gid = get(element, "GlobalId")
    name = get(element, "Name")
    return f"{name} ({gid})" if name else gid


def _openings(model: ifcopenshell.file, slab: Entity, pieces: Sequence[_Extrusion],
              angle: float, notes: list[str]) -> list[FloatArray]:
    """Footprints of the openings through ``slab`` (notes for those not subtracted)."""
    out: list[FloatArray] = []
    bottom = min(p.bottom for p in pieces)
    top = max(p.top for p in pieces)
    tol = 1e-3 * max(top - bottom, 1e-9)
    for rel in getattr(slab, "HasOpenings", ()) or ():
        opening = get(rel, "RelatedOpeningElement")
        what = f"opening {_label(opening)} of slab {_label(slab)}"
        try:
            solids = _product_extrusions(model, opening, angle, [])
        except SlabError as exc:
            notes.append(f"{what} not subtracted ({exc}); the slab's load over it is kept")
            continue
        for s in solids:
            if s.bottom <= bottom + tol and s.top >= top - tol:
                out.append(s.outer)
            else:
                notes.append(f"{what} does not go through the slab (a recess): not "
                             "subtracted")
    return out


def _slab_storey(slab: Entity) -> Entity | None:
    """The storey holding a slab: its container, or that of what it is aggregated into."""
    seen = 0
    element: Entity | None = slab
    while element is not None and seen < _MAX_DEPTH:
        container: Entity = ifcopenshell.util.element.get_container(element)
        if container is not None:
            return container if container.is_a("IfcBuildingStorey") else None
        parent: Entity = ifcopenshell.util.element.get_aggregate(element)
        if parent is not None and parent.is_a("IfcBuildingStorey"):
            return parent
        element = parent
        seen += 1
    return None


def storey_slabs(model: ifcopenshell.file) -> list[StoreySlabs]:
    """Every storey of the model with its slabs' footprints (module notes), by elevation.

    Args:
        model: an opened model (not modified).

    Returns:
        One :class:`StoreySlabs` per ``IfcBuildingStorey``, lowest first; slabs held by no
        storey are left out.
    """
    storeys: dict[int, StoreySlabs] = {}
    for storey in model.by_type("IfcBuildingStorey"):
        storeys[storey.id()] = StoreySlabs(
            name=get(storey, "Name") or get(storey, "GlobalId"),
            global_id=get(storey, "GlobalId"),
            elevation=float(ifcopenshell.util.placement.get_storey_elevation(storey)))
    angle = plane_angle_scale(model)
    for slab in model.by_type("IfcSlab"):
        held = _slab_storey(slab)
        if held is None or held.id() not in storeys:
            continue
        into = storeys[held.id()]
        if not _body(slab) and ifcopenshell.util.element.get_parts(slab):
            continue  # an element slab: its parts (IfcSlab too) are read
        notes: list[str] = []
        try:
            pieces = _product_extrusions(model, slab, angle, notes)
        except (SlabError, ValueError, AttributeError, TypeError, IndexError) as exc:
            into.problems.append(f"slab {_label(slab)}: {exc}")
            continue
        into.notes.extend(f"slab {_label(slab)}: {n}" for n in dict.fromkeys(notes))
        gid, name = get(slab, "GlobalId"), get(slab, "Name") or get(slab, "GlobalId")
        into.parts.extend(SlabPart(gid, name, p.outer, p.holes, p.depth, p.bottom)
                          for p in pieces)
        into.openings.extend(_openings(model, slab, pieces, angle, into.notes))
    return sorted(storeys.values(), key=lambda s: s.elevation)


def vertical_extents(model: ifcopenshell.file, global_ids: Sequence[str]
                     ) -> tuple[FloatArray, FloatArray]:
    """World z of the bottom and top of each element's Body, model length unit.

    From the Body's vertical extrusions (as for slabs, profiles not read): the lowest
    bottom and the highest top.  NaN where the element or such a Body is not found.

    Args:
        model: the model.
        global_ids: the elements' GlobalIds (members of the member table).
    """
    bottom = np.full(len(global_ids), np.nan)
    top = np.full(len(global_ids), np.nan)
    for i, gid in enumerate(global_ids):
        try:
            with np.errstate(all="ignore"):
                solids = _product_extrusions(model, model.by_guid(str(gid)), None, [])
        except Exception:  # noqa: S112 - no element, or no vertical extrusion: unknown
            continue
        bottom[i] = min(s.bottom for s in solids)
        top[i] = max(s.top for s in solids)
    return bottom, top


__all__ = ["SlabPart", "StoreySlabs", "storey_slabs", "vertical_extents"]
