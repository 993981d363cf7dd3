"""Axial forces from structural analysis results stored in the model, by ASCE 7 load type.

Path from a column to its results (docs/design.md §5):

    IfcColumn <-IfcRelAssignsToProduct (either direction)-> IfcStructuralCurveMember
    IfcStructuralCurveMember (or the column itself) <-IfcRelConnectsStructuralActivity->
        IfcStructuralReaction (IfcStructuralCurveReaction; IFC2X3: IfcStructuralPointReaction)
    reaction <-IfcRelAssignsToGroup-> IfcStructuralResultGroup .ResultForLoadGroup -> load case
        (IfcStructuralLoadCase, or an IfcStructuralLoadGroup)

A reaction connected to a member is the member's internal force (result).  Its AppliedLoad is
an IfcStructuralLoadSingleForce, or an IfcStructuralLoadConfiguration of them (values along
the member); ForceX is the axial force in member-local coordinates, tension positive, so the
compression is -ForceX.  Per load case the largest compression over the member's reactions
is taken.  Reactions given in GLOBAL_COORDS, and structural *actions* (applied loads, not
internal forces), are not used.

Which load type a case is, and how several cases of one type (and several analysis models)
combine, is the engine's load-case policy (:mod:`engine.loads`); this module only extracts
the cases, their attributes and their axial forces, and says so in the messages.
"""

from __future__ import annotations

import math
from collections.abc import Sequence
from dataclasses import dataclass, field

from stanchion.engine.loads import CaseForce, case_load_type, combine_cases
from stanchion.ifc_bridge.access import Entity
from stanchion.ifc_bridge.errors import ModelReadError
from stanchion.ifc_bridge.relations import RelationIndex, describe, instance_of
from stanchion.ifc_bridge.units import ModelUnits


def _texts(group: Entity) -> list[str]:
    return [t for t in (group.Name, group.Description, getattr(group, "ObjectType", None)) if t]


def load_type(group: Entity) -> tuple[str | None, str]:
    """Load type of a load case / group (:func:`engine.loads.case_load_type`), with its rule."""
    predefined = getattr(group, "PredefinedType", None)
    combination = predefined in ("LOAD_COMBINATION", "LOAD_COMBINATION_GROUP") or group.is_a(
        "IfcStructuralLoadCombination")
    return case_load_type(_texts(group), action_source=getattr(group, "ActionSource", None),
                          action_type=getattr(group, "ActionType", None),
                          combination=combination)


def _axial_forces(load: Entity | None, holder: Entity) -> list[float]:
    """ForceX values of a single force or of a load configuration's single forces.

    Raises:
        ModelReadError: ``load`` is not an IfcStructuralLoad (a damaged line: reading past it
            would drop the result without a word); the column becomes not checked.
    """
    if load is None:
        return []
    if not instance_of(load, "IfcStructuralLoad"):
        raise ModelReadError(f"damaged model: #{holder.id()} {holder.is_a()} holds "
                             f"{describe(load)} where an IfcStructuralLoad belongs")
    if load.is_a("IfcStructuralLoadSingleForce"):
        force = load.ForceX
        if force is None:
            return []
        if isinstance(force, bool) or not isinstance(force, int | float) or not math.isfinite(
                force):  # 'NaN' text, 1E400: reading past it would drop the result
            raise ModelReadError(f"damaged model: #{load.id()} {load.is_a()}.ForceX holds "
                                 f"{str(force)[:40]!r}, not a finite number")
        return [float(force)]
    if load.is_a("IfcStructuralLoadConfiguration"):
        out: list[float] = []
        for value in load.Values or ():
            out.extend(_axial_forces(value, load))
        return out
    return []


@dataclass
class _Found:
    """Results found for one column, largest compression per (analysis model, load case).

    Keyed by (analysis model, load case): results of several analysis models (e.g. an old
    and a new run kept in one file) are kept apart and enveloped by the engine, never added.
    """

    per_case: dict[tuple[int, int], float] = field(default_factory=dict)
    case_of: dict[int, Entity] = field(default_factory=dict)
    model_names: dict[int, str] = field(default_factory=dict)


