"""A model job takes ``analysis_members`` (the command line's ``--analysis-members``; issue 14).

true / false (1 / 0, yes / no, on / off); anything else is 422 naming the field.  The job runs
in a real worker process (the default worker command, the real pipeline).
"""

from __future__ import annotations

from fastapi.testclient import TestClient

from tests.service.cli.test_analysis_members import _model
from tests.service.http.jobs import job_report, run_job


def test_the_job_field(client: TestClient, tmp_path) -> None:
    model = _model(tmp_path).read_bytes()
    job = run_job(client, model, data={"analysis_members": "true"})
    report = job_report(client, job)
    assert report["source"]["analysis_members"] is True
    assert [m["name"] for m in report["members"]] == ["C1", "free"]
    bad = client.post("/v1/models", files={"file": ("frame.ifc", model)},
                      data={"analysis_members": "maybe"})
    assert bad.status_code == 422
    assert "analysis_members" in bad.text and "expected true or false" in bad.text
