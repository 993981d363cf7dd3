"""Two IFC elements with one GlobalId (issue 13): never checked, named in every output."""

from __future__ import annotations

import json
from pathlib import Path

import ifcopenshell

from stanchion.service.cli import main
from tests.service.test_model_check_files import write_model


def _model_with_a_repeated_global_id(tmp_path: Path) -> tuple[Path, str]:
    """The standard model (three columns, C1 and C2 checkable) with C2 given C1's GlobalId."""
    path = write_model(tmp_path / "tower.ifc")
    model = ifcopenshell.open(str(path))
    cols = {c.Name: c for c in model.by_type("IfcColumn")}
    cols["C2"].GlobalId = cols["C1"].GlobalId
    model.write(str(path))
    return path, cols["C1"].GlobalId


def test_elements_sharing_a_global_id_are_not_checked(tmp_path: Path, capsys) -> None:
    path, gid = _model_with_a_repeated_global_id(tmp_path)
    report_path = tmp_path / "report.json"
    code = main(["check", str(path), "--report", str(report_path)])
    assert code == 1  # not checked is not a pass (docs/design.md §4)
    report = json.loads(report_path.read_text())
    why = f"GlobalId {gid} is used by 2 elements"  # two elements were given it above
    rows = [m for m in report["members"] if m["id"] == gid]
    assert len(rows) == 2
    assert all(m["status"] == "not_checked" and m["reason"].startswith(why) for m in rows)
    assert any(why in m for m in report["messages"])  # the model-level message ...
    assert why in capsys.readouterr().out  # ... also on the terminal


def test_a_baseline_comparison_refuses_them_in_one_line(tmp_path: Path, capsys) -> None:
    path, gid = _model_with_a_repeated_global_id(tmp_path)
    baseline = tmp_path / "last.json"
    assert main(["check", str(write_model(tmp_path / "good.ifc")), "--report", str(baseline),
                 "--quiet"]) in (0, 1)
    out = tmp_path / "report.json"
    code = main(["check", str(path), "--baseline", str(baseline), "--report", str(out)])
    assert code == 2
    err = capsys.readouterr().err
    assert err.startswith("stanchion: ") and err.count("\n") == 1 and gid in err
    assert not out.exists()
