"""Grid locations of columns (ifc_bridge/grids.py, docs/design.md §5 "Grids").

Every expected name is worked by hand in the comment beside it from the grid the test
builds: a 3 x 3 grid, U axes A, B, C running +x at y = 0, 240, 480 in and V axes 1, 2, 3
running +y at x = 0, 360, 720 in, in a millimetre model (1 in = 25.4 mm exactly).
"""

from __future__ import annotations

import math

import numpy as np
import pytest

from stanchion.ifc_bridge.elements import PlanPositions
from stanchion.ifc_bridge.grids import (
    GridNamer,
    axis_line,
    length_symbol,
    placement_matrix,
    read_grids,
)
from stanchion.ifc_bridge.read import read_columns
from stanchion.ifc_bridge.relations import RelationIndex

U_AT = {"A": 0.0, "B": 240.0, "C": 480.0}  # y of the U axes, in
V_AT = {"1": 0.0, "2": 360.0, "3": 720.0}  # x of the V axes, in


def add_grid(b, *, name="Grid", storey="Level 1", origin=(0.0, 0.0), degrees=0.0,
             u=None, v=None, reverse=()):
    """A grid of straight IfcPolyline axes (inches), placed at ``origin`` turned ``degrees``.

    The axes named in ``reverse`` get SameSense false: they run against their curve.

    Returns:
        (grid, {tag: IfcGridAxis}).
    """
    import ifcopenshell.api.geometry
    import ifcopenshell.api.root
    import ifcopenshell.api.spatial

    m = b.model
    grid = ifcopenshell.api.root.create_entity(m, ifc_class="IfcGrid", name=name)
    c, s = math.cos(math.radians(degrees)), math.sin(math.radians(degrees))
    matrix = np.array([[c, -s, 0, origin[0] * 0.0254], [s, c, 0, origin[1] * 0.0254],
                       [0, 0, 1, 0], [0, 0, 0, 1.0]])
    ifcopenshell.api.geometry.edit_object_placement(m, product=grid, matrix=matrix)
    if storey is not None:
        ifcopenshell.api.spatial.assign_container(m, products=[grid],
                                                  relating_structure=b.storey(storey))
    axes = {}

    def axis(tag, p, q):
        pts = [m.createIfcCartesianPoint((b.L(x), b.L(y))) for x, y in (p, q)]
        ax = m.create_entity("IfcGridAxis", AxisTag=tag, AxisCurve=m.createIfcPolyline(pts),
                             SameSense=tag not in reverse)
        axes[tag] = ax
        return ax

    grid.UAxes = [axis(t, (-60.0, y), (780.0, y)) for t, y in (u or U_AT).items()]
    grid.VAxes = [axis(t, (x, -60.0), (x, 540.0)) for t, x in (v or V_AT).items()]
    return grid, axes


def grid_placed(b, column, axes, first, second, offsets=(0.0, 0.0)):
    """Place ``column`` by IfcGridPlacement on the intersection of two axes (offsets, in)."""
    m = b.model
    where = m.create_entity("IfcVirtualGridIntersection",
                            IntersectingAxes=[axes[first], axes[second]],
                            OffsetDistances=[b.L(o) for o in offsets] + [0.0])
    placement = m.create_entity("IfcGridPlacement", PlacementLocation=where)
    column.ObjectPlacement = placement
    return placement


def steel_column(b, name, **kw):
    profile = b.profile("I", "W12X65", d=12.1, bf=12.0, tw=0.39, tf=0.605, r=0.6)
    col = b.column(name, profile=profile, material=b.material("ASTM A992", fy=50.0), **kw)
    b.loads(col, D=100.0, L=50.0)
    return col


def grid_of(members, name):
    return dict(zip(members.name.tolist(), members.extra["grid"].tolist(), strict=True))[name]


