"""Material class of columns: non-steel columns skipped, no material not checked (issue 13
item 4; docs/design.md §5 "Material class").

The models reproduce the patterns measured on public models (a concrete column named in
Russian, German names with underscores, an aluminium column whose IFC4 Category is 'Metal',
steel named by its grade) with ``ifcopenshell.api``; nothing of those files is copied.
Expected statuses: the rule of docs/design.md §5 (names: common practice, no source).
"""

from __future__ import annotations

import ifcopenshell.api.material
import pytest

from stanchion.engine.check import NOT_CHECKED, PASS, SKIPPED, check_members
from stanchion.ifc_bridge.read import read_columns

W14X48 = {"d": 13.8, "bf": 8.03, "tw": 0.340, "tf": 0.595}  # AISC Shapes Database v16.0
SQUARE = {"H": 16.0, "B": 16.0}  # a 16 in square column (concrete, timber)


def _material(b, name: str, category: str | None = None):
    """An IfcMaterial with a Name and, IFC4 and later, a Category (none in IFC2X3)."""
    kw = {"category": category} if category and b.schema != "IFC2X3" else {}
    return ifcopenshell.api.material.add_material(b.model, name=name, **kw)


def _column(b, name: str, material, kind: str = "RECT", dims: dict | None = None, **kw):
    profile = b.profile(kind, None if kind == "RECT" else "W14X48", **(dims or SQUARE))
    col = b.column(name, profile=profile, material=material, **kw)
    b.loads(col, D=100.0, L=50.0)
    return col


def _statuses(b) -> dict[str, tuple[str, str | None]]:
    members = read_columns(b.model).members
    r = check_members(members)
    return {str(n): (str(s), why) for n, s, why in zip(members.name, r.status, r.reason,
                                                      strict=True)}


def test_mixed_model_statuses(builder):
    b = builder
    _column(b, "concrete", _material(b, "Бетон"))
    # IFC4+: a timber column known by its Category only; IFC2X3 has no Category: by name.
    wood = (_material(b, "GL-Stuetze 1", "wood") if b.schema != "IFC2X3"
            else _material(b, "Brettschichtholz"))
    _column(b, "timber category", wood)
    _column(b, "timber name", _material(b, "x_Holz_GL24h"))
    _column(b, "aluminium", _material(b, "Aluminium EN AW-6082", "Metal"), kind="I",
            dims=W14X48)
    _column(b, "steel", _material(b, "ASTM A992"), kind="I", dims=W14X48)
    # No material at all: a Body extrusion gives the profile, nothing gives Fy.
    profile = b.profile("I", "W14X48", **W14X48)
    bare = b.column("no material", profile=profile, material=None, via="body")
    b.loads(bare, D=100.0, L=50.0)

    got = _statuses(b)
    assert got["concrete"] == (SKIPPED, "not steel: concrete")
    assert got["timber category"] == (SKIPPED, "not steel: timber")
    assert got["timber name"] == (SKIPPED, "not steel: timber")
    assert got["aluminium"] == (SKIPPED, "not steel: aluminium")
    # W14X48, A992 (Fy 50 ksi), Lc = 12 ft: phi_c Pn > 303 kip, its value at 16 ft (AISC
    # Manual Table 4-1a, read-off; strength falls with length), against 1.2*100 + 1.6*50 =
    # 200 kip (ASCE 7-22 §2.3.1 combination 2, by hand): a pass.
    assert got["steel"][0] == PASS
    status, why = got["no material"]
    assert status == NOT_CHECKED and why.startswith("no yield strength")


def test_material_class_column(builder):
    b = builder
    _column(b, "C1", _material(b, "Structural Concrete"))
    _column(b, "C2", _material(b, "S355JR"), kind="I", dims=W14X48)
    members = read_columns(b.model).members
    assert members.material.tolist() == ["concrete", "steel"]


def test_type_material_gives_the_class(builder):
    b = builder
    ctype = b.column_type("Concrete type", material=_material(b, "Beton C30/37"))
    col = b.column("C1", profile=b.profile("RECT", None, **SQUARE), material=None,
                   via="body", column_type=ctype)
    b.loads(col, D=10.0)
    assert _statuses(b)["C1"] == (SKIPPED, "not steel: concrete")


def test_composite_name_is_not_checked_nor_skipped(builder):
    b = builder
    _column(b, "C1", _material(b, "Steel - reinforced concrete column"), kind="I", dims=W14X48)
    status, why = _statuses(b)["C1"]
    assert status == NOT_CHECKED
    assert why.startswith("material names steel and concrete")


@pytest.mark.parametrize("schema", ["IFC4", "IFC4X3"])
def test_reinforced_concrete_constituents_are_concrete(make_builder, schema):
    # IFC4+: a concrete column as a constituent set of concrete and its reinforcement.
    b = make_builder("mm_N", schema)
    cset = ifcopenshell.api.material.add_material_set(
        b.model, name="RC column", set_type="IfcMaterialConstituentSet")
    for name in ("Concrete C30/37", "Reinforcing steel B500B"):
        ifcopenshell.api.material.add_constituent(
            b.model, constituent_set=cset, material=_material(b, name))
    _column(b, "C1", cset, via="body")
    assert _statuses(b)["C1"] == (SKIPPED, "not steel: concrete")


def test_repeated_global_id_outranks_the_material(builder):
    # docs/design.md §5: elements sharing a GlobalId are all not checked, whatever else.
    b = builder
    first = _column(b, "K1", _material(b, "Concrete"))
    second = _column(b, "K2", _material(b, "Concrete"))
    second.GlobalId = first.GlobalId
    _column(b, "K3", _material(b, "Concrete"))
    got = _statuses(b)
    for name in ("K1", "K2"):
        status, why = got[name]
        assert status == NOT_CHECKED and why.startswith(f"GlobalId {first.GlobalId} is used by 2")
    assert got["K3"] == (SKIPPED, "not steel: concrete")


def test_stainless_columns_are_not_checked_and_get_no_default_grade(builder):
    # Review item 2: stainless steel is designed to AISC 370, not AISC 360-22 (from memory):
    # not checked with that reason (not skipped: a person must look), and --default-grade
    # never gives it a yield stress; a plain 'Steel' beside it takes the default (A992,
    # Fy = 50 ksi, ASTM A992/A992M) and passes.
    b = builder
    _column(b, "stainless", _material(b, "Stainless steel"), kind="I", dims=W14X48)
    _column(b, "inox", _material(b, "Inox 1.4301", "steel"), kind="I", dims=W14X48)
    _column(b, "edelstahl", _material(b, "Edelstahl rostfrei"), kind="I", dims=W14X48)
    _column(b, "steel", _material(b, "Steel"), kind="I", dims=W14X48)
    members = read_columns(b.model, default_grade="A992").members
    r = check_members(members)
    got = {str(n): (str(s), why) for n, s, why in zip(members.name, r.status, r.reason,
                                                      strict=True)}
    for name in ("stainless", "inox", "edelstahl"):
        assert got[name] == (NOT_CHECKED,
                             "stainless steel: designed to AISC 370, not checked here"), name
        i = list(members.name).index(name)
        assert members.extra["fy_source"][i] != "default_grade"
    assert got["steel"] == (PASS, None)
