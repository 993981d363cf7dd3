"""Dimensions of parametric profiles: broadcasting and the conditions they must meet.

The builders of :mod:`engine.section_properties` take their dimensions through
:func:`checked_dimensions` (ValueError naming every failed condition); readers that must mark
only the bad rows "not checked" ask :func:`dimension_problems`, the same diagnosis row by row
without raising.  Dimensions in inches.
"""

from __future__ import annotations

from collections.abc import Callable

import numpy as np
from numpy.typing import ArrayLike

from stanchion.engine.arrays import BoolArray, FloatArray, IntArray, ObjectArray

Array = FloatArray
Check = tuple[BoolArray, str]  # (rows where a condition fails, the condition)


def _arrays(*values: ArrayLike | None) -> list[Array]:
    """Broadcast the inputs to 1-D float arrays of a common length."""
    arrays = np.broadcast_arrays(*(np.atleast_1d(np.asarray(v, dtype=float)) for v in values))
    if arrays[0].ndim != 1:
        raise ValueError(f"dimensions must be scalars or 1-D arrays, got {arrays[0].shape}")
    return [a.copy() for a in arrays]


def format_dimension(v: float) -> str:
    """A dimension as written in labels and messages (four significant digits)."""
    return f"{v:.4g}"


def _positive(**dims: Array) -> list[Check]:
    return [(~(np.isfinite(v) & (v > 0)), f"{k} must be a positive number")
            for k, v in dims.items()]


def _radius(name: str, r: Array) -> list[Check]:
    return [(~(np.isfinite(r) & (r >= 0)), f"{name} must be zero or a positive number")]


def _open_checks(family: str, d: Array, bf: Array, tw: Array, tf: Array, r: Array
                 ) -> list[Check]:
    """Conditions for I (two flanges, fillets both sides of the web), T and U profiles."""
    flanges = 1 if family == "T" else 2  # flanges along d
    sides = 1 if family == "U" else 2  # fillets across bf
    part = "stem" if family == "T" else "web"
    return _positive(d=d, bf=bf, tw=tw, tf=tf) + _radius("r", r) + [
        (tw >= bf, "tw must be less than bf"),
        (flanges * tf >= d, ("2*tf" if flanges == 2 else "tf") + " must be less than d"),
        (tw + sides * r > bf, ("tw + 2*r" if sides == 2 else "tw + r")
         + f" ({part} and fillets) must not exceed bf"),
        (flanges * (tf + r) >= d,
         f"clear {part} d - {flanges}*(tf + r) must be positive"),
    ]


_CHECKS: dict[str, tuple[tuple[str, ...], Callable[..., list[Check]]]] = {
    "I": (("d", "bf", "tw", "tf", "r"), lambda *a: _open_checks("I", *a)),
    "T": (("d", "bf", "tw", "tf", "r"), lambda *a: _open_checks("T", *a)),
    "U": (("d", "bf", "tw", "tf", "r"), lambda *a: _open_checks("U", *a)),
    "HSS": (("H", "B", "t", "r_out"), lambda H, B, t, r_out: (
        _positive(H=H, B=B, t=t) + _radius("r_out", r_out) + [
            (2 * t >= H, "2*t must be less than H"), (2 * t >= B, "2*t must be less than B"),
            (2 * r_out > np.minimum(H, B), "r_out must not exceed half of min(H, B)")])),
    "HSS_ROUND": (("D", "t"), lambda D, t: (
        _positive(D=D, t=t) + [(2 * t >= D, "2*t must be less than D")])),
    "RECT": (("H", "B"), lambda H, B: _positive(H=H, B=B)),
    "ROUND": (("D",), lambda D: _positive(D=D)),
}


def _failures(family: str, arrays: list[Array]) -> list[tuple[IntArray, str]]:
    """(bad row indices, message) for every condition that fails in some row."""
    with np.errstate(invalid="ignore"):
        checks = _CHECKS[family][1](*arrays)
    return [(np.flatnonzero(bad), msg) for bad, msg in checks if np.any(bad)]


def dimension_problems(family: str, **dims: ArrayLike | None) -> ObjectArray:
    """Row-by-row diagnosis of parametric dimensions, without raising.

    Args:
        family: ``"I"``, ``"HSS"``, ``"HSS_ROUND"``, ``"T"``, ``"U"``, ``"RECT"`` or ``"ROUND"``.
        **dims: the builder's dimension arguments by name (``d=..., bf=...``); ``r`` defaults
            to 0 and ``r_out`` to 2t, as in the builders; None elsewhere reads as missing.

    Returns:
        Object array, one string per row: ``""`` when the row is usable, otherwise the reasons
        joined by ``"; "`` (e.g. ``"tw must be less than bf"``).

    Raises:
        ValueError: unknown family, a missing / unexpected dimension name, non-numeric values.
    """
    if family not in _CHECKS:
        raise ValueError(f"unknown profile family {family!r}; expected one of {list(_CHECKS)}")
    names = _CHECKS[family][0]
    dims = dict(dims)
    if "r" in names and dims.get("r") is None:
        dims["r"] = 0.0
    if family == "HSS" and dims.get("r_out") is None and "t" in dims:
        dims["r_out"] = 2.0 * np.asarray(dims["t"], dtype=float)
    missing, extra = [k for k in names if k not in dims], [k for k in dims if k not in names]
    if missing or extra:
        raise ValueError(f"{family} profile: missing {missing}, unexpected {extra}")
    arrays = _arrays(*(dims[k] for k in names))
    reasons: list[list[str]] = [[] for _ in range(len(arrays[0]))]
    for rows, message in _failures(family, arrays):
        for i in rows:
            reasons[i].append(message)
    return np.array(["; ".join(r) for r in reasons], dtype=object)


def checked_dimensions(family: str, *values: ArrayLike) -> list[Array]:
    """Broadcast the dimensions; raise ValueError naming each failed condition.

    For array input the message names the rows too, with the values of the first bad row.

    Args:
        family: ``"I"``, ``"HSS"``, ``"HSS_ROUND"``, ``"T"``, ``"U"``, ``"RECT"`` or ``"ROUND"``.
        *values: the family's dimensions, in the order of its builder's arguments.

    Returns:
        The dimensions as 1-D float arrays of a common length.

    Raises:
        ValueError: a value is not a number, or a condition fails (named in the message).
    """
    for name, v in zip(_CHECKS[family][0], values, strict=True):
        try:
            np.asarray(v, dtype=float)
        except (TypeError, ValueError):
            raise ValueError(f"invalid {family} profile dimensions: {name} must be a number, "
                             f"got {v!r}") from None
    arrays = _arrays(*values)
    scalar = all(np.ndim(v) == 0 for v in values)
    problems = []
    for rows, message in _failures(family, arrays):
        where = "" if scalar else f" in rows {rows[:10].tolist()}" + (
            " ..." if rows.size > 10 else "")
        got = ", ".join(f"{k}={format_dimension(a[rows[0]])}"
                        for k, a in zip(_CHECKS[family][0], arrays, strict=True))
        problems.append(f"{message}{where} (got {got})")
    if problems:
        raise ValueError(f"invalid {family} profile dimensions: " + "; ".join(problems))
    return arrays
