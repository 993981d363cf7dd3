"""The grid location in every output (issue 15 item 1): report, CSV, JUnit, terminal, model.

The model is ``tests/service/grid_model.py``'s; the names expected there are worked by hand.
"""

from __future__ import annotations

import json
import xml.etree.ElementTree as ET

import ifcopenshell
import ifcopenshell.util.element
import pandas as pd
import pytest

from stanchion.ifc_bridge.write import PSET_NAME
from stanchion.service.cli import main
from stanchion.service.report_model import Report
from tests.service.grid_model import ON_GRID, write_grid_model


@pytest.fixture(params=["IFC2X3", "IFC4", "IFC4X3"])
def checked(request, tmp_path, capsys):
    src = write_grid_model(tmp_path / "grid.ifc", request.param)
    paths = {k: tmp_path / f"out.{k}" for k in ("json", "csv", "xml", "ifc")}
    code = main(["check", str(src), "--report", str(paths["json"]), "--csv",
                 str(paths["csv"]), "--junit", str(paths["xml"]), "--out", str(paths["ifc"])])
    assert code == 1  # C2 is not checked (no loads)
    return paths, capsys.readouterr().out


def test_report_rows_carry_the_grid(checked) -> None:
    paths, _ = checked
    report = json.loads(paths["json"].read_text())
    Report.model_validate(report)
    rows = {m["name"]: m for m in report["members"]}
    assert {n: r["grid"] for n, r in rows.items()} == {
        n: ON_GRID[n] for n in ("C1", "C2", "K1")}
    assert rows["K1"]["status"] == "skipped"  # a skipped member is still located


def test_csv_has_a_grid_column_after_the_storey(checked) -> None:
    paths, _ = checked
    frame = pd.read_csv(paths["csv"], keep_default_na=False)
    assert list(frame.columns[:4]) == ["id", "name", "storey", "grid"]
    assert dict(zip(frame["name"], frame["grid"], strict=True)) == {
        n: ON_GRID[n] for n in ("C1", "C2", "K1")}


def test_junit_names_and_properties(checked) -> None:
    paths, _ = checked
    cases = list(ET.parse(paths["xml"]).getroot().iter("testcase"))
    by_grid = {}
    for case in cases:
        props = {p.get("name"): p.get("value") for p in case.iter("property")}
        by_grid[case.get("name").split(" [")[0]] = props
    assert by_grid["C1 at B-2"] == {"storey": "Level 1", "grid": "B-2"}
    assert by_grid["C2 at B-2 (+610, -152 mm)"]["grid"] == "B-2 (+610, -152 mm)"
    assert by_grid["K1 at C-3"]["grid"] == "C-3"


def test_terminal_names_the_grid(checked) -> None:
    _, out = checked
    line = next(x for x in out.splitlines() if x.strip().startswith("C1 "))
    assert line.split()[:3] == ["C1", "B-2", "W14X48"]
    assert "not checked: C2 (B-2 (+610, -152 mm)): no loads" in out


def test_checked_model_gets_grid_location(checked) -> None:
    paths, _ = checked
    model = ifcopenshell.open(str(paths["ifc"]))
    found = {c.Name: ifcopenshell.util.element.get_psets(c)[PSET_NAME].get("GridLocation")
             for c in model.by_type("IfcColumn")}
    assert found == {n: ON_GRID[n] for n in ("C1", "C2", "K1")}


def test_members_files_have_no_grid(tmp_path) -> None:
    members = {"members": [{"id": "C-12", "section": "W14X48", "length": 14.0, "fy": 50.0,
                            "loads": {"D": 95.0, "L": 60.0}}]}
    src = tmp_path / "members.json"
    src.write_text(json.dumps(members))
    out = tmp_path / "r.json"
    main(["check", str(src), "--report", str(out), "--quiet"])
    row = json.loads(out.read_text())["members"][0]
    assert "grid" not in row and Report.model_validate(json.loads(out.read_text()))
