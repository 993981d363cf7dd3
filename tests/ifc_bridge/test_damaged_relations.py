"""Relationships holding the wrong kind of value are refused (issue 13 item 6, fuzz findings).

An entity name changed to another name of the schema parses without an error (at most a
warning about the attribute count); a relationship pointing at it then holds an instance of
the wrong class, or a text where instances belong.  Before ``ifc_bridge/relations.py``
checked them, such a model either lost the link silently (a damaged analysis result: the
column was checked with its dead load only) or stopped with a traceback.  The models are built
with ifcopenshell.api and damaged in their STEP text, as the fuzz test's mutants are.
"""

from __future__ import annotations

import re
import warnings
from pathlib import Path

import pytest

from stanchion.ifc_bridge.errors import ModelReadError
from stanchion.ifc_bridge.model import open_model
from stanchion.ifc_bridge.read import read_columns

W14X48 = {"d": 13.8, "bf": 8.03, "tw": 0.340, "tf": 0.595}  # AISC Shapes Database v16.0


def _model_with_results(builder, path: Path) -> tuple[str, int, int]:
    """A column with dead and live analysis results; (text, live reaction id, its rel id)."""
    col = builder.column("C1", profile=builder.profile("I", "W14X48", **W14X48),
                         material=builder.material("A992"))
    member = builder.analysis_member(col)
    builder.reaction(member, builder.load_case("Dead", "DEAD_LOAD_G", "PERMANENT_G"), -120.0)
    live = builder.reaction(member, builder.load_case("Live", "LIVE_LOAD_Q", "VARIABLE_Q"),
                            -80.0)
    rel = next(r for r in builder.model.by_type("IfcRelConnectsStructuralActivity")
               if r.RelatedStructuralActivity == live)
    builder.write(path)
    return path.read_text(), live.id(), rel.id()


def _retype(text: str, entity: int, new: str) -> str:
    """``text`` with entity ``#entity``'s class name replaced by ``new``."""
    changed, count = re.subn(rf"^#{entity}=IFC\w+\(", f"#{entity}={new}(", text,
                             flags=re.MULTILINE)
    assert count == 1
    return changed


def test_intact_model_reads_both_loads(builder, tmp_path: Path) -> None:
    text, _, _ = _model_with_results(builder, tmp_path / "m.ifc")
    members = read_columns(open_model(tmp_path / "m.ifc")).members
    # the two results as built (-ForceX, tension positive): D 120 kip, L 80 kip
    assert members.loads[0][0] == pytest.approx(120.0, rel=1e-6)
    assert members.loads[0][1] == pytest.approx(80.0, rel=1e-6)


def test_result_link_to_an_instance_of_another_class_is_refused(builder, tmp_path: Path) -> None:
    text, live, rel = _model_with_results(builder, tmp_path / "m.ifc")
    damaged = tmp_path / "damaged.ifc"
    damaged.write_text(_retype(text, live, "IFCCARTESIANPOINT"))
    # before: the live load vanished and the column was checked with D = 120 kip alone
    with pytest.raises(ModelReadError) as err:
        read_columns(open_model(damaged))
    assert str(err.value) == (
        f"damaged model: #{rel} IfcRelConnectsStructuralActivity.RelatedStructuralActivity "
        f"holds #{live}, an IfcCartesianPoint, where an IfcStructuralActivity belongs")


def test_relationship_retyped_into_another_is_refused_without_traceback(
        builder, tmp_path: Path) -> None:
    text, _, rel = _model_with_results(builder, tmp_path / "m.ifc")
    damaged = tmp_path / "damaged.ifc"
    # the fuzz test's case: before, AttributeError 'str' object has no attribute 'id'
    damaged.write_text(_retype(text, rel, "IFCRELDEFINESBYTYPE"))
    with pytest.raises(ModelReadError, match=rf"^damaged model: #{rel} IfcRelDefinesByType\."):
        read_columns(open_model(damaged))


def test_result_whose_load_is_another_class_leaves_the_column_not_checked(
        builder, tmp_path: Path) -> None:
    text, live, _ = _model_with_results(builder, tmp_path / "m.ifc")
    force = builder.model.by_id(live).AppliedLoad.id()
    damaged = tmp_path / "damaged.ifc"
    damaged.write_text(_retype(text, force, "IFCCARTESIANPOINT"))
    # before: the live load vanished and the column was checked with D = 120 kip alone
    members = read_columns(open_model(damaged)).members
    cls = builder.model.by_id(live).is_a()
    assert members.reason[0] == (
        f"element could not be read (ModelReadError: damaged model: #{live} {cls} holds "
        f"#{force}, an IfcCartesianPoint, where an IfcStructuralLoad belongs)")


def test_result_connected_to_nothing_is_a_run_message(builder, tmp_path: Path) -> None:
    text, live, rel = _model_with_results(builder, tmp_path / "m.ifc")
    damaged = tmp_path / "damaged.ifc"
    # the fuzz test's case: the connecting line deleted; nothing refers to it, so the parser
    # cannot tell; before, the column was checked with D = 120 kip alone and no word
    damaged.write_text(re.sub(rf"^#{rel}=.*\n", "", text, flags=re.MULTILINE))
    read = read_columns(open_model(damaged))
    assert read.members.loads[0][1] != read.members.loads[0][1]  # L: NaN, not read
    assert (f"1 analysis result(s) in result groups (#{live}) are connected to no member or "
            "element, so no column uses their forces (an IfcRelConnectsStructuralActivity "
            "missing or damaged?)") in read.messages


