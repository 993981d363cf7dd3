"""Member checks: validity reasons, status and demand (engine.check)."""

from __future__ import annotations

import numpy as np
import pytest

from stanchion.engine import catalog
from stanchion.engine.check import _REASONS, FAIL, NOT_CHECKED, PASS, SKIPPED, check_members
from stanchion.engine.members import LOAD_TYPES, MemberTable

FT = 12.0  # in per ft


def _members(n: int, **columns) -> MemberTable:
    """``n`` W14X48 members, Fy 50 ksi, 16 ft, D = 95 and L = 60 kip, with columns replaced."""
    loads = np.full((n, len(LOAD_TYPES)), np.nan)
    loads[:, 0], loads[:, 1] = 95.0, 60.0
    args = dict(section_index=catalog.lookup(["W14X48"] * n), Fy=np.full(n, 50.0),
                length=np.full(n, 16 * FT), loads=loads)
    args.update(columns)
    return MemberTable.build(ids=[f"C{i}" for i in range(n)], sections=catalog.load_catalog(),
                             **args)


def test_usable_members_pass_or_fail_on_the_table_strength() -> None:
    # W14X48, Fy = 50 ksi, Lc = 16 ft: φcPn = 303 kip (AISC Manual Table 4-1a, read-off).
    # Demands 1.2·95 + 1.6·60 = 210 kip and 1.2·150 + 1.6·100 = 340 kip (ASCE 7-22 §2.3.1
    # combination 2, by hand).
    loads = np.full((2, len(LOAD_TYPES)), np.nan)
    loads[0, :2], loads[1, :2] = (95.0, 60.0), (150.0, 100.0)
    r = check_members(_members(2, loads=loads))
    assert r.status.tolist() == [PASS, FAIL]
    assert r.required_strength.tolist() == pytest.approx([210.0, 340.0])
    assert r.available_strength[0] == pytest.approx(303.0, abs=1.0)
    assert r.reason.tolist() == [None, None]


def _bad(column: str, value: float, n: int = 3) -> dict:
    arr = np.full(n, 50.0 if column == "Fy" else 16 * FT if column.startswith("l") else 1.0)
    arr[1] = value
    return {column: arr}


@pytest.mark.parametrize(("columns", "reason"), [
    ({"section_index": np.array([0, -1, 0])}, "no usable section"),
    (_bad("Fy", np.nan), "no yield strength"),
    (_bad("Fy", 0.0), "yield strength must be a finite number greater than zero"),
    (_bad("lx", np.nan), "no length"),
    # A bad lx is named "unbraced length x" (issue 13: "lx": -5 was reported as "length"):
    (_bad("lx", -1.0), "unbraced length x must be a finite number greater than zero"),
    (_bad("ly", np.nan), "no unbraced length y"),
    (_bad("lz", 0.0), "unbraced length z must be a finite number greater than zero"),
    (_bad("kx", 0.0), "effective length factor kx must be a finite number greater than zero"),
    (_bad("ky", np.nan), "effective length factor ky must be a finite number greater than zero"),
    (_bad("kz", -0.5), "effective length factor kz must be a finite number greater than zero"),
    ({"E": np.array([29000.0, 0.0, 29000.0])}, "E and G must be finite numbers greater than zero"),
    ({"G": np.array([11200.0, np.nan, 11200.0])},
     "E and G must be finite numbers greater than zero"),
    ({"loads": np.array([[95.0, *[np.nan] * 6], [np.nan] * 7, [95.0, *[np.nan] * 6]])},
     "no loads"),
    ({"required_strength": np.array([np.nan, -5.0, np.nan])},
     "required strength must be compression (zero or positive)"),
    # Infinite numbers (a JSON 1e400, an IFC real out of range) never check as "pass":
    (_bad("Fy", np.inf), "yield strength must be a finite number greater than zero"),
    (_bad("lx", np.inf), "unbraced length x must be a finite number greater than zero"),
    (_bad("ky", np.inf), "effective length factor ky must be a finite number greater than zero"),
    ({"E": np.array([29000.0, np.inf, 29000.0])},
     "E and G must be finite numbers greater than zero"),
    ({"loads": np.array([[95.0, *[np.nan] * 6], [np.inf, *[np.nan] * 6],
                         [95.0, *[np.nan] * 6]])},
     "loads and required strength must be finite numbers"),
    ({"required_strength": np.array([np.nan, np.inf, np.nan])},
     "loads and required strength must be finite numbers"),
])
def test_each_reason_makes_only_its_member_not_checked(columns: dict, reason: str) -> None:
    # The reasons and their order are ours (common practice, no source); a member with
    # unusable data is never reported "pass".
    if "section_index" in columns:
        columns = {"section_index": np.where(columns["section_index"] < 0, -1,
                                             catalog.lookup(["W14X48"] * 3))}
    r = check_members(_members(3, **columns))
    assert r.status.tolist() == [PASS, NOT_CHECKED, PASS]
    assert r.reason.tolist() == [None, reason, None]
    assert reason in _REASONS
    assert np.isnan(r.utilization[1])
    if reason == "no loads":  # the capacity is still computed: same member as its neighbours
        assert r.available_strength[1] == r.available_strength[0]
    else:
        assert np.isnan(r.available_strength[1])
    if "finite numbers" in reason and "E and G" not in reason:
        assert np.isnan(r.required_strength[1])  # no partial demand for suggestions


