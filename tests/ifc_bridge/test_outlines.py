"""Outlines of arbitrary IFC profiles (ifc_bridge/outlines.py), per schema.

Models are built in memory (millimetre models from tests/ifc_bridge/conftest.py, a plane-angle
unit added where a test needs one) with the curve patterns exporters write: polylines,
composite curves of polylines and IfcTrimmedCurve fillets on IfcCircle (parameters in
degrees, segments with SameSense .F.), voids, and IFC4 IfcIndexedPolyCurve with arcs.
Expected areas are hand computations shown beside them; the polygon's area is within the
chord tolerance of the exact area (ifc_bridge.outlines.CHORD_TOL: < 0.07 % for a circle,
far less for fillets).
"""

from __future__ import annotations

import math

import ifcopenshell.api.profile
import ifcopenshell.api.unit
import numpy as np
import pytest
from shapely.geometry import Polygon

from stanchion.engine.outlines import outline_section
from stanchion.ifc_bridge.outlines import CHORD_TOL, outline_of

SPANDREL = 1 - math.pi / 4  # area of a fillet of radius 1 in a square corner
#: Polygon area vs the exact area: the chords of the arcs (CHORD_TOL) and float rounding.
AREA_TOL = 5e-4


def area(outline):
    return Polygon(outline.outer, [v for v in outline.voids]).area


def add_angle_unit(model, name):
    if name == "degree":
        unit = ifcopenshell.api.unit.add_conversion_based_unit(model, name="degree")
    else:
        unit = ifcopenshell.api.unit.add_si_unit(model, unit_type="PLANEANGLEUNIT")
    ifcopenshell.api.unit.assign_unit(model, units=[unit])


def point(m, x, y):
    return m.createIfcCartesianPoint((float(x), float(y)))


def polyline(m, pts):
    return m.createIfcPolyline([point(m, *p) for p in pts])


def circle(m, cx, cy, r, ref=(1.0, 0.0)):
    place = m.createIfcAxis2Placement2D(point(m, cx, cy), m.createIfcDirection(ref))
    return m.createIfcCircle(place, float(r))


def trimmed(m, circ, a1, a2, sense=True):
    return m.createIfcTrimmedCurve(circ, [m.createIfcParameterValue(float(a1))],
                                   [m.createIfcParameterValue(float(a2))], sense, "PARAMETER")


def composite(m, parts):
    """parts: (curve, same_sense) in order."""
    segs = [m.createIfcCompositeCurveSegment("CONTINUOUS", s, c) for c, s in parts]
    return m.createIfcCompositeCurve(segs, False)


def arbitrary(m, curve, name="P", voids=()):
    if voids:
        return m.createIfcArbitraryProfileDefWithVoids("AREA", name, curve, list(voids))
    return m.createIfcArbitraryClosedProfileDef("AREA", name, curve)


def filleted_i(m, d, bf, tw, tf, r, deg):
    """An I (mm) as a composite curve: polylines and trimmed-circle root fillets.

    Fillets as one exporter writes them: the top ones trimmed counter-clockwise
    (SenseAgreement .T.) and used forwards; the bottom ones trimmed from 270° to 0° (or
    180° to 270°) and used with SameSense .F. (reversed). ``deg`` converts degrees to the
    model's plane-angle unit.
    """
    h, w, s, a = d / 2, bf / 2, tw / 2, d / 2 - tf
    parts = [
        (polyline(m, [(s, -a + r), (s, a - r)]), True),
        # top right: centre (s + r, a - r), from 180° to 90° clockwise = 90°..180° reversed
        (trimmed(m, circle(m, s + r, a - r, r), 90 * deg, 180 * deg), False),
        (polyline(m, [(s + r, a), (w, a), (w, h), (-w, h), (-w, a), (-s - r, a)]), True),
        # top left: centre (-s - r, a - r), from 90° to 0° clockwise, SenseAgreement .F.
        (trimmed(m, circle(m, -s - r, a - r, r), 90 * deg, 0 * deg, sense=False), True),
        (polyline(m, [(-s, a - r), (-s, -a + r)]), True),
        # bottom left: centre (-s - r, -a + r), 0° -> 270° clockwise = 270°..360° reversed
        (trimmed(m, circle(m, -s - r, -a + r, r), 270 * deg, 0 * deg), False),
        (polyline(m, [(-s - r, -a), (-w, -a), (-w, -h), (w, -h), (w, -a), (s + r, -a)]), True),
        # bottom right: centre (s + r, -a + r), 270° -> 180° clockwise = 180°..270° reversed
        (trimmed(m, circle(m, s + r, -a + r, r), 180 * deg, 270 * deg), False),
    ]
    return arbitrary(m, composite(m, parts), "IPE 200")


