"""Load combinations: typed axial service load effects -> governing required strength.

The engine takes the member table's ``loads`` array, shape ``(n, 7)`` in the order of
``engine.members.LOAD_TYPES`` (D, L, Lr, S, R, W, E; axial effects, compression positive,
NaN where a type is absent) and combines every member with every combination in a single
matrix product ``loads @ factors.T``.

Default combinations are ASCE 7-22 §2.3.1 and §2.3.6 (strength design, LRFD) and §2.4.1 and
§2.4.5 (allowable stress design, ASD).  Alternatives written "(Lr or S or R)" and "(L or 0.5W)"
in the standard are expanded here into one :class:`Combination` per alternative.

Conventions:

* W and E are reversible: every combination with a non-zero W or E factor is evaluated with
  each sign (``+`` first, then ``-``; both W and E -> ``++ +- -+ --``).  This also holds for
  custom combinations.
* E is the combined seismic load effect the user supplies (Ev and Eh already combined, the
  magnitude of Ev + Eh).  With E reversible, §2.3.6 combination 7 (0.9D - Ev + Eh) and §2.4.5
  combination 10 (0.6D - 0.7Ev + 0.7Eh) are evaluated as 0.9D ± E and 0.6D ± 0.7E: the minus
  sign is exactly the uplift case; the plus sign is conservative and is dominated by
  combinations 6 and 9 for non-negative gravity loads.
* A combination whose net axial value is tension (<= 0) cannot govern a compression check.
  The largest net tension is reported separately, as a positive number.
* Ties: the first combination in list order wins (with the sign order above).  Values that are
  equal up to floating-point rounding (relative 1e-12) count as ties.

Snow (from memory, to be confirmed against the printed standard): ASCE 7-22 made the mapped
ground snow loads strength-level (reliability-targeted), and in our recollection replaced
1.6S by 1.0S in strength combination 3, the companion 0.5S of combinations 2 and 4 by 0.3S,
0.2S in the seismic combination by 0.15S, and applies 0.7S in the ASD combinations.  The S
supplied must therefore be the ASCE 7-22 snow load effect; feeding a service-level snow load
from an earlier edition into these factors is unconservative.  The factors are the
``_SNOW_*`` constants below, one place to change.

Not included: flood, ice, tornado (§2.3.3-2.3.5, 2.4.2-2.4.4) and the overstrength
combinations of Chapter 12; such cases can be supplied as custom combinations.
"""

from __future__ import annotations

import functools
import itertools
import math
import operator
from collections.abc import Mapping, Sequence
from dataclasses import dataclass, field
from numbers import Real
from types import MappingProxyType

import numpy as np

from stanchion.engine.arrays import BoolArray, FloatArray, IntArray, ObjectArray
from stanchion.engine.masks import any_set
from stanchion.engine.members import LOAD_TYPES, REVERSIBLE

# --- Snow factors (see module docstring: from memory, ASCE 7-22 strength-level snow) -------
_SNOW_LRFD_PRINCIPAL = 1.0  # ASCE 7-22 §2.3.1 combination 3 (7-16: 1.6S)
_SNOW_LRFD_COMPANION = 0.3  # ASCE 7-22 §2.3.1 combinations 2 and 4 (7-16: 0.5S)
_SNOW_LRFD_SEISMIC = 0.15  # ASCE 7-22 §2.3.6 combination 6 (7-16: 0.2S)
_SNOW_ASD_PRINCIPAL = 0.7  # ASCE 7-22 §2.4.1 combination 3 (7-16: 1.0S)
_SNOW_ASD_COMPANION = 0.525  # 0.75(0.7S), ASCE 7-22 §2.4.1 combinations 4 and 6 (7-16: 0.75S)
_SNOW_ASD_SEISMIC = 0.525  # 0.75(0.7S), ASCE 7-22 §2.4.5 combination 9 (7-16: 0.75S)

_TIE_RTOL = 1e-12  # values this close (relative) to the extreme count as ties

_CUSTOM_KEYS = frozenset({"name", "factors", "source"})