def test_columns_on_intersections_off_grid_and_grid_placed(builder):
    b = builder
    _, axes = add_grid(b)
    steel_column(b, "on B-2", at=(360.0, 240.0))  # V2 x = 360, U B y = 240: on B-2
    steel_column(b, "on A-1", at=(0.0, 0.0))
    steel_column(b, "near C-3", at=(720.0 + 0.5, 480.0 - 0.5))  # within 1 in: on C-3
    # 24 in along B (+x), -6 in along 2 (+y): 609.6 and -152.4 mm, shown to the mm
    steel_column(b, "off B-2", at=(360.0 + 24.0, 240.0 - 6.0))
    placed = steel_column(b, "placed C-1")
    grid_placed(b, placed, axes, "C", "1")  # y = 480 (C), x = 0 (1)
    shifted = steel_column(b, "placed C-3 shifted")
    # 300 mm to the left of C (C runs +x: left is +y), none from 3: (720 in, 480 in + 300 mm)
    grid_placed(b, shifted, axes, "C", "3", offsets=(300.0 / 25.4, 0.0))
    result = read_columns(b.model)
    m = result.members
    assert grid_of(m, "on B-2") == "B-2"
    assert grid_of(m, "on A-1") == "A-1"
    assert grid_of(m, "near C-3") == "C-3"
    assert grid_of(m, "off B-2") == "B-2 (+610, -152 mm)"
    assert grid_of(m, "placed C-1") == "C-1"
    assert grid_of(m, "placed C-3 shifted") == "C-3 (0, +300 mm)"
    # the grid placement gives the plan position too: x = 0, y = 480 in = 12192 mm
    i = m.name.tolist().index("placed C-1")
    assert m.extra["x"][i] == pytest.approx(0.0, abs=1e-6)
    assert m.extra["y"][i] == pytest.approx(12192.0)
    i = m.name.tolist().index("placed C-3 shifted")
    assert m.extra["y"][i] == pytest.approx(12192.0 + 300.0)
    assert m.reason[i] is None, m.reason[i]  # a grid placement stops nothing else


def test_rotated_grid(builder):
    b = builder
    add_grid(b, origin=(1000.0, 500.0), degrees=30.0)
    # B-2 is (360, 240) in the grid: x = 1000 + 360 cos 30 - 240 sin 30 = 1191.769 in,
    # y = 500 + 360 sin 30 + 240 cos 30 = 887.846 in
    c, s = math.cos(math.radians(30)), math.sin(math.radians(30))
    steel_column(b, "B-2 turned", at=(1000 + 360 * c - 240 * s, 500 + 360 * s + 240 * c))
    # 24 in further along B (the grid's turned x axis): 609.6 mm along B, none along 2
    steel_column(b, "off B-2 turned",
                 at=(1000 + 384 * c - 240 * s, 500 + 384 * s + 240 * c))
    m = read_columns(b.model).members
    assert grid_of(m, "B-2 turned") == "B-2"
    assert grid_of(m, "off B-2 turned") == "B-2 (+610, 0 mm)"


def test_reversed_axis_turns_its_offset(builder):
    b = builder
    _, axes = add_grid(b, reverse=("B",))
    # B runs -x now (SameSense false): 24 in towards +x is -24 in along B = -609.6 mm
    steel_column(b, "off B-2", at=(384.0, 240.0))
    placed = steel_column(b, "left of reversed B")
    # left of an axis running -x is -y: 10 in off B at x = 720 -> (720, 230), 254 mm along 3
    # negative
    grid_placed(b, placed, axes, "B", "3", offsets=(10.0, 0.0))
    m = read_columns(b.model).members
    assert grid_of(m, "off B-2") == "B-2 (-610, 0 mm)"
    assert grid_of(m, "left of reversed B") == "B-3 (0, -254 mm)"


def test_grid_of_the_storey_wins_else_the_nearest(builder):
    b = builder
    add_grid(b, name="low", storey="Level 1")
    # the upper grid is shifted 12 in along x and named X, Y / 7, 8
    add_grid(b, name="high", storey="Level 2", origin=(12.0, 0.0),
             u={"X": 0.0, "Y": 240.0}, v={"7": 0.0, "8": 360.0})
    steel_column(b, "upper", storey="Level 2", at=(360.0, 240.0))  # Y-8 is at (372, 240)
    steel_column(b, "lower", storey="Level 1", at=(372.0, 240.0))  # B-2 at (360, 240)
    steel_column(b, "roof", storey="Roof", at=(372.0, 0.0))  # no grid: nearest, X-8
    m = read_columns(b.model).members
    assert grid_of(m, "upper") == "Y-8 (-305, 0 mm)"  # -12 in = -304.8 mm along Y
    assert grid_of(m, "lower") == "B-2 (+305, 0 mm)"
    assert grid_of(m, "roof") == "X-8"


def test_no_grid_gives_none(builder):
    steel_column(builder, "alone")
    m = read_columns(builder.model).members
    assert grid_of(m, "alone") is None


@pytest.mark.parametrize("units", ["in_kip", "m_kN"])
def test_offsets_in_the_model_length_unit(make_builder, units):
    b = make_builder(units)
    add_grid(b)
    steel_column(b, "off", at=(360.0 + 24.0, 240.0 - 6.0))
    m = read_columns(b.model).members
    # 24 in, -6 in; 0.6096 m and -0.1524 m shown to the mm (3 decimals)
    expected = {"in_kip": "B-2 (+24, -6 in)", "m_kN": "B-2 (+0.61, -0.152 m)"}[units]
    assert grid_of(m, "off") == expected


