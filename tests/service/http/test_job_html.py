"""A model job's HTML report is downloadable like its report (issue 16 item 1, §6).

The job runs in a real worker process (the default worker command, the real pipeline).
"""

from __future__ import annotations

from pathlib import Path

from fastapi.testclient import TestClient

from tests.service.http.jobs import run_job
from tests.service.reports.html_page import parse
from tests.service.test_model_check_files import column_guids, write_model


def test_a_done_job_gives_its_html_report(client: TestClient, tmp_path: Path) -> None:
    # The standard model: C1 passes, C2 fails (1.4 x 300 = 420 kip > φcPn 303 kip, AISC
    # Manual Table 4-1a), C3 has no loads (not checked).
    import ifcopenshell

    model = write_model(tmp_path / "frame.ifc")
    guids = column_guids(ifcopenshell.open(str(model)))
    job = run_job(client, model.read_bytes())
    assert job["status"] == "done", job
    page = client.get(f"/v1/jobs/{job['job_id']}/html")
    assert page.status_code == 200
    assert page.headers["content-type"].startswith("text/html")
    assert 'filename="frame-report.html"' in page.headers["content-disposition"]
    tree = parse(page.text)
    statuses = {a.attrs["data-member"]: a.attrs["class"].split()[1]
                for a in tree.find_all("article")}
    assert statuses == {guids["C1"]: "pass", guids["C2"]: "fail",
                        guids["C3"]: "not_checked"}
    cells = {td.attrs["data-summary"]: td.text() for td in tree.find_all("td")
             if "data-summary" in td.attrs}
    assert (cells["pass"], cells["fail"], cells["not_checked"]) == ("1", "1", "1")


def test_html_of_an_unknown_job_is_404(client: TestClient) -> None:
    r = client.get("/v1/jobs/nosuchjob/html")
    assert r.status_code == 404
    assert "error" in r.json()
