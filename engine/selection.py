"""Section selection: the lightest adequate catalog sections for each member.

Members × candidate shapes are evaluated as one array computation with the same Chapter E
functions as the check itself (:func:`engine.compression.compressive_strength`), so a
suggested section is exactly as safe as a checked one.
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Any

import numpy as np

from stanchion.engine import catalog
from stanchion.engine.arrays import BoolArray, FloatArray, IntArray
from stanchion.engine.compression import available_strength, compressive_strength
from stanchion.engine.masks import finite_positive
from stanchion.engine.materials import E_DEFAULT, G_DEFAULT
from stanchion.engine.members import MemberTable
from stanchion.engine.sections import Kind, SectionTable

DEFAULT_MAX_SUGGESTIONS = 5


@dataclass
class Suggestions:
    """Per member, the passing candidates lightest first (kip, lb/ft).

    Attributes:
        index: (n, k) catalog row of each suggestion, -1 past the last one.
        available_strength: (n, k) φc·Pn or Pn/Ωc of each suggestion.
        utilization: (n, k) required / available.
        weight: (n, k) nominal weight, lb/ft.
    """

    index: IntArray
    available_strength: FloatArray
    utilization: FloatArray
    weight: FloatArray

    def for_member(self, i: int, table: SectionTable) -> list[dict[str, Any]]:
        """Suggestions of member ``i`` as plain dicts (designation, strength, utilization).

        Args:
            i: the member's row in these suggestions.
            table: the section table ``index`` points into (the catalog).

        Returns:
            The member's suggestions, lightest first: ``section`` (designation, str),
            ``available_strength`` (kip), ``utilization`` and ``weight`` (lb/ft), floats.
        """
        out: list[dict[str, Any]] = []
        for j in np.flatnonzero(self.index[i] >= 0):
            out.append({
                "section": str(table.designation[self.index[i, j]]),
                "available_strength": float(self.available_strength[i, j]),
                "utilization": float(self.utilization[i, j]),
                "weight": float(self.weight[i, j]),
            })
        return out


def candidate_indices(specs: list[str], *, min_depth: float | None = None,
                      max_depth: float | None = None) -> IntArray:
    """Catalog rows for families ("W12", "HSS") or designations, within a nominal depth range.

    Args:
        specs: families, families with a nominal depth, or designations
            (:func:`engine.catalog.family_indices`).
        min_depth: smallest nominal depth, in (None: no limit).
        max_depth: largest nominal depth, in (None: no limit).

    Returns:
        Sorted catalog rows, angles left out.

    Raises:
        ValueError: naming a spec that matches no catalog shape.
    """
    rows = []
    for spec in specs:
        found = catalog.family_indices(spec)
        if len(found) == 0:
            raise ValueError(f"candidate {spec!r} matches no catalog shape")
        rows.append(found)
    idx = np.unique(np.concatenate(rows)) if rows else np.empty(0, dtype=np.int64)
    cat = catalog.load_catalog()
    idx = idx[cat.kind[idx] != Kind.UNSUPPORTED]
    depth = catalog.nominal_depth()[idx]
    keep = np.ones(len(idx), dtype=bool)
    if min_depth is not None:
        keep &= depth >= min_depth
    if max_depth is not None:
        keep &= depth <= max_depth
    kept: IntArray = idx[keep]
    return kept


# The Chapter E inputs of compressive_strength plus keyword-only search options; called so by
# service.cli.suggest and the tests.
def select(  # noqa: PLR0913 - Chapter E's member inputs plus keyword-only search options
    required: FloatArray,
    Fy: FloatArray,
    Lcx: FloatArray,
    Lcy: FloatArray,
    Lcz: FloatArray,
    candidates: IntArray,
    *,
    allowed: BoolArray | None = None,
    method: str = "LRFD",
    max_utilization: FloatArray | float = 1.0,
    max_suggestions: int = DEFAULT_MAX_SUGGESTIONS,
    E: FloatArray | float = E_DEFAULT,
    G: FloatArray | float = G_DEFAULT,
) -> Suggestions:
    """Lightest passing candidates for every member (one members × candidates computation).

    Order: lightest (catalog weight per length) first; equal weights by higher available
    strength.

    Args:
        required: (n,) required strength, kip (NaN: no suggestion).
        Fy: (n,) yield stress, ksi.
        Lcx: (n,) effective length for flexural buckling about x, in.
        Lcy: (n,) effective length for flexural buckling about y, in.
        Lcz: (n,) effective length for torsional buckling, in.
        candidates: (m,) catalog rows to try.
        allowed: optional (n, m) mask of the candidates each member may take.
        method: "LRFD" or "ASD".
        max_utilization: the reserve margin: a candidate passes when
            required / available <= max_utilization.
        max_suggestions: at most this many per member.
        E: modulus of elasticity, ksi (one value or one per member).
        G: shear modulus, ksi (one value or one per member).

    Returns:
        (n, k) suggestions, k = min(max_suggestions, m).
    """
    cat = catalog.load_catalog()
    n, m = len(required), len(candidates)
    k = max(0, min(max_suggestions, m))
    if n == 0 or m == 0 or k == 0:
        empty = np.full((n, k), np.nan)
        return Suggestions(np.full((n, k), -1), empty, empty.copy(), empty.copy())

    rep = np.repeat
    E_ = rep(np.broadcast_to(np.asarray(E, float), (n,)), m)
    G_ = rep(np.broadcast_to(np.asarray(G, float), (n,)), m)
    res = compressive_strength(cat, rep(Fy, m), rep(Lcx, m), rep(Lcy, m), rep(Lcz, m), E_, G_,
                               index=np.tile(candidates, n))
    avail = available_strength(res.Pn, method).reshape(n, m)
    in_scope = res.in_scope.reshape(n, m)
    with np.errstate(divide="ignore", invalid="ignore"):
        util = required[:, None] / avail
    limit = np.broadcast_to(np.asarray(max_utilization, float), (n,))[:, None]
    ok = in_scope & (util <= limit) & np.isfinite(util)
    if allowed is not None:
        ok &= allowed
    weight = np.broadcast_to(cat.weight[candidates], (n, m))
    key_weight = np.where(ok, weight, np.inf)
    order = np.lexsort((-avail, key_weight), axis=-1)[:, :k]
    picked_ok = np.take_along_axis(ok, order, axis=1)
    index = np.where(picked_ok, candidates[order], -1)

    def pick(a: FloatArray) -> FloatArray:
        return np.where(picked_ok, np.take_along_axis(a, order, axis=1), np.nan)

    return Suggestions(index=index, available_strength=pick(avail), utilization=pick(util),
                       weight=pick(weight))


def suggest_for_members(
    m: MemberTable,
    required: FloatArray,
    specs: list[list[str] | None],
    *,
    method: str = "LRFD",
    max_utilization: FloatArray | float = 1.0,
    max_suggestions: int = DEFAULT_MAX_SUGGESTIONS,
    min_depth: float | None = None,
    max_depth: float | None = None,
) -> tuple[Suggestions, IntArray, IntArray]:
    """Suggestions for the members of a :class:`~engine.members.MemberTable` that ask for them.

    Args:
        m: the member table (Fy, unbraced lengths, K factors, E, G are used).
        required: (n,) required strength, kip.
        specs: per member, candidate families / designations, or None for no selection.
        method: "LRFD" or "ASD".
        max_utilization: the reserve margin, one value or one per member (:func:`select`).
        max_suggestions: at most this many per member.
        min_depth: smallest nominal depth of a candidate, in (None: no limit).
        max_depth: largest nominal depth of a candidate, in (None: no limit).

    Returns:
        The suggestions for the selected rows, those rows' member indices, and the indices
        of members that asked but whose demand, yield stress or lengths are unknown.

    Raises:
        ValueError: a candidate matches no catalog shape.
    """
    asked = np.array([bool(s) for s in specs], dtype=bool)
    Lcx, Lcy, Lcz = m.kx * m.lx, m.ky * m.ly, m.kz * m.lz
    # A member whose demand, yield stress or lengths are unknown gets no suggestion: never a
    # section chosen for a length or grade the member was not checked at.
    with np.errstate(invalid="ignore"):
        usable = (np.isfinite(required) & finite_positive(m.Fy) & finite_positive(Lcx)
                  & finite_positive(Lcy) & finite_positive(Lcz) & finite_positive(m.E)
                  & finite_positive(m.G))
    rows = np.flatnonzero(asked & usable)
    skipped = np.flatnonzero(asked & ~usable)
    if len(rows) == 0:
        empty = np.empty((0, 0))
        return Suggestions(np.empty((0, 0), dtype=np.int64), empty, empty, empty), rows, skipped
    per_member = [candidate_indices(specs[i] or [], min_depth=min_depth, max_depth=max_depth)
                  for i in rows]  # specs[i] is a non-empty list for every asking row
    union = np.unique(np.concatenate(per_member))
    allowed = np.zeros((len(rows), len(union)), dtype=bool)
    for r, idx in enumerate(per_member):
        allowed[r, np.searchsorted(union, idx)] = True
    limit = np.broadcast_to(np.asarray(max_utilization, float), (len(m),))[rows]
    sug = select(
        required[rows], m.Fy[rows], Lcx[rows], Lcy[rows], Lcz[rows], union, allowed=allowed,
        method=method, max_utilization=limit, max_suggestions=max_suggestions,
        E=m.E[rows], G=m.G[rows],
    )
    return sug, rows, skipped


#: Catalog family searched for a section whose own family is not a catalog one (parametric
#: profiles): the closest rolled / tube family (common practice, no source).
_SUGGESTION_FAMILIES = {"I": "W", "T": "WT", "U": "C", "RECT": "HSS", "ROUND": "HSS_ROUND"}


def suggestion_family(family: str) -> str:
    """The catalog family to suggest sections from for a section of ``family``.

    Parametric families map to a catalog one (I -> W, T -> WT, U -> C, RECT -> HSS,
    ROUND -> HSS_ROUND); a catalog family (``"W"``, ``"HSS"`` ...) is returned as is.
    """
    return _SUGGESTION_FAMILIES.get(family, family)
