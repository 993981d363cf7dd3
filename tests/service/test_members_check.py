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

