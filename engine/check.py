"""Member checks: member table in, results table out (pure computation, internal units).

The one place where validity, required strength, available strength and status meet.  Every
reader (members JSON, IFC) and every front end (CLI, HTTP) goes through :func:`check_members`.
"""

from __future__ import annotations

from dataclasses import dataclass, field
from typing import TypeVar

import numpy as np
from numpy.typing import NDArray

from stanchion.engine.arrays import BoolArray, FloatArray, IntArray, ObjectArray
from stanchion.engine.combinations import Combination, default_combinations, governing
from stanchion.engine.compression import (
    SLENDERNESS_ADVISORY,
    available_strength,
    compressive_strength,
    kc,
)
from stanchion.engine.designations import AS_WELDED, designation_of
from stanchion.engine.masks import all_set, any_set, finite_positive, is_none
from stanchion.engine.materials import (
    E_DEFAULT,
    G_DEFAULT,
    composite_reason,
    skip_reason,
    stainless_reason,
)
from stanchion.engine.members import MemberTable
from stanchion.engine.plausibility import implausible_reasons
from stanchion.engine.sections import ElementClass, Kind, SectionTable

PASS, FAIL, NOT_CHECKED, SKIPPED = "pass", "fail", "not_checked", "skipped"
GIVEN_REQUIRED = "required strength as given"
_STATUS = np.array([FAIL, PASS], dtype=object)  # indexed by (utilization <= 1)
_UNSUPPORTED = int(Kind.UNSUPPORTED)
_N = TypeVar("_N", np.float64, np.int64)  # a numeric column


@dataclass
class CheckResults:
    """Per-member results (kip, ksi), aligned with the member table rows.

    Attributes:
        status: "pass" / "fail" / "not_checked" / "skipped" (not a steel member: no
            capacity, no verdict; docs/design.md §3).
        required_strength: governing factored (LRFD) or service (ASD) compression, kip.
        available_strength: φc·Pn or Pn/Ωc, kip.
        utilization: required / available.
        limit_state: governing limit state name.
        combination: governing combination name (or "required strength as given").
        slenderness: max(Lcx/rx, Lcy/ry).
        Fcr, Ae: governing critical stress (ksi) and effective area (in²).
        reason: why a member was not checked or skipped (None otherwise).
        messages: per-member messages (warnings, notes).
        max_tension: largest net tension of any combination, kip (0 where none).
        combination_names / combination_values: every combination's net axial value
            (n × m, kip), filled when ``detail`` was asked for.
    """

    method: str
    status: ObjectArray
    required_strength: FloatArray
    available_strength: FloatArray
    utilization: FloatArray
    limit_state: ObjectArray
    combination: ObjectArray
    slenderness: FloatArray
    Fcr: FloatArray
    Ae: FloatArray
    reason: ObjectArray
    messages: list[list[str]]
    max_tension: FloatArray | None = None
    combination_names: list[str] = field(default_factory=list)
    combination_values: FloatArray | None = None

    def __len__(self) -> int:
        return len(self.status)


#: Why a member cannot be checked, in the order the tests apply (a member gets the first that
#: applies); :func:`_not_checked_reasons` builds one mask row per entry, in this order.
#: ``lx`` is the member length unless given apart: "no length" when neither is known; a bad
#: value is named "unbraced length x" (a members request names a bad ``length`` itself,
#: :func:`stanchion.service.members_check.members_from_request`). A member none of these
#: applies to is then held to the plausibility limits (:mod:`stanchion.engine.plausibility`):
#: "implausible <what> <value> <unit>: check the units".
_REASONS = (
    "no usable section",
    "angles and double angles are out of scope (AISC 360-22 E5 is not implemented)",
    "no yield strength", "yield strength must be a finite number greater than zero",
    "no length", "unbraced length x must be a finite number greater than zero",
    "no unbraced length y", "unbraced length y must be a finite number greater than zero",
    "no unbraced length z", "unbraced length z must be a finite number greater than zero",
    "effective length factor kx must be a finite number greater than zero",
    "effective length factor ky must be a finite number greater than zero",
    "effective length factor kz must be a finite number greater than zero",
    "E and G must be finite numbers greater than zero",
    "no loads",
    "loads and required strength must be finite numbers",
    "required strength must be compression (zero or positive)",
)
_REASON_TEXTS = np.array(_REASONS, dtype=object)
NO_LOADS = "no loads"


