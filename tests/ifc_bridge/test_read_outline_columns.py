"""Columns on outline profiles and on designations of other standards, read and checked.

Each test builds an in-memory model (tests/ifc_bridge/conftest.py) with one exporter pattern
of issue 14, reads it (``read_columns``), runs Chapter E (``check_members``) and compares
φcPn with a value computed independently in the test: AISC 360-22 Eq. E3-2/E3-4 by hand
(:func:`phi_pn`) on section properties from a hand formula, from sectionproperties' own
section builders, or from the published tables named beside them.  Tolerance: 2 % (issue
14, "Done when").
"""

from __future__ import annotations

import math

import pytest
from sectionproperties.analysis.section import Section
from sectionproperties.pre.library import rectangular_hollow_section

from stanchion.engine import outlines as engine_outlines
from stanchion.engine.check import check_members
from stanchion.ifc_bridge.read import read_columns
from tests.ifc_bridge.test_outlines import (
    SPANDREL,
    add_angle_unit,
    arbitrary,
    circle,
    filleted_i,
    indexed_hea,
    polyline,
    rounded_rect_curve,
)

E = 29000.0  # ksi, AISC 360-22 §E1 (the engine's E)
MM = 1 / 25.4  # in per mm
MPA = 1 / 6.894757  # ksi per MPa
TOL = 0.02  # issue 14: within 2 % of the hand computation


def phi_pn(A: float, r: float, L: float, Fy: float) -> float:
    """φcPn of a nonslender section, flexural buckling: AISC 360-22 E3-2 / E3-3 / E3-4.

    A in², r in (the governing radius of gyration), L in (K = 1), Fy ksi; φc = 0.90 (E1).
    """
    Fe = math.pi**2 * E / (L / r) ** 2  # E3-4
    Fcr = 0.658 ** (Fy / Fe) * Fy if Fy / Fe <= 2.25 else 0.877 * Fe  # E3-2 / E3-3
    return 0.9 * Fcr * A


def sharp_i(d: float, bf: float, tw: float, tf: float) -> tuple[float, float, float]:
    """A, Ix, Iy of an I without fillets (hand: rectangles, parallel axes)."""
    A = 2 * bf * tf + (d - 2 * tf) * tw
    Ix = bf * d**3 / 12 - (bf - tw) * (d - 2 * tf) ** 3 / 12
    Iy = 2 * tf * bf**3 / 12 + (d - 2 * tf) * tw**3 / 12
    return A, Ix, Iy


def _check(b):
    members = read_columns(b.model).members
    return members, check_members(members)


def _column(b, profile, material, length, **loads):
    col = b.column("C1", profile=profile, material=material, length=length)
    b.loads(col, **(loads or {"D": 10.0}))
    return col


def i_polyline(m, d, bf, tw, tf, along_x=False):
    """Sharp-cornered I as a closed IfcPolyline (model units); depth along y, or along x."""
    h, w, s, a = d / 2, bf / 2, tw / 2, d / 2 - tf
    pts = [(w, -h), (w, -a), (s, -a), (s, a), (w, a), (w, h), (-w, h), (-w, a), (-s, a),
           (-s, -a), (-w, -a), (-w, -h), (w, -h)]
    if along_x:
        pts = [(y, x) for x, y in pts]
    return polyline(m, pts)


# --------------------------------------------------------------------- outlines


def test_as_uc_polyline_outline_in_millimetres(builder):
    # IFCARBITRARYCLOSEDPROFILEDEF(.AREA.,'310UC96.8',#..) with an IfcPolyline outline in mm,
    # no fillets drawn: d 308, bf 305, tw 9.9, tf 15.4 mm (AS/NZS 3679.1 310UC96.8, from
    # memory). S355JR: fy 355 MPa for t <= 16 mm (EN 10025-2). L = 4000 mm.
    m = builder.model
    profile = arbitrary(m, i_polyline(m, 308, 305, 9.9, 15.4), "310UC96.8")
    _column(builder, profile, builder.material("S355JR"), 4000 * MM)
    members, res = _check(builder)
    assert members.reason[0] is None
    assert members.extra["profile_source"][0].endswith("/outline")
    A, _, Iy = sharp_i(308 * MM, 305 * MM, 9.9 * MM, 15.4 * MM)  # 12138 mm²: hand
    expected = phi_pn(A, math.sqrt(Iy / A), 4000 * MM, 355 * MPA)
    assert res.available_strength[0] == pytest.approx(expected, rel=TOL)
    # the name's mass, 96.8 kg/m, within 4 % of the outline's 12138 mm² x 7850 kg/m³ = 95.3
    assert "profile name AS/NZS 3679.1 310UC96.8 agrees with the geometry (2 %)" in \
        members.messages[0]


