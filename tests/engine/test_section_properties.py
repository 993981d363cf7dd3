"""Tests for engine.section_properties (section properties of parametric profiles).

Expected values come from (named beside each):
* the AISC Shapes Database v16.0: recalled from memory, and the rows of the project's shapes
  catalog engine/data/aisc_shapes_v16.csv (same database);
* sectionproperties (a finite-element reference library; geometric + warping analysis on a
  coarse mesh, so each section takes well under a second);
* AISC 360-22 equations and the conventions of engine.sections (structure tests).
"""

from __future__ import annotations

import functools
import warnings
from pathlib import Path

import numpy as np
import pandas as pd
import pytest

from stanchion.engine.section_properties import (
    WEIGHT_PER_AREA,
    channel,
    circ_hollow,
    dimension_problems,
    i_section,
    rect_hollow,
    solid_circle,
    solid_rect,
    tee,
)
from stanchion.engine.sections import ElementClass, Kind, SectionTable

# ------------------------------------------------------------------ AISC Shapes Database


def test_w14x48_against_aisc_database():
    # W14X48 dimensions and properties: AISC Shapes Database v16.0 (from memory):
    # d=13.8, bf=8.03, tw=0.340, tf=0.595, kdes=1.19; A=14.1, Ix=484, Iy=51.4, J=1.45, Cw=2240.
    # Root fillet radius taken as kdes - tf (common practice, no source).
    s = i_section(13.8, 8.03, 0.340, 0.595, r=1.19 - 0.595)
    assert s.A[0] == pytest.approx(14.1, rel=0.02)
    assert s.Ix[0] == pytest.approx(484.0, rel=0.02)
    assert s.Iy[0] == pytest.approx(51.4, rel=0.02)
    # J by El Darwish & Johnston with fillets; the plain b·t³/3 sum would be ~11 % low.
    assert s.J[0] == pytest.approx(1.45, rel=0.02)
    assert s.Cw[0] == pytest.approx(2240.0, rel=0.02)


def test_wt7x24_against_aisc_database():
    # WT7X24 (AISC Shapes Database v16.0, values as in engine/data/aisc_shapes_v16.csv):
    # d=6.90, bf=8.03, tw=0.340, tf=0.595, kdes=1.19; A=7.07, Ix=24.9, Iy=25.7, J=0.723,
    # Cw=1.07, y=1.35 (centroid below the flange top), ro=2.87, H=0.866.
    s = tee(6.90, 8.03, 0.340, 0.595, r=1.19 - 0.595)
    for ours, ref in ((s.A, 7.07), (s.Ix, 24.9), (s.Iy, 25.7), (s.J, 0.723), (s.Cw, 1.07),
                      (s.yo + s.tf / 2, 1.35), (s.ro, 2.87), (s.H, 0.866)):
        assert ours[0] == pytest.approx(ref, rel=0.02)


def test_hss8x8x1_4_against_aisc_database():
    # HSS8X8X1/4: tdes=0.233, A=7.10, I=70.7, J=111 (AISC Shapes Database v16.0, recalled and
    # as in engine/data/aisc_shapes_v16.csv). The task brief quoted A=6.88; that cannot hold
    # with tdes=0.233 (A is about the midline perimeter times t, 4*(8-0.233)*0.233 = 7.24,
    # less the corner rounding), and the database row says 7.10.
    s = rect_hollow(8.0, 8.0, 0.233)
    assert s.A[0] == pytest.approx(7.10, rel=0.02)
    assert s.Ix[0] == pytest.approx(70.7, rel=0.02)
    assert s.Iy[0] == pytest.approx(70.7, rel=0.02)
    assert s.J[0] == pytest.approx(111.0, rel=0.02)


