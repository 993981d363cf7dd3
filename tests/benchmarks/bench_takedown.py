"""Load takedown throughput: tributary areas of 2,000 columns on one storey, and a stack.

Prints the wall time (best of 5) of :func:`engine.tributary.tributary_areas` for 2,000
columns on a 45 x 45 grid of 30 ft bays with an opening, and of :func:`engine.takedown.takedown`
over 10 such storeys (20,000 columns).  Not a test: it only prints numbers.

    .venv/bin/python tests/benchmarks/bench_takedown.py [N_COLUMNS] [N_STOREYS]
"""

from __future__ import annotations

import sys

import numpy as np
import shapely
from timing import best_of

from stanchion.engine.takedown import Level, LevelLoads, SlabPiece, takedown
from stanchion.engine.tributary import slab_region, tributary_areas


def main(n: int = 2000, storeys: int = 10) -> None:
    side = int(np.ceil(np.sqrt(n)))
    lines = np.arange(side) * 360.0  # 30 ft bays, inches
    rng = np.random.default_rng(5)
    xy = np.array([(x, y) for y in lines for x in lines])[:n] + rng.normal(0, 2, (n, 2))
    slab = shapely.box(-60, -60, lines[-1] + 60, lines[-1] + 60)
    opening = shapely.box(1000, 1000, 1500, 1400)
    region = slab_region([slab], [opening])
    t_one = best_of(lambda: tributary_areas(xy, region))
    loads = LevelLoads(D=15 / 144_000, L=50 / 144_000, slab_density=0.150 / 1728,
                       live_load_reduction=True)
    levels = [Level(f"L{k}", k * 168.0, [SlabPiece(slab, 8.0)], [f"L{k}-{i}" for i in range(n)],
                    xy, np.full(n, 65.0), np.full(n, 168.0), loads, openings=[opening])
              for k in range(1, storeys + 1)]
    t_stack = best_of(lambda: takedown(levels))
    print(f"tributary areas, {n} columns on one storey: {t_one * 1e3:.1f} ms")
    print(f"takedown, {storeys} storeys x {n} columns: {t_stack:.2f} s "
          f"({n * storeys / t_stack:,.0f} columns/s)")


if __name__ == "__main__":
    main(*(int(a) for a in sys.argv[1:3]))
