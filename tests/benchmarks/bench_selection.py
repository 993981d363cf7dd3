"""Selection throughput: 2,000 members × the whole W catalog in one array computation.

Prints the wall time of :func:`engine.selection.select` (best of 5) and, for scale, the time
of checking the same 2,000 × m member/shape pairs with the compression engine alone (the
floor of the selection's work), with their ratio.  Not a test: it only prints numbers.

    .venv/bin/python tests/benchmarks/bench_selection.py [N_MEMBERS]
"""

from __future__ import annotations

import sys

import numpy as np
from timing import best_of

from stanchion.engine import catalog
from stanchion.engine.compression import compressive_strength
from stanchion.engine.selection import candidate_indices, select


def main(n: int = 2000) -> None:
    rng = np.random.default_rng(3)
    cand = candidate_indices(["W"])
    m = len(cand)
    required = rng.uniform(50, 2000, n)
    Fy = np.full(n, 50.0)
    L = rng.uniform(96, 360, n)
    t_sel = best_of(lambda: select(required, Fy, L, L, L, cand, max_suggestions=5))
    cat = catalog.load_catalog()
    idx = np.tile(cand, n)
    rep = np.repeat
    t_floor = best_of(lambda: compressive_strength(cat, rep(Fy, m), rep(L, m), rep(L, m),
                                                   rep(L, m), index=idx))
    print(f"members: {n:,} × W shapes: {m} = {n * m:,} pairs")
    print(f"select (lightest 5 per member): {t_sel:.3f} s")
    print(f"compression engine on the same pairs: {t_floor:.3f} s "
          f"(selection / engine = {t_sel / t_floor:.2f})")
    print("target: well under one second for 2,000 members")


if __name__ == "__main__":
    main(int(sys.argv[1]) if len(sys.argv) > 1 else 2000)
