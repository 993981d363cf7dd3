"""A member checked in the baseline and skipped now (docs/design.md §3 ``new_skipped``, §4).

Review gap: a steel column whose material was renamed to concrete came out ``skipped``, which
entered no change list, so ``--fail-on new-failures`` let a failing column leave CI
silently.  The models are built once with ``ifcopenshell.api`` (tests/ifc_bridge/conftest.py)
and written twice, before and after renaming one column's material, so the GlobalIds (the
comparison's key) are the same on both sides.

Expected statuses, by hand: S1 carries D = 600 kip: 1.4 x 600 = 840 kip (ASCE 7-22 §2.3.1
combination 1) > phi_c Pn of a W14X48 at any length (at most 0.9 x 50 x 14.1 = 635 kip, AISC
360-22 Eq. E3-1 with Fcr <= Fy, Ag = 14.1 in2 from the AISC Shapes Database v16.0): fail.
S2 carries D = 100, L = 50 kip: 1.2 x 100 + 1.6 x 50 = 200 kip < 303 kip (phi_c Pn at 16 ft,
AISC Manual Table 4-1a, 16th ed.; the 12 ft column is stronger): pass.
"""

from __future__ import annotations

import json
from pathlib import Path

import ifcopenshell.api.material
import jsonschema
import pytest

from stanchion.service.cli import main
from stanchion.service.report_model import Report
from stanchion.service.reports.report import report_schema
from tests.service.test_model_check_files import builder_module

W14X48 = {"d": 13.8, "bf": 8.03, "tw": 0.340, "tf": 0.595}  # AISC Shapes Database v16.0
LOADS = {"S1": {"D": 600.0}, "S2": {"D": 100.0, "L": 50.0}}  # S1 fails, S2 passes (above)


def _revisions(tmp_path: Path, schema: str, renamed: str, material: str) -> tuple[Path, Path,
                                                                                   dict]:
    """The model as it was (two steel columns) and with ``renamed``'s material renamed.

    Returns:
        The two model paths and each column's GlobalId by name.
    """
    b = builder_module().ModelBuilder(schema, "mm_N")
    materials, ids = {}, {}
    for name, loads in LOADS.items():
        materials[name] = ifcopenshell.api.material.add_material(b.model, name="ASTM A992")
        col = b.column(name, profile=b.profile("I", "W14X48", **W14X48),
                       material=materials[name], at=(0.0, 6000.0 * len(ids)))
        b.loads(col, **loads)
        ids[name] = col.GlobalId
    before = b.write(tmp_path / "before.ifc")
    materials[renamed].Name = material
    return before, b.write(tmp_path / "after.ifc"), ids


def _baseline(tmp_path: Path, model: Path) -> Path:
    path = tmp_path / "baseline.json"
    assert main(["check", str(model), "--quiet", "--report", str(path)]) == 1  # S1 fails
    statuses = {m["name"]: m["status"] for m in json.loads(path.read_text())["members"]}
    assert statuses == {"S1": "fail", "S2": "pass"}  # the hand computation above
    return path


@pytest.mark.parametrize("schema", ["IFC2X3", "IFC4", "IFC4X3"])
@pytest.mark.parametrize("allow", [[], ["--allow-not-checked"]])
def test_failing_column_turned_concrete_is_a_regression(tmp_path, capsys, schema,
                                                        allow) -> None:
    before, after, ids = _revisions(tmp_path, schema, "S1", "Beton C30/37")
    baseline = _baseline(tmp_path, before)
    capsys.readouterr()
    report_path = tmp_path / "after.json"
    code = main(["check", str(after), "--baseline", str(baseline), "--fail-on",
                 "new-failures", "--report", str(report_path), *allow])
    out, err = capsys.readouterr()
    assert code == 1  # docs/design.md §4: a failure never vanishes by relabelling
    assert (f"stanchion: warning: member S1 ({ids['S1']}) failed in the baseline "
            "(utilization ") in err
    assert "and is skipped now (not steel: concrete); a regression against the baseline" in err
    assert "1 newly skipped" in out
    assert out.rstrip().endswith("result: FAIL (1 regressions against the baseline, 1 of "
                                 "them failing before and skipped now)")

    report = json.loads(report_path.read_text())
    changes = report["changes"]
    assert [(e["name"], e["id"], e["status_before"], e["status_after"])
            for e in changes["new_skipped"]] == [("S1", ids["S1"], "fail", "skipped")]
    assert changes["counts"]["new_skipped"] == 1
    assert changes["new_failures"] == changes["fixed"] == changes["removed"] == []
    Report.model_validate(report)  # the contract: the models and the shipped schema
    jsonschema.validate(report, report_schema())


def test_passing_column_turned_timber_is_a_warning_only(tmp_path, capsys) -> None:
    before, after, ids = _revisions(tmp_path, "IFC4", "S2", "Glulam GL24h")
    baseline = _baseline(tmp_path, before)
    capsys.readouterr()
    report_path = tmp_path / "after.json"
    code = main(["check", str(after), "--baseline", str(baseline), "--fail-on",
                 "new-failures", "--report", str(report_path)])
    out, err = capsys.readouterr()
    assert code == 0  # S1 failed before too: no regression; S2 passed before
    assert (f"stanchion: warning: member S2 ({ids['S2']}) passed in the baseline and is "
            "skipped now (not steel: timber); no longer checked") in err
    assert out.rstrip().endswith("result: PASS (no regressions against the baseline)")
    report = json.loads(report_path.read_text())
    assert [e["id"] for e in report["changes"]["new_skipped"]] == [ids["S2"]]
    Report.model_validate(report)
    jsonschema.validate(report, report_schema())
