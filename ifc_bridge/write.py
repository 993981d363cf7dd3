"""Results back into the model: one ``Stanchion_ColumnCheck`` property set per column.

Every value is typed with its IFC measure type (docs/design.md §5): ``Status`` IfcLabel, forces
IfcForceMeasure in the model's force unit, ratios IfcRatioMeasure, texts IfcText.  Nothing is
left for a library to guess from a Python type.

Speed.  A model of 20,000 columns gets about 300,000 new entities; the ``ifcopenshell.api``
pset functions look up templates and inverses per call, so the entities are created here with
``file.create_entity`` directly, keyword arguments for the attributes that are set only (the
fastest spelling measured), and typed values that repeat (status labels, section names, the
design basis, the disclaimer) are built once and shared.  Existing sets are found in one pass
over ``IfcRelDefinesByProperties``, not per column.

Idempotence.  A column that already carries the set keeps it: its properties get their new
values in place, properties that no longer apply are removed, missing ones are added.  A set
shared by several columns is split, extra copies on one column are removed, so a rerun never
duplicates.  Our owner history (IFC2X3 requires one on every rooted entity) and the force unit
(added only when the model declares none) are likewise found again on a rerun.

Entities the writer may add: IfcPropertySet, IfcPropertySingleValue, IfcRelDefinesByProperties
and, once, IfcOwnerHistory / IfcApplication / IfcOrganization / IfcPerson /
IfcPersonAndOrganization / IfcSIUnit (FORCEUNIT) / IfcUnitAssignment.  Nothing else is touched.
"""

from __future__ import annotations

import math
import time
from collections.abc import Callable, Iterable
from dataclasses import dataclass, field
from datetime import UTC, datetime

import ifcopenshell
import ifcopenshell.guid
import ifcopenshell.util.unit
import numpy as np

from stanchion import __version__
from stanchion.engine.check import FAIL, NOT_CHECKED, PASS, CheckResults
from stanchion.engine.members import MemberTable
from stanchion.engine.units import factor
from stanchion.ifc_bridge.units import si_scale

PSET_NAME = "Stanchion_ColumnCheck"
STATUS_LABELS = {PASS: "PASS", FAIL: "FAIL", NOT_CHECKED: "NOT CHECKED"}
APPLICATION_ID = "stanchion"
APPLICATION_NAME = "stanchion column checks"
APPLICATION_VERSION = __version__
#: Reason written on a column of the model that is missing from the checked member table.
NOT_IN_TABLE = "column was not read as a member; see the reader's messages"
#: IfcLabel is STRING(255) in IFC4 and IFC4X3.
LABEL_MAX = 255