def test_hss6_625x0_280_against_aisc_database():
    # HSS6.625X0.280: tdes=0.260, A=5.20, I=26.4, J=52.7 (AISC Shapes Database v16.0 as in
    # engine/data/aisc_shapes_v16.csv; the task brief's recalled I=25.9 is not the table's).
    s = circ_hollow(6.625, 0.260)
    assert s.A[0] == pytest.approx(5.20, rel=0.02)
    assert s.Ix[0] == pytest.approx(26.4, rel=0.02)
    assert s.Iy[0] == pytest.approx(26.4, rel=0.02)
    assert s.J[0] == pytest.approx(52.7, rel=0.02)


_CATALOG = Path(__file__).resolve().parents[2] / "engine" / "data" / "aisc_shapes_v16.csv"


def _catalog(family: str) -> pd.DataFrame:
    if not _CATALOG.exists():
        pytest.skip(f"shapes catalog {_CATALOG} not present")
    table = pd.read_csv(_CATALOG)
    return table[table["family"] == family]


def _deviation(ours: np.ndarray, ref: pd.Series) -> np.ndarray:
    return ours / ref.to_numpy(dtype=float) - 1.0


@pytest.mark.parametrize(
    "family, build, checks",
    [
        # rolled W shapes and WT cut from them, fillet radius kdes - tf; measured worst:
        # W A 0.7 %, Ix 1.0 %, Iy 1.4 %, J 1.2 %, Cw 2.1 %; WT 0.7, 1.3, 1.7, 1.2, 1.5 %,
        # ro 0.5 %, H 0.4 %
        ("W", lambda t: i_section(t.d, t.bf, t.tw, t.tf, t.kdes - t.tf),
         {"A": 0.01, "Ix": 0.015, "Iy": 0.02, "J": 0.02, "Cw": 0.025}),
        ("WT", lambda t: tee(t.d, t.bf, t.tw, t.tf, t.kdes - t.tf),
         {"A": 0.01, "Ix": 0.02, "Iy": 0.02, "J": 0.02, "Cw": 0.02, "ro": 0.01, "H": 0.01}),
        # HSS with the design wall thickness and r_out = 2 tdes; measured worst: A 0.4 %,
        # I 0.9 % (HSS1-1/2X1-1/2X1/4), J 0.5 %; round HSS: A 0.7 %, I 1.9 %, J 1.7 %
        ("HSS", lambda t: rect_hollow(t.Ht, t.B, t.tdes),
         {"A": 0.005, "Ix": 0.015, "Iy": 0.015, "J": 0.01}),
        ("HSS_ROUND", lambda t: circ_hollow(t.OD, t.tdes),
         {"A": 0.01, "Ix": 0.025, "Iy": 0.025, "J": 0.025}),
    ],
)
def test_whole_catalog_families_against_aisc_database(family, build, checks):
    # Every row of the family in the AISC Shapes Database v16.0 (engine/data/aisc_shapes_v16.csv,
    # the colleague-built catalog), computed in one vectorized call.
    rows = _catalog(family)
    assert len(rows) > 20
    s = build(rows)
    for key, tol in checks.items():
        dev = _deviation(getattr(s, key), rows[key])
        worst = int(np.argmax(np.abs(dev)))
        assert abs(dev[worst]) <= tol, (key, rows["designation"].iloc[worst], dev[worst])


# ------------------------------------------------------------------ sectionproperties


