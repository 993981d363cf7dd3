"""Results back into the model: one ``Stanchion_ColumnCheck`` property set per column.

Every value is typed with its IFC measure type (docs/design.md §5): ``Status`` IfcLabel, forces
IfcForceMeasure in the model's force unit, ratios IfcRatioMeasure, texts IfcText.  Nothing is
left for a library to guess from a Python type.

Shared properties.  A property whose value is the same on every set written in one run (the
design basis, the disclaimer, the time of the check, and any result that happens to be equal
on every column, e.g. ``Status`` when every column passes) is one IfcPropertySingleValue
referenced by every set: IFC lets a property belong to several sets (IfcProperty.PartOfPset
is a SET [0:?] in IFC4 and IFC4X3; IFC2X3 places no limit), and viewers show it in each set
exactly as if it were a copy.  ``ifcopenshell.api.pset.edit_pset`` treats such a property as
shared and gives the edited set its own copy.  Every set lists its properties in one order
(:data:`PROPERTY_ORDER`), shared or not.

Speed.  A model of 20,000 columns gets about 200,000 new entities.  They are created with
``file.create`` and the attribute setter of the entity instance, by attribute index
(:class:`_Factory`; about six times faster than ``file.create_entity`` with keywords, which
maps names to indices and checks for a transaction on every attribute).  Where that setter
is missing (another ifcopenshell version) or the caller has a transaction open (undo), the
public ``create_entity`` / ``entity[i] = value`` path is used.  GlobalIds are drawn for all
sets at once (:func:`new_guids`); typed texts are built once per distinct text; existing sets
are found in one pass over ``IfcRelDefinesByProperties``; attributes are read by index.

Idempotence.  A column that already carries the set keeps it: its own properties get their
new values in place, properties that no longer apply or became shared are taken out (and
removed once no set refers to them), missing ones are added, and a shared property of the
previous run is reused, its value updated in place, when only sets rewritten in this run
refer to it.  A set shared by several columns is split, extra copies on one column are
removed, so a rerun never duplicates and leaves no orphaned property of ours.  Our owner
history (IFC2X3 requires one on every rooted entity) and the force unit (added only when the
model declares none) are likewise found again on a rerun.

Entities the writer may add: IfcPropertySet, IfcPropertySingleValue, IfcRelDefinesByProperties
and, once, IfcOwnerHistory / IfcApplication / IfcOrganization / IfcPerson /
IfcPersonAndOrganization / IfcSIUnit (FORCEUNIT) / IfcUnitAssignment.  Nothing else is touched.
"""

from __future__ import annotations

import contextlib
import gc
import math
import os
import time
from collections.abc import Callable, Iterable, Iterator, Sequence
from dataclasses import dataclass, field
from datetime import UTC, datetime
from typing import Any

import ifcopenshell
import ifcopenshell.guid
import ifcopenshell.util.unit
import numpy as np

from stanchion import __version__
from stanchion.engine.arrays import FloatArray
from stanchion.engine.check import FAIL, NOT_CHECKED, PASS, SKIPPED, CheckResults
from stanchion.engine.members import MemberTable
from stanchion.engine.units import factor
from stanchion.ifc_bridge.access import Entity
from stanchion.ifc_bridge.units import si_scale

PSET_NAME = "Stanchion_ColumnCheck"
STATUS_LABELS = {PASS: "PASS", FAIL: "FAIL", NOT_CHECKED: "NOT CHECKED", SKIPPED: "SKIPPED"}
APPLICATION_ID = "stanchion"
APPLICATION_NAME = "stanchion column checks"
APPLICATION_VERSION = __version__
#: Reason written on a column of the model that is missing from the checked member table.
NOT_IN_TABLE = "column was not read as a member; see the reader's messages"
#: IfcLabel is STRING(255) in IFC4 and IFC4X3.
LABEL_MAX = 255

# Property name -> IFC type, in the order every set lists its properties.  Ratios of like
# quantities (utilization = force / force, slenderness Lc/r = length / length) are
# IfcRatioMeasure, which has no range restriction (unlike IfcNormalisedRatioMeasure).
# CheckedAt is an IfcLabel in IFC2X3 (see _Writer).
PROPERTY_TYPES: dict[str, str] = {
    "Status": "IfcLabel",
    "Section": "IfcLabel",
    "GridLocation": "IfcLabel",
    "Utilization": "IfcRatioMeasure",
    "RequiredStrength": "IfcForceMeasure",
    "AvailableStrength": "IfcForceMeasure",
    "GoverningCombination": "IfcLabel",
    "GoverningLimitState": "IfcLabel",
    "Slenderness": "IfcRatioMeasure",
    "Reason": "IfcText",
    "Notes": "IfcText",
    "SuggestedSection": "IfcLabel",
    "SuggestedUtilization": "IfcRatioMeasure",
    "DesignBasis": "IfcLabel",
    "Disclaimer": "IfcText",
    "CheckedAt": "IfcDateTime",
}
PROPERTY_ORDER: tuple[str, ...] = tuple(PROPERTY_TYPES)

