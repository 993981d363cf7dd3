"""Designations of EN 10365, BS 4-1, AS/NZS 3679 and EN 10210 / 10219 (engine.designations)."""

from __future__ import annotations

import csv
import math

import numpy as np
import pytest

from stanchion.engine import section_properties as sp
from stanchion.engine.catalog import lookup, unknown_section_reason
from stanchion.engine.compression import available_strength, compressive_strength
from stanchion.engine.designations import (
    AGREE_MASS,
    EN_COLD,
    EN_HOT,
    EN_TUBES,
    TABLE_PATH,
    Designation,
    agrees,
    corner_radius,
    designation_of,
    section_from_designation,
    tabulated,
)
from stanchion.engine.sections import Kind

MM = 1 / 25.4  # in per mm (international inch, exact)


def _d(text: str) -> Designation:
    d = designation_of(text)
    assert d is not None, text
    return d


# ------------------------------------------------------------------ recognition


@pytest.mark.parametrize(("text", "name", "family", "standard", "nominal"), [
    ("IPE 300", "IPE 300", "IPE", "EN 10365", {"size": 300}),
    ("IPE300", "IPE 300", "IPE", "EN 10365", {"size": 300}),
    ("HEA 200", "HE 200 A", "HEA", "EN 10365", {"size": 200}),
    ("HE 200 A", "HE 200 A", "HEA", "EN 10365", {"size": 200}),
    ("HEB 300", "HE 300 B", "HEB", "EN 10365", {"size": 300}),
    ("HEM 300", "HE 300 M", "HEM", "EN 10365", {"size": 300}),
    ("UPE 200", "UPE 200", "UPE", "EN 10365", {"size": 200}),
    ("UPN 200", "UPN 200", "UPN", "EN 10365", {"size": 200}),
    ("UB 457x191x67", "UB 457x191x67", "UB", "BS 4-1",
     {"size_h": 457, "size_b": 191, "mass": 67}),
    ("UC 254x254x73", "UC 254x254x73", "UC", "BS 4-1",
     {"size_h": 254, "size_b": 254, "mass": 73}),
    ("UC254*254*73", "UC 254x254x73", "UC", "BS 4-1",
     {"size_h": 254, "size_b": 254, "mass": 73}),
    ("PFC 300x100x46", "PFC 300x100x46", "PFC", "BS 4-1",
     {"size_h": 300, "size_b": 100, "mass": 46}),
    ("310UC96.8", "310UC96.8", "UC", "AS/NZS 3679.1", {"size": 310, "mass": 96.8}),
    ("250UB37.3", "250UB37.3", "UB", "AS/NZS 3679.1", {"size": 250, "mass": 37.3}),
    ("300PFC40.1", "300PFC40.1", "PFC", "AS/NZS 3679.1", {"size": 300, "mass": 40.1}),
    ("RHS 200x100x6", "RHS 200x100x6", "RHS", EN_TUBES, {"H": 200, "B": 100, "t": 6}),
    ("RHS200x100x6.3", "RHS 200x100x6.3", "RHS", EN_TUBES, {"H": 200, "B": 100, "t": 6.3}),
    ("RHS200x100x6 Steel", "RHS 200x100x6", "RHS", EN_TUBES, {"H": 200, "B": 100, "t": 6}),
    ("SHS 100x100x5", "SHS 100x100x5", "SHS", EN_TUBES, {"H": 100, "B": 100, "t": 5}),
    ("CHS 168.3x6.3", "CHS 168.3x6.3", "CHS", EN_TUBES, {"D": 168.3, "t": 6.3}),
    ("B193.7/8", "CHS 193.7x8", "CHS", EN_TUBES, {"D": 193.7, "t": 8}),
])
def test_each_spelling_of_the_issue(text, name, family, standard, nominal):
    d = _d(text)
    assert (d.name, d.family, d.standard, d.text) == (name, family, standard, text)
    assert dict(d.nominal) == pytest.approx(nominal)


