"""Over HTTP, a model with no column is a failed job with the refusal's one line.

docs/design.md §4 and §6; issue 13 item 2 (measured before: a column-less model was checked,
0 columns, PASS).  The job runs in a real worker process (the default worker command, the
real pipeline), through the app built by ``create_app``.
"""

from __future__ import annotations

from pathlib import Path

from fastapi.testclient import TestClient

from tests.service.http.jobs import run_job
from tests.service.test_no_columns import columnless_model


def test_model_without_columns_fails_its_job_with_the_message(client: TestClient,
                                                               tmp_path: Path) -> None:
    content = columnless_model(tmp_path / "model.ifc", strut=False).read_bytes()
    job = run_job(client, content, "portal.ifc")  # a real worker process
    assert job["status"] == "failed", job
    # The counts are the test model's own (tests/service/test_no_columns.columnless_model).
    assert job["error"] == (
        "no columns found in portal.ifc: the model has no IfcColumn; found instead: "
        "2 IfcMember (2 BRACE); 3 IfcStructuralCurveMember (analysis members; none has an "
        "edge within 5 degrees of vertical, so none is read as a column); 1 IfcBeam; "
        "1 IfcColumnType without occurrences")
    assert job["summary"] is None
    for what in ("report", "model", "csv"):
        assert client.get(f"/v1/jobs/{job['job_id']}/{what}").status_code == 409
