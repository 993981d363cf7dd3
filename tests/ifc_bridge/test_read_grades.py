"""Grades as exporters write them (issue 14): in names, in grade properties, none, assumed.

Every test runs per schema (IFC2X3, IFC4, IFC4X3) through the ``builder`` fixture.  The
column is a W14X48 (tf 0.595 in = 15.1 mm, its thickest element: AISC Shapes Database
v16.0), so EN grades read the t <= 40 mm band of EN 1993-1-1:2005 Table 3.1.
"""

from __future__ import annotations

import ifcopenshell.api.material
import pytest

from stanchion.engine.units import factor
from stanchion.ifc_bridge.read import read_columns

W14X48 = {"d": 13.8, "bf": 8.03, "tw": 0.340, "tf": 0.595}  # AISC Shapes Database v16.0
KSI_PER_MPA = factor("megapascal", "ksi")  # pint (common practice, no source)


def _column(b, material, name="C1"):
    profile = b.profile("I", "W14X48", **W14X48)
    col = b.column(name, profile=profile, material=material)
    b.loads(col, D=10.0)
    return col


def _material(b, name, description=None, category=None):
    """An IfcMaterial as an exporter writes it (IFC4+: Name, Description, Category)."""
    mat = ifcopenshell.api.material.add_material(b.model, name=name, category=category)
    if description is not None and b.schema != "IFC2X3":  # IFC2X3 IfcMaterial: Name only
        mat.Description = description
    return mat


def _by_name(members):
    return {n: i for i, n in enumerate(members.name)}


def test_grade_named_in_the_name_with_a_category_description(builder):
    # IFCMATERIAL('S355JR','Steel',$): the grade is the name, 'Steel' the description
    # (read before issue 14 too: kept as the regression test of this exporter pattern)
    _column(builder, _material(builder, "S355JR", description="Steel"))
    m = read_columns(builder.model).members
    assert m.Fy[0] == pytest.approx(355.0 * KSI_PER_MPA)  # Table 3.1, S355, t <= 40 mm
    assert m.extra["fy_source"][0] == "grade"


def test_stress_in_an_application_default_name(builder):
    _column(builder, _material(builder, "Metal - Steel - 345 MPa"))
    m = read_columns(builder.model).members
    assert m.Fy[0] == pytest.approx(345 / 6.894757)  # 1 ksi = 6.894757 MPa: 50.04 ksi
    assert any("stress 345 MPa stated in material name" in s for s in m.messages[0])


def test_grade_from_a_material_property(builder):
    # IFCMATERIAL('STEEL') with a property Grade 'S275J0' (IFC2X3: IfcExtendedMaterialProperties,
    # IFC4+: IfcMaterialProperties)
    steel = _material(builder, "STEEL")
    builder.pset(steel, "Pset_Exporter", {"Grade": "S275J0"})
    _column(builder, steel)
    m = read_columns(builder.model).members
    assert m.Fy[0] == pytest.approx(275.0 * KSI_PER_MPA)  # Table 3.1, S275, t <= 40 mm
    assert m.extra["fy_source"][0] == "grade"
    assert any("Pset_Exporter.Grade" in s and "'S275J0'" in s for s in m.messages[0])


@pytest.mark.parametrize("prop", ["SteelGrade", "Grade name", "MaterialGrade"])
def test_other_grade_property_names(builder, prop):
    steel = _material(builder, "Steel")
    builder.pset(steel, "Pset_MaterialCommon", {prop: "A992"})
    _column(builder, steel)
    assert read_columns(builder.model).members.Fy[0] == pytest.approx(50.0)  # ASTM A992


def test_name_and_property_naming_different_grades_use_the_lower(builder):
    steel = _material(builder, "STEEL/S355JR")
    builder.pset(steel, "Pset_Exporter", {"Grade": "S275J0"})
    _column(builder, steel)
    m = read_columns(builder.model).members
    assert m.Fy[0] == pytest.approx(275.0 * KSI_PER_MPA)  # the lower: S275, Table 3.1
    assert any("material grades differ" in s for s in m.messages[0])


def test_grade_property_on_the_element(builder):
    # the exporter pattern of the real models: 'STEEL' and a Grade in the column's own set
    col = _column(builder, _material(builder, "STEEL"))
    builder.pset(col, "Exporter Common", {"Grade": "S235JR"})
    m = read_columns(builder.model).members
    assert m.Fy[0] == pytest.approx(235.0 * KSI_PER_MPA)  # Table 3.1, S235, t <= 40 mm
    assert any("Exporter Common.Grade" in s for s in m.messages[0])


@pytest.mark.parametrize("name", ["Steel", "Metal - Steel", "Structural Steel"])
def test_steel_that_names_no_grade_is_not_checked_naming_the_material(builder, name):
    _column(builder, _material(builder, name))
    m = read_columns(builder.model).members
    assert m.reason[0].startswith(f"no yield strength: material '{name}' names no grade")
    assert m.extra["fy_source"][0] == "none"


def test_default_grade_for_steel_naming_no_grade(builder):
    _column(builder, _material(builder, "Steel"), "ungraded")
    _column(builder, _material(builder, "ASTM A36"), "A36")
    _column(builder, None, "no material")
    _column(builder, _material(builder, "Metal"), "metal")  # names no material class
    m = read_columns(builder.model, default_grade="A992").members
    at = _by_name(m)
    i = at["ungraded"]
    assert m.Fy[i] == pytest.approx(50.0)  # ASTM A992/A992M: Fy = 50 ksi
    assert m.extra["fy_source"][i] == "default_grade"
    assert any(s.startswith("Fy = 50 ksi from --default-grade A992 (assumed: the material "
                            "names no grade") for s in m.messages[i])
    # a material naming its grade keeps it (ASTM A36: 36 ksi)
    assert m.Fy[at["A36"]] == pytest.approx(36.0)
    assert m.extra["fy_source"][at["A36"]] == "grade"
    # no material, or one naming no steel: never assumed steel
    for name in ("no material", "metal"):
        assert m.reason[at[name]].startswith("no yield strength"), name
        assert m.extra["fy_source"][at[name]] == "none"


def test_default_grade_that_gives_no_value_for_the_section(builder):
    # ASTM A500 applies to HSS only: a W shape gets no value, and is not checked
    _column(builder, _material(builder, "Steel"))
    m = read_columns(builder.model, default_grade="A500 Gr C").members
    assert m.reason[0].startswith("no yield strength: material 'Steel' names no grade")
    assert any("--default-grade A500 Gr C gives no yield stress" in s for s in m.messages[0])


def test_a_grade_that_gives_no_value_is_not_replaced_by_the_default(builder):
    # ASTM A500 Grade C names a grade; on a W shape it gives no Fy (HSS only, ASTM A500):
    # the member stays not checked for that reason, never takes --default-grade
    _column(builder, _material(builder, "Steel ASTM A500 Grade C"))
    m = read_columns(builder.model, default_grade="A992").members
    assert m.extra["fy_source"][0] == "none"
    assert "names no grade" not in m.reason[0]
    assert any("applies to HSS only" in s for s in m.messages[0])
