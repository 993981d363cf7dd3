"""``stanchion check model.ifc``: options, exit codes, terminal output, bad input.

The standard test model (test_model_check_files) has one passing, one failing (1.4D = 420
kips > φcPn = 303 kips: ASCE 7-22 §2.3.1 combination 1, AISC Manual Table 4-1a) and one
not-checked column.
"""

from __future__ import annotations

import io
import json

import ifcopenshell
import ifcopenshell.api.pset
import ifcopenshell.util.element

from stanchion.engine.units import factor
from stanchion.service.cli import main
from stanchion.service.cli.progress import Progress
from tests.service.test_model_check_files import column_guids, digest, write_model

PASSING = {"C1": {"D": 95.0, "L": 60.0, "S": 12.0}, "C2": {"D": 10.0}}
WITH_UNCHECKED = {"C1": {"D": 95.0, "L": 60.0, "S": 12.0}, "C2": {"D": 10.0}, "C3": None}


def test_all_outputs_and_exit_1_with_failures(tmp_path, capsys) -> None:
    src = write_model(tmp_path / "model.ifc")
    h = digest(src)
    args = ["check", str(src), "--out", str(tmp_path / "checked.ifc"),
            "--report", str(tmp_path / "r.json"), "--csv", str(tmp_path / "r.csv"),
            "--junit", str(tmp_path / "j.xml")]
    assert main(args) == 1
    for name in ("checked.ifc", "r.json", "r.csv", "j.xml"):
        assert (tmp_path / name).stat().st_size > 0
    assert digest(src) == h
    out = capsys.readouterr().out
    assert "model.ifc (IFC4): 3 IfcColumn" in out
    assert "1 pass, 1 fail, 1 not checked" in out
    assert "Level 2" in out  # storey table
    assert "result: FAIL (1 failing, 1 not checked)" in out


def test_exit_0_when_every_column_passes(tmp_path) -> None:
    src = write_model(tmp_path / "model.ifc", loads=PASSING)
    assert main(["check", str(src), "--quiet"]) == 0


def test_allow_not_checked_turns_them_into_warnings(tmp_path, capsys) -> None:
    src = write_model(tmp_path / "model.ifc", loads=WITH_UNCHECKED)
    assert main(["check", str(src), "--quiet"]) == 1
    assert main(["check", str(src), "--allow-not-checked"]) == 0
    captured = capsys.readouterr()
    assert "warning: 1 members not checked (allowed)" in captured.err
    assert "no loads" in captured.err
    assert "result: PASS" in captured.out


def test_quiet_prints_nothing(tmp_path, capsys) -> None:
    src = write_model(tmp_path / "model.ifc")
    main(["check", str(src), "--quiet", "--out", str(tmp_path / "c.ifc")])
    assert capsys.readouterr() == ("", "")


def test_unreadable_model_exits_2_with_one_line(tmp_path, capsys) -> None:
    bad = tmp_path / "model.ifc"
    bad.write_text("not a model\n")
    out = tmp_path / "checked.ifc"
    assert main(["check", str(bad), "--out", str(out), "--report", str(tmp_path / "r.json")]) == 2
    err = capsys.readouterr().err
    assert err.startswith("stanchion: cannot read ") and "model.ifc" in err
    assert err.count("\n") == 1 and "Traceback" not in err
    assert not out.exists() and not (tmp_path / "r.json").exists()


def test_out_over_the_input_exits_2(tmp_path, capsys) -> None:
    src = write_model(tmp_path / "model.ifc")
    h = digest(src)
    assert main(["check", str(src), "--out", str(src)]) == 2
    assert "is the input file" in capsys.readouterr().err
    assert digest(src) == h


def test_malformed_baseline_exits_2_and_writes_nothing(tmp_path, capsys) -> None:
    src = write_model(tmp_path / "model.ifc")
    base = tmp_path / "old.json"
    base.write_text("{not json")
    out = tmp_path / "checked.ifc"
    assert main(["check", str(src), "--baseline", str(base), "--out", str(out)]) == 2
    err = capsys.readouterr().err
    assert err.startswith("stanchion: baseline ") and "not valid JSON" in err
    assert err.count("\n") == 1
    assert not out.exists()


