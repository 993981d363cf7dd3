"""The CSV load table, parsed by the front end (service.load_table) before any model is read."""

from __future__ import annotations

import re

import pytest

from stanchion.service.errors import InputError
from stanchion.service.load_table import LoadTableError, read_load_table

KIP_PER_KN = 0.2248089431  # 1 kN in kip (pint; common practice, no source)


def _table(tmp_path, text):
    path = tmp_path / "loads.csv"
    path.write_text(text)
    return read_load_table(path)


def test_values_and_header_units(tmp_path):
    table = _table(tmp_path, "element,D [kip],L [kN],S\nC1,95,100,\nC2,,,7\n")
    # expected: the cells as written (input round trip); units from the header
    assert table.rows == (("C1", {"D": 95.0, "L": 100.0}), ("C2", {"S": 7.0}))
    assert table.to_kip["D"] == 1.0  # kip -> kip
    assert table.to_kip["L"] == pytest.approx(KIP_PER_KN)
    assert table.to_kip["S"] is None  # no unit: the model's force unit
    assert table.uses_model_unit  # C2's S has no unit
    # in kip with a model unit of 2 kip (stand-in factor): S = 7 × 2 = 14 kip (hand computed)
    assert table.in_kip(2.0) == [("C1", {"D": 95.0, "L": pytest.approx(100 * KIP_PER_KN)}),
                                 ("C2", {"S": 14.0})]


def test_unit_less_column_without_values_uses_no_model_unit(tmp_path):
    table = _table(tmp_path, "element,D [kip],L\nC1,95,\n")
    assert not table.uses_model_unit  # the unit-less L column has no value


@pytest.mark.parametrize(
    ("text", "problem"),
    [
        ("name,D\nC1,1\n", "first column must be 'element'"),
        ("element,Dead\nC1,1\n", "column 'Dead' is not a load type"),
        ("element,D,D\nC1,1,2\n", "load type D appears twice"),
        ("element,D [ft]\nC1,1\n", "'ft' is not a force unit"),
        ("element,D [furlongs]\nC1,1\n", "'furlongs' is not a force unit"),
        ("element,D\nC1,lots\n", "line 2, column D: 'lots' is not a number"),
        ("element,D\nC1,inf\n", "line 2, column D: 'inf' is not a finite number"),
        ("element,D\n,5\n", "line 2: no element"),
        ("", "cannot read load table"),
    ],
)
def test_bad_tables_are_refused(tmp_path, text, problem):
    with pytest.raises(LoadTableError) as err:
        _table(tmp_path, text)
    assert problem in str(err.value)
    assert "\n" not in str(err.value)
    assert isinstance(err.value, InputError)  # the CLI's one-line exit-2 path


def test_missing_table_file(tmp_path):
    with pytest.raises(LoadTableError, match="no such file"):
        read_load_table(tmp_path / "none.csv")


def test_column_load_schedule_keyed_by_grid_and_level(tmp_path):
    table = _table(tmp_path, (
        "Grid,Level,GlobalId,Tag,Name,D [kN],L [kN]\n"
        "B-2,Level 1,2O2Fr$t4X7Zf8NOew3FLOH,T1,C1,400,250\n"
        '"B-2 (+610, -152 mm)",Level 1,,,C2,10,\n'
        ",,3Xyz,,C9,,\n"  # a template row of a column without a grid, left empty: left out
        ",Level 2,,,C8,5,\n"))  # loads without a grid: kept, the reader names it
    # expected: the cells as written; GlobalId, Tag and Name are for reference only
    assert table.rows == (("B-2", {"D": 400.0, "L": 250.0}),
                          ("B-2 (+610, -152 mm)", {"D": 10.0}), ("", {"D": 5.0}))
    assert table.levels == ("Level 1", "Level 1", "Level 2")
    assert table.to_kip["D"] == pytest.approx(KIP_PER_KN)


def test_element_table_keeps_reference_columns_apart(tmp_path):
    # the template of a model without a grid (stanchion loads-template): keyed by element
    t = _table(tmp_path, "element,grid,level,Tag,Name,D [kip]\nC1,,Level 1,T1,C1,5\n")
    assert t.levels is None
    # expected: the cells as written; grid, level, Tag and Name are for reference only
    assert t.rows == (("C1", {"D": 5.0}),)


def test_element_table_has_no_levels(tmp_path):
    assert _table(tmp_path, "element,D [kip]\nC1,1\n").levels is None


@pytest.mark.parametrize(
    ("text", "problem"),
    [
        ("level,grid,D\nL1,B-2,1\n", "first column must be 'element', or the first two "
                                     "'grid,level'"),
        ("grid,level,Tag,Tag,D\nB-2,L1,a,b,1\n", "column 'Tag' appears twice"),
        ("grid,level,Mark,D\nB-2,L1,a,1\n", "column 'Mark' is not a load type (D, L, Lr, S, "
                                            "R, W, E, optionally with a [unit], or GlobalId, "
                                            "Tag, Name for reference)"),
        ("element,Mark,D\nC1,x,1\n", "column 'Mark' is not a load type (D, L, Lr, S, R, W, "
                                      "E, optionally with a [unit], or grid, level, "
                                      "GlobalId, Tag, Name for reference)"),
        ("element,grid,Grid,D\nC1,x,y,1\n", "column 'Grid' appears twice"),
        ("grid,level,D\nB-2,L1,x\n", "line 2, column D: 'x' is not a number"),
    ],
)
def test_unusable_schedules(tmp_path, text, problem):
    with pytest.raises(LoadTableError, match="^load table .*" + re.escape(problem)):
        _table(tmp_path, text)
