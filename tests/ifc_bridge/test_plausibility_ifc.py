"""IFC models in a wrong unit are not checked, never passed (engine/plausibility.py limits).

issue 13 item 3: with the sample's length unit swapped (mm -> m) a W12X40 became 990 ft deep
and passed. Here a W14X48 column, 144 in long, D = 100 and L = 50 kip, Fy = 50 ksi is built
in millimetre / newton / N/mm² and one declared unit is then swapped; the numbers stay.
"""

from __future__ import annotations

import pytest

from stanchion.engine.check import NOT_CHECKED, PASS, check_members
from stanchion.ifc_bridge.read import read_columns
from tests.ifc_bridge.test_read_columns import standard_column


def _swap(builder, unit_type: str, prefix: str | None) -> None:
    """Give the model's declared ``unit_type`` SI unit another prefix."""
    for unit in builder.model.by_type("IfcSIUnit"):
        if unit.UnitType == unit_type:
            unit.Prefix = prefix


def _unname(builder) -> None:
    """Drop the profile's catalog name: the section is then built from its dimensions."""
    for profile in builder.model.by_type("IfcIShapeProfileDef"):
        profile.ProfileName = None


def _check(builder):
    return check_members(read_columns(builder.model).members)


def test_the_unswapped_model_passes(builder):
    # W14X48, Lc = 12 ft: φcPn ≈ 400 kip > 1.2·100 + 1.6·50 = 200 kip (AISC Manual
    # Table 4-1a, read-off; ASCE 7-22 §2.3.1 combination 2).
    standard_column(builder)
    assert _check(builder).status.tolist() == [PASS]


@pytest.mark.parametrize(("unit_type", "prefix", "reason"), [
    # mm read as m: the section's area grows 10^6 times (about 1.4e+07 in², over
    # 4 × 272 in²) and the 144 in column becomes 12,000 ft long; the area is named first
    # (engine/plausibility.py order: yield stress, E, area, depth, lengths, loads).
    ("LENGTHUNIT", None, "implausible section area"),
    # N/mm² read as N/m² (Pa): Fy = 344.7 Pa = 5.0e-05 ksi (under 20 ksi).
    ("PRESSUREUNIT", None, "implausible yield stress"),
    # N read as MN: D = 444,822 MN = 1.0e+08 kip (over 100,000 kip).
    ("FORCEUNIT", "MEGA", "implausible load"),
])
def test_a_swapped_unit_is_not_checked(builder, unit_type, prefix, reason):
    standard_column(builder)
    _unname(builder)  # the catalog name would disagree first (see the test below)
    _swap(builder, unit_type, prefix)
    r = _check(builder)
    assert r.status.tolist() == [NOT_CHECKED]
    assert r.reason[0].startswith(reason), r.reason[0]
    assert r.reason[0].endswith(": check the units")


def test_a_swapped_length_unit_under_a_catalog_name_is_a_disagreement(builder):
    # The W14X48 name and its 1000 times larger modeled dimensions disagree beyond 2 %
    # (ifc_bridge/sections.py: name and geometry must agree), so that is the reason.
    standard_column(builder)
    _swap(builder, "LENGTHUNIT", None)
    r = _check(builder)
    assert r.status.tolist() == [NOT_CHECKED]
    assert "disagree with catalog W14X48 (d 1.38e+04 in vs 13.8 in" in r.reason[0]