def test_heb_composite_curve_in_metres_with_degree_fillets(make_builder):
    # IFCARBITRARYCLOSEDPROFILEDEF(.AREA.,'HEB 300',#..) in a model in metres: polylines and
    # IfcTrimmedCurve root fillets on IfcCircle, parameters in degrees, three fillets used
    # with SameSense .F.; material 'Metall - Baustahl S235' (fy 235 MPa, t <= 40 mm).
    b = make_builder("m_kN")
    m = b.model
    add_angle_unit(m, "degree")
    profile = filleted_i(m, 0.300, 0.300, 0.011, 0.019, 0.027, 1.0)
    profile.ProfileName = "HEB 300"
    _column(b, profile, b.material("Metall - Baustahl S235"), 3500 * MM)
    members, res = _check(b)
    assert members.reason[0] is None
    assert members.extra["profile_source"][0].endswith("/outline")
    # EN 10365 HE 300 B published: A 149.1 cm², iz 7.58 cm (from memory)
    expected = phi_pn(149.1 * 100 * MM**2, 75.8 * MM, 3500 * MM, 235 * MPA)
    assert res.available_strength[0] == pytest.approx(expected, rel=TOL)
    assert "profile name EN 10365 HE 300 B agrees with the geometry (2 %)" in \
        members.messages[0]


@pytest.mark.parametrize("schema", ["IFC4", "IFC4X3"])
def test_ipe_indexed_poly_curve_with_arcs(builder):
    # IFC4 IfcIndexedPolyCurve with IfcArcIndex fillets: IPE 200 (h 200, b 100, tw 5.6,
    # tf 8.5, r 12 mm). EN 10365 IPE 200 published: A 28.5 cm², iz 2.24 cm (from memory).
    m = builder.model
    profile = indexed_hea(m, 200, 100, 5.6, 8.5, 12)
    profile.ProfileName = "IPE200"
    _column(builder, profile, builder.material("S235JR"), 2000 * MM)
    members, res = _check(builder)
    assert members.reason[0] is None
    expected = phi_pn(28.5 * 100 * MM**2, 22.4 * MM, 2000 * MM, 235 * MPA)
    assert res.available_strength[0] == pytest.approx(expected, rel=TOL)


def test_i_drawn_with_its_depth_along_x(builder):
    # an unnamed I 300 x 150 x 7 x 11 mm drawn with its depth along the profile's x axis:
    # the section's x axis is still the major one (hand properties of the sharp I).
    m = builder.model
    profile = arbitrary(m, i_polyline(m, 300, 150, 7.0, 11.0, along_x=True), None)
    _column(builder, profile, builder.material("S275JR"), 3000 * MM)
    members, res = _check(builder)
    assert members.reason[0] is None
    row = members.sections.row(members.section_index[0])
    A, Ix, Iy = sharp_i(300 * MM, 150 * MM, 7 * MM, 11 * MM)
    assert row["d"] == pytest.approx(300 * MM, rel=1e-6)
    assert row["Ix"] == pytest.approx(Ix, rel=1e-3) and row["Iy"] == pytest.approx(Iy, rel=1e-3)
    # S275: fy 275 MPa for t <= 16 mm (EN 10025-2 / EN 1993-1-1 Table 3.1)
    expected = phi_pn(A, math.sqrt(Iy / A), 3000 * MM, 275 * MPA)
    assert res.available_strength[0] == pytest.approx(expected, rel=TOL)


