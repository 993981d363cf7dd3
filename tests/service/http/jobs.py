"""Steps the HTTP job tests share: upload a model with its form fields, wait for its job."""

from __future__ import annotations

import time
from typing import Any

from fastapi.testclient import TestClient


def wait_for_job(c: TestClient, job_id: str, timeout: float = 20.0, **kw: Any) -> dict:
    """Poll ``GET /v1/jobs/{job_id}`` until the job is done or failed; its status body.

    Args:
        c: the client.
        job_id: the job.
        timeout: seconds before the test fails.
        **kw: passed to every ``GET`` (headers of an app with a token).
    """
    end = time.monotonic() + timeout
    while time.monotonic() < end:
        job = c.get(f"/v1/jobs/{job_id}", **kw).json()
        if job["status"] in ("done", "failed"):
            return job
        time.sleep(0.05)
    raise AssertionError(f"job {job_id} not finished after {timeout} s")


def run_job(c: TestClient, model: bytes, name: str = "frame.ifc", *,
            files: dict[str, tuple[str, bytes]] | None = None,
            data: dict[str, str] | None = None, timeout: float = 60.0) -> dict:
    """Upload ``model`` as ``name`` (202 expected) and wait for its job; its status body.

    Args:
        c: the client.
        model: the model file's bytes.
        name: its file name.
        files: other file parts (``loads``, ``takedown``): field -> (file name, bytes).
        data: form fields (``force_unit``, ``default_grade`` ...).
        timeout: seconds before the test fails (a real worker reads a real model).
    """
    r = c.post("/v1/models", files={"file": (name, model), **(files or {})}, data=data or {})
    assert r.status_code == 202, r.text
    return wait_for_job(c, r.json()["job_id"], timeout)


def job_report(c: TestClient, job: dict) -> dict:
    """The JSON report of a finished job."""
    r = c.get(f"/v1/jobs/{job['job_id']}/report")
    assert r.status_code == 200, r.text
    return r.json()
