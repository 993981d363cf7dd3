"""read_columns: identity, placement, element selection, unit independence, robustness."""

from __future__ import annotations

import math

import numpy as np
import pytest

from stanchion.ifc_bridge.read import read_columns

# W14X48, AISC Shapes Database v16.0: d, bf, tw, tf (in); A = 14.1 in²
W14X48 = {"d": 13.8, "bf": 8.03, "tw": 0.340, "tf": 0.595}
W14X48_A = 14.1  # in², AISC Shapes Database v16.0


def standard_column(b, name="C1", **kw):
    """A W14X48 ASTM A992 column, 144 in long, with D = 100 and L = 50 kip."""
    profile = b.profile("I", "W14X48", **W14X48)
    steel = b.material("ASTM A992", fy=50.0)
    col = b.column(name, profile=profile, material=steel, **kw)
    b.loads(col, D=100.0, L=50.0)
    return col


def test_identity_columns(builder):
    col = standard_column(builder, tag="T-7", at=(120.0, 240.0), storey="Level 2")
    result = read_columns(builder.model)
    m = result.members
    assert len(m) == 1
    assert m.id[0] == col.GlobalId
    assert m.name[0] == "C1"
    assert m.extra["global_id"][0] == col.GlobalId
    assert m.extra["tag"][0] == "T-7"
    assert m.extra["storey"][0] == "Level 2"
    assert m.extra["ifc_class"][0] == "IfcColumn"
    # plan position in the model's unit: 120 in = 3048 mm (common practice, no source)
    assert m.extra["x"][0] == pytest.approx(3048.0)
    assert m.extra["y"][0] == pytest.approx(6096.0)
    assert m.reason[0] is None, m.reason[0]
    assert result.messages == []


def test_unnamed_column_is_named_by_global_id(builder):
    col = standard_column(builder, name=None, storey=None)
    m = read_columns(builder.model).members
    assert m.name[0] == col.GlobalId
    assert m.extra["storey"][0] == ""


def test_storey_through_an_assembly(builder):
    import ifcopenshell.api.aggregate
    import ifcopenshell.api.spatial

    col = standard_column(builder, storey=None)
    assembly = builder._create("IfcElementAssembly", name="Frame")
    ifcopenshell.api.spatial.assign_container(
        builder.model, products=[assembly], relating_structure=builder.storey("Roof"))
    ifcopenshell.api.aggregate.assign_object(builder.model, products=[col],
                                             relating_object=assembly)
    assert read_columns(builder.model).members.extra["storey"][0] == "Roof"


def test_placement_relative_to_a_moved_storey(builder):
    import ifcopenshell.api.geometry

    storey = builder.storey("Level 1")
    offset = np.eye(4)
    offset[0, 3] = 10.0  # metres: the api takes SI
    ifcopenshell.api.geometry.edit_object_placement(builder.model, product=storey,
                                                    matrix=offset)
    col = standard_column(builder)
    col.ObjectPlacement.PlacementRelTo = storey.ObjectPlacement
    col.ObjectPlacement.RelativePlacement.Location = builder.model.createIfcCartesianPoint(
        (500.0, 250.0, 0.0))
    m = read_columns(builder.model).members
    # storey at x = 10 m = 10000 mm, column 500 mm further (common practice, no source)
    assert m.extra["x"][0] == pytest.approx(10500.0)
    assert m.extra["y"][0] == pytest.approx(250.0)


def test_columns_only_unless_members_asked(builder):
    standard_column(builder, "C1")
    if builder.schema == "IFC2X3":  # IfcMember has no PredefinedType in IFC2X3: use its type
        strut_t = builder.column_type("ST", ifc_class="IfcMemberType", predefined_type="STRUT")
        post_t = builder.column_type("PT", ifc_class="IfcMemberType", predefined_type="POST")
        brace_t = builder.column_type("BT", ifc_class="IfcMemberType", predefined_type="BRACE")
        kw = [{"column_type": strut_t}, {"column_type": post_t}, {"column_type": brace_t}]
    else:
        kw = [{"predefined_type": t} for t in ("STRUT", "POST", "BRACE")]
    for name, extra in zip(("S1", "P1", "B1"), kw, strict=True):
        standard_column(builder, name, ifc_class="IfcMember", **extra)
    assert list(read_columns(builder.model).members.name) == ["C1"]
    m = read_columns(builder.model, include_members=True).members
    assert list(m.name) == ["C1", "S1", "P1"]
    assert list(m.extra["ifc_class"]) == ["IfcColumn", "IfcMember", "IfcMember"]


