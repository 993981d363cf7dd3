"""OpenAPI says what each route answers: the report model for checks, the job models, the error
body for every error status a route gives, and downloads with their media types; real answers
of each kind validate against the documented models."""

from __future__ import annotations

import time
from pathlib import Path

import pytest

from stanchion.service.report_model import ErrorBody, JobAccepted, JobStatus, Report, SectionList
from tests.service.http.test_app import MEMBER, TOKEN, _client

ERROR_REF = "#/components/schemas/ErrorBody"

#: The status codes each route gives (common practice, no source: what the routes raise,
#: plus 401 wherever the guard asks for the token and 413 wherever a body is read).
EXPECTED = {
    ("get", "/v1/health"): {"200"},
    ("post", "/v1/checks"): {"200", "401", "413", "422"},
    ("post", "/v1/models"): {"202", "401", "413", "415", "422"},
    ("get", "/v1/jobs/{job_id}"): {"200", "401", "404"},
    ("delete", "/v1/jobs/{job_id}"): {"204", "401", "404"},
    ("get", "/v1/jobs/{job_id}/report"): {"200", "401", "404", "409"},
    ("get", "/v1/jobs/{job_id}/model"): {"200", "401", "404", "409"},
    ("get", "/v1/jobs/{job_id}/csv"): {"200", "401", "404", "409"},
    ("get", "/v1/jobs/{job_id}/junit"): {"200", "401", "404", "409"},
    ("get", "/v1/jobs/{job_id}/bcf"): {"200", "401", "404", "409"},
    ("get", "/v1/jobs/{job_id}/html"): {"200", "401", "404", "409"},
    ("get", "/v1/sections"): {"200", "401", "404", "422"},
}


@pytest.fixture(scope="module")
def schema(tmp_path_factory) -> dict:
    with _client(tmp_path_factory.mktemp("openapi")) as c:
        return c.get("/openapi.json").json()


def _ref(response: dict, media: str = "application/json") -> str | None:
    return response["content"][media]["schema"].get("$ref")


def test_every_route_documents_exactly_the_answers_it_gives(schema: dict) -> None:
    documented = {(m, p): set(op["responses"]) for p, ops in schema["paths"].items()
                  for m, op in ops.items()}
    assert documented == EXPECTED
    for (method, path), codes in EXPECTED.items():
        for code in codes - {"200", "202", "204"}:
            assert _ref(schema["paths"][path][method]["responses"][code]) == ERROR_REF


def test_success_bodies_are_the_models(schema: dict) -> None:
    paths = schema["paths"]
    assert _ref(paths["/v1/checks"]["post"]["responses"]["200"]) == \
        "#/components/schemas/Report"
    assert _ref(paths["/v1/jobs/{job_id}/report"]["get"]["responses"]["200"]) == \
        "#/components/schemas/Report"
    assert _ref(paths["/v1/models"]["post"]["responses"]["202"]) == \
        "#/components/schemas/JobAccepted"
    assert _ref(paths["/v1/jobs/{job_id}"]["get"]["responses"]["200"]) == \
        "#/components/schemas/JobStatus"
    status = schema["components"]["schemas"]["JobStatus"]["properties"]
    assert "options" in status  # the options a job was started with (docs/design.md §6)
    assert set(schema["components"]["schemas"]["JobOptions"]["properties"]) == {
        "force_unit", "default_grade", "analysis_members", "loads", "takedown"}
    assert _ref(paths["/v1/sections"]["get"]["responses"]["200"]) == \
        "#/components/schemas/SectionList"
    assert "HTTPValidationError" not in schema["components"]["schemas"]


def test_downloads_have_their_media_types(schema: dict) -> None:
    paths = schema["paths"]
    assert set(paths["/v1/jobs/{job_id}/model"]["get"]["responses"]["200"]["content"]) == \
        {"application/x-step"}
    assert set(paths["/v1/jobs/{job_id}/csv"]["get"]["responses"]["200"]["content"]) == \
        {"text/csv"}
    assert set(paths["/v1/jobs/{job_id}/junit"]["get"]["responses"]["200"]["content"]) == \
        {"application/xml"}
    assert set(paths["/v1/jobs/{job_id}/bcf"]["get"]["responses"]["200"]["content"]) == \
        {"application/octet-stream"}
    assert set(paths["/v1/jobs/{job_id}/html"]["get"]["responses"]["200"]["content"]) == \
        {"text/html"}


def test_real_answers_validate_against_the_documented_models(tmp_path: Path) -> None:
    with _client(tmp_path, max_upload_mb=0.01) as c:
        Report.model_validate(c.post("/v1/checks", json={"members": [MEMBER]}).json())
        accepted = c.post("/v1/models", files={"file": ("tower.ifc", b"SLOW0.50")})
        JobAccepted.model_validate(accepted.json())
        job_id = accepted.json()["job_id"]
        answers = [
            c.post("/v1/checks", json={"members": [{**MEMBER, "fy": "x"}]}),  # 422
            c.post("/v1/checks", content=b"{" + b" " * 20_000 + b"}"),  # 413
            c.post("/v1/models", content=b"x", headers={"content-type": "text/plain"}),  # 415
            c.get("/v1/jobs/" + "0" * 32),  # 404
            c.get(f"/v1/jobs/{job_id}/report"),  # 409 while it runs
            c.get("/v1/sections", params={"family": "Q7"}),  # 422
        ]
        assert [r.status_code for r in answers] == [422, 413, 415, 404, 409, 422]
        for r in answers:
            ErrorBody.model_validate(r.json())
        SectionList.model_validate(c.get("/v1/sections", params={"family": "W14"}).json())
        end = time.monotonic() + 20
        while (job := c.get(f"/v1/jobs/{job_id}").json())["status"] not in ("done", "failed"):
            assert time.monotonic() < end
            time.sleep(0.05)
        JobStatus.model_validate(job)
    with _client(tmp_path / "authed", api_token=TOKEN) as c:
        ErrorBody.model_validate(c.get("/v1/sections").json())  # 401
