"""Boolean mask tests (expected values by definition: common practice, no source)."""

from __future__ import annotations

import numpy as np
import pytest

from stanchion.engine.masks import all_set, any_set


@pytest.mark.parametrize("mask", [
    np.zeros(0, bool), np.zeros(5, bool), np.ones(5, bool), np.array([False, True, False]),
    np.array([[True, True], [True, False]]),
])
def test_agree_with_numpy_any_and_all(mask: np.ndarray) -> None:
    assert any_set(mask) is bool(mask.any())
    assert all_set(mask) is bool(mask.all())
