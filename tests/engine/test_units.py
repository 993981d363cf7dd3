"""Unit factors: the named units' exact SI definitions agree with pint, other expressions go
to pint, and nonsense is a ValueError."""

from __future__ import annotations

import itertools

import pint
import pytest

from stanchion.engine import units

UREG = pint.UnitRegistry()
NAMED = list(units._SI)


@pytest.mark.parametrize(("unit", "internal"), [
    (a, b) for a, b in itertools.product(NAMED, NAMED) if units._SI[a][0] == units._SI[b][0]])
def test_named_units_agree_with_pint(unit: str, internal: str) -> None:
    # pint's definitions (inch = 2.54 cm, pound = 0.45359237 kg, g_0 = 9.80665 m/s²) are the
    # reference; the two differ by float rounding at most.
    expected = UREG.Quantity(1.0, unit).to(internal).magnitude
    assert units.factor(unit, internal) == pytest.approx(expected, rel=1e-14, abs=0)


def test_request_units_cover_the_table() -> None:
    for table in (units.FORCE_UNITS, units.LENGTH_UNITS, units.STRESS_UNITS):
        assert set(table.values()) <= set(units._SI)  # no request unit needs pint at run time


def test_familiar_values() -> None:
    # Exact definitions (NIST SP 811): 1 kip = 4.4482216152605 kN, 1 ft = 304.8 mm,
    # 1 ksi = 6.894757293 MPa (to 10 digits).
    assert units.factor("kip", "kilonewton") == pytest.approx(4.4482216152605, rel=1e-15)
    assert units.factor("foot", "millimeter") == pytest.approx(304.8, rel=1e-15)
    assert units.factor("ksi", "megapascal") == pytest.approx(6.894757293, rel=1e-9)


def test_other_expressions_go_to_pint() -> None:
    # 1 ton_force (short ton) = 2000 lbf = 2 kip; 1 kgf = 9.80665 N (pint's definitions)
    assert units.factor("ton_force", "kip") == pytest.approx(2.0, rel=1e-12)
    assert units.factor("kgf", "newton") == pytest.approx(9.80665, rel=1e-12)


@pytest.mark.parametrize(("unit", "internal"), [("meter", "kip"), ("furlongs of doom", "kip"),
                                                ("kip", "ksi")])
def test_unusable_conversions_are_value_errors(unit: str, internal: str) -> None:
    with pytest.raises(ValueError, match="cannot convert"):
        units.factor(unit, internal)