def _infinite_demand(m: MemberTable) -> BoolArray:
    """True for members with an infinite load or required strength."""
    return np.isinf(m.loads).any(axis=1) | np.isinf(m.required_strength)


#: The masks of :data:`_REASONS` that concern the capacity (section, Fy, lengths, K, E, G);
#: the rest concern the demand.
_CAPACITY_REASONS = _REASONS.index("no loads")


def _load_only(reason: ObjectArray, rows: BoolArray) -> BoolArray:
    """Rows whose given reason names missing loads and nothing else ("no loads (...)")."""
    out = np.zeros(len(reason), dtype=bool)
    for i in rows.nonzero()[0].tolist():
        text = str(reason[i])
        out[i] = text.startswith(NO_LOADS) and "; " not in text
    return out


def _not_checked_reasons(m: MemberTable) -> tuple[ObjectArray, BoolArray]:
    """The first reason each member cannot be checked, or None; and the load-only members.

    One boolean row per entry of :data:`_REASONS`, filled by a few passes over stacked
    columns (as cheap for a small request as for a large one).  A member whose only
    reason is that it has no loads (the engine's "no loads", or a reader's reason that
    begins with it and names nothing else) and whose capacity inputs are usable and
    plausible is *load-only*: it is not checked, but its available strength is computed
    (an engineer without loads yet still learns what each column carries).
    """
    reason = m.reason.copy()
    idx = m.section_index
    masks = np.empty((len(_REASONS), len(m)), dtype=bool)
    np.less(idx, 0, out=masks[0])
    kind = (m.sections.kind.take(np.where(masks[0], 0, idx)) if len(m.sections)
            else np.full(len(m), -1))
    np.equal(kind, _UNSUPPORTED, out=masks[1])
    masks[1] &= ~masks[0]
    with np.errstate(invalid="ignore"):
        numbers = np.stack([m.Fy, m.lx, m.ly, m.lz])  # rows 2-9: "no X", "X must be ..."
        np.isnan(numbers, out=masks[2:10:2])
        masks[3:10:2] = ~finite_positive(numbers)
        masks[10:13] = ~finite_positive(np.stack([m.kx, m.ky, m.kz]))
        masks[13] = ~finite_positive(m.E) | ~finite_positive(m.G)
        masks[14] = np.isnan(m.loads).all(axis=1) & np.isnan(m.required_strength)
        masks[15] = _infinite_demand(m)
        np.less(m.required_strength, 0, out=masks[16])
    free = is_none(reason)
    hit = masks.any(axis=0) & free
    capacity_ok = ~masks[:_CAPACITY_REASONS].any(axis=0)
    load_only = capacity_ok & ((free & masks[_CAPACITY_REASONS]
                                & ~masks[_CAPACITY_REASONS + 1:].any(axis=0))
                               | _load_only(reason, ~free & capacity_ok))
    if any_set(hit):
        reason[hit] = _REASON_TEXTS[masks.argmax(axis=0)[hit]]
    implausible = implausible_reasons(m, (free & ~hit) | load_only)
    flagged = ~is_none(implausible)
    if any_set(flagged):
        for i in (flagged & load_only).nonzero()[0].tolist():  # both reasons, capacity first
            reason[i] = f"{implausible[i]}; {reason[i]}"
        plain = flagged & ~load_only
        reason[plain] = implausible[plain]
        load_only &= ~flagged
    return reason, load_only


