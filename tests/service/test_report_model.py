"""The report models (service/report_model.py) and the generated JSON Schema, on real output.

- The shipped ``service/schemas/report.schema.json`` is what ``tools/generate_schemas.py``
  renders from the models now (so the file cannot drift from them).
- Real reports validate against both the models and the shipped schema: a members-file report
  from the command line (detail, suggestions, custom combinations, a not-checked member and a
  baseline comparison with every kind of change) and an IFC model report (SI units,
  suggestions, a not-checked column, a baseline).
- Both refuse an unknown status, a missing required field, and the other ways a report can be
  wrong; the HTTP bodies (health, sections, job accepted / status, errors) fit their models.

Expected strengths: φcPn of a W14X48, Fy = 50 ksi, Lc = 16 ft is 303 kips (AISC Manual Table
4-1a, 16th ed.); combinations are ASCE 7-22 §2.3.1 or the custom factors given here.
"""

from __future__ import annotations

import copy
import importlib.util
import json
import sys
import time
from pathlib import Path
from types import ModuleType

import jsonschema
import pytest
from pydantic import BaseModel, ValidationError

from stanchion.service.cli import main as cli_main
from stanchion.service.members_check import check_request
from stanchion.service.report_model import (
    ErrorBody,
    Health,
    JobAccepted,
    JobStatus,
    Report,
    SectionList,
)
from stanchion.service.reports.report import report_schema
from stanchion.service.request import MembersRequest
from tests.service.checking import check_file as check_model
from tests.service.test_model_check_files import write_model

ROOT = Path(__file__).resolve().parents[2]
CHANGE_KINDS = ("new_failures", "fixed", "new_not_checked", "new_skipped", "added", "removed",
                "utilization_changes")


def _generator() -> ModuleType:
    """tools/generate_schemas.py, loaded by path (tools/ is not a package)."""
    name = "stanchion_tools_generate_schemas"
    if name not in sys.modules:
        spec = importlib.util.spec_from_file_location(name, ROOT / "tools" /
                                                      "generate_schemas.py")
        module = importlib.util.module_from_spec(spec)
        sys.modules[name] = module
        spec.loader.exec_module(module)
    return sys.modules[name]


def _validate(report: dict) -> None:
    """The report fits the models and the shipped JSON Schema."""
    Report.model_validate(report)
    jsonschema.validate(report, report_schema())


def _ids(changes: dict) -> dict[str, set[str]]:
    return {k: {e["id"] for e in changes[k]} for k in CHANGE_KINDS}


# ------------------------------------------------------------------------------ the schema


def test_shipped_schema_is_the_generated_one() -> None:
    gen = _generator()
    rendered = gen.render()
    path = gen.SCHEMAS_DIR / "report.schema.json"
    request_path = gen.SCHEMAS_DIR / "members-request.schema.json"
    assert set(rendered) == {path, request_path}
    for each in rendered:
        assert each.read_text(encoding="utf-8") == rendered[each], (
            f"service/schemas/{each.name} differs from the models: run "
            "tools/generate_schemas.py")
    assert gen.main(["--check"]) == 0
    shipped = report_schema()  # what the package loads is that file
    assert shipped == json.loads(rendered[path])
    jsonschema.Draft202012Validator.check_schema(shipped)
    assert (shipped["$schema"], shipped["$id"], shipped["title"]) == (
        "https://json-schema.org/draft/2020-12/schema", "stanchion/report.schema.json",
        "stanchion check report")


# ------------------------------------------------------------------------------ real reports


def _member(ident: str, section: str = "W14X48", **loads: float) -> dict:
    return {"id": ident, "section": section, "fy": 50, "length": 16, "loads": loads}


