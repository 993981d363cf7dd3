"""`stanchion suggest` and suggestions in the members report."""

from __future__ import annotations

import json

import jsonschema
import pytest

from stanchion.service.cli import main
from stanchion.service.reports.report import report_schema


def test_suggest_prints_the_lightest_sections(capsys) -> None:
    # AISC Manual Table 4-1a read-offs at Lc = 16 ft, Fy = 50 ksi, LRFD: W14X48 303 kips,
    # W12X45 290 kips -> for 295 kips among W12/W14 the W14X48 comes first.
    code = main(["suggest", "--load", "295", "--length", "16", "--fy", "50",
                 "--families", "W12,W14", "--count", "3"])
    out = capsys.readouterr().out
    assert code == 0
    table = [line.split() for line in out.splitlines() if line.startswith("W")]
    assert table[0][0] == "W14X48"
    assert float(table[0][2]) == pytest.approx(303.0, abs=1.0)
    assert len(table) == 3
    assert "licensed engineer" in out


def test_suggest_without_a_passing_section_exits_1(capsys) -> None:
    # 5,000 kips exceeds the squash load 0.9·50·A of every W8 (largest A = 19.7 in², W8X67,
    # Shapes Database v16.0: 0.9·50·19.7 = 887 kips).
    assert main(["suggest", "--load", "5000", "--length", "10", "--fy", "50",
                 "--families", "W8"]) == 1
    assert "no candidate passes" in capsys.readouterr().out


def test_suggest_bad_family_exits_2(capsys) -> None:
    assert main(["suggest", "--load", "100", "--length", "10", "--fy", "50",
                 "--families", "Q7"]) == 2
    assert capsys.readouterr().err.startswith("stanchion: ")


def test_members_report_carries_suggestions_in_report_units(tmp_path) -> None:
    data = {
        "units": {"force": "kN", "length": "m", "stress": "MPa"},
        "members": [
            # 295 kips = 1312.2 kN, 16 ft = 4.8768 m, 50 ksi = 344.74 MPa (pint definitions).
            {"id": "A", "section": "W12X45", "fy": 344.738, "length": 4.8768,
             "required_strength": 1312.2, "candidates": ["W12", "W14"]},
            {"id": "B", "section": "W12X45", "fy": 344.738, "length": 4.8768,
             "required_strength": 100, "candidates": ["W13"]},
        ],
        "selection": {"max_suggestions": 2},
    }
    p = tmp_path / "m.json"
    p.write_text(json.dumps(data))
    out = tmp_path / "r.json"
    assert main(["check", str(p), "--report", str(out), "--quiet"]) == 1  # A fails as W12X45
    report = json.loads(out.read_text())
    jsonschema.validate(report, report_schema())
    a, b = report["members"]
    assert a["status"] == "fail"
    assert [s["section"] for s in a["suggestions"]] == ["W14X48", "W12X50"]
    # 303.1 kips (Manual Table 4-1a) = 1348 kN; 48 lb/ft = 0.7005 kN/m (pint definitions).
    assert a["suggestions"][0]["available_strength"] == pytest.approx(1348.0, rel=0.003)
    assert a["suggestions"][0]["weight"] == pytest.approx(0.7005, rel=0.002)
    assert "suggestions" not in b and any("W13" in m for m in b["messages"])


def test_member_without_length_gets_no_suggestion(tmp_path) -> None:
    # Missing data never produces a suggestion: the member is not checked ("no length") and
    # no section is chosen for a length it was not checked at (standards: no silent guess).
    data = {"members": [{"id": "A", "section": "W12X45", "fy": 50, "required_strength": 200,
                         "candidates": ["W12", "W14"]}]}
    p = tmp_path / "m.json"
    p.write_text(json.dumps(data))
    out = tmp_path / "r.json"
    assert main(["check", str(p), "--report", str(out), "--quiet"]) == 1
    row = json.loads(out.read_text())["members"][0]
    assert row["status"] == "not_checked" and row["reason"] == "no length"
    assert "suggestions" not in row
    assert any(m.startswith("no suggestions") for m in row["messages"])


