"""Writing check results into IFC models: typed values, units, reruns, schema validity.

Results are built directly (a MemberTable and CheckResults with chosen numbers), so what is
tested here is the writer alone: the expected property values are those numbers converted
into the model's force unit with pint (engine.units.factor; common practice, no source).
"""

from __future__ import annotations

import gc
from collections import Counter

import ifcopenshell
import ifcopenshell.guid
import ifcopenshell.ifcopenshell_wrapper
import ifcopenshell.util.element
import ifcopenshell.util.unit
import ifcopenshell.validate
import numpy as np
import pytest

from stanchion.engine.check import CheckResults
from stanchion.engine.members import MemberTable
from stanchion.engine.sections import SectionTable
from stanchion.ifc_bridge.write import (
    ATTRIBUTE_INDEX,
    NOT_IN_TABLE,
    PSET_NAME,
    existing_sets,
    new_guids,
    read_results,
    write_results,
)

BASIS = "AISC 360-22 Chapter E, LRFD; ASCE 7-22 combinations"
DISCLAIMER = "review by a licensed engineer required"

# Three members: pass, fail, not checked (values chosen for the test, in kip).
STATUS = ["pass", "fail", "not_checked"]
REQUIRED = [100.0, 400.0, np.nan]
AVAILABLE = [300.0, 300.0, np.nan]


def _results(status=STATUS, required=REQUIRED, available=AVAILABLE, reason=None,
             messages=None) -> CheckResults:
    n = len(status)
    req, avail = np.array(required, float), np.array(available, float)
    checked = np.array([s != "not_checked" for s in status])
    return CheckResults(
        method="LRFD",
        status=np.array(status, dtype=object),
        required_strength=req,
        available_strength=avail,
        utilization=req / avail,
        limit_state=np.where(checked, "flexural buckling about y", "").astype(object),
        combination=np.where(checked, "1.4D", "").astype(object),
        slenderness=np.where(checked, 61.5, np.nan),
        Fcr=np.where(checked, 32.0, np.nan),
        Ae=np.where(checked, 14.1, np.nan),
        reason=np.array(reason if reason is not None else
                        [None if c else "no loads" for c in checked], dtype=object),
        messages=messages if messages is not None else [[] for _ in range(n)],
    )


def _members(ids: list[str], labels: list[str] | None = None) -> MemberTable:
    n = len(ids)
    return MemberTable.build(ids, SectionTable.empty(), np.full(n, -1), np.full(n, 50.0),
                             np.full(n, 144.0), section_label=labels or ["W14X48"] * n)


def _columns(builder, n: int = 3) -> list:
    return [builder.column(f"C{i}", at=(i * 240.0, 0.0)) for i in range(n)]


def _props(model, element) -> dict:
    return ifcopenshell.util.element.get_psets(model.by_guid(element.GlobalId))[PSET_NAME]


def _types(model, element) -> dict[str, str]:
    """Property name -> IFC type of the nominal value."""
    sets = existing_sets(model)[element.id()]
    assert len(sets) == 1
    return {p.Name: p.NominalValue.is_a() for p in sets[0][1].HasProperties}


def _schema_errors(path) -> list[dict]:
    logger = ifcopenshell.validate.json_logger()
    ifcopenshell.validate.validate(str(path), logger)
    return [s for s in logger.statements if s["level"] in ("error", "ERROR")]


def _write(builder, cols, results=None, **kw):
    return write_results(builder.model, _members([c.GlobalId for c in cols]),
                         results or _results(), design_basis=BASIS, disclaimer=DISCLAIMER,
                         **kw)


