"""A synthetic model for the load takedown tests: a regular grid of bays, three slab levels.

Plan (inches): grid lines x = 0, 300, 600 (25 ft bays) and y = 0, 360, 720 (30 ft bays);
nine W10X49 columns (A992, Fy 50 ksi) per level, stacked three high, each 144 in (12 ft).
Storeys: ``Level 1`` at 0 (the columns' base, no slab), ``Level 2`` at 144, ``Level 3`` at
288, ``Roof`` at 432; each of the upper three holds one slab, 6 in thick, whose top is at the
storey's elevation, spanning x = 0 .. 660 (a 60 in cantilever east of line x = 600) and
y = 0 .. 720.  The ``Level 2`` slab has a stair opening 60 x 100 in (x = 320 .. 380,
y = 400 .. 500) inside the interior column's cell.  The columns of ``Level 1`` (base at 0,
top at 144) carry ``Level 2``; those of ``Level 2`` carry ``Level 3``; those of ``Level 3``
carry the ``Roof``.  No loads anywhere.
"""

from __future__ import annotations

import ifcopenshell
import ifcopenshell.api.root
import ifcopenshell.api.spatial

from tests.ifc_bridge.conftest import ModelBuilder

XS = (0.0, 300.0, 600.0)
YS = (0.0, 360.0, 720.0)
CANTILEVER = 60.0
HEIGHT = 144.0
THICKNESS = 6.0
OPENING = (320.0, 400.0, 380.0, 500.0)  # x0, y0, x1, y1 in the Level 2 slab
#: (storey name, elevation in) -- the slabs' tops are at the elevation.
STOREYS = (("Level 1", 0.0), ("Level 2", 144.0), ("Level 3", 288.0), ("Roof", 432.0))


def _placement(b: ModelBuilder, x: float, y: float, z: float):
    m = b.model
    point = m.create_entity("IfcCartesianPoint", (b.L(x), b.L(y), b.L(z)))
    return m.create_entity("IfcLocalPlacement", RelativePlacement=m.create_entity(
        "IfcAxis2Placement3D", Location=point))


def _extrusion(b: ModelBuilder, corners: list[tuple[float, float]], depth: float,
               z: float = 0.0):
    """A vertical extrusion of a polygon (in) by ``depth`` (in), starting at local ``z``."""
    m = b.model
    pts = [m.create_entity("IfcCartesianPoint", (b.L(x), b.L(y))) for x, y in corners]
    curve = m.create_entity("IfcPolyline", pts + [pts[0]])
    profile = m.create_entity("IfcArbitraryClosedProfileDef", ProfileType="AREA",
                              OuterCurve=curve)
    position = m.create_entity("IfcAxis2Placement3D", Location=m.create_entity(
        "IfcCartesianPoint", (0.0, 0.0, b.L(z))))
    solid = m.create_entity("IfcExtrudedAreaSolid", SweptArea=profile, Position=position,
                            ExtrudedDirection=m.create_entity("IfcDirection", (0.0, 0.0, 1.0)),
                            Depth=b.L(depth))
    return m.create_entity("IfcShapeRepresentation", ContextOfItems=b.body,
                           RepresentationIdentifier="Body", RepresentationType="SweptSolid",
                           Items=[solid])


def _shape(b: ModelBuilder, rep):
    return b.model.create_entity("IfcProductDefinitionShape", Representations=[rep])


def slab(b: ModelBuilder, storey: str, corners: list[tuple[float, float]], top: float,
         thickness: float = THICKNESS, name: str = "slab"):
    """An IfcSlab in ``storey`` whose top is at ``top`` (in), extruded upwards from below."""
    s = ifcopenshell.api.root.create_entity(b.model, ifc_class="IfcSlab", name=name)
    s.ObjectPlacement = _placement(b, 0.0, 0.0, top - thickness)
    s.Representation = _shape(b, _extrusion(b, corners, thickness))
    ifcopenshell.api.spatial.assign_container(b.model, products=[s],
                                              relating_structure=b.storey(storey))
    return s


def opening(b: ModelBuilder, host, box: tuple[float, float, float, float], bottom: float,
            depth: float):
    """An IfcOpeningElement voiding ``host``: a box (x0, y0, x1, y1) from ``bottom`` up."""
    x0, y0, x1, y1 = box
    o = ifcopenshell.api.root.create_entity(b.model, ifc_class="IfcOpeningElement",
                                            name="stair")
    o.ObjectPlacement = _placement(b, 0.0, 0.0, bottom)
    o.Representation = _shape(b, _extrusion(b, [(x0, y0), (x1, y0), (x1, y1), (x0, y1)],
                                            depth))
    rel = ifcopenshell.api.root.create_entity(b.model, ifc_class="IfcRelVoidsElement")
    rel.RelatingBuildingElement = host
    rel.RelatedOpeningElement = o
    return o


def outline() -> list[tuple[float, float]]:
    """The slab outline of every level (in): the grid plus the east cantilever."""
    east = XS[-1] + CANTILEVER
    return [(XS[0], YS[0]), (east, YS[0]), (east, YS[-1]), (XS[0], YS[-1])]


def build(schema: str = "IFC4", units: str = "mm_N") -> tuple[ModelBuilder, dict]:
    """The model and its columns by name ``C-<x index><y index>-<level>`` (level 1..3)."""
    b = ModelBuilder(schema, units)
    for name, z in STOREYS:
        b.storey(name).ObjectPlacement = _placement(b, 0.0, 0.0, z)
        b.storey(name).Elevation = b.L(z)
    profile = b.profile("I", "W10X49", d=10.0, bf=10.0, tw=0.34, tf=0.56, r=0.5)
    steel = b.material("ASTM A992", fy=50.0)
    columns = {}
    for level, (storey, z) in enumerate(STOREYS[:3], start=1):
        for i, x in enumerate(XS):
            for j, y in enumerate(YS):
                name = f"C-{i}{j}-{level}"
                col = b.column(name, profile=profile, material=steel, length=HEIGHT,
                               storey=storey, at=(x, y), tag=name)
                col.ObjectPlacement = _placement(b, x, y, z)
                columns[name] = col
    slabs = {storey: slab(b, storey, outline(), z, name=f"slab {storey}")
             for storey, z in STOREYS[1:]}
    opening(b, slabs["Level 2"], OPENING, STOREYS[1][1] - THICKNESS - 1.0, THICKNESS + 2.0)
    return b, columns


__all__ = ["build", "ifcopenshell", "opening", "outline", "slab"]