def test_angles_are_out_of_scope() -> None:
    idx = catalog.lookup(["W14X48", "L4X4X1/2"])
    r = check_members(_members(2, section_index=idx))
    assert r.status.tolist() == [PASS, NOT_CHECKED]
    assert r.reason[1].startswith("angles and double angles are out of scope")


def test_the_first_reason_that_applies_is_given() -> None:
    # No yield strength comes before no length, which comes before no loads (order of
    # _REASONS); a reason from the reader comes before all of them.
    Fy, lx = np.array([np.nan, 50.0]), np.array([np.nan, np.nan])
    loads = np.full((2, len(LOAD_TYPES)), np.nan)
    r = check_members(_members(2, Fy=Fy, lx=lx, loads=loads))
    assert r.reason.tolist() == ["no yield strength", "no length"]
    m = _members(2, Fy=Fy)
    m.reason[0] = "profile: width must be positive"
    assert check_members(m).reason.tolist() == ["profile: width must be positive", None]


def test_given_required_strength_replaces_the_combinations() -> None:
    # A given (already factored) strength is used as is (docs/design.md §2); the others still
    # combine D = 95, L = 60 kip to 210 kip (ASCE 7-22 §2.3.1 combination 2, by hand; its
    # Lr, S and R variants tie without roof loads and the first listed is named).
    r = check_members(_members(2, required_strength=np.array([250.0, np.nan])))
    assert r.required_strength.tolist() == pytest.approx([250.0, 210.0])
    assert r.combination.tolist() == ["required strength as given", "1.2D+1.6L+0.5Lr"]


def test_non_steel_members_are_skipped_with_no_numbers() -> None:
    # Five usable W14X48 members (the passing member of the first test: phi_c Pn = 303 kip,
    # AISC Manual Table 4-1a, read-off); only the material class differs.  Skipped: status
    # 'skipped', reason 'not steel: <class>', no capacity, no demand (docs/design.md §3/§5).
    m = _members(5, material=["steel", "concrete", "timber", "unknown", "steel, concrete"])
    r = check_members(m)
    assert r.status.tolist() == [PASS, SKIPPED, SKIPPED, PASS, NOT_CHECKED]
    assert r.reason[1] == "not steel: concrete"
    assert r.reason[2] == "not steel: timber"
    assert r.reason[4].startswith("material names steel and concrete")
    for i in (1, 2, 4):
        assert np.isnan([r.available_strength[i], r.utilization[i], r.slenderness[i],
                         r.Fcr[i]]).all()
        assert r.limit_state[i] == "" and r.combination[i] == ""
    # A not-checked member keeps its known demand (for suggestions); a skipped one has none.
    assert np.isnan(r.required_strength[[1, 2]]).all()
    assert r.required_strength[4] == pytest.approx(210.0)  # 1.2*95 + 1.6*60, by hand
    assert r.available_strength[0] == pytest.approx(303.0, abs=1.0)
    assert r.available_strength[3] == pytest.approx(303.0, abs=1.0)


