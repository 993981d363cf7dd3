"""Gravity load takedown: service axial loads of columns from slab loads, down the stack.

Inputs in engine units (inch, kip, ksi; column weights in lb/ft).  Entry point:
:func:`takedown` over :class:`Level` objects, one per slab level, each with the columns whose
tops carry it.  Rules (docs/design.md §5 "Load takedown"):

* **Tributary areas** per level: :mod:`stanchion.engine.tributary` (Voronoi cells of the
  columns clipped to the slab region, openings subtracted; position for KLL).
* **Pressures** per level: superimposed D, L, Lr, S, plus the slab self-weight (each slab's
  modelled thickness × the density, over the part of the slab in the cell) added to D.
* **Stack**: a column carries its own level and everything the column above it carries.  The
  column above is the column of the nearest higher level having one within
  ``match_tolerance`` (12 in) in plan whose base is not above the level below its own (base =
  its level's elevation less its length, ``elevation_tolerance`` 12 in): a column reaching
  down past a level (double height) is still above; a column standing on a higher floor is a
  transfer.  A column with no column below, whose base is at or above some lower level,
  stands on that floor (a transfer): the columns of that floor whose cells hold its position
  get a reason (its load is not taken down to them; nothing is guessed) and it gets a note.
  Those tolerances are our choice (common practice, no source).
* **Self-weight** of columns: weight (lb/ft) × length of the column and of every column above
  it; an unknown weight or length makes the load of every column beneath unknown (a reason).
  :func:`steel_weight` gives lb/ft from an area for sections without a catalog weight.
* **Live load reduction** (:mod:`stanchion.engine.live_load_reduction`): on the floors whose L
  may be reduced (L > 0, reduction allowed for the level, use not ``assembly``), KLL·AT is the
  sum of each floor's KLL × AT and the floors counted are those floors (conservative); normal
  floors by §4.7.2, heavy (L > 100 psf or use ``heavy``) and garage floors by §4.7.3/§4.7.4;
  the others at full L.  Lr and S are never reduced here (§4.8 is not applied).
"""

from __future__ import annotations

from collections.abc import Sequence
from dataclasses import dataclass, field
from typing import Any, Literal

import numpy as np
import shapely

from stanchion.engine import live_load_reduction as llr
from stanchion.engine.arrays import BoolArray, FloatArray, IntArray, ObjectArray
from stanchion.engine.members import LOAD_TYPES
from stanchion.engine.tributary import (
    CANTILEVER_TOLERANCE,
    TOLERANCE,
    Tributary,
    cell_volumes,
    slab_region,
    tributary_areas,
)

#: Steel density, lb/ft³ (AISC Manual, common practice) -> weight lb/ft = A (in²) × 490 / 144.
STEEL_DENSITY_PCF = 490.0
_PSF = 1.0 / 144_000.0  # ksi per psf
_FT2 = 144.0  # in² per ft²
_M2 = 0.0254**-2  # in² per m²


def steel_weight(A: FloatArray | float) -> FloatArray:
    """Weight of a steel member per length, lb/ft, from its area in in² (490 lb/ft³)."""
    return np.asarray(A, dtype=float) * STEEL_DENSITY_PCF / 144.0


@dataclass(frozen=True)
class LevelLoads:
    """Loads of one slab level.

    Attributes:
        D: superimposed dead load, ksi.
        L: floor live load Lo, ksi.
        Lr: roof live load, ksi.
        S: snow load, ksi.
        slab_density: unit weight of the slabs, kip/in³ (0: self-weight included in D).
        live_load_reduction: §4.7 reduction allowed on this level.
        use: ``normal``, ``heavy``, ``garage`` or ``assembly`` (§4.7.3-§4.7.5).
    """

    D: float = 0.0
    L: float = 0.0
    Lr: float = 0.0
    S: float = 0.0
    slab_density: float = 0.0
    live_load_reduction: bool = False
    use: str = "normal"


@dataclass(frozen=True)
class SlabPiece:
    """One modelled slab: plan outline (shapely polygon, holes = openings, in), thickness in."""

    outline: Any
    thickness: float


