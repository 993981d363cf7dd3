"""Loads: analysis results, load table rows, Stanchion_Loads; precedence and conflicts."""

from __future__ import annotations

import math

import ifcopenshell
import ifcopenshell.guid
import pytest

from stanchion.engine.members import LOAD_TYPES
from stanchion.ifc_bridge.errors import ModelReadError
from stanchion.ifc_bridge.load_cases import load_type
from stanchion.ifc_bridge.read import read_columns
from stanchion.service.load_table import read_load_table

W14X48 = {"d": 13.8, "bf": 8.03, "tw": 0.340, "tf": 0.595}  # AISC Shapes Database v16.0
KIP_PER_KN = 0.2248089431  # 1 kN in kip (pint; common practice, no source)


def _col(b, name="C1", tag=None):
    prof = b.profile("I", "W14X48", **W14X48)
    return b.column(name, profile=prof, material=b.material("A992"), tag=tag)


def _loads(m, i=0) -> dict[str, float]:
    return {t: float(v) for t, v in zip(LOAD_TYPES, m.loads[i], strict=True)
            if not math.isnan(v)}


# ------------------------------------------------------------------ analysis results


def test_analysis_results_by_action_source(builder):
    col = _col(builder)
    member = builder.analysis_member(col)
    dead = builder.load_case("Dead", "DEAD_LOAD_G", "PERMANENT_G")
    live = builder.load_case("Live", "LIVE_LOAD_Q", "VARIABLE_Q")
    wind = builder.load_case("Wind X", "WIND_W", "VARIABLE_Q")
    builder.reaction(member, dead, -120.0)  # tension positive: 120 kip compression
    builder.reaction(member, live, -80.0)
    builder.reaction(member, wind, 15.0)  # wind puts the column in tension
    m = read_columns(builder.model).members
    assert _loads(m) == pytest.approx({"D": 120.0, "L": 80.0, "W": -15.0})
    assert m.extra["load_source"][0] == "analysis"
    assert m.reason[0] is None


def test_results_of_two_analysis_models_are_not_added(builder):
    # Two analysis runs kept in one file, each with its own dead-load case: adding them
    # would double the dead load; the reader takes the larger per load type (a conservative
    # envelope; common practice, no source) and says so.
    col = _col(builder)
    member = builder.analysis_member(col)
    old, new = builder.load_case("D", "DEAD_LOAD_G"), builder.load_case("D", "DEAD_LOAD_G")
    builder.reaction(member, old, -100.0)
    builder.reaction(member, new, -120.0)
    for name, case in (("run 1", old), ("run 2", new)):
        model = builder.model.create_entity(
            "IfcStructuralAnalysisModel", GlobalId=ifcopenshell.guid.new(), Name=name,
            PredefinedType="LOADING_3D", HasResults=[builder.result_group(case)])
        if builder.schema == "IFC2X3":
            model.OwnerHistory = builder.model.by_type("IfcOwnerHistory")[0]
    m = read_columns(builder.model).members
    assert _loads(m) == pytest.approx({"D": 120.0})
    assert any("2 analysis models (run 1, run 2)" in s for s in m.messages[0])


def test_largest_compression_along_the_member(builder):
    col = _col(builder)
    member = builder.analysis_member(col)
    dead = builder.load_case("Dead", "DEAD_LOAD_G")
    builder.reaction(member, dead, [-100.0, -112.5, -104.0])  # values along the member
    assert _loads(read_columns(builder.model).members)["D"] == pytest.approx(112.5)


def test_results_on_member_related_the_other_way(builder):
    col = _col(builder)
    member = builder.analysis_member(col, relating="column")
    builder.reaction(member, builder.load_case("Snow", "SNOW_S"), -30.0)
    assert _loads(read_columns(builder.model).members) == pytest.approx({"S": 30.0})


def test_roof_live_from_the_name(builder):
    col = _col(builder)
    member = builder.analysis_member(col)
    builder.reaction(member, builder.load_case("Lr", "LIVE_LOAD_Q"), -10.0)
    builder.reaction(member, builder.load_case("Floor live", "LIVE_LOAD_Q"), -20.0)
    assert _loads(read_columns(builder.model).members) == pytest.approx({"Lr": 10.0, "L": 20.0})


def test_name_decides_when_action_source_is_undefined(builder):
    col = _col(builder)
    member = builder.analysis_member(col)
    builder.reaction(member, builder.load_case("W1", "USERDEFINED"), -7.0)
    builder.reaction(member, builder.load_case("Rain ponding", "NOTDEFINED"), -3.0)
    builder.reaction(member, builder.load_case("Case 9", "NOTDEFINED", "PERMANENT_G"), -50.0)
    assert _loads(read_columns(builder.model).members) == pytest.approx(
        {"W": 7.0, "R": 3.0, "D": 50.0})