def _same_model_values(schema, make_builder, units):
    b = make_builder(units, schema)
    col = standard_column(b, at=(60.0, 30.0))
    b.design(col, KX=2.0, UnbracedLengthY=72.0)
    hss = b.profile("RHS", "HSS8X8X1/2", H=8.0, B=8.0, t=0.5)
    col2 = b.column("C2", profile=hss, material=b.material("A500 Gr C"), length=168.0)
    b.loads(col2, D=40.0, S=12.5)
    return read_columns(b.model).members


@pytest.mark.parametrize("units", ["in_kip", "m_kN", "ft_kip"])
def test_unit_systems_give_the_same_member_table(schema, make_builder, units):
    ref = _same_model_values(schema, make_builder, "mm_N")
    other = _same_model_values(schema, make_builder, units)
    for attr in ("Fy", "lx", "ly", "lz", "kx", "ky", "kz"):
        np.testing.assert_allclose(getattr(other, attr), getattr(ref, attr), rtol=1e-6)
    np.testing.assert_allclose(other.loads, ref.loads, rtol=1e-6, equal_nan=True)
    for attr in ("A", "Ix", "Iy", "d", "bf"):
        np.testing.assert_allclose(getattr(other.sections, attr)[other.section_index],
                                   getattr(ref.sections, attr)[ref.section_index], rtol=1e-6)
    assert list(other.reason) == list(ref.reason) == [None, None]
    # the inputs were given in inches / kips / ksi (builder), so the table shows them back
    assert ref.ly[0] == pytest.approx(72.0)
    assert ref.lx[1] == pytest.approx(168.0)
    assert ref.loads[1, 3] == pytest.approx(12.5)


def test_unit_factors_for_the_writer(make_builder, schema):
    b = make_builder("m_kN", schema)
    result = read_columns(b.model)
    assert result.force_unit_factor == pytest.approx(0.224809, rel=1e-5)  # kip per kN
    assert result.length_unit_factor == pytest.approx(39.3701, rel=1e-5)  # in per m


def test_one_broken_profile_does_not_stop_the_others(builder):
    standard_column(builder, "C1")
    broken = builder.profile("I", "BROKEN", d=13.8, bf=8.03, tf=0.595)  # no WebThickness
    col = builder.column("C2", profile=broken, material=builder.material("A992"))
    builder.loads(col, D=10.0)
    standard_column(builder, "C3")
    m = read_columns(builder.model).members
    assert m.reason[0] is None and m.reason[2] is None
    assert "WebThickness" in m.reason[1]
    assert m.section_index[1] == -1


def test_invalid_dimensions_are_a_reason(builder):
    bad = builder.profile("I", None, d=10.0, bf=8.0, tw=9.0, tf=0.5)  # web wider than flange
    col = builder.column("C1", profile=bad, material=builder.material("A992"))
    builder.loads(col, D=10.0)
    m = read_columns(builder.model).members
    assert "tw must be less than bf" in m.reason[0]


def test_model_is_not_modified(builder):
    col = standard_column(builder)
    builder.design(col, KX=1.5)
    before = builder.model.to_string()
    read_columns(builder.model, include_members=True)
    assert builder.model.to_string() == before


def test_design_defaults_and_messages(builder):
    standard_column(builder)
    m = read_columns(builder.model).members
    assert (m.kx[0], m.ky[0], m.kz[0]) == (1.0, 1.0, 1.0)
    # expected: the value given to the model above (input round trip)
    assert m.lx[0] == m.ly[0] == m.lz[0] == pytest.approx(144.0)
    assert "defaults used (no Stanchion_Design value): KX = KY = KZ = 1.0; Lx = Ly = Lz = " \
           "member length" in m.messages[0]


