"""Members request -> member table: what a not-checked reason names (docs/design.md §2)."""

from __future__ import annotations

import pytest

from stanchion.service.members_check import check_request
from stanchion.service.request import MembersRequest


def _reason(**member: object) -> str | None:
    base = {"id": "C-1", "section": "W14X48", "fy": 50, "length": 16, "loads": {"D": 95.0}}
    report = check_request(MembersRequest.model_validate({"members": [{**base, **member}]}))
    row = report["members"][0]
    assert row["status"] == "not_checked"  # never pass on a bad length
    return row["reason"]


@pytest.mark.parametrize(("member", "reason"), [
    # issue 13: "lx": -5 was reported as "length"; the reason names the field given
    # (the engine's reasons table, engine/check.py _REASONS).
    ({"lx": -5}, "unbraced length x must be a finite number greater than zero"),
    ({"ly": 0}, "unbraced length y must be a finite number greater than zero"),
    ({"length": -5}, "length must be a finite number greater than zero"),
    ({"length": -5, "ly": 10}, "length must be a finite number greater than zero"),
    # a bad length given is refused even where no unbraced length falls back to it:
    ({"length": -5, "lx": 16, "ly": 16, "lz": 16},
     "length must be a finite number greater than zero"),
    ({"length": 0}, "length must be a finite number greater than zero"),
])
def test_a_bad_length_is_named_by_its_field(member: dict, reason: str) -> None:
    assert _reason(**member) == reason



@pytest.mark.parametrize(("member", "reason"), [
    # issue 13: "fy": 1e300 passed (now refused whole: tests/service/test_request_bounds.py).
    # Plausibility limits (engine/plausibility.py, each with its source there): Fy 20–120
    # ksi, lengths 1–200 ft, loads up to 100,000 kip.
    ({"fy": 345e6}, "implausible yield stress 3.45e+08 ksi: check the units"),  # Pa as ksi
    ({"fy": 345}, "implausible yield stress 345 ksi: check the units"),  # MPa given as ksi
    ({"length": 4877}, "implausible unbraced length x 4877 ft: check the units"),  # mm as ft
    ({"ly": 0.5}, "implausible unbraced length y 0.5 ft: check the units"),
    ({"loads": {"D": 444822.0}}, "implausible load 4.448e+05 kip: check the units"),  # N as kip
    ({"required_strength": 2e5}, "implausible required strength 2e+05 kip: check the units"),
    # A profile of a W12X40 (d = 11.9 in, AISC Shapes Database v16.0) given in m as if mm
    # would be 11.9 m deep; here d = 302 m: A = 2·203·13.1 + (302 − 2·13.1)·7.5 = 7387 m²
    # = 1.145e+07 in² (by hand, no fillets), far over 4 × 272 in².
    ({"section": None, "profile": {"shape": "I", "unit": "m", "d": 302, "bf": 203,
                                   "tw": 7.5, "tf": 13.1}},
     "implausible section area 1.145e+07 in²: check the units"),
])
def test_an_implausible_value_is_not_checked(member: dict, reason: str) -> None:
    assert _reason(**member) == reason
