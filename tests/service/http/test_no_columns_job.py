"""Over HTTP, a model with no column is a failed job with the refusal's one line.

docs/design.md §4 and §6; issue 13 item 2 (measured before: a column-less model was checked,
0 columns, PASS).  The job runs in a real worker process (the default worker command, the
real pipeline), through the app built by ``create_app``.
"""

from __future__ import annotations

from pathlib import Path

from fastapi.testclient import TestClient

from stanchion.service.http.app import create_app
from stanchion.service.http.settings import Settings
from tests.service.http.test_app import _wait
from tests.service.test_no_columns import columnless_model


def test_model_without_columns_fails_its_job_with_the_message(tmp_path: Path) -> None:
    content = columnless_model(tmp_path / "model.ifc", strut=False).read_bytes()
    app = create_app(Settings(data_dir=tmp_path / "data"))
    with TestClient(app, raise_server_exceptions=False) as c:
        r = c.post("/v1/models", files={"file": ("portal.ifc", content)})
        assert r.status_code == 202, r.text
        job = _wait(c, r.json()["job_id"], timeout=60.0)  # a real worker process
        assert job["status"] == "failed", job
        # The counts are the test model's own (tests/service/test_no_columns.columnless_model).
        assert job["error"] == (
            "no columns found in portal.ifc: the model has no IfcColumn; found instead: "
            "2 IfcMember (2 BRACE); 3 IfcStructuralCurveMember (analysis members; none has an "
            "edge within 5 degrees of vertical, so none is read as a column); 1 IfcBeam; "
            "1 IfcColumnType without occurrences")
        assert job["summary"] is None
        for what in ("report", "model", "csv"):
            assert c.get(f"/v1/jobs/{job['job_id']}/{what}").status_code == 409