@dataclass(frozen=True)
class Combination:
    """One load combination: a factor per load type.

    Attributes:
        name: display name; for the defaults it is the formula, e.g. ``"1.2D+1.6L+0.5Lr"``.
        factors: load type (one of ``LOAD_TYPES``) -> load factor; types not listed are 0.
            The order of the entries is the order of the terms in generated names.
        source: where the combination comes from, e.g. ``"ASCE 7-22 §2.3.1 combination 2"``.

    Raises:
        ValueError: an unknown load type or a factor that is not a finite number.
    """

    name: str
    factors: Mapping[str, float]
    source: str = ""

    def __post_init__(self) -> None:
        clean: dict[str, float] = {}
        for key, value in dict(self.factors).items():
            if key not in LOAD_TYPES:
                raise ValueError(
                    f"combination {self.name!r}: unknown load type {key!r} "
                    f"(expected one of {', '.join(LOAD_TYPES)})"
                )
            if isinstance(value, bool) or not isinstance(value, Real):
                raise ValueError(
                    f"combination {self.name!r}: factor for {key} must be a number, got {value!r}"
                )
            if not math.isfinite(value):
                raise ValueError(f"combination {self.name!r}: factor for {key} is not finite")
            clean[key] = float(value)
        # Defensive, read-only copy: a caller's dict is never aliased, and a combination
        # never changes (sign expansions are cached by identity).
        object.__setattr__(self, "factors", MappingProxyType(clean))


@dataclass
class Governing:
    """Governing combination per member, and every combination's value.

    Attributes:
        required: (n,) required axial compression, >= 0; 0 when no combination compresses.
        index: (n,) int, index into ``names`` of the governing combination, -1 if none
            compresses.
        combination: (n,) object array, the governing expanded name (signs shown, e.g.
            ``"0.9D-1.0W"``), None where ``index`` is -1.
        max_tension: (n,) largest net tension over all combinations as a positive number,
            0 where no combination is in tension.
        no_loads: (n,) True where every load type is NaN (the caller reports the member
            not checked).
        names: every expanded combination name, signs included, in evaluation order.
        values: (n, m) net axial value of every expanded combination, compression positive.
        sources: source of each expanded combination (same order as ``names``).
        tension_index: (n,) int, index into ``names`` of the combination with the largest
            net tension, -1 where none is in tension.
        tension_combination: (n,) object array, its name, None where ``tension_index`` is -1.
    """

    required: FloatArray
    index: IntArray
    combination: ObjectArray
    max_tension: FloatArray
    no_loads: BoolArray
    names: list[str]
    values: FloatArray
    sources: list[str] = field(default_factory=list)
    tension_index: IntArray = field(default_factory=lambda: np.empty(0, dtype=np.int64))
    tension_combination: ObjectArray = field(default_factory=lambda: np.empty(0, dtype=object))


# --------------------------------------------------------------------------------------------
# Names


def _number(x: float) -> str:
    """A factor as written in a name: 1.0, 0.5, 0.525, 1.6."""
    text = f"{abs(x):.6g}"
    if "." not in text and "e" not in text:
        text += ".0"
    return text


def _signed(value: float, key: str) -> str:
    """One term with its sign always shown: ``+0.6W``, ``-1.0E``."""
    return f"{'-' if value < 0 else '+'}{_number(value)}{key}"


def formula(factors: Mapping[str, float]) -> str:
    """The combination written out, terms in the order of ``factors``, zero terms omitted.

    Example: ``{"D": 0.9, "W": -1.0}`` -> ``"0.9D-1.0W"``.
    """
    text = ""
    for key, value in factors.items():
        if value == 0.0:
            continue
        sign = "-" if value < 0 else ("+" if text else "")
        text += f"{sign}{_number(value)}{key}"
    return text or "0"


def _combo(source: str, *terms: tuple[str, float]) -> Combination:
    """A default combination named by its own formula."""
    factors = dict(terms)
    return Combination(name=formula(factors), factors=factors, source=source)


# --------------------------------------------------------------------------------------------
# Default combinations


