"""Member length: axis, extrusion, base quantity, analysis member, none."""

from __future__ import annotations

import math

import pytest

from stanchion.ifc_bridge.read import read_columns

W14X48 = {"d": 13.8, "bf": 8.03, "tw": 0.340, "tf": 0.595}  # AISC Shapes Database v16.0


def _column(b, **kw):
    prof = b.profile("I", "W14X48", **W14X48)
    col = b.column("C1", profile=prof, material=b.material("A992"), **kw)
    b.loads(col, D=10.0)
    return col


def _read(b):
    return read_columns(b.model).members


def test_axis_length_first(builder):
    _column(builder, length=150.0, axis=True)
    m = _read(builder)
    assert m.extra["length_source"][0] == "axis"
    # expected: the value given to the model above (input round trip)
    assert m.lx[0] == pytest.approx(150.0)


def test_axis_and_extrusion_disagreeing_is_noted(builder):
    col = _column(builder, length=150.0, axis=True)
    body = next(r for r in col.Representation.Representations
                if r.RepresentationIdentifier == "Body")
    body.Items[0].Depth = builder.L(120.0)
    m = _read(builder)
    # expected: the value given to the model above (input round trip)
    assert m.lx[0] == pytest.approx(150.0)
    assert any("axis length 150 in and extrusion depth 120 in differ" in s
               for s in m.messages[0])


def test_extrusion_depth(builder):
    _column(builder, length=168.0)
    m = _read(builder)
    assert m.extra["length_source"][0] == "extrusion"
    # expected: the value given to the model above (input round trip)
    assert m.lx[0] == m.ly[0] == m.lz[0] == pytest.approx(168.0)


def test_base_quantity_length(builder):
    if builder.schema == "IFC2X3":
        col = _column(builder, length=None)  # IFC2X3 keeps the profile in the body; no body
    else:
        col = _column(builder, length=96.0, body=False)
    builder.qto_length(col, 96.0)
    m = _read(builder)
    assert m.extra["length_source"][0] == "quantity"
    assert m.lx[0] == pytest.approx(96.0)


def test_analysis_member_length(builder):
    col = _column(builder, length=None)
    builder.analysis_member(col, length=132.0)
    m = _read(builder)
    assert m.extra["length_source"][0] == "analytical"
    # expected: the value given to the model above (input round trip)
    assert m.lx[0] == pytest.approx(132.0)


def test_analysis_member_related_the_other_way(builder):
    col = _column(builder, length=None)
    builder.analysis_member(col, length=132.0, relating="column")
    # expected: the value given to the model above (input round trip)
    assert _read(builder).lx[0] == pytest.approx(132.0)


def test_no_length(builder):
    _column(builder, length=None)
    m = _read(builder)
    assert m.extra["length_source"][0] == "none"
    assert "no length" in m.reason[0]
    assert math.isnan(m.lx[0])


def test_unbraced_lengths_replace_a_missing_length(builder):
    col = _column(builder, length=None)
    builder.design(col, UnbracedLengthX=144.0, UnbracedLengthY=72.0, UnbracedLengthZ=72.0)
    m = _read(builder)
    assert (m.lx[0], m.ly[0], m.lz[0]) == pytest.approx((144.0, 72.0, 72.0))
    assert m.reason[0] is None or "no length" not in m.reason[0]


def test_length_in_feet_model(make_builder, schema):
    b = make_builder("ft_kip", schema)
    _column(b, length=150.0, axis=True)
    # expected: the value given to the model above (input round trip)
    assert _read(b).lx[0] == pytest.approx(150.0)


# ---------------------------------------------------------------- bodies that are not extrusions
# Issue 14 item 5 (an exporter pattern: a column body written as an IfcFacetedBrep inside a
# mapped item, no profile, no Axis, no quantity): the length is the body's extent along the
# column's local z axis.


def _box_points(b, width: float, height: float, z0: float = 0.0):
    """The 8 corners of a width x width x height box (inputs in inches, model units out)."""
    w, h, z = b.L(width), b.L(height), b.L(z0)
    return [(x, y, zz) for zz in (z, z + h) for y in (0.0, w) for x in (0.0, w)]


def _faceted_brep(b, points):
    m = b.model
    pts = [m.create_entity("IfcCartesianPoint", Coordinates=p) for p in points]
    quads = ((0, 1, 3, 2), (4, 5, 7, 6), (0, 1, 5, 4), (2, 3, 7, 6), (0, 2, 6, 4), (1, 3, 7, 5))
    faces = [m.create_entity("IfcFace", Bounds=[m.create_entity(
        "IfcFaceOuterBound", Bound=m.create_entity("IfcPolyLoop", Polygon=[pts[i] for i in q]),
        Orientation=True)]) for q in quads]
    shell = m.create_entity("IfcClosedShell", CfsFaces=faces)
    return m.create_entity("IfcFacetedBrep", Outer=shell)


