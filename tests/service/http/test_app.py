"""HTTP routes through FastAPI's TestClient (model jobs run the stand-in worker).

Every route: health, checks (good, malformed, not JSON), models upload -> job -> downloads,
409 before results exist, 404 for unknown jobs, delete, sections, auth on and off, 413
limits, the catch-all 500 handler, OpenAPI and docs.
"""

from __future__ import annotations

import sys
from pathlib import Path

import pytest
from fastapi.testclient import TestClient

from stanchion.service.http.app import create_app
from stanchion.service.http.guard import Guard
from stanchion.service.http.routes import checks as checks_route
from stanchion.service.http.settings import Settings
from stanchion.service.members_check import check_request
from stanchion.service.request import MembersRequest
from tests.service.http.jobs import wait_for_job as _wait
from tests.service.test_takedown_loads import PROJECT

STUB = [sys.executable, str(Path(__file__).parents[1] / "jobs" / "stub_worker.py")]
TOKEN = "s3cret-token"

MEMBER = {"id": "C-12", "section": "W14X48", "fy": 50, "length": 16,
          "loads": {"D": 95.0, "L": 60.0, "S": 12.0}}  # docs/design.md §2 example


def _client(tmp_path: Path, **settings) -> TestClient:
    s = Settings(data_dir=tmp_path / "data", **settings)
    return TestClient(create_app(s, worker_command=STUB), raise_server_exceptions=False)


@pytest.fixture
def client(tmp_path: Path):
    with _client(tmp_path) as c:
        yield c


@pytest.fixture
def authed(tmp_path: Path):
    with _client(tmp_path, api_token=TOKEN) as c:
        yield c


def _upload(c: TestClient, content: bytes = b"fine model", name: str = "tower.ifc",
            **kw) -> str:
    r = c.post("/v1/models", files={"file": (name, content)}, **kw)
    assert r.status_code == 202, r.text
    assert r.headers["location"] == f"/v1/jobs/{r.json()['job_id']}"
    return r.json()["job_id"]


# ----------------------------------------------------------------------------- health, checks


def test_health(client: TestClient) -> None:
    r = client.get("/v1/health")
    assert r.status_code == 200 and r.json()["status"] == "ok"


def test_checks_returns_the_core_report(client: TestClient) -> None:
    body = {"design_method": "LRFD", "members": [MEMBER]}
    r = client.post("/v1/checks", json=body)
    assert r.status_code == 200
    report = r.json()
    # the HTTP answer is the report of the shared core, unchanged (docs/design.md §3)
    assert report == check_request(MembersRequest.model_validate(body))
    m = report["members"][0]
    assert m["id"] == "C-12" and m["section"] == "W14X48"
    assert report["summary"]["members"] == 1 and m["status"] in ("pass", "fail")


def test_checks_malformed_body_names_the_fields(client: TestClient) -> None:
    bad = {"members": [MEMBER, {**MEMBER, "id": "C-13", "fy": "fifty", "kx": []}]}
    r = client.post("/v1/checks", json=bad)
    assert r.status_code == 422
    body = r.json()
    locs = {d["loc"] for d in body["details"]}
    assert {"members.1.fy", "members.1.kx"} <= locs
    assert "members.1." in body["error"]


@pytest.mark.parametrize(("payload", "loc"), [
    ({"members": []}, "members"),
    ({}, "members"),
    ({"members": [MEMBER], "design_method": "XYZ"}, "design_method"),
    ({"members": [MEMBER], "unknown": 1}, "unknown"),
    ({"members": [MEMBER, MEMBER]}, "request"),  # repeated ids: a whole-request rule
    ({"members": [{**MEMBER, "loads": {"D": 10, "T": 5}}]}, "members.0.loads.T"),  # no type T
    ({"members": [{**MEMBER, "loads": {"D": "heavy"}}]}, "members.0.loads.D"),
    # more candidates than request.MAX_CANDIDATES (200; 100,000 cost 14 s of CPU, issue 13)
    ({"members": [{**MEMBER, "candidates": ["W14"] * 201}]}, "members.0.candidates"),
    # a rule checked after validation: repeated combination names (the error body still
    # names the field)
    ({"members": [MEMBER], "combinations": [{"name": "x", "factors": {"D": 1}},
                                           {"name": "x", "factors": {"D": 2}}]},
     "combinations"),
])
def test_checks_refuses_malformed_requests_as_a_whole(client, payload, loc) -> None:
    r = client.post("/v1/checks", json=payload)
    assert r.status_code == 422
    assert loc in [d["loc"] for d in r.json()["details"]]