def _material_reasons(m: MemberTable, reason: ObjectArray) -> BoolArray | None:
    """Apply the material class (:mod:`stanchion.engine.materials`) to ``reason``.

    A member whose materials all name another material than steel is skipped: its reason
    becomes "not steel: <class>" whatever else it lacks.  A member whose materials name
    steel and another material (composite or ambiguous) is not checked, that reason first; one
    whose materials name stainless steel is not checked with that reason alone (AISC 370).
    Steel and unknown members are left alone.  Loops only over the distinct classes.

    Args:
        m: the members (``m.material`` None: nothing to do).
        reason: the members' reasons, changed in place.

    Returns:
        The skipped members, or None when there are none.
    """
    if m.material is None:
        return None
    skipped = None
    for label in set(m.material.tolist()):
        rows = m.material == label
        skip = skip_reason(str(label))
        if skip is not None:
            reason[rows] = skip
            skipped = rows if skipped is None else skipped | rows
            continue
        stainless = stainless_reason(str(label))
        if stainless is not None:  # outranks whatever else it lacks (no Fy is expected)
            reason[rows] = stainless
            continue
        mixed = composite_reason(str(label))
        if mixed is not None:
            for i in rows.nonzero()[0].tolist():
                reason[i] = mixed if reason[i] is None else f"{mixed}; {reason[i]}"
    return skipped


def check_members(
    m: MemberTable,
    method: str = "LRFD",
    combinations: list[Combination] | None = None,
    *,
    half_live: bool = False,
    detail: bool = False,
) -> CheckResults:
    """Check every member in compression (AISC 360-22 Chapter E, ASCE 7-22 combinations).

    Args:
        m: the members.
        method: "LRFD" or "ASD".
        combinations: replaces the ASCE 7-22 defaults for ``method`` when given.
        half_live: the ASCE 7-22 §2.3.1 exception (0.5L), ignored with custom combinations.
        detail: keep every combination's value.

    Returns:
        The results, one row per member.
    """
    method = method.upper()
    n = len(m)
    reason, load_only = _not_checked_reasons(m)
    before = reason.copy()
    skipped = _material_reasons(m, reason)
    ok = is_none(reason)
    if any_set(load_only):  # a material reason (not steel, composite) outranks the capacity
        load_only &= np.asarray(reason == before, dtype=bool)
    capable = ok | load_only  # the available strength is computed for these

    # Compute on every row with harmless stand-ins where data are unusable, then blank them
    # (when every member is usable, the usual case, the inputs are used as they are).
    every = all_set(ok)

    def usable(a: NDArray[_N], stand_in: float) -> NDArray[_N]:
        return a if every else np.where(capable, a, stand_in)

    idx = (usable(m.section_index, 0) if len(m.sections)
           else np.zeros(n, dtype=np.int64))
    Fy, E, G = usable(m.Fy, 50.0), usable(m.E, E_DEFAULT), usable(m.G, G_DEFAULT)
    Lcx, Lcy, Lcz = (usable(k, 1.0) * usable(length, 1.0)
                     for k, length in ((m.kx, m.lx), (m.ky, m.ly), (m.kz, m.lz)))

    messages = list(m.messages)  # rows that gain a message get a new list (_advisories)
    if len(m.sections) and (every or any_set(capable)):
        comp = compressive_strength(m.sections, Fy, Lcx, Lcy, Lcz, E, G, index=idx)
        if not all_set(comp.in_scope):
            out_of_scope = capable & ~comp.in_scope
            reason[out_of_scope] = "round HSS with D/t >= 0.45 E/Fy is outside AISC 360-22 E7"
            ok &= comp.in_scope
            capable &= comp.in_scope
            every = False
        available = available_strength(comp.Pn, method)
        limit_state = comp.limit_state_names()
        slenderness, Fcr_, Ae = comp.slenderness, comp.Fcr, comp.Ae
    else:
        available = np.full(n, np.nan)
        limit_state = np.full(n, "", dtype=object)
        slenderness = Fcr_ = Ae = np.full(n, np.nan)

    # The 0.5L exception is a strength-design (§2.3.1) rule; ASD combinations have no such
    # option.
    combos = combinations if combinations is not None else default_combinations(
        method, half_live=half_live and method == "LRFD")
    loads = m.loads
    unknown_demand = _infinite_demand(m)  # such members are not checked (see _REASONS)
    if any_set(unknown_demand):
        loads = np.where(np.isinf(loads), np.nan, loads)
    gov = governing(loads, combos)
    given = ~np.isnan(m.required_strength)
    any_given = any_set(given)
    required = np.where(given, m.required_strength, gov.required) if any_given else gov.required
    combination = gov.combination.copy()  # object array, None where nothing compresses
    combination[is_none(combination)] = ""
    if any_given:
        combination[given] = GIVEN_REQUIRED

    with np.errstate(divide="ignore", invalid="ignore"):
        utilization = required / available

    status = _STATUS[(utilization <= 1.0).view(np.int8)]
    if not every:
        bad = ~ok
        status[bad] = NOT_CHECKED
        # The demand stays known where it can be computed (selection uses it even for a
        # member whose own section is unusable); everything capacity-related is blanked,
        # except the capacity of load-only members.
        utilization[bad] = np.nan
        for arr in (available, slenderness, Fcr_, Ae):
            arr[~capable] = np.nan
        required[bad & ((gov.no_loads & ~given) | unknown_demand)] = np.nan
        limit_state = np.where(capable, limit_state, "").astype(object)
        combination[bad] = ""
    if skipped is not None:  # not steel: no verdict and no numbers at all
        status[skipped] = SKIPPED
        required[skipped] = np.nan

    max_tension = (gov.max_tension if every and not any_given
                   else np.where(ok & ~given, gov.max_tension, 0.0))
    _advisories(messages, ok, capable, slenderness, given, gov.index)
    if len(m.sections):
        _built_up_notes(messages, m.sections, idx, capable)
    return CheckResults(
        method=method,
        status=status,
        required_strength=required,
        available_strength=available,
        utilization=utilization,
        limit_state=limit_state,
        combination=combination,
        slenderness=slenderness,
        Fcr=Fcr_,
        Ae=Ae,
        reason=reason,
        messages=messages,
        max_tension=max_tension,
        combination_names=list(gov.names) if detail else [],
        combination_values=gov.values if detail else None,
    )