@dataclass(frozen=True)
class Level:
    """A slab level and the columns whose tops carry it.

    Attributes:
        name: the storey's name.
        elevation: elevation of the level, in (levels are sorted by it).
        slabs: the slabs of the level.
        ids: the columns' ids.
        xy: (n, 2) plan positions of the columns, in.
        weight: (n,) weight of each column, lb/ft (NaN unknown).
        length: (n,) length of each column, in (NaN unknown).
        loads: the level's loads.
        openings: further openings through the slabs (shapely polygons), in.
        problems: slabs of the level that could not be read, each naming the slab and why:
            every column of the level, and every column beneath them, gets a reason (the
            load of an unknown slab is never guessed).
    """

    name: str
    elevation: float
    slabs: Sequence[SlabPiece]
    ids: Sequence[str]
    xy: FloatArray
    weight: FloatArray
    length: FloatArray
    loads: LevelLoads
    openings: Sequence[Any] = ()
    problems: Sequence[str] = ()


@dataclass(frozen=True)
class TakedownOptions:
    """Tolerances (in) and the area unit of messages.

    Attributes:
        tolerance: columns this close to a slab are on it (:mod:`engine.tributary`).
        cantilever_tolerance: a free slab edge farther than this from a column is a cantilever.
        match_tolerance: plan distance within which a column stands on the one below.
        elevation_tolerance: a column base this close to a level stands on it.
        units: ``"US"`` (ft², psf in messages) or ``"SI"`` (m²).
    """

    tolerance: float = TOLERANCE
    cantilever_tolerance: float = CANTILEVER_TOLERANCE
    match_tolerance: float = 12.0
    elevation_tolerance: float = 12.0
    units: Literal["US", "SI"] = "US"


@dataclass(frozen=True)
class Takedown:
    """Service axial loads of every column of every level (levels by rising elevation).

    Attributes:
        ids: column ids, level by level.
        level: index of each column's level in ``level_names``.
        level_names: the levels' names, by rising elevation.
        loads: (n, len(LOAD_TYPES)) kip, compression positive; D, L (reduced), Lr, S given,
            R, W, E NaN.  NaN rows where ``reason`` is set.
        area: (n, len(level_names)) tributary area carried from each level, in².
        area_total: total tributary area carried, in².
        floors: number of levels the column carries some slab of (area > 0).
        KLL: influence-area weighted KLL of the floors whose L is reduced (NaN for none).
        llr_factor: L / Lo of the column (1 where nothing is reduced, NaN where L = 0).
        above: index of the column above, -1 for none.
        reason: None, or why the column's loads are not known.
        messages: per-column notes.
        notes: run-wide notes.
        cells: each column's tributary cell on its own level (shapely, in; an empty
            polygon for none), for drawing; None when not kept.
    """

    ids: ObjectArray
    level: IntArray
    level_names: tuple[str, ...]
    loads: FloatArray
    area: FloatArray
    area_total: FloatArray
    floors: IntArray
    KLL: FloatArray
    llr_factor: FloatArray
    above: IntArray
    reason: ObjectArray
    messages: list[list[str]]
    notes: list[str] = field(default_factory=list)
    cells: ObjectArray | None = None


@dataclass
class _Own:
    """What each column takes from its own level (one row per column), summed down the stack."""

    D: FloatArray
    Lr: FloatArray
    S: FloatArray
    L_normal: FloatArray  # Lo·AT of normal floors whose L is reduced, kip
    L_limited: FloatArray  # Lo·AT of heavy and garage floors whose L may be reduced, kip
    L_full: FloatArray  # Lo·AT never reduced, kip
    AT_red: FloatArray  # AT of the floors whose L is reduced, in²
    KAT_red: FloatArray  # KLL·AT of those floors, in²
    n_red: FloatArray  # number of those floors
    floors: FloatArray
    unknown: BoolArray  # self-weight unknown
    orphan: FloatArray  # area on slab pieces with no column, in²

    def add(self, idx: IntArray, src: IntArray) -> None:
        """Add the rows ``src`` to the rows ``idx`` (``src`` -1: nothing)."""
        has = src >= 0
        for name, arr in vars(self).items():
            if name == "unknown":
                arr[idx[has]] |= arr[src[has]]
            else:
                arr[idx[has]] += arr[src[has]]


