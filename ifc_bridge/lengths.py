"""Member length of a column, from the first source that gives one.

Order (``length_source`` names the one used):

1. ``axis`` -- length of the Axis representation's curve;
2. ``extrusion`` -- depth of the Body's (longest) IfcExtrudedAreaSolid, i.e. its length along
   the extrusion direction, which is the column's axis;
3. ``quantity`` -- ``Qto_ColumnBaseQuantities.Length`` (IFC4+) / ``BaseQuantities`` Length
   (IFC2X3);
4. ``analytical`` -- edge length of the IfcStructuralCurveMember(s) tied to the column
   (summed when the column is split into several analysis members);
5. ``body`` -- for a body that is not an extrusion (Brep, face set): the extent of its
   vertices along the element's local z axis (it includes whatever the body models beyond
   the shaft, such as base plates; the member notes it);
6. ``none`` -- the member is not checked unless Stanchion_Design gives all three unbraced
   lengths.

When the axis and the extrusion disagree by more than 2 %, the member notes it.
"""

from __future__ import annotations

import math

from stanchion.ifc_bridge.access import Entity
from stanchion.ifc_bridge.representation import ShapeInfo, distance

DISAGREE = 0.02


def _edge_length(edge: Entity) -> float | None:
    try:
        if edge.is_a("IfcOrientedEdge"):
            edge = edge.EdgeElement
        a, b = edge.EdgeStart, edge.EdgeEnd
        if not (a.is_a("IfcVertexPoint") and b.is_a("IfcVertexPoint")):
            return None
        return distance(a.VertexGeometry.Coordinates, b.VertexGeometry.Coordinates)
    except (AttributeError, RuntimeError, TypeError):
        return None


def analytical_length(members: list[Entity]) -> float | None:
    """Summed edge length of structural curve members (model length units)."""
    total = 0.0
    for member in members:
        shape = member.Representation
        for rep in (shape.Representations if shape is not None else ()) or ():
            for item in rep.Items or ():
                if item.is_a("IfcEdge"):
                    total += _edge_length(item) or 0.0
    return total if total > 0 else None


def choose_length(
    shape: ShapeInfo,
    quantity_in: float | None,
    analytical_model: float | None,
    length_factor: float,
) -> tuple[float, str, list[str]]:
    """Pick the member length.

    Args:
        shape: representation facts.
        quantity_in: base-quantity length, in (already converted).
        analytical_model: analysis member length, model units.
        length_factor: model length unit -> inch.

    Returns:
        (length in inches or NaN, source name, member notes).
    """
    notes: list[str] = []
    main = shape.main
    extrusion = main.depth * length_factor if main is not None else None
    if extrusion is not None and not (math.isfinite(extrusion) and extrusion > 0):
        extrusion = None
    axis = shape.axis_length * length_factor if shape.axis_length else None
    if axis is not None:
        if extrusion is not None and abs(axis - extrusion) > DISAGREE * axis:
            notes.append(f"axis length {axis:.4g} in and extrusion depth {extrusion:.4g} in "
                         "differ; the axis length is used")
        return axis, "axis", notes
    if extrusion is not None:
        return extrusion, "extrusion", notes
    if quantity_in is not None:
        return quantity_in, "quantity", notes
    if analytical_model is not None:
        return analytical_model * length_factor, "analytical", notes
    if shape.body_extent is not None:
        extent = shape.body_extent * length_factor
        notes.append(f"length {extent:.4g} in is the extent of the {shape.body_kind or 'body'} "
                     "along the column's local z axis (it includes anything modelled beyond "
                     "the shaft, such as base plates): review it, or give a Length quantity "
                     "or Stanchion_Design unbraced lengths")
        return extent, "body", notes
    return math.nan, "none", notes
