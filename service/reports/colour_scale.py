"""The utilization colour scale of the HTML report's pictures (docs/design.md §3).

A perceptually uniform sequential scale: matplotlib's *viridis* sampled at 17 even stops
(matplotlib 3.11, ``colormaps["viridis"](t)`` rounded to 8-bit sRGB; the test compares the
table with matplotlib when it is installed), run from light to dark so that the more a
column is used the darker it is drawn.  Utilization 0 is the light end, 1.0 the dark end;
beyond 1.0 the colour stays at the dark end and the status is told by the mark's shape.
Between stops the colour is interpolated linearly in sRGB.
"""

from __future__ import annotations

import math

#: viridis at t = 1, 15/16, ..., 0: utilization 0 first (light), 1.0 last (dark).
STOPS: tuple[str, ...] = (
    "#fde725", "#d8e219", "#addc30", "#84d44b", "#5ec962", "#3fbc73", "#28ae80", "#1fa088",
    "#21918c", "#26828e", "#2c728e", "#33638d", "#3b528b", "#424086", "#472d7b", "#48186a",
    "#440154",
)
#: The utilization at the dark end of the scale.
TOP = 1.0
#: Marks and cells of members without a utilization (not checked, skipped): outside the
#: scale, a neutral grey the scale never takes.
NO_VALUE = "#c8c8c8"


def _rgb(hex_colour: str) -> tuple[int, int, int]:
    return (int(hex_colour[1:3], 16), int(hex_colour[3:5], 16), int(hex_colour[5:7], 16))


def colour_of(utilization: float | None) -> str:
    """The scale's colour of a utilization (``#rrggbb``); :data:`NO_VALUE` without one.

    Args:
        utilization: required over available strength; clipped to [0, :data:`TOP`].
    """
    if utilization is None or not math.isfinite(utilization):
        return NO_VALUE
    t = min(max(utilization / TOP, 0.0), 1.0) * (len(STOPS) - 1)
    i = min(int(t), len(STOPS) - 2)
    f = t - i
    a, b = _rgb(STOPS[i]), _rgb(STOPS[i + 1])
    r, g, bl = (round(x + (y - x) * f) for x, y in zip(a, b, strict=True))
    return f"#{r:02x}{g:02x}{bl:02x}"


def text_colour_on(background: str) -> str:
    """Black or white, whichever reads better on ``background`` (WCAG 2.1 relative luminance).

    Args:
        background: ``#rrggbb``.
    """
    def channel(c: int) -> float:
        s = c / 255.0
        return s / 12.92 if s <= 0.04045 else ((s + 0.055) / 1.055) ** 2.4

    r, g, b = (channel(c) for c in _rgb(background))
    luminance = 0.2126 * r + 0.7152 * g + 0.0722 * b
    # contrast with black (L + 0.05)/0.05 against white 1.05/(L + 0.05): equal at L ≈ 0.179
    return "#000000" if luminance > 0.179 else "#ffffff"
