"""Slab footprints per storey (ifc_bridge/slabs.py), per schema.

Every expected footprint is the slab's profile moved by its placements, worked out by hand
beside the assertion (plan coordinates and areas in inches; the builder writes millimetres).
"""

from __future__ import annotations

import math

import ifcopenshell.api.aggregate
import ifcopenshell.api.root
import ifcopenshell.api.spatial
import numpy as np
import pytest
import shapely

from stanchion.ifc_bridge.slabs import storey_slabs, vertical_extents
from tests.service import takedown_model as tm

MM = 25.4  # mm per inch (exact)


def _area_in2(part) -> float:
    return shapely.Polygon(part.outer, part.holes).area / MM**2


def _placement(b, x, y, z, angle_deg=0.0):
    m = b.model
    a = math.radians(angle_deg)
    return m.create_entity("IfcLocalPlacement", RelativePlacement=m.create_entity(
        "IfcAxis2Placement3D",
        Location=m.create_entity("IfcCartesianPoint", (b.L(x), b.L(y), b.L(z))),
        Axis=m.create_entity("IfcDirection", (0.0, 0.0, 1.0)),
        RefDirection=m.create_entity("IfcDirection", (math.cos(a), math.sin(a), 0.0))))


def _slab_with(b, storey, item, placement, name="S"):
    s = ifcopenshell.api.root.create_entity(b.model, ifc_class="IfcSlab", name=name)
    s.ObjectPlacement = placement
    s.Representation = b.model.create_entity(
        "IfcProductDefinitionShape", Representations=[b.model.create_entity(
            "IfcShapeRepresentation", ContextOfItems=b.body, RepresentationIdentifier="Body",
            RepresentationType="SweptSolid", Items=[item])])
    if storey is not None:
        ifcopenshell.api.spatial.assign_container(b.model, products=[s],
                                                  relating_structure=b.storey(storey))
    return s


def _rect_solid(b, xdim, ydim, depth, at=(0.0, 0.0), direction=(0.0, 0.0, 1.0)):
    m = b.model
    profile = m.create_entity(
        "IfcRectangleProfileDef", ProfileType="AREA", XDim=b.L(xdim), YDim=b.L(ydim),
        Position=m.create_entity("IfcAxis2Placement2D", Location=m.create_entity(
            "IfcCartesianPoint", (b.L(at[0]), b.L(at[1])))))
    return m.create_entity(
        "IfcExtrudedAreaSolid", SweptArea=profile,
        Position=m.create_entity("IfcAxis2Placement3D", Location=m.create_entity(
            "IfcCartesianPoint", (0.0, 0.0, 0.0))),
        ExtrudedDirection=m.create_entity("IfcDirection", direction), Depth=b.L(depth))


def _storey(slabs, name):
    return next(s for s in slabs if s.name == name)


def test_rectangle_placed_and_rotated(builder):
    b = builder
    b.storey("L2").ObjectPlacement = _placement(b, 0, 0, 144)
    # a 200 x 100 in rectangle centred at (50, 0) in its profile, slab placed at
    # (1000, 500, 138) turned 90°: profile x -> world y, so the world box is
    # x = 1000 - 50 .. 1000 + 50, y = 500 - 50 .. 500 + 150 (area 20,000 in²)
    _slab_with(b, "L2", _rect_solid(b, 200, 100, 6, at=(50, 0)),
               _placement(b, 1000, 500, 138, 90))
    st = _storey(storey_slabs(b.model), "L2")
    assert st.elevation == pytest.approx(b.L(144))
    (part,) = st.parts
    assert part.thickness == pytest.approx(b.L(6))
    assert part.bottom == pytest.approx(b.L(138))
    lo, hi = part.outer.min(axis=0) / MM, part.outer.max(axis=0) / MM
    assert lo == pytest.approx([950, 450], abs=1e-6)
    assert hi == pytest.approx([1050, 650], abs=1e-6)
    assert _area_in2(part) == pytest.approx(20_000.0)
    assert st.problems == [] and st.openings == []


def test_profile_with_voids_keeps_its_hole(builder):
    b = builder
    m = b.model

    def ring(x0, y0, x1, y1):
        pts = [m.create_entity("IfcCartesianPoint", (b.L(x), b.L(y)))
               for x, y in ((x0, y0), (x1, y0), (x1, y1), (x0, y1))]
        return m.create_entity("IfcPolyline", pts + [pts[0]])

    profile = m.create_entity("IfcArbitraryProfileDefWithVoids", ProfileType="AREA",
                              OuterCurve=ring(0, 0, 300, 200),
                              InnerCurves=[ring(100, 50, 150, 150)])
    solid = m.create_entity(
        "IfcExtrudedAreaSolid", SweptArea=profile,
        Position=m.create_entity("IfcAxis2Placement3D", Location=m.create_entity(
            "IfcCartesianPoint", (0.0, 0.0, 0.0))),
        ExtrudedDirection=m.create_entity("IfcDirection", (0.0, 0.0, 1.0)), Depth=b.L(8))
    _slab_with(b, "L1", solid, _placement(b, 0, 0, -8))
    (part,) = _storey(storey_slabs(m), "L1").parts
    # 300 x 200 less the 50 x 100 void = 55,000 in²
    assert _area_in2(part) == pytest.approx(55_000.0)
    assert len(part.holes) == 1


