"""A model job takes ``default_grade`` (the command line's ``--default-grade``; issue 14).

Validated like the option: a text naming no grade is 422 naming the field.  The job runs in
a real worker process (the default worker command, the real pipeline).
"""

from __future__ import annotations

from fastapi.testclient import TestClient

from tests.service.cli.test_default_grade import _model
from tests.service.http.jobs import job_report, run_job


def test_the_default_grade_is_applied_and_stated(client: TestClient, tmp_path) -> None:
    model = _model(tmp_path).read_bytes()
    job = run_job(client, model, data={"default_grade": "A992"})
    assert job["status"] == "done", job
    report = job_report(client, job)
    c1 = next(m for m in report["members"] if m["name"] == "C1")
    assert c1["fy_source"] == "default_grade"
    # over HTTP the grade came from the job's field: the outputs name it, not the option
    assert report["design_basis"].endswith("assumed from the job's default_grade A992")
    assert any(m.startswith("the job's default_grade A992 assumed for") for m in
               report["messages"])
    assert any("Fy = 50 ksi from the job's default_grade A992" in m for m in c1["messages"])
    outputs = [str(report)] + [client.get(f"/v1/jobs/{job['job_id']}/{kind}").text
                               for kind in ("csv", "junit", "html")]
    assert not any("--default-grade" in text for text in outputs)


def test_an_unknown_grade_is_422_naming_the_field(client: TestClient, tmp_path) -> None:
    model = _model(tmp_path).read_bytes()
    r = client.post("/v1/models", files={"file": ("frame.ifc", model)},
                    data={"default_grade": "A999"})
    assert r.status_code == 422, r.text
    assert "default_grade" in r.text and "names no grade" in r.text