def _level_rows(level: Level, trib: Tributary, opts: TakedownOptions) -> _Own:
    """The rows of one level's columns."""
    p = level.loads
    n = len(level.ids)
    AT = trib.area
    if len(level.slabs) == 1:  # every cell lies within the one slab
        volume = AT * float(level.slabs[0].thickness)
    else:
        volume = cell_volumes(trib.cells, [s.outline for s in level.slabs],
                              np.array([s.thickness for s in level.slabs], dtype=float))
    own_weight = np.asarray(level.weight, float) / 12_000.0 * np.asarray(level.length, float)
    D = p.D * AT + p.slab_density * volume + np.nan_to_num(own_weight)
    Lo_AT = p.L * AT
    if p.use not in llr.USE_CODES:
        raise ValueError(f"level {level.name}: use {p.use!r} is none of {sorted(llr.USE_CODES)}")
    use = llr.USE_CODES[p.use]
    if p.L > llr.HEAVY_LIVE_LOAD_PSF * _PSF and use == llr.NORMAL:
        use = llr.HEAVY
    reducible = p.live_load_reduction and p.L > 0 and use != llr.ASSEMBLY
    zero = np.zeros(n)
    KLL = llr.K_LL(trib.position, trib.cantilever)
    carries = AT > 0
    return _Own(
        D=D, Lr=p.Lr * AT, S=p.S * AT,
        L_normal=Lo_AT if reducible and use == llr.NORMAL else zero.copy(),
        L_limited=Lo_AT if reducible and use != llr.NORMAL else zero.copy(),
        L_full=zero.copy() if reducible else Lo_AT,
        AT_red=AT.copy() if reducible else zero.copy(),
        KAT_red=KLL * AT if reducible else zero.copy(),
        n_red=carries.astype(float) if reducible else zero.copy(),
        floors=carries.astype(float),
        unknown=~np.isfinite(own_weight),
        orphan=trib.orphan_area.copy(),
    )


def _concat(rows: Sequence[_Own]) -> _Own:
    return _Own(**{k: np.concatenate([vars(r)[k] for r in rows]) for k in vars(rows[0])})


def _nearest(xy: FloatArray, candidates: FloatArray, tol: float) -> IntArray:
    """Index of the nearest candidate within ``tol`` of each point, -1 for none."""
    out = np.full(len(xy), -1, dtype=np.int64)
    mine = np.flatnonzero(np.isfinite(xy).all(axis=1))
    theirs = np.flatnonzero(np.isfinite(candidates).all(axis=1))
    if len(mine) == 0 or len(theirs) == 0:
        return out
    tree = shapely.STRtree(shapely.points(candidates[theirs]))
    (i, j) = tree.query_nearest(shapely.points(xy[mine]), max_distance=tol, all_matches=False)
    out[mine[i]] = theirs[j]
    return out


def _stack(levels: Sequence[Level], start: IntArray, opts: TakedownOptions
           ) -> tuple[IntArray, BoolArray]:
    """Index of the column above each column (-1 none), and which columns are matched."""
    n = int(start[-1])
    above = np.full(n, -1, dtype=np.int64)
    matched = np.zeros(n, dtype=bool)
    elev = np.array([lv.elevation for lv in levels])
    for i, lv in enumerate(levels):
        todo = np.arange(len(lv.ids))
        for k in range(i + 1, len(levels)):
            if len(todo) == 0:
                break
            up = levels[k]
            base = up.elevation - np.asarray(up.length, float)
            # it must reach down to level i (a column standing on a floor between is a
            # transfer); an unknown length is taken as one storey high
            allowed = np.where(np.isfinite(base), base <= elev[i] + opts.elevation_tolerance,
                               k == i + 1)
            cand = np.flatnonzero(allowed)
            hit = _nearest(np.asarray(lv.xy, float)[todo], np.asarray(up.xy, float)[cand],
                           opts.match_tolerance)
            got = hit >= 0
            above[start[i] + todo[got]] = start[k] + cand[hit[got]]
            matched[start[k] + cand[hit[got]]] = True
            todo = todo[~got]
            # a column of level k at this position stops the search even if it stands higher
            blocked = _nearest(np.asarray(lv.xy, float)[todo], np.asarray(up.xy, float),
                               opts.match_tolerance) >= 0
            todo = todo[~blocked]
    return above, matched


