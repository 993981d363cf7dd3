"""Undeclared project units are refused, never assumed (issue 13 item 3; docs/design.md §5).

The IFC standard leaves a measure's unit to the project's unit assignment and defines none to
fall back on (IFC4.3 IfcMeasureResource and IfcContext.UnitsInContext), so a model whose
assignment lacks the length unit -- or the pressure unit while a yield stress is read as a
pressure -- is refused with one line naming what is missing.  Issue 13 measured a W12X40
becoming 990 ft deep with the length unit swapped.
"""

from __future__ import annotations

import pytest

from stanchion.ifc_bridge.errors import ModelReadError
from stanchion.ifc_bridge.read import read_columns
from tests.ifc_bridge.conftest import ModelBuilder

W14X48 = {"d": 13.8, "bf": 8.03, "tw": 0.340, "tf": 0.595}  # AISC Shapes Database v16.0
#: MPa per ksi: 6.894757 (NIST SP 811, Appendix B.9; 1 ksi = 1000 lbf/in²).
MPA_PER_KSI = 6.894757


def _column(b: ModelBuilder, fy: float | None = 50.0, material: str = "Steel"):
    return b.column("C1", profile=b.profile("I", "W14X48", **W14X48),
                    material=b.material(material, fy=fy))


@pytest.mark.parametrize("units", ["none", "mm_only"])
def test_a_yield_stress_in_an_undeclared_pressure_unit_is_refused(schema, units) -> None:
    b = ModelBuilder(schema, units)
    _column(b)  # Pset_MaterialSteel / IfcMechanicalSteelMaterialProperties YieldStress
    with pytest.raises(ModelReadError) as err:
        read_columns(b.model)
    text = str(err.value)
    if units == "none":  # the length is missing first
        assert text.startswith("model declares no length unit (no LENGTHUNIT in the "
                               "project's IfcUnitAssignment)"), text
    else:
        assert text.startswith("model declares no pressure unit (no PRESSUREUNIT in the "
                               "project's IfcUnitAssignment) but gives a yield stress"), text
    assert "the model must declare its" in text and "\n" not in text


def test_a_model_without_a_unit_assignment_is_refused(schema) -> None:
    b = ModelBuilder(schema, "mm_N")
    _column(b, fy=None, material="ASTM A992")
    b.project.UnitsInContext = None  # IFC4 made it optional; the IFC2X3 file is then invalid
    with pytest.raises(ModelReadError, match="^model declares no length unit"):
        read_columns(b.model)


def test_a_yield_stress_from_the_grade_needs_no_pressure_unit(schema) -> None:
    # ASTM A992: Fy = 50 ksi (ASTM A992/A992M, Table 2); no pressure is read from the model
    b = ModelBuilder(schema, "mm_only")
    _column(b, fy=None, material="ASTM A992")
    result = read_columns(b.model)
    assert result.members.Fy[0] == pytest.approx(50.0)
    assert not any("pressure" in m for m in result.messages)


def test_a_property_with_its_own_unit_needs_no_project_pressure_unit(schema) -> None:
    b = ModelBuilder(schema, "mm_only")
    col = _column(b, fy=None, material="Steel")
    pset = b.pset(col, "Stanchion_Design", {"YieldStress": b.measure(
        "IfcPressureMeasure", 50.0 * MPA_PER_KSI)})
    prop = next(p for p in pset.HasProperties if p.Name == "YieldStress")
    prop.Unit = b.model.create_entity("IfcSIUnit", UnitType="PRESSUREUNIT", Prefix="MEGA",
                                      Name="PASCAL")
    result = read_columns(b.model)
    assert result.members.Fy[0] == pytest.approx(50.0, rel=1e-6)


def test_declared_units_read_without_a_message(schema) -> None:
    b = ModelBuilder(schema, "mm_N")
    _column(b)
    result = read_columns(b.model)
    assert result.members.Fy[0] == pytest.approx(50.0)
    assert not any("unit" in m for m in result.messages)