@functools.cache
def _reference(builder: str, *dims: float) -> dict[str, float]:
    """A, Ix, Iy, J, Cw, centroid and elastic shear centre from sectionproperties."""
    from sectionproperties.analysis import Section
    from sectionproperties.pre import library as lib

    geometry = {
        "i": lambda d, b, tw, tf, r: lib.i_section(d=d, b=b, t_f=tf, t_w=tw, r=r, n_r=8),
        "t": lambda d, b, tw, tf, r: lib.tee_section(d=d, b=b, t_f=tf, t_w=tw, r=r, n_r=8),
        "u": lambda d, b, tw, tf, r: lib.channel_section(d=d, b=b, t_f=tf, t_w=tw, r=r, n_r=8),
        "hss": lambda h, b, t, r: lib.rectangular_hollow_section(d=h, b=b, t=t, r_out=r, n_r=24),
        "chs": lambda d, t: lib.circular_hollow_section(d=d, t=t, n=96),
        "rect": lambda h, b: lib.rectangular_section(d=h, b=b),
        "circle": lambda d: lib.circular_section(d=d, n=96),
    }[builder](*dims)
    with warnings.catch_warnings():
        warnings.simplefilter("ignore")
        geometry.create_mesh(mesh_sizes=[geometry.calculate_area() / 60.0])
        section = Section(geometry)
        section.calculate_geometric_properties()
        section.calculate_warping_properties()
    ixx, iyy, _ = section.get_ic()
    cx, cy = section.get_c()
    sx, sy = section.get_sc()
    return {"A": section.get_area(), "Ix": ixx, "Iy": iyy, "J": section.get_j(),
            "Cw": section.get_gamma(), "cx": cx, "cy": cy, "sx": sx, "sy": sy}


def _close(ours: float, ref: float, rel: float, what: str) -> None:
    assert ours == pytest.approx(ref, rel=rel), f"{what}: ours {ours:.6g} vs ref {ref:.6g}"


# d, bf, tw, tf, r: a W14X48-like rolled shape, a welded (no fillet) plate I, a slender I
I_CASES = [(13.8, 8.03, 0.34, 0.595, 0.595), (10.0, 10.0, 0.5, 0.8, 0.0),
           (12.0, 6.0, 0.3, 0.4, 0.5)]


@pytest.mark.parametrize("dims", I_CASES)
def test_i_section_against_sectionproperties(dims):
    ref = _reference("i", *dims)  # sectionproperties i_section
    s = i_section(*dims)
    for key in ("A", "Ix", "Iy"):
        _close(getattr(s, key)[0], ref[key], 0.003, key)
    _close(s.J[0], ref["J"], 0.03, "J")  # El Darwish & Johnston; measured -1.5 %..-0.8 %
    _close(s.Cw[0], ref["Cw"], 0.02, "Cw")  # Iy h0²/4; measured +0.3 %..+1.4 %
    # doubly symmetric: the reference shear centre is at the centroid (to mesh precision)
    tol = 1e-4 * dims[0]
    assert abs(ref["sx"] - ref["cx"]) < tol and abs(ref["sy"] - ref["cy"]) < tol
    assert s.xo[0] == 0.0 and s.yo[0] == 0.0


# tee d, bf, tw, tf, r (flange at top): WT7X24-like, a stocky welded tee, a slender tee
T_CASES = [(6.9, 8.03, 0.34, 0.595, 0.595), (5.0, 10.0, 0.5, 0.8, 0.0),
           (6.0, 6.0, 0.3, 0.4, 0.5)]


@pytest.mark.parametrize("dims", T_CASES)
def test_tee_against_sectionproperties(dims):
    ref = _reference("t", *dims)  # sectionproperties tee_section (flange at the top)
    s = tee(*dims)
    for key in ("A", "Ix", "Iy"):
        _close(getattr(s, key)[0], ref[key], 0.003, key)
    _close(s.J[0], ref["J"], 0.03, "J")  # El Darwish & Johnston; measured -1.1 %..-0.6 %
    _close(s.Cw[0], ref["Cw"], 0.05, "Cw")  # thin-walled tee formula; measured +1.3 %..+2.7 %
    # centroid depth below the flange top
    d = dims[0]
    _close(-s.yo[0] - s.tf[0] / 2.0 + d, ref["cy"], 0.002, "centroid")
    # shear centre above the centroid (towards the flange); thin-walled theory puts it at the
    # flange mid-thickness, the finite-element one is slightly lower: measured +2.3 %..+4.0 %
    _close(s.yo[0], ref["sy"] - ref["cy"], 0.06, "yo")
    assert s.xo[0] == 0.0


