"""Axial forces from structural analysis results stored in the model, by ASCE 7 load type.

Path from a column to its results (design.md §5):

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

Load case -> load type (:func:`load_type`), first rule that applies:

=====================================  ==================================================
rule                                   load type
=====================================  ==================================================
PredefinedType LOAD_COMBINATION(_GROUP)  ignored: combinations are formed by ASCE 7-22
ActionSource DEAD_LOAD_G, COMPLETION_G1  D
ActionSource LIVE_LOAD_Q                 L; Lr when Name/Description/ObjectType has the
                                         token ``Lr`` (any case) or the word "roof"
ActionSource SNOW_S / RAIN / WIND_W /    S / R / W / E
EARTHQUAKE_E
any other ActionSource (TEMPERATURE_T,   ignored, with a model message
PRESTRESSING_P, ICE, ...)
ActionSource NOTDEFINED / USERDEFINED /  the Name / Description / ObjectType: a token
unset                                    ``D L Lr S R W E`` (case as written, optional
                                         trailing digits, e.g. ``D1``, ``Lr``, ``W2``), else
                                         the words dead / self weight / superimposed -> D,
                                         roof live -> Lr, live -> L, snow -> S, rain -> R,
                                         wind -> W, seismic / earthquake -> E; several
                                         different types -> ignored (ambiguous)
ActionType PERMANENT_G (nothing else)    D
otherwise                                ignored, with a model message
=====================================  ==================================================

Several load cases of one type: D, L, Lr, S and R cases are added (taken to act together,
which is conservative when they are alternative patterns); W and E cases are alternatives
(directions), the one of largest magnitude is used (the engine reverses W and E itself).
"""

from __future__ import annotations

import re
from collections import defaultdict
from dataclasses import dataclass, field

import ifcopenshell

from stanchion.engine.members import REVERSIBLE
from stanchion.ifc_bridge.relations import RelationIndex
from stanchion.ifc_bridge.units import ModelUnits

Entity = ifcopenshell.entity_instance

#: ActionSource -> load type.
ACTION_SOURCES: dict[str, str] = {
    "DEAD_LOAD_G": "D",
    "COMPLETION_G1": "D",
    "LIVE_LOAD_Q": "L",
    "SNOW_S": "S",
    "RAIN": "R",
    "WIND_W": "W",
    "EARTHQUAKE_E": "E",
}
_UNSPECIFIED = (None, "NOTDEFINED", "USERDEFINED")
_TOKEN = re.compile(r"^(D|L|Lr|LR|lr|S|R|W|E)\d*$")
#: (regex on lower-cased text, load type), tried in order.
_WORDS: tuple[tuple[re.Pattern, str], ...] = (
    (re.compile(r"\broof\s*live\b|\blive\s*roof\b|\broof\b"), "Lr"),
    (re.compile(r"\bdead\b|\bself[\s\-]*weight\b|\bsuperimposed\b"), "D"),
    (re.compile(r"\blive\b"), "L"),
    (re.compile(r"\bsnow\b"), "S"),
    (re.compile(r"\brain\b"), "R"),
    (re.compile(r"\bwind\b"), "W"),
    (re.compile(r"\bseismic\b|\bearthquake\b"), "E"),
)


def _texts(group: Entity) -> list[str]:
    return [t for t in (group.Name, group.Description, getattr(group, "ObjectType", None)) if t]


def _tokens(texts: list[str]) -> set[str]:
    found = set()
    for text in texts:
        for tok in re.split(r"[^A-Za-z0-9]+", text):
            m = _TOKEN.match(tok)
            if m:
                found.add("Lr" if m.group(1).lower() == "lr" else m.group(1))
    return found


def _by_name(texts: list[str]) -> tuple[str | None, str]:
    tokens = _tokens(texts)
    if len(tokens) == 1:
        return next(iter(tokens)), "name token"
    if len(tokens) > 1:
        return None, f"ambiguous name (types {', '.join(sorted(tokens))})"
    words = set()
    for text in texts:
        low = text.lower()
        for rx, kind in _WORDS:
            if rx.search(low):
                words.add(kind)
                break
    if len(words) == 1:
        return next(iter(words)), "name"
    if len(words) > 1:
        return None, f"ambiguous name (types {', '.join(sorted(words))})"
    return None, "name does not tell"


def load_type(group: Entity) -> tuple[str | None, str]:
    """Load type of a load case / group, with the rule that decided (see module table)."""
    predefined = getattr(group, "PredefinedType", None)
    if predefined in ("LOAD_COMBINATION", "LOAD_COMBINATION_GROUP") or group.is_a(
        "IfcStructuralLoadCombination"
    ):
        return None, "a load combination (combinations are formed by ASCE 7-22 here)"
    source = getattr(group, "ActionSource", None)
    texts = _texts(group)
    if source in ACTION_SOURCES:
        kind = ACTION_SOURCES[source]
        if kind == "L":
            roof = "Lr" in _tokens(texts) or any(re.search(r"\broof\b", t.lower()) for t in texts)
            if roof:
                return "Lr", f"ActionSource {source} and a roof name"
        return kind, f"ActionSource {source}"
    if source not in _UNSPECIFIED:
        return None, f"ActionSource {source} has no ASCE 7-22 load type here"
    kind, rule = _by_name(texts)
    if kind is not None:
        return kind, rule
    if getattr(group, "ActionType", None) == "PERMANENT_G":
        return "D", "ActionType PERMANENT_G"
    return None, f"ActionSource {source or 'unset'}, ActionType " \
                 f"{getattr(group, 'ActionType', None) or 'unset'}, {rule}"


