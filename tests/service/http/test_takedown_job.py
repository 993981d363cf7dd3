"""A model job takes a load takedown project file (the command line's ``--takedown``).

Field ``takedown`` of ``POST /v1/models``: validated at upload (an unusable file is 422
naming the field, with the command line's one line); the job runs in a real worker process
with the real pipeline and its report marks the takedown loads.
"""

from __future__ import annotations

from pathlib import Path

import pytest

from tests.service import takedown_model as tm
from tests.service.http.jobs import job_report, run_job
from tests.service.test_takedown_loads import PROJECT, hand


def _model(tmp_path: Path) -> bytes:
    b, _ = tm.build("IFC4")
    return b.write(tmp_path / "grid.ifc").read_bytes()


def test_a_job_with_a_takedown_project_checks_every_column(client, tmp_path):
    job = run_job(client, _model(tmp_path), "grid.ifc",
                  files={"takedown": ("my loads.toml", PROJECT.encode())})
    assert job["status"] == "done", job
    report = job_report(client, job)
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
