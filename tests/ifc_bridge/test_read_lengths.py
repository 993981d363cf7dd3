"""Member length: axis, extrusion, base quantity, analysis member, none."""

from __future__ import annotations

import math

import pytest

from stanchion.ifc_bridge.read import read_columns

W14X48 = {"d": 13.8, "bf": 8.03, "tw": 0.340, "tf": 0.595}  # AISC Shapes Database v16.0


def _column(b, **kw):
    prof = b.profile("I", "W14X48", **W14X48)
    col = b.column("C1", profile=prof, material=b.material("A992"), **kw)
    b.loads(col, D=10.0)
    return col


def _read(b):
    return read_columns(b.model).members


def test_axis_length_first(builder):
    _column(builder, length=150.0, axis=True)
    m = _read(builder)
    assert m.extra["length_source"][0] == "axis"
    # expected: the value given to the model above (input round trip)
    assert m.lx[0] == pytest.approx(150.0)


def test_axis_and_extrusion_disagreeing_is_noted(builder):
    col = _column(builder, length=150.0, axis=True)
    body = next(r for r in col.Representation.Representations
                if r.RepresentationIdentifier == "Body")
    body.Items[0].Depth = builder.L(120.0)
    m = _read(builder)
    # expected: the value given to the model above (input round trip)
    assert m.lx[0] == pytest.approx(150.0)
    assert any("axis length 150 in and extrusion depth 120 in differ" in s
               for s in m.messages[0])


def test_extrusion_depth(builder):
    _column(builder, length=168.0)
    m = _read(builder)
    assert m.extra["length_source"][0] == "extrusion"
    # expected: the value given to the model above (input round trip)
    assert m.lx[0] == m.ly[0] == m.lz[0] == pytest.approx(168.0)


def test_base_quantity_length(builder):
    if builder.schema == "IFC2X3":
        col = _column(builder, length=None)  # IFC2X3 keeps the profile in the body; no body
    else:
        col = _column(builder, length=96.0, body=False)
    builder.qto_length(col, 96.0)
    m = _read(builder)
    assert m.extra["length_source"][0] == "quantity"
    assert m.lx[0] == pytest.approx(96.0)


def test_analysis_member_length(builder):
    col = _column(builder, length=None)
    builder.analysis_member(col, length=132.0)
    m = _read(builder)
    assert m.extra["length_source"][0] == "analytical"
    # expected: the value given to the model above (input round trip)
    assert m.lx[0] == pytest.approx(132.0)


def test_analysis_member_related_the_other_way(builder):
    col = _column(builder, length=None)
    builder.analysis_member(col, length=132.0, relating="column")
    # expected: the value given to the model above (input round trip)
    assert _read(builder).lx[0] == pytest.approx(132.0)


def test_no_length(builder):
    _column(builder, length=None)
    m = _read(builder)
    assert m.extra["length_source"][0] == "none"
    assert "no length" in m.reason[0]
    assert math.isnan(m.lx[0])


def test_unbraced_lengths_replace_a_missing_length(builder):
    col = _column(builder, length=None)
    builder.design(col, UnbracedLengthX=144.0, UnbracedLengthY=72.0, UnbracedLengthZ=72.0)
    m = _read(builder)
    assert (m.lx[0], m.ly[0], m.lz[0]) == pytest.approx((144.0, 72.0, 72.0))
    assert m.reason[0] is None or "no length" not in m.reason[0]


def test_length_in_feet_model(make_builder, schema):
    b = make_builder("ft_kip", schema)
    _column(b, length=150.0, axis=True)
    # expected: the value given to the model above (input round trip)
    assert _read(b).lx[0] == pytest.approx(150.0)