def test_fail_on_new_failures_needs_a_baseline(tmp_path, capsys) -> None:
    src = write_model(tmp_path / "model.ifc")
    assert main(["check", str(src), "--fail-on", "new-failures"]) == 2
    assert "needs --baseline" in capsys.readouterr().err


def test_fail_on_new_failures_gates_on_regressions_only(tmp_path, capsys) -> None:
    src = write_model(tmp_path / "model.ifc")
    first = tmp_path / "r1.json"
    checked = tmp_path / "checked.ifc"
    assert main(["check", str(src), "--report", str(first), "--out", str(checked),
                 "--quiet"]) == 1
    # same model again: the existing failure is not a regression
    assert main(["check", str(checked), "--baseline", str(first), "--fail-on",
                 "new-failures", "--quiet"]) == 0
    # revision: C1 now carries 300 kip dead load (1.4D = 420 > 303 kips) -> new failure
    model = ifcopenshell.open(str(checked))
    ids = column_guids(model)
    pset = ifcopenshell.util.element.get_psets(model.by_guid(ids["C1"]))["Stanchion_Loads"]
    ifcopenshell.api.pset.edit_pset(model, pset=model.by_id(pset["id"]), properties={
        "D": model.create_entity("IfcForceMeasure", 300.0 * factor("kip", "newton")),
        "L": None, "S": None})
    revised = tmp_path / "revised.ifc"
    model.write(str(revised))
    report = tmp_path / "r2.json"
    capsys.readouterr()
    code = main(["check", str(revised), "--baseline", str(first), "--fail-on", "new-failures",
                 "--report", str(report)])
    assert code == 1
    changes = json.loads(report.read_text())["changes"]
    assert [e["id"] for e in changes["new_failures"]] == [ids["C1"]]
    assert [e["id"] for e in changes["utilization_changes"]] == [ids["C1"]]
    out = capsys.readouterr().out
    assert "1 new failures" in out and "result: FAIL (1 regressions" in out


def test_members_file_gets_csv_junit_and_baseline(tmp_path) -> None:
    members = tmp_path / "m.json"
    members.write_text(json.dumps({"members": [
        {"id": "C-12", "section": "W14X48", "fy": 50, "length": 16,
         "loads": {"D": 95.0, "L": 60.0, "S": 12.0}}]}))
    r1 = tmp_path / "r1.json"
    assert main(["check", str(members), "--report", str(r1), "--csv", str(tmp_path / "r.csv"),
                 "--junit", str(tmp_path / "j.xml"), "--quiet"]) == 0
    assert (tmp_path / "r.csv").exists() and (tmp_path / "j.xml").exists()
    r2 = tmp_path / "r2.json"
    assert main(["check", str(members), "--baseline", str(r1), "--fail-on", "new-failures",
                 "--report", str(r2), "--quiet"]) == 0
    assert json.loads(r2.read_text())["changes"]["counts"]["new_failures"] == 0


def test_model_options_are_refused_for_members_files(tmp_path, capsys) -> None:
    members = tmp_path / "m.json"
    members.write_text('{"members": []}')
    assert main(["check", str(members), "--out", str(tmp_path / "x.ifc")]) == 2
    assert "applies to IFC models" in capsys.readouterr().err


def test_progress_lines_only_for_large_jobs() -> None:
    stream = io.StringIO()
    p = Progress(stream)
    assert not p.consider(size=10_000, items=20)
    with p.phase("reading small.ifc"):
        pass
    assert stream.getvalue() == ""
    assert p.consider(items=20_000)
    with p.phase("checking 20,000 members"):
        p.count(10, 20)  # not a terminal: no running count
    text = stream.getvalue()
    assert text.startswith("stanchion: checking 20,000 members ...") and text.endswith(" s\n")
    assert "10 / 20" not in text


def test_bad_load_table_exits_2_with_one_line(tmp_path, capsys) -> None:
    src = write_model(tmp_path / "model.ifc")
    table = tmp_path / "loads.csv"
    table.write_text("element,Dead\nC3,10\n")
    report = tmp_path / "r.json"
    assert main(["check", str(src), "--loads", str(table), "--report", str(report)]) == 2
    err = capsys.readouterr().err.strip()
    assert "column 'Dead' is not a load type" in err and "\n" not in err
    assert not report.exists()
