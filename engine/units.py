"""Unit conversion at the edges.  The engine works in kip, inch and ksi throughout.

Factors come from pint's unit definitions, not from a table of our own.
"""

from __future__ import annotations

from functools import cache

import pint

_UREG: pint.UnitRegistry[float] = pint.UnitRegistry()

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


@cache
def factor(unit: str, internal: str) -> float:
    """Multiplier taking a value in pint unit ``unit`` into pint unit ``internal``."""
    return float(_UREG.Quantity(1.0, unit).to(internal).magnitude)


def force_factor(name: str) -> float:
    """Request force unit name -> kip multiplier."""
    return factor(FORCE_UNITS[name], INTERNAL["force"])


def length_factor(name: str) -> float:
    """Request length unit name -> inch multiplier."""
    return factor(LENGTH_UNITS[name], INTERNAL["length"])


def stress_factor(name: str) -> float:
    """Request stress unit name -> ksi multiplier."""
    return factor(STRESS_UNITS[name], INTERNAL["stress"])
