"""Load-case policy, and the plain load table front ends parse and readers match to members.

Which ASCE 7 load type an analysis load case is, how several cases combine, and
:class:`LoadTable`, the service load effects by element a front end read from a table.

Readers extract the facts (a case's ActionSource, ActionType, names; each case's axial force
per analysis model) and call these functions; the policy itself lives only here.

Load case -> load type (:func:`case_load_type`), first rule that applies:

=====================================  ==================================================
rule                                   load type
=====================================  ==================================================
a load combination (PredefinedType     ignored: combinations are formed by ASCE 7-22
LOAD_COMBINATION(_GROUP))
ActionSource DEAD_LOAD_G, COMPLETION_G1  D
ActionSource LIVE_LOAD_Q                 L; Lr when a name has the token ``Lr`` (any case)
                                         or the word "roof"
ActionSource SNOW_S / RAIN / WIND_W /    S / R / W / E
EARTHQUAKE_E
any other ActionSource (TEMPERATURE_T,   ignored (no ASCE 7-22 load type here)
PRESTRESSING_P, ICE, ...)
ActionSource NOTDEFINED / USERDEFINED /  the names: a token ``D L Lr S R W E`` (case as
unset                                    written, optional trailing digits, e.g. ``D1``,
                                         ``Lr``, ``W2``), else the words dead / self weight /
                                         superimposed -> D, roof live -> Lr, live -> L,
                                         snow -> S, rain -> R, wind -> W, seismic /
                                         earthquake -> E; several different types ->
                                         ignored (ambiguous)
ActionType PERMANENT_G (nothing else)    D
otherwise                                ignored
=====================================  ==================================================

Several cases of one type in one analysis model (:func:`combine_cases`): D, L, Lr, S and R
cases are added (taken to act together, which is conservative when they are alternative
patterns); W and E cases are alternatives (directions), the one of largest magnitude is used
(the combinations reverse W and E themselves).  Results of several analysis models (e.g. an
old and a new run kept in one file) are never added: per load type the largest compression
(W, E: the largest magnitude) over the models is used.  Common practice, no source.
"""

from __future__ import annotations

import re
from collections.abc import Hashable, Iterable, Sequence
from dataclasses import dataclass
from typing import NamedTuple

from stanchion.engine.members import REVERSIBLE

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
_WORDS: tuple[tuple[re.Pattern[str], str], ...] = (
    (re.compile(r"\broof\s*live\b|\blive\s*roof\b|\broof\b"), "Lr"),
    (re.compile(r"\bdead\b|\bself[\s\-]*weight\b|\bsuperimposed\b"), "D"),
    (re.compile(r"\blive\b"), "L"),
    (re.compile(r"\bsnow\b"), "S"),
    (re.compile(r"\brain\b"), "R"),
    (re.compile(r"\bwind\b"), "W"),
    (re.compile(r"\bseismic\b|\bearthquake\b"), "E"),
)


def _tokens(texts: Sequence[str]) -> set[str]:
    found = set()
    for text in texts:
        for tok in re.split(r"[^A-Za-z0-9]+", text):
            m = _TOKEN.match(tok)
            if m:
                found.add("Lr" if m.group(1).lower() == "lr" else m.group(1))
    return found


def _by_name(texts: Sequence[str]) -> tuple[str | None, str]:
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


def case_load_type(
    texts: Sequence[str],
    *,
    action_source: str | None = None,
    action_type: str | None = None,
    combination: bool = False,
) -> tuple[str | None, str]:
    """Load type of an analysis load case (the table in the module docstring).

    Args:
        texts: the case's names (name, description, object type), empty ones left out.
        action_source: its ActionSource (``"DEAD_LOAD_G"``, ``"WIND_W"``, ``"USERDEFINED"``,
            ...) or None.
        action_type: its ActionType (``"PERMANENT_G"`` ...) or None.
        combination: the case is a load combination, not a load case.

    Returns:
        (load type or None when the case is not used, the rule that decided).
    """
    if combination:
        return None, "a load combination (combinations are formed by ASCE 7-22 here)"
    if action_source in ACTION_SOURCES:
        source_kind = ACTION_SOURCES[action_source]
        if source_kind == "L":
            roof = "Lr" in _tokens(texts) or any(re.search(r"\broof\b", t.lower()) for t in texts)
            if roof:
                return "Lr", f"ActionSource {action_source} and a roof name"
        return source_kind, f"ActionSource {action_source}"
    if action_source not in _UNSPECIFIED:
        return None, f"ActionSource {action_source} has no ASCE 7-22 load type here"
    kind, rule = _by_name(texts)
    if kind is not None:
        return kind, rule
    if action_type == "PERMANENT_G":
        return "D", "ActionType PERMANENT_G"
    return None, (f"ActionSource {action_source or 'unset'}, ActionType "
                  f"{action_type or 'unset'}, {rule}")


