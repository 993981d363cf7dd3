"""Analysis models as input, and what --include-members skips (issue 14 items 6 and 7).

Exporter pattern reproduced: an IfcStructuralAnalysisModel whose IfcStructuralCurveMembers
carry an IfcMaterialProfileSetUsage and their own results, with no IfcColumn in the file.
IFC2X3 has no material profile sets, so these models are IFC4 and later.
"""

from __future__ import annotations

import math

import pytest

from stanchion.engine.members import LOAD_TYPES
from stanchion.ifc_bridge.read import read_columns

W14X90 = {"d": 14.0, "bf": 14.5, "tw": 0.440, "tf": 0.710}  # AISC Shapes Database v16.0


def _member(b, name: str, start, end, profile=None, material=None):
    """A standalone analysis member from ``start`` to ``end`` (inches), profile set usage."""
    m = b.model
    member = b._create("IfcStructuralCurveMember", name=name,
                       predefined_type="RIGID_JOINED_MEMBER")
    member.Axis = m.createIfcDirection((1.0, 0.0, 0.0))
    v0, v1 = (m.createIfcVertexPoint(m.createIfcCartesianPoint(tuple(b.L(c) for c in p)))
              for p in (start, end))
    rep = m.createIfcTopologyRepresentation(b.body, "Reference", "Edge",
                                            [m.createIfcEdge(v0, v1)])
    member.Representation = m.createIfcProductDefinitionShape(None, None, [rep])
    if profile is not None:
        pset = b.profile_set(profile, material, name=profile.ProfileName)
        b._associate(member, m.create_entity("IfcMaterialProfileSetUsage", ForProfileSet=pset))
    return member


@pytest.fixture
def analysis_builder(builder):
    if builder.schema == "IFC2X3":
        pytest.skip("analysis members carry material profile sets from IFC4 on")
    return builder


def _frame(b):
    """Two columns 144 in tall, a beam between them and a brace sloped at 45 degrees."""
    prof = b.profile("I", "W14X90", **W14X90)
    steel = b.material("A992")
    left = _member(b, "left", (0, 0, 0), (0, 0, 144), prof, steel)
    right = _member(b, "right", (240, 0, 0), (240, 0, 144), prof, steel)
    _member(b, "beam", (0, 0, 144), (240, 0, 144), prof, steel)
    _member(b, "brace", (0, 0, 0), (144, 0, 144), prof, steel)
    dead = b.load_case("Dead", action_type="PERMANENT_G")
    b.reaction(left, dead, -300.0)
    return left, right


def test_vertical_analysis_members_are_read_when_there_is_no_column(analysis_builder):
    b = analysis_builder
    left, right = _frame(b)
    read = read_columns(b.model)
    m = read.members
    # expected: the two vertical members of the frame built above; beam and brace are not
    assert list(m.id) == [left.GlobalId, right.GlobalId]
    assert list(m.extra["ifc_class"]) == ["IfcStructuralCurveMember"] * 2
    assert list(m.extra["length_source"]) == ["analytical"] * 2
    # expected: the edge lengths given above, 144 in
    assert m.lx.tolist() == pytest.approx([144.0, 144.0])
    # expected: the plan positions of the feet given above, in model units (mm)
    assert m.extra["x"].tolist() == pytest.approx([0.0, b.L(240.0)])
    assert list(m.section_label) == ["W14X90", "W14X90"]
    # expected: the reaction given above, 300 kip compression as dead load
    assert m.loads[0, LOAD_TYPES.index("D")] == pytest.approx(300.0)
    assert any("its 2 vertical IfcStructuralCurveMember (analysis members) are checked as "
               "columns" in s for s in read.messages)
    assert "no loads" in (m.reason[1] or "")


def test_analysis_members_beside_columns_only_on_request(analysis_builder):
    b = analysis_builder
    prof = b.profile("I", "W14X90", **W14X90)
    col = b.column("C1", profile=prof, material=b.material("A992"))
    b.analysis_member(col, length=144.0)  # tied to the column: read through it, not again
    free = _member(b, "free", (120, 0, 0), (120, 0, 144), prof, b.material("A992"))
    assert list(read_columns(b.model).members.id) == [col.GlobalId]
    read = read_columns(b.model, analysis_members=True)
    assert list(read.members.id) == [col.GlobalId, free.GlobalId]
    assert any("1 vertical IfcStructuralCurveMember tied to no column are checked" in s
               for s in read.messages)


def test_a_model_with_only_sloped_analysis_members_reads_nothing(analysis_builder):
    b = analysis_builder
    prof = b.profile("I", "W14X90", **W14X90)
    # 6 degrees from vertical: 144 in tall, 144 * tan(6 deg) = 15.13 in across (hand computed)
    _member(b, "leaning", (0, 0, 0), (144 * math.tan(math.radians(6.0)), 0, 144), prof)
    assert len(read_columns(b.model).members) == 0


def test_include_members_names_what_it_skipped(builder):
    prof = builder.profile("I", "W14X90", **W14X90)
    for name, kind in (("S1", "STRUT"), ("M1", "MULLION"), ("M2", "MULLION"),
                       ("N1", "NOTDEFINED")):
        builder.column(name, profile=prof, material=builder.material("A992"),
                       ifc_class="IfcMember", predefined_type=kind)
    read = read_columns(builder.model, include_members=True)
    if builder.schema == "IFC2X3":  # IfcMember has no PredefinedType of its own in IFC2X3
        expected = ("--include-members read 0 IfcMember of type STRUT or POST and skipped 4 "
                    "of other types: 4 no predefined type")
    else:
        expected = ("--include-members read 1 IfcMember of type STRUT or POST and skipped 3 "
                    "of other types: 2 MULLION, 1 no predefined type")
    assert expected in read.messages
    assert not any("--include-members" in s for s in read_columns(builder.model).messages)