# Attribute positions, the same in IFC2X3, IFC4 and IFC4X3 (checked against the schemas by
# tests/ifc_bridge/test_write.py): IfcProperty.Name; IfcPropertySingleValue.NominalValue,
# .Unit; IfcRoot.GlobalId, .OwnerHistory, .Name; IfcPropertySet.HasProperties;
# IfcRelDefinesByProperties.RelatedObjects, .RelatingPropertyDefinition.
ATTRIBUTE_INDEX: dict[str, dict[str, int]] = {
    "IfcPropertySingleValue": {"Name": 0, "NominalValue": 2, "Unit": 3},
    "IfcPropertySet": {"GlobalId": 0, "OwnerHistory": 1, "Name": 2, "HasProperties": 4},
    "IfcRelDefinesByProperties": {"GlobalId": 0, "OwnerHistory": 1, "RelatedObjects": 4,
                                  "RelatingPropertyDefinition": 5},
}
_NAME, _NOMINAL, _UNIT = 0, 2, 3
_GLOBAL_ID, _HISTORY, _HAS_PROPERTIES = 0, 1, 4
_RELATED, _RELATING = 4, 5

#: One property's value on one row: text, number, or None (the property is absent).
_Value = str | float | None
#: Property name -> one value per member row plus a last row for unlisted columns.
_Columns = dict[str, list[_Value]]
#: An element's sets: (IfcRelDefinesByProperties, IfcPropertySet) pairs.
_Sets = list[tuple[Entity, Entity]]
#: ``set(entity, index, value)``: one attribute of an entity.
_Setter = Callable[[Entity, int, object], None]


@dataclass
class WriteSummary:
    """What :func:`write_results` did.

    Attributes:
        written: property sets written (new plus updated).
        updated: of those, sets that existed and were updated in place.
        not_in_table: columns of the model that were not in the member table (written
            NOT CHECKED with :data:`NOT_IN_TABLE`).
        missing: member ids with no element of that GlobalId in the model (nothing written).
        force_unit: the force unit the strengths are written in (``"NEWTON"``, ``"kip"`` ...).
        added_force_unit: True when the model declared no force unit and one was added.
        removed_duplicates: extra copies of the set removed from columns.
        shared: names of the properties written as one entity shared by every set.
        removed_properties: properties of ours removed because no set refers to them.
    """

    written: int = 0
    updated: int = 0
    not_in_table: int = 0
    missing: list[str] = field(default_factory=list)
    force_unit: str = ""
    added_force_unit: bool = False
    removed_duplicates: int = 0
    shared: list[str] = field(default_factory=list)
    removed_properties: int = 0


# ---------------------------------------------------------------------------- units


def _unit_label(unit: Entity) -> str:
    if unit.is_a("IfcSIUnit"):
        return " ".join(p for p in (unit.Prefix, unit.Name) if p)
    return str(getattr(unit, "Name", None) or unit.is_a())


def _given_force_unit(model: ifcopenshell.file, name: str, to_kip: float) -> Entity:
    """An IFC force unit for a unit given on the command line (``--force-unit``).

    N, kN and MN become an IfcSIUnit (with its prefix); any other unit an
    IfcConversionBasedUnit named as given, defined by its size in newtons.
    """
    newtons = to_kip / factor("newton", "kip")
    for prefix, size in ((None, 1.0), ("KILO", 1e3), ("MEGA", 1e6)):
        if math.isclose(newtons, size, rel_tol=1e-12):
            return model.create_entity("IfcSIUnit", UnitType="FORCEUNIT", Prefix=prefix,
                                       Name="NEWTON")
    newton = model.create_entity("IfcSIUnit", UnitType="FORCEUNIT", Name="NEWTON")
    size_in_n = model.create_entity("IfcMeasureWithUnit", model.create_entity(
        "IfcForceMeasure", newtons), newton)
    dims = model.create_entity("IfcDimensionalExponents", 1, 1, -2, 0, 0, 0, 0)
    return model.create_entity("IfcConversionBasedUnit", Dimensions=dims,
                               UnitType="FORCEUNIT", Name=name, ConversionFactor=size_in_n)


