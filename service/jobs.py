"""Model jobs: a SQLite job table under the data folder and the worker processes that run them.

Layout of ``STANCHION_DATA_DIR``::

    jobs.sqlite3            one row per job (status, times, error, summary)
    server.lock             held by the one server using this folder
    jobs/<id>/              job.json (parameters), the upload, and the worker's outputs
    jobs/<id>.part/         an upload still being received (never a job yet)

Each job runs in its own child process (``python -P -m stanchion.service.worker JOB_DIR``),
so a model that crashes or hangs the IFC parser cannot take the server down.  One dispatcher
thread starts at most ``max_workers`` processes at a time, stops a process that runs longer
than the time
limit, and records the outcome the worker left in ``result.json``.  Only this process writes
the job table.  On start, jobs left ``running`` by an earlier server are failed ("interrupted
by a server restart") and queued ones are run.
"""

from __future__ import annotations

import fcntl
import json
import logging
import os
import re
import shutil
import signal
import sqlite3
import subprocess
import sys
import threading
import time
import uuid
from dataclasses import dataclass
from datetime import UTC, datetime
from pathlib import Path
from typing import IO

log = logging.getLogger("stanchion.jobs")

STATUSES = ("queued", "running", "done", "failed")
INTERRUPTED_BY_RESTART = "interrupted by a server restart"
INTERRUPTED_BY_SHUTDOWN = "interrupted by a server shutdown"
_ID = re.compile(r"^[0-9a-f]{32}$")

#: File names inside a job folder (shared with :mod:`service.worker`).
PARAMS_FILE = "job.json"
RESULT_FILE = "result.json"
REPORT_FILE = "report.json"
MODEL_OUT_FILE = "checked.ifc"
CSV_FILE = "report.csv"
LOG_FILE = "worker.log"

_SCHEMA = """
CREATE TABLE IF NOT EXISTS jobs (
    id TEXT PRIMARY KEY,
    status TEXT NOT NULL,
    error TEXT,
    created TEXT NOT NULL,
    started TEXT,
    finished TEXT,
    filename TEXT NOT NULL,
    design_method TEXT NOT NULL,
    has_loads INTEGER NOT NULL DEFAULT 0,
    summary TEXT
);
CREATE INDEX IF NOT EXISTS jobs_status_created ON jobs (status, created);
"""


def _now() -> str:
    return datetime.now(UTC).isoformat(timespec="milliseconds").replace("+00:00", "Z")


def valid_job_id(job_id: str) -> bool:
    """True for ids this store hands out (32 lowercase hex digits); anything else is unknown."""
    return bool(_ID.match(job_id))


@dataclass(frozen=True)
class Job:
    """One job row."""

    id: str
    status: str
    error: str | None
    created: str
    started: str | None
    finished: str | None
    filename: str
    design_method: str
    has_loads: bool
    summary: dict | None

    @classmethod
    def _from_row(cls, row: sqlite3.Row) -> Job:
        return cls(
            id=row["id"], status=row["status"], error=row["error"], created=row["created"],
            started=row["started"], finished=row["finished"], filename=row["filename"],
            design_method=row["design_method"], has_loads=bool(row["has_loads"]),
            summary=json.loads(row["summary"]) if row["summary"] else None,
        )

    def public(self) -> dict:
        """The job as ``GET /v1/jobs/{id}`` shows it."""
        return {
            "job_id": self.id, "status": self.status, "error": self.error,
            "created": self.created, "started": self.started, "finished": self.finished,
            "filename": self.filename, "design_method": self.design_method,
            "loads": self.has_loads, "summary": self.summary,
        }


