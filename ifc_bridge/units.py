"""Project units of an IFC model, as factors into the engine's kip / inch / ksi.

Model unit -> SI comes from ``ifcopenshell.util.unit`` (``calculate_unit_scale`` for length,
``get_project_unit`` + ``get_unit_scale`` for force and pressure, which follows chains of
IfcConversionBasedUnit and applies SI prefixes); SI -> internal comes from
:func:`engine.units.factor` (the units' exact SI definitions).  No conversion factor is
written down here.

Undeclared units.  The IFC standard leaves the unit of a measure to the project's unit
assignment ("Units globally assigned to measure types used within the context",
IfcContext.UnitsInContext, optional since IFC4; the IfcMeasureResource schema: the global
unit assignment "defines the unit for all the usages of this defined measure type") and
defines no unit to fall back on when a unit type is missing from it -- its table of measures
names each measure's SI unit, not a default.  So a value read in a project unit the model
does not declare would be a guess: :meth:`ModelUnits.note_use` records the quantity
(:attr:`ModelUnits.undeclared_used`) and :meth:`ModelUnits.refusal` gives the one line
refusing the model (:func:`ifc_bridge.read.read_columns` raises it; issue 13: units are
never guessed).  A length is always used (every member has one); a pressure only when a
yield stress is read from a property without its own ``Unit``; a force when the model
carries forces.

A force unit given apart.  A model that declares no force unit may be read with one given on
the command line (``--force-unit``, an HTTP job's ``force_unit``): :class:`GivenUnit`.  Its
forces are then read in that unit, and the first use records a model-level warning (and a
per-member note) saying the unit came from the command line, not the model.

Per-property units.  An IfcPropertySingleValue or IfcPhysicalSimpleQuantity may carry its own
``Unit``; :meth:`ModelUnits.value_factor` uses it instead of the project unit.
"""

from __future__ import annotations

from dataclasses import dataclass, field
from typing import NamedTuple

import ifcopenshell
import ifcopenshell.util.unit

from stanchion.engine.units import factor
from stanchion.ifc_bridge.access import Entity
from stanchion.ifc_bridge.errors import ModelReadError
from stanchion.ifc_bridge.relations import describe, instance_of

#: Quantity -> (IFC unit type, SI unit in pint spelling, internal unit in pint spelling).
QUANTITIES: dict[str, tuple[str, str, str]] = {
    "length": ("LENGTHUNIT", "meter", "inch"),
    "force": ("FORCEUNIT", "newton", "kip"),
    "pressure": ("PRESSUREUNIT", "pascal", "ksi"),
}

#: The SI unit of each measure type (IfcMeasureResource, Table 1), named for an undeclared
#: unit; a model using one is refused (:meth:`ModelUnits.refusal`), never read in it.
ASSUMED_SI = {"length": "metre", "force": "newton", "pressure": "pascal"}


class GivenUnit(NamedTuple):
    """A force unit given apart from the model (``--force-unit``).

    Attributes:
        name: as the user wrote it (``kN``, ``kip``).
        to_kip: multiplier, that unit -> kip.
        option: how the messages name where it was given: the command line's option
            (``--force-unit``) or a front end's own words (``the job's force_unit``).
    """

    name: str
    to_kip: float
    option: str = "--force-unit"

    @property
    def given_as(self) -> str:
        """Where it was given: ``on the command line (--force-unit)``, else ``with OPTION``."""
        if self.option.startswith("--"):
            return f"on the command line ({self.option})"
        return f"with {self.option}"


def _unit_name(unit: Entity) -> str:
    """Short human name of an IFC unit (``MILLI METRE``, ``kip``, ``MEGA PASCAL``)."""
    if unit.is_a("IfcSIUnit"):
        return " ".join(p for p in (unit.Prefix, unit.Name) if p)
    if unit.is_a("IfcNamedUnit"):
        return str(getattr(unit, "Name", None) or unit.is_a())
    return str(unit.is_a())


def si_scale(unit: Entity) -> float:
    """Multiplier taking a value in ``unit`` to SI base units (m, N, Pa, kg ...).

    ``ifcopenshell.util.unit.get_unit_scale`` scales an IfcSIUnit GRAM to grams; inside an
    IfcDerivedUnit (kg·m/s² spelled out) the kilogram is the SI base, so each GRAM element is
    corrected by 10⁻³ per exponent.
    """
    if unit.is_a("IfcDerivedUnit"):
        scale = 1.0
        for element in unit.Elements:
            named = element.Unit
            part = ifcopenshell.util.unit.get_named_unit_scale(named)
            base = named
            while base.is_a("IfcConversionBasedUnit"):
                base = base.ConversionFactor.UnitComponent
            if base.is_a("IfcSIUnit") and base.Name == "GRAM":
                part *= 1e-3
            scale *= part**element.Exponent
        return scale
    return float(ifcopenshell.util.unit.get_unit_scale(unit))