def test_through_opening_subtracted_and_recess_noted(builder):
    b = builder
    slab = tm.slab(b, "L1", [(0, 0), (240, 0), (240, 240), (0, 240)], 0.0, name="floor")
    tm.opening(b, slab, (10, 10, 50, 70), -7.0, 8.0)  # through: from 7 in below to 1 in above
    tm.opening(b, slab, (100, 100, 120, 120), -3.0, 3.0)  # a 3 in deep recess in a 6 in slab
    st = _storey(storey_slabs(b.model), "L1")
    assert len(st.openings) == 1
    box = shapely.Polygon(st.openings[0])
    assert box.area / MM**2 == pytest.approx(40.0 * 60.0)
    assert any("does not go through the slab (a recess)" in n for n in st.notes)


def test_slabs_of_a_roof_and_aggregated_into_the_storey_are_read(builder):
    b = builder
    roof = ifcopenshell.api.root.create_entity(b.model, ifc_class="IfcRoof", name="roof")
    ifcopenshell.api.spatial.assign_container(b.model, products=[roof],
                                              relating_structure=b.storey("Roof"))
    part = _slab_with(b, None, _rect_solid(b, 100, 100, 4), _placement(b, 0, 0, 0), "deck")
    ifcopenshell.api.aggregate.assign_object(b.model, products=[part], relating_object=roof)
    loose = _slab_with(b, None, _rect_solid(b, 50, 50, 4), _placement(b, 200, 0, 0), "pad")
    ifcopenshell.api.aggregate.assign_object(b.model, products=[loose],
                                             relating_object=b.storey("Roof"))
    st = _storey(storey_slabs(b.model), "Roof")
    assert sorted(p.name for p in st.parts) == ["deck", "pad"]


def test_mapped_slab_is_moved_by_its_mapping(builder):
    b = builder
    m = b.model
    rep = m.create_entity("IfcShapeRepresentation", ContextOfItems=b.body,
                          RepresentationIdentifier="Body", RepresentationType="SweptSolid",
                          Items=[_rect_solid(b, 100, 100, 4)])
    source = m.create_entity("IfcRepresentationMap", MappingOrigin=m.create_entity(
        "IfcAxis2Placement3D", Location=m.create_entity("IfcCartesianPoint", (0.0, 0.0, 0.0))),
        MappedRepresentation=rep)
    target = m.create_entity("IfcCartesianTransformationOperator3D", LocalOrigin=m.create_entity(
        "IfcCartesianPoint", (b.L(300), 0.0, 0.0)))
    item = m.create_entity("IfcMappedItem", MappingSource=source, MappingTarget=target)
    _slab_with(b, "L1", item, _placement(b, 0, 0, 0))
    (part,) = _storey(storey_slabs(m), "L1").parts
    # centred at 300 after the mapping: x = 250 .. 350
    assert part.outer[:, 0].min() / MM == pytest.approx(250.0)
    assert part.outer[:, 0].max() / MM == pytest.approx(350.0)


def test_bodies_that_are_not_vertical_extrusions_are_problems(builder):
    b = builder
    _slab_with(b, "L1", _rect_solid(b, 100, 100, 4, direction=(0.0, 0.6, 0.8)),
               _placement(b, 0, 0, 0), "tilted")
    sphere = b.model.create_entity("IfcSphere", Position=b.model.create_entity(
        "IfcAxis2Placement3D", Location=b.model.create_entity("IfcCartesianPoint",
                                                              (0.0, 0.0, 0.0))), Radius=10.0)
    _slab_with(b, "L1", sphere, _placement(b, 0, 0, 0), "ball")
    st = _storey(storey_slabs(b.model), "L1")
    assert st.parts == []
    assert any(p.startswith("slab tilted (") and "not vertical" in p for p in st.problems)
    assert any(p.startswith("slab ball (") and "IfcSphere" in p for p in st.problems)


def test_vertical_extents_of_columns(builder):
    b = builder
    profile = b.profile("I", "W10X49", d=10.0, bf=10.0, tw=0.34, tf=0.56, r=0.5)
    col = b.column("C1", profile=profile, material=b.material("A992", fy=50.0), length=144.0)
    col.ObjectPlacement = tm._placement(b, 0.0, 0.0, 288.0)
    bottom, top = vertical_extents(b.model, [col.GlobalId, "no-such-id"])
    assert bottom[0] == pytest.approx(b.L(288.0)) and top[0] == pytest.approx(b.L(432.0))
    assert np.isnan(bottom[1]) and np.isnan(top[1])