class JobStore:
    """The job table (``jobs.sqlite3``) and the job folders under ``data_dir``."""

    def __init__(self, data_dir: Path) -> None:
        self.data_dir = Path(data_dir).resolve()
        self.jobs_dir = self.data_dir / "jobs"
        self.db_path = self.data_dir / "jobs.sqlite3"
        self.jobs_dir.mkdir(parents=True, exist_ok=True)
        with self._connect() as con:
            con.execute("PRAGMA journal_mode=WAL")
            con.executescript(_SCHEMA)

    def _connect(self) -> sqlite3.Connection:
        con = sqlite3.connect(self.db_path, timeout=30, isolation_level=None)
        con.row_factory = sqlite3.Row
        return con

    def _one(self, sql: str, args: tuple = ()) -> sqlite3.Row | None:
        con = self._connect()
        try:
            return con.execute(sql, args).fetchone()
        finally:
            con.close()

    def _exec(self, sql: str, args: tuple = ()) -> int:
        con = self._connect()
        try:
            return con.execute(sql, args).rowcount
        finally:
            con.close()

    @staticmethod
    def new_id() -> str:
        """A fresh job id."""
        return uuid.uuid4().hex

    def job_dir(self, job_id: str) -> Path:
        """The folder of a job."""
        return self.jobs_dir / job_id

    def incoming_dir(self, job_id: str) -> Path:
        """Where an upload is received before it becomes a job."""
        return self.jobs_dir / f"{job_id}.part"

    def add(self, job_id: str, *, filename: str, design_method: str, has_loads: bool) -> Job:
        """Record a queued job whose folder (``job_dir(job_id)``) is complete."""
        self._exec(
            "INSERT INTO jobs (id, status, created, filename, design_method, has_loads) "
            "VALUES (?, 'queued', ?, ?, ?, ?)",
            (job_id, _now(), filename, design_method, int(has_loads)),
        )
        job = self.get(job_id)
        assert job is not None
        return job

    def get(self, job_id: str) -> Job | None:
        """The job, or None when there is no such job."""
        if not valid_job_id(job_id):
            return None
        row = self._one("SELECT * FROM jobs WHERE id = ?", (job_id,))
        return Job._from_row(row) if row else None

    def count(self, status: str) -> int:
        """How many jobs have ``status``."""
        row = self._one("SELECT COUNT(*) AS n FROM jobs WHERE status = ?", (status,))
        return int(row["n"]) if row else 0

    def claim_next(self) -> Job | None:
        """Mark the oldest queued job running and return it (None when none is queued)."""
        row = self._one(
            "UPDATE jobs SET status = 'running', started = ? WHERE id = ("
            "SELECT id FROM jobs WHERE status = 'queued' ORDER BY created, rowid LIMIT 1) "
            "AND status = 'queued' RETURNING *",
            (_now(),),
        )
        return Job._from_row(row) if row else None

    def finish(self, job_id: str, status: str, *, error: str | None = None,
               summary: dict | None = None) -> bool:
        """Record the end of a running job (``done`` or ``failed``); False if it is not running."""
        if status not in ("done", "failed"):
            raise ValueError(f"a job finishes done or failed, not {status!r}")
        n = self._exec(
            "UPDATE jobs SET status = ?, error = ?, summary = ?, finished = ? "
            "WHERE id = ? AND status = 'running'",
            (status, error, json.dumps(summary) if summary is not None else None, _now(),
             job_id),
        )
        return n == 1

    def delete(self, job_id: str) -> bool:
        """Remove the job's record and its folder; False when there was no such job."""
        if not valid_job_id(job_id):
            return False
        n = self._exec("DELETE FROM jobs WHERE id = ?", (job_id,))
        shutil.rmtree(self.job_dir(job_id), ignore_errors=True)
        return n == 1

    def fail_running(self, reason: str) -> int:
        """Fail every job marked running (after a restart); returns how many."""
        return self._exec(
            "UPDATE jobs SET status = 'failed', error = ?, finished = ? WHERE status = 'running'",
            (reason, _now()),
        )

    def remove_orphans(self) -> int:
        """Delete unfinished uploads and job folders without a record; returns how many."""
        removed = 0
        for p in self.jobs_dir.iterdir():
            name = p.name.removesuffix(".part")
            if p.is_dir() and (p.name.endswith(".part") or
                               (valid_job_id(name) and self.get(name) is None)):
                shutil.rmtree(p, ignore_errors=True)
                removed += 1
        return removed


