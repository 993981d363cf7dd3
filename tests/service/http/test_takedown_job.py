"""A model job takes a load takedown project file (the command line's ``--takedown``).

Field ``takedown`` of ``POST /v1/models``: validated at upload (an unusable file is 422
naming the field, with the command line's one line); the job runs in a real worker process
with the real pipeline and its report marks the takedown loads.
"""

from __future__ import annotations

from pathlib import Path

import pytest
from fastapi.testclient import TestClient

from stanchion.service.http.app import create_app
from stanchion.service.http.settings import Settings
from tests.service import takedown_model as tm
from tests.service.http.test_app import _wait
from tests.service.test_takedown_loads import PROJECT, hand


@pytest.fixture
def client(tmp_path: Path):
    with TestClient(create_app(Settings(data_dir=tmp_path / "data")),
                    raise_server_exceptions=False) as c:
        yield c


def _model(tmp_path: Path) -> bytes:
    b, _ = tm.build("IFC4")
    return b.write(tmp_path / "grid.ifc").read_bytes()


def test_a_job_with_a_takedown_project_checks_every_column(client, tmp_path):
    r = client.post("/v1/models", files={"file": ("grid.ifc", _model(tmp_path)),
                                         "takedown": ("my loads.toml", PROJECT.encode())})
    assert r.status_code == 202, r.text
    job = _wait(client, r.json()["job_id"], timeout=60.0)
    assert job["status"] == "done", job
    report = client.get(f"/v1/jobs/{job['job_id']}/report").json()
    assert report["source"]["takedown"] == "my loads.toml"
    assert {m["load_source"] for m in report["members"]} == {"takedown"}
    assert {m["status"] for m in report["members"]} == {"pass"}
    row = next(m for m in report["members"] if m["name"] == "C-11-1")
    assert row["tributary_area"] == pytest.approx(hand(1, 1, 1)["area"], rel=0.01)  # ft²


def test_an_unusable_project_is_422_naming_the_field(client, tmp_path):
    bad = b'units = "SI"\n[options]\nslab_density = "heavy"\n'
    r = client.post("/v1/models", files={"file": ("grid.ifc", _model(tmp_path)),
                                         "takedown": ("p.toml", bad)})
    assert r.status_code == 422, r.text
    assert "takedown" in r.text and "options.slab_density" in r.text
    empty = client.post("/v1/models", files={"file": ("grid.ifc", _model(tmp_path)),
                                             "takedown": ("p.toml", b"")})
    assert empty.status_code == 422 and "empty" in empty.text
