"""Job store and job runner: queueing, worker processes, crashes, time limit, restarts.

The worker processes run the real ``stanchion.service.jobs.worker`` with a stand-in model
check (``stub_worker.py``), so these tests need no IFC parsing.  Every wait is bounded.
"""

from __future__ import annotations

import json
import os
import sqlite3
import sys
import time
from pathlib import Path

import pytest

from stanchion.service.jobs import store as jobs
from stanchion.service.jobs.runner import JobRunner
from stanchion.service.jobs.store import JobStore
from stanchion.service.jobs.worker import run_job

STUB = [sys.executable, str(Path(__file__).with_name("stub_worker.py"))]


def _queue(store: JobStore, content: bytes, *, method: str = "LRFD",
           loads: str | None = None) -> str:
    job_id = store.new_id()
    d = store.job_dir(job_id)
    d.mkdir(parents=True)
    (d / "model.ifc").write_bytes(content)
    params = {"model": "model.ifc", "filename": "upload.ifc", "design_method": method,
              "loads": None, "loads_filename": None}
    if loads is not None:
        (d / "loads.csv").write_text(loads)
        params.update(loads="loads.csv", loads_filename="my-loads.csv")
    (d / jobs.PARAMS_FILE).write_text(json.dumps(params))
    store.add(job_id, filename="upload.ifc", design_method=method, has_loads=loads is not None)
    return job_id


def _wait(store: JobStore, job_id: str, timeout: float = 20.0) -> jobs.Job:
    end = time.monotonic() + timeout
    while time.monotonic() < end:
        job = store.get(job_id)
        if job is not None and job.status in ("done", "failed"):
            return job
        time.sleep(0.05)
    raise AssertionError(f"job {job_id} still {store.get(job_id).status} after {timeout} s")


@pytest.fixture
def store(tmp_path: Path) -> JobStore:
    return JobStore(tmp_path / "data")


@pytest.fixture
def runner(store: JobStore):
    r = JobRunner(store, max_workers=2, timeout_s=30, command=STUB)
    r.start()
    yield r
    r.stop()


# ----------------------------------------------------------------------------- store


def test_store_life_cycle(store: JobStore) -> None:
    job_id = _queue(store, b"ok")
    job = store.get(job_id)
    assert job.status == "queued" and job.error is None and job.started is None
    claimed = store.claim_next()
    assert claimed.id == job_id and claimed.status == "running" and claimed.started
    assert store.claim_next() is None  # nothing else queued
    assert store.finish(job_id, "done", summary={"members": 3})
    job = store.get(job_id)
    assert job.status == "done" and job.summary == {"members": 3} and job.finished
    assert not store.finish(job_id, "failed", error="late")  # only running jobs finish
    assert store.get(job_id).status == "done"
    assert store.delete(job_id)
    assert store.get(job_id) is None and not store.job_dir(job_id).exists()
    assert not store.delete(job_id)


def test_store_claims_oldest_first_and_rejects_odd_ids(store: JobStore) -> None:
    first, second = _queue(store, b"a"), _queue(store, b"b")
    assert store.claim_next().id == first
    assert store.claim_next().id == second
    for bad in ("../../etc", "X" * 32, "", first.upper()):
        assert store.get(bad) is None and not store.delete(bad)


def test_store_persists_across_instances(tmp_path: Path) -> None:
    a = JobStore(tmp_path / "d")
    job_id = _queue(a, b"x")
    b = JobStore(tmp_path / "d")
    assert b.get(job_id).status == "queued"


# ----------------------------------------------------------------------------- runner


def test_job_runs_in_a_worker_process_and_leaves_its_outputs(store, runner) -> None:
    job_id = _queue(store, b"fine model", method="ASD", loads="element,D\nC1,10\n")
    runner.wake()
    job = _wait(store, job_id)
    assert job.status == "done", job.error
    assert job.error is None and job.summary["members"] == 1
    d = store.job_dir(job_id)
    report = json.loads((d / jobs.REPORT_FILE).read_text())
    assert report["stand_in"]["method"] == "ASD"
    assert report["stand_in"]["loads"] == "element,D\nC1,10\n"
    assert report["stand_in"]["pid"] != os.getpid()  # ran in another process
    assert report["stand_in"]["cpu_limit"] == 30 + 30  # time limit + 30 s grace, jobs/runner.py
    assert (d / jobs.MODEL_OUT_FILE).read_bytes() == b"fine model"
    assert (d / jobs.CSV_FILE).is_file()


def test_input_error_fails_the_job_with_its_message_without_server_paths(store, runner):
    job_id = _queue(store, b"INPUT")
    runner.wake()
    job = _wait(store, job_id)
    assert job.status == "failed"
    assert job.error == "cannot read upload.ifc: not an IFC file"
    assert str(store.data_dir) not in job.error


def test_unexpected_exception_gives_a_short_message_no_traceback(store, runner) -> None:
    job_id = _queue(store, b"BOOM")
    runner.wake()
    job = _wait(store, job_id)
    assert job.status == "failed"
    assert job.error == "the model could not be processed (RuntimeError)"
    assert "Traceback" not in job.error and "internal detail" not in job.error
    # the traceback stays server-side, in the job's worker log
    assert "Traceback" in (store.job_dir(job_id) / jobs.LOG_FILE).read_text()


