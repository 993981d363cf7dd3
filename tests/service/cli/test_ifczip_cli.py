"""``stanchion check`` on an ``.ifczip`` beyond the model size limit: exit 2, one line.

Issue 13 measured a 1 MB ``.ifczip`` expanding to 1.07 GB; the limit is
``STANCHION_MAX_MODEL_MB`` (docs/design.md §4).
"""

from __future__ import annotations

import tempfile
import zipfile
from pathlib import Path

import ifcopenshell
import pytest

from stanchion.service.cli import main


def test_zip_bomb_is_refused_in_one_line_and_nothing_is_written(
        tmp_path: Path, monkeypatch: pytest.MonkeyPatch, capsys: pytest.CaptureFixture[str]
) -> None:
    scratch = tmp_path / "scratch"
    scratch.mkdir()
    monkeypatch.setattr(tempfile, "tempdir", str(scratch))
    monkeypatch.setenv("STANCHION_MAX_MODEL_MB", "1")
    model = ifcopenshell.file(schema="IFC4")
    model.createIfcProject(ifcopenshell.guid.new())
    model.write(str(tmp_path / "m.ifc"))
    # padded to 2 MiB by a STEP comment: twice the limit, a few KB zipped
    data = (tmp_path / "m.ifc").read_bytes().replace(
        b"ENDSEC;", b"/*" + b" " * (2 << 20) + b"*/ENDSEC;", 1)
    path = tmp_path / "bomb.ifczip"
    with zipfile.ZipFile(path, "w", compression=zipfile.ZIP_DEFLATED) as zf:
        zf.writestr("m.ifc", data)
    report = tmp_path / "out" / "r.json"
    assert main(["check", str(path), "--report", str(report), "--quiet"]) == 2
    err = capsys.readouterr().err
    assert err == (f"stanchion: cannot read {path}: the model expands beyond 1 MiB "
                   "(the limit, STANCHION_MAX_MODEL_MB)\n")
    assert not report.exists() and list(scratch.iterdir()) == []
