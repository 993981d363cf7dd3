"""The members request model: whole-request rules (docs/design.md §2)."""

from __future__ import annotations

import time

import pytest
from pydantic import ValidationError

from stanchion.service.request import MAX_CANDIDATES, MembersRequest


def _member(i: int) -> dict:
    return {"id": f"m{i}", "section": "W14X48", "fy": 50, "length": 10, "loads": {"D": 1.0}}


def test_repeated_ids_are_named_once_each() -> None:
    members = [_member(1), _member(2), _member(1), _member(3), _member(2), _member(1)]
    with pytest.raises(ValidationError, match=r"repeated: m1, m2 \["):
        MembersRequest.model_validate({"members": members})


def test_repeated_ids_in_a_large_request_are_found_in_linear_time() -> None:
    # 50,000 members and one repeat: counting each id with list.count took about 20 s
    # (quadratic, measured on the development machine); a linear count well under a second.
    members = [_member(i) for i in range(50_000)] + [_member(7)]
    start = time.perf_counter()
    with pytest.raises(ValidationError, match="repeated: m7"):
        MembersRequest.model_validate({"members": members})
    assert time.perf_counter() - start < 5.0  # generous for a loaded machine


def test_candidates_are_deduplicated_as_designations_compare() -> None:
    # Designations are case- and space-insensitive (engine.catalog.normalize_designation);
    # the first spelling of each is kept, in the order given (issue 13).
    given = ["W14", " w 14", "hss", "HSS", "w14x48", "W 14 X 48", "W12"]
    m = MembersRequest.model_validate({"members": [{**_member(1), "candidates": given}]})
    assert m.members[0].candidates == ["W14", "hss", "w14x48", "W12"]


def test_candidates_are_capped() -> None:
    # MAX_CANDIDATES (200, our choice, docs/design.md §2): at the cap accepted, over it refused
    # naming the field (100,000 entries cost 14 s of server CPU, issue 13).
    assert MAX_CANDIDATES == 200
    ok = {**_member(1), "candidates": [f"W{i}" for i in range(MAX_CANDIDATES)]}
    assert len(MembersRequest.model_validate({"members": [ok]}).members[0].candidates or []) \
        == MAX_CANDIDATES
    over = {**_member(1), "candidates": ["W14"] * (MAX_CANDIDATES + 1)}
    with pytest.raises(ValidationError) as exc:
        MembersRequest.model_validate({"members": [over]})
    assert [e["loc"] for e in exc.value.errors()] == [("members", 0, "candidates")]


@pytest.mark.parametrize("field", ["fy", "length", "lx", "kx", "required_strength",
                                   "max_utilization"])
def test_booleans_are_not_numbers(field: str) -> None:
    # issue 13: "fy": true was taken as 1 ksi; an integer still counts (JSON has one number).
    with pytest.raises(ValidationError) as exc:
        MembersRequest.model_validate({"members": [{**_member(1), field: True}]})
    assert [e["loc"] for e in exc.value.errors()] == [("members", 0, field)]
    assert MembersRequest.model_validate({"members": [{**_member(1), field: 2}]})
