"""Engine throughput: member checks per second over 1,000,000 catalog members.

Prints the full check (every Chapter E limit state, E7, ASCE 7-22 combinations, status) next to
a bare numpy E3-only kernel run in the same process on the same members, and their ratio
(target: full / bare >= 0.33).  Not a test: it asserts nothing and only prints numbers.

    .venv/bin/python tests/benchmarks/bench_engine.py [N]
"""

from __future__ import annotations

import sys
import time

import numpy as np

from engine import catalog
from engine.check import check_members
from engine.members import LOAD_TYPES, MemberTable
from engine.sections import Kind


def bare_e3_kernel(cat, idx, Fy, Lc) -> np.ndarray:
    """φc·Pn by E3 only (both axes, no E4, no E7, no loads): the floor to compare with."""
    A = cat.A[idx]
    r = np.minimum(cat.rx[idx], cat.ry[idx])
    Fe = np.pi**2 * 29000.0 / (Lc / r) ** 2
    ratio = Fy / Fe
    Fcr = np.where(ratio <= 2.25, np.power(0.658, ratio) * Fy, 0.877 * Fe)
    return 0.9 * Fcr * A


def best_of(fn, repeats: int = 3) -> float:
    """Shortest wall time of ``repeats`` calls."""
    best = np.inf
    for _ in range(repeats):
        t = time.perf_counter()
        fn()
        best = min(best, time.perf_counter() - t)
    return best


def main(n: int = 1_000_000) -> None:
    rng = np.random.default_rng(7)
    cat = catalog.load_catalog()
    usable = np.flatnonzero(cat.kind != Kind.UNSUPPORTED)
    idx = rng.choice(usable, n)
    Fy = rng.choice([36.0, 46.0, 50.0], n)
    length = rng.uniform(96.0, 360.0, n)
    loads = np.full((n, len(LOAD_TYPES)), np.nan)
    loads[:, 0] = rng.uniform(10, 400, n)  # D
    loads[:, 1] = rng.uniform(0, 300, n)  # L
    loads[:, 3] = rng.uniform(0, 60, n)  # S
    loads[:, 5] = rng.uniform(-50, 50, n)  # W
    members = MemberTable.build(
        ids=np.arange(n).astype(str).tolist(), sections=cat, section_index=idx, Fy=Fy,
        length=length, loads=loads,
    )

    t_bare = best_of(lambda: bare_e3_kernel(cat, idx, Fy, length))
    t_full = best_of(lambda: check_members(members, "LRFD"), repeats=2)
    full_rate = n / t_full
    bare_rate = n / t_bare
    print(f"members: {n:,}")
    print(f"bare E3-only kernel: {bare_rate:,.0f} members/s ({t_bare:.3f} s)")
    print(f"full member check:   {full_rate:,.0f} members/s ({t_full:.3f} s)")
    print(f"ratio full/bare: {full_rate / bare_rate:.2f} (target >= 0.33)")


if __name__ == "__main__":
    main(int(sys.argv[1]) if len(sys.argv) > 1 else 1_000_000)
