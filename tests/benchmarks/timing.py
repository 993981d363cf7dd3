"""Timing helper shared by the benchmark scripts (imported from their own folder)."""

from __future__ import annotations

import time
from collections.abc import Callable

import numpy as np


def best_of(fn: Callable[[], object], repeats: int = 5) -> float:
    """Shortest wall time of ``repeats`` calls of ``fn`` (seconds)."""
    best = np.inf
    for _ in range(repeats):
        t = time.perf_counter()
        fn()
        best = min(best, time.perf_counter() - t)
    return best