# channel d, bf, tw, tf, r: C-like shapes of several proportions, one without fillets
U_CASES = [(13.8, 4.0, 0.34, 0.595, 0.595), (10.0, 5.0, 0.5, 0.8, 0.0),
           (12.0, 3.0, 0.3, 0.4, 0.5), (15.0, 3.716, 0.716, 0.65, 0.5)]


@pytest.mark.parametrize("dims", U_CASES)
def test_channel_against_sectionproperties(dims):
    ref = _reference("u", *dims)  # sectionproperties channel_section (web at x = 0..tw)
    s = channel(*dims)
    for key in ("A", "Ix", "Iy"):
        _close(getattr(s, key)[0], ref[key], 0.003, key)
    # J: Roark rectangles + L junctions; measured -4.4 %..-0.1 % (on the safe side for E4)
    assert -0.07 < s.J[0] / ref["J"] - 1.0 < 0.01, (s.J[0], ref["J"])
    _close(s.Cw[0], ref["Cw"], 0.04, "Cw")  # thin-walled channel formula; measured -2.8 %..-0.9 %
    # distance centroid -> shear centre (shear centre behind the web); measured +1.3 %..+2.7 %
    _close(s.xo[0], ref["cx"] - ref["sx"], 0.04, "xo")
    assert ref["sx"] < 0.0  # the reference shear centre is outside the web too
    assert s.yo[0] == 0.0


# H, B, t, r_out: HSS8X8X1/4 shape, a deep thick tube, a thin tube, sharp corners
HSS_CASES = [(8.0, 8.0, 0.233, 0.466), (12.0, 4.0, 0.465, 0.93), (6.0, 3.0, 0.125, 0.25),
             (10.0, 6.0, 0.5, 0.0)]


@pytest.mark.parametrize("dims", HSS_CASES)
def test_rect_hollow_against_sectionproperties(dims):
    ref = _reference("hss", *dims)  # sectionproperties rectangular_hollow_section
    s = rect_hollow(*dims)
    for key in ("A", "Ix", "Iy"):
        _close(getattr(s, key)[0], ref[key], 0.003, key)
    _close(s.J[0], ref["J"], 0.04, "J")  # Bredt on the midline; measured -3.5 %..-0.3 %
    assert s.Cw[0] == 0.0  # closed section: Cw taken as 0 (documented convention)


@pytest.mark.parametrize("dims", [(6.625, 0.26), (20.0, 0.5), (4.0, 0.9)])
def test_circ_hollow_against_sectionproperties(dims):
    ref = _reference("chs", *dims)  # sectionproperties circular_hollow_section, 96-gon
    s = circ_hollow(*dims)
    for key in ("A", "Ix", "Iy", "J"):
        _close(getattr(s, key)[0], ref[key], 0.005, key)  # 96-gon vs true circle
    assert abs(ref["Cw"]) < 1e-6 * s.Ix[0] * s.d[0] ** 2 and s.Cw[0] == 0.0


@pytest.mark.parametrize("dims", [(4.0, 4.0), (6.0, 2.0), (1.0, 10.0)])
def test_solid_rect_against_sectionproperties(dims):
    ref = _reference("rect", *dims)  # sectionproperties rectangular_section
    s = solid_rect(*dims)
    for key in ("A", "Ix", "Iy"):
        _close(getattr(s, key)[0], ref[key], 1e-9, key)
    _close(s.J[0], ref["J"], 0.005, "J")  # Saint-Venant series vs finite elements


def test_solid_circle_against_sectionproperties():
    ref = _reference("circle", 2.5)  # sectionproperties circular_section, 96-gon
    s = solid_circle(2.5)
    for key in ("A", "Ix", "Iy", "J"):
        _close(getattr(s, key)[0], ref[key], 0.005, key)


# ------------------------------------------------------------------ conventions


