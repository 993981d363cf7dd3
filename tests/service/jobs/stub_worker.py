"""A stand-in job worker for the job-machinery tests (not a test module; no tests here).

Run as ``python tests/service/jobs/stub_worker.py JOB_DIR``: it runs the real
:func:`stanchion.service.jobs.worker.main` with a stand-in model check whose behaviour is
chosen by the first bytes of the uploaded file, so the tests can exercise every outcome
without IFC parsing:

``CRASH`` abort the process · ``HANG`` sleep for an hour · ``FILL`` leave a file in the
temporary folder and a half-written ``.report.json.*.tmp`` in the job folder, then hang ·
``INPUT`` raise InputError naming the file's server path · ``BOOM`` raise RuntimeError ·
``SLOW<s>`` sleep ``s`` seconds, then succeed · anything else: succeed, echoing the method,
load table and size in the report.  Every run first writes its pid to ``stub.pid`` (and,
for ``FILL``, the temporary file's path to ``stub.tmp``) in the job folder.
"""

from __future__ import annotations

import os
import resource
import sys
import tempfile
import time
from pathlib import Path

from stanchion.service.pipeline import CheckOptions, OutputPaths


def stand_in_check(path: Path, options: CheckOptions, outputs: OutputPaths) -> dict:
    """Behave as the first bytes of the model ask (see the module docstring)."""
    from stanchion.service.errors import InputError

    method, loads_table = options.method, options.loads_table
    out_model, out_csv = outputs.model, outputs.csv
    data = Path(path).read_bytes()
    job_dir = Path(path).parent
    (job_dir / "stub.pid").write_text(str(os.getpid()))
    if data.startswith(b"FILL"):
        fd, scratch = tempfile.mkstemp(prefix="stanchion-unzip-")  # as an .ifczip extraction
        os.write(fd, b"x" * 100_000)
        os.close(fd)
        (job_dir / ".report.json.abc.tmp").write_text("{")  # as write_atomic, half way
        (job_dir / "stub.tmp").write_text(scratch)
        time.sleep(3600)
    if data.startswith(b"CRASH"):
        os.abort()
    if data.startswith(b"HANG"):
        time.sleep(3600)
    if data.startswith(b"INPUT"):
        raise InputError(f"cannot read {path}: not an IFC file")
    if data.startswith(b"BOOM"):
        raise RuntimeError(f"internal detail that must not leak: {path}")
    if data.startswith(b"SLOW"):
        time.sleep(float(data[4:8]))
    report = {
        "schema_version": "1",
        "summary": {"members": 1, "pass": 1, "fail": 0, "not_checked": 0,
                    "skipped": 0, "max_utilization": 0.5},
        "members": [],
        "stand_in": {"method": method, "size": len(data), "pid": os.getpid(),
                     "cpu_limit": resource.getrlimit(resource.RLIMIT_CPU)[0],
                     "loads": loads_table.read_text() if loads_table else None},
    }
    if out_model is not None:
        Path(out_model).write_bytes(data)
    if out_csv is not None:
        Path(out_csv).write_text("id,status\nC1,pass\n")
    return report


if __name__ == "__main__":
    from stanchion.service.jobs.worker import main

    sys.exit(main(sys.argv[1:], check=stand_in_check))