def ensure_force_unit(model: ifcopenshell.file, given: tuple[str, float] | None = None
                      ) -> tuple[float, str, bool]:
    """The model's force unit, adding one to its unit assignment when none is declared.

    An undeclared force unit is read as newton (the SI unit of IfcForceMeasure, as the reader
    does), so adding NEWTON keeps every existing force value's meaning.  A model read with a
    force unit given on the command line gets that unit instead (its forces were read in it).

    Args:
        model: the model.
        given: (name, kip per unit) of the unit given with ``--force-unit``, or None.

    Returns:
        (multiplier model force unit -> kip, unit label, whether a unit was added).
    """
    to_kip = factor("newton", "kip")
    projects = model.by_type("IfcProject")
    unit = ifcopenshell.util.unit.get_project_unit(model, "FORCEUNIT") if projects else None
    if unit is not None:
        return si_scale(unit) * to_kip, _unit_label(unit), False
    if not projects:  # nowhere to declare it; values stay in the IFC default, newton
        return (to_kip, "NEWTON", False) if given is None else (given[1], given[0], False)
    newton = (model.create_entity("IfcSIUnit", UnitType="FORCEUNIT", Name="NEWTON")
              if given is None else _given_force_unit(model, *given))
    if given is not None:
        to_kip = given[1]
    assignment = projects[0].UnitsInContext
    if assignment is None:
        projects[0].UnitsInContext = model.create_entity("IfcUnitAssignment", Units=[newton])
    else:
        assignment.Units = tuple(assignment.Units or ()) + (newton,)
    if getattr(model, "units", None):
        ifcopenshell.util.unit.clear_unit_cache(model)
    return to_kip, _unit_label(newton), True


# ---------------------------------------------------------------------------- ownership


def _owner_history(model: ifcopenshell.file) -> Entity | None:
    """Our IfcOwnerHistory (found again on a rerun), or None where the model uses none.

    IFC2X3 makes OwnerHistory mandatory on every IfcRoot; IFC4 and IFC4X3 make it optional,
    and one is added there only when the model already records owner histories.
    """
    existing = model.by_type("IfcOwnerHistory")
    if model.schema != "IFC2X3" and not existing:
        return None
    now = int(time.time())
    for history in existing:
        app = history.OwningApplication
        if app is not None and app.ApplicationIdentifier == APPLICATION_ID:
            history.ChangeAction = "MODIFIED"
            history.LastModifiedDate = now
            history.LastModifyingApplication = app
            return history
    apps = [a for a in model.by_type("IfcApplication")
            if a.ApplicationIdentifier == APPLICATION_ID]
    if apps:
        app = apps[0]
    else:
        developer = model.create_entity("IfcOrganization", Name="stanchion project")
        app = model.create_entity(
            "IfcApplication", ApplicationDeveloper=developer, Version=APPLICATION_VERSION,
            ApplicationFullName=APPLICATION_NAME, ApplicationIdentifier=APPLICATION_ID)
    users = model.by_type("IfcPersonAndOrganization")
    if users:
        user = users[0]
    else:
        person = model.create_entity("IfcPerson", FamilyName="unknown")
        user = model.create_entity("IfcPersonAndOrganization", ThePerson=person,
                                   TheOrganization=app.ApplicationDeveloper)
    return model.create_entity(
        "IfcOwnerHistory", OwningUser=user, OwningApplication=app, ChangeAction="ADDED",
        CreationDate=now)


# ---------------------------------------------------------------------------- existing sets


def _as_psets(definition: Entity | Sequence[Entity] | None) -> Iterable[Entity]:
    """RelatingPropertyDefinition as a sequence (IFC4X3 allows a set of definitions)."""
    if isinstance(definition, tuple | list):
        return definition
    return () if definition is None else (definition,)


def existing_sets(
    model: ifcopenshell.file, name: str = PSET_NAME
) -> dict[int, _Sets]:
    """Element id -> [(relationship, property set)] for every set called ``name``.

    One pass over IfcRelDefinesByProperties; only our sets' related objects are visited.

    Args:
        model: the model.
        name: the property set name.

    Returns:
        The sets of every element that has one, by element id.
    """
    found: dict[int, _Sets] = {}
    for rel in model.by_type("IfcRelDefinesByProperties"):
        for pset in _as_psets(rel[_RELATING]):
            if pset[2] == name and pset.is_a("IfcPropertySet"):
                for obj in rel[_RELATED] or ():
                    found.setdefault(obj.id(), []).append((rel, pset))
    return found


def _detach(model: ifcopenshell.file, element: Entity, rel: Entity, pset: Entity,
            dropped: dict[int, Entity]) -> None:
    """Take ``element`` out of ``rel``; remove rel and set once nothing is left.

    The set's properties go to ``dropped``; they are removed at the end of the run if no set
    refers to them any more (a property may be shared with sets still in use).
    """
    eid = element.id()
    others = [o for o in rel[_RELATED] if o.id() != eid]
    if others:
        rel[_RELATED] = others
        return
    props = list(pset[_HAS_PROPERTIES] or ())
    model.remove(rel)
    if model.get_total_inverses(pset) == 0:
        model.remove(pset)
        for prop in props:
            dropped[prop.id()] = prop


