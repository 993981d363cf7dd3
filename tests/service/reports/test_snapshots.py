"""Snapshots of a column's place on its storey (service/reports/snapshots.py)."""

from __future__ import annotations

import io

import numpy as np
from PIL import Image

from stanchion.service.reports.snapshots import DPI, PNG_SIGNATURE, SIZE_IN, StoreyDots


def _report() -> dict:
    rows = [{"id": f"c{i}", "tag": f"T{i}", "storey": "L1", "status": "fail",
             "x": float(i % 4) * 20.0, "y": float(i // 4) * 20.0} for i in range(12)]
    rows.append({"id": "nowhere", "storey": "L1", "status": "not_checked", "x": None,
                 "y": None})
    return {"units": {"length": "ft"}, "members": rows}


def test_each_picture_is_a_png_of_its_own_column_and_redraws_alike() -> None:
    report = _report()
    pictures = StoreyDots(report)
    first = pictures(report["members"][0])
    other = pictures(report["members"][5])
    again = pictures(report["members"][0])
    assert first.startswith(PNG_SIGNATURE) and other.startswith(PNG_SIGNATURE)
    assert first != other  # the highlighted column moved
    assert first == again  # the storey's background is restored, no mark left behind
    size = Image.open(io.BytesIO(first)).size
    assert size == (round(SIZE_IN * DPI), round(SIZE_IN * DPI))


def test_a_column_without_a_plan_position_gets_no_picture() -> None:
    report = _report()
    assert StoreyDots(report)(report["members"][-1]) is None


def test_plan_layers_draw_the_slab_and_grid_beneath_the_dots() -> None:
    # The slab outline with its opening and the grid lines (bluish greys #aab3bf, #8a94a3)
    # are the HTML plans' layers (service/plan_data.py); each adds its own pixels.
    from stanchion.service.reports.plan_data import GridAxis, PlanData, SlabOutline, StoreyPlan

    report = _report()
    outer = ((-10.0, -10.0), (70.0, -10.0), (70.0, 50.0), (-10.0, 50.0))
    hole = ((25.0, 25.0), (35.0, 25.0), (35.0, 35.0), (25.0, 35.0))
    axes = (GridAxis("A", (-20.0, 0.0), (80.0, 0.0)), GridAxis("1", (0.0, -20.0), (0.0, 60.0)))

    def bluish(plan: StoreyPlan | None) -> int:  # blue well above red: the layers' inks
        png = StoreyDots(report, None if plan is None else PlanData({"L1": plan}, "ft"))(
            report["members"][0])
        image = np.asarray(Image.open(io.BytesIO(png)).convert("RGB"), dtype=int)
        return int(((image[..., 2] - image[..., 0] >= 12) & (image[..., 0] < 200)).sum())

    plain = bluish(None)
    solid = bluish(StoreyPlan(slabs=(SlabOutline(outer),)))
    opened = bluish(StoreyPlan(slabs=(SlabOutline(outer, (hole,)),)))
    gridded = bluish(StoreyPlan(grid_axes=axes, slabs=(SlabOutline(outer, (hole,)),)))
    assert solid > plain + 200  # the slab's outline
    assert opened > solid + 40  # and its opening's
    assert gridded > opened + 100  # the grid lines and their tag bubbles
