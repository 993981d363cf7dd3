"""A large ``POST /v1/checks`` is worked off the event loop (issue 13 item 5; docs/design.md §6).

Issue 13 measured 2,000 candidates stalling the event loop 0.2 s.  The check of a large body
(parsing, validation, the check itself: ``checks.check_body``) runs in the thread pool, so
``/v1/health`` answers meanwhile.  The test asserts the order of events, not timings: the
check is patched to wait until the test releases it, and the test releases it only after
health has answered -- on the event loop the wait would block health until it timed out.
"""

from __future__ import annotations

import json
import threading
from pathlib import Path

import pytest
from fastapi.testclient import TestClient

from stanchion.service.http.app import create_app
from stanchion.service.http.routes import checks as checks_route
from stanchion.service.http.settings import Settings

#: How long the patched check waits for its release before giving up (a failing run).
WAIT_S = 10.0


def _large_body() -> bytes:
    members = [{"id": f"C-{i}", "section": "W14X48", "fy": 50, "length": 16,
                "loads": {"D": 95.0, "L": 60.0}} for i in range(600)]
    return json.dumps({"members": members}).encode()


def test_health_answers_while_a_large_check_is_worked(
        tmp_path: Path, monkeypatch: pytest.MonkeyPatch) -> None:
    started, release = threading.Event(), threading.Event()
    order: list[str] = []
    original = checks_route.check_body

    def held_check(body: bytes):
        started.set()
        order.append("check started")
        order.append("check released" if release.wait(WAIT_S) else "check gave up")
        return original(body)

    monkeypatch.setattr(checks_route, "check_body", held_check)
    body = _large_body()
    assert len(body) > checks_route.INLINE_CHECK_BYTES  # the large-body path
    answers: dict[str, int] = {}
    with TestClient(create_app(Settings(data_dir=tmp_path / "data")),
                    raise_server_exceptions=False) as client:

        def post() -> None:
            r = client.post("/v1/checks", content=body,
                            headers={"content-type": "application/json"})
            answers["check"] = r.status_code
            if r.status_code == 200:
                answers["members"] = r.json()["summary"]["members"]

        poster = threading.Thread(target=post)
        poster.start()
        assert started.wait(WAIT_S), "the check never started"
        health = client.get("/v1/health")
        order.append("health answered")
        release.set()
        poster.join(WAIT_S)
    assert health.status_code == 200
    assert order == ["check started", "health answered", "check released"]
    assert answers == {"check": 200, "members": 600}


def test_a_small_check_is_answered_the_same(tmp_path: Path) -> None:
    # the inline path (at most INLINE_CHECK_BYTES) gives the same report as the pooled one
    member = {"id": "C-1", "section": "W14X48", "fy": 50, "length": 16,
              "loads": {"D": 95.0, "L": 60.0}}
    with TestClient(create_app(Settings(data_dir=tmp_path / "data"))) as client:
        small = client.post("/v1/checks", json={"members": [member]}).json()
        padded = {"members": [member, *({**member, "id": f"P-{i}"} for i in range(599))]}
        large = client.post("/v1/checks", json=padded).json()
    assert small["members"][0] == large["members"][0]