def test_axes_that_are_not_straight_are_left_out_with_a_message(builder):
    b = builder
    grid, axes = add_grid(b)
    m = b.model
    circle = m.createIfcCircle(m.createIfcAxis2Placement2D(m.createIfcCartesianPoint(
        (0.0, 0.0))), b.L(100.0))
    grid.VAxes = [*grid.VAxes, m.create_entity("IfcGridAxis", AxisTag="R", AxisCurve=circle,
                                               SameSense=True)]
    grids, messages = read_grids(m, RelationIndex.build(m))
    assert [a.tag for a in grids[0].v] == ["1", "2", "3"]
    assert messages == ["grid Grid: left out axis R (IfcCircle (only straight axes are read))"]


def test_line_and_trimmed_axes(builder):
    m = builder.model
    line = m.createIfcLine(m.createIfcCartesianPoint((0.0, 5.0)),
                           m.createIfcVector(m.createIfcDirection((0.0, 2.0)), 1.0))
    assert axis_line(line) == ((0.0, 5.0), (0.0, 1.0))
    trimmed = m.create_entity("IfcTrimmedCurve", BasisCurve=line, Trim1=[], Trim2=[],
                              SenseAgreement=False, MasterRepresentation="UNSPECIFIED")
    assert axis_line(trimmed) == ((0.0, 5.0), (-0.0, -1.0))


def test_plan_positions_evaluate_grid_placements(builder):
    b = builder
    _, axes = add_grid(b, origin=(100.0, 0.0))
    col = steel_column(b, "placed")
    grid_placed(b, col, axes, "2", "B")  # the V axis first: order does not matter
    x, y = PlanPositions().xy(col)
    # 2 at x = 360 + 100 in, B at y = 240 in
    assert (x, y) == (pytest.approx(b.L(460.0)), pytest.approx(b.L(240.0)))
    assert placement_matrix(col.ObjectPlacement)[2, 3] == pytest.approx(0.0)


def test_length_symbols():
    # the unit's size in inches (exact definitions: 1 in = 25.4 mm, 1 ft = 12 in)
    assert [length_symbol(f) for f in (1 / 25.4, 1000 / 25.4, 1.0, 12.0)] == [
        "mm", "m", "in", "ft"]


def test_namer_without_positions():
    namer = GridNamer([], 1 / 25.4)
    assert namer.names([math.nan], [math.nan], [None]) == [None]


def test_indexed_and_bent_polylines(builder):
    from stanchion.ifc_bridge.grids import GridError

    m = builder.model
    pts = [m.createIfcCartesianPoint(p) for p in ((0.0, 0.0), (5.0, 5.0), (10.0, 10.0))]
    # three points on y = x: the direction is (1, 1) / sqrt 2
    point, d = axis_line(m.createIfcPolyline(pts))
    assert point == (0.0, 0.0) and d == pytest.approx((math.sqrt(0.5), math.sqrt(0.5)))
    bent = m.createIfcPolyline([m.createIfcCartesianPoint(p)
                                for p in ((0.0, 0.0), (5.0, 1.0), (10.0, 0.0))])
    with pytest.raises(GridError, match="not straight"):
        axis_line(bent)
    if builder.schema != "IFC2X3":  # IfcIndexedPolyCurve is IFC4 and later
        coords = m.create_entity("IfcCartesianPointList2D", CoordList=[(0.0, 2.0), (0.0, 8.0)])
        curve = m.create_entity("IfcIndexedPolyCurve", Points=coords)
        assert axis_line(curve) == ((0.0, 2.0), (0.0, 1.0))


def test_grid_placement_ref_direction_turns_a_child(builder):
    """A local placement relative to a grid-placed one follows PlacementRefDirection."""
    b = builder
    _, axes = add_grid(b)
    parent = steel_column(b, "parent")
    placement = grid_placed(b, parent, axes, "B", "2")  # (360, 240) in
    m = b.model
    placement.PlacementRefDirection = m.createIfcDirection((0.0, 1.0, 0.0))  # x along +y
    child = steel_column(b, "child")
    origin = m.createIfcAxis2Placement3D(m.createIfcCartesianPoint((b.L(12.0), 0.0, 0.0)))
    child.ObjectPlacement = m.createIfcLocalPlacement(placement, origin)
    # 12 in along the parent's x axis, which is +y: (360, 252) in, 12 in off B-2 along 2
    x, y = PlanPositions().xy(child)
    assert (x, y) == (pytest.approx(b.L(360.0)), pytest.approx(b.L(252.0)))
    names = read_columns(m).members
    assert grid_of(names, "child") == "B-2 (0, +305 mm)"
