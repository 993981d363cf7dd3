"""Profile outlines: the cost of a distinct outline, of a repeated one, and of reading one.

Prints (1) the import of sectionproperties and the first analysis of a process, (2) the
sectionproperties analysis and family recognition of each of six distinct rolled-shape
outlines (I, sloped-flange I, channel, tee, rectangular and round tube; mesh per
engine.outlines.MESH_FACTOR), (3) the time of a cache hit (the same outline again, placed
elsewhere) and (4) the time ifc_bridge.outlines.outline_of takes to read an I of polylines
and trimmed-circle fillets from an in-memory IFC4 model.  Not a test: it only prints numbers.

    .venv/bin/python tests/benchmarks/bench_outlines.py
"""

from __future__ import annotations

import math
import time

import ifcopenshell
from shapely.geometry import Polygon, box
from timing import best_of

from stanchion.engine import outlines as ol
from stanchion.ifc_bridge.outlines import outline_of


def _closed(sharp: Polygon, r: float) -> list[tuple[float, float]]:
    """Outer ring of a sharp shape with its concave corners filleted by r."""
    return list(sharp.buffer(r, quad_segs=16).buffer(-r, quad_segs=16).exterior.coords)[:-1]


def _i(d: float, bf: float, tw: float, tf: float, slope: float = 0.0) -> Polygon:
    o = (bf - tw) / 2
    a, b = d / 2 - tf - slope * o / 2, d / 2 - tf + slope * o / 2
    right = [(bf / 2, -d / 2), (bf / 2, -b), (tw / 2, -a), (tw / 2, a), (bf / 2, b),
             (bf / 2, d / 2)]
    return Polygon(right + [(-x, y) for x, y in reversed(right)])


def _ring(D: float, n: int = 100) -> list[tuple[float, float]]:
    return [(D / 2 * math.cos(2 * math.pi * k / n), D / 2 * math.sin(2 * math.pi * k / n))
            for k in range(n)]


def _outlines() -> dict[str, ol.Outline]:
    tube = box(-3, -4, 3, 4).buffer(-0.8).buffer(0.8)
    void = box(-2.6, -3.6, 2.6, 3.6).buffer(-0.4).buffer(0.4)
    tee = box(-5, -0.6, 5, 0).union(box(-0.2, -6, 0.2, 0))
    channel = box(0, -6, 0.4, 6).union(box(0, 5.4, 3.5, 6)).union(box(0, -6, 3.5, -5.4))
    return {
        "W-like I 14x14.5": ol.Outline.of(_closed(_i(14.0, 14.5, 0.44, 0.71), 0.6)),
        "S-like I, 1:6 flanges": ol.Outline.of(_closed(_i(12.0, 5.48, 0.687, 0.659, 1 / 6),
                                                       0.58)),
        "channel 12x3.5": ol.Outline.of(_closed(channel, 0.5)),
        "tee 6x10": ol.Outline.of(_closed(tee, 0.5)),
        "tube 8x6x0.4": ol.Outline.of(list(tube.exterior.coords)[:-1],
                                      [list(void.exterior.coords)[:-1]]),
        "round tube 10x0.4": ol.Outline.of(_ring(10.0), [_ring(9.2)]),
    }


def _ifc_profile() -> tuple[ifcopenshell.file, object]:
    """An IFC4 I profile (mm): polylines and four trimmed-circle fillets in radians."""
    m = ifcopenshell.file(schema="IFC4")
    d, bf, tw, tf, r = 300.0, 300.0, 11.0, 19.0, 27.0
    h, w, s, a = d / 2, bf / 2, tw / 2, d / 2 - tf

    def pt(x: float, y: float) -> object:
        return m.createIfcCartesianPoint((x, y))

    def arc(cx: float, cy: float, a1: float, a2: float) -> object:
        place = m.createIfcAxis2Placement2D(pt(cx, cy), None)
        return m.createIfcTrimmedCurve(
            m.createIfcCircle(place, r), [m.createIfcParameterValue(math.radians(a1))],
            [m.createIfcParameterValue(math.radians(a2))], True, "PARAMETER")

    parts = [
        (m.createIfcPolyline([pt(s, -a + r), pt(s, a - r)]), True),
        (arc(s + r, a - r, 90, 180), False),
        (m.createIfcPolyline([pt(x, y) for x, y in ((s + r, a), (w, a), (w, h), (-w, h),
                                                    (-w, a), (-s - r, a))]), True),
        (arc(-s - r, a - r, 0, 90), True),
        (m.createIfcPolyline([pt(-s, a - r), pt(-s, -a + r)]), True),
        (arc(-s - r, -a + r, 270, 360), False),
        (m.createIfcPolyline([pt(x, y) for x, y in ((-s - r, -a), (-w, -a), (-w, -h), (w, -h),
                                                    (w, -a), (s + r, -a))]), True),
        (arc(s + r, -a + r, 180, 270), False),
    ]
    segs = [m.createIfcCompositeCurveSegment("CONTINUOUS", same, c) for c, same in parts]
    curve = m.createIfcCompositeCurve(segs, False)
    return m, m.createIfcArbitraryClosedProfileDef("AREA", "HEB 300", curve)


def main() -> None:
    outlines = _outlines()
    start = time.perf_counter()
    first = ol.outline_section(next(iter(outlines.values())))
    print(f"first outline of the process (imports sectionproperties): "
          f"{time.perf_counter() - start:.2f} s")
    assert first.table is not None, first.reason
    for name, outline in outlines.items():
        ol.cache_clear()
        start = time.perf_counter()
        result = ol.outline_section(outline, name, "ASTM A1085")
        took = time.perf_counter() - start
        elements = result.analysis.elements if result.analysis else 0
        print(f"{name:24} {result.family or result.reason:10} {elements:5} elements "
              f"{took:.2f} s")
    outline = outlines["W-like I 14x14.5"]
    moved = ol.Outline(outline.outer + 100.0)
    ol.outline_section(outline)
    hit = best_of(lambda: [ol.outline_section(moved, "W") for _ in range(1000)]) / 1000
    print(f"cache hit (same outline elsewhere): {hit * 1e6:.0f} µs")
    model, profile = _ifc_profile()
    read = best_of(lambda: [outline_of(model, profile, 1.0) for _ in range(100)]) / 100
    print(f"outline_of, I of 4 polylines + 4 trimmed circles: {read * 1e3:.2f} ms")


if __name__ == "__main__":
    main()
