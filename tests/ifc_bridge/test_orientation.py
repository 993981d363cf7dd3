"""The plan rotation of each column's section (ifc_bridge/orientation.py; design §5).

Every expected angle is a hand computation from the directions the test writes into the
model: atan2 of a plan direction, sums of the placements' and the body's angles, and the
90° a rectangle whose XDim is the larger adds (its depth is the larger side).
"""

from __future__ import annotations

import math

import ifcopenshell.api.geometry
import numpy as np
import pytest

from stanchion.ifc_bridge.read import read_columns

W14X48 = {"d": 13.8, "bf": 8.03, "tw": 0.34, "tf": 0.595, "r": 0.4}


def _turned(b, column, degrees: float, at=(0.0, 0.0)) -> None:
    c, s = math.cos(math.radians(degrees)), math.sin(math.radians(degrees))
    matrix = np.array([[c, -s, 0, at[0] * 0.0254], [s, c, 0, at[1] * 0.0254],
                       [0, 0, 1, 0], [0, 0, 0, 1.0]])
    ifcopenshell.api.geometry.edit_object_placement(b.model, product=column, matrix=matrix)


def _solid(column):
    for rep in column.Representation.Representations:
        for item in rep.Items:
            if item.is_a("IfcExtrudedAreaSolid"):
                return item
    raise AssertionError("no extrusion")


def _rotations(b) -> dict[str, float]:
    m = read_columns(b.model).members
    return {str(n): float(r) for n, r in zip(m.name, m.extra["rotation"], strict=True)}


def test_placement_body_mapping_and_rectangles_turn_the_section(builder) -> None:
    b = builder
    i_shape = b.profile("I", "W14X48", **W14X48)
    steel = b.material("ASTM A992", fy=50.0)
    _turned(b, b.column("plain", profile=i_shape, material=steel, via="body"), 0.0)
    _turned(b, b.column("quarter", profile=i_shape, material=steel, via="body",
                        at=(100.0, 0.0)), 90.0, (100.0, 0.0))
    _turned(b, b.column("mapped 30", profile=i_shape, material=steel, via="mapped",
                        at=(200.0, 0.0)), 30.0, (200.0, 0.0))
    # the extrusion's own Position turned by -90° (RefDirection (0, -1, 0)): 270°
    body = b.column("body -90", profile=i_shape, material=steel, via="body", at=(300.0, 0.0))
    solid = _solid(body)
    solid.Position = b.model.create_entity(
        "IfcAxis2Placement3D", Location=b.model.createIfcCartesianPoint((0.0, 0.0, 0.0)),
        Axis=b.model.createIfcDirection((0.0, 0.0, 1.0)),
        RefDirection=b.model.createIfcDirection((0.0, -1.0, 0.0)))
    # a rectangular tube with XDim 12 > YDim 8: its depth (the larger side) along plan x
    wide = b.profile("RHS", "HSS12X8X1/2", H=8.0, B=12.0, t=0.465, r_out=0.93)
    b.column("wide tube", profile=wide, material=steel, via="body", at=(400.0, 0.0))
    # relative to a parent placement turned 45°, itself turned 45°: 90°
    child = b.column("child", profile=i_shape, material=steel, via="body", at=(500.0, 0.0))
    parent = b.model.create_entity("IfcLocalPlacement", RelativePlacement=b.model.create_entity(
        "IfcAxis2Placement3D", Location=b.model.createIfcCartesianPoint((0.0, 0.0, 0.0)),
        RefDirection=b.model.createIfcDirection((1.0, 1.0, 0.0))))
    child.ObjectPlacement = b.model.create_entity(
        "IfcLocalPlacement", PlacementRelTo=parent, RelativePlacement=b.model.create_entity(
            "IfcAxis2Placement3D", Location=b.model.createIfcCartesianPoint((0.0, 0.0, 0.0)),
            RefDirection=b.model.createIfcDirection((1.0, 1.0, 0.0))))
    got = _rotations(b)
    assert got["plain"] == pytest.approx(0.0)
    assert got["quarter"] == pytest.approx(90.0)
    assert got["mapped 30"] == pytest.approx(30.0)
    assert got["body -90"] == pytest.approx(270.0)
    assert got["wide tube"] == pytest.approx(90.0)
    assert got["child"] == pytest.approx(90.0)


def test_profile_position_and_a_downward_extrusion(builder) -> None:
    b = builder
    steel = b.material("ASTM A992", fy=50.0)
    # the profile's own Position turned to (0, 1): 90°; extruded downwards (z = -1) the
    # profile's y runs the other way, so the same Position reads -90° = 270°
    for name, down in (("up", False), ("down", True)):
        prof = b.profile("I", f"W14X48 {name}", **W14X48)
        prof.Position = b.model.createIfcAxis2Placement2D(
            b.model.createIfcCartesianPoint((0.0, 0.0)), b.model.createIfcDirection((0.0, 1.0)))
        col = b.column(name, profile=prof, material=steel, via="body",
                       at=(0.0, 200.0 if down else 0.0))
        if down:
            solid = _solid(col)
            solid.Position = b.model.create_entity(
                "IfcAxis2Placement3D",
                Location=b.model.createIfcCartesianPoint((0.0, 0.0, b.L(144.0))),
                Axis=b.model.createIfcDirection((0.0, 0.0, -1.0)),
                RefDirection=b.model.createIfcDirection((1.0, 0.0, 0.0)))
    got = _rotations(b)
    assert got["up"] == pytest.approx(90.0)
    assert got["down"] == pytest.approx(270.0)


def test_no_placement_gives_no_rotation(builder) -> None:
    b = builder
    col = b.column("loose", profile=b.profile("I", "W14X48", **W14X48),
                   material=b.material("ASTM A992", fy=50.0), via="body")
    col.ObjectPlacement = None
    assert math.isnan(_rotations(b)["loose"])