# ---------------------------------------------------------------------------- GlobalIds

_GUID_CHARS = np.frombuffer(
    b"0123456789ABCDEFGHIJKLMNOPQRSTUVWXYZabcdefghijklmnopqrstuvwxyz_$", dtype=np.uint8)
# Bit offsets (from the least significant bit of the 128-bit number) of the 21 six-bit
# characters after the first, which holds the top two bits (IFC GlobalId compression).
_GUID_SHIFTS = np.arange(120, -1, -6, dtype=np.uint64)


def new_guids(n: int) -> list[str]:
    """``n`` new IFC GlobalIds: random version-4 UUIDs, compressed to 22 characters.

    The same encoding as ``ifcopenshell.guid.compress`` (the first character carries the top
    two bits, then 21 characters of six bits, most significant first), vectorized: drawing
    20,000 ids this way takes milliseconds instead of a tenth of a second.

    Args:
        n: how many.

    Returns:
        The GlobalIds.
    """
    if n <= 0:
        return []
    raw = np.frombuffer(os.urandom(16 * n), dtype=np.uint8).reshape(n, 16).copy()
    raw[:, 6] = (raw[:, 6] & 0x0F) | 0x40  # UUID version 4 (RFC 4122 §4.4)
    raw[:, 8] = (raw[:, 8] & 0x3F) | 0x80  # RFC 4122 variant
    words = raw.view(">u8").astype(np.uint64)
    hi, lo = words[:, 0:1], words[:, 1:2]
    shifts = _GUID_SHIFTS[None, :]
    low_bits = (lo >> np.minimum(shifts, np.uint64(63))) & np.uint64(63)
    high_bits = (hi >> (np.maximum(shifts, np.uint64(64)) - np.uint64(64))) & np.uint64(63)
    six = np.where(shifts >= 64, high_bits, low_bits)
    # the character at bit 60 straddles the two words: bits 60..63 of lo, 0..1 of hi
    straddle = int(np.flatnonzero(_GUID_SHIFTS == 60)[0])
    six[:, straddle] = ((lo[:, 0] >> np.uint64(60)) | ((hi[:, 0] & np.uint64(3)) << np.uint64(4)))
    codes = np.empty((n, 22), dtype=np.uint8)
    codes[:, 0] = _GUID_CHARS[(hi[:, 0] >> np.uint64(62)).astype(np.intp)]
    codes[:, 1:] = _GUID_CHARS[six.astype(np.intp)]
    return codes.view("S22").ravel().astype(str).tolist()


# ---------------------------------------------------------------------------- values


def _label(text: str) -> str:
    return text if len(text) <= LABEL_MAX else text[: LABEL_MAX - 1] + "…"


def _checked_at_text(checked_at: datetime | str | None) -> str | None:
    if checked_at is None or isinstance(checked_at, str):
        return checked_at
    return checked_at.isoformat(timespec="seconds")


def _finite(values: FloatArray) -> list[_Value]:
    """Python floats, None where NaN / infinite (vectorized mask, one list conversion)."""
    arr = np.asarray(values, dtype=float)
    out: list[_Value] = arr.tolist()
    for i in np.flatnonzero(~np.isfinite(arr)).tolist():
        out[i] = None
    return out


def _joined(messages: list[list[str]]) -> list[_Value]:
    """Each row's messages joined with "; " (None when there are none).

    One string object per distinct text: rows of one column type usually share their notes.
    """
    texts: dict[tuple[str, ...], str] = {}
    out: list[_Value] = []
    for m in messages:
        if not m:
            out.append(None)
            continue
        key = tuple(m)
        text = texts.get(key)
        if text is None:
            text = texts[key] = "; ".join(key)
        out.append(text)
    return out


def _grid_labels(members: MemberTable) -> list[_Value]:
    """Each member's grid location (``B-2``), None where unknown or not read from IFC."""
    grid = members.extra.get("grid")
    if grid is None:
        return [None] * len(members)
    return [_label(str(g)) if g else None for g in grid.tolist()]