def _give_body(b, col, item, rep_type: str = "Brep", mapped: bool = False, origin_z=0.0,
               rotate_x_90: bool = False):
    m = b.model
    rep = m.create_entity("IfcShapeRepresentation", ContextOfItems=b.body,
                          RepresentationIdentifier="Body", RepresentationType=rep_type,
                          Items=[item])
    if mapped:
        axes = {}
        if rotate_x_90:  # the map's z axis points along the column's -y: extent along z changes
            axes = {"Axis": m.create_entity("IfcDirection", DirectionRatios=(0.0, -1.0, 0.0)),
                    "RefDirection": m.create_entity("IfcDirection",
                                                    DirectionRatios=(1.0, 0.0, 0.0))}
        origin = m.create_entity("IfcAxis2Placement3D", Location=m.create_entity(
            "IfcCartesianPoint", Coordinates=(0.0, 0.0, b.L(origin_z))), **axes)
        rmap = m.create_entity("IfcRepresentationMap", MappingOrigin=origin,
                               MappedRepresentation=rep)
        target = m.create_entity(
            "IfcCartesianTransformationOperator3D",
            LocalOrigin=m.create_entity("IfcCartesianPoint", Coordinates=(0.0, 0.0, 0.0)))
        item = m.create_entity("IfcMappedItem", MappingSource=rmap, MappingTarget=target)
        rep = m.create_entity("IfcShapeRepresentation", ContextOfItems=b.body,
                              RepresentationIdentifier="Body",
                              RepresentationType="MappedRepresentation", Items=[item])
    shape = m.create_entity("IfcProductDefinitionShape", Representations=[rep])
    col.Representation = shape


def _brep_column(b):
    col = b.column("C1", profile=None, material=b.material("A992"), length=None)
    b.loads(col, D=10.0)
    return col


def test_faceted_brep_body_gives_the_length_and_names_itself(builder):
    col = _brep_column(builder)
    _give_body(builder, col, _faceted_brep(builder, _box_points(builder, 10.0, 150.0)))
    m = _read(builder)
    assert m.extra["length_source"][0] == "body"
    # expected: the box's height given above (input round trip), 150 in
    assert m.lx[0] == pytest.approx(150.0)
    assert any("extent of the IfcFacetedBrep" in s for s in m.messages[0])
    assert "the Body is an IfcFacetedBrep, from which no section is read" in m.reason[0]


def test_mapped_brep_extent_applies_the_map_transform(builder):
    # A box 10 in wide and 150 in tall, mapped with its z axis turned onto -y: along the
    # column's z it now spans its 10 in width (hand computation: the rotation swaps y and z).
    col = _brep_column(builder)
    _give_body(builder, col, _faceted_brep(builder, _box_points(builder, 10.0, 150.0)),
               mapped=True, rotate_x_90=True)
    assert _read(builder).lx[0] == pytest.approx(10.0)


def test_mapped_brep_with_an_offset_origin_keeps_its_extent(builder):
    col = _brep_column(builder)
    _give_body(builder, col, _faceted_brep(builder, _box_points(builder, 10.0, 120.0, 6.0)),
               mapped=True, origin_z=30.0)
    # expected: a translation does not change the extent; 120 in as modelled
    assert _read(builder).lx[0] == pytest.approx(120.0)


def test_triangulated_body_gives_the_length(builder):
    if builder.schema == "IFC2X3":
        pytest.skip("IfcTriangulatedFaceSet is IFC4 and later")
    col = _brep_column(builder)
    pts = _box_points(builder, 8.0, 96.0)
    coords = builder.model.create_entity("IfcCartesianPointList3D", CoordList=pts)
    tri = builder.model.create_entity(
        "IfcTriangulatedFaceSet", Coordinates=coords,
        CoordIndex=[(1, 2, 4), (1, 4, 3), (5, 6, 8), (5, 8, 7)])
    _give_body(builder, col, tri, rep_type="Tessellation")
    m = _read(builder)
    assert m.extra["length_source"][0] == "body"
    # expected: the box's height given above, 96 in
    assert m.lx[0] == pytest.approx(96.0)
    assert "IfcTriangulatedFaceSet" in m.reason[0]


def test_a_quantity_comes_before_the_body_extent(builder):
    col = _brep_column(builder)
    _give_body(builder, col, _faceted_brep(builder, _box_points(builder, 10.0, 150.0)))
    builder.qto_length(col, 140.0)
    m = _read(builder)
    assert m.extra["length_source"][0] == "quantity"
    # expected: the quantity given above; the body (150 in) includes more than the shaft
    assert m.lx[0] == pytest.approx(140.0)