# Property name -> IFC type.  Ratios of like quantities (utilization = force / force,
# slenderness Lc/r = length / length) are IfcRatioMeasure, which has no range restriction
# (unlike IfcNormalisedRatioMeasure).  CheckedAt is an IfcLabel in IFC2X3 (see _Writer).
PROPERTY_TYPES: dict[str, str] = {
    "Status": "IfcLabel",
    "Utilization": "IfcRatioMeasure",
    "RequiredStrength": "IfcForceMeasure",
    "AvailableStrength": "IfcForceMeasure",
    "GoverningCombination": "IfcLabel",
    "GoverningLimitState": "IfcLabel",
    "Section": "IfcLabel",
    "Slenderness": "IfcRatioMeasure",
    "DesignBasis": "IfcLabel",
    "Disclaimer": "IfcText",
    "Reason": "IfcText",
    "Notes": "IfcText",
    "SuggestedSection": "IfcLabel",
    "SuggestedUtilization": "IfcRatioMeasure",
    "CheckedAt": "IfcDateTime",
}


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
    """

    written: int = 0
    updated: int = 0
    not_in_table: int = 0
    missing: list[str] = field(default_factory=list)
    force_unit: str = ""
    added_force_unit: bool = False
    removed_duplicates: int = 0


# ---------------------------------------------------------------------------- units


def _unit_label(unit: ifcopenshell.entity_instance) -> str:
    if unit.is_a("IfcSIUnit"):
        return " ".join(p for p in (unit.Prefix, unit.Name) if p)
    return str(getattr(unit, "Name", None) or unit.is_a())


def ensure_force_unit(model: ifcopenshell.file) -> tuple[float, str, bool]:
    """The model's force unit, adding SI newton to its unit assignment when none is declared.

    An undeclared force unit is read as newton (the SI unit of IfcForceMeasure, as the reader
    does), so adding NEWTON keeps every existing force value's meaning.

    Returns:
        (multiplier model force unit -> kip, unit label, whether a unit was added).
    """
    to_kip = factor("newton", "kip")
    projects = model.by_type("IfcProject")
    unit = ifcopenshell.util.unit.get_project_unit(model, "FORCEUNIT") if projects else None
    if unit is not None:
        return si_scale(unit) * to_kip, _unit_label(unit), False
    if not projects:  # nowhere to declare it; values stay in the IFC default, newton
        return to_kip, "NEWTON", False
    newton = model.create_entity("IfcSIUnit", UnitType="FORCEUNIT", Name="NEWTON")
    assignment = projects[0].UnitsInContext
    if assignment is None:
        projects[0].UnitsInContext = model.create_entity("IfcUnitAssignment", Units=[newton])
    else:
        assignment.Units = tuple(assignment.Units or ()) + (newton,)
    if getattr(model, "units", None):
        ifcopenshell.util.unit.clear_unit_cache(model)
    return to_kip, "NEWTON", True


# ---------------------------------------------------------------------------- ownership


def _owner_history(model: ifcopenshell.file) -> ifcopenshell.entity_instance | None:
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


def _as_psets(definition) -> Iterable[ifcopenshell.entity_instance]:
    """RelatingPropertyDefinition as a sequence (IFC4X3 allows a set of definitions)."""
    if isinstance(definition, tuple | list):
        return definition
    return () if definition is None else (definition,)


def existing_sets(
    model: ifcopenshell.file, name: str = PSET_NAME
) -> dict[int, list[tuple[ifcopenshell.entity_instance, ifcopenshell.entity_instance]]]:
    """Element id -> [(relationship, property set)] for every set called ``name``.

    One pass over IfcRelDefinesByProperties; only our sets' related objects are visited.
    """
    found: dict[int, list] = {}
    for rel in model.by_type("IfcRelDefinesByProperties"):
        for pset in _as_psets(rel.RelatingPropertyDefinition):
            if pset.is_a("IfcPropertySet") and pset.Name == name:
                for obj in rel.RelatedObjects or ():
                    found.setdefault(obj.id(), []).append((rel, pset))
    return found


def _detach(model: ifcopenshell.file, element, rel, pset) -> None:
    """Take ``element`` out of ``rel``; remove rel, set and properties once nothing is left."""
    others = [o for o in rel.RelatedObjects if o.id() != element.id()]
    if others:
        rel.RelatedObjects = others
        return
    props = list(pset.HasProperties or ())
    model.remove(rel)
    if model.get_total_inverses(pset) == 0:
        model.remove(pset)
        for prop in props:
            if model.get_total_inverses(prop) == 0:
                model.remove(prop)


# ---------------------------------------------------------------------------- values


def _label(text: str) -> str:
    return text if len(text) <= LABEL_MAX else text[: LABEL_MAX - 1] + "…"


def _checked_at_text(checked_at: datetime | str | None) -> str | None:
    if checked_at is None or isinstance(checked_at, str):
        return checked_at
    return checked_at.isoformat(timespec="seconds")


def _finite(values: np.ndarray) -> list[float | None]:
    """Python floats, None where NaN / infinite (vectorized mask, one list conversion)."""
    arr = np.asarray(values, dtype=float)
    out = arr.tolist()
    for i in np.flatnonzero(~np.isfinite(arr)).tolist():
        out[i] = None
    return out


def _row_values(
    members: MemberTable, results: CheckResults, to_model_force: float,
    constant: dict[str, object], suggested: dict[int, tuple[str, float]] | None = None,
) -> Callable[[int], dict[str, object]]:
    """A function row -> {property name: plain value}; columns are prepared vectorized."""
    status = [STATUS_LABELS[str(s)] for s in results.status]
    util = _finite(results.utilization)
    req = _finite(results.required_strength * to_model_force)
    avail = _finite(results.available_strength * to_model_force)
    slender = _finite(results.slenderness)
    combo = [_label(str(c)) if c else "" for c in results.combination]
    limit = [_label(str(c)) if c else "" for c in results.limit_state]
    section = [_label(str(s)) if s else "" for s in members.section_label]
    reason = [None if r is None else str(r) for r in results.reason]
    notes = ["; ".join(m) if m else "" for m in results.messages]
    not_checked = STATUS_LABELS[NOT_CHECKED]

    def row(i: int) -> dict[str, object]:
        out: dict[str, object] = {"Status": status[i]}
        if section[i]:
            out["Section"] = section[i]
        if util[i] is not None:
            out["Utilization"] = util[i]
        if req[i] is not None:
            out["RequiredStrength"] = req[i]
        if avail[i] is not None:
            out["AvailableStrength"] = avail[i]
        if combo[i]:
            out["GoverningCombination"] = combo[i]
        if limit[i]:
            out["GoverningLimitState"] = limit[i]
        if slender[i] is not None:
            out["Slenderness"] = slender[i]
        if status[i] == not_checked and reason[i]:
            out["Reason"] = reason[i]
        if notes[i]:
            out["Notes"] = notes[i]
        if suggested and i in suggested:
            out["SuggestedSection"] = _label(suggested[i][0])
            out["SuggestedUtilization"] = float(suggested[i][1])
        out.update(constant)
        return out

    return row


# ---------------------------------------------------------------------------- writing


class _Writer:
    """Creates or updates one property set per element.

    Values arrive as plain Python values and are typed here from :data:`PROPERTY_TYPES`;
    typed texts are built once per distinct text and shared (assignment copies the value).
    Setting an attribute of an entity already in a large file costs tens of microseconds, so
    an update compares first and only sets what changed.
    """

    def __init__(self, model: ifcopenshell.file, history) -> None:
        self.model = model
        self.history = history
        self.create = model.create_entity
        self.new_guid = ifcopenshell.guid.new
        self.types = dict(PROPERTY_TYPES)
        if model.schema == "IFC2X3":  # no IfcDateTime before IFC4
            self.types["CheckedAt"] = "IfcLabel"
        self.texts: dict[tuple[str, str], ifcopenshell.entity_instance] = {}

    def typed(self, name: str, value: object):
        ifc_type = self.types[name]
        if isinstance(value, str):
            key = (ifc_type, value)
            v = self.texts.get(key)
            if v is None:
                v = self.texts[key] = self.create(ifc_type, value)
            return v
        return self.create(ifc_type, value)

    def _prop(self, name: str, value: object):
        return self.create("IfcPropertySingleValue", Name=name,
                           NominalValue=self.typed(name, value))

    def add(self, element, values: dict[str, object]) -> None:
        props = [self._prop(k, v) for k, v in values.items()]
        create, gid = self.create, self.new_guid
        if self.history is None:
            pset = create("IfcPropertySet", GlobalId=gid(), Name=PSET_NAME, HasProperties=props)
            create("IfcRelDefinesByProperties", GlobalId=gid(), RelatedObjects=[element],
                   RelatingPropertyDefinition=pset)
        else:
            pset = create("IfcPropertySet", GlobalId=gid(), OwnerHistory=self.history,
                          Name=PSET_NAME, HasProperties=props)
            create("IfcRelDefinesByProperties", GlobalId=gid(), OwnerHistory=self.history,
                   RelatedObjects=[element], RelatingPropertyDefinition=pset)

    def update(self, pset, values: dict[str, object]) -> None:
        """New values in place; stale properties removed, new ones appended."""
        model, types = self.model, self.types
        keep, changed = [], False
        for prop in pset.HasProperties or ():
            name = prop.Name
            own = model.get_total_inverses(prop) <= 1
            if name in values and own and prop.is_a("IfcPropertySingleValue"):
                value = values.pop(name)
                old = prop.NominalValue
                if old is None or old.is_a() != types[name] or old.wrappedValue != value:
                    prop.NominalValue = self.typed(name, value)
                if prop.Unit is not None:
                    prop.Unit = None
                keep.append(prop)
                continue
            changed = True
            if name in values:  # shared with another set, or not a single value: replace
                keep.append(self._prop(name, values.pop(name)))
            if own:
                model.remove(prop)
        if values:
            changed = True
            keep.extend(self._prop(k, v) for k, v in values.items())
        if changed:
            pset.HasProperties = keep
        if self.history is not None and pset.OwnerHistory != self.history:
            pset.OwnerHistory = self.history


def write_results(
    model: ifcopenshell.file,
    members: MemberTable,
    results: CheckResults,
    *,
    design_basis: str,
    disclaimer: str,
    force_unit_factor: float | None = None,
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
        design_basis: the report's design basis line (``service.report.design_basis``).
        disclaimer: the report's disclaimer text.
        force_unit_factor: multiplier model force unit -> kip as the reader used it; checked
            against the model's own unit (ValueError on disagreement).  None: the model's.
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
    to_kip, unit_name, added = ensure_force_unit(model)
    if force_unit_factor is not None and not math.isclose(force_unit_factor, to_kip,
                                                          rel_tol=1e-9):
        raise ValueError(
            f"force unit factor {force_unit_factor} does not match the model's force unit "
            f"{unit_name} ({to_kip} kip)")
    summary = WriteSummary(force_unit=unit_name, added_force_unit=added)
    history = _owner_history(model)
    constant: dict[str, object] = {"DesignBasis": _label(design_basis), "Disclaimer": disclaimer}
    stamp = _checked_at_text(checked_at)
    if stamp is not None:
        constant["CheckedAt"] = stamp
    values_of = _row_values(members, results, 1.0 / to_kip, constant, suggested)
    existing = existing_sets(model)
    writer = _Writer(model, history)

    targets: list[tuple[ifcopenshell.entity_instance, Callable[[], dict]]] = []
    seen: set[int] = set()
    for i, gid in enumerate(members.id.tolist()):
        try:
            element = model.by_guid(str(gid))
        except RuntimeError:
            summary.missing.append(str(gid))
            continue
        seen.add(element.id())
        targets.append((element, lambda i=i: values_of(i)))
    if mark_unlisted_columns:
        unlisted = {"Status": STATUS_LABELS[NOT_CHECKED], "Reason": NOT_IN_TABLE, **constant}
        for element in model.by_type("IfcColumn"):
            if element.id() not in seen:
                summary.not_in_table += 1
                targets.append((element, lambda: dict(unlisted)))

    total = len(targets)
    for n, (element, values) in enumerate(targets, 1):
        current = existing.get(element.id())
        if current:
            rel, pset = current[0]
            for extra_rel, extra_pset in current[1:]:
                _detach(model, element, extra_rel, extra_pset)
                summary.removed_duplicates += 1
            if len(rel.RelatedObjects) == 1:
                writer.update(pset, values())
                summary.updated += 1
            else:  # one set shared by several columns: this column gets its own
                _detach(model, element, rel, pset)
                writer.add(element, values())
        else:
            writer.add(element, values())
        summary.written += 1
        if progress is not None and (n % 2000 == 0 or n == total):
            progress(n, total)
    return summary


def read_results(model: ifcopenshell.file, name: str = PSET_NAME) -> dict[str, dict]:
    """GlobalId -> {property: value} of every element's set (for tests and round trips)."""
    out: dict[str, dict] = {}
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