def test_material_name_holding_an_instance_is_no_name(builder, tmp_path: Path) -> None:
    if builder.schema == "IFC2X3":
        pytest.skip("IfcMaterialProfileSetUsage is IFC4 and later")
    builder.column("C1", profile=builder.profile("I", "W14X48", **W14X48),
                   material=builder.material("A992"))
    text = builder.write(tmp_path / "m.ifc").read_text()
    usage = builder.model.by_type("IfcMaterialProfileSetUsage")[0].id()
    damaged = tmp_path / "damaged.ifc"
    # the fuzz test's case: the usage line renamed IFCMATERIAL, whose Name is then #set;
    # before, TypeError from material_text stopped the whole read
    damaged.write_text(_retype(text, usage, "IFCMATERIAL"))
    members = read_columns(open_model(damaged)).members
    assert members.reason[0] is not None and "no yield strength" in members.reason[0]


def test_unit_whose_factor_is_another_class_is_refused(tmp_path: Path) -> None:
    """The fuzz test's case on the IFC2X3 sample: the inch's IfcMeasureWithUnit retyped.

    Before: AttributeError 'IfcAxis2Placement3D' has no attribute 'ValueComponent' from
    ifcopenshell.util.unit, a traceback.
    """
    sample = Path(__file__).resolve().parents[2] / "sample_models" / "garden_pavilion.ifc"
    text = sample.read_text()
    factor = re.search(r"^#(\d+)=IFCMEASUREWITHUNIT\(IFCREAL\(0\.0254\)", text, re.MULTILINE)
    assert factor is not None
    damaged = tmp_path / "damaged.ifc"
    damaged.write_text(_retype(text, int(factor.group(1)), "IFCAXIS2PLACEMENT3D"))
    with pytest.raises(ModelReadError, match=r"^damaged model: its length unit #\d+, an "
                       r"IfcConversionBasedUnit, cannot be read \(.*ValueComponent"):
        read_columns(open_model(damaged))


def test_force_given_as_text_leaves_the_column_not_checked(builder, tmp_path: Path) -> None:
    text, live, _ = _model_with_results(builder, tmp_path / "m.ifc")
    force = builder.model.by_id(live).AppliedLoad.id()
    damaged = tmp_path / "damaged.ifc"
    # the fuzz test's case: ForceX written 'NaN' (a text); before, float('NaN') dropped the
    # live load without a word and the column was checked with D = 120 kip alone
    changed, count = re.subn(rf"^(#{force}=IFCSTRUCTURALLOADSINGLEFORCE\('[^']*',)[^,]+,",
                             r"\1'NaN',", text, flags=re.MULTILINE)
    assert count == 1
    damaged.write_text(changed)
    members = read_columns(open_model(damaged)).members
    assert members.reason[0] == (
        f"element could not be read (ModelReadError: damaged model: #{force} "
        "IfcStructuralLoadSingleForce.ForceX holds 'NaN', not a finite number)")


def test_zero_placement_direction_gives_no_numpy_warning(tmp_path: Path) -> None:
    """The fuzz test's case: a parent placement's Axis (0, 0, 1) written (0, 0, 0).

    Before, ifcopenshell.util.placement's normalisation printed "RuntimeWarning: invalid
    value encountered in divide" on stderr; the plan position is then unknown (NaN).
    """
    sample = Path(__file__).resolve().parents[2] / "sample_models" / "garden_pavilion.ifc"
    text = sample.read_text()
    assert "#37=IFCDIRECTION((0.,0.,1.));" in text  # the axis of the site's placement
    damaged = tmp_path / "damaged.ifc"
    damaged.write_text(text.replace("#37=IFCDIRECTION((0.,0.,1.));",
                                    "#37=IFCDIRECTION((0.,0.,0.));"))
    with warnings.catch_warnings(record=True) as caught:
        warnings.simplefilter("always")  # recorded, not raised: the reader catches errors
        members = read_columns(open_model(damaged)).members
    assert [str(w.message) for w in caught] == []
    assert len(members) == 8  # sample_models/README.md: 8 columns


def test_profile_material_of_another_class_leaves_the_column_not_checked(
        builder, tmp_path: Path) -> None:
    if builder.schema == "IFC2X3":
        pytest.skip("IfcMaterialProfile is IFC4 and later")
    builder.column("C1", profile=builder.profile("I", "W14X48", **W14X48),
                   material=builder.material("A992"))
    text = builder.write(tmp_path / "m.ifc").read_text()
    material = builder.model.by_type("IfcMaterial")[0].id()
    damaged = tmp_path / "damaged.ifc"
    # the fuzz test's case: the material line renamed; before, AttributeError 'Name' from
    # material_text stopped the whole read
    damaged.write_text(_retype(text, material, "IFCCARTESIANPOINT"))
    members = read_columns(open_model(damaged)).members
    assert members.reason[0] is not None and members.reason[0].startswith(
        f"damaged model: #{material}, an IfcCartesianPoint, stands where an IfcMaterial "
        "belongs")