def lrfd_combinations(half_live: bool = False) -> list[Combination]:
    """Strength design combinations, ASCE 7-22 §2.3.1 (1-5) and §2.3.6 (6-7).

    Written from memory of the 2022 edition (snow factors: see the module docstring):

    1. 1.4D
    2. 1.2D + 1.6L + (0.5Lr or 0.3S or 0.5R)
    3. 1.2D + (1.6Lr or 1.0S or 1.6R) + (L or 0.5W)
    4. 1.2D + 1.0W + L + (0.5Lr or 0.3S or 0.5R)
    5. 0.9D + 1.0W
    6. 1.2D + Ev + Eh + L + 0.15S   (E = Ev + Eh, combined)
    7. 0.9D - Ev + Eh               (evaluated as 0.9D ± E)

    Args:
        half_live: apply the §2.3.1 exception: the factor on L in combinations 3, 4 and 6 is
            0.5 (permitted for occupancies with Lo <= 100 psf in Table 4.3-1, except garages
            and places of public assembly).  Off by default; the user must opt in.

    Returns:
        One combination per alternative, in the order above.
    """
    basic = "ASCE 7-22 §2.3.1 combination"
    seismic = "ASCE 7-22 §2.3.6 combination"
    fl = 0.5 if half_live else 1.0
    roof_companion = (("Lr", 0.5), ("S", _SNOW_LRFD_COMPANION), ("R", 0.5))
    roof_principal = (("Lr", 1.6), ("S", _SNOW_LRFD_PRINCIPAL), ("R", 1.6))
    combos = [_combo(f"{basic} 1", ("D", 1.4))]
    combos += [_combo(f"{basic} 2", ("D", 1.2), ("L", 1.6), roof) for roof in roof_companion]
    for roof in roof_principal:
        combos.append(_combo(f"{basic} 3", ("D", 1.2), roof, ("L", fl)))
        combos.append(_combo(f"{basic} 3", ("D", 1.2), roof, ("W", 0.5)))
    combos += [
        _combo(f"{basic} 4", ("D", 1.2), ("W", 1.0), ("L", fl), roof) for roof in roof_companion
    ]
    combos.append(_combo(f"{basic} 5", ("D", 0.9), ("W", 1.0)))
    combos.append(
        _combo(f"{seismic} 6", ("D", 1.2), ("E", 1.0), ("L", fl), ("S", _SNOW_LRFD_SEISMIC))
    )
    combos.append(_combo(f"{seismic} 7", ("D", 0.9), ("E", 1.0)))
    return combos


def asd_combinations() -> list[Combination]:
    """Allowable stress design combinations, ASCE 7-22 §2.4.1 (1-7) and §2.4.5 (8-10).

    Written from memory of the 2022 edition (snow factors and the numbering 8-10: see the
    module docstring):

    1. D
    2. D + L
    3. D + (Lr or 0.7S or R)
    4. D + 0.75L + 0.75(Lr or 0.7S or R)
    5. D + 0.6W
    6. D + 0.75L + 0.75(0.6W) + 0.75(Lr or 0.7S or R)
    7. 0.6D + 0.6W
    8. 1.0D + 0.7Ev + 0.7Eh                      (E = Ev + Eh, combined)
    9. 1.0D + 0.525Ev + 0.525Eh + 0.75L + 0.75(0.7S)
    10. 0.6D - 0.7Ev + 0.7Eh                     (evaluated as 0.6D ± 0.7E)

    Returns:
        One combination per alternative, in the order above.
    """
    basic = "ASCE 7-22 §2.4.1 combination"
    seismic = "ASCE 7-22 §2.4.5 combination"
    roof = (("Lr", 1.0), ("S", _SNOW_ASD_PRINCIPAL), ("R", 1.0))
    roof_companion = (("Lr", 0.75), ("S", _SNOW_ASD_COMPANION), ("R", 0.75))
    combos = [_combo(f"{basic} 1", ("D", 1.0))]
    combos.append(_combo(f"{basic} 2", ("D", 1.0), ("L", 1.0)))
    combos += [_combo(f"{basic} 3", ("D", 1.0), r) for r in roof]
    combos += [_combo(f"{basic} 4", ("D", 1.0), ("L", 0.75), r) for r in roof_companion]
    combos.append(_combo(f"{basic} 5", ("D", 1.0), ("W", 0.6)))
    combos += [
        _combo(f"{basic} 6", ("D", 1.0), ("L", 0.75), ("W", 0.45), r) for r in roof_companion
    ]
    combos.append(_combo(f"{basic} 7", ("D", 0.6), ("W", 0.6)))
    combos.append(_combo(f"{seismic} 8", ("D", 1.0), ("E", 0.7)))
    combos.append(
        _combo(f"{seismic} 9", ("D", 1.0), ("E", 0.525), ("L", 0.75), ("S", _SNOW_ASD_SEISMIC))
    )
    combos.append(_combo(f"{seismic} 10", ("D", 0.6), ("E", 0.7)))
    return combos


def default_combinations(method: str, half_live: bool = False) -> list[Combination]:
    """The ASCE 7-22 combinations for a design method.

    Args:
        method: ``"LRFD"`` or ``"ASD"`` (case-insensitive).
        half_live: the §2.3.1 0.5L exception (LRFD only).

    Raises:
        ValueError: unknown method, or ``half_live`` with ASD (the exception is a strength
            design provision; the ASD combinations have no such option).
    """
    key = str(method).strip().upper()
    if key == "ASD" and half_live:
        raise ValueError(
            "the 0.5L exception (half_live) is an ASCE 7-22 §2.3.1 strength design "
            "provision and does not apply to ASD"
        )
    if key not in ("LRFD", "ASD"):
        raise ValueError(f"unknown design method {method!r} (expected 'LRFD' or 'ASD')")
    return list(_defaults(key, bool(half_live)))