@pytest.mark.parametrize("units", ["mm_N", "m_kN", "in_kip"])
def test_values_are_typed_and_in_the_model_force_unit(make_builder, units) -> None:
    b = make_builder(units)
    cols = _columns(b)
    summary = _write(b, cols, checked_at="2026-01-02T03:04:05+00:00")
    assert summary.written == 3 and summary.updated == 0 and not summary.added_force_unit

    passed, failed, skipped = (_props(b.model, c) for c in cols)
    assert passed["Status"] == "PASS" and failed["Status"] == "FAIL"
    assert skipped["Status"] == "NOT CHECKED"
    # 100 and 300 kip in the model's force unit (pint factor; common practice, no source).
    assert passed["RequiredStrength"] == pytest.approx(b.F(100.0), rel=1e-9)
    assert passed["AvailableStrength"] == pytest.approx(b.F(300.0), rel=1e-9)
    assert failed["Utilization"] == pytest.approx(400.0 / 300.0)
    assert passed["Slenderness"] == pytest.approx(61.5)
    assert passed["GoverningCombination"] == "1.4D"
    assert passed["GoverningLimitState"] == "flexural buckling about y"
    assert passed["Section"] == "W14X48"
    assert passed["DesignBasis"] == BASIS and passed["Disclaimer"] == DISCLAIMER
    assert passed["CheckedAt"] == "2026-01-02T03:04:05+00:00"
    assert "Reason" not in passed

    types = _types(b.model, cols[0])
    assert types["Status"] == "IfcLabel"
    assert types["Utilization"] == "IfcRatioMeasure"
    assert types["RequiredStrength"] == types["AvailableStrength"] == "IfcForceMeasure"
    assert types["Slenderness"] == "IfcRatioMeasure"
    assert types["DesignBasis"] == types["Section"] == types["GoverningCombination"] == "IfcLabel"
    assert types["Disclaimer"] == "IfcText"
    assert types["CheckedAt"] == ("IfcLabel" if b.schema == "IFC2X3" else "IfcDateTime")
    assert "IfcReal" not in types.values()


def test_not_checked_column_carries_the_reason_and_no_numbers(builder) -> None:
    cols = _columns(builder)
    _write(builder, cols)
    props = _props(builder.model, cols[2])
    assert props["Reason"] == "no loads"
    assert _types(builder.model, cols[2])["Reason"] == "IfcText"
    for key in ("Utilization", "RequiredStrength", "AvailableStrength", "Slenderness",
                "GoverningCombination", "GoverningLimitState"):
        assert key not in props


def test_messages_become_notes(builder) -> None:
    cols = _columns(builder)
    _write(builder, cols, _results(messages=[["first note", "second note"], [], []]))
    assert _props(builder.model, cols[0])["Notes"] == "first note; second note"
    assert "Notes" not in _props(builder.model, cols[1])


def test_force_unit_added_once_when_the_model_declares_none(make_builder) -> None:
    b = make_builder("mm_MPa")
    model = b.model
    assert ifcopenshell.util.unit.get_project_unit(model, "FORCEUNIT") is None
    cols = _columns(b)
    summary = _write(b, cols)
    assert summary.added_force_unit and summary.force_unit == "NEWTON"
    unit = ifcopenshell.util.unit.get_project_unit(model, "FORCEUNIT")
    assert unit.is_a("IfcSIUnit") and unit.Name == "NEWTON" and unit.Prefix is None
    # 100 kip in newton (pint; common practice, no source).
    assert _props(model, cols[0])["RequiredStrength"] == pytest.approx(
        b.F(100.0), rel=1e-9)
    again = _write(b, cols)
    assert not again.added_force_unit
    forces = [u for u in model.by_type("IfcProject")[0].UnitsInContext.Units
              if getattr(u, "UnitType", None) == "FORCEUNIT"]
    assert len(forces) == 1
    # the other units are untouched: millimetre length is still there
    length = ifcopenshell.util.unit.get_project_unit(model, "LENGTHUNIT")
    assert length.Prefix == "MILLI"


def test_rerun_replaces_values_without_duplicating(builder) -> None:
    model = builder.model
    cols = _columns(builder)
    _write(builder, cols)
    counts = Counter(e.is_a() for e in model)
    # Second run: member 0 now fails, member 2 is now checked and passes.
    changed = _results(status=["fail", "fail", "pass"], required=[350.0, 400.0, 150.0],
                       available=[300.0, 300.0, 300.0])
    summary = _write(builder, cols, changed)
    assert summary.updated == 3 and summary.written == 3
    after = Counter(e.is_a() for e in model)
    for cls in ("IfcPropertySet", "IfcRelDefinesByProperties", "IfcOwnerHistory"):
        assert after[cls] == counts[cls]  # no second set
    # one property per name and set: member 2 lost Reason and gained eight numbers/labels
    sets = [existing_sets(model)[c.id()][0][1] for c in cols]
    names = [[p.Name for p in s.HasProperties] for s in sets]
    assert all(len(n) == len(set(n)) for n in names)
    # every property in the model belongs to one of the sets (none orphaned; IFC rule: a
    # property is used through the sets that list it)
    used = {p.id() for s in sets for p in s.HasProperties}
    assert after["IfcPropertySingleValue"] == len(used)
    first, _, third = (_props(model, c) for c in cols)
    assert first["Status"] == "FAIL"
    assert first["Utilization"] == pytest.approx(350.0 / 300.0)
    assert third["Status"] == "PASS" and "Reason" not in third
    assert third["RequiredStrength"] == pytest.approx(builder.F(150.0), rel=1e-9)
    for c in cols:
        assert len(existing_sets(model)[c.id()]) == 1
    # a third identical run changes nothing at all
    before = Counter(e.is_a() for e in model)
    _write(builder, cols, changed)
    assert Counter(e.is_a() for e in model) == before