def test_unmapped_and_combination_results_are_ignored_with_messages(builder):
    col = _col(builder)
    member = builder.analysis_member(col)
    builder.reaction(member, builder.load_case("Thermal", "TEMPERATURE_T"), -99.0)
    combo = builder.load_case("1.2D+1.6L", predefined_type="LOAD_COMBINATION")
    builder.reaction(member, combo, -500.0)
    builder.reaction(member, builder.load_case("Dead", "DEAD_LOAD_G"), -100.0)
    result = read_columns(builder.model)
    assert _loads(result.members) == pytest.approx({"D": 100.0})
    assert any("'Thermal' ignored: ActionSource TEMPERATURE_T" in s for s in result.messages)
    assert any("'1.2D+1.6L' ignored: a load combination" in s for s in result.messages)


def test_several_cases_of_one_type(builder):
    col = _col(builder)
    member = builder.analysis_member(col)
    builder.reaction(member, builder.load_case("Self weight", "DEAD_LOAD_G"), -60.0)
    builder.reaction(member, builder.load_case("Finishes", "COMPLETION_G1"), -25.0)
    builder.reaction(member, builder.load_case("Wind +X", "WIND_W"), -12.0)
    builder.reaction(member, builder.load_case("Wind -X", "WIND_W"), 18.0)
    m = read_columns(builder.model).members
    # documented rule: dead cases add up; wind cases are alternatives, largest magnitude
    assert _loads(m) == pytest.approx({"D": 85.0, "W": -18.0})
    assert any("D from 2 load cases" in s and "added" in s for s in m.messages[0])


def test_global_coordinate_results_are_not_used(builder):
    col = _col(builder)
    member = builder.analysis_member(col)
    builder.reaction(member, builder.load_case("Dead", "DEAD_LOAD_G"), -100.0,
                     global_or_local="GLOBAL_COORDS")
    builder.loads(col, D=90.0)
    m = read_columns(builder.model).members
    assert _loads(m) == pytest.approx({"D": 90.0})
    assert any("global coordinates ignored" in s for s in m.messages[0])


def test_analysis_in_kilonewton_model(make_builder, schema):
    b = make_builder("m_kN", schema)
    col = _col(b)
    b.reaction(b.analysis_member(col), b.load_case("Dead", "DEAD_LOAD_G"), -100.0)
    # expected: the value given to the model above (input round trip)
    assert _loads(read_columns(b.model).members)["D"] == pytest.approx(100.0)


@pytest.mark.parametrize(
    ("name", "source", "action_type", "expected"),
    [
        ("anything", "DEAD_LOAD_G", "NOTDEFINED", "D"),
        ("anything", "COMPLETION_G1", "NOTDEFINED", "D"),
        ("anything", "LIVE_LOAD_Q", "NOTDEFINED", "L"),
        ("Roof live", "LIVE_LOAD_Q", "NOTDEFINED", "Lr"),
        ("anything", "SNOW_S", "NOTDEFINED", "S"),
        ("anything", "RAIN", "NOTDEFINED", "R"),
        ("anything", "WIND_W", "NOTDEFINED", "W"),
        ("anything", "EARTHQUAKE_E", "NOTDEFINED", "E"),
        ("E2", "NOTDEFINED", "NOTDEFINED", "E"),
        ("Seismic Y", "USERDEFINED", "NOTDEFINED", "E"),
        ("LR", "NOTDEFINED", "NOTDEFINED", "Lr"),
        ("Superimposed dead", "NOTDEFINED", "NOTDEFINED", "D"),
        ("anything", "ICE", "NOTDEFINED", None),
        ("D+L", "NOTDEFINED", "NOTDEFINED", None),
        ("Case 3", "NOTDEFINED", "VARIABLE_Q", None),
    ],
)
def test_load_type_table(builder, name, source, action_type, expected):
    case = builder.load_case(name, source, action_type)
    assert load_type(case)[0] == expected


# ------------------------------------------------------------------ CSV load table


def _table(tmp_path, text):
    path = tmp_path / "loads.csv"
    path.write_text(text)
    return read_load_table(path)


