"""Revision comparison against a previous report: what counts as new, fixed, changed.

Reports here are small hand-made dicts; utilizations are arbitrary test numbers (common
practice, no source) chosen on either side of the 0.05 threshold.
"""

from __future__ import annotations

import json
import re

import pytest

from stanchion.service.errors import InputError
from stanchion.service.reports.baseline import (
    compare,
    format_changes,
    load_baseline,
    regressions,
    skipped_warnings,
)


def _report(*members: tuple[str, str, float | None], basis: str = "basis A") -> dict:
    return {
        "design_basis": basis,
        "members": [{"id": i, "name": f"name-{i}", "section": "W14X48", "status": s,
                     "utilization": u} for i, s, u in members],
    }


OLD = _report(("A", "pass", 0.70), ("B", "fail", 1.20), ("C", "pass", 0.50),
              ("D", "not_checked", None), ("E", "pass", 0.90))
NEW = _report(("A", "pass", 0.76), ("B", "pass", 0.95), ("C", "fail", 1.05),
              ("D", "not_checked", None), ("F", "fail", 1.10), ("G", "not_checked", None))


def _ids(entries: list[dict]) -> list[str]:
    return [e["id"] for e in entries]


def test_compare_finds_every_kind_of_change() -> None:
    ch = compare(OLD, NEW, threshold=0.05, baseline_name="old.json")
    assert _ids(ch["new_failures"]) == ["C", "F"]  # C got worse, F is new and fails
    assert _ids(ch["fixed"]) == ["B"]
    assert _ids(ch["new_not_checked"]) == ["G"]  # D was already not checked
    assert _ids(ch["added"]) == ["F", "G"]
    assert _ids(ch["removed"]) == ["E"]
    # |0.76-0.70| = 0.06 > 0.05; |0.95-1.20| = 0.25; |1.05-0.50| = 0.55 (largest first)
    assert _ids(ch["utilization_changes"]) == ["C", "B", "A"]
    a = ch["utilization_changes"][2]
    assert a["change"] == pytest.approx(0.06)
    assert a["utilization_before"] == 0.70 and a["utilization_after"] == 0.76
    assert ch["counts"]["new_failures"] == 2 and ch["baseline"] == "old.json"


def test_threshold_is_an_absolute_difference() -> None:
    ch = compare(_report(("A", "pass", 0.70)), _report(("A", "pass", 0.74)), threshold=0.05)
    assert ch["utilization_changes"] == []
    ch = compare(_report(("A", "pass", 0.70)), _report(("A", "pass", 0.74)), threshold=0.03)
    assert _ids(ch["utilization_changes"]) == ["A"]


def test_regressions_count_new_not_checked_unless_allowed() -> None:
    ch = compare(OLD, NEW)
    assert regressions(ch) == 3  # C, F new failures + G newly not checked
    assert regressions(ch, allow_not_checked=True) == 2
    same = compare(OLD, OLD)
    assert regressions(same) == 0 and same["counts"]["utilization_changes"] == 0


def test_design_basis_change_is_noted() -> None:
    ch = compare(OLD, _report(("A", "pass", 0.70), basis="basis B"))
    assert ch["design_basis_before"] == "basis A"
    assert "basis A" in format_changes(ch)


def test_format_changes_names_members_and_counts() -> None:
    text = format_changes(compare(OLD, NEW, baseline_name="old.json"))
    assert "old.json" in text and "2 new failures" in text and "1 fixed" in text
    assert "name-C" in text and "name-E" in text


@pytest.mark.parametrize("content, expected", [
    ("not json", "not valid JSON"),
    ("[1, 2]", "no 'members' list"),
    ('{"members": {}}', "no 'members' list"),
    ('{"members": [{"status": "pass"}]}', "members[0] has no string 'id'"),
    ('{"members": [{"id": "A", "status": "ok"}]}', "status must be one of"),
    ('{"members": [{"id": "A", "status": "pass", "utilization": "high"}]}',
     "utilization must be a number"),
    ('{"members": [{"id": "A", "status": "pass"}, {"id": "A", "status": "fail"}]}',
     "appears twice"),
    # copied into the comparison's entries, which the report model types as strings
    ('{"members": [{"id": "A", "status": "pass", "name": 7}]}', "name must be a string"),
    ('{"members": [{"id": "A", "status": "pass", "section": ["W14X48"]}]}',
     "section must be a string"),
])
def test_malformed_baselines_are_refused_in_one_line(tmp_path, content, expected) -> None:
    p = tmp_path / "old.json"
    p.write_text(content)
    with pytest.raises(InputError, match=re.escape(expected)) as info:
        load_baseline(p)
    assert "\n" not in str(info.value) and str(p) in str(info.value)