def test_grid_location_is_written_and_replaced_on_a_rerun(builder) -> None:
    """GridLocation (issue 15 item 1): an IfcLabel per column, updated in place on a rerun."""
    model = builder.model
    cols = _columns(builder)
    ids = [c.GlobalId for c in cols]

    def write(grids):
        members = MemberTable.build(
            ids, SectionTable.empty(), np.full(3, -1), np.full(3, 50.0), np.full(3, 144.0),
            section_label=["W14X48"] * 3, extra={"grid": np.array(grids, dtype=object)})
        write_results(model, members, _results(), design_basis=BASIS, disclaimer=DISCLAIMER)

    write(["A-1", "B-1 (+600, 0 mm)", None])
    first, second, third = (_props(model, c) for c in cols)
    assert first["GridLocation"] == "A-1" and second["GridLocation"] == "B-1 (+600, 0 mm)"
    assert "GridLocation" not in third
    assert _types(model, cols[0])["GridLocation"] == "IfcLabel"
    before = Counter(e.is_a() for e in model)
    write(["A-2", None, "C-1"])
    first, second, third = (_props(model, c) for c in cols)
    assert (first["GridLocation"], third["GridLocation"]) == ("A-2", "C-1")
    assert "GridLocation" not in second
    after = Counter(e.is_a() for e in model)
    assert after["IfcPropertySet"] == before["IfcPropertySet"]  # no second set
    assert after["IfcPropertySingleValue"] == before["IfcPropertySingleValue"]  # none orphaned
    assert [len(existing_sets(model)[c.id()]) for c in cols] == [1, 1, 1]


def test_duplicate_and_shared_sets_are_cleaned_up(builder) -> None:
    model = builder.model
    cols = _columns(builder)
    # an old set shared by columns 0 and 1, plus a second copy on column 0
    history = model.by_type("IfcOwnerHistory")[0] if builder.schema == "IFC2X3" else None
    for related in ([cols[0], cols[1]], [cols[0]]):
        label = model.create_entity("IfcLabel", "OLD")
        prop = model.create_entity("IfcPropertySingleValue", Name="Status", NominalValue=label)
        pset = model.create_entity("IfcPropertySet", GlobalId=ifcopenshell.guid.new(),
                                   OwnerHistory=history, Name=PSET_NAME, HasProperties=[prop])
        model.create_entity("IfcRelDefinesByProperties", GlobalId=ifcopenshell.guid.new(),
                            OwnerHistory=history, RelatedObjects=related,
                            RelatingPropertyDefinition=pset)
    assert len(existing_sets(model)[cols[0].id()]) == 2
    summary = _write(builder, cols)
    assert summary.removed_duplicates == 1
    sets = existing_sets(model)
    for c in cols:
        assert len(sets[c.id()]) == 1
        rel, _ = sets[c.id()][0]
        assert [o.id() for o in rel.RelatedObjects] == [c.id()]
    assert _props(model, cols[1])["Status"] == "FAIL"
    assert _props(model, cols[0])["Status"] == "PASS"


def test_columns_missing_from_the_table_are_marked_not_checked(builder) -> None:
    cols = _columns(builder, 4)
    summary = write_results(builder.model, _members([c.GlobalId for c in cols[:3]] + ["nope"]),
                            _results(STATUS + ["pass"], REQUIRED + [1.0], AVAILABLE + [2.0]),
                            design_basis=BASIS, disclaimer=DISCLAIMER)
    assert summary.missing == ["nope"] and summary.not_in_table == 1
    props = _props(builder.model, cols[3])
    assert props["Status"] == "NOT CHECKED" and props["Reason"] == NOT_IN_TABLE


