"""``stanchion check`` refuses a model whose length or pressure unit is undeclared (exit 2).

Issue 13 item 3 (docs/design.md §5): IFC defines no default unit, so nothing is assumed; one
line names what is missing, nothing is written.  The standard test model
(tests/service/test_model_check_files.py) in the builder's unit systems without the unit.
"""

from __future__ import annotations

import pytest

from stanchion.service.cli import main
from tests.service.test_model_check_files import write_model


@pytest.mark.parametrize(("units", "missing"), [("none", "length"), ("mm_only", "pressure")])
def test_an_undeclared_unit_is_refused_in_one_line(tmp_path, capsys, units, missing) -> None:
    model = write_model(tmp_path / "model.ifc", units=units, loads={"C1": None})
    report, out = tmp_path / "r.json", tmp_path / "checked.ifc"
    assert main(["check", str(model), "--report", str(report), "--out", str(out)]) == 2
    err = capsys.readouterr().err
    assert err.startswith(f"stanchion: model declares no {missing} unit (no "
                          f"{missing.upper()}UNIT in the project's IfcUnitAssignment)"), err
    assert err.count("\n") == 1 and f"must declare its {missing} unit" in err
    assert not report.exists() and not out.exists()
