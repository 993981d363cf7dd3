"""Property sets and quantities: finding them and reading typed numbers out of them.

Our input property sets (docs/design.md §5), on a column or on its element type -- for each
property the occurrence's value wins over the type's:

``Stanchion_Design``
    ``KX``, ``KY``, ``KZ``: effective length factors (IfcPositiveRatioMeasure / IfcReal) for
    flexural buckling about the section's x (major) and y (minor) axes and for torsional
    buckling; ``UnbracedLengthX/Y/Z`` (IfcLengthMeasure, model length unit); ``YieldStress``
    (IfcPressureMeasure, model pressure unit) -- an override that wins over every material
    source (see :mod:`ifc_bridge.materials`).  x / y are the engine's section axes (AISC: x is
    the major axis), whatever the orientation of the profile in the model.

``Stanchion_Loads``
    ``D``, ``L``, ``Lr``, ``S``, ``R``, ``W``, ``E``: axial service load effects,
    IfcForceMeasure in the model's force unit, compression positive.

A property's own ``Unit`` overrides the project unit.  A value typed with a measure of
another quantity (an IfcForceMeasure for a length) is refused; an untyped number (IfcReal,
IfcInteger) is read in the project unit with a note.
"""

from __future__ import annotations

import functools
import math
from dataclasses import dataclass, field

from stanchion.engine.members import LOAD_TYPES
from stanchion.ifc_bridge.access import Entity, get, get_opt
from stanchion.ifc_bridge.units import ModelUnits

DESIGN_PSET = "Stanchion_Design"
LOADS_PSET = "Stanchion_Loads"
AXES = ("X", "Y", "Z")

#: Measure types accepted for each quantity; other numeric types are "untyped".
MEASURES: dict[str, frozenset[str]] = {
    "length": frozenset({"IfcLengthMeasure", "IfcPositiveLengthMeasure",
                         "IfcNonNegativeLengthMeasure"}),
    "force": frozenset({"IfcForceMeasure"}),
    "pressure": frozenset({"IfcPressureMeasure", "IfcModulusOfElasticityMeasure"}),
    "ratio": frozenset({"IfcRatioMeasure", "IfcPositiveRatioMeasure",
                        "IfcNormalisedRatioMeasure"}),
}
_UNTYPED = frozenset({"IfcReal", "IfcInteger", "IfcNumericMeasure", "IfcCountMeasure"})
_ALL_MEASURES = frozenset().union(*MEASURES.values())


@dataclass(frozen=True)
class PropertyValue:
    """One single value: its number or text, IFC value type and own unit (if any)."""

    value: object
    measure: str | None
    unit: Entity | None


def find_definition(definitions: list[Entity], name: str) -> Entity | None:
    """First property set / element quantity called ``name``."""
    for d in definitions:
        if get_opt(d, "Name") == name:
            return d
    return None


def single_values(pset: Entity | None) -> dict[str, PropertyValue]:
    """The IfcPropertySingleValue members of a property set, by name."""
    out: dict[str, PropertyValue] = {}
    if pset is None or not pset.is_a("IfcPropertySet"):
        return out
    for prop in get(pset, "HasProperties") or ():
        if not prop.is_a("IfcPropertySingleValue"):
            continue
        nominal = get(prop, "NominalValue")
        name, unit = get(prop, "Name"), get(prop, "Unit")
        if nominal is None:
            out[name] = PropertyValue(None, None, unit)
        else:  # a typed value wrapper: its only argument is the value
            out[name] = PropertyValue(nominal.get_argument(0), nominal.is_a(), unit)
    return out


def quantity_length(definitions: list[Entity], units: ModelUnits) -> tuple[float | None, str]:
    """``Length`` from a base-quantity set, in inches.

    IFC4 / IFC4X3 name the set ``Qto_ColumnBaseQuantities`` (``Qto_MemberBaseQuantities``
    for members); IFC2X3 models use ``BaseQuantities``.  Any IfcElementQuantity with one of
    those names is searched for an IfcQuantityLength called ``Length``.

    Returns:
        (length in inches or None, note -- empty, or what was assumed about units).
    """
    for d in definitions:
        if not d.is_a("IfcElementQuantity"):
            continue
        if d.Name not in ("Qto_ColumnBaseQuantities", "Qto_MemberBaseQuantities",
                          "BaseQuantities"):
            continue
        for q in d.Quantities or ():
            if q.is_a("IfcQuantityLength") and q.Name == "Length" and q.LengthValue:
                f, note = units.value_factor("length", q.Unit)
                value = float(q.LengthValue) * f
                if math.isfinite(value) and value > 0:
                    return value, note or ""
    return None, ""