def test_crashing_worker_fails_its_job_and_the_runner_goes_on(store, runner) -> None:
    crash = _queue(store, b"CRASH")
    after = _queue(store, b"fine")
    runner.wake()
    job = _wait(store, crash)
    assert job.status == "failed"
    assert job.error == ("the model could not be processed: the worker process was killed "
                         "by SIGABRT")
    assert _wait(store, after).status == "done"


def test_stuck_job_is_killed_after_the_time_limit(store) -> None:
    # 3 s: room for a worker's start-up (imports ~0.5 s) on a loaded machine
    r = JobRunner(store, max_workers=1, timeout_s=3.0, command=STUB)
    r.start()
    try:
        stuck = _queue(store, b"HANG")
        r.wake()
        t0 = time.monotonic()
        job = _wait(store, stuck, timeout=20)
        assert job.status == "failed" and "time limit" in job.error
        assert 2.9 < time.monotonic() - t0 < 15
        assert r.running() == 0
        assert _wait(store, _queue(store, b"fine")).status == "done"  # next job still runs
    finally:
        r.stop()


def test_at_most_max_workers_run_at_once(store) -> None:
    r = JobRunner(store, max_workers=1, timeout_s=30, command=STUB)
    r.start()
    try:
        ids = [_queue(store, b"SLOW0.10") for _ in range(3)]
        r.wake()
        seen_running = 0
        end = time.monotonic() + 20
        while time.monotonic() < end and any(
                store.get(i).status not in ("done", "failed") for i in ids):
            seen_running = max(seen_running, r.running(), store.count("running"))
            time.sleep(0.02)
        done = [store.get(i) for i in ids]
        assert [j.status for j in done] == ["done"] * 3
        assert seen_running == 1
        spans = sorted((j.started, j.finished) for j in done)
        assert all(a[1] <= b[0] for a, b in zip(spans, spans[1:], strict=False))  # no overlap
    finally:
        r.stop()


def test_delete_stops_a_running_job(store, runner) -> None:
    job_id = _queue(store, b"HANG")
    runner.wake()
    end = time.monotonic() + 10
    while runner.running() == 0 and time.monotonic() < end:
        time.sleep(0.02)
    assert store.get(job_id).status == "running"
    assert runner.delete(job_id)
    assert runner.running() == 0
    assert store.get(job_id) is None and not store.job_dir(job_id).exists()
    assert not runner.delete(job_id)


def test_restart_fails_interrupted_jobs_and_runs_queued_ones(tmp_path: Path) -> None:
    data = tmp_path / "data"
    store = JobStore(data)
    interrupted = _queue(store, b"fine")
    assert store.claim_next().id == interrupted  # a server took it, then died
    queued = _queue(store, b"fine")
    orphan = store.incoming_dir(store.new_id())
    orphan.mkdir()  # an upload cut off by the crash
    fresh = JobStore(data)
    r = JobRunner(fresh, max_workers=1, timeout_s=30, command=STUB)
    found = r.start()
    try:
        assert found == {"interrupted": 1, "queued": 1, "orphans": 1}
        job = fresh.get(interrupted)
        assert job.status == "failed" and job.error == jobs.INTERRUPTED_BY_RESTART
        assert _wait(fresh, queued).status == "done"
        assert not orphan.exists()
    finally:
        r.stop()


def test_shutdown_fails_running_jobs(store) -> None:
    r = JobRunner(store, max_workers=1, timeout_s=30, command=STUB)
    r.start()
    job_id = _queue(store, b"HANG")
    r.wake()
    end = time.monotonic() + 10
    while r.running() == 0 and time.monotonic() < end:
        time.sleep(0.02)
    r.stop()
    job = store.get(job_id)
    assert job.status == "failed" and job.error == jobs.INTERRUPTED_BY_SHUTDOWN


def test_one_runner_per_data_folder(store) -> None:
    a = JobRunner(store, command=STUB)
    a.start()
    try:
        with pytest.raises(RuntimeError, match="another stanchion server"):
            JobRunner(JobStore(store.data_dir), command=STUB).start()
    finally:
        a.stop()
    b = JobRunner(store, command=STUB)  # free again once the first has stopped
    b.start()
    b.stop()


def test_database_is_plain_sqlite(store) -> None:
    job_id = _queue(store, b"x")
    con = sqlite3.connect(store.db_path)
    try:
        assert con.execute("SELECT status FROM jobs WHERE id = ?", (job_id,)).fetchone() == (
            "queued",)
    finally:
        con.close()


# ----------------------------------------------------------------------------- worker


def test_worker_writes_the_report_when_the_check_does_not(store) -> None:
    job_id = _queue(store, b"fine")
    d = store.job_dir(job_id)
    result = run_job(d, check=lambda path, options, outputs: {"summary": {"members": 0},
                                                              "members": []})
    assert result == {"status": "done", "summary": {"members": 0}}
    assert json.loads((d / jobs.REPORT_FILE).read_text())["members"] == []
    assert json.loads((d / jobs.RESULT_FILE).read_text()) == result