def test_force_unit_factor_must_match_the_model(make_builder) -> None:
    b = make_builder("in_kip")
    cols = _columns(b)
    with pytest.raises(ValueError, match="force unit"):
        _write(b, cols, force_unit_factor=1.0 / 4448.2216)  # newton -> kip, but model is kip
    _write(b, cols, force_unit_factor=1.0)  # kip model: factor 1 (kip -> kip)


def test_owner_history_where_the_schema_needs_it(builder) -> None:
    model = builder.model
    cols = _columns(builder)
    _write(builder, cols)
    for c in cols:
        rel, pset = existing_sets(model)[c.id()][0]
        if builder.schema == "IFC2X3":
            assert pset.OwnerHistory is not None and rel.OwnerHistory is not None
            assert pset.OwnerHistory.OwningApplication.ApplicationIdentifier == "stanchion"
    histories = len(model.by_type("IfcOwnerHistory"))
    _write(builder, cols)
    assert len(model.by_type("IfcOwnerHistory")) == histories  # found again, not re-added


def test_output_passes_schema_validation_and_keeps_every_entity(builder, tmp_path) -> None:
    cols = _columns(builder, 5)
    builder.loads(cols[0], D=10.0)
    src = builder.write(tmp_path / "in.ifc")
    model = ifcopenshell.open(str(src))
    before = Counter(e.is_a() for e in model)
    guids = {e.GlobalId for e in model.by_type("IfcRoot")}
    members = _members([c.GlobalId for c in cols[:3]])
    write_results(model, members, _results(), design_basis=BASIS, disclaimer=DISCLAIMER,
                  checked_at="2026-01-02T03:04:05Z")
    out = tmp_path / "out.ifc"
    model.write(str(out))
    assert _schema_errors(out) == []

    written = ifcopenshell.open(str(out))
    after = Counter(e.is_a() for e in written)
    assert guids <= {e.GlobalId for e in written.by_type("IfcRoot")}
    added = after - before
    assert not (before - after)  # nothing of the input is lost
    allowed = {"IfcPropertySet", "IfcPropertySingleValue", "IfcRelDefinesByProperties",
               "IfcOwnerHistory", "IfcApplication", "IfcOrganization"}
    assert set(added) <= allowed
    assert added["IfcPropertySet"] == 5  # three checked members + two unlisted columns
    assert set(read_results(written)) == {c.GlobalId for c in cols}
    # a rerun on the written model adds nothing
    write_results(written, members, _results(), design_basis=BASIS, disclaimer=DISCLAIMER,
                  checked_at="2026-01-03T00:00:00Z")
    assert Counter(e.is_a() for e in written) == after


def test_validation_detects_a_broken_set(builder, tmp_path) -> None:
    """The validity check above can fail: a property set without its GlobalId is an error."""
    cols = _columns(builder, 1)
    write_results(builder.model, _members([cols[0].GlobalId]), _results(["pass"], [1.0], [2.0]),
                  design_basis=BASIS, disclaimer=DISCLAIMER)
    assert _schema_errors(builder.write(tmp_path / "fine.ifc")) == []
    pset = existing_sets(builder.model)[cols[0].id()][0][1]
    pset.GlobalId = None
    out = tmp_path / "broken.ifc"
    builder.model.write(str(out))
    assert _schema_errors(out)


# ---------------------------------------------------------------------------- shared properties
# IFC rule (IFC4 / IFC4X3 IfcProperty.PartOfPset: SET [0:?] OF IfcPropertySet; IFC2X3 sets no
# limit): one property entity may be listed by several property sets.

CONSTANT = ("DesignBasis", "Disclaimer", "CheckedAt")


def _ours(model) -> list:
    """Every property set called Stanchion_ColumnCheck."""
    return [s for s in model.by_type("IfcPropertySet") if s.Name == PSET_NAME]


def _entities_named(model, name: str) -> list:
    return [p for p in model.by_type("IfcPropertySingleValue") if p.Name == name]


def _orphans(model) -> list:
    """Single values that no entity refers to (no set lists them)."""
    return [p for p in model.by_type("IfcPropertySingleValue")
            if model.get_total_inverses(p) == 0]