def test_i_section_conventions():
    # element definitions and flags of the task's contract (engine.sections conventions)
    s = i_section(13.8, 8.03, 0.34, 0.595, r=0.595)
    assert s.kind[0] == Kind.I_SHAPE and s.family[0] == "I"
    assert s.designation[0] == "I 13.8x8.03x0.34x0.595 r0.595"
    assert (s.b1[0], s.t1[0], s.n1[0], s.cls1[0]) == (
        pytest.approx(8.03 / 2), 0.595, 4, ElementClass.UNSTIFFENED_FLANGE)
    assert (s.b2[0], s.t2[0], s.n2[0], s.cls2[0]) == (
        pytest.approx(13.8 - 2 * (0.595 + 0.595)), 0.34, 1, ElementClass.STIFFENED_WEB)
    assert s.H[0] == 1.0
    assert s.ro[0] == pytest.approx(np.sqrt((s.Ix[0] + s.Iy[0]) / s.A[0]))
    assert s.weight[0] == pytest.approx(WEIGHT_PER_AREA * s.A[0])
    assert WEIGHT_PER_AREA == 3.40  # 490 lb/ft³ / 144 (common practice, no source)
    assert i_section(10, 5, 0.3, 0.5).designation[0] == "I 10x5x0.3x0.5"
    assert i_section(10, 5, 0.3, 0.5, label="PL-I").designation[0] == "PL-I"


def test_tee_and_channel_use_e4_8_and_e4_9():
    for s in (tee(6.9, 8.03, 0.34, 0.595, 0.595), channel(13.8, 4.0, 0.34, 0.595, 0.595)):
        xo, yo, A = s.xo[0], s.yo[0], s.A[0]
        # AISC 360-22 Eq. E4-9 and E4-8
        ro2 = xo**2 + yo**2 + (s.Ix[0] + s.Iy[0]) / A
        assert s.ro[0] == pytest.approx(np.sqrt(ro2))
        assert s.H[0] == pytest.approx(1.0 - (xo**2 + yo**2) / ro2)
        assert 0.0 < s.H[0] < 1.0
    t = tee(6.9, 8.03, 0.34, 0.595, 0.595)
    assert t.kind[0] == Kind.TEE and t.family[0] == "T" and t.yo[0] > 0
    assert (t.b1[0], t.n1[0], t.cls1[0]) == (pytest.approx(4.015), 2,
                                             ElementClass.UNSTIFFENED_FLANGE)
    assert (t.b2[0], t.t2[0], t.n2[0], t.cls2[0]) == (6.9, 0.34, 1, ElementClass.TEE_STEM)
    u = channel(13.8, 4.0, 0.34, 0.595, 0.595)
    assert u.kind[0] == Kind.CHANNEL and u.family[0] == "U" and u.xo[0] > 0
    assert (u.b1[0], u.n1[0], u.cls1[0]) == (4.0, 2, ElementClass.UNSTIFFENED_FLANGE)
    # web h = d - 2(tf + r) (see channel())
    assert (u.b2[0], u.n2[0], u.cls2[0]) == (pytest.approx(11.42), 1, ElementClass.STIFFENED_WEB)