def i_area(d, bf, tw, tf, r):
    """Hand computation: two flanges, the web between them, four fillet spandrels."""
    return 2 * bf * tf + (d - 2 * tf) * tw + 4 * SPANDREL * r * r


def test_polyline_I(builder):
    # I 200 x 100, tw 6, tf 10, sharp corners, written by ifcopenshell.api (IfcPolyline in
    # IFC2X3, IfcIndexedPolyCurve without segments in IFC4+).
    pts = [(50, -100), (50, -90), (3, -90), (3, 90), (50, 90), (50, 100), (-50, 100),
           (-50, 90), (-3, 90), (-3, -90), (-50, -90), (-50, -100), (50, -100)]
    # the api takes metres and writes the project unit (mm)
    profile = ifcopenshell.api.profile.add_arbitrary_profile(
        builder.model, profile=[(x / 1000, y / 1000) for x, y in pts])
    outline, reason = outline_of(builder.model, profile)
    assert reason is None
    assert area(outline) == pytest.approx(2 * 100 * 10 + 180 * 6)  # 3080 mm², hand
    assert len(outline.outer) == 12  # closing point not repeated
    result = outline_section(outline.scaled(1 / 25.4))
    assert result.family == "I"
    assert result.dims["d"] == pytest.approx(200 / 25.4)


@pytest.mark.parametrize("unit", ["degree", "radian"])
def test_composite_curve_with_trimmed_circle_fillets(builder, unit):
    m = builder.model
    add_angle_unit(m, unit)
    deg = 1.0 if unit == "degree" else math.pi / 180
    profile = filleted_i(m, 200, 100, 5.6, 8.5, 12, deg)
    outline, reason = outline_of(m, profile)
    assert reason is None
    # IPE 200 geometry: 2·100·8.5 + 183·5.6 + 4(1 - π/4)12² = 1700 + 1024.8 + 123.6 = 2848.4
    # mm² (EN 10365 tabulates 28.5 cm²)
    assert area(outline) == pytest.approx(i_area(200, 100, 5.6, 8.5, 12), rel=AREA_TOL)
    result = outline_section(outline.scaled(1 / 25.4), "IPE 200")
    assert result.family == "I"
    assert result.dims["r"] * 25.4 == pytest.approx(12, rel=0.02)
    assert result.dims["tw"] * 25.4 == pytest.approx(5.6, rel=1e-3)


@pytest.mark.parametrize(("declared", "written"), [("radian", "degrees"),
                                                   ("degree", "radians")])
def test_angles_written_in_the_other_unit_are_read_as_the_segments_decide(builder, declared,
                                                                          written):
    # parameters in degrees in a model declaring radians (or the reverse): read in the
    # declared unit the fillets land elsewhere and the segments do not meet; read in the
    # other unit they do. That reading is taken, with a note that reaches the section.
    m = builder.model
    add_angle_unit(m, declared)
    deg = 1.0 if written == "degrees" else math.pi / 180
    outline, reason = outline_of(m, filleted_i(m, 200, 100, 5.6, 8.5, 12, deg))
    assert reason is None
    assert area(outline) == pytest.approx(i_area(200, 100, 5.6, 8.5, 12), rel=AREA_TOL)
    note = (f"circle trimming parameters read in {written}: in the model's plane-angle unit "
            f"({declared}s) the outline's segments do not meet, in {written} they do")
    assert outline.notes == (note,)
    result = outline_section(outline.scaled(1 / 25.4), "IPE 200")
    assert result.family == "I" and note in result.notes


def test_segments_that_meet_in_no_angle_unit_give_the_gap(builder):
    # a fillet trimmed 0..100 (degrees) where 0..90 belongs: in neither unit do the
    # segments meet -> no outline, the gap named
    m = builder.model
    add_angle_unit(m, "degree")
    r, s, a = 12.0, 2.8, 91.5
    curve = composite(m, [
        (polyline(m, [(s, -a), (s, a - r)]), True),
        (trimmed(m, circle(m, s + r, a - r, r), 90, 190), False),
        (polyline(m, [(s + r, a), (50, a), (50, -a), (s, -a)]), True)])
    outline, reason = outline_of(m, arbitrary(m, curve))
    assert outline is None
    assert reason.startswith("outline IfcCompositeCurve has a gap of")


