"""A model job takes the force unit of a model that declares none (issue 13 item 3).

``POST /v1/models`` accepts ``force_unit`` (the command line's ``--force-unit``), validated
the same way: not a force unit is 422 naming the field.  Without it, a model that declares no
force unit but carries forces fails its job naming the fix (docs/design.md §5, §6).  The
jobs run in a real worker process (the default worker command, the real pipeline).
"""

from __future__ import annotations

from pathlib import Path

import pytest
from fastapi.testclient import TestClient

from tests.service.cli.test_force_unit import N_PER_KIP
from tests.service.http.jobs import job_report, run_job
from tests.service.test_model_check_files import write_model


@pytest.fixture
def model(tmp_path: Path) -> bytes:
    # Stanchion_Loads D = 100 (meaning kN) in a millimetre model without a force unit
    path = write_model(tmp_path / "model.ifc", units="mm_MPa",
                       loads={"C1": {"D": 100 / N_PER_KIP}, "C2": {"D": 100 / N_PER_KIP}})
    return path.read_bytes()


def test_the_given_force_unit_reads_the_models_forces(client: TestClient, model) -> None:
    job = run_job(client, model, data={"force_unit": "kN"})
    assert job["status"] == "done", job
    report = job_report(client, job)
    # 1.4D = 1.4 x 100 kN / 4.4482216 kN per kip = 31.47 kip (ASCE 7-22 §2.3.1 comb. 1);
    # φcPn = 303 kip (W14X48, Fy 50 ksi, Lc 16 ft: AISC Manual Table 4-1a, read-off)
    assert [m["utilization"] for m in report["members"]] == pytest.approx([31.47 / 303] * 2,
                                                                           rel=0.01)
    # over HTTP the unit came from the job's field: the outputs name it, not the option
    assert any("read in kN, the unit given with the job's force_unit" in m
               for m in report["messages"])
    assert all("force read in kN, given with the job's force_unit" in m["messages"]
               for m in report["members"])
    outputs = [str(report)] + [client.get(f"/v1/jobs/{job['job_id']}/{kind}").text
                               for kind in ("csv", "junit", "html")]
    assert not any("--force-unit" in text or "command line" in text for text in outputs)


def test_without_it_the_job_fails_naming_the_fix(client: TestClient, model) -> None:
    job = run_job(client, model)
    assert job["status"] == "failed", job
    assert "model declares no force unit but carries forces" in job["error"]
    assert "force_unit" in job["error"] and "\n" not in job["error"]


@pytest.mark.parametrize("unit", ["m", "furlongs", "2*N", "x" * 41])
def test_a_force_unit_that_is_not_one_is_refused(client: TestClient, model, unit) -> None:
    r = client.post("/v1/models", files={"file": ("frame.ifc", model)},
                    data={"force_unit": unit})
    assert r.status_code == 422, r.text
    body = r.json()
    assert body["details"][0]["loc"] == "force_unit"
    assert "is not a force unit" in body["details"][0]["msg"]
    assert client.get("/v1/health").status_code == 200
