"""`stanchion check members.json`: exit codes, report, terminal summary, bad input."""

from __future__ import annotations

import json
from pathlib import Path

import jsonschema
import pytest

from stanchion.service.cli import main
from stanchion.service.reports.report import report_schema


def _write(tmp_path: Path, data: object, name: str = "members.json") -> Path:
    p = tmp_path / name
    p.write_text(data if isinstance(data, str) else json.dumps(data))
    return p


def _request(**member) -> dict:
    base = {"id": "C-12", "section": "W14X48", "fy": 50, "length": 16,
            "loads": {"D": 95.0, "L": 60.0, "S": 12.0}}
    base.update(member)
    return {"design_method": "LRFD", "members": [base]}


def test_design_card_example_passes_and_writes_a_valid_report(tmp_path, capsys) -> None:
    # docs/design.md §2 example: W14X48, Fy = 50 ksi, 16 ft; 1.2(95) + 1.6(60) + 0.3(12) = 213.6
    # kips (ASCE 7-22 §2.3.1 combination 2 with the 7-22 companion snow factor 0.3S, from
    # memory) against φcPn = 303 kips (AISC Manual Table 4-1a): utilization 0.705.
    out = tmp_path / "r.json"
    code = main(["check", str(_write(tmp_path, _request())), "--report", str(out)])
    assert code == 0
    report = json.loads(out.read_text())
    jsonschema.validate(report, report_schema())
    m = report["members"][0]
    assert m["status"] == "pass"
    assert m["required_strength"] == pytest.approx(213.6, abs=0.05)
    assert m["available_strength"] == pytest.approx(303.0, abs=1.0)
    assert m["utilization"] == pytest.approx(213.6 / 303.1, abs=0.005)
    assert m["limit_state"] == "flexural buckling about y"
    assert "1.6L" in m["combination"]
    assert report["summary"] == {"members": 1, "pass": 1, "fail": 0, "not_checked": 0,
                                 "skipped": 0, "max_utilization": m["utilization"]}
    printed = capsys.readouterr().out
    assert "1 pass" in printed and "C-12" in printed


def test_failing_member_exits_1(tmp_path) -> None:
    # 1.4·300 = 420 kips (ASCE 7-22 §2.3.1 combination 1) > 303 kips (Manual Table 4-1a).
    p = _write(tmp_path, _request(loads={"D": 300.0}))
    assert main(["check", str(p), "--quiet"]) == 1


def test_not_checked_member_exits_1_and_others_are_checked(tmp_path) -> None:
    data = _request()
    data["members"].append({"id": "C-13", "section": "W14X47", "fy": 50, "length": 16,
                            "loads": {"D": 10}})
    data["members"].append({"id": "C-14", "section": "W14X48", "fy": 0, "length": 16,
                            "loads": {"D": 10}})
    data["members"].append({"id": "C-15", "section": "W14X48", "fy": 50, "length": 16})
    data["members"].append({"id": "C-16", "section": "L4X4X1/2", "fy": 36, "length": 8,
                            "loads": {"D": 10}})
    out = tmp_path / "r.json"
    assert main(["check", str(_write(tmp_path, data)), "--report", str(out), "--quiet"]) == 1
    rows = {m["id"]: m for m in json.loads(out.read_text())["members"]}
    assert rows["C-12"]["status"] == "pass"
    assert rows["C-13"]["status"] == "not_checked"
    assert "W14X47" in rows["C-13"]["reason"] and "W14X48" in rows["C-13"]["reason"]
    assert rows["C-14"]["status"] == "not_checked" and "yield" in rows["C-14"]["reason"]
    assert rows["C-15"]["reason"] == "no loads"
    assert "angle" in rows["C-16"]["reason"]
    for k in ("C-13", "C-14", "C-15", "C-16"):
        assert rows[k]["utilization"] is None


def test_method_option_overrides_the_file(tmp_path) -> None:
    # ASD: D + L = 155 kips (ASCE 7-22 §2.4.1 combination 2) vs Pn/Ωc = 303.1/1.503 = 201.7.
    out = tmp_path / "r.json"
    main(["check", str(_write(tmp_path, _request(loads={"D": 95, "L": 60}))),
          "--method", "asd", "--report", str(out), "--quiet"])
    report = json.loads(out.read_text())
    m = report["members"][0]
    assert "ASD" in report["design_basis"]
    assert m["required_strength"] == pytest.approx(155.0)
    assert m["available_strength"] == pytest.approx(303.08 / 1.503, rel=0.002)


