"""``stanchion check model.ifc --analysis-members`` and the job field (issue 14 item 6).

A model with one column and one vertical analysis member tied to no column: without the
option only the column is checked; with it both, the report's ``source.analysis_members``
says so and the run message names the option.  A members file refuses the option (exit 2,
one line).  The HTTP job form's ``analysis_members``:
tests/service/http/test_analysis_members_job.py.
"""

from __future__ import annotations

import json

import pytest

from stanchion.service.cli import main
from tests.ifc_bridge.test_read_analysis_model import W14X90, _member
from tests.service.test_model_check_files import builder_module


def _model(tmp_path):
    b = builder_module().ModelBuilder("IFC4", "mm_N")
    prof = b.profile("I", "W14X90", **W14X90)
    col = b.column("C1", profile=prof, material=b.material("A992"))
    b.loads(col, D=100.0)
    _member(b, "free", (120, 0, 0), (120, 0, 144), prof, b.material("A992"))
    return b.write(tmp_path / "frame.ifc")


@pytest.mark.parametrize("given", [False, True])
def test_analysis_members_option(tmp_path, given) -> None:
    report = tmp_path / "r.json"
    args = ["check", str(_model(tmp_path)), "--report", str(report), "--quiet"]
    main(args + (["--analysis-members"] if given else []))
    data = json.loads(report.read_text())
    assert data["source"]["analysis_members"] is given
    names = [m["name"] for m in data["members"]]
    assert names == (["C1", "free"] if given else ["C1"])
    assert any("tied to no column are checked as columns (--analysis-members)" in s
               for s in data["messages"]) is given


def test_a_members_file_refuses_it(tmp_path, capsys) -> None:
    members = tmp_path / "m.json"
    members.write_text(json.dumps({"members": []}))
    assert main(["check", str(members), "--analysis-members"]) == 2
    err = capsys.readouterr().err.strip()
    assert err.endswith("--analysis-members applies to IFC models; a members file carries "
                        "its own loads, units, grades and candidates")
    assert "\n" not in err
