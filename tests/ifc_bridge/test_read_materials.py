"""Yield strength: override, material properties, grade table, none."""

from __future__ import annotations

import pytest

from stanchion.engine.units import factor
from stanchion.ifc_bridge.read import read_columns

W14X48 = {"d": 13.8, "bf": 8.03, "tw": 0.340, "tf": 0.595}  # AISC Shapes Database v16.0
KSI_PER_MPA = factor("megapascal", "ksi")  # pint (common practice, no source)


def _column(b, material, profile=None, **kw):
    profile = profile or b.profile("I", "W14X48", **W14X48)
    col = b.column("C1", profile=profile, material=material, **kw)
    b.loads(col, D=10.0)
    return col


def _read(b):
    return read_columns(b.model).members


def test_yield_from_material_properties(builder):
    _column(builder, builder.material("Steel", fy=55.0))
    m = _read(builder)
    assert m.Fy[0] == pytest.approx(55.0)  # given in ksi, stored in N/mm², read back
    assert m.extra["fy_source"][0] == "material"
    where = ("IfcMechanicalSteelMaterialProperties" if builder.schema == "IFC2X3"
             else "Pset_MaterialSteel")
    assert any(where in s for s in m.messages[0])


def test_yield_in_imperial_model(make_builder, schema):
    b = make_builder("in_kip", schema)
    _column(b, b.material("Steel", fy=46.0))
    # expected: the value given to the model above (input round trip)
    assert _read(b).Fy[0] == pytest.approx(46.0)


def test_override_wins_over_material(builder):
    col = _column(builder, builder.material("ASTM A992", fy=50.0))
    builder.design(col, YieldStress=42.0)
    m = _read(builder)
    # expected: the value given to the model above (input round trip)
    assert m.Fy[0] == pytest.approx(42.0)
    assert m.extra["fy_source"][0] == "override"


def test_override_on_the_type(builder):
    ctype = builder.column_type("CT")
    builder.design(ctype, YieldStress=36.0)
    _column(builder, builder.material("no grade"), column_type=ctype)
    # expected: the value given to the model above (input round trip)
    assert _read(builder).Fy[0] == pytest.approx(36.0)


def test_override_alone_without_material(builder):
    col = _column(builder, None)
    builder.design(col, YieldStress=50.0)
    m = _read(builder)
    # expected: the value given to the model above (input round trip)
    assert m.Fy[0] == pytest.approx(50.0) and m.reason[0] is None


def test_material_properties_win_over_grade_name(builder):
    _column(builder, builder.material("ASTM A36", fy=50.0))
    # expected: the value given to the model above (input round trip)
    assert _read(builder).Fy[0] == pytest.approx(50.0)


@pytest.mark.parametrize(
    ("name", "expected"),
    [
        ("ASTM A992", 50.0),  # ASTM A992/A992M
        ("A36", 36.0),  # ASTM A36/A36M
        ("A572 Gr. 50", 50.0),  # ASTM A572/A572M Grade 50
        ("A572-65", 65.0),  # ASTM A572/A572M Grade 65
        ("ASTM A913 Grade 65", 65.0),  # ASTM A913/A913M Grade 65
        ("S355JR", 355.0 * KSI_PER_MPA),  # EN 1993-1-1:2005 Table 3.1, t <= 40 mm
        ("S235", 235.0 * KSI_PER_MPA),  # EN 1993-1-1:2005 Table 3.1, t <= 40 mm
    ],
)
def test_yield_from_grade_in_material_name(builder, name, expected):
    _column(builder, builder.material(name))
    m = _read(builder)
    assert m.Fy[0] == pytest.approx(expected)
    assert m.extra["fy_source"][0] == "grade"


def test_a500_round_and_rectangular(builder):
    steel = builder.material("ASTM A500 Grade C")
    rect = builder.profile("RHS", "HSS8X8X1/2", H=8.0, B=8.0, t=0.5)
    rnd = builder.profile("CHS", "HSS6.625X0.280", D=6.625, t=0.280)
    for name, prof in (("R", rect), ("O", rnd)):
        builder.loads(builder.column(name, profile=prof, material=steel), D=1.0)
    m = _read(builder)
    assert m.Fy[0] == pytest.approx(50.0)  # ASTM A500 Grade C, rectangular
    assert m.Fy[1] == pytest.approx(46.0)  # ASTM A500 Grade C, round


def test_no_yield_strength(builder):
    _column(builder, builder.material("Steel"))
    m = _read(builder)
    assert m.reason[0].startswith("no yield strength")
    assert m.extra["fy_source"][0] == "none"


def test_no_material_at_all(builder):
    _column(builder, None)
    assert _read(builder).reason[0].startswith("no yield strength")


def test_material_on_the_type(builder):
    ctype = builder.column_type("CT", material=builder.material("A992"))
    _column(builder, None, column_type=ctype)
    assert _read(builder).Fy[0] == pytest.approx(50.0)  # ASTM A992


def test_en_band_of_a_flat_bar_is_read_at_its_thickness(builder):
    # A 2 in x 8 in flat (50.8 x 203.2 mm) of S355: its nominal thickness is 50.8 mm, band
    # 40 < t <= 80 mm, fy = 335 MPa (EN 1993-1-1:2005 Table 3.1); read at its 203 mm width it
    # would have no value at all.
    flat = builder.profile("RECT", None, H=8.0, B=2.0)
    builder.loads(builder.column("F", profile=flat, material=builder.material("S355")), D=1.0)
    assert _read(builder).Fy[0] == pytest.approx(335.0 * KSI_PER_MPA)