@functools.cache
def _defaults(method: str, half_live: bool) -> tuple[Combination, ...]:
    """The default combinations, built once per (method, option)."""
    if method == "LRFD":
        return tuple(lrfd_combinations(half_live=half_live))
    return tuple(asd_combinations())


def custom_combinations(spec: Sequence[object]) -> list[Combination]:
    """Combinations supplied with a request; they replace the defaults.

    Each entry is ``{"name": str, "factors": {load type: number}, "source": str (optional)}``.
    W and E factors are still evaluated with both signs (see the module docstring).  The spec
    is not modified.

    Args:
        spec: the request's list of combinations, as parsed from JSON (validated here).

    Returns:
        The combinations, in the order given.

    Raises:
        ValueError: not a non-empty list, an entry without a non-empty name, a repeated name,
            unknown keys, empty factors, an unknown load type (named in the message) or a
            factor that is not a finite number.
    """
    if not isinstance(spec, list) or not spec:
        raise ValueError("combinations must be a non-empty list")
    combos: list[Combination] = []
    seen: set[str] = set()
    for i, entry in enumerate(spec):
        where = f"combinations[{i}]"
        if not isinstance(entry, Mapping):
            raise ValueError(f"{where} must be an object with 'name' and 'factors'")
        unknown = sorted(set(entry) - _CUSTOM_KEYS)
        if unknown:
            raise ValueError(f"{where}: unknown key(s) {', '.join(map(repr, unknown))}")
        name = entry.get("name")
        if not isinstance(name, str) or not name.strip():
            raise ValueError(f"{where}: 'name' must be a non-empty string")
        name = name.strip()
        if name in seen:
            raise ValueError(f"{where}: combination name {name!r} is used twice")
        seen.add(name)
        factors = entry.get("factors")
        if not isinstance(factors, Mapping) or not factors:
            raise ValueError(f"{where} ({name!r}): 'factors' must be a non-empty object")
        source = entry.get("source", "custom combination (request)")
        if not isinstance(source, str):
            raise ValueError(f"{where} ({name!r}): 'source' must be a string")
        combos.append(Combination(name=name, factors=dict(factors), source=source))
    return combos


# --------------------------------------------------------------------------------------------
# Evaluation


def expand_signs(
    combinations: list[Combination],
) -> tuple[list[str], list[str], FloatArray]:
    """Expand W and E into both signs (cached; see :func:`_expand_signs`)."""
    hit = _expanded(combinations)
    return list(hit.names), list(hit.sources), hit.factors


@dataclass(frozen=True)
class _Expansion:
    names: tuple[str, ...]
    sources: tuple[str, ...]
    factors: FloatArray  # (m, 7), read-only
    labels: ObjectArray  # names and a final None (index -1)


def _expanded(combinations: list[Combination]) -> _Expansion:
    """The sign expansion, cached by the identity of the (immutable) combinations.

    Equal combinations built anew are found by their content.
    """
    ids = tuple(map(id, combinations))
    held = _BY_IDENTITY.get(ids)
    if held is not None and all(map(operator.is_, held[0], combinations)):
        return held[1]
    key = tuple((c.name, tuple(c.factors.items()), c.source) for c in combinations)
    hit = _EXPANDED.get(key)
    if hit is None:
        names, sources, factors = _expand_signs(combinations)
        factors.flags.writeable = False
        hit = _Expansion(tuple(names), tuple(sources), factors,
                         np.array([*names, None], dtype=object))
        if len(_EXPANDED) >= 256:
            _EXPANDED.clear()
        _EXPANDED[key] = hit
    if len(_BY_IDENTITY) >= 256:
        _BY_IDENTITY.clear()
    _BY_IDENTITY[ids] = (tuple(combinations), hit)  # holding them keeps their ids unique
    return hit


#: Content of a list of combinations: (name, factors, source) of each.
_Content = tuple[tuple[str, tuple[tuple[str, float], ...], str], ...]
_EXPANDED: dict[_Content, _Expansion] = {}
_BY_IDENTITY: dict[tuple[int, ...], tuple[tuple[Combination, ...], _Expansion]] = {}


