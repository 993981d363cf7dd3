"""Storey heights and the project GlobalId for BCF viewpoints (ifc_bridge/storeys.py)."""

from __future__ import annotations

import ifcopenshell.api.geometry
import numpy as np
import pytest

from stanchion.ifc_bridge.storeys import project_guid, storey_elevations


def test_storey_height_from_its_placement_else_its_elevation(builder) -> None:
    placed, listed, bare = (builder.storey(n) for n in ("L2", "L3", "L4"))
    matrix = np.eye(4)
    matrix[2, 3] = 3.5  # metres: the api converts to the model's unit (mm here)
    ifcopenshell.api.geometry.edit_object_placement(builder.model, product=placed,
                                                    matrix=matrix)
    listed.Elevation = 7000.0  # model unit mm
    heights = storey_elevations(builder.model)
    assert heights["L2"] == pytest.approx(3500.0)  # 3.5 m in mm
    assert heights["L3"] == pytest.approx(7000.0)
    assert "L4" not in heights  # neither placement nor elevation: no height, never 0 guessed
    assert bare.Name == "L4"
    assert project_guid(builder.model) == builder.project.GlobalId
