"""Where a model's storeys stand and which project it is: what a BCF viewpoint refers to.

BCF viewpoints (docs/design.md §3, BCF) place their camera in the model's own coordinate
system; the column's plan position comes from the report, its height from its storey here.
"""

from __future__ import annotations

import math

import ifcopenshell
import ifcopenshell.util.placement

from stanchion.ifc_bridge.access import Entity, get


def _storey_z(storey: Entity) -> float | None:
    """World z of a storey's placement origin, else its Elevation; None when neither reads."""
    placement = get(storey, "ObjectPlacement")
    if placement is not None:
        try:
            z = float(ifcopenshell.util.placement.get_local_placement(placement)[2, 3])
            if math.isfinite(z):
                return z
        except Exception:  # a grid or linear placement this reader does not evaluate
            pass
    elevation = get(storey, "Elevation")
    if isinstance(elevation, int | float) and math.isfinite(elevation):
        return float(elevation)
    return None


def storey_elevations(model: ifcopenshell.file) -> dict[str, float]:
    """The height of every named storey, in the model's length unit.

    The storey's placement origin in world coordinates (``IfcBuildingStorey.Elevation`` when
    the placement cannot be evaluated); a name used by several storeys keeps the first in
    file order, the name the report's ``storey`` field carries.

    Args:
        model: an opened model.

    Returns:
        Storey name to height.
    """
    out: dict[str, float] = {}
    for storey in model.by_type("IfcBuildingStorey"):
        name = get(storey, "Name") or ""
        if name and name not in out:
            z = _storey_z(storey)
            if z is not None:
                out[name] = z
    return out


def project_guid(model: ifcopenshell.file) -> str | None:
    """The GlobalId of the model's IfcProject (None when there is not exactly one)."""
    projects = model.by_type("IfcProject")
    return str(get(projects[0], "GlobalId")) if len(projects) == 1 else None