def _value_columns(
    members: MemberTable, results: CheckResults, to_model_force: float,
    constant: dict[str, _Value], suggested: dict[int, tuple[str, float]] | None,
) -> _Columns:
    """Property name -> one value per member row plus a last row for unlisted columns.

    None means the property is absent from that row's set.  Columns are prepared vectorized;
    the names come in :data:`PROPERTY_ORDER`.
    """
    n = len(members)
    status: list[_Value] = [STATUS_LABELS[str(s)] for s in results.status]
    not_checked = STATUS_LABELS[NOT_CHECKED]
    with_reason = (not_checked, STATUS_LABELS[SKIPPED])  # skipped: "not steel: concrete"
    cols: _Columns = {
        "Status": status,
        "Section": [_label(str(s)) if s else None for s in members.section_label],
        "GridLocation": _grid_labels(members),
        "Utilization": _finite(results.utilization),
        "RequiredStrength": _finite(results.required_strength * to_model_force),
        "AvailableStrength": _finite(results.available_strength * to_model_force),
        "GoverningCombination": [_label(str(c)) if c else None for c in results.combination],
        "GoverningLimitState": [_label(str(c)) if c else None for c in results.limit_state],
        "Slenderness": _finite(results.slenderness),
        "Reason": [str(r) if s in with_reason and r is not None and str(r) else None
                   for s, r in zip(status, results.reason, strict=True)],
        "Notes": _joined(results.messages),
    }
    if suggested:
        cols["SuggestedSection"] = [None] * n
        cols["SuggestedUtilization"] = [None] * n
        for i, (section, util) in suggested.items():
            cols["SuggestedSection"][i] = _label(section)
            cols["SuggestedUtilization"][i] = float(util)
    unlisted: dict[str, _Value] = {"Status": not_checked, "Reason": NOT_IN_TABLE}
    for name, col in cols.items():
        col.append(unlisted.get(name))
    for name, value in constant.items():
        cols[name] = [value] * (n + 1)
    return {name: cols[name] for name in PROPERTY_ORDER if name in cols}


def _common(cols: _Columns, rows: list[int]) -> dict[str, _Value]:
    """Properties present with one and the same value on every row in ``rows``."""
    if not rows:
        return {}
    out: dict[str, _Value] = {}
    for name, col in cols.items():
        first = col[rows[0]]
        if first is None:
            continue
        if len(rows) == len(col):
            same = col.count(first) == len(col)
        else:
            same = all(col[i] == first for i in rows)
        if same:
            out[name] = first
    return out


# ---------------------------------------------------------------------------- entities


class _Factory:
    """Creates entities with only the given attributes set, by attribute index.

    The fast path (``file.create`` + ``entity_instance.set_attribute_value_py``) skips the
    keyword-to-index mapping and the per-attribute transaction check of ``create_entity``;
    ifcopenshell still checks every value against the schema.  It is used only when both
    exist and no transaction is recording (so an undo stays complete); otherwise the public
    ``create_entity`` and ``entity[i] = value`` are used.
    """

    def __init__(self, model: ifcopenshell.file) -> None:
        self.model = model
        setter = _fast_setter(model)
        self.fast = setter is not None
        #: ``set(entity, index, value)``: one attribute of an entity.
        self.set: _Setter = setter if setter is not None else _set_item
        #: ``typed(ifc_type, value)``: a typed value (IfcLabel, IfcForceMeasure ...).
        self.typed: Callable[[str, object], Entity]
        #: ``prop(name, typed value)``: a new IfcPropertySingleValue.
        self.prop: Callable[[str, Entity], Entity]
        if setter is not None:
            new, put = model.create, setter

            def typed(ifc_type: str, value: object) -> Entity:
                v = new(ifc_type, -1)
                put(v, 0, value)
                return v

            def prop(name: str, value: Entity) -> Entity:
                p = new("IfcPropertySingleValue", -1)
                put(p, _NAME, name)
                put(p, _NOMINAL, value)
                return p

            self.typed, self.prop = typed, prop
        else:
            self.typed = model.create_entity
            self.prop = lambda name, value: model.create_entity(
                "IfcPropertySingleValue", name, None, value)

    def make(self, ifc_class: str, attributes: dict[int, object]) -> Entity:
        """A new entity with the attributes at the given indices set, the others unset.

        Args:
            ifc_class: the entity's IFC class.
            attributes: attribute index -> value.

        Returns:
            The new entity.
        """
        if self.fast:
            entity = self.model.create(ifc_class, -1)
            for index, value in attributes.items():
                self.set(entity, index, value)
            return entity
        args: list[object] = [None] * (max(attributes) + 1)
        for index, value in attributes.items():
            args[index] = value
        return self.model.create_entity(ifc_class, *args)


def _fast_setter(model: ifcopenshell.file) -> _Setter | None:
    """The attribute setter of the fast path, or None where the public path must be used.

    The fast path needs ``file.create`` and ``entity_instance.set_attribute_value_py`` and no
    transaction recording on the model; a typed value (not an entity of the file) is made
    and set as a harmless probe.
    """
    setter: _Setter | None = getattr(ifcopenshell.entity_instance, "set_attribute_value_py",
                                     None)
    if setter is None or getattr(type(model), "create", None) is None or \
            getattr(model, "transaction", None) is not None:
        return None
    try:
        probe = model.create("IfcLabel", -1)
        setter(probe, 0, "probe")
        return setter if probe.wrappedValue == "probe" else None
    except Exception:
        return None