@pytest.mark.parametrize(("text", "loc", "msg"), [
    ('"fy": 1e400', "members.0.fy", "finite"),  # parses as infinity
    ('"loads": {"D": 1e400}', "members.0.loads.D", "finite"),
    ('"loads": {"D": "NaN"}', "members.0.loads.D", "valid"),  # a string is not a number
    # Booleans are not numbers (issue 13: "fy": true was taken as 1 ksi); the field is named.
    ('"fy": true', "members.0.fy", "valid"),
    ('"lx": false', "members.0.lx", "valid"),
    ('"loads": {"D": true}', "members.0.loads.D", "valid"),
    ('"fy": 50}], "E": true, "x": [{', "E", "valid"),
    ('"fy": 50}], "selection": {"max_suggestions": true}, "x": [{',
     "selection.max_suggestions", "valid"),
])
def test_checks_refuses_numbers_that_are_not_finite_numbers(client, text, loc, msg) -> None:
    body = '{"members": [{"id": "C-1", "section": "W14X48", "length": 16, ' + text + "}]}"
    r = client.post("/v1/checks", content=body, headers={"content-type": "application/json"})
    assert r.status_code == 422
    assert loc in [d["loc"] for d in r.json()["details"]]
    detail = next(d for d in r.json()["details"] if d["loc"] == loc)
    assert detail["msg"].startswith(f"Input should be a {msg}")


def test_checks_not_json(client: TestClient) -> None:
    r = client.post("/v1/checks", content=b"{members: oops",
                    headers={"content-type": "application/json"})
    assert r.status_code == 422
    assert r.json()["details"][0]["loc"] == "body"
    assert "not valid JSON" in r.json()["error"]


def test_unusable_member_is_not_checked_others_are(client: TestClient) -> None:
    body = {"members": [MEMBER, {**MEMBER, "id": "C-13", "section": "W14X47"}]}
    r = client.post("/v1/checks", json=body)
    assert r.status_code == 200  # docs/design.md §2: well-formed but unusable -> not_checked
    status = {m["id"]: m["status"] for m in r.json()["members"]}
    assert status["C-13"] == "not_checked" and status["C-12"] != "not_checked"


# ----------------------------------------------------------------------------- model jobs


def test_upload_job_and_downloads(client: TestClient) -> None:
    job_id = client.post(
        "/v1/models", files={"file": ("tower.ifc", b"fine model"),
                             "loads": ("loads.csv", b"element,D\nC1,10\n")},
        data={"design_method": "asd"}).json()["job_id"]
    job = _wait(client, job_id)
    assert job["status"] == "done" and job["error"] is None
    assert job["design_method"] == "ASD" and job["loads"] is True
    assert job["filename"] == "tower.ifc" and job["created"] and job["finished"]
    assert job["summary"]["members"] == 1
    report = client.get(f"/v1/jobs/{job_id}/report")
    assert report.status_code == 200
    assert report.json()["stand_in"]["loads"] == "element,D\nC1,10\n"
    model = client.get(f"/v1/jobs/{job_id}/model")
    assert model.status_code == 200 and model.content == b"fine model"
    assert 'filename="tower-checked.ifc"' in model.headers["content-disposition"]
    csv = client.get(f"/v1/jobs/{job_id}/csv")
    assert csv.status_code == 200 and csv.text.startswith("id,status")
    assert csv.headers["content-type"].startswith("text/csv")


def test_the_job_status_shows_the_options_it_was_started_with(client: TestClient) -> None:
    job_id = client.post(
        "/v1/models", files={"file": ("tower.ifc", b"fine model"),
                             "loads": ("my loads.csv", b"element,D\nC1,10\n"),
                             "takedown": ("slabs.toml", PROJECT.encode())},
        data={"force_unit": " kN ", "default_grade": "A992", "analysis_members": "yes"},
    ).json()["job_id"]
    options = {"force_unit": "kN", "default_grade": "A992", "analysis_members": True,
               "loads": "my loads.csv", "takedown": "slabs.toml"}
    assert client.get(f"/v1/jobs/{job_id}").json()["options"] == options  # while queued
    assert _wait(client, job_id)["options"] == options
    plain = _wait(client, _upload(client))
    assert plain["options"] == {"force_unit": None, "default_grade": None,
                                "analysis_members": False, "loads": None, "takedown": None}