@dataclass
class AnalysisLoads:
    """Reads analysis-result axial forces for columns (kip, compression positive)."""

    index: RelationIndex
    units: ModelUnits
    model_messages: list[str] = field(default_factory=list)
    _case_types: dict[int, tuple[str | None, str]] = field(default_factory=dict)
    _told: set[str] = field(default_factory=set)

    def __post_init__(self) -> None:
        """Tell the model about results in a result group that are connected to nothing."""
        connected = {a.id() for acts in self.index.activities.values() for a in acts}
        loose = sorted(k for k in self.index.result_groups if k not in connected)
        if loose:
            shown = ", ".join(f"#{k}" for k in loose[:5]) + (" ..." if len(loose) > 5 else "")
            self._tell(f"{len(loose)} analysis result(s) in result groups ({shown}) are "
                       "connected to no member or element, so no column uses their forces "
                       "(an IfcRelConnectsStructuralActivity missing or damaged?)")

    def _tell(self, text: str) -> None:
        if text not in self._told:
            self._told.add(text)
            self.model_messages.append(text)

    def case_type(self, case: Entity) -> str | None:
        """Load type of a load case (cached), telling the model once when it is ignored."""
        key = case.id()
        if key not in self._case_types:
            self._case_types[key] = load_type(case)
            kind, rule = self._case_types[key]
            if kind is None:
                self._tell(f"analysis results for load case '{case.Name or key}' ignored: "
                           f"{rule}")
        return self._case_types[key][0]

    def _record(self, found: _Found, groups: Sequence[Entity], compression: float) -> None:
        """Add one reaction's compression to the load cases its result groups name."""
        for group in groups:
            case = group.ResultForLoadGroup
            if case is None:
                self._tell(f"result group '{group.Name}' names no load case; ignored")
                continue
            owners = getattr(group, "ResultGroupFor", None) or ()
            owner = owners[0] if owners else None
            model_key = owner.id() if owner is not None else 0
            if owner is not None:
                found.model_names[model_key] = owner.Name or f"#{model_key}"
            key = (model_key, case.id())
            found.case_of[case.id()] = case
            found.per_case[key] = max(found.per_case.get(key, -float("inf")), compression)

    def _cases(self, found: _Found) -> list[CaseForce]:
        """The found results of the load cases that have a load type (engine.loads)."""
        cases: list[CaseForce] = []
        for (model_key, case_key), value in found.per_case.items():
            case = found.case_of[case_key]
            kind = self.case_type(case)
            if kind is not None:
                cases.append(CaseForce(model_key, kind, case.Name or f"#{case_key}", value,
                                       found.model_names.get(model_key, "")))
        return cases

    def for_column(
        self, column: Entity, members: list[Entity]
    ) -> tuple[dict[str, float], list[str]]:
        """Axial compression by load type from the results of ``members`` (and the column).

        Args:
            column: the column.
            members: its structural analysis members.

        Returns:
            ({load type: kip}, member notes).  Empty when the model holds no results.
        """
        found = _Found()
        notes: list[str] = []
        skipped_global = ungrouped = 0
        for item in dict.fromkeys([column, *members]):  # a member read as a column
            for activity in self.index.activities.get(item.id(), ()):
                if not activity.is_a("IfcStructuralReaction"):
                    continue
                if activity.GlobalOrLocal == "GLOBAL_COORDS":
                    skipped_global += 1
                    continue
                forces = _axial_forces(activity.AppliedLoad, activity)
                if not forces:
                    continue
                groups = self.index.result_groups.get(activity.id(), ())
                if not groups:
                    ungrouped += 1
                self._record(found, groups, max(-f for f in forces) * self.units.force)
        if skipped_global:
            notes.append(f"{skipped_global} analysis result(s) in global coordinates ignored "
                         "(axial force needs member-local ForceX)")
        if ungrouped:
            notes.append(f"{ungrouped} analysis result(s) in no IfcStructuralResultGroup "
                         "ignored (their load case is unknown)")
        out, combined = combine_cases(self._cases(found))
        notes.extend(combined)
        if out:
            note = self.units.note_use("force")
            if note:
                notes.append(note)
        return out, notes