def test_trims_by_cartesian_points(builder):
    # a quarter-round corner trimmed by its end points (MasterRepresentation CARTESIAN):
    # square 100 x 100 with one corner rounded r 20: 100² - (1 - π/4)20² = 9914.16 mm²
    m = builder.model
    arc = m.createIfcTrimmedCurve(circle(m, 80, 80, 20), [point(m, 100, 80)],
                                  [point(m, 80, 100)], True, "CARTESIAN")
    curve = composite(m, [(polyline(m, [(0, 0), (100, 0), (100, 80)]), True), (arc, True),
                          (polyline(m, [(80, 100), (0, 100), (0, 0)]), True)])
    outline, reason = outline_of(m, arbitrary(m, curve))
    assert reason is None
    assert area(outline) == pytest.approx(100**2 - SPANDREL * 20**2, rel=AREA_TOL)


def rounded_rect_curve(m, B, H, r, deg):
    """Outer ring of a tube: corner arcs on circles whose Position is turned 90° (RefDirection
    (0, 1)), so parameter 0 points along +y: the corner at (+, +) spans -90°..0°."""
    x, y = B / 2, H / 2
    up = (0.0, 1.0)
    return composite(m, [
        (polyline(m, [(-x + r, -y), (x - r, -y)]), True),
        (trimmed(m, circle(m, x - r, -y + r, r, up), 180 * deg, 270 * deg), True),
        (polyline(m, [(x, -y + r), (x, y - r)]), True),
        (trimmed(m, circle(m, x - r, y - r, r, up), 270 * deg, 360 * deg), True),
        (polyline(m, [(x - r, y), (-x + r, y)]), True),
        (trimmed(m, circle(m, -x + r, y - r, r, up), 0 * deg, 90 * deg), True),
        (polyline(m, [(-x, y - r), (-x, -y + r)]), True),
        (trimmed(m, circle(m, -x + r, -y + r, r, up), 90 * deg, 180 * deg), True),
    ])


def test_rectangular_tube_with_void(builder):
    # RHS 200 x 100 x 6 (mm): outer corners r 12 on rotated circles, inner corners r 6
    m = builder.model
    add_angle_unit(m, "degree")
    outer = rounded_rect_curve(m, 100, 200, 12, 1.0)
    inner = rounded_rect_curve(m, 88, 188, 6, 1.0)
    profile = arbitrary(m, outer, "RHS200x100x6", voids=[inner])
    outline, reason = outline_of(m, profile)
    assert reason is None and len(outline.voids) == 1
    # hand: 200·100 - 4(1 - π/4)12² - (188·88 - 4(1 - π/4)6²) = 19876.39 - 16513.10 = 3363.29
    expected = 200 * 100 - 4 * SPANDREL * 144 - (188 * 88 - 4 * SPANDREL * 36)
    assert area(outline) == pytest.approx(expected, rel=AREA_TOL)
    result = outline_section(outline.scaled(1 / 25.4), "RHS200x100x6", "EN 10219")
    assert result.family == "HSS"
    assert result.dims["t"] * 25.4 == pytest.approx(6.0, rel=1e-3)  # EN 10219: nominal wall
    assert result.dims["H"] * 25.4 == pytest.approx(200.0, rel=1e-6)


def test_round_tube_from_whole_circles(builder):
    # CHS 193.7 x 8 as two IfcCircle rings: π/4 (193.7² - 177.7²) = 4667.0 mm²
    m = builder.model
    profile = arbitrary(m, circle(m, 0, 0, 96.85), "CHS", voids=[circle(m, 0, 0, 88.85)])
    outline, reason = outline_of(m, profile)
    assert reason is None
    # inscribed 100-gons: 0.066 % low (1 - sin(2π/100)/(2π/100))
    assert area(outline) == pytest.approx(math.pi / 4 * (193.7**2 - 177.7**2), rel=1e-3)
    assert outline_section(outline.scaled(1 / 25.4), "CHS").family == "HSS_ROUND"


def test_arcs_keep_the_chord_tolerance(builder):
    # every chord of a discretised circle of radius 50 lies within CHORD_TOL x 50 of the arc:
    # its midpoint is at R cos(Δ/2) from the centre, the sagitta R (1 - cos(Δ/2))
    m = builder.model
    outline, _ = outline_of(m, arbitrary(m, circle(m, 10, 20, 50.0)))
    pts = outline.outer
    mids = (pts + np.roll(pts, -1, axis=0)) / 2 - (10, 20)
    sagitta = 50.0 - np.hypot(mids[:, 0], mids[:, 1])
    assert sagitta.max() <= CHORD_TOL * 50.0
    assert sagitta.max() > 0.8 * CHORD_TOL * 50.0  # not needlessly fine
    assert np.allclose(np.hypot(pts[:, 0] - 10, pts[:, 1] - 20), 50.0)


