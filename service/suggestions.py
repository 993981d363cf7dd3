"""Section suggestions for checked members, for members files and models alike.

The search itself is the engine's (:func:`stanchion.engine.selection.suggest_for_members`);
this module validates the candidate lists and tells each member, in its messages, why it got
no suggestion: unusable candidates, unknown demand or strength, or none that passes.
"""

from __future__ import annotations

from collections.abc import Sequence
from typing import Any

import numpy as np

from stanchion.engine import catalog
from stanchion.engine.check import CheckResults
from stanchion.engine.members import MemberTable
from stanchion.engine.selection import suggest_for_members, suggestion_family


def _unusable(spec: Sequence[str]) -> str | None:
    """Why a candidate list cannot be searched, or None."""
    try:
        for item in spec:
            if len(catalog.family_indices(item)) == 0:
                return f"no suggestions: candidate {item!r} matches no catalog shape"
    except ValueError as exc:
        return f"no suggestions: {exc}"
    return None


def suggest(
    members: MemberTable,
    results: CheckResults,
    specs: Sequence[Sequence[str] | None],
    limits: Sequence[float | None],
    *,
    min_depth: float | None = None,
    max_depth: float | None = None,
    count: int = 5,
) -> dict[int, list[dict[str, Any]]]:
    """The lightest adequate sections for the members whose ``specs`` ask for them.

    Each member that asked and got none is told why in ``results.messages``.

    Args:
        members: the checked members.
        results: their results (the demand searched for; messages are added here).
        specs: per member, the candidate families or designations; None: no suggestion.
        limits: per member, the utilization suggestions must pass at (None: 1.0).
        min_depth: smallest nominal depth, in.
        max_depth: largest nominal depth, in.
        count: most suggestions per member.

    Returns:
        Suggestions by member row, lightest first (kip, lb/ft); an empty list for a member
        whose candidates were searched and none passed.
    """
    if not any(specs):
        return {}
    problems: dict[int, str] = {}
    usable: list[list[str] | None] = []
    for i, spec in enumerate(specs):
        why = _unusable(spec) if spec else None
        if why is not None:
            problems[i] = why
        usable.append(list(spec) if spec and why is None else None)
    limit = np.array([1.0 if u is None else u for u in limits], dtype=float)
    found, rows, skipped = suggest_for_members(
        members, results.required_strength, usable, method=results.method,
        max_utilization=limit, max_suggestions=count, min_depth=min_depth, max_depth=max_depth,
    )
    for i in skipped.tolist():
        problems[i] = ("no suggestions: the member's required strength, yield stress or "
                       "unbraced lengths are unknown")
    cat = catalog.load_catalog()
    suggestions = {int(i): found.for_member(j, cat) for j, i in enumerate(rows)}
    for i, spec in enumerate(usable):
        if spec and i not in problems and not suggestions.get(i):
            problems[i] = (f"no section of {', '.join(spec)} passes at utilization <= "
                           f"{limit[i]:g}")
    for i, text in problems.items():
        results.messages[i] = [*results.messages[i], text]
    _note_other_families(members, results, suggestions)
    return suggestions


def _note_other_families(members: MemberTable, results: CheckResults,
                         suggestions: dict[int, list[dict[str, Any]]]) -> None:
    """Say so where a suggestion is of another family than the member's own.

    Every suggestion is rated at the member's own yield stress; a section of another family
    is usually made of another material (a W of ASTM A992, a round HSS of A500, a pipe of
    A53), whose Fy may be lower.  Nothing is assumed about that material: the member is told.
    """
    if not suggestions:
        return
    families = catalog.load_catalog().family
    for i, found in suggestions.items():
        row = int(members.section_index[i])
        own = str(members.sections.family[row]) if row >= 0 else ""
        rows = catalog.lookup([s["section"] for s in found]).tolist()
        other = sorted({str(families[r]) for r in rows if r >= 0}
                       - {own, suggestion_family(own)})
        if other:
            results.messages[i] = [
                *results.messages[i],
                f"suggested {', '.join(other)} sections are rated at this member's own yield "
                "stress; check the grade such a section is made of (its Fy may be lower)"]