def test_catalog_w_drawn_as_outline_with_depth_along_x(make_builder):
    # W14X90 as a sharp polyline in inches, depth along x: its dimensions agree with the
    # catalog within 2 %, so the tabulated row is used (AISC Shapes Database v16.0: A 26.5
    # in², ry 3.70 in); A992 Fy 50 ksi; L = 15 ft.
    b = make_builder("in_kip")
    profile = arbitrary(b.model, i_polyline(b.model, 14.0, 14.5, 0.44, 0.71, along_x=True),
                        "W14X90")
    _column(b, profile, b.material("A992"), 180.0)
    members, res = _check(b)
    assert members.reason[0] is None
    assert members.extra["profile_source"][0].endswith("/catalog")
    expected = phi_pn(26.5, 3.70, 180.0, 50.0)
    assert res.available_strength[0] == pytest.approx(expected, rel=TOL)


def _rhs_expected(t_design_mm: float, fy_mpa: float, length_mm: float) -> float:
    """φcPn of RHS 200 x 100 (outer corners r 12, inner r_out - t) from sectionproperties'
    own rectangular_hollow_section builder (mm), minor-axis radius of gyration."""
    geom = rectangular_hollow_section(d=200, b=100, t=t_design_mm, r_out=12, n_r=32)
    geom.create_mesh(mesh_sizes=[20.0])
    sec = Section(geom)
    sec.calculate_geometric_properties()
    A = sec.get_area()
    r_minor = math.sqrt(min(sec.get_ic()[:2]) / A)
    return phi_pn(A * MM**2, r_minor * MM, length_mm * MM, fy_mpa * MPA)


def test_en_tube_with_voids_and_material_steel_has_the_nominal_wall(builder):
    # IFCARBITRARYPROFILEDEFWITHVOIDS(.AREA.,'RHS200x100x6 Steel',#..,(#..)): outer corners
    # r 12 on circles turned 90°, inner r 6, degrees; material 'Steel' with a yield stress of
    # 50 ksi: the name is an EN 10210/10219 tube, whose design wall is the nominal 6 mm
    # (engine/tubes.py), not 0.93 x 6.
    m = builder.model
    add_angle_unit(m, "degree")
    profile = arbitrary(m, rounded_rect_curve(m, 100, 200, 12, 1.0), "RHS200x100x6 Steel",
                        voids=[rounded_rect_curve(m, 88, 188, 6, 1.0)])
    _column(builder, profile, builder.material("Steel", fy=50.0), 3000 * MM)
    members, res = _check(builder)
    assert members.reason[0] is None
    assert any("design wall = nominal wall (EN 10210 or EN 10219 tube" in s
               for s in members.messages[0])
    fy_mpa = 50.0 / MPA
    expected = _rhs_expected(6.0, fy_mpa, 3000)
    assert res.available_strength[0] == pytest.approx(expected, rel=TOL)
    assert res.available_strength[0] > 1.04 * _rhs_expected(0.93 * 6.0, fy_mpa, 3000)


def test_parametric_en_tube_with_material_steel_has_the_nominal_wall(builder):
    # IfcRectangleHollowProfileDef 'RHS 200x100x6', outer radius 12 mm, material 'Steel'
    # (50 ksi): nominal wall, as above.
    profile = builder.profile("RHS", "RHS 200x100x6", H=200 * MM, B=100 * MM, t=6 * MM,
                              r_out=12 * MM)
    _column(builder, profile, builder.material("Steel", fy=50.0), 3000 * MM)
    members, res = _check(builder)
    assert members.reason[0] is None
    expected = _rhs_expected(6.0, 50.0 / MPA, 3000)
    assert res.available_strength[0] == pytest.approx(expected, rel=TOL)
    assert "profile name EN 10210/10219 RHS 200x100x6 agrees with the geometry (2 %)" in \
        members.messages[0]


# --------------------------------------------------------------------- names


