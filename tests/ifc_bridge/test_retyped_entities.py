"""Entities retyped by damage that the reader met only through the regenerated samples' fuzz
mutants (tests/service/test_fuzz_models.py): a unit assignment turned into another class
(refused, one line) and a column turned into a spatial element (a model-level note).
"""

from __future__ import annotations

import ifcopenshell.api.root
import pytest

from stanchion.ifc_bridge.errors import ModelReadError
from stanchion.ifc_bridge.read import read_columns


def _column(builder):
    profile = builder.profile("I", "W10X49", d=10.0, bf=10.0, tw=0.34, tf=0.56, r=0.5)
    return builder.column("C1", profile=profile, material=builder.material("A992", fy=50.0))


def test_units_in_context_of_another_class_is_refused(builder):
    _column(builder)
    project = builder.model.by_type("IfcProject")[0]
    project.UnitsInContext = builder.model.by_type("IfcShapeRepresentation")[0]
    with pytest.raises(ModelReadError) as err:
        read_columns(builder.model)
    text = str(err.value)
    assert text.startswith(f"damaged model: #{project.id()} IfcProject.UnitsInContext holds #")
    assert "an IfcShapeRepresentation, where an IfcUnitAssignment belongs" in text


def test_a_contained_spatial_element_is_noted(builder):
    _column(builder)
    lost = ifcopenshell.api.root.create_entity(builder.model, ifc_class="IfcBuilding",
                                               name="was a column")
    rel = builder.model.by_type("IfcRelContainedInSpatialStructure")[0]  # the column's
    rel.RelatedElements = [*rel.RelatedElements, lost]
    read = read_columns(builder.model)
    assert len(read.members) == 1
    notes = [m for m in read.messages if "IfcRelContainedInSpatialStructure contains" in m]
    assert len(notes) == 1
    assert f"#{lost.id()}, an IfcBuilding" in notes[0] and "WR31" in notes[0]