def to_internal(
    pv: PropertyValue, quantity: str, units: ModelUnits, label: str
) -> tuple[float | None, str | None, str | None]:
    """Convert one property value of ``quantity`` to internal units.

    Args:
        pv: the property value.
        quantity: ``"length"``, ``"force"``, ``"pressure"`` or ``"ratio"`` (dimensionless).
        units: the model's units.
        label: ``"Pset.Prop"`` for messages.

    Returns:
        (value or None, note or None, problem or None).  A problem means the value is
        unusable (wrong type, not a number, wrong unit).
    """
    if pv.value is None:
        return None, None, None
    if isinstance(pv.value, bool) or not isinstance(pv.value, int | float):
        return None, None, f"{label} = {pv.value!r} is not a number"
    measure = pv.measure or ""
    note = None
    if measure not in MEASURES[quantity]:
        if measure in _ALL_MEASURES:
            return None, None, f"{label} is an {measure}, expected a {quantity} measure"
        if measure not in _UNTYPED:
            return None, None, f"{label} has value type {measure}, expected a {quantity}"
        if quantity != "ratio":
            note = f"{label} is an untyped {measure}; read in the model's {quantity} unit"
    if quantity == "ratio":
        return float(pv.value), note, None
    f, unit_note = units.value_factor(quantity, pv.unit)
    if not math.isfinite(f):
        return None, None, f"{label}: {unit_note}"
    notes = "; ".join(n for n in (note, unit_note) if n) or None
    return float(pv.value) * f, notes, None


@dataclass
class DesignInputs:
    """Stanchion_Design values for one member (internal units).

    Attributes:
        k: effective length factors by axis ("X", "Y", "Z"), only those given.
        unbraced: unbraced lengths (in) by axis, only those given.
        fy: yield stress override (ksi) or None.
        notes: member messages (unit assumptions).
        problems: unusable values, each a not-checked reason.
    """

    k: dict[str, float] = field(default_factory=dict)
    unbraced: dict[str, float] = field(default_factory=dict)
    fy: float | None = None
    notes: list[str] = field(default_factory=list)
    problems: list[str] = field(default_factory=list)


def design_inputs(
    occurrence: dict[str, PropertyValue], type_values: dict[str, PropertyValue],
    units: ModelUnits,
) -> DesignInputs:
    """Read Stanchion_Design (occurrence values win property by property over the type's).

    Args:
        occurrence: :func:`single_values` of the occurrence's Stanchion_Design ({} when
            absent).
        type_values: the same for the element type's Stanchion_Design.
        units: the model's units.

    Returns:
        The member's design inputs, notes and problems.
    """
    out = DesignInputs()
    values = {**type_values, **occurrence}
    wanted = [(f"K{a}", "ratio", out.k, a) for a in AXES]
    wanted += [(f"UnbracedLength{a}", "length", out.unbraced, a) for a in AXES]
    for prop, quantity, target, axis in wanted:
        if prop not in values:
            continue
        value, note, problem = to_internal(values[prop], quantity, units, f"{DESIGN_PSET}.{prop}")
        if problem:
            out.problems.append(problem)
        elif value is not None:
            if not (math.isfinite(value) and value > 0):
                out.problems.append(f"{DESIGN_PSET}.{prop} = {values[prop].value} "
                                    "is not a positive number")
                continue
            target[axis] = value
        if note:
            out.notes.append(note)
    if "YieldStress" in values:
        value, note, problem = to_internal(values["YieldStress"], "pressure", units,
                                           f"{DESIGN_PSET}.YieldStress")
        if problem:
            out.problems.append(problem)
        elif value is not None:
            if math.isfinite(value) and value > 0:
                out.fy = value
            else:
                out.problems.append(f"{DESIGN_PSET}.YieldStress = {values['YieldStress'].value}"
                                    " is not a positive number")
        if note:
            out.notes.append(note)
    return out


@functools.lru_cache(maxsize=64)
def _default_text(k_given: frozenset[str], l_given: frozenset[str]) -> str | None:
    parts = []
    k_missing = [f"K{a}" for a in AXES if a not in k_given]
    l_missing = [f"L{a.lower()}" for a in AXES if a not in l_given]
    if k_missing:
        parts.append(" = ".join(k_missing) + " = 1.0")
    if l_missing:
        parts.append(" = ".join(l_missing) + " = member length")
    return ("defaults used (no Stanchion_Design value): " + "; ".join(parts)) if parts else None


def default_note(design: DesignInputs) -> str | None:
    """Message naming the K factors and unbraced lengths that took their defaults.

    Args:
        design: the member's Stanchion_Design inputs.

    Returns:
        The message, or None when every value was given.
    """
    return _default_text(frozenset(design.k), frozenset(design.unbraced))


def pset_loads(
    values: dict[str, PropertyValue], units: ModelUnits
) -> tuple[dict[str, float], list[str], list[str]]:
    """Stanchion_Loads on the column or its type.

    Args:
        values: :func:`single_values` of the Stanchion_Loads of the type, updated with the
            column's own ({} when absent).
        units: the model's units.

    Returns:
        ({load type: kip}, member notes, problems).  A load value that cannot be read (text,
        a measure of another quantity) is a problem -- the member is not checked rather than
        checked without that load.
    """
    loads: dict[str, float] = {}
    notes: list[str] = []
    problems: list[str] = []
    for name, pv in values.items():
        if name not in LOAD_TYPES:
            notes.append(f"{LOADS_PSET}.{name} ignored: not a load type "
                         f"({', '.join(LOAD_TYPES)})")
            continue
        value, note, problem = to_internal(pv, "force", units, f"{LOADS_PSET}.{name}")
        if problem:
            problems.append(problem)
        elif value is not None and math.isfinite(value):
            loads[name] = value
        if note:
            notes.append(note)
    return loads, notes, problems