def test_missing_baseline_is_refused(tmp_path) -> None:
    with pytest.raises(InputError, match="cannot read"):
        load_baseline(tmp_path / "nope.json")


def test_a_real_report_loads(tmp_path) -> None:
    p = tmp_path / "old.json"
    p.write_text(json.dumps(OLD))
    assert load_baseline(p)["members"][0]["id"] == "A"


@pytest.mark.parametrize("side", ["baseline", "report"])
def test_repeated_ids_are_refused_not_matched(side: str) -> None:
    # issue 13: two elements with one GlobalId; a comparison keyed by id cannot tell them
    # apart, so it refuses in one line naming the id (docs/design.md §3).
    twice = _report(("A", "pass", 0.70), ("B", "pass", 0.50), ("A", "fail", 1.20))
    old, new = (twice, NEW) if side == "baseline" else (OLD, twice)
    with pytest.raises(InputError, match=r"repeats the member id\(s\) A \(") as exc:
        compare(old, new)
    assert "\n" not in str(exc.value)


def test_skipped_now_is_listed_and_a_former_failure_is_a_regression(tmp_path) -> None:
    # Review gap: a member skipped now (its material renamed from steel to concrete) was in
    # no list, so --fail-on new-failures let a failing member vanish.  Now every member that
    # had a status other than skipped before is in new_skipped; one that failed before is a
    # regression whatever allow_not_checked, the others are not (docs/design.md §3, §4).
    old = _report(("A", "fail", 1.20), ("B", "pass", 0.50), ("C", "skipped", None),
                  ("E", "not_checked", None))
    new = _report(("A", "skipped", None), ("B", "skipped", None), ("C", "skipped", None),
                  ("D", "skipped", None), ("E", "skipped", None))
    ch = compare(old, new)
    assert ch["new_failures"] == ch["new_not_checked"] == ch["fixed"] == []
    assert _ids(ch["new_skipped"]) == ["A", "B", "E"]  # C was skipped, D is only added
    assert ch["counts"]["new_skipped"] == 3
    a = ch["new_skipped"][0]
    assert (a["status_before"], a["status_after"], a["utilization_before"]) == (
        "fail", "skipped", 1.20)
    assert _ids(ch["added"]) == ["D"]
    assert regressions(ch) == regressions(ch, allow_not_checked=True) == 1  # A only
    path = tmp_path / "old.json"
    path.write_text(json.dumps(old))
    assert [m["status"] for m in load_baseline(path)["members"]][2] == "skipped"


def test_skipped_on_both_sides_or_only_now_added_is_no_regression() -> None:
    old = _report(("A", "pass", 0.50), ("C", "skipped", None))
    new = _report(("A", "pass", 0.50), ("C", "skipped", None), ("D", "skipped", None))
    ch = compare(old, new)
    assert ch["new_skipped"] == [] and regressions(ch) == 0


def test_removed_members_are_listed_not_regressions() -> None:
    # A member deleted from the model (failing or not) cannot fail any more: it is listed
    # in removed with its baseline status, never counted as a regression; an element whose
    # id changed is removed and added, and the added one fails as a new failure.
    old = _report(("A", "fail", 1.20), ("B", "pass", 0.50))
    ch = compare(old, _report(("B", "pass", 0.50), ("A2", "fail", 1.20)))
    assert _ids(ch["removed"]) == ["A"] and ch["removed"][0]["status_before"] == "fail"
    assert ch["removed"][0]["status_after"] is None and ch["new_skipped"] == []
    assert _ids(ch["new_failures"]) == ["A2"] and regressions(ch) == 1
    assert regressions(compare(old, _report(("B", "pass", 0.50)))) == 0


def test_format_changes_and_warnings_name_the_skipped_members() -> None:
    old = _report(("A", "fail", 1.20), ("B", "pass", 0.50))
    ch = compare(old, _report(("A", "skipped", None), ("B", "skipped", None)),
                 baseline_name="old.json")
    text = format_changes(ch)
    assert "2 newly skipped" in text
    assert re.search(r"skipped now\s+name-A\s+A\s+1\.200 -> -\s+fail -> skipped", text)
    lines = skipped_warnings(ch, {"A": "not steel: concrete", "B": "not steel: timber"})
    assert lines == [
        "member name-A (A) failed in the baseline (utilization 1.200) and is skipped now "
        "(not steel: concrete); a regression against the baseline",
        "member name-B (B) passed in the baseline and is skipped now (not steel: timber); "
        "no longer checked"]
    many = compare(_report(*[(f"M{i}", "pass", 0.5) for i in range(12)]),
                   _report(*[(f"M{i}", "skipped", None) for i in range(12)]))
    assert skipped_warnings(many, {})[-1].startswith("... and 2 more members skipped now")
