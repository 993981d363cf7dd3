"""Load-case policy (engine.loads): case -> load type, and how several cases combine."""

from __future__ import annotations

import pytest

from stanchion.engine.loads import CaseForce, LoadTable, case_load_type, combine_cases


@pytest.mark.parametrize(
    ("texts", "source", "action_type", "expected"),
    [
        (["Dead"], "DEAD_LOAD_G", None, "D"),
        (["Roof live"], "LIVE_LOAD_Q", None, "Lr"),  # roof name on a live source
        (["Floor live"], "LIVE_LOAD_Q", None, "L"),
        (["W2"], "USERDEFINED", None, "W"),  # name token
        (["Seismic X"], None, None, "E"),  # name word
        (["G1"], "NOTDEFINED", "PERMANENT_G", "D"),  # permanent action, nothing else
        (["Thermal"], "TEMPERATURE_T", None, None),  # no ASCE 7-22 load type here
        (["D + L"], None, None, None),  # ambiguous name
    ],
)
def test_case_load_type(texts, source, action_type, expected):
    # expected: the rule table of engine.loads (common practice, no source)
    kind, rule = case_load_type(texts, action_source=source, action_type=action_type)
    assert kind == expected
    assert rule


def test_a_combination_is_never_a_load_case():
    kind, rule = case_load_type(["1.2D+1.6L"], action_source="DEAD_LOAD_G", combination=True)
    assert kind is None and "combinations are formed by ASCE 7-22" in rule


def test_cases_of_one_type_add_and_winds_envelope():
    out, notes = combine_cases([
        CaseForce(1, "D", "Dead", 100.0), CaseForce(1, "D", "Finishes", 20.0),
        CaseForce(1, "W", "Wind X", 30.0), CaseForce(1, "W", "Wind Y", -45.0),
    ])
    # D: 100 + 20 = 120 (added); W: |-45| > |30|, -45 kept with its sign (hand computed)
    assert out == {"D": 120.0, "W": -45.0}
    assert "D from 2 load cases (Dead, Finishes): added" in notes
    assert "W from 2 load cases (Wind X, Wind Y): largest magnitude used" in notes


def test_several_analysis_models_are_enveloped_not_added():
    out, notes = combine_cases([
        CaseForce("a", "D", "Dead", 100.0, "run 1"), CaseForce("b", "D", "Dead", 110.0, "run 2"),
        CaseForce("a", "E", "EQ", 10.0, "run 1"), CaseForce("b", "E", "EQ", -12.0, "run 2"),
    ])
    # per type the largest compression (D: 110) or magnitude (E: -12) over the two models
    assert out == {"D": 110.0, "E": -12.0}
    assert notes == ["results of 2 analysis models (run 1, run 2) are not added: the largest "
                     "compression per load type is used"]


def test_no_cases():
    assert combine_cases([]) == ({}, [])


def test_load_table_in_kip():
    table = LoadTable((("C1", {"D": 10.0, "L": 2.0}),), {"D": 1.0, "L": None}, "t.csv")
    assert table.uses_model_unit
    # L in the model unit, here 0.5 kip per unit (stand-in factor): 2 × 0.5 = 1 kip
    assert table.in_kip(0.5) == [("C1", {"D": 10.0, "L": 1.0})]
