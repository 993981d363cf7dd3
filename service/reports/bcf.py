"""BCF 3.0 issues (``--bcf``): one topic per failing and per not-checked column.

Written with bcf-client (:mod:`bcf.v3`) from the report (docs/design.md §3) and a
:class:`BcfScene` -- what the report does not carry: the storeys' heights, the columns'
lengths and yield stresses, the IFC project.  Each topic has a title naming the column and
its status, a description with the numbers or the reason, the labels ``stanchion`` and the
status (``fail``, ``not checked``), and one viewpoint that selects the column by its IfcGuid
and looks at it, with a snapshot of its place on its storey plan (any
:data:`~stanchion.service.reports.snapshots.SnapshotSource`; by default
:class:`~stanchion.service.reports.snapshots.StoreyDots`).  The camera rule is
:func:`camera_for`.  The file is written atomically.
"""

from __future__ import annotations

import math
import re
import uuid
from dataclasses import dataclass, field
from pathlib import Path
from typing import TYPE_CHECKING, Any

import numpy as np

from stanchion.engine.units import length_factor
from stanchion.service.reports.files import write_atomic
from stanchion.service.reports.snapshots import SnapshotSource, StoreyDots, member_label

if TYPE_CHECKING:
    from stanchion.service.model_check import ModelCheck

#: Report statuses that get a topic, and the label each gets.
TOPIC_STATUSES = {"fail": "fail", "not_checked": "not checked"}
#: The label every topic carries.
TOOL_LABEL = "stanchion"
#: Topic type and status (declared in the file's extensions.xml, as BCF 3.0 asks).
TOPIC_TYPE, TOPIC_STATUS = "Column check", "Open"
AUTHOR = "stanchion"
SNAPSHOT_NAME = "snapshot.png"
#: An IFC GlobalId: 22 characters of the IFC base-64 alphabet (BCF 3.0 IfcGuid type).
IFC_GUID = re.compile(r"^[0-9A-Za-z_$]{22}$")
#: Metres per inch (exact, by definition of the inch).
M_PER_IN = 0.0254
#: Camera rule (common practice for a look at one element, no source): aim at mid-height,
#: stand back along (-1, -1, 1) at least this far, or this many column lengths.
MIN_DISTANCE_M, LENGTHS_AWAY = 8.0, 2.5
#: Length assumed for a column whose length is unknown, to aim at its mid-height.
DEFAULT_HEIGHT_M = 3.0
FIELD_OF_VIEW_DEG, ASPECT_RATIO = 60.0, 1.0


@dataclass(frozen=True)
class BcfScene:
    """What a topic needs beyond the report.

    Attributes:
        storey_z: storey name to the storey's height, m (model coordinates).
        heights: member id to its length, m.
        fy: member id to its yield stress, report stress unit.
        project_guid: the IfcProject's GlobalId, named in each topic's header.
        model_file: the model's file name, named in each topic's header.
    """

    storey_z: dict[str, float] = field(default_factory=dict)
    heights: dict[str, float] = field(default_factory=dict)
    fy: dict[str, float] = field(default_factory=dict)
    project_guid: str | None = None
    model_file: str | None = None


@dataclass(frozen=True)
class Camera:
    """A perspective camera in model coordinates, metres (BCF: position, direction, up)."""

    position: tuple[float, float, float]
    direction: tuple[float, float, float]
    up: tuple[float, float, float]


def _num(x: Any, digits: int = 4) -> str:
    return "n/a" if not isinstance(x, int | float) or not math.isfinite(x) else f"{x:.{digits}g}"


def target_point(row: dict[str, Any], scene: BcfScene, length_unit: str
                 ) -> tuple[float, float, float] | None:
    """The point a column's camera looks at, m: its plan position at mid-height.

    x, y are the report's (its length unit); z is the storey's height plus half the
    column's length (:data:`DEFAULT_HEIGHT_M` when unknown; a column without a storey
    height stands at z = 0).  None when the report gives no plan position.
    """
    x, y = row.get("x"), row.get("y")
    if not (isinstance(x, int | float) and isinstance(y, int | float)
            and math.isfinite(x) and math.isfinite(y)):
        return None
    to_m = length_factor(length_unit) * M_PER_IN
    height = scene.heights.get(str(row.get("id")), DEFAULT_HEIGHT_M)
    z0 = scene.storey_z.get(str(row.get("storey") or ""), 0.0)
    return float(x) * to_m, float(y) * to_m, z0 + height / 2


