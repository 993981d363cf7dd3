"""Model jobs: a SQLite job table under the data folder and the worker processes that run them.

Layout of ``STANCHION_DATA_DIR``::

    jobs.sqlite3            one row per job (status, times, error, summary, options)
    server.lock             held by the one server using this folder
    jobs/<id>/              job.json (parameters), the upload, and the worker's outputs
    jobs/<id>.part/         an upload still being received (never a job yet)

Each job runs in its own child process (``python -P -m stanchion.service.jobs.worker JOB_DIR``),
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
import re
import shutil
import sqlite3
import uuid
from dataclasses import dataclass
from datetime import UTC, datetime
from pathlib import Path

log = logging.getLogger("stanchion.jobs")

STATUSES = ("queued", "running", "done", "failed")
INTERRUPTED_BY_RESTART = "interrupted by a server restart"
INTERRUPTED_BY_SHUTDOWN = "interrupted by a server shutdown"
_ID = re.compile(r"^[0-9a-f]{32}$")

#: File names inside a job folder (shared with :mod:`stanchion.service.jobs.worker`).
PARAMS_FILE = "job.json"
RESULT_FILE = "result.json"
REPORT_FILE = "report.json"
MODEL_OUT_FILE = "checked.ifc"
CSV_FILE = "report.csv"
JUNIT_FILE = "junit.xml"
BCF_FILE = "issues.bcf"
HTML_FILE = "report.html"
LOG_FILE = "worker.log"
#: The worker's temporary folder (its ``TMPDIR``: an ``.ifczip`` is extracted there), removed
#: by the server whenever the worker has ended.
SCRATCH_DIR = "tmp"
#: Written by the server when it fails a job whose worker may still be alive (killed at the
#: time limit, interrupted by a restart): a worker finding it writes no result.
STOPPED_FILE = "stopped"

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
    summary TEXT,
    options TEXT
);
CREATE INDEX IF NOT EXISTS jobs_status_created ON jobs (status, created);
"""

#: Columns added after the first release, with their SQL type: a table created before gets
#: them on start (``ALTER TABLE``), its earlier rows hold NULL there.
_ADDED_COLUMNS = {"options": "TEXT"}


def _now() -> str:
    return datetime.now(UTC).isoformat(timespec="milliseconds").replace("+00:00", "Z")


def _add_columns(con: sqlite3.Connection) -> None:
    """Give a job table created by an earlier version the columns added since (NULL)."""
    have = {str(r["name"]) for r in con.execute("PRAGMA table_info(jobs)").fetchall()}
    for name, kind in _ADDED_COLUMNS.items():
        if name not in have:
            try:
                con.execute(f"ALTER TABLE jobs ADD COLUMN {name} {kind}")
            except sqlite3.OperationalError as exc:  # another store added it meanwhile
                if "duplicate column" not in str(exc):
                    raise


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
    options: dict | None = None

    @classmethod
    def _from_row(cls, row: sqlite3.Row) -> Job:
        return cls(
            id=row["id"], status=row["status"], error=row["error"], created=row["created"],
            started=row["started"], finished=row["finished"], filename=row["filename"],
            design_method=row["design_method"], has_loads=bool(row["has_loads"]),
            summary=json.loads(row["summary"]) if row["summary"] else None,
            options=json.loads(row["options"]) if row["options"] else None,
        )

    def public(self) -> dict:
        """The job as ``GET /v1/jobs/{id}`` shows it."""
        return {
            "job_id": self.id, "status": self.status, "error": self.error,
            "created": self.created, "started": self.started, "finished": self.finished,
            "filename": self.filename, "design_method": self.design_method,
            "loads": self.has_loads, "summary": self.summary, "options": self.options,
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
            _add_columns(con)

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

    def add(self, job_id: str, *, filename: str, design_method: str, has_loads: bool,
            options: dict | None = None) -> Job:
        """Record a queued job whose folder (``job_dir(job_id)``) is complete.

        Args:
            job_id: the job's id.
            filename: the uploaded model's file name.
            design_method: LRFD or ASD.
            has_loads: a load table came with the model.
            options: the options the job was started with (``GET /v1/jobs/{id}``).
        """
        self._exec(
            "INSERT INTO jobs (id, status, created, filename, design_method, has_loads, "
            "options) VALUES (?, 'queued', ?, ?, ?, ?, ?)",
            (job_id, _now(), filename, design_method, int(has_loads),
             json.dumps(options) if options is not None else None),
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

    def running_ids(self) -> list[str]:
        """The ids of the jobs marked running."""
        con = self._connect()
        try:
            rows = con.execute("SELECT id FROM jobs WHERE status = 'running'").fetchall()
        finally:
            con.close()
        return [str(r["id"]) for r in rows]

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