def data_dir_in_use(data_dir: Path) -> bool:
    """True when a running server holds the lock of ``data_dir``."""
    lock = Path(data_dir) / "server.lock"
    if not lock.exists():
        return False
    with lock.open("a") as fh:
        try:
            fcntl.flock(fh, fcntl.LOCK_EX | fcntl.LOCK_NB)
        except BlockingIOError:
            return True
        fcntl.flock(fh, fcntl.LOCK_UN)
    return False


@dataclass
class _Running:
    job_id: str
    proc: subprocess.Popen
    started: float
    log: IO[bytes]


def worker_command() -> list[str]:
    """The command line of a job's worker process (the job folder is appended)."""
    # -P: the server's working folder is not put on sys.path, so a folder that holds packages
    # of its own can never shadow stanchion's modules in the worker.
    return [sys.executable, "-P", "-m", "stanchion.service.worker"]


#: Environment variable telling a worker its CPU-time limit (seconds), a safety net that
#: holds even when the server that should kill it has died.
CPU_LIMIT_ENV = "STANCHION_WORKER_CPU_LIMIT_S"


def _worker_env(timeout_s: float) -> dict[str, str]:
    """The server's environment as it is, plus the worker's CPU-time limit."""
    env = dict(os.environ)
    env[CPU_LIMIT_ENV] = str(int(timeout_s) + 30)
    return env


