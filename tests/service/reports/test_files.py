"""CSV, JUnit XML and atomic writes, from hand-made report dicts read back with pandas / etree.

The member numbers are arbitrary test values (common practice, no source): these tests check
that what is in the report reaches the files unchanged, with the right structure.
"""

from __future__ import annotations

import xml.etree.ElementTree as ET

import pandas as pd
import pytest

from stanchion.service.reports.files import (
    NO_STOREY,
    failure_message,
    write_atomic,
    write_csv,
    write_junit,
)


def _member(ident: str, status: str, util: float | None, storey: str | None = "Level 1",
            **kw) -> dict:
    row = {"id": ident, "name": f"C-{ident}", "section": "W14X48", "status": status,
           "required_strength": None if util is None else round(util * 300.0, 3),
           "available_strength": None if util is None else 300.0, "utilization": util,
           "limit_state": "" if util is None else "flexural buckling about y",
           "combination": "" if util is None else "1.4D", "slenderness": None,
           "critical_stress": None, "messages": [], "storey": storey}
    if status == "not_checked":
        row["reason"] = "no loads"
    row.update(kw)
    return row


REPORT = {
    "design_basis": "AISC 360-22 Chapter E, LRFD; ASCE 7-22 combinations",
    "units": {"force": "kip", "length": "ft", "stress": "ksi"},
    "members": [
        _member("1", "pass", 0.5, messages=["first", "second"], tag="T1"),
        _member("2", "fail", 1.25),
        _member("3", "not_checked", None, storey="Level 2"),
        _member("4", "pass", 0.25, storey=None),
    ],
}


def test_csv_has_one_row_per_member_with_units_in_headers(tmp_path) -> None:
    path = tmp_path / "r.csv"
    write_csv(path, REPORT)
    df = pd.read_csv(path, keep_default_na=False, dtype={"id": str})
    assert list(df["id"]) == ["1", "2", "3", "4"]
    assert list(df["status"]) == ["pass", "fail", "not_checked", "pass"]
    assert "required_strength [kip]" in df.columns
    assert "critical_stress [ksi]" in df.columns
    assert float(df.loc[1, "required_strength [kip]"]) == pytest.approx(375.0)  # 1.25 x 300
    assert df.loc[2, "reason"] == "no loads"
    assert df.loc[2, "utilization"] == ""  # not checked: empty, never 0
    assert df.loc[0, "messages"] == "first; second"
    assert df.loc[0, "tag"] == "T1"  # further scalar fields are kept
    assert list(df.columns).index("storey") == 2


def test_csv_of_a_members_report_has_no_storey_column(tmp_path) -> None:
    report = {**REPORT, "members": [{k: v for k, v in m.items() if k != "storey"}
                                    for m in REPORT["members"]]}
    path = tmp_path / "r.csv"
    write_csv(path, report)
    assert "storey" not in pd.read_csv(path).columns


def test_junit_groups_by_storey_and_marks_failures(tmp_path) -> None:
    path = tmp_path / "j.xml"
    write_junit(path, REPORT)
    root = ET.parse(path).getroot()
    assert root.tag == "testsuites"
    assert (root.get("tests"), root.get("failures"), root.get("skipped")) == ("4", "2", "0")
    suites = {s.get("name"): s for s in root.findall("testsuite")}
    assert list(suites) == ["Level 1", "Level 2", NO_STOREY]
    level1 = suites["Level 1"]
    assert (level1.get("tests"), level1.get("failures")) == ("2", "1")
    cases = {c.get("name"): c for c in root.iter("testcase")}
    assert cases["C-1 [1]"].find("failure") is None
    failure = cases["C-2 [2]"].find("failure")
    assert failure.get("type") == "FAIL"
    assert "1.25" in failure.get("message") and "375" in failure.get("message")
    assert "300" in failure.get("message") and "kip" in failure.get("message")
    nc = cases["C-3 [3]"].find("failure")
    assert nc.get("type") == "NOT CHECKED" and "no loads" in nc.get("message")


