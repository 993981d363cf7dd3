"""Engine throughput: member checks per second over 1,000,000 catalog members.

Prints, for the same random catalog members in the same process:
- a bare numpy E3-only kernel (both axes, separate Lcx and Lcy, φcPn): the floor;
- the Chapter E capacity engine (E3 both axes, E4-2 / E4-3, E7 effective area, limit-state
  codes, slenderness) plus utilization and status — the ratio to the floor is the target
  (>= 0.33);
- the whole ``check_members`` pipeline (validity reasons, ASCE 7-22 combinations for every
  member, status, messages), for information.
Not a test: it asserts nothing and only prints numbers.

    .venv/bin/python tests/benchmarks/bench_engine.py [N]
"""

from __future__ import annotations

import sys

import numpy as np
from timing import best_of

from stanchion.engine import catalog
from stanchion.engine.check import check_members
from stanchion.engine.compression import available_strength, compressive_strength
from stanchion.engine.members import LOAD_TYPES, MemberTable
from stanchion.engine.sections import Kind


def bare_e3_kernel(cat, idx, Fy, Lcx, Lcy) -> np.ndarray:
    """φc·Pn by E3 only (both axes, no E4, no E7, no loads): the floor to compare with."""
    A = cat.A[idx]
    Lc_r = np.maximum(Lcx / cat.rx[idx], Lcy / cat.ry[idx])
    Fe = np.pi**2 * 29000.0 / (Lc_r * Lc_r)
    ratio = Fy / Fe
    Fcr = np.where(ratio <= 2.25, np.power(0.658, ratio) * Fy, 0.877 * Fe)
    return 0.9 * Fcr * A


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

    required = rng.uniform(10, 800, n)

    def chapter_e_check():
        r = compressive_strength(cat, Fy, length, length, length, index=idx)
        util = required / available_strength(r.Pn, "LRFD")
        return np.where(util <= 1.0, 1, 0)

    t_bare = best_of(lambda: bare_e3_kernel(cat, idx, Fy, length, length), repeats=7)
    t_engine = best_of(chapter_e_check, repeats=7)
    t_full = best_of(lambda: check_members(members, "LRFD"), repeats=2)
    print(f"members: {n:,}")
    print(f"bare E3-only kernel:          {n / t_bare:>13,.0f} members/s ({t_bare:.4f} s)")
    print(f"Chapter E check (E3+E4+E7):   {n / t_engine:>13,.0f} members/s ({t_engine:.4f} s)")
    print(f"ratio Chapter E / bare: {t_bare / t_engine:.2f} (target >= 0.33)")
    print(f"full check_members pipeline:  {n / t_full:>13,.0f} members/s ({t_full:.4f} s)"
          f"  ratio to bare {t_bare / t_full:.3f}")


if __name__ == "__main__":
    main(int(sys.argv[1]) if len(sys.argv) > 1 else 1_000_000)
