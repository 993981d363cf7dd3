"""Running model jobs: worker processes, at most ``max_workers`` at a time, with a time limit.

Each job runs in its own child process (``python -P -m stanchion.service.jobs.worker JOB_DIR``,
started in the job folder with the server's environment as it is), so a model that crashes or
hangs the IFC parser cannot take the server down.  One dispatcher thread starts the processes,
stops one that runs longer than the time limit, and records the outcome the worker left in
``result.json`` in the job table (:mod:`stanchion.service.jobs.store`); only this process writes
the table.
"""

from __future__ import annotations

import fcntl
import json
import logging
import os
import shutil
import signal
import subprocess
import sys
import threading
import time
from dataclasses import dataclass
from typing import IO

from stanchion.service.jobs.store import (
    INTERRUPTED_BY_RESTART,
    INTERRUPTED_BY_SHUTDOWN,
    LOG_FILE,
    RESULT_FILE,
    SCRATCH_DIR,
    STOPPED_FILE,
    Job,
    JobStore,
)

log = logging.getLogger("stanchion.jobs")


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
    return [sys.executable, "-P", "-m", "stanchion.service.jobs.worker"]


#: Environment variable telling a worker its CPU-time limit (seconds), a safety net that
#: holds even when the server that should kill it has died.
CPU_LIMIT_ENV = "STANCHION_WORKER_CPU_LIMIT_S"
#: Environment variable telling a worker its server's process id: a worker whose parent is
#: no longer that process ends at once (docs/design.md §6, "Jobs").
SERVER_PID_ENV = "STANCHION_SERVER_PID"
#: The expanded-size limit of an ``.ifczip`` (``ifc_bridge.model.MAX_MODEL_MB_ENV``).
MAX_MODEL_MB_ENV = "STANCHION_MAX_MODEL_MB"


def _worker_env(timeout_s: float, job_dir: os.PathLike[str] | str,
                max_model_mb: float | None = None) -> dict[str, str]:
    """The server's environment as it is, plus what the worker is told.

    That is its CPU-time limit, the server's pid, ``TMPDIR`` inside the job folder (so the
    server can remove whatever a killed worker left) and the ``.ifczip`` size limit.
    """
    env = dict(os.environ)
    env[CPU_LIMIT_ENV] = str(int(timeout_s) + 30)
    env[SERVER_PID_ENV] = str(os.getpid())
    env["TMPDIR"] = os.path.join(job_dir, SCRATCH_DIR)
    if max_model_mb is not None:
        env[MAX_MODEL_MB_ENV] = repr(float(max_model_mb))
    return env


def clean_job_dir(job_dir: os.PathLike[str] | str) -> None:
    """Remove what an ended worker may have left: its ``TMPDIR`` and ``.*.tmp`` files.

    A worker killed at the time limit (SIGKILL) cannot clean up after itself: an ``.ifczip``
    half extracted, an output half written (``reports.files.write_atomic``).
    """
    folder = os.fspath(job_dir)
    shutil.rmtree(os.path.join(folder, SCRATCH_DIR), ignore_errors=True)
    try:
        names = os.listdir(folder)
    except OSError:
        return
    for name in names:
        if name.startswith(".") and name.endswith(".tmp"):
            try:
                os.unlink(os.path.join(folder, name))
            except OSError:
                pass


def mark_stopped(job_dir: os.PathLike[str] | str) -> None:
    """Tell a worker that may still be alive that its job has been failed (best effort)."""
    try:
        with open(os.path.join(job_dir, STOPPED_FILE), "w", encoding="utf-8") as fh:
            fh.write("stopped\n")
    except OSError:
        pass


class JobRunner:
    """Runs queued jobs in worker processes, at most ``max_workers`` at a time.

    Args:
        store: the job store.
        max_workers: worker processes at the same time.
        timeout_s: a worker running longer is killed and its job failed.
        command: worker command line without the job folder (tests pass a stand-in).
        poll_s: how often the dispatcher looks at its processes, seconds.
        max_model_mb: the ``.ifczip`` expanded-size limit given to workers, MiB (None: the
            worker's environment or default decides).
    """

    def __init__(self, store: JobStore, *, max_workers: int = 1, timeout_s: float = 600.0,
                 command: list[str] | None = None, poll_s: float = 0.05,
                 max_model_mb: float | None = None) -> None:
        self.store = store
        self.max_model_mb = max_model_mb
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
        for job_id in self.store.running_ids():  # an earlier server's, its worker may live on
            mark_stopped(self.store.job_dir(job_id))
            clean_job_dir(self.store.job_dir(job_id))
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
            (job_dir / SCRATCH_DIR).mkdir(exist_ok=True)
            logf = open(job_dir / LOG_FILE, "wb")  # noqa: SIM115
            # Started from the dispatcher thread, which lives as long as the runner: a worker's
            # parent-death signal (worker.py) fires when the thread that started it ends.
            proc = subprocess.Popen(
                [*self.command, str(job_dir)], stdin=subprocess.DEVNULL,
                stdout=logf, stderr=subprocess.STDOUT,
                env=_worker_env(self.timeout_s, job_dir, self.max_model_mb),
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
                    mark_stopped(self.store.job_dir(job_id))
                    self.store.finish(job_id, "failed", error=(
                        f"stopped after {self.timeout_s:g} s, the time limit for a job "
                        "(STANCHION_JOB_TIMEOUT_S)"))
                    log.warning("job %s timed out", job_id)
                elif code is not None:
                    del self._running[job_id]
                    r.log.close()
                    clean_job_dir(self.store.job_dir(job_id))
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
        clean_job_dir(self.store.job_dir(job_id))