def camera_for(target: tuple[float, float, float], height: float) -> Camera:
    """The camera of a column's viewpoint.

    It stands back from ``target`` along (-1, -1, 1)/sqrt(3) -- south-west of the column
    and above it, looking down 35.3 degrees -- at the larger of :data:`MIN_DISTANCE_M` and
    :data:`LENGTHS_AWAY` column lengths, so the whole column and its neighbours are in a
    60 degree view; the up vector is the vertical made perpendicular to the direction.

    Args:
        target: the point looked at, m.
        height: the column's length, m.
    """
    offset = np.array([-1.0, -1.0, 1.0]) / math.sqrt(3.0)
    distance = max(MIN_DISTANCE_M, LENGTHS_AWAY * height)
    position = np.asarray(target) + distance * offset
    direction = -offset
    up = np.array([0.0, 0.0, 1.0]) - direction[2] * direction
    up /= np.linalg.norm(up)
    return Camera(tuple(position.tolist()), tuple(direction.tolist()), tuple(up.tolist()))


def topic_title(row: dict[str, Any]) -> str:
    """``Column C-12 (grid B/3, Level 2) fails: utilization 1.155`` or ``... not checked``."""
    where = [f"grid {row['grid']}"] if row.get("grid") else []
    if row.get("storey"):
        where.append(str(row["storey"]))
    place = f" ({', '.join(where)})" if where else ""
    if row["status"] == "fail":
        utilization = _num(row.get("utilization"))
        return f"Column {member_label(row)}{place} fails: utilization {utilization}"
    return f"Column {member_label(row)}{place} not checked"


def topic_description(row: dict[str, Any], report: dict[str, Any], scene: BcfScene) -> str:
    """The numbers of a failing column, or the reason a column was not checked."""
    units = report.get("units", {})
    force, stress = units.get("force", ""), units.get("stress", "")
    fy = scene.fy.get(str(row.get("id")))
    section = f"Section {row.get('section') or 'unknown'}, Fy {_num(fy)} {stress}."
    if row["status"] == "fail":
        lines = [
            f"Required strength {_num(row.get('required_strength'), 6)} {force} exceeds the "
            f"available strength {_num(row.get('available_strength'), 6)} {force}: "
            f"utilization {_num(row.get('utilization'))}.",
            f"Governing limit state: {row.get('limit_state') or 'n/a'}; governing "
            f"combination: {row.get('combination') or 'n/a'}.",
            section,
        ]
    else:
        lines = [f"Not checked: {row.get('reason') or 'no reason given'}.", section]
    lines += [f"IfcGuid {row.get('id')}; name {row.get('name') or 'n/a'}.",
              f"{report.get('design_basis', '')}. {report.get('disclaimer', '')}".strip()]
    return "\n".join(lines)


def _viewpoint(row: dict[str, Any], scene: BcfScene, length_unit: str,
               snapshot: bytes | None) -> Any:
    """The viewpoint handler selecting the column and looking at it."""
    import bcf.v3.model as mdl
    from bcf.v3.visinfo import VisualizationInfoHandler

    info = mdl.VisualizationInfo(guid=str(uuid.uuid4()))
    guid = str(row.get("id") or "")
    if IFC_GUID.match(guid):
        info.components = mdl.Components(
            selection=mdl.ComponentSelection(component=[mdl.Component(ifc_guid=guid)]),
            visibility=mdl.ComponentVisibility(default_visibility=True))
    target = target_point(row, scene, length_unit)
    if target is not None:
        cam = camera_for(target, scene.heights.get(guid, DEFAULT_HEIGHT_M))
        info.perspective_camera = mdl.PerspectiveCamera(
            camera_view_point=mdl.Point(x=cam.position[0], y=cam.position[1],
                                        z=cam.position[2]),
            camera_direction=mdl.Direction(x=cam.direction[0], y=cam.direction[1],
                                           z=cam.direction[2]),
            camera_up_vector=mdl.Direction(x=cam.up[0], y=cam.up[1], z=cam.up[2]),
            field_of_view=FIELD_OF_VIEW_DEG, aspect_ratio=ASPECT_RATIO)
    return VisualizationInfoHandler(info, snapshot=snapshot)


