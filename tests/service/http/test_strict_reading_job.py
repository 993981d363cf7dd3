"""Over HTTP, a damaged model is a failed job with the refusal's one line (issue 13 item 1).

docs/design.md §5 and §6.  The job runs in a real worker process (the default worker
command, the real pipeline), through the app built by ``create_app``.
"""

from __future__ import annotations

from pathlib import Path

from fastapi.testclient import TestClient

from stanchion.service.http.app import create_app
from stanchion.service.http.settings import Settings
from tests.service.http.test_app import _wait

SAMPLE = Path(__file__).resolve().parents[3] / "sample_models" / "workshop_annex.ifc"


def test_cut_model_fails_its_job_naming_the_line(tmp_path: Path) -> None:
    # head -n -7 of the sample (the case): its last line is then line count - 7
    lines = SAMPLE.read_bytes().splitlines(keepends=True)
    content = b"".join(lines[:-7])
    app = create_app(Settings(data_dir=tmp_path / "data"))
    with TestClient(app, raise_server_exceptions=False) as c:
        r = c.post("/v1/models", files={"file": ("annex.ifc", content)})
        assert r.status_code == 202, r.text
        job = _wait(c, r.json()["job_id"], timeout=60.0)  # a real worker process
        assert job["status"] == "failed", job
        assert job["error"].endswith(f": line {len(lines) - 7}: the file ends without "
                                     "END-ISO-10303-21; (cut short?)"), job["error"]
        assert job["error"].startswith("cannot read annex.ifc: "), job["error"]
        assert "\n" not in job["error"]
        assert job["summary"] is None
        for what in ("report", "model", "csv"):
            assert c.get(f"/v1/jobs/{job['job_id']}/{what}").status_code == 409