def test_suggest_depth_range_limits_the_nominal_depth(capsys) -> None:
    # Same demand as above among all W shapes, nominal depths 12 to 14 in only: every printed
    # section is a W12, W13 or W14 (nominal depth = the number after W; common practice).
    assert main(["suggest", "--load", "295", "--length", "16", "--fy", "50", "--depth", "12-14",
                 "--count", "10"]) == 0
    names = [line.split()[0] for line in capsys.readouterr().out.splitlines()
             if line.startswith("W")]
    assert names and all(12 <= int(n[1:].split("X")[0]) <= 14 for n in names)
    assert main(["suggest", "--load", "295", "--length", "16", "--fy", "50",
                 "--depth", "14"]) == 0
    names = [line.split()[0] for line in capsys.readouterr().out.splitlines()
             if line.startswith("W")]
    assert names and all(n.startswith("W14X") for n in names)


@pytest.mark.parametrize("text, expected", [
    ("10-14", (10.0, 14.0)), ("12-", (12.0, None)), ("-14", (None, 14.0)),
    ("14", (14.0, 14.0)), (" 8 - 10 ", (8.0, 10.0)),
])
def test_depth_range_forms(text: str, expected: tuple) -> None:
    from stanchion.service.cli.suggest import depth_range

    assert depth_range(text) == expected  # the forms the option's help names


@pytest.mark.parametrize("bad", ["14-10", "-", "a-b", "0-4", ""])
def test_bad_depth_range_exits_2(bad: str, capsys) -> None:
    with pytest.raises(SystemExit) as exc:
        main(["suggest", "--load", "100", "--length", "10", "--fy", "50", "--depth", bad])
    assert exc.value.code == 2
    assert "--depth" in capsys.readouterr().err


@pytest.mark.parametrize("old", [["select", "--load", "100", "--length", "10", "--fy", "50"],
                                 ["suggest", "--load", "100", "--length", "10", "--fy", "50",
                                  "--min-depth", "10"],
                                 ["suggest", "--load", "100", "--length", "10", "--fy", "50",
                                  "--max-utilization", "0.9"]])
def test_old_verb_and_options_are_gone(old: list[str]) -> None:
    with pytest.raises(SystemExit) as exc:  # no alias: nobody depends on them yet
        main(old)
    assert exc.value.code == 2


@pytest.mark.parametrize("option, value", [("--kx", "0"), ("--ky", "-1"), ("--kz", "nan"),
                                           ("--fy", "0"), ("--load", "inf")])
def test_suggest_refuses_unusable_numbers(option: str, value: str, capsys) -> None:
    # K = 0 gives Lc = 0 and would rate every shape at its squash load (AISC 360-22 E3-2 at
    # Lc/r = 0): refused with one line naming the option, like every other bad number.
    args = {"--load": "100", "--length": "10", "--fy": "50", option: value}
    assert main(["suggest", *[x for kv in args.items() for x in kv]]) == 2
    err = capsys.readouterr().err
    assert err.startswith("stanchion: ") and option in err


def test_suggest_needs_the_yield_stress() -> None:
    with pytest.raises(SystemExit) as exc:  # no default: 50 would mean ksi or MPa by --units
        main(["suggest", "--load", "100", "--length", "10"])
    assert exc.value.code == 2


def test_suggestions_of_another_family_say_they_use_the_members_yield_stress(tmp_path) -> None:
    # A W12X45 at 50 ksi (ASTM A992) asked for round HSS: the suggestion is rated at 50 ksi,
    # but round HSS of ASTM A500 Gr. C have Fy = 46 ksi (ASTM A500) -- the member is told.
    data = {"members": [
        {"id": "A", "section": "W12X45", "fy": 50, "length": 16, "required_strength": 200,
         "candidates": ["HSS_ROUND"]},
        {"id": "B", "section": "W12X45", "fy": 50, "length": 16, "required_strength": 200,
         "candidates": ["W12"]}]}
    p = tmp_path / "m.json"
    p.write_text(json.dumps(data))
    out = tmp_path / "r.json"
    main(["check", str(p), "--report", str(out), "--quiet"])
    a, b = json.loads(out.read_text())["members"]
    assert a["suggestions"] and any("HSS_ROUND sections are rated at this member's own yield"
                                    in m for m in a["messages"])
    assert b["suggestions"] and not any("own yield" in m for m in b["messages"])