def _axial_forces(load: Entity | None) -> list[float]:
    """ForceX values of a single force or of a load configuration's single forces."""
    if load is None:
        return []
    if load.is_a("IfcStructuralLoadSingleForce"):
        return [float(load.ForceX)] if load.ForceX is not None else []
    if load.is_a("IfcStructuralLoadConfiguration"):
        out: list[float] = []
        for value in load.Values or ():
            out.extend(_axial_forces(value))
        return out
    return []


@dataclass
class AnalysisLoads:
    """Reads analysis-result axial forces for columns (kip, compression positive)."""

    index: RelationIndex
    units: ModelUnits
    model_messages: list[str] = field(default_factory=list)
    _case_types: dict[int, tuple[str | None, str]] = field(default_factory=dict)
    _told: set[str] = field(default_factory=set)

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

    def for_column(
        self, column: Entity, members: list[Entity]
    ) -> tuple[dict[str, float], list[str]]:
        """Axial compression by load type from the results of ``members`` (and the column).

        Returns:
            ({load type: kip}, member notes).  Empty when the model holds no results.
        """
        # Keyed by (analysis model, load case): results of several analysis models (e.g. an
        # old and a new run kept in one file) are never added together.
        per_case: dict[tuple[int, int], float] = {}
        case_of: dict[int, Entity] = {}
        model_names: dict[int, str] = {}
        notes: list[str] = []
        skipped_global = ungrouped = 0
        for item in [column, *members]:
            for activity in self.index.activities.get(item.id(), ()):
                if not activity.is_a("IfcStructuralReaction"):
                    continue
                if activity.GlobalOrLocal == "GLOBAL_COORDS":
                    skipped_global += 1
                    continue
                forces = _axial_forces(activity.AppliedLoad)
                if not forces:
                    continue
                compression = max(-f for f in forces) * self.units.force
                groups = self.index.result_groups.get(activity.id(), ())
                if not groups:
                    ungrouped += 1
                for group in groups:
                    case = group.ResultForLoadGroup
                    if case is None:
                        self._tell(f"result group '{group.Name}' names no load case; ignored")
                        continue
                    owners = getattr(group, "ResultGroupFor", None) or ()
                    owner = owners[0] if owners else None
                    model_key = owner.id() if owner is not None else 0
                    if owner is not None:
                        model_names[model_key] = owner.Name or f"#{model_key}"
                    key = (model_key, case.id())
                    case_of[case.id()] = case
                    per_case[key] = max(per_case.get(key, -float("inf")), compression)
        if skipped_global:
            notes.append(f"{skipped_global} analysis result(s) in global coordinates ignored "
                         "(axial force needs member-local ForceX)")
        if ungrouped:
            notes.append(f"{ungrouped} analysis result(s) in no IfcStructuralResultGroup "
                         "ignored (their load case is unknown)")
        per_model: dict[int, dict[str, list[tuple[str, float]]]] = defaultdict(
            lambda: defaultdict(list))
        for (model_key, case_key), value in per_case.items():
            kind = self.case_type(case_of[case_key])
            if kind is not None:
                per_model[model_key][kind].append(
                    (case_of[case_key].Name or f"#{case_key}", value))
        results: list[dict[str, float]] = []
        for by_type in per_model.values():
            one: dict[str, float] = {}
            for kind, items in by_type.items():
                if kind in REVERSIBLE:
                    one[kind] = max((v for _, v in items), key=abs)
                else:
                    one[kind] = sum(v for _, v in items)
                if len(items) > 1:
                    how = "largest magnitude used" if kind in REVERSIBLE else "added"
                    names = ", ".join(n for n, _ in items)
                    notes.append(f"{kind} from {len(items)} load cases ({names}): {how}")
            results.append(one)
        out: dict[str, float] = {}
        for one in results:  # several analysis models: the envelope, per load type
            for kind, value in one.items():
                if kind not in out:
                    out[kind] = value
                elif kind in REVERSIBLE:
                    out[kind] = max(out[kind], value, key=abs)
                else:
                    out[kind] = max(out[kind], value)
        if len(results) > 1:
            names = ", ".join(sorted(model_names.values())) or f"{len(results)} groups"
            notes.append(f"results of {len(results)} analysis models ({names}) are not "
                         "added: the largest compression per load type is used")
        if out:
            note = self.units.note_use("force")
            if note:
                notes.append(note)
        return out, notes
