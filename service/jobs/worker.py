"""The child process that runs one model job: ``python -m stanchion.service.jobs.worker JOB_DIR``.

It reads ``JOB_DIR/job.json`` (written by the server when the upload was complete), checks the
model with the pipeline (:func:`stanchion.service.pipeline.check`), leaves the report, checked
model, CSV, JUnit XML, BCF issues and HTML report in the folder, and writes ``result.json``:
``{"status": "done", "summary": {...}}`` or ``{"status": "failed", "error": "one line"}``.
The server (:mod:`stanchion.service.jobs.runner`) reads that file once the process has
ended; a process that crashes or is killed leaves none and its job is failed by the server.
Tracebacks go to this process's stderr (``worker.log`` in the job folder, server-side
only), never into ``result.json``.
"""

from __future__ import annotations

import argparse
import ctypes
import json
import logging
import os
import resource
import signal
import sys
import traceback
from collections.abc import Callable, Sequence
from pathlib import Path
from typing import Any

from stanchion.ifc_bridge.errors import ModelReadError
from stanchion.service.errors import InputError
from stanchion.service.jobs.runner import CPU_LIMIT_ENV, SERVER_PID_ENV
from stanchion.service.jobs.store import (
    BCF_FILE,
    CSV_FILE,
    HTML_FILE,
    JUNIT_FILE,
    MODEL_OUT_FILE,
    PARAMS_FILE,
    REPORT_FILE,
    RESULT_FILE,
    STOPPED_FILE,
)
from stanchion.service.pipeline import CheckOptions, OutputPaths, check
from stanchion.service.reports.files import write_json

log = logging.getLogger("stanchion.worker")

#: The check a job runs: (model, options, outputs) -> report.  Tests pass a stand-in.
CheckModel = Callable[[Path, CheckOptions, OutputPaths], dict[str, Any]]

#: ``prctl`` option: the signal this process gets when its parent dies (linux/prctl.h).
PR_SET_PDEATHSIG = 1
#: The result of a job the server has already failed: nothing is written.
STOPPED = {"status": "failed", "error": "the job was stopped by the server"}


def _is_input_error(exc: BaseException) -> bool:
    """True when the exception describes a problem of the uploaded input.

    That is :class:`InputError` or the IFC reader's :class:`ModelReadError`, matched by type.
    """
    return isinstance(exc, InputError | ModelReadError)


def pipeline_check(model: Path, options: CheckOptions, outputs: OutputPaths
                   ) -> dict[str, Any]:
    """The pipeline's check of a model; returns its report."""
    return check(model, options, outputs).report


def _public_message(msg: str, job_dir: Path, names: dict[str, str]) -> str:
    """The message with server paths replaced by the names the client uploaded."""
    for stored, original in names.items():
        msg = msg.replace(str(job_dir / stored), original)
    msg = msg.replace(str(job_dir) + os.sep, "").replace(str(job_dir), "")
    first = msg.strip().splitlines()[0] if msg.strip() else "failed"
    return first[:500]