def test_stainless_members_are_not_checked_with_the_reason() -> None:
    # A usable W14X48 (φcPn = 303 kip, AISC Manual Table 4-1a, read-off) of stainless steel:
    # AISC 360 does not cover it (AISC 370 does): not checked, never passed nor skipped, and
    # the reason replaces any other (here a missing Fy).
    m = _members(3, material=["steel", "stainless steel", "stainless steel"],
                 Fy=np.array([50.0, 50.0, np.nan]))
    r = check_members(m)
    assert r.status.tolist() == [PASS, NOT_CHECKED, NOT_CHECKED]
    for i in (1, 2):
        assert r.reason[i] == "stainless steel: designed to AISC 370, not checked here"
        assert np.isnan(r.available_strength[i])


def test_skipped_wins_over_missing_data() -> None:
    # A concrete column has no steel yield stress and no catalog section: it is skipped for
    # its material, not "not checked" for what a steel check would need.
    m = _members(2, Fy=np.full(2, np.nan), section_index=np.array([-1, -1]),
                 material=["concrete", "unknown"])
    r = check_members(m)
    assert r.status.tolist() == [SKIPPED, NOT_CHECKED]
    assert r.reason[0] == "not steel: concrete"
    assert r.reason[1] == "no usable section"


def _no_loads(n: int) -> np.ndarray:
    return np.full((n, len(LOAD_TYPES)), np.nan)


def test_members_without_loads_get_their_available_strength() -> None:
    # W14X48, Fy = 50 ksi, Lc = 16 ft: φcPn = 303 kip (AISC Manual Table 4-1a, read-off).
    # A member with usable capacity inputs and no loads is not checked, but an engineer
    # without loads yet still learns what it carries (common practice, no source).
    m = _members(4, loads=_no_loads(4),
                 reason=[None, "no loads (no analysis results, load table row or "
                         "Stanchion_Loads)", "no loads (none); no yield strength (none)",
                         "GlobalId X is used by 2 elements"])
    r = check_members(m)
    assert r.status.tolist() == [NOT_CHECKED] * 4
    assert r.reason[0] == "no loads"
    assert r.available_strength[:2] == pytest.approx([303.0, 303.0], abs=1.0)
    assert r.limit_state[0] == r.limit_state[1] != ""
    # another reason beside the missing loads: nothing is computed
    assert np.isnan(r.available_strength[2:]).all()
    assert np.isnan(r.utilization).all() and np.isnan(r.required_strength).all()


def test_a_member_without_loads_and_an_implausible_input_gets_no_capacity() -> None:
    # Fy = 500 ksi is outside the plausibility limits (engine/plausibility.py, 20-120 ksi).
    r = check_members(_members(1, loads=_no_loads(1), Fy=np.array([500.0])))
    assert r.reason[0].startswith("implausible yield stress")
    assert r.reason[0].endswith("; no loads")
    assert np.isnan(r.available_strength[0])


def test_a_skipped_member_without_loads_gets_no_capacity() -> None:
    r = check_members(_members(2, loads=_no_loads(2), material=["concrete", "steel"]))
    assert r.status.tolist() == [SKIPPED, NOT_CHECKED]
    assert np.isnan(r.available_strength[0]) and r.available_strength[1] > 0


def test_built_up_flanges_are_said_with_kc() -> None:
    # A welded I 20 x 13.3 x 0.625 x 0.5 in (no root radius) and the same with r = 0.5 in
    # (rolled).  h/tw = 19/0.625 = 30.4, kc = 4/sqrt(30.4) = 0.7255 -> "0.73" (AISC 360-22
    # Table B4.1a note [a], by hand); the rolled row gets no such message.
    from stanchion.engine import section_properties as sp
    from stanchion.engine.sections import SectionTable
    sections = SectionTable.concat([sp.i_section(20.0, 13.3, 0.625, 0.5, r)
                                    for r in (0.0, 0.5)])
    loads = np.full((2, len(LOAD_TYPES)), np.nan)
    loads[:, 0] = 100.0
    m = MemberTable.build(ids=["A", "B"], sections=sections, section_index=np.array([0, 1]),
                          Fy=np.full(2, 50.0), length=np.full(2, 12 * FT), loads=loads)
    r = check_members(m)
    assert ("flanges taken as built-up (no root radius): AISC 360-22 Table B4.1a case 2, "
            "kc = 0.73") in r.messages[0]
    assert not any("built-up" in s for s in r.messages[1])
