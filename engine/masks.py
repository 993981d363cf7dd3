"""Tests on boolean masks, for the small arrays of a single request.

``ndarray.any()`` and ``ndarray.all()`` pass through a Python-level wrapper that costs more
than the test itself on a few hundred members; ``np.count_nonzero`` does not.
"""

from __future__ import annotations

import numpy as np


def any_set(mask: np.ndarray) -> bool:
    """True when any element of the boolean ``mask`` is True."""
    return bool(np.count_nonzero(mask))


def all_set(mask: np.ndarray) -> bool:
    """True when every element of the boolean ``mask`` is True (also when it is empty)."""
    return bool(np.count_nonzero(mask) == np.size(mask))


def finite_positive(a: np.ndarray) -> np.ndarray:
    """True where ``a`` is a finite number greater than zero (NaN and infinity: False)."""
    return (a > 0) & (a < np.inf)