def run_job(job_dir: Path, check: CheckModel | None = None) -> dict[str, Any]:
    """Check the model of one job folder and write ``result.json``.

    Args:
        job_dir: the job folder.
        check: the model check (default :func:`pipeline_check`).

    Returns:
        The result written to ``result.json``.
    """
    job_dir = Path(job_dir)
    if (job_dir / STOPPED_FILE).exists():
        return dict(STOPPED)
    params = json.loads((job_dir / PARAMS_FILE).read_text(encoding="utf-8"))
    model = job_dir / params["model"]
    loads = job_dir / params["loads"] if params.get("loads") else None
    names = {params["model"]: params.get("filename") or params["model"]}
    if params.get("loads"):
        names[params["loads"]] = params.get("loads_filename") or params["loads"]
    takedown = job_dir / params["takedown"] if params.get("takedown") else None
    if params.get("takedown"):
        names[params["takedown"]] = params.get("takedown_filename") or params["takedown"]
    try:
        options = CheckOptions(method=params.get("design_method", "LRFD"), loads_table=loads,
                               takedown=takedown,
                               force_unit=params.get("force_unit"),
                               default_grade=params.get("default_grade"),
                               analysis_members=bool(params.get("analysis_members", False)),
                               source_name=names[params["model"]], front_end="HTTP job")
        outputs = OutputPaths(model=job_dir / MODEL_OUT_FILE, report=job_dir / REPORT_FILE,
                              csv=job_dir / CSV_FILE, junit=job_dir / JUNIT_FILE,
                              bcf=job_dir / BCF_FILE, html=job_dir / HTML_FILE)
        report = (check or pipeline_check)(model, options, outputs)
        if not (job_dir / REPORT_FILE).exists():
            write_json(job_dir / REPORT_FILE, report)
        result = {"status": "done", "summary": report.get("summary")}
    except MemoryError:
        result = {"status": "failed", "error": "the model is too large to process"}
    except Exception as exc:
        if _is_input_error(exc):
            error = _public_message(str(exc), job_dir, names)
        else:
            traceback.print_exc()  # server-side only: worker.log in the job folder
            error = ("model checks are not available on this server"
                     if isinstance(exc, ImportError)
                     else f"the model could not be processed ({type(exc).__name__})")
        result = {"status": "failed", "error": error}
    if (job_dir / STOPPED_FILE).exists():  # failed meanwhile (time limit, server restart)
        return dict(STOPPED)
    write_json(job_dir / RESULT_FILE, result)
    return result


def die_with_server(environ: dict[str, str] | None = None) -> bool:
    """End this worker when its server ends; False when the server is already gone.

    On Linux the kernel sends SIGKILL to this process when its parent (the server's job
    dispatcher thread) ends: ``prctl(PR_SET_PDEATHSIG, SIGKILL)``.  The parent may have died
    before that call: then the parent is no longer the server whose pid the runner passed in
    ``STANCHION_SERVER_PID``, and the caller ends at once.  Elsewhere only that comparison and
    the CPU-time cap remain.

    Args:
        environ: the environment (default ``os.environ``).
    """
    env = os.environ if environ is None else environ
    if sys.platform.startswith("linux"):
        try:
            libc = ctypes.CDLL(None, use_errno=True)
            libc.prctl(PR_SET_PDEATHSIG, int(signal.SIGKILL), 0, 0, 0)
        except (OSError, AttributeError):  # pragma: no cover - no prctl in this libc
            pass
    server = env.get(SERVER_PID_ENV, "")
    return not server.isdigit() or os.getppid() == int(server)


def _limit_self() -> None:
    """Lower this process's priority and cap its CPU time (best effort).

    The server kills a worker at the job time limit; the CPU cap (from
    ``STANCHION_WORKER_CPU_LIMIT_S``) also ends a worker whose server has died.
    """
    try:
        os.nice(5)  # the server process stays responsive while models are checked
    except OSError:  # pragma: no cover
        pass
    limit = os.environ.get(CPU_LIMIT_ENV, "")
    if limit.isdigit():
        try:
            resource.setrlimit(resource.RLIMIT_CPU, (int(limit), int(limit) + 5))
        except (OSError, ValueError):  # pragma: no cover - a hard limit already lower
            pass


def main(argv: Sequence[str] | None = None, check: CheckModel | None = None) -> int:
    """Entry point of the worker process; 0 once ``result.json`` is written."""
    p = argparse.ArgumentParser(prog="python -m stanchion.service.jobs.worker")
    p.add_argument("job_dir", type=Path)
    args = p.parse_args(argv)
    logging.basicConfig(level=logging.INFO, stream=sys.stderr,
                        format="%(asctime)s %(levelname)s %(name)s: %(message)s")
    if not die_with_server():
        print("the server that started this worker has ended", file=sys.stderr)
        return 3
    _limit_self()
    if not (args.job_dir / PARAMS_FILE).is_file():
        print(f"no {PARAMS_FILE} in {args.job_dir}", file=sys.stderr)
        return 2
    result = run_job(args.job_dir, check)
    log.info("job %s: %s", args.job_dir.name, result["status"])
    return 0


if __name__ == "__main__":  # pragma: no cover
    sys.exit(main())