def test_table_by_global_id_tag_and_name(builder, tmp_path):
    c1 = _col(builder, "C1")
    _col(builder, "C2", tag="T2")
    _col(builder, "C3")
    path = _table(tmp_path, f"element,D,L\n{c1.GlobalId},10,20\nT2,30,\nC3,,5\n")
    m = read_columns(builder.model, loads_table=path).members
    # model force unit is the newton: 10 N etc. converted to kip (common practice)
    n_to_kip = 0.0002248089431
    assert _loads(m, 0) == pytest.approx({"D": 10 * n_to_kip, "L": 20 * n_to_kip})
    assert _loads(m, 1) == pytest.approx({"D": 30 * n_to_kip})
    assert _loads(m, 2) == pytest.approx({"L": 5 * n_to_kip})
    assert list(m.extra["load_source"]) == ["table"] * 3


def test_table_units_in_the_header(builder, tmp_path):
    _col(builder, "C1")
    path = _table(tmp_path, "element,D [kip],L [kN],S [lbf]\nC1,95,100,2000\n")
    m = read_columns(builder.model, loads_table=path).members
    assert _loads(m) == pytest.approx({"D": 95.0, "L": 100 * KIP_PER_KN, "S": 2.0})


def test_table_unknown_and_ambiguous_elements(builder, tmp_path):
    _col(builder, "C1")
    _col(builder, "Twin")
    _col(builder, "Twin")
    path = _table(tmp_path, "element,D [kip]\nC1,1\nNOPE,2\nTwin,3\nGHOST,4\n")
    result = read_columns(builder.model, loads_table=path)
    assert any("no column matches element(s) NOPE, GHOST" in s for s in result.messages)
    assert any("Twin (2 elements)" in s for s in result.messages)
    assert _loads(result.members, 0) == {"D": 1.0}
    assert _loads(result.members, 1) == {}


def test_table_without_units_for_a_model_without_a_force_unit_is_refused(
        make_builder, schema, tmp_path):
    # issue 13 item 3: such a table was read in newtons (D = 100 meaning kN gave PASS at
    # utilization 0.0001); units are never guessed, the fix is named.
    b = make_builder("mm_MPa", schema)
    _col(b, "C1")
    table = _table(tmp_path, "element,D,L [kN]\nC1,100,50\n")
    with pytest.raises(ModelReadError, match=r"column\(s\) D name no unit and the model "
                       r"declares no force unit; .*'D \[kN\]'.* --force-unit"):
        read_columns(b.model, loads_table=table)


def test_a_force_unit_given_apart_reads_a_table_without_units(make_builder, schema, tmp_path):
    b = make_builder("mm_MPa", schema)
    _col(b, "C1")
    path = tmp_path / "loads.csv"
    path.write_text("element,D,L [kip]\nC1,4.4482216152605,2\n")
    result = read_columns(b.model, loads_table=read_load_table(path, force_unit="kN"))
    # 4.4482216152605 kN = 1 kip (1 kip = 1000 lbf, 1 lbf = 4.4482216152605 N exactly;
    # common practice)
    assert _loads(result.members) == pytest.approx({"D": 1.0, "L": 2.0}, rel=1e-9)
    assert not any("force" in s for s in result.messages)


def test_a_path_is_refused(builder, tmp_path):
    # the CSV is parsed by the front end (service.load_table); the reader only matches rows
    _col(builder)
    with pytest.raises(TypeError, match="parsed load table"):
        read_columns(builder.model, loads_table=tmp_path / "loads.csv")


# ------------------------------------------------------------------ property set and order


def test_pset_loads(builder):
    col = _col(builder)
    builder.loads(col, D=50.0, Lr=5.0, E=-3.0)
    m = read_columns(builder.model).members
    assert _loads(m) == pytest.approx({"D": 50.0, "Lr": 5.0, "E": -3.0})
    assert m.extra["load_source"][0] == "pset"


def test_pset_loads_on_the_type_with_the_column_winning(builder):
    # docs/design.md §5: our input property sets are read on a column or its type; the
    # occurrence's value wins per property (common practice for IFC type/occurrence data).
    ctype = builder.column_type("CT1")
    builder.loads(ctype, D=40.0, L=20.0)
    prof = builder.profile("I", "W14X48", **W14X48)
    col = builder.column("C1", profile=prof, material=builder.material("A992"),
                         column_type=ctype)
    builder.loads(col, D=55.0)
    m = read_columns(builder.model).members
    assert _loads(m) == pytest.approx({"D": 55.0, "L": 20.0})
    assert m.extra["load_source"][0] == "pset"


def test_pset_unknown_property_is_noted(builder):
    col = _col(builder)
    builder.pset(col, "Stanchion_Loads", {"D": builder.measure("IfcForceMeasure", 1.0),
                                          "Dead": builder.measure("IfcForceMeasure", 2.0)})
    m = read_columns(builder.model).members
    assert any("Stanchion_Loads.Dead ignored" in s for s in m.messages[0])