def test_results_are_409_until_ready(client: TestClient) -> None:
    job_id = _upload(client, b"SLOW0.50")
    for what in ("report", "model", "csv"):
        r = client.get(f"/v1/jobs/{job_id}/{what}")
        assert r.status_code == 409
        assert "not ready" in r.json()["error"]
    assert _wait(client, job_id)["status"] == "done"
    assert client.get(f"/v1/jobs/{job_id}/report").status_code == 200


def test_failed_job_has_its_message_and_no_results(client: TestClient) -> None:
    job_id = _upload(client, b"INPUT")
    job = _wait(client, job_id)
    assert job["status"] == "failed"
    assert job["error"] == "cannot read tower.ifc: not an IFC file"
    r = client.get(f"/v1/jobs/{job_id}/report")
    assert r.status_code == 409 and "not an IFC file" in r.json()["error"]


def test_crashing_model_does_not_take_the_server_down(client: TestClient) -> None:
    job = _wait(client, _upload(client, b"CRASH"))
    assert job["status"] == "failed" and "worker process" in job["error"]
    assert client.get("/v1/health").status_code == 200
    assert _wait(client, _upload(client))["status"] == "done"


@pytest.mark.parametrize("path", ["/v1/jobs/{}", "/v1/jobs/{}/report", "/v1/jobs/{}/model",
                                  "/v1/jobs/{}/csv"])
@pytest.mark.parametrize("job_id", ["0" * 32, "nope", "..%2F..%2Fjobs.sqlite3"])
def test_unknown_job_is_404_json(client: TestClient, path: str, job_id: str) -> None:
    r = client.get(path.format(job_id))
    assert r.status_code == 404 and "error" in r.json()


def test_delete_removes_record_and_files(client: TestClient, tmp_path: Path) -> None:
    job_id = _upload(client)
    _wait(client, job_id)
    job_dir = tmp_path / "data" / "jobs" / job_id
    assert job_dir.is_dir()
    assert client.delete(f"/v1/jobs/{job_id}").status_code == 204
    assert client.get(f"/v1/jobs/{job_id}").status_code == 404
    assert not job_dir.exists()
    assert client.delete(f"/v1/jobs/{job_id}").status_code == 404


@pytest.mark.parametrize(("files", "data", "status", "loc"), [
    ({}, {"design_method": "LRFD"}, 422, "file"),
    ({"file": ("notes.txt", b"hello")}, {}, 422, "file"),
    ({"file": ("empty.ifc", b"")}, {}, 422, "file"),
    ({"file": ("a.ifc", b"x")}, {"design_method": "WSD"}, 422, "design_method"),
    ({"file": ("a.ifc", b"x"), "extra": ("b.ifc", b"y")}, {}, 422, "extra"),
    ({"file": ("a.ifc", b"x"), "loads": ("loads.csv", b"")}, {}, 422, "loads"),
])
def test_upload_refusals(client, tmp_path, files, data, status, loc) -> None:
    if not files:  # a form without the file part
        r = client.post("/v1/models", data=data, files={"loads": ("l.csv", b"a,b\n")})
    else:
        r = client.post("/v1/models", files=files, data=data)
    assert r.status_code == status, r.text
    assert r.json()["details"][0]["loc"] == loc
    assert list((tmp_path / "data" / "jobs").iterdir()) == []  # nothing left behind


def test_upload_must_be_multipart(client: TestClient) -> None:
    r = client.post("/v1/models", json={"file": "x"})
    assert r.status_code == 415 and "multipart" in r.json()["error"]


def test_upload_limit_by_content_length(tmp_path: Path) -> None:
    with _client(tmp_path, max_upload_mb=0.01) as c:  # 10,485 bytes
        r = c.post("/v1/models", files={"file": ("big.ifc", b"x" * 20_000)})
        assert r.status_code == 413 and "STANCHION_MAX_UPLOAD_MB" in r.json()["error"]
        assert list((tmp_path / "data" / "jobs").iterdir()) == []
        assert _upload(c, b"y" * 5_000)  # under the limit: accepted