def test_a_name_that_disagrees_with_its_outline_is_not_checked(builder):
    # an IPE 200 outline named 'HEB 300': name and geometry must agree (ifc_bridge/sections.py)
    m = builder.model
    add_angle_unit(m, "degree")
    profile = filleted_i(m, 200, 100, 5.6, 8.5, 12, 1.0)
    profile.ProfileName = "HEB 300"
    _column(builder, profile, builder.material("S235JR"), 3000 * MM)
    members, res = _check(builder)
    assert res.status[0] == "not_checked"
    assert "profile name EN 10365 HE 300 B disagrees with the geometry: h 200 mm vs 300 mm" \
        in members.reason[0]
    assert "name and geometry must agree" in members.reason[0]


def _ellipse(m):
    return m.createIfcEllipse(m.createIfcAxis2Placement2D(
        m.createIfcCartesianPoint((0.0, 0.0)), None), 150.0, 75.0)


def test_en_name_without_usable_geometry_is_built_from_its_name(builder):
    # an outline the reader cannot read (an IfcEllipse) named 'IPE 300': the section of the
    # name (EN 10365 table). EN 10365 IPE 300 published: A 53.8 cm², iz 3.35 cm (from memory).
    profile = arbitrary(builder.model, _ellipse(builder.model), "IPE 300")
    _column(builder, profile, builder.material("S235JR"), 3000 * MM)
    members, res = _check(builder)
    assert members.reason[0] is None
    assert members.extra["profile_source"][0].endswith("/designation")
    assert any("the section is built from its name EN 10365 IPE 300" in s
               for s in members.messages[0])
    expected = phi_pn(53.8 * 100 * MM**2, 33.5 * MM, 3000 * MM, 235 * MPA)
    assert res.available_strength[0] == pytest.approx(expected, rel=TOL)


def test_bs_name_without_usable_geometry_says_geometry_is_needed(builder):
    profile = arbitrary(builder.model, _ellipse(builder.model), "UC254*254*73")
    _column(builder, profile, builder.material("S275JR"), 3000 * MM)
    members, _ = _check(builder)
    assert "BS 4-1 UC 254x254x73: dimensions from the model's geometry are needed" in \
        members.reason[0]
    assert "nearest" not in members.reason[0]


def test_wide_h_i_shape_keeps_its_axes(builder):
    # IfcIShapeProfileDef 'UC356*368*153': OverallWidth 370.5 > OverallDepth 362 (tw 12.3,
    # tf 20.7, r 15.2 mm). The x axis is about the web-perpendicular axis whatever the
    # order: published Iy-y 48600 cm⁴ > Iz-z 17600 cm⁴ (SCI P363 Blue Book, from memory).
    profile = builder.profile("I", "UC356*368*153", d=362 * MM, bf=370.5 * MM, tw=12.3 * MM,
                              tf=20.7 * MM, r=15.2 * MM)
    _column(builder, profile, builder.material("S355JR"), 4000 * MM)
    members, _ = _check(builder)
    assert members.reason[0] is None
    row = members.sections.row(members.section_index[0])
    cm4 = (10 * MM) ** 4
    assert row["Ix"] > row["Iy"]
    assert row["Ix"] == pytest.approx(48600 * cm4, rel=TOL)
    assert row["Iy"] == pytest.approx(17600 * cm4, rel=TOL)
    # A by hand: 2·370.5·20.7 + 320.6·12.3 + 4(1 - π/4)15.2² = 19480 mm² (published 195 cm²)
    area = 2 * 370.5 * 20.7 + (362 - 41.4) * 12.3 + 4 * SPANDREL * 15.2**2
    assert row["A"] == pytest.approx(area * MM**2, rel=1e-3)


# --------------------------------------------------------------------- cache


def test_columns_sharing_an_outline_analyse_it_once(builder, monkeypatch):
    calls = []
    real = engine_outlines.analyse
    monkeypatch.setattr(engine_outlines, "analyse", lambda p: calls.append(1) or real(p))
    engine_outlines.cache_clear()
    m = builder.model
    profiles = [arbitrary(m, i_polyline(m, d, 150, 7.0, 11.0), None) for d in (250, 300, 350)]
    material = builder.material("S275JR")
    for k in range(30):
        builder.column(f"C{k}", profile=profiles[k % 3], material=material, length=120.0,
                       at=(100.0 * k, 0.0))
    members = read_columns(m).members
    assert all(r is None or r.startswith("no loads") for r in members.reason)
    assert len(calls) == 3
    assert len({members.section_index[k] for k in range(30)}) == 3