def test_hollow_and_solid_conventions():
    s = rect_hollow(8.0, 8.0, 0.233)  # default r_out = 2t
    assert s.kind[0] == Kind.RECT_HSS and s.family[0] == "HSS"
    assert s.A[0] == pytest.approx(rect_hollow(8.0, 8.0, 0.233, r_out=0.466).A[0])
    assert (s.b1[0], s.n1[0], s.cls1[0]) == (pytest.approx(8 - 3 * 0.233), 2,
                                             ElementClass.HSS_WALL)
    assert (s.b2[0], s.n2[0], s.cls2[0]) == (pytest.approx(8 - 3 * 0.233), 2,
                                             ElementClass.HSS_WALL)
    assert (s.d[0], s.bf[0], s.tw[0], s.tf[0], s.H[0]) == (8.0, 8.0, 0.233, 0.233, 1.0)
    a, b = rect_hollow(12.0, 4.0, 0.3), rect_hollow(4.0, 12.0, 0.3)
    assert a.Ix[0] == pytest.approx(b.Iy[0]) and a.Iy[0] == pytest.approx(b.Ix[0])
    # flat widths = outside - 3t (AISC 360-22 B4.1b(d))
    assert a.b1[0] == pytest.approx(4 - 0.9) and a.b2[0] == pytest.approx(12 - 0.9)
    c = circ_hollow(6.625, 0.26)
    assert c.kind[0] == Kind.ROUND_HSS and c.family[0] == "HSS_ROUND"
    assert (c.b1[0], c.t1[0], c.n1[0], c.cls1[0]) == (6.625, 0.26, 1, ElementClass.ROUND_WALL)
    for s, kind, fam in ((solid_rect(4, 2), Kind.SOLID_RECT, "RECT"),
                         (solid_circle(2), Kind.SOLID_ROUND, "ROUND")):
        assert s.kind[0] == kind and s.family[0] == fam
        assert s.cls1[0] == ElementClass.NONE and s.cls2[0] == ElementClass.NONE
        assert s.n1[0] == 0 and s.n2[0] == 0 and s.H[0] == 1.0
    assert solid_circle(2.0).J[0] == pytest.approx(np.pi * 2.0**4 / 32)  # πD⁴/32


# ------------------------------------------------------------------ vectorization


def _assert_same(a: SectionTable, b: SectionTable) -> None:
    assert len(a) == len(b)
    for name in SectionTable.__dataclass_fields__:
        x, y = getattr(a, name), getattr(b, name)
        if x.dtype == object:
            assert list(x) == list(y), name
        else:
            np.testing.assert_allclose(x, y, rtol=1e-12, atol=0, err_msg=name)


@pytest.mark.parametrize(
    "builder, rows",
    [
        (i_section, [(13.8, 8.03, 0.34, 0.595, 0.595), (10, 10, 0.5, 0.8, 0.0),
                     (24, 7, 0.4, 0.6, 0.5)]),
        (tee, T_CASES),
        (channel, U_CASES),
        (rect_hollow, HSS_CASES),
        (circ_hollow, [(6.625, 0.26), (20.0, 0.5)]),
        (solid_rect, [(4.0, 4.0), (6.0, 2.0), (1.0, 10.0)]),
        (solid_circle, [(2.0,), (3.5,)]),
    ],
)
def test_arrays_match_scalars(builder, rows):
    columns = [np.array(c, dtype=float) for c in zip(*rows, strict=True)]
    together = builder(*columns)
    one_by_one = SectionTable.concat([builder(*row) for row in rows])
    _assert_same(together, one_by_one)


def test_scalars_broadcast_against_arrays():
    s = i_section(np.array([10.0, 12.0, 14.0]), 8.0, 0.3, 0.5, r=0.4)
    assert len(s) == 3 and np.all(np.diff(s.Ix) > 0)
    _assert_same(s.take(np.array([1])), i_section(12.0, 8.0, 0.3, 0.5, 0.4))
    h = rect_hollow([8.0, 6.0], [8.0, 4.0], 0.233)
    assert len(h) == 2
    labels = tee([6.0, 7.0], 6.0, 0.3, 0.4, label=["A", "B"]).designation
    assert list(labels) == ["A", "B"]


# ------------------------------------------------------------------ bad input


