"""The members request model: whole-request rules (docs/design.md §2)."""

from __future__ import annotations

import time

import pytest
from pydantic import ValidationError

from stanchion.service.request import MembersRequest


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