def _transfers(levels: Sequence[Level], tribs: Sequence[Tributary], start: IntArray,
               matched: BoolArray, opts: TakedownOptions) -> list[tuple[int, int]]:
    """(column standing on a floor, column of that floor whose cell holds it) pairs."""
    pairs: list[tuple[int, int]] = []
    elev = np.array([lv.elevation for lv in levels])
    for k, lv in enumerate(levels):
        if k == 0:
            continue
        base = lv.elevation - np.asarray(lv.length, float)
        for j in np.flatnonzero(~matched[start[k]:start[k + 1]]):
            below = np.flatnonzero(elev[:k] <= (base[j] if np.isfinite(base[j]) else elev[k - 1])
                                   + opts.elevation_tolerance)
            if len(below) == 0:
                continue  # stands on the foundation
            m = int(below[-1])
            pt = shapely.points(np.asarray(lv.xy, float)[j])
            if not np.isfinite(np.asarray(lv.xy, float)[j]).all():
                continue  # no position: the column has a reason of its own
            holds = np.flatnonzero(shapely.intersects(tribs[m].cells, pt))
            pairs.extend((int(start[k] + j), int(start[m] + h)) for h in holds)
            if len(holds) == 0:
                pairs.append((int(start[k] + j), -1))
    return pairs


def takedown(levels: Sequence[Level], options: TakedownOptions | None = None) -> Takedown:
    """Service axial loads of every column by a gravity load takedown (module docstring).

    Args:
        levels: the slab levels with their columns and loads (any order).
        options: tolerances and message units.

    Returns:
        The :class:`Takedown`, levels by rising elevation, columns in input order within each.
    """
    opts = options or TakedownOptions()
    levels = sorted(levels, key=lambda lv: lv.elevation)
    counts = [len(lv.ids) for lv in levels]
    start = np.r_[0, np.cumsum(counts)].astype(np.int64)
    n, nl = int(start[-1]), len(levels)
    tribs = [tributary_areas(np.asarray(lv.xy, float).reshape(-1, 2),
                             slab_region([s.outline for s in lv.slabs], lv.openings),
                             tolerance=opts.tolerance,
                             cantilever_tolerance=opts.cantilever_tolerance) for lv in levels]
    ids = np.array([i for lv in levels for i in lv.ids] + [None], dtype=object)[:n]
    level = np.repeat(np.arange(nl), counts).astype(np.int64)
    messages: list[list[str]] = [[] for _ in range(n)]
    reason = np.full(n, None, dtype=object)
    notes = [f"{lv.name}: {note}" for lv, t in zip(levels, tribs, strict=True) for note in t.notes]
    if n == 0:
        empty = np.zeros(0)
        return Takedown(ids, level, tuple(lv.name for lv in levels),
                        np.zeros((0, len(LOAD_TYPES))), np.zeros((0, nl)), empty,
                        np.zeros(0, np.int64), empty, empty, np.zeros(0, np.int64), reason,
                        messages, notes)
    own = _concat([_level_rows(lv, t, opts) for lv, t in zip(levels, tribs, strict=True)])
    area = np.zeros((n, nl))
    area[np.arange(n), level] = np.concatenate([t.area for t in tribs])
    above, matched = _stack(levels, start, opts)
    for i in range(nl - 1, -1, -1):  # top down: a column adds what the column above carries
        idx = np.arange(start[i], start[i + 1])
        own.add(idx, above[idx])
        has = above[idx] >= 0
        area[idx[has]] += area[above[idx[has]]]
    for j, t in enumerate(tribs):
        for c in np.flatnonzero(t.reason != None):  # noqa: E711 - object array
            messages[start[j] + c].append(f"carries nothing of {levels[j].name}: {t.reason[c]}")
    for up, down in _transfers(levels, tribs, start, matched, opts):
        messages[up].append("stands on a floor with no column below it (a transfer): its "
                            "load is not taken further down")
        if down >= 0:
            reason[down] = (f"supports column {ids[up]} above, which has no column below it "
                            "(a transfer): its load is not taken down; give the loads")
    for j, lv in enumerate(levels):
        if lv.problems:
            more = f" (and {len(lv.problems) - 1} more)" if len(lv.problems) > 1 else ""
            why = (f"a slab of {lv.name} could not be read, {lv.problems[0]}{more}: its load "
                   "is not taken down; give the loads")
            for row in range(int(start[j]), int(start[j + 1])):
                reason[row] = reason[row] or why
    nowhere = ~np.isfinite(np.concatenate([np.asarray(lv.xy, float).reshape(-1, 2)
                                           for lv in levels])).all(axis=1)
    reason[nowhere & (reason == None)] = "no plan position: no takedown"  # noqa: E711
    missing = reason != None  # noqa: E711 - object array
    for i in range(nl - 1, -1, -1):  # a transfer's load is missing all the way down
        idx = np.arange(start[i], start[i + 1])
        inherit = idx[(above[idx] >= 0) & ~missing[idx]]
        inherit = inherit[missing[above[inherit]]]
        missing[inherit] = True
        reason[inherit] = [f"the column above ({ids[above[c]]}) has no takedown load: "
                           f"{reason[above[c]]}" for c in inherit]
    L, factor, KLL = _live_load(own)
    loads = np.full((n, len(LOAD_TYPES)), np.nan)
    loads[:, LOAD_TYPES.index("D")] = own.D
    loads[:, LOAD_TYPES.index("L")] = L
    loads[:, LOAD_TYPES.index("Lr")] = own.Lr
    loads[:, LOAD_TYPES.index("S")] = own.S
    unknown = np.flatnonzero(own.unknown & (reason == None))  # noqa: E711 - object array
    reason[unknown] = ("self-weight unknown: this column or one above it has no weight or "
                       "length")
    loads[reason != None] = np.nan  # noqa: E711 - object array
    _messages(messages, own, factor, KLL, opts)
    return Takedown(ids, level, tuple(lv.name for lv in levels), loads, area, area.sum(axis=1),
                    own.floors.astype(np.int64), KLL, factor, above, reason, messages, notes,
                    cells=np.concatenate([t.cells for t in tribs]))