class CaseForce(NamedTuple):
    """One analysis load case's axial compression on one member (kip, compression positive).

    Attributes:
        model: key of the analysis model the result belongs to (any hashable).
        load_type: the case's load type (:func:`case_load_type`).
        case: the case's display name.
        value: the compression, kip.
        model_name: the analysis model's display name ("" when it has none).
    """

    model: Hashable
    load_type: str
    case: str
    value: float
    model_name: str = ""


def combine_cases(cases: Iterable[CaseForce]) -> tuple[dict[str, float], list[str]]:
    """Service load effect per load type from several load cases (module docstring policy).

    Args:
        cases: every case result of one member, in reading order.

    Returns:
        ({load type: kip}, member notes saying which cases were added or enveloped).
    """
    per_model: dict[Hashable, dict[str, list[tuple[str, float]]]] = {}
    model_names: dict[Hashable, str] = {}
    for c in cases:
        per_model.setdefault(c.model, {}).setdefault(c.load_type, []).append((c.case, c.value))
        if c.model_name:
            model_names[c.model] = c.model_name
    notes: list[str] = []
    out: dict[str, float] = {}
    for by_type in per_model.values():
        for kind, items in by_type.items():
            if kind in REVERSIBLE:
                value = max((v for _, v in items), key=abs)
            else:
                value = sum(v for _, v in items)
            if len(items) > 1:
                how = "largest magnitude used" if kind in REVERSIBLE else "added"
                names = ", ".join(n for n, _ in items)
                notes.append(f"{kind} from {len(items)} load cases ({names}): {how}")
            if kind not in out:  # several analysis models: the envelope, per load type
                out[kind] = value
            elif kind in REVERSIBLE:
                out[kind] = max(out[kind], value, key=abs)
            else:
                out[kind] = max(out[kind], value)
    if len(per_model) > 1:
        names = ", ".join(sorted(model_names.values())) or f"{len(per_model)} groups"
        notes.append(f"results of {len(per_model)} analysis models ({names}) are not "
                     "added: the largest compression per load type is used")
    return out, notes


@dataclass(frozen=True)
class LoadTable:
    """Service axial load effects by element, as a front end parsed them from a load table.

    Attributes:
        rows: (element text, {load type: value in that column's unit}) in table order; in a
            table keyed by grid and level the text is the row's grid location (``B-2``).
        to_kip: {load type: factor to kip} per column; None for a column without a unit,
            whose values are in the force unit of the model the table goes with.
        label: where the table came from (file name), for messages.
        levels: None for a table keyed by element (GlobalId, Tag or Name); for a column load
            schedule keyed by grid and level, each row's level (a storey name).
    """

    rows: tuple[tuple[str, dict[str, float]], ...]
    to_kip: dict[str, float | None]
    label: str = "load table"
    levels: tuple[str, ...] | None = None

    @property
    def uses_model_unit(self) -> bool:
        """True when some value is in the model's force unit (a column without a unit)."""
        return any(self.to_kip.get(kind) is None for _, loads in self.rows for kind in loads)

    def in_kip(self, model_force_to_kip: float) -> list[tuple[str, dict[str, float]]]:
        """The rows with every value in kip (``model_force_to_kip`` for unit-less columns)."""
        f = {kind: model_force_to_kip if k is None else k for kind, k in self.to_kip.items()}
        return [(element, {kind: v * f[kind] for kind, v in loads.items()})
                for element, loads in self.rows]