@pytest.mark.parametrize(("text", "name"), [
    ("ipe 300", "IPE 300"), ("Ipe-300", "IPE 300"), ("IPE 300 S355", "IPE 300"),
    ("hea200", "HE 200 A"), ("HE200A", "HE 200 A"), ("HE-B 300", "HE 300 B"),
    ("he 300 b", "HE 300 B"), ("HEB 300 Steel", "HE 300 B"),
    ("uc 254 x 254 x 73", "UC 254x254x73"), ("UC254X254X73", "UC 254x254x73"),
    ("UC 254×254×73", "UC 254x254x73"), ("UC 254 254 73", None),
    ("254x254x73 UC", "UC 254x254x73"), ("UKC 254x254x73", "UC 254x254x73"),
    ("310 UC 96.8", "310UC96.8"), ("310uc96.8", "310UC96.8"),
    ("rhs 200 x 100 x 6", "RHS 200x100x6"), ("RHS200*100*6", "RHS 200x100x6"),
    ("SHS 100x5", "SHS 100x100x5"), ("CHS 168,3x6,3", "CHS 168.3x6.3"),
    ("b 193.7 / 8", "CHS 193.7x8"),
])
def test_case_and_separators(text, name):
    d = designation_of(text)
    assert (d.name if d else None) == name


@pytest.mark.parametrize("text", [
    "Steel", "", "   ", "W12X40", "HSS8X8X1/4", "PIPE6STD", "C15X50", "HP14X73",
    "HE 300",  # no series letter
    "IPE 300 x 2", "IPE 300/2",  # numbers continue: not an IPE 300
    "SHS 100x80x5",  # a square tube with two sides
    "RHS 100x50x30",  # wall thicker than half the side
    "BSH 20/20cm, Holz GL24h", "STB 25/50cm, Beton C30/37", "B 25/50",
    "Колонна - прямоугольная: 200x200 мм",
])
def test_non_matches(text):
    assert designation_of(text) is None


@pytest.mark.parametrize("value", [None, 300, 3.0, ["IPE300"], {"IPE": 300}])
def test_non_text_is_no_designation(value):
    assert designation_of(value) is None


def test_aisc_names_stay_aisc():
    assert designation_of("W12X40") is None and lookup(["W12X40"])[0] >= 0
    assert designation_of("HSS8X8X1/4") is None and lookup(["HSS8X8X1/4"])[0] >= 0


def test_tube_standard_from_the_name():
    assert _d("HF RHS 200x100x6").standard == EN_HOT
    assert _d("CFSHS 100x100x5").standard == EN_COLD
    assert _d("RHS 200x100x6 CF").standard == EN_COLD
    assert _d("CHS 168.3x6.3 EN 10210 S355J2H").standard == EN_HOT
    assert _d("RHS 200x100x6 S355").standard == EN_TUBES


def test_catalog_reason_names_the_standard_and_no_nearest_shape():
    for text, label in [("IPE300", "EN 10365 IPE 300"), ("UC254*254*73", "BS 4-1 UC 254x254x73"),
                        ("310UC96.8", "AS/NZS 3679.1 310UC96.8"),
                        ("B193.7/8", "EN 10210/10219 CHS 193.7x8"),
                        ("RHS200x100x6 Steel", "EN 10210/10219 RHS 200x100x6")]:
        reason = unknown_section_reason(text)
        assert reason == f"section '{text}' is {label}, not an AISC catalog shape"
        assert "nearest" not in reason
    assert "nearest: W14X48" in unknown_section_reason("W14X47")  # AISC path unchanged
    assert unknown_section_reason("W14X48") == ""


# ------------------------------------------------------------------ tables and sections


def test_every_table_row_is_recognised_by_its_name():
    # engine/data/en_bs_sections.csv (tools/build_designation_tables.py): 326 rows, each name
    # read back as its own family; counts as generated from structuralcodes 0.7.2
    with TABLE_PATH.open(encoding="utf-8") as fh:
        rows = list(csv.DictReader(fh))
    counts: dict[str, int] = {}
    for row in rows:
        d = _d(row["designation"])
        assert (d.name, d.family, d.standard) == (row["designation"], row["family"],
                                                  row["standard"])
        assert tabulated(d) is not None
        counts[d.family] = counts.get(d.family, 0) + 1
    assert counts == {"IPE": 18, "HEA": 24, "HEB": 24, "HEM": 24, "UPE": 14, "UPN": 18,
                      "UB": 180, "UC": 24}


def test_table_rows():
    # structuralcodes 0.7.2 (EN 10365 values): IPE 300 h 300, b 150, tw 7.1, tf 10.7, r 15
    assert tabulated(_d("IPE300")) == {"h": 300, "b": 150, "tw": 7.1, "tf": 10.7, "r": 15}
    # HE 200 A is 190 mm deep (EN 10365; the serial size is not the depth)
    assert (tabulated(_d("HEA 200")) or {}).get("h") == 190
    assert tabulated(_d("310UC96.8")) is None  # AS/NZS 3679.1: no table
    assert tabulated(_d("PFC 300x100x46")) is None  # BS 4-1 PFC: no table