def test_upload_limit_while_streaming_without_content_length(tmp_path: Path) -> None:
    boundary = "XyZ"
    head = (f"--{boundary}\r\nContent-Disposition: form-data; name=\"file\"; "
            f"filename=\"big.ifc\"\r\n\r\n").encode()

    def body():  # chunked: no Content-Length header
        yield head
        for _ in range(10):
            yield b"x" * 4096
        yield f"\r\n--{boundary}--\r\n".encode()

    with _client(tmp_path, max_upload_mb=0.01) as c:
        r = c.post("/v1/models", content=body(),
                   headers={"content-type": f"multipart/form-data; boundary={boundary}"})
        assert r.status_code == 413
        assert list((tmp_path / "data" / "jobs").iterdir()) == []


def test_checks_body_limit_without_content_length(tmp_path: Path) -> None:
    def body():  # chunked: the limit is counted while reading
        yield b'{"members": ['
        for i in range(50):
            yield (b'{"id": "C%d", "section": "W14X48", "fy": 50, "length": 16},' % i)
        yield b'{"id": "last"}]}'

    with _client(tmp_path, max_upload_mb=0.001) as c:  # 1,048 bytes
        r = c.post("/v1/checks", content=body(), headers={"content-type": "application/json"})
        assert r.status_code == 413


@pytest.mark.parametrize("declared", [b"100", None])
def test_guard_counts_a_chunked_body_whatever_length_it_declares(tmp_path, declared) -> None:
    # A body sent chunked is not framed by a Content-Length it also declares (RFC 9112
    # §6.3): the guard counts what is read.
    import asyncio

    settings = Settings(data_dir=tmp_path / "data", max_upload_mb=0.001)
    read: list[int] = []

    async def inner(scope, receive, send) -> None:
        while True:
            message = await receive()
            read.append(len(message.get("body", b"")))
            if not message.get("more_body"):
                break
        await send({"type": "http.response.start", "status": 200, "headers": []})
        await send({"type": "http.response.body", "body": b"ok"})

    chunks = [{"type": "http.request", "body": b"x" * 600, "more_body": True}] * 3 + [
        {"type": "http.request", "body": b"", "more_body": False}]
    sent: list[dict] = []

    async def receive() -> dict:
        return chunks.pop(0)

    async def send(message: dict) -> None:
        sent.append(message)

    headers = [(b"transfer-encoding", b"chunked")]
    if declared is not None:
        headers.append((b"content-length", declared))
    scope = {"type": "http", "path": "/v1/checks", "method": "POST", "headers": headers}
    asyncio.run(Guard(inner, settings)(scope, receive, send))
    assert sent[0]["status"] == 413
    assert sum(read) <= 2 * 600  # stopped once past the 1,048-byte limit


def test_checks_body_limit(tmp_path: Path) -> None:
    with _client(tmp_path, max_upload_mb=0.001) as c:  # 1,048 bytes
        many = {"members": [{**MEMBER, "id": f"C{i}"} for i in range(50)]}
        assert c.post("/v1/checks", json=many).status_code == 413
        assert c.post("/v1/checks", json={"members": [MEMBER]}).status_code == 200


# ----------------------------------------------------------------------------- sections


def test_sections_of_a_family_with_depth(client: TestClient) -> None:
    r = client.get("/v1/sections", params={"family": "W14"})
    assert r.status_code == 200
    body = r.json()
    names = [s["designation"] for s in body["sections"]]
    assert "W14X48" in names and body["count"] == len(names)
    assert all(n.startswith("W14X") for n in names)
    w = next(s for s in body["sections"] if s["designation"] == "W14X48")
    # AISC Shapes Database v16.0, W14X48: A = 14.1 in², d = 13.8 in, bf = 8.03 in,
    # rx = 5.85 in, ry = 1.91 in, 48 lb/ft
    assert (w["A"], w["d"], w["bf"], w["rx"], w["ry"], w["weight"]) == (
        14.1, 13.8, 8.03, 5.85, 1.91, 48.0)
    assert w["family"] == "W" and w["supported"] is True
    assert body["units"]["A"] == "in2"