def test_pset_load_of_the_wrong_type_is_a_reason(builder):
    col = _col(builder)
    builder.pset(col, "Stanchion_Loads", {"D": builder.measure("IfcLengthMeasure", 1.0)})
    assert "Stanchion_Loads.D is an IfcLengthMeasure" in \
        read_columns(builder.model).members.reason[0]


def test_precedence_analysis_table_pset(builder, tmp_path):
    col = _col(builder)
    builder.reaction(builder.analysis_member(col), builder.load_case("Dead", "DEAD_LOAD_G"),
                     -100.0)
    builder.loads(col, D=90.0, L=40.0, S=7.0)
    path = _table(tmp_path, "element,D [kip],L [kip]\nC1,95,45\n")
    m = read_columns(builder.model, loads_table=path).members
    assert _loads(m) == pytest.approx({"D": 100.0, "L": 45.0, "S": 7.0})
    assert m.extra["load_source"][0] == "analysis+table+pset"
    notes = " | ".join(m.messages[0])
    assert "D: analysis gives 100 kip, table gives 95 kip; analysis is used" in notes
    assert "D: analysis gives 100 kip, pset gives 90 kip; analysis is used" in notes
    assert "L: table gives 45 kip, pset gives 40 kip; table is used" in notes


def test_equal_values_are_no_conflict(builder, tmp_path):
    col = _col(builder)
    builder.loads(col, D=90.0)
    m = read_columns(builder.model,
                     loads_table=_table(tmp_path, "element,D [kip]\nC1,90\n")).members
    assert not any("gives" in s for s in m.messages[0])


def test_no_loads_is_a_reason(builder):
    _col(builder)
    m = read_columns(builder.model).members
    assert m.reason[0].startswith("no loads")
    assert m.extra["load_source"][0] == "none"


def test_results_connected_to_the_column_itself(builder):
    import ifcopenshell.api.structural

    col = _col(builder)
    case = builder.load_case("Dead", "DEAD_LOAD_G")
    load = builder.model.create_entity("IfcStructuralLoadSingleForce", Name="D",
                                       ForceX=builder.F(-64.0))
    cls = ("IfcStructuralPointReaction" if builder.schema == "IFC2X3"
           else "IfcStructuralCurveReaction")
    reaction = ifcopenshell.api.structural.add_structural_activity(
        builder.model, applied_load=load, structural_member=col, ifc_class=cls,
        predefined_type="CONST" if cls.endswith("CurveReaction") else None,
        global_or_local="LOCAL_COORDS")
    rel = builder._create("IfcRelAssignsToGroup")
    rel.RelatingGroup = builder.result_group(case)
    rel.RelatedObjects = [reaction]
    assert _loads(read_columns(builder.model).members) == pytest.approx({"D": 64.0})


def test_results_outside_a_result_group_are_noted(builder):
    col = _col(builder)
    member = builder.analysis_member(col)
    reaction = builder.reaction(member, builder.load_case("Dead", "DEAD_LOAD_G"), -10.0)
    rel = builder.model.by_type("IfcRelAssignsToGroup")[0]
    builder.model.remove(rel)
    builder.loads(col, D=1.0)
    m = read_columns(builder.model).members
    # expected: the value given to the model above (input round trip)
    assert _loads(m) == {"D": pytest.approx(1.0)}
    assert any("in no IfcStructuralResultGroup" in s for s in m.messages[0])
    assert reaction is not None


# ------------------------------------------------------------------ undeclared force unit


def _with_analysis(b):
    member = b.analysis_member(_col(b))
    b.reaction(member, b.load_case("Dead", "DEAD_LOAD_G", "PERMANENT_G"), -120.0)


def _with_pset(b):
    b.loads(_col(b), D=100.0)


@pytest.mark.parametrize("add_forces", [_with_analysis, _with_pset])
def test_forces_in_a_model_without_a_force_unit_are_refused(make_builder, schema, add_forces):
    # issue 13 item 3: with the force unit removed from the sample, its forces were read in
    # newtons and every column passed at utilization <= 0.002; units are never guessed.
    b = make_builder("mm_MPa", schema)
    add_forces(b)
    with pytest.raises(ModelReadError, match=r"^model declares no force unit but carries "
                       r"forces .*units are never guessed"):
        read_columns(b.model)


def test_a_model_without_a_force_unit_and_without_forces_is_read(make_builder, schema):
    # 14 of 17 real models declare no force unit and carry no forces (issue 13): still read.
    b = make_builder("mm_MPa", schema)
    _col(b)
    result = read_columns(b.model)
    assert len(result.members) == 1 and "no loads" in result.members.reason[0]