def test_members_file_report_with_detail_suggestions_and_changes(tmp_path: Path) -> None:
    # Baseline, ASCE 7-22 §2.3.1 (LRFD), φcPn = 303 kip for every W14X48 here:
    #   C-1 1.2(95) + 1.6(60) = 210 pass; C-2 1.2(100) + 1.6(50) = 200 pass;
    #   C-3 only here; C-5 1.4(300) = 420 > 303 fail.
    before = {"members": [_member("C-1", D=95, L=60), _member("C-2", D=100, L=50),
                          _member("C-3", D=50), _member("C-5", D=300)]}
    # Now, custom combinations gravity 1.2D + 1.6L and dead 1.4D:
    #   C-1 max(210, 133) = 210 pass, unchanged; C-2 max(1.2(200) + 1.6(100), 1.4(200)) =
    #   400 > 303 fail (utilization 0.66 -> 1.32); C-4 an angle, not checked (E5 is out of
    #   scope); C-5 max(180, 210) = 210 pass (1.39 -> 0.69).
    now = {"detail": True,
           "combinations": [{"name": "gravity", "factors": {"D": 1.2, "L": 1.6}},
                            {"name": "dead", "factors": {"D": 1.4}}],
           "members": [{**_member("C-1", D=95, L=60), "candidates": ["W12"]},
                       _member("C-2", D=200, L=100), _member("C-4", "L4X4X1/2", D=10),
                       _member("C-5", D=150)]}
    for name, body in (("before.json", before), ("now.json", now)):
        (tmp_path / name).write_text(json.dumps(body), encoding="utf-8")
    old, new = tmp_path / "old-report.json", tmp_path / "report.json"
    assert cli_main(["check", str(tmp_path / "before.json"), "--report", str(old),
                     "--quiet"]) == 1  # C-5 fails
    assert cli_main(["check", str(tmp_path / "now.json"), "--report", str(new),
                     "--baseline", str(old), "--quiet"]) == 1  # C-2 fails

    report = json.loads(new.read_text(encoding="utf-8"))
    rows = {m["id"]: m for m in report["members"]}
    assert [rows[i]["status"] for i in ("C-1", "C-2", "C-4", "C-5")] == [
        "pass", "fail", "not_checked", "pass"]  # the hand computation above
    assert rows["C-1"]["suggestions"]  # candidates given: W12 sections carry 210 kip
    assert set(rows["C-2"]["combinations"]) == {"gravity", "dead"}  # the request's names
    assert rows["C-4"]["reason"]
    assert report["source"] == {"file": "now.json", "members": 4}
    assert _ids(report["changes"]) == {
        "new_failures": {"C-2"}, "fixed": {"C-5"}, "new_not_checked": {"C-4"},
        "new_skipped": set(), "added": {"C-4"}, "removed": {"C-3"},
        "utilization_changes": {"C-2", "C-5"}}
    assert "design_basis_before" in report["changes"]  # ASCE 7-22 -> custom combinations
    _validate(report)
    _validate(json.loads(old.read_text(encoding="utf-8")))


def test_ifc_model_report_with_not_checked_columns_and_changes(tmp_path: Path) -> None:
    # The standard model (test_model_check_files): C1 1.2(95) + 1.6(60) + 0.5(12) = 216 kip
    # pass; C2 1.4(300) = 420 kip > 303 fail; C3 no loads, not checked.  In the baseline C2
    # carries D = 100 kip: 1.4(100) = 140 kip, pass.
    old_model = write_model(tmp_path / "old.ifc", "IFC4", loads={
        "C1": {"D": 95.0, "L": 60.0, "S": 12.0}, "C2": {"D": 100.0}, "C3": None})
    model = write_model(tmp_path / "model.ifc", "IFC4")
    baseline = tmp_path / "old-report.json"
    check_model(old_model, out_report=baseline, checked_at=None)
    report = check_model(model, units="si", suggest=True, baseline=baseline, checked_at=None,
                         out_report=tmp_path / "report.json")

    rows = {m["name"]: m for m in report["members"]}
    assert {n: m["status"] for n, m in rows.items()} == {
        "C1": "pass", "C2": "fail", "C3": "not_checked"}  # the hand computation above
    assert rows["C3"]["reason"]
    assert rows["C2"]["suggestions"]  # --suggest: failing columns get suggestions
    assert {rows[n]["tag"] for n in rows} == {"T0", "T1", "T2"}  # the builder's tags
    assert report["units"] == {"force": "kN", "length": "m", "stress": "MPa"}  # --units si
    assert report["source"]["schema"] == "IFC4"
    assert _ids(report["changes"])["new_failures"] == {rows["C2"]["id"]}
    _validate(report)
    _validate(json.loads((tmp_path / "report.json").read_text(encoding="utf-8")))


@pytest.mark.parametrize(("model", "loads"), [
    ("workshop_annex.ifc", None), ("garden_pavilion.ifc", "garden_pavilion_loads.csv")])
def test_sample_model_reports(model: str, loads: str | None) -> None:
    # The demo models (sample_models/README.md): analysis loads, a load table, W and HSS
    # columns, failing and not-checked ones on purpose.
    folder = ROOT / "sample_models"
    report = check_model(folder / model, loads_table=folder / loads if loads else None,
                         suggest=True, oversized=0.5, checked_at=None)
    assert report["summary"]["members"] == len(report["members"]) > 0
    assert report["source"]["loads_table"] == loads  # the table given, by name
    _validate(report)


# ------------------------------------------------------------------------------ refusals


@pytest.fixture(scope="module")
def good_report() -> dict:
    """A members report with a pass row (0) and a not-checked row (1)."""
    req = MembersRequest.model_validate({"members": [
        _member("C-1", D=95, L=60), _member("C-4", "L4X4X1/2", D=10)]})
    report = check_request(req)
    assert [m["status"] for m in report["members"]] == ["pass", "not_checked"]  # as above
    return report


def _set(path: tuple, value: object):
    def change(report: dict) -> None:
        *parents, last = path
        target = report
        for key in parents:
            target = target[key]
        target[last] = value
    return change


def _delete(path: tuple):
    def change(report: dict) -> None:
        *parents, last = path
        target = report
        for key in parents:
            target = target[key]
        del target[last]
    return change


