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
from stanchion.ifc_bridge.access import Entity, get, get_opt
from stanchion.ifc_bridge.grids import placement_matrix


def _ratios(direction: Entity | None, size: int) -> list[float] | None:
    if direction is None:
        return None
    values = [float(v) for v in get_opt(direction, "DirectionRatios") or ()]
    return (values + [0.0] * size)[:size] if values else None


def _x_axis(placement: Entity | None) -> tuple[float, float, float, bool]:
    """An IfcAxis2Placement's x axis (made perpendicular to its z) and whether z points down."""
    if placement is None:
        return 1.0, 0.0, 0.0, False
    axis = _ratios(get_opt(placement, "Axis"), 3) if placement.is_a(
        "IfcAxis2Placement3D") else None
    ref = _ratios(get_opt(placement, "RefDirection"), 3)
    zx, zy, zz = axis if axis else (0.0, 0.0, 1.0)
    norm = math.sqrt(zx * zx + zy * zy + zz * zz) or 1.0
    zx, zy, zz = zx / norm, zy / norm, zz / norm
    x, y, z = ref if ref else (1.0, 0.0, 0.0)
    dot = x * zx + y * zy + z * zz
    return x - dot * zx, y - dot * zy, z - dot * zz, zz < 0


def _x_angle_3d(placement: Entity | None) -> tuple[float, bool]:
    """(angle of an IfcAxis2Placement3D's x axis in its parent's plan, its z points down)."""
    x, y, _, down = _x_axis(placement)
    return math.degrees(math.atan2(y, x)), down


def _x_angle_2d(placement: Entity | None) -> float:
    ref = _ratios(get_opt(placement, "RefDirection"), 2) if placement is not None else None
    return math.degrees(math.atan2(ref[1], ref[0])) if ref else 0.0


def solid_angle(solid: Entity) -> float:
    """The plan angle of an IfcExtrudedAreaSolid's profile x axis in its item's coordinates.

    Its ``Position``'s x axis plus its profile's ``Position`` angle (mirrored when the
    extrusion's z axis points down), degrees.

    Args:
        solid: the IfcExtrudedAreaSolid.
    """
    try:
        pos, down = _x_angle_3d(get_opt(solid, "Position"))
        profile = get_opt(solid, "SweptArea")
        inner = _x_angle_2d(get_opt(profile, "Position") if profile is not None else None)
    except (AttributeError, TypeError, ValueError, IndexError, RuntimeError):
        return math.nan  # a damaged placement: the rotation is not known
    return pos - inner if down else pos + inner


def mapping_turn(item: Entity) -> float:
    """The plan angle an IfcMappedItem turns its items by: origin and target x axes, degrees.

    Args:
        item: the IfcMappedItem.
    """
    try:
        source = get_opt(item, "MappingSource")
        origin = _x_angle_3d(get_opt(source, "MappingOrigin"))[0] if source is not None else 0.0
        target = get_opt(item, "MappingTarget")
        axis1 = _ratios(get_opt(target, "Axis1"), 2) if target is not None else None
    except (AttributeError, TypeError, ValueError, IndexError, RuntimeError):
        return math.nan  # a damaged mapping: the rotation is not known
    return origin + (math.degrees(math.atan2(axis1[1], axis1[0])) if axis1 else 0.0)


def _rectangle_turn(profile: Entity | None) -> float:
    if profile is not None and profile.is_a("IfcRectangleProfileDef"):
        x, y = get(profile, "XDim"), get(profile, "YDim")
        if x is not None and y is not None and float(x) > float(y):
            return 90.0
    return 0.0


def _placement_x(placement: Entity, parents: dict[int, FloatArray]) -> tuple[float, ...]:
    """The world direction of a placement's x axis (parent matrices cached by id)."""
    if not placement.is_a("IfcLocalPlacement"):
        return tuple(float(v) for v in placement_matrix(placement)[:3, 0])
    x = _x_axis(get(placement, "RelativePlacement"))[:3]
    parent = get(placement, "PlacementRelTo")
    if parent is None:
        return x
    key = parent.id()
    if key not in parents:
        parents[key] = placement_matrix(parent)[:3, :3]
    m = parents[key]
    return tuple(float(m[r, 0] * x[0] + m[r, 1] * x[1] + m[r, 2] * x[2]) for r in range(3))


def plan_rotation(element: Entity, solid: tuple[Entity | None, float] | None = None,
                  parents: dict[int, FloatArray] | None = None) -> float:
    """The plan rotation of ``element``'s section, degrees in [0, 360) (module notes).

    Args:
        element: a column (any product with an ``ObjectPlacement``).
        solid: (profile, angle) of the Body's longest extrusion in the element's
            coordinates (:attr:`stanchion.ifc_bridge.representation.Extrusion.angle`), or
            None without one.
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
    except Exception:  # noqa: BLE001 - a placement this reader does not evaluate, damage
        return math.nan
    if not all(math.isfinite(v) for v in x) or math.hypot(x[0], x[1]) < 1e-6:
        return math.nan
    angle = math.degrees(math.atan2(x[1], x[0]))
    if solid is not None:
        profile, local = solid
        angle += local + _rectangle_turn(profile)
    return round(angle % 360.0, 4) % 360.0
