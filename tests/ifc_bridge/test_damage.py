"""Which columns a damaged model's problems touch (issue 13 item 1, ``--lenient``).

Each test builds a three-column model in memory (every schema), writes it as STEP text,
damages one line on purpose and reads it leniently; :func:`touched_global_ids` must name
exactly the columns whose inputs the damaged line feeds (docs/design.md §5).  Expected
columns come from how each model is built (common practice, no source).
"""

from __future__ import annotations

import re
from pathlib import Path

import numpy as np
import pytest

from stanchion.ifc_bridge.damage import touched_global_ids
from stanchion.ifc_bridge.model import open_model
from stanchion.ifc_bridge.read import read_columns


@pytest.fixture
def three(builder):
    """Columns C0, C1, C2 sharing one steel; C1 has analysis results; each has loads."""
    steel = builder.material("ASTM A992", fy=50)
    cols, profiles = [], []
    for i in range(3):
        prof = builder.profile("I", f"W12X{40 + i}", d=11.9, bf=8.0, tw=0.295, tf=0.515)
        col = builder.column(f"C{i}", profile=prof, material=steel, tag=f"T{i}")
        builder.loads(col, D=50, L=30)
        cols.append(col)
        profiles.append(prof)
    member = builder.analysis_member(cols[1])
    case = builder.load_case("Dead", source="DEAD_LOAD_G")
    reaction = builder.reaction(member, case, -40.0)
    return builder, cols, {"steel": steel, "profiles": profiles, "reaction": reaction,
                           "case": case}


def _damaged(tmp_path: Path, builder, edit) -> tuple[list, object]:
    path = builder.write(tmp_path / "good.ifc")
    text = path.read_text()
    bad = tmp_path / "bad.ifc"
    bad.write_text(edit(text))
    problems: list = []
    model = open_model(bad, problems=problems)
    assert problems, "the damage must be in the parser's log"
    return problems, model


def _line(step_id: int) -> re.Pattern[str]:
    return re.compile(rf"^#{step_id}=.*\n", re.MULTILINE)


def _delete(step_id: int):
    return lambda text: _line(step_id).sub("", text, count=1)


def _rename(step_id: int):
    """The line's entity renamed to one no schema has (the parser skips the line)."""
    return lambda text: re.sub(rf"^#{step_id}=IFC", f"#{step_id}=IFX", text, count=1,
                               flags=re.MULTILINE)


def _names(model, touched) -> list[list[str] | None]:
    names = {c.GlobalId: c.Name for c in model.by_type("IfcColumn")}
    # the columns among the products touched (analysis members, storeys ... left out)
    return [None if t is None else sorted(names[g] for g in t if g in names) for t in touched]


def test_deleted_result_touches_only_its_column(tmp_path, three):
    # issue 13: one IfcStructural*Reaction line deleted silently lowered one column's load;
    # both references to it (its activity relationship, its result group) name C1 alone
    builder, _cols, parts = three
    problems, model = _damaged(tmp_path, builder, _delete(parts["reaction"].id()))
    assert len(problems) == 2
    assert _names(model, touched_global_ids(model, problems)) == [["C1"], ["C1"]]


def test_dangling_profile_of_one_extrusion_touches_that_column(tmp_path, three):
    builder, cols, parts = three
    solid = next(e for e in builder.model.traverse(cols[2].Representation)
                 if e.is_a("IfcExtrudedAreaSolid"))
    prof = parts["profiles"][2].id()

    def edit(text: str) -> str:
        return text.replace(f"#{solid.id()}=IFCEXTRUDEDAREASOLID(#{prof},",
                            f"#{solid.id()}=IFCEXTRUDEDAREASOLID(#999999,")

    problems, model = _damaged(tmp_path, builder, edit)
    assert [p.step_id for p in problems] == [solid.id()]
    assert _names(model, touched_global_ids(model, problems)) == [["C2"]]


def test_skipped_property_set_touches_its_column(tmp_path, three):
    # the parser skips the renamed line; its relationship then refers to nothing: both
    # problems name C0, the column whose Stanchion_Loads it was
    builder, cols, _parts = three
    pset = next(r.RelatingPropertyDefinition for r in builder.model.by_type(
        "IfcRelDefinesByProperties") if cols[0] in r.RelatedObjects)
    problems, model = _damaged(tmp_path, builder, _rename(pset.id()))
    assert len(problems) == 2
    assert _names(model, touched_global_ids(model, problems)) == [["C0"], ["C0"]]


def test_shared_material_touches_every_column_using_it(tmp_path, three):
    builder, _cols, parts = three
    problems, model = _damaged(tmp_path, builder, _rename(parts["steel"].id()))
    touched = _names(model, touched_global_ids(model, problems))
    assert touched and all(t == ["C0", "C1", "C2"] for t in touched)


def test_load_case_of_the_results_touches_the_column_with_results(tmp_path, three):
    builder, _cols, parts = three
    problems, model = _damaged(tmp_path, builder, _delete(parts["case"].id()))
    touched = _names(model, touched_global_ids(model, problems))
    assert touched and all(t == ["C1"] for t in touched)


def test_project_units_touch_every_element(tmp_path, three):
    builder, _cols, _parts = three
    length = next(u for u in builder.project.UnitsInContext.Units
                  if getattr(u, "UnitType", None) == "LENGTHUNIT")
    problems, model = _damaged(tmp_path, builder, _delete(length.id()))
    assert touched_global_ids(model, problems) == [None]


def test_cut_short_touches_every_element(tmp_path, three):
    builder, _cols, _parts = three

    def cut(text: str) -> str:
        return text[:text.rindex("ENDSEC;")]

    problems, model = _damaged(tmp_path, builder, cut)
    assert problems[0].everywhere
    assert touched_global_ids(model, problems)[0] is None


def test_a_sound_model_is_read_the_same_after_the_search(tmp_path, three):
    # the search only reads: the member table of the damaged model is unchanged by it
    builder, _cols, parts = three
    problems, model = _damaged(tmp_path, builder, _delete(parts["reaction"].id()))
    before = read_columns(model).members.loads
    touched_global_ids(model, problems)
    np.testing.assert_array_equal(read_columns(model).members.loads, before)


def test_the_analysis_member_of_a_deleted_result_is_touched_too(tmp_path, three):
    # members may also be read from analysis members (IfcStructuralCurveMember, a product
    # but no IfcElement): the search names any product, the caller keeps its own rows
    builder, cols, parts = three
    member = next(r.RelatingProduct for r in builder.model.by_type("IfcRelAssignsToProduct")
                  if cols[1] in r.RelatedObjects)
    problems, model = _damaged(tmp_path, builder, _delete(parts["reaction"].id()))
    touched = touched_global_ids(model, problems)
    assert len(touched) == 2 and all(touched)
    assert all(member.GlobalId in t and cols[1].GlobalId in t for t in touched if t)
    assert all(cols[0].GlobalId not in t for t in touched if t)