def _set_item(entity: Entity, index: int, value: object) -> None:
    entity[index] = value


class _Writer:
    """Creates or updates one property set per element.

    Values arrive as plain Python values and are typed here from :data:`PROPERTY_TYPES`;
    typed texts are built once per distinct text and referenced by every property that has
    that text (a typed value is never modified after it is built).  Setting an attribute of
    an entity already in a large file costs microseconds, so an update compares first and
    only sets what changed.
    """

    def __init__(self, model: ifcopenshell.file, history: Entity | None,
                 shared: dict[str, Entity]) -> None:
        self.model = model
        self.history = history
        self.shared = shared
        self.factory = _Factory(model)
        self._typed, self._prop, self._set = (self.factory.typed, self.factory.prop,
                                              self.factory.set)
        self.types = dict(PROPERTY_TYPES)
        if model.schema == "IFC2X3":  # no IfcDateTime before IFC4
            self.types["CheckedAt"] = "IfcLabel"
        self.texts: dict[tuple[str, str], Entity] = {}
        self.dropped: dict[int, Entity] = {}
        self._guids: list[str] = []
        self.new_props: Callable[[int], list[Entity]] = lambda row: []

    def guid(self) -> str:
        if not self._guids:
            self._guids = new_guids(4096)
        return self._guids.pop()

    def typed(self, name: str, value: _Value) -> Entity:
        ifc_type = self.types[name]
        if isinstance(value, str):
            key = (ifc_type, value)
            v = self.texts.get(key)
            if v is None:
                v = self.texts[key] = self._typed(ifc_type, value)
            return v
        return self._typed(ifc_type, value)

    def prop(self, name: str, value: _Value) -> Entity:
        """A new IfcPropertySingleValue ``name`` with the typed ``value``."""
        return self._prop(name, self.typed(name, value))

    def set_value(self, prop: Entity, name: str, value: _Value) -> None:
        """Give an existing property ``value`` (only what differs is set)."""
        old = prop[_NOMINAL]
        if old is None or old.is_a() != self.types[name] or old.wrappedValue != value:
            self._set(prop, _NOMINAL, self.typed(name, value))
        if prop[_UNIT] is not None:
            self._set(prop, _UNIT, None)

    def add(self, element: Entity, props: list[Entity]) -> None:
        """A new set with ``props`` related to ``element`` alone."""
        history = self.history
        if self.factory.fast:
            new, put = self.model.create, self._set
            pset = new("IfcPropertySet", -1)
            put(pset, _GLOBAL_ID, self.guid())
            put(pset, 2, PSET_NAME)
            put(pset, _HAS_PROPERTIES, props)
            rel = new("IfcRelDefinesByProperties", -1)
            put(rel, _GLOBAL_ID, self.guid())
            put(rel, _RELATED, [element])
            put(rel, _RELATING, pset)
            if history is not None:
                put(pset, _HISTORY, history)
                put(rel, _HISTORY, history)
            return
        make = self.factory.make
        attributes: dict[int, object] = {_GLOBAL_ID: self.guid(), 2: PSET_NAME,
                                         _HAS_PROPERTIES: props}
        if history is not None:
            attributes[_HISTORY] = history
        pset = make("IfcPropertySet", attributes)
        attributes = {_GLOBAL_ID: self.guid(), _RELATED: [element], _RELATING: pset}
        if history is not None:
            attributes[_HISTORY] = history
        make("IfcRelDefinesByProperties", attributes)

    def prepare(self, cols: _Columns, shared: dict[str, Entity]) -> None:
        """Take this run's value columns and shared properties (sets :attr:`new_props`)."""
        self.shared = shared
        self.new_props = self._props_maker(cols)

    def _props_maker(self, cols: _Columns) -> Callable[[int], list[Entity]]:
        """A function row -> the property entities of a new set for that value row.

        The layout (shared entity or IFC type per name) is worked out once; per row only the
        own properties are made, typed texts coming from the cache.
        """
        layout = [(name, col, self.shared.get(name), self.types[name])
                  for name, col in cols.items()]
        typed, prop, texts = self._typed, self._prop, self.texts

        def props(row: int) -> list[Entity]:
            out: list[Entity] = []
            for name, col, entity, ifc_type in layout:
                if entity is not None:
                    out.append(entity)
                    continue
                value = col[row]
                if value is None:
                    continue
                if value.__class__ is str:
                    v = texts.get((ifc_type, value))
                    if v is None:
                        v = texts[ifc_type, value] = typed(ifc_type, value)
                else:
                    v = typed(ifc_type, value)
                out.append(prop(name, v))
            return out

        return props

    def update(self, pset: Entity, values: dict[str, _Value]) -> None:
        """Bring an existing set to ``values`` (own properties) plus the shared ones.

        Own properties keep their entity and get the new value in place; a property that is
        stale, shared with another set, or no longer shared in this run is taken out of the
        set (and remembered for :meth:`remove_orphans`); missing ones are added.
        """
        model, shared = self.model, self.shared
        have: dict[str, Entity] = {}
        old = list(pset[_HAS_PROPERTIES] or ())
        for prop in old:
            name = prop[_NAME]
            entity = shared.get(name)
            if entity is not None:
                if prop.id() == entity.id() and name not in have:
                    have[name] = prop
                    continue
            elif (name in values and name not in have
                  and prop.is_a("IfcPropertySingleValue")
                  and model.get_total_inverses(prop) <= 1):
                self.set_value(prop, name, values[name])
                have[name] = prop
                continue
            self.dropped[prop.id()] = prop
        props: list[Entity] = []
        for name in PROPERTY_ORDER:
            if name in shared:
                props.append(shared[name])
            elif name in values:
                props.append(have.get(name) or self.prop(name, values[name]))
        if [p.id() for p in props] != [p.id() for p in old]:
            self._set(pset, _HAS_PROPERTIES, props)
        history = self.history
        if history is not None and (pset[_HISTORY] is None
                                    or pset[_HISTORY].id() != history.id()):
            self._set(pset, _HISTORY, history)

    def write(self, element: Entity, row: int, cols: _Columns, current: _Sets | None,
              summary: WriteSummary) -> None:
        """Write the set of ``element`` from value row ``row``; ``current``: its sets now."""
        if current:
            rel, pset = current[0]
            for extra_rel, extra_pset in current[1:]:
                _detach(self.model, element, extra_rel, extra_pset, self.dropped)
                summary.removed_duplicates += 1
            if len(rel[_RELATED]) == 1:
                shared = self.shared
                self.update(pset, {name: col[row] for name, col in cols.items()
                                   if name not in shared and col[row] is not None})
                summary.updated += 1
                summary.written += 1
                return
            # one set shared by several columns: this column gets its own
            _detach(self.model, element, rel, pset, self.dropped)
        self.add(element, self.new_props(row))
        summary.written += 1

    def remove_orphans(self) -> int:
        """Remove the properties taken out of sets that no entity refers to any more."""
        removed = 0
        for prop in self.dropped.values():
            if self.model.get_total_inverses(prop) == 0:
                self.model.remove(prop)
                removed += 1
        self.dropped.clear()
        return removed