@pytest.mark.parametrize(
    "content, needle",
    [
        ("{not json", "not valid JSON"),
        (json.dumps({"members": []}), "members"),
        (json.dumps({"members": [{"id": "A", "fy": "high"}]}), "members.0.fy"),
        (json.dumps([1, 2]), "request"),
        (json.dumps({"members": [{"id": "A"}, {"id": "A"}]}), "unique"),
        (json.dumps({"design_method": "WSD", "members": [{"id": "A"}]}), "design_method"),
        # issue 13: a boolean is not a number ("fy": true was taken as 1 ksi) ...
        (json.dumps({"members": [{"id": "A", "fy": True}]}), "members.0.fy"),
        # ... a candidate list has a cap (MAX_CANDIDATES, 200, docs/design.md §2) ...
        (json.dumps({"members": [{"id": "A", "candidates": ["W14"] * 201}]}),
         "members.0.candidates"),
        # ... and a file nested 1,000 levels deep gave a RecursionError traceback.
        ('{"members": ' + "[" * 1000 + "]" * 1000 + "}", "nested too deeply"),
    ],
)
def test_malformed_file_exits_2_with_one_line_and_writes_nothing(tmp_path, capsys, content,
                                                                 needle) -> None:
    out = tmp_path / "r.json"
    code = main(["check", str(_write(tmp_path, content)), "--report", str(out)])
    assert code == 2
    err = capsys.readouterr().err
    assert err.startswith("stanchion: ") and needle in err
    assert err.count("\n") == 1 and "Traceback" not in err
    assert not out.exists()


def test_missing_file_exits_2(tmp_path, capsys) -> None:
    assert main(["check", str(tmp_path / "absent.json")]) == 2
    assert "cannot read" in capsys.readouterr().err


def test_si_and_us_requests_give_the_same_capacity(tmp_path) -> None:
    # Unit conversion only (pint definitions): 16 ft = 4.8768 m, 50 ksi = 344.738 MPa,
    # 1 kip = 4.448222 kN.
    us = tmp_path / "us.json"
    si = tmp_path / "si.json"
    main(["check", str(_write(tmp_path, _request(), "a.json")), "--report", str(us), "--quiet"])
    data = _request(fy=344.7379, length=4.8768,
                    loads={"D": 95 * 4.448222, "L": 60 * 4.448222, "S": 12 * 4.448222})
    data["units"] = {"force": "kN", "length": "m", "stress": "MPa"}
    main(["check", str(_write(tmp_path, data, "b.json")), "--report", str(si), "--quiet"])
    a = json.loads(us.read_text())["members"][0]
    b = json.loads(si.read_text())["members"][0]
    assert b["available_strength"] / 4.448222 == pytest.approx(a["available_strength"],
                                                               rel=1e-5)
    assert b["utilization"] == pytest.approx(a["utilization"], abs=1e-4)


def test_required_strength_bypasses_combinations_and_slender_warning(tmp_path) -> None:
    # Lc/r = 50 ft·12/1.91 = 314 > 200: a message (AISC 360-22 E2 user note), not a failure.
    out = tmp_path / "r.json"
    main(["check", str(_write(tmp_path, _request(length=50, loads=None, required_strength=20))),
          "--report", str(out), "--quiet"])
    m = json.loads(out.read_text())["members"][0]
    assert m["required_strength"] == 20
    assert m["combination"] == "required strength as given"
    assert m["status"] == "pass"
    assert any("exceeds 200" in s for s in m["messages"])


def test_parametric_profile_matches_the_catalog_shape(tmp_path) -> None:
    # A W14X48 given by its dimensions (Shapes Database v16.0: d 13.8, bf 8.03, tw 0.340,
    # tf 0.595, fillet ≈ kdes − tf = 0.595 in) checks within 2% of the catalog row.
    out = tmp_path / "r.json"
    prof = {"shape": "I", "unit": "in", "d": 13.8, "bf": 8.03, "tw": 0.34, "tf": 0.595,
            "r": 0.595}
    main(["check", str(_write(tmp_path, _request(section=None, profile=prof))),
          "--report", str(out), "--quiet"])
    m = json.loads(out.read_text())["members"][0]
    assert m["status"] == "pass"
    assert m["available_strength"] == pytest.approx(303.1, rel=0.02)
