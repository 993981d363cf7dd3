"""Workers end with their server, never write into a failed job, and leave nothing behind.

Issue 13 measured: a job timeout during an ``.ifczip`` extraction leaves 597 MB behind; after
the server is killed its worker keeps running beside the new server's workers and writes into
a job already marked failed.  The workers here are the real worker with a stand-in check
(``stub_worker.py``); every wait is bounded.
"""

from __future__ import annotations

import json
import os
import signal
import subprocess
import sys
import time
from pathlib import Path

import pytest

from stanchion.service.jobs import store as jobs
from stanchion.service.jobs.runner import SERVER_PID_ENV, JobRunner
from stanchion.service.jobs.store import JobStore
from stanchion.service.jobs.worker import STOPPED, run_job

STUB_PATH = Path(__file__).with_name("stub_worker.py")
STUB = [sys.executable, str(STUB_PATH)]

#: A server stand-in: a job runner over the data folder argv[1], until it is killed.
RUNNER = r'''
import sys, time
from pathlib import Path
from stanchion.service.jobs.runner import JobRunner
from stanchion.service.jobs.store import JobStore

runner = JobRunner(JobStore(Path(sys.argv[1])), max_workers=1, timeout_s=120,
                   command=[sys.executable, sys.argv[2]])
runner.start()
runner.wake()
time.sleep(120)
'''


def _queue(store: JobStore, content: bytes) -> str:
    job_id = store.new_id()
    d = store.job_dir(job_id)
    d.mkdir(parents=True)
    (d / "model.ifc").write_bytes(content)
    (d / jobs.PARAMS_FILE).write_text(json.dumps(
        {"model": "model.ifc", "filename": "upload.ifc", "design_method": "LRFD",
         "loads": None, "loads_filename": None}))
    store.add(job_id, filename="upload.ifc", design_method="LRFD", has_loads=False)
    return job_id


def _wait_for(condition, timeout: float, what: str) -> None:
    end = time.monotonic() + timeout
    while not condition():
        assert time.monotonic() < end, f"{what} after {timeout} s"
        time.sleep(0.05)


def _alive(pid: int) -> bool:
    """True while the process runs (a zombie waiting for its new parent has ended)."""
    try:
        state = Path(f"/proc/{pid}/stat").read_text().rsplit(")", 1)[1].split()[0]
    except (OSError, IndexError):
        return False
    return state not in ("Z", "X")


def test_timeout_kill_removes_the_workers_leftovers(tmp_path: Path) -> None:
    store = JobStore(tmp_path / "data")
    # 3 s: room for a worker's start-up on a loaded machine (as test_runner.py)
    runner = JobRunner(store, max_workers=1, timeout_s=3.0, command=STUB)
    runner.start()
    try:
        job_id = _queue(store, b"FILL")
        runner.wake()
        d = store.job_dir(job_id)
        _wait_for(lambda: (d / "stub.tmp").exists(), 20, "the worker never filled")
        scratch = Path((d / "stub.tmp").read_text())
        assert scratch.is_relative_to(d / jobs.SCRATCH_DIR)  # TMPDIR is in the job folder
        _wait_for(lambda: store.get(job_id).status == "failed", 20, "the job did not fail")
        assert "time limit" in store.get(job_id).error
        assert not scratch.exists() and not (d / jobs.SCRATCH_DIR).exists()
        assert [p.name for p in d.iterdir() if p.name.endswith(".tmp")] == ["stub.tmp"]
        assert (d / jobs.STOPPED_FILE).exists()
    finally:
        runner.stop()


def test_worker_ends_when_its_server_is_killed(tmp_path: Path) -> None:
    data = tmp_path / "data"
    store = JobStore(data)
    job_id = _queue(store, b"HANG")
    server = subprocess.Popen([sys.executable, "-c", RUNNER, str(data), str(STUB_PATH)],
                              stdout=subprocess.DEVNULL, stderr=subprocess.DEVNULL)
    pid_file = store.job_dir(job_id) / "stub.pid"
    worker = 0
    try:
        _wait_for(pid_file.exists, 30, "the worker never started")
        worker = int(pid_file.read_text())
        assert _alive(worker)
        server.kill()  # SIGKILL: the server gets no chance to stop its workers
        server.wait(timeout=10)
        # a few seconds: the kernel signals at once (common practice, no source)
        end = time.monotonic() + 5
        while _alive(worker) and time.monotonic() < end:
            time.sleep(0.05)
        assert not _alive(worker), "the worker outlived its server"
        assert not (store.job_dir(job_id) / jobs.RESULT_FILE).exists()
    finally:
        if server.poll() is None:
            server.kill()
            server.wait(timeout=10)
        if worker and _alive(worker):
            os.kill(worker, signal.SIGKILL)


def test_worker_whose_server_is_already_gone_does_nothing(tmp_path: Path) -> None:
    store = JobStore(tmp_path / "data")
    job_id = _queue(store, b"fine")
    d = store.job_dir(job_id)
    # the pid of a process that is not this worker's parent: its server died before it ran
    env = {**os.environ, SERVER_PID_ENV: str(os.getpid() + 1_000_000)}
    done = subprocess.run([*STUB, str(d)], env=env, capture_output=True, text=True, timeout=60)
    assert done.returncode == 3  # service/jobs/worker.py main
    assert not (d / "stub.pid").exists() and not (d / jobs.RESULT_FILE).exists()


def test_worker_writes_no_result_into_a_job_already_failed(tmp_path: Path) -> None:
    store = JobStore(tmp_path / "data")
    d = store.job_dir(_queue(store, b"fine"))

    def failed_meanwhile(path, options, outputs) -> dict:
        (d / jobs.STOPPED_FILE).write_text("stopped\n")  # the server failed the job
        return {"summary": {"members": 1}, "members": []}

    assert run_job(d, check=failed_meanwhile) == STOPPED
    assert not (d / jobs.RESULT_FILE).exists()

    def never(path, options, outputs) -> dict:
        raise AssertionError("a stopped job is not checked")

    assert run_job(d, check=never) == STOPPED
    assert not (d / jobs.RESULT_FILE).exists()


def test_restart_stops_and_cleans_the_jobs_it_fails(tmp_path: Path) -> None:
    data = tmp_path / "data"
    store = JobStore(data)
    job_id = _queue(store, b"fine")
    assert store.claim_next().id == job_id  # a server took it, then died
    d = store.job_dir(job_id)
    (d / jobs.SCRATCH_DIR).mkdir()
    (d / jobs.SCRATCH_DIR / "stanchion-unzip-x").write_bytes(b"x" * 1000)
    (d / ".checked.ifc.abc.tmp").write_text("ISO")
    runner = JobRunner(JobStore(data), command=STUB)
    try:
        assert runner.start()["interrupted"] == 1
        assert (d / jobs.STOPPED_FILE).exists()
        assert not (d / jobs.SCRATCH_DIR).exists() and not (d / ".checked.ifc.abc.tmp").exists()
    finally:
        runner.stop()


@pytest.mark.parametrize("max_model_mb", [None, 12.5])
def test_workers_are_told_the_model_size_limit(tmp_path: Path, max_model_mb) -> None:
    from stanchion.service.jobs.runner import MAX_MODEL_MB_ENV, _worker_env

    env = _worker_env(10, tmp_path, max_model_mb)
    assert env["TMPDIR"] == str(tmp_path / jobs.SCRATCH_DIR)
    assert env[SERVER_PID_ENV] == str(os.getpid())
    assert env.get(MAX_MODEL_MB_ENV) == (os.environ.get(MAX_MODEL_MB_ENV)
                                         if max_model_mb is None else "12.5")