@pytest.mark.parametrize(("text", "area_cm2", "iy_cm4", "iz_cm4"), [
    # eurocodepy 2027.0.12, data/i_profiles_euro.json (EN catalogue values; the same values
    # as the producers' tables, from memory): IPE 300 A 53.81, Iy 8356, Iz 603.8;
    # HE 300 B A 149.08, Iy 25170, Iz 8563; HE 200 A A 53.83, Iy 3692, Iz 1336.
    ("IPE 300", 53.81, 8356.0, 603.8),
    ("HEB 300", 149.08, 25170.0, 8563.0),
    ("HE 200 A", 53.83, 3692.0, 1336.0),
])
def test_en_sections_from_the_table(text, area_cm2, iy_cm4, iz_cm4):
    got = section_from_designation(_d(text))
    assert got.reason is None
    s = got.section
    assert s is not None and len(s) == 1 and s.kind[0] == Kind.I_SHAPE
    assert s.designation[0] == _d(text).name
    cm = 10 * MM
    assert s.A[0] / cm**2 == pytest.approx(area_cm2, rel=0.005)
    assert s.Ix[0] / cm**4 == pytest.approx(iy_cm4, rel=0.01)
    assert s.Iy[0] / cm**4 == pytest.approx(iz_cm4, rel=0.01)
    assert "structuralcodes 0.7.2" in got.notes[0]


def test_upe_channel_from_the_table():
    # UPE 200 (EN 10365 via structuralcodes 0.7.2): h 200, b 80, tw 6, tf 11, r 13.
    # Hand computation: web 200·6 + flanges 2·(80-6)·11 + fillets 2·(1-π/4)·13² = 1200 + 1628
    # + 72.5 = 2900.5 mm² (eurocodepy-free; EN catalogue A = 29.0 cm², from memory)
    s = section_from_designation(_d("UPE 200")).section
    assert s is not None and s.kind[0] == Kind.CHANNEL
    assert s.A[0] / MM**2 == pytest.approx(2900.5, rel=1e-3)


@pytest.mark.parametrize("text", ["UC254*254*73", "UB 457x191x67", "UPN 200", "310UC96.8",
                                  "PFC 300x100x46", "IPE A 300"])
def test_names_without_a_built_table_need_the_geometry(text):
    got = section_from_designation(_d(text))
    assert got.section is None and got.reason is not None
    assert got.reason.startswith(f"{_d(text).label}: dimensions from the model's geometry")


def test_rhs_section_properties_by_hand():
    # RHS 200x100x6, standard unknown: EN 10219-2 corner ro = 2t = 12, ri = 6 mm.
    # Hand computation, k = 4 - π = 0.858407:
    # A = 200·100 - k·12² - (188·88 - k·6²) = 20000 - 123.61 - 16513.10 = 3363.29 mm²
    # (EN 10219-2 tables: 33.6 cm², from memory).
    got = section_from_designation(_d("RHS 200x100x6"), material="Steel")
    s = got.section
    assert s is not None and s.kind[0] == Kind.RECT_HSS
    assert s.A[0] / MM**2 == pytest.approx(3363.29, rel=1e-5)
    assert s.tw[0] / MM == pytest.approx(6.0)  # nominal wall: EN tube
    assert "outer corner radius 12 mm" in got.notes[0]
    assert "design wall = nominal wall (EN 10210 or EN 10219 tube" in got.notes[1]


def test_rhs_matches_sectionproperties():
    # sectionproperties 3 (rectangular_hollow_section: concentric corners ri = ro - t, as the
    # builder) as the reference for A, Ix, Iy of RHS 200x100x6 with ro = 12 mm.
    from sectionproperties.analysis.section import Section
    from sectionproperties.pre.library.steel_sections import rectangular_hollow_section

    geom = rectangular_hollow_section(d=200, b=100, t=6, r_out=12, n_r=32)
    geom.create_mesh(mesh_sizes=[20.0])
    ref = Section(geom)
    ref.calculate_geometric_properties()
    ixx, iyy, _ = ref.get_ic()
    s = section_from_designation(_d("RHS 200x100x6")).section
    assert s is not None
    assert s.A[0] / MM**2 == pytest.approx(ref.get_area(), rel=2e-3)
    assert s.Ix[0] / MM**4 == pytest.approx(ixx, rel=2e-3)
    assert s.Iy[0] / MM**4 == pytest.approx(iyy, rel=2e-3)


