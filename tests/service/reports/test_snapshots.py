"""Snapshots of a column's place on its storey (service/reports/snapshots.py)."""

from __future__ import annotations

import io

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