@pytest.mark.parametrize(
    "call, words",
    [
        (lambda: i_section(10.0, 5.0, 6.0, 0.5), "tw must be less than bf"),
        (lambda: i_section(10.0, 5.0, 0.3, 5.0), "2*tf must be less than d"),
        (lambda: i_section(-10.0, 5.0, 0.3, 0.5), "d must be a positive number"),
        (lambda: i_section(10.0, 5.0, 0.3, 0.5, r=-0.1), "r must be zero or a positive"),
        (lambda: i_section(10.0, 5.0, 0.3, 0.5, r=4.6), "clear web"),
        (lambda: i_section(10.0, float("nan"), 0.3, 0.5), "bf must be a positive number"),
        (lambda: tee(0.5, 5.0, 0.3, 0.5), "tf must be less than d"),
        (lambda: channel(10.0, 0.3, 0.3, 0.5), "tw must be less than bf"),
        (lambda: rect_hollow(8.0, 0.4, 0.233), "2*t must be less than B"),
        (lambda: rect_hollow(8.0, 8.0, 0.233, r_out=5.0), "r_out must not exceed"),
        (lambda: circ_hollow(6.0, 3.0), "2*t must be less than D"),
        (lambda: solid_rect(0.0, 2.0), "H must be a positive number"),
        (lambda: solid_circle(-1.0), "D must be a positive number"),
    ],
)
def test_invalid_dimensions_raise_naming_the_dimension(call, words):
    with pytest.raises(ValueError, match=words.replace("*", r"\*").replace("+", r"\+")):
        call()


def test_invalid_rows_are_listed_for_arrays():
    with pytest.raises(ValueError, match=r"tw must be less than bf in rows \[1, 3\]"):
        i_section([10, 10, 10, 10], [5, 0.2, 5, 0.1], 0.3, 0.5)
    reasons = dimension_problems("I", d=[10, 10, -1], bf=[5, 0.2, 5], tw=0.3, tf=0.5)
    assert reasons[0] == ""
    assert reasons[1] == "tw must be less than bf; tw + 2*r (web and fillets) must not exceed bf"
    assert "d must be a positive number" in reasons[2]
    assert list(dimension_problems("HSS", H=8.0, B=8.0, t=0.233)) == [""]
    assert "2*t must be less than D" in dimension_problems("HSS_ROUND", D=4.0, t=2.0)[0]
    # r=None (an unset IFC FilletRadius) means no fillet, like r=0
    _assert_same(i_section(10, 5, 0.3, 0.5, r=None), i_section(10, 5, 0.3, 0.5))
    assert dimension_problems("T", d=5, bf=4, tw=0.3, tf=0.5, r=None)[0] == ""
    assert dimension_problems("U", d=5, bf=None, tw=0.3, tf=0.5)[0] == (
        "bf must be a positive number")
    with pytest.raises(ValueError, match="t must be a number"):
        rect_hollow(8.0, 8.0, "thin")
    with pytest.raises(ValueError, match="unknown profile family"):
        dimension_problems("Z", d=1.0)
    with pytest.raises(ValueError, match=r"missing \['tf'\]"):
        dimension_problems("I", d=1.0, bf=1.0, tw=0.1)


def test_tee_centroid_ybar_matches_the_database() -> None:
    # WT7X15: d = 6.92, bf = 6.73, tw = 0.270, tf = 0.385, kdes = 0.785 (fillet ≈ kdes − tf),
    # ȳ = 1.58 in (AISC Shapes Database v16.0).
    t = tee(6.92, 6.73, 0.27, 0.385, 0.785 - 0.385)
    assert t.ybar[0] == pytest.approx(1.58, rel=0.02)
    assert t.yo[0] == pytest.approx(t.ybar[0] - 0.385 / 2.0)


def test_overflowing_dimension_gives_inf_not_a_warning() -> None:
    """A damaged model's 1e300 in dimension (issue 13 item 6, fuzz finding).

    Before, numpy printed "RuntimeWarning: overflow encountered" lines on stderr; the member
    is left to the plausibility limits (depth outside 0.42-120 in: not checked).
    """
    from stanchion.engine.compression import compressive_strength

    with warnings.catch_warnings():
        warnings.simplefilter("error")
        sec = rect_hollow(H=1e300, B=3.0, t=0.1875)
        assert not np.isfinite(sec.Ix[0])
        compressive_strength(sec, np.array([50.0]), np.array([120.0]), np.array([120.0]),
                             np.array([120.0]))