def _shared_properties(
    writer: _Writer, values: dict[str, _Value], rewritten: list[Entity]
) -> dict[str, Entity]:
    """One property entity per shared name: reused from a previous run when possible.

    A property of that name in a set rewritten now is reused (its value set in place) when
    it is a single value and every set referring to it is rewritten in this run; otherwise a
    new property is made and the old one is left to the sets that still use it.
    """
    model = writer.model
    rewritten_ids = {p.id() for p in rewritten}
    found: dict[str, Entity] = {}
    wanted = set(values)
    for pset in rewritten:
        for prop in pset[_HAS_PROPERTIES] or ():
            name = prop[_NAME]
            if name in wanted and name not in found:
                found[name] = prop
        if len(found) == len(wanted):
            break
    shared: dict[str, Entity] = {}
    for name, value in values.items():
        prop = found.get(name)
        if prop is not None and prop.is_a("IfcPropertySingleValue") and all(
                ref.id() in rewritten_ids for ref in model.get_inverse(prop)):
            writer.set_value(prop, name, value)
            shared[name] = prop
        else:
            shared[name] = writer.prop(name, value)
    return shared


# ---------------------------------------------------------------------------- writing


@contextlib.contextmanager
def _collector_paused() -> Iterator[None]:
    """Pause the cyclic garbage collector (restored afterwards, as the reader does).

    The writer makes many small acyclic objects (value columns, targets, property lists); a
    full collection triggered among them costs about 0.15 s on a 20,000-column model and
    finds nothing to free.
    """
    was_enabled = gc.isenabled()
    gc.disable()
    try:
        yield
    finally:
        if was_enabled:
            gc.enable()