def test_round_tube_by_hand():
    # B193.7/8: D 193.7, t 8 mm. Hand computation: A = π/4·(193.7² - 177.7²) = π/4·5942.4 =
    # 4667.1 mm²; I = π/64·(193.7⁴ - 177.7⁴).
    s = section_from_designation(_d("B193.7/8")).section
    assert s is not None and s.kind[0] == Kind.ROUND_HSS
    assert s.A[0] / MM**2 == pytest.approx(math.pi / 4 * (193.7**2 - 177.7**2), rel=1e-9)
    assert s.A[0] / MM**2 == pytest.approx(4667.1, abs=0.1)
    assert s.Ix[0] / MM**4 == pytest.approx(math.pi / 64 * (193.7**4 - 177.7**4), rel=1e-9)


@pytest.mark.parametrize(("t", "standard", "r_out"), [
    (5.0, EN_COLD, 10.0),  # EN 10219-2: 2.0 t for t <= 6 mm (from memory)
    (6.0, EN_COLD, 12.0),
    (8.0, EN_COLD, 20.0),  # 2.5 t for 6 < t <= 10 mm
    (12.5, EN_COLD, 37.5),  # 3.0 t above 10 mm
    (8.0, EN_TUBES, 20.0),  # unknown: EN 10219's (larger, conservative)
    (8.0, EN_HOT, 16.0),  # EN 10210-2 ro 1.5 t, ri 1.0 t: built concentric as 2.0 t
])
def test_corner_radius(t, standard, r_out):
    assert corner_radius(t, standard) == pytest.approx(r_out)


@pytest.mark.parametrize(("material", "ratio", "words"), [
    ("Steel", 1.0, "nominal wall (EN 10210 or EN 10219"),  # the name's standard decides
    ("S355J2H", 1.0, "nominal wall (EN 10210 or EN 10219"),
    ("EN 10219 S355J2H", 1.0, "nominal wall (EN 10219"),
    (None, 1.0, "nominal wall (EN 10210 or EN 10219"),
    ("ASTM A500 Gr C", 0.93, "0.93 x nominal wall (ASTM A500"),  # the material's standard
])
def test_en_tube_wall_rule(material, ratio, words):
    # engine.tubes.design_wall: EN tubes nominal; ASTM A500 0.93 tnom (AISC 360-22 §B4.2)
    got = section_from_designation(_d("SHS 100x100x5"), material=material)
    assert got.section is not None
    assert got.section.tw[0] / MM == pytest.approx(5.0 * ratio)
    assert words in got.notes[1]


def test_chapter_e_runs_on_a_named_tube():
    # CHS 168.3x6.3, nominal wall, Fy = 355 MPa = 51.49 ksi, Lc = 4 m, LRFD.
    # Hand computation (AISC 360-22 E3): A = π/4·(168.3² - 155.7²) = 3206.3 mm² = 4.970 in²;
    # I = π/64·(168.3⁴ - 155.7⁴) = 1.0534e7 mm⁴, r = √(I/A) = 57.32 mm; Lc/r = 4000/57.32 =
    # 69.78; Fe = π²·29000/69.78² = 58.77 ksi (E3-4); Fy/Fe = 0.8761 < 2.25 →
    # Fcr = 0.658^0.8761·51.49 = 35.68 ksi (E3-2); D/t = 26.7 < 0.11 E/Fy = 62: nonslender;
    # φPn = 0.9·35.68·4.970 = 159.6 kip.
    s = section_from_designation(_d("CHS 168.3x6.3"), material="S355").section
    assert s is not None
    L = np.array([4000 * MM])
    res = compressive_strength(s, np.array([355 * 0.145038]), L, L, L)
    assert float(available_strength(res.Pn, "LRFD")[0]) == pytest.approx(159.6, rel=1e-3)


# ------------------------------------------------------------------ cross-check


def _i(d, bf, tw, tf, r):
    return sp.i_section(d * MM, bf * MM, tw * MM, tf * MM, r * MM).row(0)


def test_uc_geometry_as_exported_agrees():
    # BS 4-1 UC 254x254x73: D 254.1, B 254.6, t 8.6, T 14.2, r 12.7 mm (from memory; an
    # authoring application exports these values). Mass: A ≈ 9310 mm² → 73.1 kg/m.
    assert agrees(_d("UC254*254*73"), _i(254.1, 254.6, 8.6, 14.2, 12.7)) is None


