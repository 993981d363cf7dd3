"""A model job's JUnit XML and BCF issues are downloadable like its report (issue 16 item 4).

The job runs in a real worker process (the default worker command, the real pipeline).
"""

from __future__ import annotations

import xml.etree.ElementTree as ET

from bcf.v3.bcfxml import BcfXml
from fastapi.testclient import TestClient

from tests.service.http.jobs import run_job
from tests.service.test_model_check_files import column_guids, write_model


def test_a_done_job_gives_its_junit_and_bcf(client: TestClient, tmp_path) -> None:
    # The standard model: C1 passes, C2 fails (1.4 x 300 = 420 kip > φcPn 303 kip, AISC
    # Manual Table 4-1a), C3 has no loads (not checked).
    model = write_model(tmp_path / "frame.ifc")
    import ifcopenshell

    guids = column_guids(ifcopenshell.open(str(model)))
    job = run_job(client, model.read_bytes())
    assert job["status"] == "done", job
    base = f"/v1/jobs/{job['job_id']}"

    junit = client.get(f"{base}/junit")
    assert junit.status_code == 200
    assert junit.headers["content-type"].startswith("application/xml")
    assert 'filename="frame-junit.xml"' in junit.headers["content-disposition"]
    root = ET.fromstring(junit.content)
    cases = {c.get("name").split(" [")[0]: c for c in root.iter("testcase")}
    assert set(cases) == {"C1", "C2", "C3"}
    assert cases["C2"].find("failure").get("type") == "FAIL"
    assert cases["C3"].find("failure").get("type") == "NOT CHECKED"

    bcf = client.get(f"{base}/bcf")
    assert bcf.status_code == 200
    assert bcf.headers["content-type"] == "application/octet-stream"
    assert 'filename="frame-issues.bcf"' in bcf.headers["content-disposition"]
    path = tmp_path / "got.bcf"
    path.write_bytes(bcf.content)
    document = BcfXml.load(path)
    selected = sorted(g for t in document.topics.values() for v in t.viewpoints.values()
                      for g in v.get_selected_guids())
    assert selected == sorted([guids["C2"], guids["C3"]])
    summary = job["summary"]
    assert len(document.topics) == summary["fail"] + summary["not_checked"] == 2
    document.close()


def test_unknown_job_downloads_are_404(client: TestClient) -> None:
    for what in ("junit", "bcf"):
        r = client.get(f"/v1/jobs/{'0' * 32}/{what}")
        assert r.status_code == 404, r.text
