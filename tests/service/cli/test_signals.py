"""SIGTERM ends a command-line run like SIGINT: temporary files removed, one line, exit 143.

Issue 13 measured killed command-line runs leaving ``.tmp`` files (SIGTERM was not handled).
Each test runs ``stanchion`` in a child process with a hook that pauses it at a chosen point
(after an atomic write's temporary file is written; inside an ``.ifczip`` extraction),
sends SIGTERM there and looks for leftovers.  Every wait is bounded.
"""

from __future__ import annotations

import json
import os
import signal
import subprocess
import sys
import time
import zipfile
from pathlib import Path

import pytest

#: Runs ``stanchion`` (argv[2:]) with a pause at the point argv[1] names; writes READY first.
HOOK = r'''
import sys, time, zipfile
from pathlib import Path

ready, point = Path(sys.argv[1]), sys.argv[2]

def pause():
    ready.write_text("ready")
    time.sleep(60)

if point == "write":
    from stanchion.service.reports import files
    real = files.write_atomic
    def slow(path, write):
        def w(tmp):
            write(tmp)
            pause()
        real(path, w)
    files.write_atomic = slow
elif point == "unzip":
    real_read = zipfile.ZipExtFile.read
    def slow_read(self, n=-1):
        data = real_read(self, n)
        pause()
        return data
    zipfile.ZipExtFile.read = slow_read

from stanchion.service.cli import main
sys.exit(main(sys.argv[3:]))
'''

#: The README's members file example (docs/design.md §2).
MEMBERS = {"design_method": "LRFD", "units": {"force": "kip", "length": "ft", "stress": "ksi"},
           "members": [{"id": "C-12", "section": "W14X48", "fy": 50, "length": 16,
                        "loads": {"D": 95.0, "L": 60.0}}]}


def _terminate_at(tmp_path: Path, point: str, argv: list[str], env: dict[str, str]
                  ) -> subprocess.CompletedProcess[str]:
    ready = tmp_path / "ready"
    proc = subprocess.Popen([sys.executable, "-c", HOOK, str(ready), point, *argv],
                            stdout=subprocess.PIPE, stderr=subprocess.PIPE, text=True, env=env)
    try:
        end = time.monotonic() + 60
        while not ready.exists():
            assert proc.poll() is None, proc.communicate()
            assert time.monotonic() < end, "the hook was never reached"
            time.sleep(0.05)
        proc.send_signal(signal.SIGTERM)
        out, err = proc.communicate(timeout=30)
    finally:
        if proc.poll() is None:
            proc.kill()
            proc.wait()
    return subprocess.CompletedProcess(proc.args, proc.returncode, out, err)


@pytest.fixture
def env(tmp_path: Path) -> dict[str, str]:
    scratch = tmp_path / "scratch"
    scratch.mkdir()
    return {**os.environ, "TMPDIR": str(scratch)}


def test_sigterm_during_a_write_removes_the_temporary_file(tmp_path, env) -> None:
    members = tmp_path / "members.json"
    members.write_text(json.dumps(MEMBERS))
    out = tmp_path / "out"
    done = _terminate_at(tmp_path, "write",
                         ["check", str(members), "--report", str(out / "r.json"), "--quiet"],
                         env)
    # 143 = 128 + SIGTERM, what a shell reports for a terminated process (common practice,
    # no source); service/cli/__init__.py
    assert done.returncode == 143, done.stderr
    assert done.stderr == "stanchion: terminated\n"
    assert sorted(p.name for p in out.iterdir()) == []  # no .r.json.*.tmp, no r.json


def test_sigterm_during_ifczip_extraction_removes_the_folder(tmp_path, env) -> None:
    import ifcopenshell

    model = ifcopenshell.file(schema="IFC4")
    model.createIfcProject(ifcopenshell.guid.new())
    model.write(str(tmp_path / "m.ifc"))
    path = tmp_path / "m.ifczip"
    with zipfile.ZipFile(path, "w", compression=zipfile.ZIP_DEFLATED) as zf:
        zf.write(tmp_path / "m.ifc", "m.ifc")
    done = _terminate_at(tmp_path, "unzip", ["check", str(path), "--quiet"], env)
    assert done.returncode == 143, done.stderr
    assert done.stderr == "stanchion: terminated\n"
    assert list(Path(env["TMPDIR"]).iterdir()) == []


def test_the_previous_sigterm_handler_is_restored(tmp_path) -> None:
    # main() may run inside another program (tests, a caller's process): its handler is only
    # in place while the verb runs.
    from stanchion.service.cli import main

    members = tmp_path / "members.json"
    members.write_text(json.dumps(MEMBERS))
    before = signal.getsignal(signal.SIGTERM)
    assert main(["check", str(members), "--quiet"]) in (0, 1)
    assert signal.getsignal(signal.SIGTERM) is before