def test_values_equal_on_every_column_are_one_shared_entity(builder) -> None:
    model = builder.model
    cols = _columns(builder)
    summary = _write(builder, cols, checked_at="2026-01-02T03:04:05+00:00")
    sets = _ours(model)
    assert len(sets) == 3
    for name in CONSTANT:
        entities = _entities_named(model, name)
        assert len(entities) == 1, name  # one entity in the whole model
        assert {s.id() for s in model.get_inverse(entities[0])} == {s.id() for s in sets}
        assert name in summary.shared
    # Status differs between the columns (pass, fail, not checked): one entity per set
    assert len(_entities_named(model, "Status")) == 3 and "Status" not in summary.shared
    # each set still shows every value (what a viewer lists is unchanged by the sharing)
    for c in cols:
        props = _props(model, c)
        assert props["DesignBasis"] == BASIS and props["Disclaimer"] == DISCLAIMER
        assert props["CheckedAt"] == "2026-01-02T03:04:05+00:00"


def test_results_equal_on_every_column_are_shared_too(builder) -> None:
    model = builder.model
    cols = _columns(builder)
    passing = _results(status=["pass"] * 3, required=[100.0, 120.0, 140.0],
                       available=[300.0] * 3)
    summary = _write(builder, cols, passing)
    # every column: PASS, W14X48, 1.4D, flexural buckling about y, slenderness 61.5 and an
    # available strength of 300 kip (chosen above); the other numbers differ
    for name in ("Status", "Section", "GoverningCombination", "GoverningLimitState",
                 "Slenderness", "AvailableStrength"):
        assert name in summary.shared
        assert len(_entities_named(model, name)) == 1, name
    for name in ("Utilization", "RequiredStrength"):
        assert name not in summary.shared and len(_entities_named(model, name)) == 3
    assert [_props(model, c)["RequiredStrength"] for c in cols] == pytest.approx(
        [builder.F(100.0), builder.F(120.0), builder.F(140.0)], rel=1e-9)


def test_rerun_keeps_one_shared_entity_and_leaves_no_orphans(builder) -> None:
    model = builder.model
    cols = _columns(builder)
    _write(builder, cols, checked_at="2026-01-02T03:04:05+00:00")
    first = {name: _entities_named(model, name)[0].id() for name in CONSTANT}
    counts = Counter(e.is_a() for e in model)
    _write(builder, cols, checked_at="2026-02-03T04:05:06+00:00")
    for name in CONSTANT:
        entities = _entities_named(model, name)
        assert [e.id() for e in entities] == [first[name]]  # the same entity, not a copy
        assert model.get_total_inverses(entities[0]) == 3
    assert {_props(model, c)["CheckedAt"] for c in cols} == {"2026-02-03T04:05:06+00:00"}
    assert _orphans(model) == []
    assert Counter(e.is_a() for e in model) == counts  # nothing added, nothing left behind


def test_rerun_when_a_shared_value_starts_to_differ(builder) -> None:
    model = builder.model
    cols = _columns(builder)
    _write(builder, cols, _results(status=["pass"] * 3, required=[100.0] * 3,
                                   available=[300.0] * 3))
    assert len(_entities_named(model, "Status")) == 1
    # second run: column 1 fails -- Status is no longer the same everywhere
    changed = _results(status=["pass", "fail", "pass"], required=[100.0, 400.0, 100.0],
                       available=[300.0] * 3)
    summary = _write(builder, cols, changed)
    assert "Status" not in summary.shared
    assert sorted(p.NominalValue.wrappedValue for p in _entities_named(model, "Status")) == [
        "FAIL", "PASS", "PASS"]
    assert [_props(model, c)["Status"] for c in cols] == ["PASS", "FAIL", "PASS"]
    assert _orphans(model) == []
    for s in _ours(model):
        names = [p.Name for p in s.HasProperties]
        assert len(names) == len(set(names))
    # and back: every column passes again -> one shared Status, the per-set ones removed
    _write(builder, cols, _results(status=["pass"] * 3, required=[100.0] * 3,
                                   available=[300.0] * 3))
    assert len(_entities_named(model, "Status")) == 1
    assert _orphans(model) == []