def _expand_signs(
    combinations: list[Combination],
) -> tuple[list[str], list[str], FloatArray]:
    """Expand W and E into both signs.

    Args:
        combinations: the combinations, in priority order.

    Returns:
        ``(names, sources, factors)``: the expanded names (a default's formula with the signs
        applied, e.g. ``"0.9D-1.0W"``; a custom name gets the signed reversible terms
        appended, e.g. ``"uplift (-0.6W)"``), their sources, and the ``(m, 7)`` factor matrix
        with columns in ``LOAD_TYPES`` order.
    """
    names: list[str] = []
    sources: list[str] = []
    rows: list[list[float]] = []
    for combo in combinations:
        flip = [t for t in REVERSIBLE if combo.factors.get(t, 0.0) != 0.0]
        named_by_formula = combo.name == formula(combo.factors)
        for signs in itertools.product((1.0, -1.0), repeat=len(flip)):
            factors = dict(combo.factors)
            for t, s in zip(flip, signs, strict=True):
                factors[t] = s * factors[t]
            if not flip:
                name = combo.name
            elif named_by_formula:
                name = formula(factors)
            else:
                terms = ", ".join(_signed(factors[t], t) for t in flip)
                name = f"{combo.name} ({terms})"
            names.append(name)
            sources.append(combo.source)
            rows.append([factors.get(t, 0.0) for t in LOAD_TYPES])
    return names, sources, np.asarray(rows, dtype=float).reshape(len(rows), len(LOAD_TYPES))


def _first_extreme(candidates: FloatArray, extreme: FloatArray, largest: bool) -> IntArray:
    """Index of the first column within rounding of the row's extreme (ties: first wins).

    Every value lies on one side of its row's extreme, so "within the tolerance" is one
    comparison: ``v >= top - tol`` for the largest, ``v <= bottom + tol`` for the smallest.
    """
    tol = _TIE_RTOL * np.abs(extreme)
    if largest:
        first: IntArray = np.argmax(candidates >= (extreme - tol)[:, None], axis=1)
    else:
        first = np.argmax(candidates <= (extreme + tol)[:, None], axis=1)
    return first


def governing(loads: FloatArray, combinations: list[Combination]) -> Governing:
    """Combine every member with every combination and pick the governing compression.

    Args:
        loads: ``(n, 7)`` axial service load effects in ``LOAD_TYPES`` order, compression
            positive, NaN where a type is absent (counted as 0).  Not modified.
        combinations: the combinations in priority order (defaults or custom).

    Returns:
        A :class:`Governing`.  ``required`` is the largest positive combination value (0 when
        none compresses); ties go to the first combination in list order, + sign before -.

    Raises:
        ValueError: ``loads`` is not ``(n, 7)``, holds an infinite value, or no combinations
            are given.
    """
    loads = np.asarray(loads, dtype=float)
    if loads.ndim != 2 or loads.shape[1] != len(LOAD_TYPES):
        raise ValueError(
            f"loads must have shape (n, {len(LOAD_TYPES)}) in the order "
            f"{', '.join(LOAD_TYPES)}; got {loads.shape}"
        )
    if any_set(np.isinf(loads)):
        raise ValueError("loads contain an infinite value")
    if not combinations:
        raise ValueError("no load combinations given")

    expansion = _expanded(combinations)
    names, sources, factors = list(expansion.names), list(expansion.sources), expansion.factors
    absent = np.isnan(loads)
    no_loads: BoolArray = np.logical_and.reduce(absent, axis=1)  # absent.all(axis=1)
    values = np.where(absent, 0.0, loads) @ factors.T  # (n, 7) @ (7, m) -> (n, m)

    label = expansion.labels  # label[-1] is None

    top = values.max(axis=1)
    compresses = top > 0.0
    required = np.where(compresses, top, 0.0)
    index = np.where(compresses, _first_extreme(values, top, largest=True), -1)

    bottom = values.min(axis=1)
    pulls = bottom < 0.0
    if any_set(pulls):
        max_tension = np.where(pulls, -bottom, 0.0)
        tension_index = np.where(pulls, _first_extreme(values, bottom, largest=False), -1)
    else:
        max_tension = np.zeros(len(loads))
        tension_index = np.full(len(loads), -1)

    return Governing(
        required=required,
        index=index.astype(np.int64),
        combination=label[index],
        max_tension=max_tension,
        no_loads=no_loads,
        names=names,
        values=values,
        sources=sources,
        tension_index=tension_index.astype(np.int64),
        tension_combination=label[tension_index],
    )
