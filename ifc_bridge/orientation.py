"""The plan rotation of a column's section (docs/design.md §5 "What is read").

The angle, in degrees counter-clockwise from the world plan x axis, of the section's x axis
(the axis parallel to the flanges of an I shape, a channel or a tee: the major axis AISC
calls x, perpendicular to the web) as the model places it:

* the element's placement: the plan direction of its ``ObjectPlacement``'s x axis (the
  ``RefDirection`` of each ``IfcAxis2Placement3D`` of the chain, made perpendicular to its
  ``Axis``), through the parent placements (:func:`stanchion.ifc_bridge.grids.placement_matrix`);
* plus the Body's longest ``IfcExtrudedAreaSolid`` (through ``IfcMappedItem``: the mapping
  origin's and target's x axis; the first operand of a boolean result): its ``Position``'s x
  axis in the element's coordinates and its profile's ``Position`` (``IfcAxis2Placement2D``)
  -- mirrored when the extrusion's z axis points down;
* plus 90° for a rectangle or rectangular tube whose ``XDim`` is the larger: the reader
  takes the larger outside dimension as the depth, measured across the x axis.

NaN when the placement cannot be evaluated or its x axis is (nearly) vertical.  An outline
profile is turned to its principal axes by the reader (§8); its rotation is that of the
profile's own drawing frame.
"""

from __future__ import annotations

import math

import numpy as np

from stanchion.engine.arrays import FloatArray
from stanchion.ifc_bridge.access import Entity, get
from stanchion.ifc_bridge.grids import placement_matrix

#: Representation items followed before giving up (mapped items, booleans).
_MAX_DEPTH = 8


def _ratios(direction: Entity | None, size: int) -> list[float] | None:
    if direction is None:
        return None
    values = [float(v) for v in get(direction, "DirectionRatios") or ()]
    return (values + [0.0] * size)[:size] if values else None


def _x_angle_3d(placement: Entity | None) -> tuple[float, bool]:
    """(angle of an IfcAxis2Placement3D's x axis in its parent's plan, its z points down)."""
    if placement is None:
        return 0.0, False
    axis = _ratios(get(placement, "Axis"), 3) if placement.is_a("IfcAxis2Placement3D") else None
    ref = _ratios(get(placement, "RefDirection"), 3)
    z = np.array(axis if axis else (0.0, 0.0, 1.0))
    z = z / (np.linalg.norm(z) or 1.0)
    x = np.array(ref if ref else (1.0, 0.0, 0.0))
    x = x - float(x @ z) * z
    return math.degrees(math.atan2(x[1], x[0])), bool(z[2] < 0)


def _x_angle_2d(placement: Entity | None) -> float:
    ref = _ratios(get(placement, "RefDirection"), 2) if placement is not None else None
    return math.degrees(math.atan2(ref[1], ref[0])) if ref else 0.0


def _extrusions(item: Entity | None, angle: float, found: list[tuple[float, float, Entity]],
                level: int) -> None:
    """(depth, angle of the profile x axis in the element's plan, profile) of each solid."""
    if item is None or level > _MAX_DEPTH:
        return
    if item.is_a("IfcExtrudedAreaSolid"):
        pos, down = _x_angle_3d(get(item, "Position"))
        profile = get(item, "SweptArea")
        inner = _x_angle_2d(get(profile, "Position") if profile is not None else None)
        found.append((float(get(item, "Depth") or 0.0), angle + pos + (-inner if down
                                                                         else inner), profile))
    elif item.is_a("IfcMappedItem"):
        source = get(item, "MappingSource")
        origin = _x_angle_3d(get(source, "MappingOrigin"))[0] if source is not None else 0.0
        target = get(item, "MappingTarget")
        axis1 = _ratios(get(target, "Axis1"), 2) if target is not None else None
        turn = math.degrees(math.atan2(axis1[1], axis1[0])) if axis1 else 0.0
        mapped = get(source, "MappedRepresentation") if source is not None else None
        for sub in (get(mapped, "Items") if mapped is not None else None) or ():
            _extrusions(sub, angle + origin + turn, found, level + 1)
    elif item.is_a("IfcBooleanResult"):
        _extrusions(get(item, "FirstOperand"), angle, found, level + 1)


def _body_items(element: Entity) -> list[Entity]:
    shape = get(element, "Representation")
    for rep in (get(shape, "Representations") if shape is not None else None) or ():
        if get(rep, "RepresentationIdentifier") == "Body":
            return list(get(rep, "Items") or ())
    return []


def _rectangle_turn(profile: Entity | None) -> float:
    if profile is not None and profile.is_a("IfcRectangleProfileDef"):
        x, y = get(profile, "XDim"), get(profile, "YDim")
        if x is not None and y is not None and float(x) > float(y):
            return 90.0
    return 0.0


def _placement_x(placement: Entity, parents: dict[int, FloatArray]) -> FloatArray:
    """The world direction of a placement's x axis (parent matrices cached by id)."""
    parent = get(placement, "PlacementRelTo") if placement.is_a("IfcLocalPlacement") else None
    if placement.is_a("IfcLocalPlacement"):
        own = get(placement, "RelativePlacement")
        ref = _ratios(get(own, "RefDirection"), 3) if own is not None else None
        axis = _ratios(get(own, "Axis"), 3) if own is not None and own.is_a(
            "IfcAxis2Placement3D") else None
        z = np.array(axis if axis else (0.0, 0.0, 1.0))
        z = z / (np.linalg.norm(z) or 1.0)
        x = np.array(ref if ref else (1.0, 0.0, 0.0))
        x = x - float(x @ z) * z
        if parent is None:
            return x
        key = parent.id()
        if key not in parents:
            parents[key] = placement_matrix(parent)[:3, :3]
        return np.asarray(parents[key] @ x, dtype=float)
    return np.asarray(placement_matrix(placement)[:3, 0], dtype=float)


def plan_rotation(element: Entity, parents: dict[int, FloatArray] | None = None) -> float:
    """The plan rotation of ``element``'s section, degrees in [0, 360) (module notes).

    Args:
        element: a column (any product with an ``ObjectPlacement``).
        parents: a cache of parent placements' rotations (one per model read), or None.

    Returns:
        The angle, or NaN when it cannot be told.
    """
    placement = get(element, "ObjectPlacement")
    if placement is None:
        return math.nan
    try:
        with np.errstate(all="ignore"):
            x = _placement_x(placement, {} if parents is None else parents)
        if not np.isfinite(x).all() or math.hypot(x[0], x[1]) < 1e-6:
            return math.nan
        angle = math.degrees(math.atan2(x[1], x[0]))
        found: list[tuple[float, float, Entity]] = []
        for item in _body_items(element):
            _extrusions(item, 0.0, found, 0)
    except Exception:  # noqa: BLE001 - a placement or body this reader does not evaluate
        return math.nan
    if found:
        _, local, profile = max(found, key=lambda f: f[0])
        angle += local + _rectangle_turn(profile)
    return round(angle % 360.0, 4) % 360.0
