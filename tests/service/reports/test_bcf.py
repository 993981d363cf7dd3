"""`check MODEL --bcf`: BCF 3.0 topics for failing and not-checked columns, read back with
bcf-client (docs/design.md §3, BCF)."""

from __future__ import annotations

import math
from pathlib import Path

import numpy as np
import pytest
from bcf.v3.bcfxml import BcfXml

from stanchion.service.cli import main
from stanchion.service.reports.bcf import (
    BcfScene,
    camera_for,
    target_point,
    write_bcf,
)
from stanchion.service.reports.snapshots import PNG_SIGNATURE
from tests.ifc_bridge.conftest import SCHEMAS
from tests.service.test_model_check_files import build_model

SAMPLES = Path(__file__).resolve().parents[3] / "sample_models"


_OPEN: list[BcfXml] = []  # a BcfXml closes its zip file when collected


def _topics(path: Path) -> list:
    document = BcfXml.load(path)
    assert document is not None
    _OPEN.append(document)
    return list(document.topics.values())


def _model(tmp_path: Path, schema: str) -> tuple[Path, dict[str, str]]:
    """The standard model (C1 pass, C2 fail, C3 not checked: no loads) plus a concrete
    column C4 (skipped); Level 2's placement stands at z = 4 m."""
    b = build_model(schema)
    concrete = b.material("Concrete C30/37")
    if schema != "IFC2X3":
        concrete.Category = "concrete"  # the builder's materials are all of category steel
    b.column("C4", profile=b.profile("RECT", "300x300", H=11.8, B=11.8), material=concrete,
             length=144.0, storey="Level 1", at=(0.0, 240.0), tag="T3", via="body")
    import ifcopenshell.api.geometry

    matrix = np.eye(4)
    matrix[2, 3] = 4.0  # metres (the api takes SI)
    ifcopenshell.api.geometry.edit_object_placement(
        b.model, product=b.storey("Level 2"), matrix=matrix)
    guids = {c.Name: c.GlobalId for c in b.model.by_type("IfcColumn")}
    return b.write(tmp_path / f"m_{schema}.ifc"), guids


@pytest.mark.parametrize("schema", SCHEMAS)
def test_one_topic_per_failing_and_not_checked_column(tmp_path, schema) -> None:
    model, guids = _model(tmp_path, schema)
    out = tmp_path / "issues.bcf"
    assert main(["check", str(model), "--bcf", str(out), "--quiet"]) == 1
    topics = _topics(out)
    # C2 fails (1.4 x 300 = 420 kip > φcPn 303 kip, Manual Table 4-1a), C3 has no loads:
    # 2 topics; C1 passes and C4 (concrete) is skipped: none.
    assert len(topics) == 2
    by_title = {t.topic.title: t for t in topics}
    fail = next(t for title, t in by_title.items() if title.startswith("Column T1 "))
    unchecked = next(t for title, t in by_title.items() if title.startswith("Column T2 "))
    assert fail.topic.title.startswith("Column T1 (Level 2) fails: utilization 1.")
    assert unchecked.topic.title == "Column T2 (Level 2) not checked"
    assert fail.topic.labels.label == ["stanchion", "fail"]
    assert unchecked.topic.labels.label == ["stanchion", "not checked"]
    assert "Section W14X48, Fy 50 ksi." in fail.topic.description
    assert "flexural buckling" in fail.topic.description
    assert "Not checked: no loads" in unchecked.topic.description
    for name, topic in (("C2", fail), ("C3", unchecked)):
        (viewpoint,) = topic.viewpoints.values()
        assert viewpoint.get_selected_guids() == [guids[name]]
        assert viewpoint.snapshot.startswith(PNG_SIGNATURE)
        camera = viewpoint.visualization_info.perspective_camera
        # C2 stands at x = 240 in = 6.096 m, C3 at 12.192 m, y = 0, on Level 2 (z = 4 m),
        # 16 ft = 4.8768 m long: the camera looks at (x, 0, 4 + 2.4384) m.
        x = {"C2": 6.096, "C3": 12.192}[name]
        target = np.array([x, 0.0, 4.0 + 2.4384])
        position = np.array([camera.camera_view_point.x, camera.camera_view_point.y,
                             camera.camera_view_point.z])
        direction = np.array([camera.camera_direction.x, camera.camera_direction.y,
                              camera.camera_direction.z])
        towards = (target - position) / np.linalg.norm(target - position)
        assert towards == pytest.approx(direction, abs=1e-6)
        assert np.linalg.norm(target - position) == pytest.approx(12.192, abs=1e-6)  # 2.5 L