class JobRunner:
    """Runs queued jobs in worker processes, at most ``max_workers`` at a time.

    Args:
        store: the job store.
        max_workers: worker processes at the same time.
        timeout_s: a worker running longer is killed and its job failed.
        command: worker command line without the job folder (tests pass a stand-in).
        poll_s: how often the dispatcher looks at its processes, seconds.
    """

    def __init__(self, store: JobStore, *, max_workers: int = 1, timeout_s: float = 600.0,
                 command: list[str] | None = None, poll_s: float = 0.05) -> None:
        self.store = store
        self.max_workers = max_workers
        self.timeout_s = timeout_s
        self.command = list(command) if command else worker_command()
        self.poll_s = poll_s
        self._running: dict[str, _Running] = {}
        self._lock = threading.Lock()
        self._wake = threading.Event()
        self._stop = threading.Event()
        self._thread: threading.Thread | None = None
        self._lockfile: IO[str] | None = None

    # -- life cycle -------------------------------------------------------------------------

    def start(self) -> dict[str, int]:
        """Take the data folder, recover from an earlier server, start dispatching.

        Returns:
            ``{"interrupted": n, "queued": m, "orphans": k}`` found on start.

        Raises:
            RuntimeError: another server is using the same data folder.
        """
        self._lockfile = open(self.store.data_dir / "server.lock", "w")  # noqa: SIM115
        try:
            fcntl.flock(self._lockfile, fcntl.LOCK_EX | fcntl.LOCK_NB)
        except BlockingIOError:
            self._lockfile.close()
            self._lockfile = None
            raise RuntimeError(
                f"another stanchion server is using {self.store.data_dir}"
            ) from None
        found = {
            "interrupted": self.store.fail_running(INTERRUPTED_BY_RESTART),
            "queued": self.store.count("queued"),
            "orphans": self.store.remove_orphans(),
        }
        if found["interrupted"] or found["queued"]:
            log.warning("on start: %(interrupted)d interrupted job(s) failed, "
                        "%(queued)d queued job(s) to run", found)
        self._stop.clear()
        self._thread = threading.Thread(target=self._loop, name="stanchion-jobs", daemon=True)
        self._thread.start()
        return found

    def stop(self, timeout: float = 10.0) -> None:
        """Stop dispatching; kill running workers and fail their jobs (shutdown)."""
        self._stop.set()
        self._wake.set()
        if self._thread is not None:
            self._thread.join(timeout)
            self._thread = None
        with self._lock:
            for job_id in list(self._running):
                self._kill(job_id)
                self.store.finish(job_id, "failed", error=INTERRUPTED_BY_SHUTDOWN)
        if self._lockfile is not None:
            self._lockfile.close()
            self._lockfile = None

    def wake(self) -> None:
        """A job was queued: look for work now."""
        self._wake.set()

    def running(self) -> int:
        """Worker processes alive now."""
        with self._lock:
            return len(self._running)

    def delete(self, job_id: str) -> bool:
        """Stop the job's worker if it runs, then remove the job; False if there is none."""
        with self._lock:
            if job_id in self._running:
                self._kill(job_id)
            return self.store.delete(job_id)

    # -- dispatcher -------------------------------------------------------------------------

    def _loop(self) -> None:
        while not self._stop.is_set():
            try:
                self._reap()
                self._fill()
            except Exception:  # keep dispatching whatever one job did
                log.exception("job dispatcher error")
            self._wake.wait(self.poll_s)
            self._wake.clear()

    def _fill(self) -> None:
        with self._lock:
            while len(self._running) < self.max_workers and not self._stop.is_set():
                job = self.store.claim_next()
                if job is None:
                    return
                self._spawn(job)

    def _spawn(self, job: Job) -> None:
        job_dir = self.store.job_dir(job.id)
        try:
            logf = open(job_dir / LOG_FILE, "wb")  # noqa: SIM115
            proc = subprocess.Popen(
                [*self.command, str(job_dir)], stdin=subprocess.DEVNULL,
                stdout=logf, stderr=subprocess.STDOUT, env=_worker_env(self.timeout_s),
                cwd=job_dir, start_new_session=True,
            )
        except OSError as exc:
            log.error("cannot start the worker of job %s: %s", job.id, exc)
            self.store.finish(job.id, "failed", error="the job could not be started")
            return
        log.info("job %s started (pid %d)", job.id, proc.pid)
        self._running[job.id] = _Running(job.id, proc, time.monotonic(), logf)

    def _reap(self) -> None:
        with self._lock:
            now = time.monotonic()
            for job_id, r in list(self._running.items()):
                code = r.proc.poll()
                if code is None and now - r.started > self.timeout_s:
                    self._kill(job_id)
                    self.store.finish(job_id, "failed", error=(
                        f"stopped after {self.timeout_s:g} s, the time limit for a job "
                        "(STANCHION_JOB_TIMEOUT_S)"))
                    log.warning("job %s timed out", job_id)
                elif code is not None:
                    del self._running[job_id]
                    r.log.close()
                    self._record(job_id, code)

    def _record(self, job_id: str, code: int) -> None:
        """Record what a finished worker left in ``result.json``."""
        try:
            result = json.loads((self.store.job_dir(job_id) / RESULT_FILE).read_text("utf-8"))
            status = result["status"]
        except (OSError, ValueError, KeyError, TypeError):
            result, status = None, None
        if status == "done":
            self.store.finish(job_id, "done", summary=result.get("summary"))
        elif status == "failed":
            self.store.finish(job_id, "failed", error=str(result.get("error") or "failed"))
        else:
            how = f"exited with code {code}"
            if code < 0:
                try:
                    how = f"was killed by {signal.Signals(-code).name}"
                except ValueError:
                    how = f"was killed by signal {-code}"
            self.store.finish(job_id, "failed", error=(
                f"the model could not be processed: the worker process {how}"))
        log.info("job %s finished (exit %d)", job_id, code)

    def _kill(self, job_id: str) -> None:
        """Kill a running worker and its process group (caller holds the lock)."""
        r = self._running.pop(job_id)
        try:
            os.killpg(r.proc.pid, signal.SIGKILL)
        except (ProcessLookupError, PermissionError):
            pass
        try:
            r.proc.wait(timeout=10)
        except subprocess.TimeoutExpired:
            log.error("worker %d of job %s did not end after SIGKILL", r.proc.pid, job_id)
        r.log.close()