def indexed_hea(m, d, bf, tw, tf, r):
    """An I as IfcIndexedPolyCurve: IfcLineIndex runs and IfcArcIndex fillets (start, a point
    at 45° on the arc, end), points 1-based, as IFC4 exporters write them."""
    h, w, s, a = d / 2, bf / 2, tw / 2, d / 2 - tf
    c = r * (1 - math.sqrt(0.5))  # the 45° point's offset from the fillet's corner lines
    pts = [(s, -a + r), (s, a - r), (s + c, a - c), (s + r, a), (w, a), (w, h), (-w, h),
           (-w, a), (-s - r, a), (-s - c, a - c), (-s, a - r), (-s, -a + r), (-s - c, -a + c),
           (-s - r, -a), (-w, -a), (-w, -h), (w, -h), (w, -a), (s + r, -a), (s + c, -a + c)]
    plist = m.createIfcCartesianPointList2D([(float(x), float(y)) for x, y in pts])
    segs = [m.createIfcLineIndex((1, 2)), m.createIfcArcIndex((2, 3, 4)),
            m.createIfcLineIndex((4, 5, 6, 7, 8, 9)), m.createIfcArcIndex((9, 10, 11)),
            m.createIfcLineIndex((11, 12)), m.createIfcArcIndex((12, 13, 14)),
            m.createIfcLineIndex((14, 15, 16, 17, 18, 19)), m.createIfcArcIndex((19, 20, 1))]
    return arbitrary(m, m.createIfcIndexedPolyCurve(plist, segs, False), "HEA 200")


@pytest.mark.parametrize("schema", ["IFC4", "IFC4X3"])
def test_indexed_poly_curve_with_arcs(builder):
    outline, reason = outline_of(builder.model, indexed_hea(builder.model, 190, 200, 6.5,
                                                            10, 18))
    assert reason is None
    # HEA 200 geometry: 2·200·10 + 170·6.5 + 4(1 - π/4)18² = 4000 + 1105 + 278.2 = 5383.2
    # mm² (EN 10365 tabulates 53.8 cm²)
    assert area(outline) == pytest.approx(i_area(190, 200, 6.5, 10, 18), rel=AREA_TOL)
    assert len(outline.outer) > 40  # the arcs are discretised, not chords through 3 points
    result = outline_section(outline.scaled(1 / 25.4), "HEA 200")
    assert result.family == "I" and result.dims["d"] * 25.4 == pytest.approx(190)
    # bf > d: x stays the axis parallel to the flanges
    assert result.table.Ix[0] > result.table.Iy[0]


def test_derived_profile_mirrored_and_moved(builder):
    m = builder.model
    add_angle_unit(m, "degree")
    parent = filleted_i(m, 200, 100, 5.6, 8.5, 12, 1.0)
    op = m.createIfcCartesianTransformationOperator2D(
        m.createIfcDirection((0.0, 1.0)), m.createIfcDirection((1.0, 0.0)),
        point(m, 500, -300), 1.0)
    outline, reason = outline_of(m, m.createIfcDerivedProfileDef("AREA", "D", parent, op, None))
    assert reason is None
    assert area(outline) == pytest.approx(i_area(200, 100, 5.6, 8.5, 12), rel=AREA_TOL)
    assert outline.outer[:, 0].min() > 300  # moved by LocalOrigin (500, -300)


def test_unsupported_curves_and_profiles_give_reasons(builder):
    m = builder.model
    ellipse = m.createIfcEllipse(
        m.createIfcAxis2Placement2D(point(m, 0, 0), None), 50.0, 30.0)
    assert outline_of(m, arbitrary(m, ellipse)) == (
        None, "outline of type IfcEllipse not supported")
    i_shape = m.createIfcIShapeProfileDef("AREA", "I", None, 100.0, 200.0, 6.0, 10.0)
    assert outline_of(m, i_shape) == (
        None, "profile type IfcIShapeProfileDef has no outline to read")
    curve = m.createIfcArbitraryClosedProfileDef(
        "CURVE", "C", polyline(m, [(0, 0), (1, 0), (1, 1), (0, 0)]))
    assert "is a CURVE profile, not an area" in outline_of(m, curve)[1]
    gap = composite(m, [(polyline(m, [(0, 0), (100, 0), (100, 100)]), True),
                        (polyline(m, [(90, 100), (0, 100), (0, 0)]), True)])
    assert "has a gap of 10 (model length unit) before segment 2" in outline_of(
        m, arbitrary(m, gap))[1]