def test_junit_allow_not_checked_makes_them_skipped(tmp_path) -> None:
    path = tmp_path / "j.xml"
    write_junit(path, REPORT, allow_not_checked=True)
    root = ET.parse(path).getroot()
    assert (root.get("failures"), root.get("skipped")) == ("1", "1")
    case = next(c for c in root.iter("testcase") if c.get("name") == "C-3 [3]")
    assert case.find("failure") is None
    assert "no loads" in case.find("skipped").get("message")


def test_junit_of_a_members_report_is_one_suite(tmp_path) -> None:
    report = {**REPORT, "members": [{k: v for k, v in m.items() if k != "storey"}
                                    for m in REPORT["members"]]}
    path = tmp_path / "j.xml"
    write_junit(path, report)
    assert [s.get("name") for s in ET.parse(path).getroot()] == ["members"]


def test_failure_message_names_the_numbers() -> None:
    text = failure_message(_member("2", "fail", 1.25), "kN")
    assert text == ("utilization 1.25 > 1.0: required 375 kN, available 300 kN "
                    "(flexural buckling about y; 1.4D)")


def test_write_atomic_leaves_nothing_behind_on_failure(tmp_path) -> None:
    target = tmp_path / "out.txt"
    target.write_text("old")

    def broken(tmp) -> None:
        tmp.write_text("half")
        raise RuntimeError("disk full")

    with pytest.raises(RuntimeError):
        write_atomic(target, broken)
    assert target.read_text() == "old"
    assert [p.name for p in tmp_path.iterdir()] == ["out.txt"]


def test_written_files_get_ordinary_permissions(tmp_path) -> None:
    import os

    path = tmp_path / "r.csv"
    write_csv(path, REPORT)
    mask = os.umask(0)
    os.umask(mask)
    assert path.stat().st_mode & 0o777 == 0o666 & ~mask  # like open(path, "w")


def _junit(tmp_path, report: dict, allow: bool = False) -> ET.Element:
    path = tmp_path / "j.xml"
    write_junit(path, report, allow_not_checked=allow)
    return ET.parse(path).getroot()


def test_junit_skipped_members_are_skipped_cases_not_failures(tmp_path) -> None:
    report = {**REPORT, "members": [
        _member("1", "pass", 0.5),
        _member("2", "skipped", None, reason="not steel: concrete")]}
    root = _junit(tmp_path, report)
    assert (root.get("tests"), root.get("failures"), root.get("skipped")) == ("2", "0", "1")
    case = [c for c in root.iter("testcase") if c.find("skipped") is not None]
    assert [c.get("name") for c in case] == ["C-2 [2]"]
    assert case[0].find("skipped").get("message") == "skipped: not steel: concrete"
    assert failure_message(report["members"][1], "kip") == "skipped: not steel: concrete"


@pytest.mark.parametrize(("members", "line"), [
    ([_member("1", "not_checked", None)],
     "nothing was checked: the only member is not checked"),
    ([_member("1", "skipped", None, reason="not steel: timber"),
      _member("2", "not_checked", None)],
     "nothing was checked: of 2 members, 1 not checked and 1 skipped (not steel)"),
    ([], "nothing was checked: no members"),
])
@pytest.mark.parametrize("allow", [False, True])
def test_junit_with_no_verdict_has_a_failing_run_case(tmp_path, members, line, allow) -> None:
    # docs/design.md §3/§4: a run with no verdict is never green, in the JUnit file either.
    root = _junit(tmp_path, {**REPORT, "members": members}, allow)
    assert int(root.get("failures")) >= 1
    run = next(s for s in root.iter("testsuite") if s.get("name") == "stanchion run")
    assert (run.get("tests"), run.get("failures")) == ("1", "1")
    failure = run.find("testcase").find("failure")
    assert (failure.get("type"), failure.get("message")) == ("NOTHING CHECKED", line)


def test_junit_with_a_verdict_has_no_run_case(tmp_path) -> None:
    root = _junit(tmp_path, REPORT, allow=True)
    assert all(s.get("name") != "stanchion run" for s in root.iter("testsuite"))