@dataclass
class ModelUnits:
    """Factors from the model's project units into kip / inch / ksi.

    Attributes:
        length, force, pressure: multipliers, model unit -> inch / kip / ksi.
        names: human names of the project units (``"MILLI METRE"``), or the assumed SI unit.
        declared: whether the model's IfcUnitAssignment declares each quantity's unit.
        warnings: model-level warnings recorded by :meth:`note_use` (each once).
        given: quantity -> the unit given apart (``--force-unit``) it is read in, for a
            quantity the model does not declare.
        given_as: where that unit was given (:attr:`GivenUnit.given_as`), for the messages.
    """

    length: float
    force: float
    pressure: float
    names: dict[str, str]
    declared: dict[str, bool]
    warnings: list[str] = field(default_factory=list)
    given: dict[str, str] = field(default_factory=dict)
    given_as: str = "on the command line (--force-unit)"
    _warned: set[str] = field(default_factory=set, repr=False)
    _told: set[str] = field(default_factory=set, repr=False)

    @property
    def undeclared_used(self) -> frozenset[str]:
        """The quantities read in an undeclared unit so far (see :meth:`note_use`)."""
        return frozenset(self._warned)

    def note_use(self, quantity: str) -> str | None:
        """Record that a value of ``quantity`` was read in the project unit.

        Returns:
            A per-member note when the unit is undeclared or given apart (None otherwise);
            an undeclared one is recorded for :meth:`refusal`, a given one's model-level
            warning is appended to :attr:`warnings` the first time only.
        """
        if self.declared[quantity]:
            return None
        if quantity in self.given:
            unit = self.given[quantity]
            if quantity not in self._told:
                self._told.add(quantity)
                self.warnings.append(
                    f"model declares no {quantity} unit; its {quantity}s are read in {unit}, "
                    f"the unit given {self.given_as}")
            return f"{quantity} read in {unit}, given {self.given_as}"
        self._warned.add(quantity)  # refused: see refusal()
        return f"{quantity} read in an undeclared unit"

    def refusal(self) -> str | None:
        """The one line refusing a model that used a unit it does not declare (or None).

        The first such quantity is named, length before pressure before force, with what
        the model must declare (and for forces ``--force-unit``, the one unit given apart).
        """
        if "length" in self._warned:
            return ("model declares no length unit (no LENGTHUNIT in the project's "
                    "IfcUnitAssignment) and IFC defines no default; units are never "
                    "guessed: the model must declare its length unit")
        if "pressure" in self._warned:
            return ("model declares no pressure unit (no PRESSUREUNIT in the project's "
                    "IfcUnitAssignment) but gives a yield stress as a pressure without a "
                    "unit of its own, and IFC defines no default; units are never guessed: "
                    "the model must declare its pressure unit (or give the property a Unit)")
        if "force" in self._warned:
            return ("model declares no force unit but carries forces (analysis results or "
                    "Stanchion_Loads); units are never guessed: declare its force unit "
                    "(IfcUnitAssignment) in the authoring program or give it with "
                    "--force-unit (e.g. --force-unit kN; an HTTP job's force_unit field)")
        return None

    def value_factor(
        self, quantity: str, unit: Entity | None
    ) -> tuple[float, str | None]:
        """Factor for one value of ``quantity`` whose property may name its own unit.

        Args:
            quantity: ``"length"``, ``"force"`` or ``"pressure"``.
            unit: the property's / quantity's ``Unit`` attribute (None: project unit).

        Returns:
            (factor into the internal unit, note or None).  A property unit of the wrong
            kind gives factor NaN and a note naming it.
        """
        if unit is None:
            return getattr(self, quantity), self.note_use(quantity)
        unit_type, si_name, internal = QUANTITIES[quantity]
        kind = getattr(unit, "UnitType", None)
        if unit.is_a("IfcDerivedUnit"):
            kind = ifcopenshell.util.unit.identify_unit_dimensions(unit) or kind
        if kind != unit_type:
            return float("nan"), f"property unit {_unit_name(unit)} is not a {quantity} unit"
        return si_scale(unit) * factor(si_name, internal), None


def read_units(model: ifcopenshell.file, force: GivenUnit | None = None) -> ModelUnits:
    """The model's project length, force and pressure units.

    Args:
        model: an opened IFC model.
        force: the force unit given apart (``--force-unit``): used when the model declares
            none; a model that declares one is read in its own (a warning says so).

    Returns:
        :class:`ModelUnits`; undeclared quantities use the SI base unit (see module notes),
        or for forces the given unit.
    """
    factors: dict[str, float] = {}
    names: dict[str, str] = {}
    declared: dict[str, bool] = {}
    has_project = bool(model.by_type("IfcProject"))
    for project in model.by_type("IfcProject") if has_project else ():
        assignment: Entity = getattr(project, "UnitsInContext", None)
        if assignment is not None and not instance_of(assignment, "IfcUnitAssignment"):
            raise ModelReadError(f"damaged model: #{project.id()} IfcProject.UnitsInContext "
                                 f"holds {describe(assignment)} where an IfcUnitAssignment "
                                 "belongs")
    for quantity, (unit_type, si_name, internal) in QUANTITIES.items():
        unit = ifcopenshell.util.unit.get_project_unit(model, unit_type) if has_project else None
        to_internal = factor(si_name, internal)
        if unit is None:
            factors[quantity] = to_internal
            names[quantity] = f"{ASSUMED_SI[quantity]} (not declared)"
            declared[quantity] = False
            continue
        try:  # a damaged unit (a line retyped) must not stop the run with a traceback
            if quantity == "length":
                scale = float(ifcopenshell.util.unit.calculate_unit_scale(model, unit_type))
            else:
                scale = si_scale(unit)
        except (AttributeError, TypeError, ValueError) as exc:
            raise ModelReadError(f"damaged model: its {quantity} unit {describe(unit)} cannot "
                                 f"be read ({exc})") from None
        factors[quantity] = scale * to_internal
        names[quantity] = _unit_name(unit)
        declared[quantity] = True
    units = ModelUnits(
        length=factors["length"],
        force=factors["force"],
        pressure=factors["pressure"],
        names=names,
        declared=declared,
    )
    if force is not None and declared["force"]:
        units.warnings.append(
            f"the model declares its force unit ({names['force']}): its forces are read in "
            f"it, not in {force.name} ({force.option})")
    elif force is not None:
        units.force = force.to_kip
        units.names["force"] = f"{force.name} ({force.option})"
        units.given["force"] = force.name
        units.given_as = force.given_as
    return units
