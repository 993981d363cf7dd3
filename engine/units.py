"""Unit conversion at the edges.  The engine works in kip, inch and ksi throughout.

The units stanchion names (requests, reports, IFC project units) convert through their exact
definitions in SI (NIST SP 811, Appendix B: 1 in = 0.0254 m, 1 lbm = 0.45359237 kg, standard
gravity 9.80665 m/s2), the same definitions pint uses: ``tests/engine/test_units.py`` checks
every pair against pint.  Any other unit expression (a load table may name one) goes to pint,
loaded only then: the registry takes a good part of a second to build.
"""

from __future__ import annotations

from functools import cache
from typing import TYPE_CHECKING

if TYPE_CHECKING:
    import pint

# Names accepted in requests (docs/design.md §2) -> pint unit expressions.
FORCE_UNITS = {"kip": "kip", "kN": "kilonewton", "N": "newton", "lbf": "lbf", "MN": "meganewton"}
LENGTH_UNITS = {"ft": "foot", "in": "inch", "m": "meter", "mm": "millimeter"}
STRESS_UNITS = {"ksi": "ksi", "MPa": "megapascal", "psi": "psi", "Pa": "pascal"}

INTERNAL = {"force": "kip", "length": "inch", "stress": "ksi"}

#: Named report unit systems for the command line (``--units``): request unit names.
UNIT_SYSTEMS: dict[str, dict[str, str]] = {
    "us": {"force": "kip", "length": "ft", "stress": "ksi"},
    "si": {"force": "kN", "length": "m", "stress": "MPa"},
}

_INCH = 0.0254  # m, exact
_LBF = 0.45359237 * 9.80665  # N: pound mass × standard gravity, exact
#: The named units in SI base units (m, N, Pa), with the kind they measure.
_SI: dict[str, tuple[str, float]] = {
    "meter": ("length", 1.0), "millimeter": ("length", 1e-3), "inch": ("length", _INCH),
    "foot": ("length", 12 * _INCH),
    "newton": ("force", 1.0), "kilonewton": ("force", 1e3), "meganewton": ("force", 1e6),
    "lbf": ("force", _LBF), "kip": ("force", 1000 * _LBF),
    "pascal": ("stress", 1.0), "megapascal": ("stress", 1e6),
    "psi": ("stress", _LBF / _INCH**2), "ksi": ("stress", 1000 * _LBF / _INCH**2),
}


@cache
def _registry() -> pint.UnitRegistry[float]:
    import pint

    return pint.UnitRegistry()


@cache
def factor(unit: str, internal: str) -> float:
    """Multiplier taking a value in unit ``unit`` into unit ``internal``.

    Args:
        unit: a unit name or pint expression, e.g. ``"kilonewton"``, ``"tonf"``.
        internal: the unit to convert into.

    Raises:
        ValueError: a unit pint does not know, or units of different kinds.
    """
    a, b = _SI.get(unit), _SI.get(internal)
    if a is not None and b is not None and a[0] == b[0]:
        return a[1] / b[1]
    try:
        return float(_registry().Quantity(1.0, unit).to(internal).magnitude)
    except Exception as exc:  # pint's own errors, or a malformed expression
        raise ValueError(f"cannot convert {unit!r} to {internal!r}: {exc}") from None


def force_factor(name: str) -> float:
    """Request force unit name -> kip multiplier."""
    return factor(FORCE_UNITS[name], INTERNAL["force"])


def length_factor(name: str) -> float:
    """Request length unit name -> inch multiplier."""
    return factor(LENGTH_UNITS[name], INTERNAL["length"])


def stress_factor(name: str) -> float:
    """Request stress unit name -> ksi multiplier."""
    return factor(STRESS_UNITS[name], INTERNAL["stress"])