def test_bcf_of_the_sample_model_has_failing_plus_not_checked_topics(tmp_path) -> None:
    out, report = tmp_path / "s.bcf", tmp_path / "s.json"
    main(["check", str(SAMPLES / "workshop_annex.ifc"), "--bcf", str(out), "--report",
          str(report), "--quiet"])
    import json

    data = json.loads(report.read_text())
    wanted = [m for m in data["members"] if m["status"] in ("fail", "not_checked")]
    topics = _topics(out)
    assert len(topics) == data["summary"]["fail"] + data["summary"]["not_checked"] > 0
    selected = sorted(g for t in topics for v in t.viewpoints.values()
                      for g in v.get_selected_guids())
    assert selected == sorted(m["id"] for m in wanted)
    assert all(t.topic.topic_type == "Column check" for t in topics)


def test_bcf_is_refused_for_a_members_file(tmp_path, capsys) -> None:
    members = tmp_path / "m.json"
    members.write_text('{"members": [{"id": "C1", "section": "W14X48", "fy": 50, '
                       '"length": 16, "loads": {"D": 10}}]}')
    assert main(["check", str(members), "--bcf", str(tmp_path / "x.bcf")]) == 2
    assert "--bcf applies to IFC models" in capsys.readouterr().err
    assert not (tmp_path / "x.bcf").exists()


def test_camera_rule_by_hand() -> None:
    # Target at the origin, a 3 m column: distance max(8, 2.5 x 3) = 8 m along
    # (-1, -1, 1)/sqrt(3): position (-4.6188, -4.6188, 4.6188); direction (1, 1, -1)/sqrt(3);
    # up = z minus its part along the direction, normalised: (1, 1, 2)/sqrt(6).
    cam = camera_for((0.0, 0.0, 0.0), 3.0)
    s3, s6 = math.sqrt(3.0), math.sqrt(6.0)
    assert cam.position == pytest.approx((-8 / s3, -8 / s3, 8 / s3))
    assert cam.direction == pytest.approx((1 / s3, 1 / s3, -1 / s3))
    assert cam.up == pytest.approx((1 / s6, 1 / s6, 2 / s6))
    assert camera_for((0.0, 0.0, 0.0), 6.0).position[2] == pytest.approx(15 / s3)  # 2.5 x 6


def test_target_point_converts_the_report_unit() -> None:
    # 10 ft = 3.048 m exactly (1 ft = 0.3048 m); storey at 4 m, 3.2 m column: z = 5.6 m.
    scene = BcfScene(storey_z={"L2": 4.0}, heights={"g": 3.2})
    row = {"id": "g", "x": 10.0, "y": -20.0, "storey": "L2"}
    assert target_point(row, scene, "ft") == pytest.approx((3.048, -6.096, 5.6))
    assert target_point({**row, "x": None}, scene, "ft") is None
    # Unknown length: 3 m assumed (mid-height 1.5 m); unknown storey height: z0 = 0.
    assert target_point({"id": "h", "x": 1.0, "y": 2.0, "storey": "?"}, scene, "m") == \
        pytest.approx((1.0, 2.0, 1.5))


def test_snapshot_source_is_replaceable_and_a_bad_guid_selects_nothing(tmp_path) -> None:
    report = {"units": {"force": "kN", "length": "m", "stress": "MPa"},
              "design_basis": "basis", "disclaimer": "caution",
              "members": [{"id": "not-a-guid", "name": "X", "status": "fail", "x": 1.0,
                           "y": 1.0, "utilization": 1.5, "section": "W8X31"},
                          {"id": "0123456789abcdefABCD_$", "name": "Y", "status": "pass"}]}
    seen: list[str] = []

    def picture(row: dict) -> bytes | None:
        seen.append(row["id"])
        return None

    out = tmp_path / "r.bcf"
    assert write_bcf(out, report, snapshots=picture) == 1
    assert seen == ["not-a-guid"]
    (topic,) = _topics(out)
    (viewpoint,) = topic.viewpoints.values()
    assert viewpoint.get_selected_guids() is None  # never a selection of a malformed id
    assert viewpoint.snapshot is None
    assert "Fy n/a MPa" in topic.topic.description


def test_title_names_tag_grid_and_storey() -> None:
    from stanchion.service.reports.bcf import topic_title

    row = {"id": "g", "tag": "T1", "name": "C1", "grid": "B-2", "storey": "Level 2",
           "status": "fail", "utilization": 1.3862}
    assert topic_title(row) == "Column T1 (grid B-2, Level 2) fails: utilization 1.386"
    bare = {"id": "g", "name": "C9", "status": "not_checked"}
    assert topic_title(bare) == "Column C9 not checked"
