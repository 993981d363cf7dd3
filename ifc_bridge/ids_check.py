"""Validating a model against an IDS document (ifctester): what each column is missing.

Used by ``check MODEL --ids FILE`` (docs/design.md §3 ``requirements``, §4): the IDS is
validated against the model before the check's results are reported, and every failed
requirement is listed per element by its GlobalId.
"""

from __future__ import annotations

from dataclasses import dataclass, field
from typing import Any

import ifcopenshell

from stanchion.ifc_bridge.access import get


@dataclass
class SpecificationOutcome:
    """One IDS specification against the model.

    Attributes:
        name: the specification's name.
        applicable: elements it applies to.
        failed: of those, elements failing a requirement.
        passed: True when the specification holds (also its own minOccurs / maxOccurs).
    """

    name: str
    applicable: int
    failed: int
    passed: bool


@dataclass
class IdsOutcome:
    """A model validated against an IDS.

    Attributes:
        specifications: one outcome per specification, in the IDS's order.
        missing: GlobalId to the failed requirements of that element, each
            ``"<specification>: <what failed>"``.
    """

    specifications: list[SpecificationOutcome] = field(default_factory=list)
    missing: dict[str, list[str]] = field(default_factory=dict)


def _facet_text(facet: Any) -> str:
    """What a requirement facet asks, in ifctester's words; "" for a value restriction.

    A pattern or enumeration would be printed as ifctester's dict of it: the reason of the
    failure (the values found) says enough then.
    """
    if not all(isinstance(getattr(facet, k, None), str | None)
               for k in ("value", "baseName", "propertySet", "name")):
        return ""
    try:
        return str(facet.to_string("requirement"))
    except Exception:  # a facet ifctester cannot describe
        return ""


def validate_ids(model: ifcopenshell.file, ids: Any) -> IdsOutcome:
    """Validate ``model`` against ``ids`` (an :class:`ifctester.ids.Ids`).

    Args:
        model: an opened model (only read).
        ids: the IDS document.

    Returns:
        The outcome per specification and the failed requirements per GlobalId.
    """
    ids.validate(model)
    outcome = IdsOutcome()
    for spec in ids.specifications:
        outcome.specifications.append(SpecificationOutcome(
            name=str(spec.name),
            applicable=len(spec.applicable_entities), failed=len(spec.failed_entities),
            passed=bool(spec.status)))
        for facet in spec.requirements:
            for failure in facet.failures:
                guid = get(failure["element"], "GlobalId")
                if guid is None:
                    continue
                reason = failure.get("reason") or "not met"
                asked = _facet_text(facet)
                outcome.missing.setdefault(str(guid), []).append(
                    f"{spec.name}: {asked} ({reason})" if asked else f"{spec.name}: {reason}")
    return outcome
