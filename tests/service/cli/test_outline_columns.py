"""``stanchion check`` on columns whose profiles are outlines (issue 14 items 1, 2 and 5).

Two exporter patterns through the whole command line (read, Chapter E, report): an
'HEB 300' composite-curve outline with degree fillets in a model in metres, material
'Metall - Baustahl S235'; an 'RHS200x100x6 Steel' outline with a void and material
'Steel' (50 ksi), whose EN tube name gives the nominal wall.  φcPn is compared with AISC
360-22 E3 by hand (tests/ifc_bridge/test_read_outline_columns.py, ``phi_pn``) within 2 %.
"""

from __future__ import annotations

import json

import pytest

from stanchion.service.cli import main
from tests.ifc_bridge.test_outlines import (
    add_angle_unit,
    arbitrary,
    filleted_i,
    rounded_rect_curve,
)
from tests.ifc_bridge.test_read_outline_columns import MM, MPA, TOL, _rhs_expected, phi_pn
from tests.service.test_model_check_files import builder_module


def _report(tmp_path, builder):
    path = builder.write(tmp_path / "model.ifc")
    report = tmp_path / "r.json"
    assert main(["check", str(path), "--report", str(report), "--quiet"]) == 0
    data = json.loads(report.read_text())
    assert data["units"]["force"] == "kip"
    return data["members"][0]


@pytest.mark.parametrize("schema", ["IFC2X3", "IFC4"])
def test_heb_outline_in_metres(tmp_path, schema) -> None:
    b = builder_module().ModelBuilder(schema, "m_kN")
    add_angle_unit(b.model, "degree")
    profile = filleted_i(b.model, 0.300, 0.300, 0.011, 0.019, 0.027, 1.0)
    profile.ProfileName = "HEB 300"
    col = b.column("C1", profile=profile, material=b.material("Metall - Baustahl S235"),
                   length=3500 * MM)
    b.loads(col, D=100.0)
    member = _report(tmp_path, b)
    assert member["status"] == "pass"
    assert member["profile_source"].endswith("/outline")
    # EN 10365 HE 300 B published: A 149.1 cm², iz 7.58 cm (from memory); fy 235 MPa
    expected = phi_pn(149.1 * 100 * MM**2, 75.8 * MM, 3500 * MM, 235 * MPA)
    assert member["available_strength"] == pytest.approx(expected, rel=TOL)


def test_en_tube_outline_with_material_steel(tmp_path) -> None:
    b = builder_module().ModelBuilder("IFC4", "mm_N")
    m = b.model
    add_angle_unit(m, "degree")
    profile = arbitrary(m, rounded_rect_curve(m, 100, 200, 12, 1.0), "RHS200x100x6 Steel",
                        voids=[rounded_rect_curve(m, 88, 188, 6, 1.0)])
    col = b.column("C1", profile=profile, material=b.material("Steel", fy=50.0),
                   length=3000 * MM)
    b.loads(col, D=50.0)
    member = _report(tmp_path, b)
    assert member["status"] == "pass"
    # sectionproperties' own RHS builder, nominal 6 mm wall (EN 10210/10219 tube)
    expected = _rhs_expected(6.0, 50.0 / MPA, 3000)
    assert member["available_strength"] == pytest.approx(expected, rel=TOL)
