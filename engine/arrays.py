"""Array types shared by the engine and its readers (``numpy.typing`` aliases).

Every member or section column is one of these: floats in the internal units (kip, inch,
ksi), integer codes and row indices, boolean masks, or Python objects (ids, names, reasons).
"""

from __future__ import annotations

from typing import Any, TypeAlias

import numpy as np
from numpy.typing import NDArray

FloatArray: TypeAlias = NDArray[np.float64]
IntArray: TypeAlias = NDArray[np.int64]
BoolArray: TypeAlias = NDArray[np.bool_]
ObjectArray: TypeAlias = NDArray[np.object_]
#: A column whose dtype depends on its content (extra writer columns).
AnyArray: TypeAlias = NDArray[Any]

__all__ = ["AnyArray", "BoolArray", "FloatArray", "IntArray", "ObjectArray"]