def _advisories(
    messages: list[list[str]],
    ok: BoolArray,
    capable: BoolArray,
    slenderness: FloatArray,
    given: BoolArray,
    gov_index: IntArray,
) -> None:
    """Append warnings that do not change the status (loops only over flagged members).

    Args:
        messages: per-member messages; a row that gains a message gets a new list.
        ok: members that were checked.
        capable: members whose available strength was computed (checked or load-only).
        slenderness: max(Lcx/rx, Lcy/ry).
        given: members whose required strength was given.
        gov_index: governing combination of each member, -1 where none compresses.
    """
    for i in (capable & (slenderness > SLENDERNESS_ADVISORY)).nonzero()[0].tolist():
        messages[i] = [*messages[i],
                       f"Lc/r = {slenderness[i]:.0f} exceeds {SLENDERNESS_ADVISORY:.0f} "
                       "(AISC 360-22 E2 user note); review the member"]
    for i in (ok & ~given & (gov_index < 0)).nonzero()[0].tolist():
        messages[i] = [*messages[i], "no load combination produces compression"]


def _built_up_notes(messages: list[list[str]], sections: SectionTable, idx: IntArray,
                    capable: BoolArray) -> None:
    """Say where flanges are taken as built-up (AISC 360-22 Table B4.1a case 2) and kc.

    docs/design.md §8 "Built-up I sections". Loops only over the flagged members.

    Args:
        messages: per-member messages; a row that gains a message gets a new list.
        sections: the section rows.
        idx: each member's row.
        capable: members whose available strength was computed.
    """
    built_up = sections.cls1 == ElementClass.BUILT_UP_FLANGE
    if not any_set(built_up):
        return
    with np.errstate(divide="ignore", invalid="ignore"):
        kc_row = kc(sections.b2 / sections.t2)
    said: dict[int, str] = {}
    for i in (capable & built_up[idx]).nonzero()[0].tolist():
        row = int(idx[i])
        if row not in said:
            named = designation_of(sections.designation[row])
            why = ("AS/NZS 3679.2 welded section" if named is not None
                   and named.standard == AS_WELDED else "no root radius")
            said[row] = (f"flanges taken as built-up ({why}): AISC 360-22 Table B4.1a case 2, "
                         f"kc = {kc_row[row]:.2f}")
        messages[i] = [*messages[i], said[row]]
