"""Tests on boolean masks, for the small arrays of a single request.

``ndarray.any()`` and ``ndarray.all()`` pass through a Python-level wrapper that costs more
than the test itself on a few hundred members; ``np.count_nonzero`` does not.
"""

from __future__ import annotations

import numpy as np

from stanchion.engine.arrays import BoolArray, FloatArray, ObjectArray

_NONE = np.array(None, dtype=object)


def any_set(mask: BoolArray) -> bool:
    """True when any element of the boolean ``mask`` is True.

    Args:
        mask: a boolean array.

    Returns:
        Whether any element is set.
    """
    return bool(np.count_nonzero(mask))


def all_set(mask: BoolArray) -> bool:
    """True when every element of the boolean ``mask`` is True (also when it is empty).

    Args:
        mask: a boolean array.

    Returns:
        Whether every element is set.
    """
    return bool(np.count_nonzero(mask) == np.size(mask))


def finite_positive(a: FloatArray) -> BoolArray:
    """True where ``a`` is a finite number greater than zero (NaN and infinity: False).

    Args:
        a: numbers.

    Returns:
        The mask, shaped like ``a``.
    """
    return (a > 0) & (a < np.inf)


def is_none(a: ObjectArray) -> BoolArray:
    """True where an element of the object array ``a`` is None (elementwise ``is None``).

    Args:
        a: an object array (reasons, combination names ...).

    Returns:
        The mask, shaped like ``a``.
    """
    out: BoolArray = np.equal(a, _NONE)
    return out
