"""Over HTTP, a damaged model is a failed job with the refusal's one line (issue 13 item 1).

docs/design.md §5 and §6.  The job runs in a real worker process (the default worker
command, the real pipeline), through the app built by ``create_app``.
"""

from __future__ import annotations

from pathlib import Path

from fastapi.testclient import TestClient

from tests.service.http.jobs import run_job

SAMPLE = Path(__file__).resolve().parents[3] / "sample_models" / "workshop_annex.ifc"


def test_cut_model_fails_its_job_naming_the_line(client: TestClient) -> None:
    # head -n -7 of the sample (the case): its last line is then line count - 7
    lines = SAMPLE.read_bytes().splitlines(keepends=True)
    job = run_job(client, b"".join(lines[:-7]), "annex.ifc")  # a real worker process
    assert job["status"] == "failed", job
    assert job["error"].endswith(f": line {len(lines) - 7}: the file ends without "
                                 "END-ISO-10303-21; (cut short?)"), job["error"]
    assert job["error"].startswith("cannot read annex.ifc: "), job["error"]
    assert "\n" not in job["error"]
    assert job["summary"] is None
    for what in ("report", "model", "csv"):
        assert client.get(f"/v1/jobs/{job['job_id']}/{what}").status_code == 409
