"""The warnings of a damaged model checked with ``--lenient`` name the columns it touches.

Issue 13 item 1: the run's warning names each problem and the columns whose inputs it
touches (Tag, else Name, with the GlobalId); those columns' messages start with the problem;
the others carry a plain warning (docs/design.md §4, §5).  The models are built in memory
(tests/ifc_bridge/conftest.py), written as STEP text and damaged on purpose; which column a
line feeds follows from how the model is built (common practice, no source).
"""

from __future__ import annotations

import re

import pytest

from stanchion.ifc_bridge.model import open_model
from stanchion.service.lenient import HEAD
from tests.ifc_bridge.conftest import SCHEMAS, ModelBuilder
from tests.service.checking import check_file


def _model(schema: str) -> tuple[ModelBuilder, list, object]:
    b = ModelBuilder(schema, "mm_N")
    steel = b.material("ASTM A992", fy=50)
    cols = []
    for i in range(3):
        prof = b.profile("I", "W12X40", d=11.9, bf=8.0, tw=0.295, tf=0.515)
        col = b.column(f"C{i}", profile=prof, material=steel, tag=f"T{i}")
        b.loads(col, D=50, L=30)
        cols.append(col)
    member = b.analysis_member(cols[1])
    reaction = b.reaction(member, b.load_case("Dead", source="DEAD_LOAD_G"), -40.0)
    return b, cols, reaction


@pytest.mark.parametrize("schema", SCHEMAS)
def test_only_the_touched_column_carries_the_damage(tmp_path, schema) -> None:
    b, cols, reaction = _model(schema)
    text = b.write(tmp_path / "good.ifc").read_text()
    bad = tmp_path / "bad.ifc"
    bad.write_text(re.sub(rf"^#{reaction.id()}=.*\n", "", text, count=1, flags=re.MULTILINE))
    report = check_file(bad, lenient=True)
    head = report["messages"][0]
    gid = cols[1].GlobalId
    assert head.startswith(f"{HEAD}: line ")
    # both references to the deleted reaction name the column whose result it was
    assert head.count(f"(touches column T1 ({gid}))") == 2
    assert "T0" not in head and "T2" not in head
    first = {m["id"]: m["messages"][0] for m in report["members"]}
    assert first[gid].startswith(f"{HEAD}: this column's inputs are touched by line ")
    for other in (cols[0], cols[2]):
        assert first[other.GlobalId].startswith(f"{HEAD} (see the run messages): none of")


def test_more_than_three_problems_are_counted(tmp_path) -> None:
    b, cols, _reaction = _model("IFC4")
    text = b.write(tmp_path / "good.ifc").read_text()
    # four property lines renamed: four skipped lines and four dangling references
    psets = [r for r in b.model.by_type("IfcPropertySingleValue")][:4]
    for prop in psets:
        text = re.sub(rf"^#{prop.id()}=IFC", f"#{prop.id()}=IFX", text, count=1,
                      flags=re.MULTILINE)
    bad = tmp_path / "bad.ifc"
    bad.write_text(text)
    report = check_file(bad, lenient=True)
    head = report["messages"][0]
    problems: list = []
    open_model(bad, problems=problems)
    assert len(problems) > 4  # the skipped lines and the references to them
    # the first three named, the rest counted (the Pset_MaterialSteel value touches all three)
    assert f"and {len(problems) - 3} more problems touching " in head
    touched = [m for m in report["members"]
               if m["messages"][0].startswith(f"{HEAD}: this column's")]
    assert touched  # the Stanchion_Loads / Pset_MaterialSteel values belong to columns
    assert {m["id"] for m in report["members"]} == {c.GlobalId for c in cols}


def test_a_cut_short_model_touches_every_column(tmp_path) -> None:
    b, cols, _reaction = _model("IFC4X3")
    text = b.write(tmp_path / "good.ifc").read_text()
    bad = tmp_path / "bad.ifc"
    bad.write_text(text[:text.rindex("ENDSEC;")])
    report = check_file(bad, lenient=True)
    assert "(touches any column: what it stands for is missing)" in report["messages"][0]
    assert all(m["messages"][0].startswith(f"{HEAD}: this column's inputs are touched by "
                                           "line ") for m in report["members"])