BROKEN = {
    "unknown status": _set(("members", 0, "status"), "warn"),
    "no summary": _delete(("summary",)),
    "no member id": _delete(("members", 0, "id")),
    "no critical stress": _delete(("members", 0, "critical_stress")),
    "not checked without reason": _delete(("members", 1, "reason")),
    "checked without utilization": _set(("members", 0, "utilization"), None),
    "checked with a reason": _set(("members", 0, "reason"), "why"),
    "negative utilization": _set(("members", 0, "utilization"), -0.5),
    "number as text": _set(("members", 0, "required_strength"), "210"),
    "count as boolean": _set(("summary", "pass"), True),
    "unknown unit": _set(("units", "force"), "tonne"),
    "other schema version": _set(("schema_version",), "2"),
    "unknown row field": _set(("members", 0, "colour"), "red"),
    "unknown top-level field": _set(("extra",), {}),
    "null suggestions": _set(("members", 0, "suggestions"), None),
    "no skipped count": _delete(("summary", "skipped")),
    "skipped without reason": lambda r: (r["members"][1].update(status="skipped"),
                                         r["members"][1].pop("reason")),
    "skipped with utilization": lambda r: r["members"][0].update(status="skipped",
                                                                  reason="not steel: wood"),
}


def test_a_real_report_is_accepted(good_report: dict) -> None:
    _validate(good_report)  # the control for the refusals below


def test_a_skipped_row_is_accepted(good_report: dict) -> None:
    report = copy.deepcopy(good_report)
    # The not-checked row of the fixture, now skipped: a reason and no numbers (its demand,
    # known for a not-checked member, is null for a skipped one).
    report["members"][1].update(status="skipped", reason="not steel: concrete",
                                required_strength=None)
    _validate(report)


@pytest.mark.parametrize("change", BROKEN.values(), ids=BROKEN.keys())
def test_models_and_schema_refuse_a_broken_report(good_report: dict, change) -> None:
    bad = copy.deepcopy(good_report)
    change(bad)
    with pytest.raises(ValidationError):
        Report.model_validate(bad)
    with pytest.raises(jsonschema.ValidationError):
        jsonschema.validate(bad, report_schema())


# ------------------------------------------------------------------------------ HTTP bodies


MEMBER = _member("C-12", D=95.0, L=60.0, S=12.0)  # docs/design.md §2 example


def _fits(model: type[BaseModel], body: object) -> None:
    model.model_validate(body)
    jsonschema.validate(body, model.model_json_schema())


def test_http_bodies_fit_their_models(tmp_path: Path) -> None:
    # Imported here: the HTTP package is being reorganized; only this test depends on it.
    from fastapi.testclient import TestClient

    from stanchion.service.http.app import create_app
    from stanchion.service.http.settings import Settings

    stub = [sys.executable, str(Path(__file__).parent / "jobs" / "stub_worker.py")]
    settings = Settings(data_dir=tmp_path / "data", api_token="t0ken", max_upload_mb=0.01)
    auth = {"Authorization": "Bearer t0ken"}
    with TestClient(create_app(settings, worker_command=stub),
                    raise_server_exceptions=False) as c:
        _fits(Health, c.get("/v1/health").json())
        sections = c.get("/v1/sections", params={"family": "W14"}, headers=auth).json()
        _fits(SectionList, sections)
        assert sections["count"] == len(sections["sections"]) > 0
        checked = c.post("/v1/checks", headers=auth, json={"members": [MEMBER]})
        assert checked.status_code == 200
        _validate(checked.json())

        errors = {
            401: c.get("/v1/sections"),
            404: c.get(f"/v1/jobs/{'0' * 32}", headers=auth),
            413: c.post("/v1/checks", headers={**auth, "Content-Type": "application/json"},
                        content=b" " * 20_000),  # over max_upload_mb = 0.01 (10,485 bytes)
            415: c.post("/v1/models", headers=auth, content=b"x"),
            422: c.post("/v1/checks", headers=auth, json={"members": []}),
        }
        upload = c.post("/v1/models", headers=auth,
                        files={"file": ("tower.ifc", b"SLOW1.00 model")})
        assert upload.status_code == 202
        _fits(JobAccepted, upload.json())
        job_url = upload.json()["url"]
        errors[409] = c.get(f"{job_url}/report", headers=auth)  # the stub sleeps 1 s
        for status, response in errors.items():
            assert response.status_code == status, (status, response.text)
            _fits(ErrorBody, response.json())
        assert errors[422].json()["details"]  # a validation error names the field

        job = c.get(job_url, headers=auth).json()
        _fits(JobStatus, job)
        end = time.monotonic() + 20
        while job["status"] not in ("done", "failed") and time.monotonic() < end:
            time.sleep(0.05)
            job = c.get(job_url, headers=auth).json()
        assert job["status"] == "done"  # the stub succeeds on this file
        _fits(JobStatus, job)
        assert job["summary"] is not None