def test_sections_unknown_family(client: TestClient) -> None:
    r = client.get("/v1/sections", params={"family": "ZZ9"})
    assert r.status_code == 422 and r.json()["details"][0]["loc"] == "family"
    r = client.get("/v1/sections", params={"family": "W13"})  # a family, no such depth
    assert r.status_code == 404 and "W13" in r.json()["error"]


def test_sections_all(client: TestClient) -> None:
    body = client.get("/v1/sections").json()
    families = {s["family"] for s in body["sections"]}
    assert {"W", "HSS", "PIPE"} <= families and body["count"] == len(body["sections"])


# ----------------------------------------------------------------------------- auth


def test_auth_off_everything_open(client: TestClient) -> None:
    assert client.get("/v1/sections", params={"family": "W14"}).status_code == 200
    assert client.get("/openapi.json").status_code == 200


@pytest.mark.parametrize(("method", "path"), [
    ("POST", "/v1/checks"), ("POST", "/v1/models"), ("GET", "/v1/jobs/" + "0" * 32),
    ("GET", "/v1/jobs/x/report"), ("DELETE", "/v1/jobs/x"), ("GET", "/v1/sections"),
    ("GET", "/openapi.json"), ("GET", "/docs"), ("GET", "/no/such/path"),
])
def test_auth_on_requires_the_token(authed: TestClient, method: str, path: str) -> None:
    for headers in ({}, {"Authorization": "Bearer wrong"}, {"Authorization": TOKEN},
                    {"Authorization": f"Basic {TOKEN}"}):
        r = authed.request(method, path, headers=headers)
        assert r.status_code == 401, (headers, r.status_code)
        assert r.json() == {"error": "missing or wrong bearer token"}
        assert r.headers["www-authenticate"] == "Bearer"


def test_auth_on_health_open_and_token_works(authed: TestClient) -> None:
    assert authed.get("/v1/health").status_code == 200
    h = {"Authorization": f"Bearer {TOKEN}"}
    assert authed.post("/v1/checks", json={"members": [MEMBER]}, headers=h).status_code == 200
    job_id = _upload(authed, headers=h)
    assert _wait(authed, job_id, headers=h)["status"] == "done"
    assert authed.get(f"/v1/jobs/{job_id}/model", headers=h).status_code == 200
    assert authed.get("/openapi.json", headers=h).status_code == 200
    assert authed.get("/docs", headers=h).status_code == 200


# ----------------------------------------------------------------------------- errors, docs


def test_internal_errors_are_json_without_traceback(client, monkeypatch, caplog) -> None:
    def explode(req):
        raise RuntimeError("secret internals")

    monkeypatch.setattr(checks_route, "check_request", explode)
    r = client.post("/v1/checks", json={"members": [MEMBER]})
    assert r.status_code == 500
    assert r.json() == {"error": "internal error"}
    assert "secret" not in r.text
    assert "secret internals" in caplog.text  # logged server-side


def test_openapi_lists_the_v1_routes(client: TestClient) -> None:
    paths = client.get("/openapi.json").json()["paths"]
    assert {"/v1/health", "/v1/checks", "/v1/models", "/v1/jobs/{job_id}",
            "/v1/jobs/{job_id}/report", "/v1/jobs/{job_id}/model", "/v1/jobs/{job_id}/csv",
            "/v1/sections"} <= set(paths)
    upload = paths["/v1/models"]["post"]["requestBody"]["content"]["multipart/form-data"]
    assert upload["schema"]["required"] == ["file"]
    doc = client.get("/openapi.json").json()
    body = paths["/v1/checks"]["post"]["requestBody"]["content"]["application/json"]
    assert body["schema"] == {"$ref": "#/components/schemas/MembersRequest"}
    schemas = doc["components"]["schemas"]
    assert "members" in schemas["MembersRequest"]["properties"]
    assert {"Member", "Units"} <= set(schemas)  # nested models resolvable
    loads = schemas["Member"]["properties"]["loads"]["anyOf"][0]
    assert loads["type"] == "object"
    assert loads["propertyNames"]["enum"] == ["D", "L", "Lr", "S", "R", "W", "E"]  # §2
    assert client.get("/docs").status_code == 200
