"""Load combinations through the members request: options, custom sets, detail, messages."""

from __future__ import annotations

import pytest

from stanchion.service.errors import InputError
from stanchion.service.members_check import check_request
from stanchion.service.request import MembersRequest


def _report(**extra) -> dict:
    member = {"id": "C1", "section": "W14X48", "fy": 50, "length": 16,
              "loads": extra.pop("loads", {"D": 100.0, "L": 80.0})}
    return check_request(MembersRequest.model_validate({"members": [member], **extra}))


def test_default_lrfd_governing_combination() -> None:
    # ASCE 7-22 §2.3.1 combination 2: 1.2(100) + 1.6(80) = 248 kips (vs 1.4(100) = 140).
    m = _report()["members"][0]
    assert m["required_strength"] == pytest.approx(248.0)
    assert m["combination"] == "1.2D+1.6L+0.5Lr"


def test_half_live_exception_changes_only_when_asked() -> None:
    # Wind governs with a large W: §2.3.1 combination 4 1.2D + 1.0W + 1.0L = 120 + 200 + 80 =
    # 400; with the 0.5L exception 120 + 200 + 40 = 360 (ASCE 7-22 §2.3.1 exception 1).
    loads = {"D": 100.0, "L": 80.0, "W": 200.0}
    full = _report(loads=loads)["members"][0]
    half = _report(loads=loads, half_live_exception=True)["members"][0]
    assert full["required_strength"] == pytest.approx(400.0)
    assert half["required_strength"] == pytest.approx(360.0)


def test_custom_combinations_replace_the_defaults_and_say_so() -> None:
    # Custom 1.0D + 1.0L = 180 kips (the request's own factors); W/E none.
    report = _report(combinations=[{"name": "service", "factors": {"D": 1.0, "L": 1.0}}])
    m = report["members"][0]
    assert m["required_strength"] == pytest.approx(180.0)
    assert m["combination"] == "service"
    assert "custom load combinations" in report["design_basis"]


def test_custom_combination_with_unknown_load_type_is_refused() -> None:
    with pytest.raises(ValueError, match="Q"):
        MembersRequest.model_validate({
            "members": [{"id": "A"}], "combinations": [{"name": "x", "factors": {"Q": 1}}]})


def test_duplicate_custom_combination_names_are_refused() -> None:
    with pytest.raises(InputError, match="combinations"):
        _report(combinations=[{"name": "x", "factors": {"D": 1}},
                              {"name": "x", "factors": {"D": 2}}])


def test_detail_lists_every_combination_value() -> None:
    # ASCE 7-22 §2.4.1 (ASD): D = 100, L = 80 -> D: 100, D+L: 180, D+0.75L+0.75Lr: 160.
    m = _report(design_method="ASD", detail=True)["members"][0]
    combos = m["combinations"]
    assert combos["1.0D"] == pytest.approx(100.0)
    assert combos["1.0D+1.0L"] == pytest.approx(180.0)
    assert combos["1.0D+0.75L+0.75Lr"] == pytest.approx(160.0)
    assert m["required_strength"] == pytest.approx(180.0)


def test_detail_of_a_member_given_its_required_strength_is_null() -> None:
    # No loads, so no combination was evaluated: null says so (0 would read as a value).
    req = {"members": [{"id": "A", "section": "W14X48", "fy": 50, "length": 16,
                        "required_strength": 200.0},
                       {"id": "B", "section": "W14X48", "fy": 50, "length": 16,
                        "loads": {"D": 100.0}}], "detail": True}
    a, b = check_request(MembersRequest.model_validate(req))["members"]
    assert a["combinations"] and set(a["combinations"].values()) == {None}
    assert a["required_strength"] == pytest.approx(200.0)  # as given
    # ASCE 7-22 §2.3.1 combination 1: 1.4D = 140 kips (hand)
    assert b["combinations"]["1.4D"] == pytest.approx(140.0)


def test_wind_uplift_reports_net_tension_in_request_units() -> None:
    # ASCE 7-22 §2.3.1 combination 5 with W reversed: 0.9(20) − 1.0(60) = −42 kips (tension),
    # reported as a message; compression governs by 1.2(20) + 1.0(60) = 84 kips (comb. 4).
    m = _report(loads={"D": 20.0, "W": 60.0}, units={"force": "kN", "length": "ft",
                                                      "stress": "ksi"})["members"][0]
    assert m["required_strength"] == pytest.approx(84.0)
    assert any("net tension of 42" in s and "kN" in s for s in m["messages"])


def test_si_loads_give_the_same_utilization() -> None:
    # 1 kip = 4.448222 kN (pint definitions); utilization is unit-free.
    us = _report()["members"][0]
    si = _report(loads={"D": 444.8222, "L": 355.8578},
                 units={"force": "kN", "length": "ft", "stress": "ksi"})["members"][0]
    assert si["utilization"] == pytest.approx(us["utilization"], abs=1e-4)


@pytest.mark.parametrize("extra", [
    {"design_method": "ASD", "half_live_exception": True},
    {"half_live_exception": True, "combinations": [{"name": "x", "factors": {"D": 1.0}}]},
])
def test_half_live_exception_where_it_cannot_apply_is_refused(extra: dict) -> None:
    # ASCE 7-22 §2.3.1: the 0.5L exception modifies the strength design combinations only;
    # ignoring it silently would hide that the request asked for something not done.
    with pytest.raises(ValueError, match="half_live_exception"):
        _report(**extra)