def test_circle_outline_in_a_model_without_angle_unit(builder):
    # a round tube of two whole IfcCircle rings (D 193.7, t 8 mm), one exporter's name
    # 'B193.7/8', material S355J2H (EN 10210: nominal wall): π/4 (193.7² - 177.7²) = 4667 mm²
    m = builder.model
    profile = arbitrary(m, circle(m, 0, 0, 96.85), "B193.7/8", voids=[circle(m, 0, 0, 88.85)])
    _column(builder, profile, builder.material("S355J2H"), 3000 * MM)
    members, res = _check(builder)
    assert members.reason[0] is None
    A = math.pi / 4 * (193.7**2 - 177.7**2) * MM**2
    r = math.sqrt(193.7**2 + 177.7**2) / 4 * MM  # hand: r of a ring = √(D² + d²)/4
    expected = phi_pn(A, r, 3000 * MM, 355 * MPA)
    assert res.available_strength[0] == pytest.approx(expected, rel=TOL)


# --------------------------------------------------------------------- reasons


def test_an_outline_fitting_no_family_is_not_checked(builder):
    # a cruciform of two 200 x 20 mm plates: no supported family
    m = builder.model
    pts = [(10, -100), (10, -10), (100, -10), (100, 10), (10, 10), (10, 100), (-10, 100),
           (-10, 10), (-100, 10), (-100, -10), (-10, -10), (-10, -100), (10, -100)]
    _column(builder, arbitrary(m, polyline(m, pts), None), builder.material("S275JR"),
            3000 * MM)
    members, res = _check(builder)
    assert res.status[0] == "not_checked"
    assert members.reason[0].startswith("profile IfcArbitraryClosedProfileDef: outline fits "
                                        "no supported section family")


def test_an_angle_outline_is_not_checked(builder):
    # L 100 x 100 x 10 mm drawn as a polyline: recognised, and out of scope
    m = builder.model
    pts = [(0, 0), (100, 0), (100, 10), (10, 10), (10, 100), (0, 100), (0, 0)]
    _column(builder, arbitrary(m, polyline(m, pts), "L100x100x10"), builder.material("S275JR"),
            3000 * MM)
    members, res = _check(builder)
    assert res.status[0] == "not_checked"
    assert "outline is an angle" in members.reason[0]
    assert "outside the scope" in members.reason[0]


def test_an_unreadable_outline_names_its_curve(builder):
    profile = arbitrary(builder.model, _ellipse(builder.model), "P1")
    _column(builder, profile, builder.material("S275JR"), 3000 * MM)
    members, _ = _check(builder)
    assert members.reason[0].startswith("profile IfcArbitraryClosedProfileDef 'P1': outline "
                                        "of type IfcEllipse not supported")


def test_derived_outline_profile_is_read(builder):
    # an IfcDerivedProfileDef turning an 'IPE 200' composite-curve outline by 90° and moving
    # it: the parent's outline, turned back to the AISC axes. EN 10365 IPE 200 published:
    # A 28.5 cm², iz 2.24 cm (from memory); S235JR, L = 2000 mm.
    m = builder.model
    add_angle_unit(m, "degree")
    parent = filleted_i(m, 200, 100, 5.6, 8.5, 12, 1.0)
    op = m.createIfcCartesianTransformationOperator2D(
        m.createIfcDirection((0.0, 1.0)), m.createIfcDirection((-1.0, 0.0)),
        m.createIfcCartesianPoint((500.0, -300.0)), 1.0)
    profile = m.createIfcDerivedProfileDef("AREA", "IPE 200", parent, op, None)
    _column(builder, profile, builder.material("S235JR"), 2000 * MM)
    members, res = _check(builder)
    assert members.reason[0] is None
    assert members.extra["profile_source"][0].endswith("/outline")
    expected = phi_pn(28.5 * 100 * MM**2, 22.4 * MM, 2000 * MM, 235 * MPA)
    assert res.available_strength[0] == pytest.approx(expected, rel=TOL)