def write_results(  # noqa: PLR0913 -- keyword-only options of the public API
    model: ifcopenshell.file,
    members: MemberTable,
    results: CheckResults,
    *,
    design_basis: str,
    disclaimer: str,
    force_unit_factor: float | None = None,
    force_unit_given: str | None = None,
    checked_at: datetime | str | None = None,
    mark_unlisted_columns: bool = True,
    progress: Callable[[int, int], None] | None = None,
    suggested: dict[int, tuple[str, float]] | None = None,
) -> WriteSummary:
    """Write one ``Stanchion_ColumnCheck`` property set per checked element (in place).

    Args:
        model: the model to annotate; changed in memory only (the caller writes it elsewhere).
        members: the member table the results belong to; ``members.id`` are GlobalIds.
        results: the engine's results, rows aligned with ``members``.
        design_basis: the report's design basis line (``service.reports.report.design_basis``).
        disclaimer: the report's disclaimer text.
        force_unit_factor: multiplier model force unit -> kip as the reader used it; checked
            against the model's own unit (ValueError on disagreement).  None: the model's.
        force_unit_given: the unit a model without a force unit was read in
            (``--force-unit``; its kip factor is ``force_unit_factor``): added to the model's
            units instead of NEWTON.
        checked_at: when given, written as CheckedAt (IfcDateTime; IfcLabel in IFC2X3).
        mark_unlisted_columns: also write NOT CHECKED on IfcColumns missing from ``members``.
        progress: called as ``progress(done, total)`` every 2,000 elements.
        suggested: by member row, the suggested section and its utilization
            (SuggestedSection, SuggestedUtilization); a rerun without it removes them.

    Returns:
        A :class:`WriteSummary`.

    Raises:
        ValueError: ``members`` and ``results`` differ in length, or ``force_unit_factor``
            disagrees with the model's force unit.
    """
    if len(members) != len(results):
        raise ValueError(f"{len(members)} members but {len(results)} results")
    given = (None if force_unit_given is None or force_unit_factor is None
             else (force_unit_given, force_unit_factor))
    to_kip, unit_name, added = ensure_force_unit(model, given)
    if force_unit_factor is not None and not math.isclose(force_unit_factor, to_kip,
                                                          rel_tol=1e-9):
        raise ValueError(
            f"force unit factor {force_unit_factor} does not match the model's force unit "
            f"{unit_name} ({to_kip} kip)")
    summary = WriteSummary(force_unit=unit_name, added_force_unit=added)
    constant: dict[str, _Value] = {"DesignBasis": _label(design_basis), "Disclaimer": disclaimer}
    stamp = _checked_at_text(checked_at)
    if stamp is not None:
        constant["CheckedAt"] = stamp
    with _collector_paused():
        cols = _value_columns(members, results, 1.0 / to_kip, constant, suggested)
        targets = _targets(model, members, mark_unlisted_columns, summary)
        existing = existing_sets(model)
        writer = _Writer(model, _owner_history(model), {})
        rewritten = [current[0][1] for current in (existing.get(e.id()) for e, _ in targets)
                     if current and len(current[0][0][_RELATED]) == 1]
        common = _common(cols, sorted({row for _, row in targets}))
        writer.prepare(cols, _shared_properties(writer, common, rewritten))
        summary.shared = list(writer.shared)
        del rewritten

        total = len(targets)
        for n, (element, row) in enumerate(targets, 1):
            writer.write(element, row, cols, existing.get(element.id()), summary)
            if progress is not None and (n % 2000 == 0 or n == total):
                progress(n, total)
        summary.removed_properties = writer.remove_orphans()
    return summary


def _targets(model: ifcopenshell.file, members: MemberTable, mark_unlisted_columns: bool,
             summary: WriteSummary) -> list[tuple[Entity, int]]:
    """(element, value row) to write: the members found by GlobalId, then unlisted columns.

    An unlisted column's row is the last row of every value column (:func:`_value_columns`).
    """
    targets: list[tuple[Entity, int]] = []
    seen: set[int] = set()
    by_guid = model.by_guid
    for i, gid in enumerate(members.id.tolist()):
        try:
            element = by_guid(str(gid))
        except RuntimeError:
            summary.missing.append(str(gid))
            continue
        seen.add(element.id())
        targets.append((element, i))
    if mark_unlisted_columns:
        unlisted_row = len(members)
        for element in model.by_type("IfcColumn"):
            if element.id() not in seen:
                summary.not_in_table += 1
                targets.append((element, unlisted_row))
    return targets


def read_results(model: ifcopenshell.file, name: str = PSET_NAME
                 ) -> dict[str, dict[str, Any]]:
    """GlobalId -> {property: value} of every element's set (for tests and round trips).

    Args:
        model: the model.
        name: the property set name.

    Returns:
        Each element's property values as IFC gives them (str, float ...; None when unset).
    """
    out: dict[str, dict[str, Any]] = {}
    for rel in model.by_type("IfcRelDefinesByProperties"):
        for pset in _as_psets(rel.RelatingPropertyDefinition):
            if pset.is_a("IfcPropertySet") and pset.Name == name:
                values = {p.Name: (p.NominalValue.wrappedValue if p.NominalValue else None)
                          for p in pset.HasProperties or ()}
                for obj in rel.RelatedObjects or ():
                    out[obj.GlobalId] = values
    return out


def checked_now() -> datetime:
    """The current UTC time, to the second (for CheckedAt)."""
    return datetime.now(UTC).replace(microsecond=0)