def test_rerun_on_sets_with_a_copy_per_column_shares_them(builder) -> None:
    """A set written with its own DesignBasis / Disclaimer per column (as before sharing)."""
    model = builder.model
    cols = _columns(builder)
    history = model.by_type("IfcOwnerHistory")[0] if builder.schema == "IFC2X3" else None
    for c in cols:
        props = [model.create_entity("IfcPropertySingleValue", Name=name,
                                     NominalValue=model.create_entity(ifc_type, text))
                 for name, ifc_type, text in (("Status", "IfcLabel", "PASS"),
                                              ("DesignBasis", "IfcLabel", "old basis"),
                                              ("Disclaimer", "IfcText", "old disclaimer"))]
        pset = model.create_entity("IfcPropertySet", GlobalId=ifcopenshell.guid.new(),
                                   OwnerHistory=history, Name=PSET_NAME, HasProperties=props)
        model.create_entity("IfcRelDefinesByProperties", GlobalId=ifcopenshell.guid.new(),
                            OwnerHistory=history, RelatedObjects=[c],
                            RelatingPropertyDefinition=pset)
    summary = _write(builder, cols)
    assert summary.updated == 3 and summary.removed_properties == 4  # 2 names x 2 copies
    for name, text in (("DesignBasis", BASIS), ("Disclaimer", DISCLAIMER)):
        entities = _entities_named(model, name)
        assert len(entities) == 1 and entities[0].NominalValue.wrappedValue == text
        assert model.get_total_inverses(entities[0]) == 3
    assert _orphans(model) == []
    assert len(_ours(model)) == 3


def test_shared_entity_of_a_set_not_rewritten_is_left_alone(builder) -> None:
    """A set of an earlier run that this run does not rewrite keeps its own values."""
    model = builder.model
    cols = _columns(builder)
    _write(builder, cols, checked_at="2026-01-02T03:04:05+00:00")
    # second run over columns 0 and 1 only, and no NOT CHECKED marking of the others
    write_results(model, _members([c.GlobalId for c in cols[:2]]),
                  _results(STATUS[:2], REQUIRED[:2], AVAILABLE[:2]), design_basis=BASIS,
                  disclaimer=DISCLAIMER, checked_at="2026-02-03T04:05:06+00:00",
                  mark_unlisted_columns=False)
    assert _props(model, cols[2])["CheckedAt"] == "2026-01-02T03:04:05+00:00"
    assert [_props(model, c)["CheckedAt"] for c in cols[:2]] == [
        "2026-02-03T04:05:06+00:00"] * 2
    assert len(_entities_named(model, "CheckedAt")) == 2  # the old one, still used, and ours
    assert _orphans(model) == []


def test_written_inside_a_transaction_undoes_completely(builder) -> None:
    """With a transaction open the public create/set path records every change."""
    model = builder.model
    cols = _columns(builder)
    before = Counter(e.is_a() for e in model)
    model.begin_transaction()
    _write(builder, cols, checked_at="2026-01-02T03:04:05+00:00")
    model.end_transaction()
    assert _props(model, cols[0])["CheckedAt"] == "2026-01-02T03:04:05+00:00"
    assert len(_entities_named(model, "CheckedAt")) == 1
    model.undo()
    assert Counter(e.is_a() for e in model) == before


def test_attribute_positions_match_every_schema(schema) -> None:
    """The writer sets attributes by position; the positions are the schema's (IFC rule)."""
    declarations = ifcopenshell.ifcopenshell_wrapper.schema_by_name(
        ifcopenshell.file(schema=schema).schema_identifier)
    for ifc_class, attributes in ATTRIBUTE_INDEX.items():
        names = [a.name() for a in declarations.declaration_by_name(ifc_class).all_attributes()]
        for name, index in attributes.items():
            assert names[index] == name, (ifc_class, name)


def test_new_guids_are_valid_ifc_globalids() -> None:
    # IFC GlobalId: a 128-bit number in 22 characters of the IFC base-64 alphabet (IFC rule);
    # ifcopenshell.guid.expand / compress are the reference conversion.
    ids = new_guids(2000)
    assert len(set(ids)) == 2000
    for gid in ids:
        assert len(gid) == 22 and gid[0] in "0123"
        hex_id = ifcopenshell.guid.expand(gid)
        assert ifcopenshell.guid.compress(hex_id) == gid
        assert hex_id[12] == "4" and hex_id[16] in "89ab"  # UUID version 4, RFC 4122 variant
    assert new_guids(0) == []


def test_garbage_collector_state_is_restored(builder) -> None:
    cols = _columns(builder)
    assert gc.isenabled()
    _write(builder, cols)
    assert gc.isenabled()
    gc.disable()
    try:
        _write(builder, cols)
        assert not gc.isenabled()
    finally:
        gc.enable()
