"""``stanchion loads-template MODEL`` and the round trip through ``check --loads``.

The model is tests/service/grid_model.py's (grid names worked by hand there).
"""

from __future__ import annotations

import csv
import io
import json

import pytest

from stanchion.engine.members import LOAD_TYPES
from stanchion.service.cli import main
from tests.service.grid_model import ON_GRID, build_grid_model, write_grid_model
from tests.service.test_model_check_files import digest

HEADER_KN = ["grid", "level", "GlobalId", "Tag", "Name", *(f"{t} [kN]" for t in LOAD_TYPES)]


def _rows(text: str) -> list[list[str]]:
    return list(csv.reader(io.StringIO(text)))


@pytest.mark.parametrize("schema", ["IFC2X3", "IFC4", "IFC4X3"])
def test_template_to_stdout(tmp_path, capsys, schema) -> None:
    src = write_grid_model(tmp_path / "grid.ifc", schema, level2=True)
    h = digest(src)
    assert main(["loads-template", str(src)]) == 0
    captured = capsys.readouterr()
    rows = _rows(captured.out)
    assert rows[0] == HEADER_KN  # an SI (mm, N) model: kN, written in every header
    body = {r[4]: r for r in rows[1:]}
    assert {n: (r[0], r[1]) for n, r in body.items()} == {
        "C1": (ON_GRID["C1"], "Level 1"), "C2": (ON_GRID["C2"], "Level 1"),
        "K1": (ON_GRID["K1"], "Level 1"), "C3": (ON_GRID["C3"], "Level 2")}
    assert body["C1"][3] == "T1" and len(body["C1"][2]) == 22  # Tag; a GlobalId
    assert all(cell == "" for r in rows[1:] for cell in r[5:])  # loads left empty
    assert captured.err == ""  # every pair is its own
    assert digest(src) == h  # the model is only read


def test_template_file_units_and_warning(tmp_path, capsys) -> None:
    b = build_grid_model("IFC4", twin=True)
    src = b.write(tmp_path / "grid.ifc")
    out = tmp_path / "schedule.csv"
    assert main(["loads-template", str(src), "-o", str(out), "--force-unit", "lbf"]) == 0
    captured = capsys.readouterr()
    assert captured.out == ""
    rows = _rows(out.read_text())
    # Two columns share B-2 / Level 1 (build_grid_model twin=True): keyed by element instead
    assert rows[0] == ["element", "grid", "level", "Tag", "Name",
                       *(f"{t} [lbf]" for t in LOAD_TYPES)]
    assert all(len(r[0]) == 22 for r in rows[1:])  # every row keyed by its GlobalId
    assert captured.err.strip() == (
        "stanchion: the template is keyed by element (GlobalId), not by grid and level: "
        "2 sharing their grid location and level with another column (C1, C1 twin) could "
        "not be matched by grid and level")
    assert not list(tmp_path.glob(".schedule.csv.*"))  # no temporary file left


def test_us_model_defaults_to_kip(tmp_path, capsys) -> None:
    from tests.service.test_model_check_files import write_model

    src = write_model(tmp_path / "us.ifc", units="in_kip")
    assert main(["loads-template", str(src)]) == 0
    rows = _rows(capsys.readouterr().out)
    assert rows[0][5] == "D [kip]"
    # no grid in that model: keyed by element, with an empty grid location for reference
    assert rows[0][:3] == ["element", "grid", "level"]
    assert all(len(r[0]) == 22 and r[1] == "" for r in rows[1:])


@pytest.mark.parametrize(
    ("extra", "problem"),
    [(["--force-unit", "psi"], "--force-unit: 'psi' is not a force unit"),
     (["-o", "{src}"], "names the model")],
)
def test_unusable_input_exits_2(tmp_path, capsys, extra, problem) -> None:
    src = write_grid_model(tmp_path / "grid.ifc")
    args = ["loads-template", str(src), *(a.format(src=src) for a in extra)]
    assert main(args) == 2
    err = capsys.readouterr().err
    assert err.startswith("stanchion: ") and problem in err and err.count("\n") == 1


def test_filled_template_checks_every_column(tmp_path, capsys) -> None:
    """The round trip: template -> filled programmatically -> check --loads."""
    src = write_grid_model(tmp_path / "grid.ifc", "IFC4", level2=True)
    template = tmp_path / "schedule.csv"
    assert main(["loads-template", str(src), "-o", str(template)]) == 0
    rows = _rows(template.read_text())
    given = {"C1": (400.0, 250.0), "C2": (300.0, 100.0), "C3": (200.0, 50.0),
             "K1": (900.0, 300.0)}
    for r in rows[1:]:
        r[5], r[6] = (f"{v:g}" for v in given[r[4]])  # D [kN], L [kN]
    filled = tmp_path / "filled.csv"
    with filled.open("w", newline="") as fh:
        csv.writer(fh).writerows(rows)
    report = tmp_path / "r.json"
    code = main(["check", str(src), "--loads", str(filled), "--units", "si",
                 "--report", str(report), "--quiet"])
    members = {m["name"]: m for m in json.loads(report.read_text())["members"]}
    for name in ("C1", "C2", "C3"):
        d, live = given[name]
        m = members[name]
        assert m["load_source"] == "table", m
        # ASCE 7-22 §2.3.1: 1.2D + 1.6L governs over 1.4D for these values (hand computed)
        assert m["required_strength"] == pytest.approx(1.2 * d + 1.6 * live, rel=1e-5)
        assert m["combination"].startswith("1.2D+1.6L")  # (+0.5Lr or S or R: all 0)
    assert members["K1"]["status"] == "skipped" and members["K1"]["grid"] == "C-3"
    assert not any("match no row" in msg or "ignored" in msg
                   for msg in json.loads(report.read_text())["messages"])
    assert code in (0, 1)  # pass or fail by the numbers; never "not checked"
    assert all(members[n]["status"] in ("pass", "fail") for n in ("C1", "C2", "C3"))


def test_template_without_grid_round_trips_by_element(tmp_path, capsys) -> None:
    """Models without a grid (three of the four shared real models with steel columns):
    the filled template still gives every column its loads."""
    from tests.service.test_model_check_files import write_model

    src = write_model(tmp_path / "nogrid.ifc", loads={"C1": None, "C2": None, "C3": None})
    out = tmp_path / "t.csv"
    assert main(["loads-template", str(src), "-o", str(out)]) == 0
    capsys.readouterr()
    rows = _rows(out.read_text())
    d = rows[0].index("D [kN]")
    for r in rows[1:]:
        r[d] = "100"
    out.write_text("\n".join(",".join(r) for r in rows) + "\n")
    report = tmp_path / "r.json"
    main(["check", str(src), "--loads", str(out), "--quiet", "--report", str(report)])
    members = json.loads(report.read_text())["members"]
    # expected: 1.4 D = 1.4 x 100 kN = 140 kN = 31.47 kip (ASCE 7-22 §2.3.1 combination 1;
    # 1 kip = 4.448222 kN)
    assert [m["required_strength"] for m in members] == pytest.approx([31.474] * 3, rel=1e-3)
    assert {m["load_source"] for m in members} == {"table"}