def topic_rows(report: dict[str, Any]) -> list[dict[str, Any]]:
    """The member rows that get a topic: failing and not-checked, in report order."""
    return [r for r in report.get("members", []) if r.get("status") in TOPIC_STATUSES]


def build_bcf(report: dict[str, Any], scene: BcfScene | None = None,
              snapshots: SnapshotSource | None = None) -> Any:
    """The BCF 3.0 document (a :class:`bcf.v3.bcfxml.BcfXml`) of a report.

    Args:
        report: the report (docs/design.md §3).
        scene: heights, lengths, yield stresses and the project (default: none known).
        snapshots: the pictures (default :class:`StoreyDots` of the report).
    """
    import bcf.v3.model as mdl
    from bcf.v3.bcfxml import BcfXml

    scene = scene or BcfScene()
    snapshots = snapshots or StoreyDots(report)
    length_unit = report.get("units", {}).get("length", "m")
    source = report.get("source", {}).get("file") or "model"
    extensions = mdl.Extensions(
        topic_types=mdl.ExtensionsTopicTypes(topic_type=[TOPIC_TYPE]),
        topic_statuses=mdl.ExtensionsTopicStatuses(topic_status=[TOPIC_STATUS]),
        topic_labels=mdl.ExtensionsTopicLabels(
            topic_label=[TOOL_LABEL, *TOPIC_STATUSES.values()]),
        users=mdl.ExtensionsUsers(user=[AUTHOR]))
    document = BcfXml.create_new(project_name=f"stanchion check of {source}",
                                 extensions=extensions)
    for row in topic_rows(report):
        topic = document.add_topic(topic_title(row), topic_description(row, report, scene),
                                   AUTHOR, topic_type=TOPIC_TYPE, topic_status=TOPIC_STATUS)
        topic.topic.labels = mdl.TopicLabels(label=[TOOL_LABEL, TOPIC_STATUSES[row["status"]]])
        if scene.model_file or scene.project_guid:
            topic.header = mdl.Header(files=mdl.HeaderFiles(file=[mdl.File(
                filename=scene.model_file, ifc_project=scene.project_guid,
                is_external=True)]))
        picture = snapshots(row)
        topic.add_visinfo_handler(_viewpoint(row, scene, length_unit, picture),
                                  snapshot_filename=SNAPSHOT_NAME if picture else None)
    return document


def write_bcf(path: Path, report: dict[str, Any], scene: BcfScene | None = None,
              snapshots: SnapshotSource | None = None) -> int:
    """Write the BCF file of :func:`build_bcf`, atomically; returns the number of topics."""
    document = build_bcf(report, scene, snapshots)
    write_atomic(Path(path), lambda tmp: document.save(tmp))
    return len(document.topics)


def scene_of(run: ModelCheck) -> BcfScene:
    """The :class:`BcfScene` of a checked model.

    Storey heights from the model (:func:`stanchion.ifc_bridge.storeys.storey_elevations`),
    each column's length as the longest of its unbraced lengths and its Fy from the member
    table, in metres and the report's stress unit.
    """
    from stanchion.engine.units import stress_factor
    from stanchion.ifc_bridge.storeys import project_guid, storey_elevations

    members, report = run.members, run.report
    to_m = run.read.length_unit_factor * M_PER_IN
    ids = [str(i) for i in members.id.tolist()]
    with np.errstate(all="ignore"):
        lengths = np.fmax(np.fmax(members.lx, members.ly), members.lz) * M_PER_IN
        fy = members.Fy / stress_factor(report["units"]["stress"])
    return BcfScene(
        storey_z={k: v * to_m for k, v in storey_elevations(run.model).items()},
        heights={i: float(h) for i, h in zip(ids, lengths.tolist(), strict=True)
                 if math.isfinite(h) and h > 0},
        fy={i: float(f) for i, f in zip(ids, fy.tolist(), strict=True)
            if math.isfinite(f) and f > 0},
        project_guid=project_guid(run.model),
        model_file=report.get("source", {}).get("file"))