def test_uc_of_another_weight_disagrees():
    # UC 254x254x89 (BS 4-1, from memory: 260.3 x 256.3 x 10.3 x 17.3, r 12.7) named x73
    reason = agrees(_d("UC 254x254x73"), _i(260.3, 256.3, 10.3, 17.3, 12.7))
    assert reason is not None
    assert reason.startswith("profile name BS 4-1 UC 254x254x73 disagrees with the geometry")
    assert "tf 17.3 mm vs 14.2 mm" in reason and "kg/m" in reason


def test_en_geometry_agrees_and_disagrees():
    # IPE 300 and HE 300 B, EN 10365 values (structuralcodes 0.7.2)
    ipe = _i(300, 150, 7.1, 10.7, 15)
    assert agrees(_d("IPE300"), ipe) is None
    assert agrees(_d("IPE 300"), _i(300, 150, 7.1, 10.7, 0)) is None  # fillets not drawn
    reason = agrees(_d("HEB 300"), ipe)
    assert reason is not None and "b 150 mm vs 300 mm" in reason


def test_as_names_check_the_mass():
    # AS/NZS 3679.1 310UC96.8: d 308, bf 305, tw 9.9, tf 15.4, r 16.5 (from memory);
    # A = 2·305·15.4 + (308 - 30.8)·9.9 + (4 - π)·16.5² = 12372 mm² → 97.1 kg/m (0.3 %).
    uc = _i(308, 305, 9.9, 15.4, 16.5)
    assert agrees(_d("310UC96.8"), uc) is None
    # 250UB37.3: d 256, bf 146, tw 6.4, tf 10.9, r 8.9 (from memory) → 37.3 kg/m
    ub = _i(256, 146, 6.4, 10.9, 8.9)
    assert agrees(_d("250UB37.3"), ub) is None
    reason = agrees(_d("310UC96.8"), ub)
    assert reason is not None and "vs 96.8 kg/m" in reason
    assert AGREE_MASS == 0.04


def test_kind_disagrees():
    reason = agrees(_d("RHS 200x100x6"), _i(300, 150, 7.1, 10.7, 15))
    assert reason == ("profile name EN 10210/10219 RHS 200x100x6 is a rectangular tube but "
                      "the geometry is a I section")


def test_tube_cross_check():
    d = _d("RHS200x100x6 Steel")
    assert agrees(d, sp.rect_hollow(200 * MM, 100 * MM, 6 * MM).row(0)) is None
    assert agrees(d, sp.rect_hollow(100 * MM, 200 * MM, 6 * MM).row(0)) is None  # turned
    assert agrees(d, sp.rect_hollow(200 * MM, 100 * MM, 0.93 * 6 * MM).row(0)) is None  # ERW
    reason = agrees(d, sp.rect_hollow(200 * MM, 100 * MM, 8 * MM).row(0))
    assert reason is not None and reason.endswith("wall 8 mm vs 6 mm")
    reason = agrees(_d("B193.7/8"), sp.circ_hollow(168.3 * MM, 8 * MM).row(0))
    assert reason is not None and "D 168.3 mm vs 193.7 mm" in reason
    assert agrees(_d("B193.7/8"), sp.circ_hollow(193.7 * MM, 8 * MM).row(0)) is None


def test_provenance_names_exactly_the_families_built_from_the_table() -> None:
    # engine/data/DESIGNATION_TABLES_PROVENANCE (Markdown) must say what the code does:
    # only BUILT_FROM_TABLE (IPE, HE A/B/M, UPE) is built; UB rows only cross-check
    # (review item 5; the repository's own files, common practice, no source).
    from pathlib import Path

    from stanchion.engine.designations import BUILT_FROM_TABLE, TABLE_PATH
    name = "DESIGNATION_TABLES_PROVENANCE" + ".md"  # spelled apart: no citation here
    text = (Path(TABLE_PATH).parent / name).read_text("utf-8")
    flat = " ".join(text.split())
    assert "UB rows are built" not in flat and "UPE and UB rows" not in flat
    assert "Only the IPE, HE A / HE B / HE M and UPE rows are built" in flat
    assert BUILT_FROM_TABLE == {"IPE", "HEA", "HEB", "HEM", "UPE"}
    ub = designation_of("UB 457x191x67")
    assert ub is not None and section_from_designation(ub).section is None