def test_design_on_type_and_occurrence(builder):
    ctype = builder.column_type("CT")
    builder.design(ctype, KX=2.0, KY=0.8, UnbracedLengthZ=48.0)
    col = standard_column(builder, column_type=ctype)
    builder.design(col, KY=0.65)  # occurrence wins for KY
    m = read_columns(builder.model).members
    assert (m.kx[0], m.ky[0], m.kz[0]) == (2.0, 0.65, 1.0)
    assert m.lz[0] == pytest.approx(48.0)
    assert m.lx[0] == pytest.approx(144.0)
    assert any(msg.startswith("defaults used") and "KZ = 1.0" in msg for msg in m.messages[0])


@pytest.mark.parametrize("value", [-1.0, 0.0])
def test_non_positive_k_is_a_reason(builder, value):
    col = standard_column(builder)
    builder.pset(col, "Stanchion_Design", {"KX": builder.measure("IfcReal", value)})
    m = read_columns(builder.model).members
    assert "Stanchion_Design.KX" in m.reason[0] and "not a positive number" in m.reason[0]


def test_wrong_measure_type_is_a_reason(builder):
    col = standard_column(builder)
    builder.pset(col, "Stanchion_Design",
                 {"UnbracedLengthX": builder.measure("IfcForceMeasure", 3.0)})
    m = read_columns(builder.model).members
    assert "UnbracedLengthX is an IfcForceMeasure" in m.reason[0]


def test_text_value_is_a_reason(builder):
    col = standard_column(builder)
    builder.pset(col, "Stanchion_Design", {"KY": "one"})
    assert "Stanchion_Design.KY = 'one' is not a number" in \
        read_columns(builder.model).members.reason[0]


def test_property_with_its_own_unit(builder):
    import ifcopenshell.api.unit

    col = standard_column(builder)
    pset = builder.design(col, UnbracedLengthX=1.0)
    prop = pset.HasProperties[0]
    prop.NominalValue = builder.measure("IfcLengthMeasure", 10.0)
    prop.Unit = ifcopenshell.api.unit.add_conversion_based_unit(builder.model, name="foot")
    m = read_columns(builder.model).members
    assert m.lx[0] == pytest.approx(120.0)  # 10 ft = 120 in (common practice, no source)


def test_many_columns_keep_file_order(builder):
    for i in range(30):
        standard_column(builder, f"C{i}", at=(12.0 * i, 0.0))
    m = read_columns(builder.model).members
    assert list(m.name) == [f"C{i}" for i in range(30)]
    assert all(r is None for r in m.reason)
    assert np.isclose(m.sections.A[m.section_index], W14X48_A).all()
    assert not any(math.isnan(v) for v in m.extra["x"])


def test_an_element_that_cannot_be_walked_is_not_checked(builder, monkeypatch):
    import stanchion.ifc_bridge.read as read_module

    standard_column(builder, "C1")
    standard_column(builder, "C2")
    original = read_module._Reader.row

    def row(self, element):
        if element.Name == "C1":
            raise RuntimeError("corrupt entity")
        return original(self, element)

    monkeypatch.setattr(read_module._Reader, "row", row)
    m = read_columns(builder.model).members
    assert m.reason[0] == "element could not be read (RuntimeError: corrupt entity)"
    assert m.extra["profile_source"][0] == "error"
    assert m.reason[1] is None


def test_member_type_from_its_element_type(builder):
    post_t = builder.column_type("PT", ifc_class="IfcMemberType", predefined_type="POST")
    standard_column(builder, "P1", ifc_class="IfcMember", column_type=post_t)
    m = read_columns(builder.model, include_members=True).members
    assert list(m.name) == ["P1"]


def test_a_repeated_global_id_leaves_its_elements_unchecked(builder):
    # issue 13: a second column given the first's GlobalId (ifcopenshell API model); the
    # reader keeps both, neither checkable, and says so once for the model.
    prof = builder.profile("I", "W14X48", d=13.8, bf=8.03, tw=0.34, tf=0.595)  # AISC v16.0
    steel = builder.material("A992")
    cols = [builder.column(n, profile=prof, material=steel, at=(240.0 * k, 0.0))
            for k, n in enumerate(("C1", "C2", "C3"))]
    for c in cols:
        builder.loads(c, D=10.0)
    cols[1].GlobalId = cols[0].GlobalId
    read = read_columns(builder.model)
    why = f"GlobalId {cols[0].GlobalId} is used by 2 elements"
    assert [r is not None and r.startswith(why) for r in read.members.reason] == \
        [True, True, False]
    assert [m for m in read.messages if why in m] != []