def _live_load(own: _Own) -> tuple[FloatArray, FloatArray, FloatArray]:
    """Reduced L (kip), L / Lo and the effective KLL of every column."""
    KAT_ft2 = own.KAT_red / _FT2
    n_red = own.n_red.astype(np.int64)
    f_normal = llr.reduction_factor(KAT_ft2, n_red, llr.NORMAL)
    f_limited = llr.reduction_factor(KAT_ft2, n_red, llr.HEAVY)
    L = own.L_normal * f_normal + own.L_limited * f_limited + own.L_full
    Lo = own.L_normal + own.L_limited + own.L_full
    with np.errstate(invalid="ignore", divide="ignore"):
        factor = np.where(Lo > 0, L / Lo, np.nan)
        KLL = np.where(own.AT_red > 0, own.KAT_red / own.AT_red, np.nan)
    return L, factor, KLL


def _messages(messages: list[list[str]], own: _Own, factor: FloatArray, KLL: FloatArray,
              opts: TakedownOptions) -> None:
    """Per-column notes on the live load reduction, Lr and orphan areas."""
    unit, per = ("ft²", _FT2) if opts.units == "US" else ("m²", _M2)
    for m in range(len(messages)):
        n_red = int(own.n_red[m])
        if own.L_normal[m] + own.L_limited[m] > 0:
            floors = f"{n_red} floor" + ("s" if n_red != 1 else "")
            at = f"AT = {own.AT_red[m] / per:,.0f} {unit} over {floors}"
            if factor[m] < 1.0:
                messages[m].append(f"L reduced by ASCE 7-22 §4.7: factor {factor[m]:.2f} "
                                   f"(KLL = {KLL[m]:g}, {at})")
            elif own.KAT_red[m] / _FT2 < llr.KLL_AT_MIN_FT2:
                messages[m].append(f"L not reduced: KLL·AT below 400 ft² (37.16 m²), ASCE "
                                   f"7-22 §4.7.2 (KLL = {KLL[m]:g}, {at})")
            else:
                messages[m].append("L not reduced: heavy live load or garage under one floor "
                                   f"(ASCE 7-22 §4.7.3, §4.7.4; KLL = {KLL[m]:g}, {at})")
        if own.L_full[m] > 0:
            messages[m].append("L of some floors not reduced (reduction not allowed there, or "
                               "assembly use, ASCE 7-22 §4.7.5)")
        if own.Lr[m] > 0:
            messages[m].append("Lr not reduced (ASCE 7-22 §4.8 not applied)")
        if own.orphan[m] > 0:
            messages[m].append(f"tributary area includes {own.orphan[m] / per:,.1f} {unit} of "
                               "slab with no column on it")
