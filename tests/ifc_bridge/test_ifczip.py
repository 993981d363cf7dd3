"""Zipped models (``.ifczip``): one IFC file, a cap on the expanded size, no leftovers.

Issue 13 measured a 1 MB ``.ifczip`` expanding to 1.07 GB in the temporary folder, with what
was extracted left behind when the process was stopped.  Here the extraction goes to a
folder each test owns (``tempfile.tempdir``), so leftovers can be counted.
"""

from __future__ import annotations

import tempfile
import zipfile
from pathlib import Path

import ifcopenshell
import pytest

from stanchion.ifc_bridge.model import (
    DEFAULT_MAX_MODEL_MB,
    MAX_MODEL_MB_ENV,
    ModelReadError,
    max_model_bytes,
    open_model,
)


@pytest.fixture
def scratch(tmp_path: Path, monkeypatch: pytest.MonkeyPatch) -> Path:
    """The temporary folder the extraction must use and clean (empty after every test)."""
    folder = tmp_path / "scratch"
    folder.mkdir()
    monkeypatch.setattr(tempfile, "tempdir", str(folder))
    monkeypatch.delenv(MAX_MODEL_MB_ENV, raising=False)
    return folder


def _step(tmp_path: Path) -> bytes:
    model = ifcopenshell.file(schema="IFC4")
    model.createIfcProject(ifcopenshell.guid.new())
    path = tmp_path / "plain.ifc"
    model.write(str(path))
    return path.read_bytes()


def _zip(path: Path, members: dict[str, bytes]) -> Path:
    with zipfile.ZipFile(path, "w", compression=zipfile.ZIP_DEFLATED) as zf:
        for name, data in members.items():
            zf.writestr(name, data)
    return path


def test_one_ifc_file_opens_and_other_files_are_ignored(tmp_path, scratch) -> None:
    path = _zip(tmp_path / "m.ifczip", {"readme.txt": b"hello", "dir/model.ifc": _step(tmp_path)})
    model = open_model(path)
    assert model.by_type("IfcProject")
    assert list(scratch.iterdir()) == []  # the extracted copy is gone


def test_expanded_size_is_capped_with_one_line_and_nothing_left(tmp_path, scratch) -> None:
    # A STEP file padded to 3 MiB by a comment, zipped to a few KB: a small zip bomb.
    data = _step(tmp_path).replace(b"ENDSEC;", b"/*" + b" " * (3 << 20) + b"*/ENDSEC;", 1)
    path = _zip(tmp_path / "bomb.ifczip", {"model.ifc": data})
    assert path.stat().st_size < 100_000
    with pytest.raises(ModelReadError) as err:
        open_model(path, max_expanded_bytes=1 << 20)
    assert str(err.value) == (f"cannot read {path}: the model expands beyond 1 MiB "
                              f"(the limit, {MAX_MODEL_MB_ENV})")
    assert list(scratch.iterdir()) == []


def test_cap_counts_the_bytes_read_not_the_archive_header(tmp_path, scratch, monkeypatch
                                                           ) -> None:
    # An archive can declare any size: the stream is counted chunk by chunk.  Here the member
    # declares 10 bytes and its stream never ends.
    path = _zip(tmp_path / "m.ifczip", {"model.ifc": b"x" * 10})
    monkeypatch.setattr(zipfile.ZipExtFile, "read", lambda self, n=-1: b"x" * max(n, 1))
    with pytest.raises(ModelReadError, match="expands beyond"):
        open_model(path, max_expanded_bytes=5 << 20)
    assert list(scratch.iterdir()) == []


def test_the_setting_gives_the_cap(tmp_path, scratch, monkeypatch) -> None:
    data = _step(tmp_path)
    path = _zip(tmp_path / "m.ifczip", {"model.ifc": data})
    monkeypatch.setenv(MAX_MODEL_MB_ENV, str(len(data) / 2 / (1 << 20)))
    with pytest.raises(ModelReadError, match=MAX_MODEL_MB_ENV):
        open_model(path)
    monkeypatch.setenv(MAX_MODEL_MB_ENV, "1")
    assert open_model(path).by_type("IfcProject")


def test_setting_values() -> None:
    # 1000 MiB = five times the server's default upload limit (docs/design.md §6).
    assert DEFAULT_MAX_MODEL_MB == 1000
    assert max_model_bytes({}) == 1000 * 1024 * 1024
    assert max_model_bytes({MAX_MODEL_MB_ENV: "2.5"}) == int(2.5 * 1024 * 1024)
    for bad in ("0", "-1", "inf", "nan", "lots"):
        with pytest.raises(ModelReadError, match=f"{MAX_MODEL_MB_ENV}="):
            max_model_bytes({MAX_MODEL_MB_ENV: bad})


@pytest.mark.parametrize(("members", "expected"), [
    ({}, "the archive holds no .ifc or .ifcxml file"),
    ({"notes.txt": b"x"}, "the archive holds no .ifc or .ifcxml file"),
    ({"a.ifc": b"x", "b.IFC": b"y"}, "the archive holds 2 IFC files (a.ifc, b.IFC); expected one"),
])
def test_archives_without_exactly_one_ifc_file_are_refused(tmp_path, scratch, members,
                                                           expected) -> None:
    path = _zip(tmp_path / "m.ifczip", members)
    with pytest.raises(ModelReadError) as err:
        open_model(path)
    assert str(err.value) == f"cannot read {path}: {expected}"
    assert list(scratch.iterdir()) == []


def test_damaged_archive_and_damaged_member_leave_nothing(tmp_path, scratch) -> None:
    junk = tmp_path / "junk.ifczip"
    junk.write_bytes(b"PK\x03\x04 this is not a zip archive")
    with pytest.raises(ModelReadError, match="not a usable zip archive") as err:
        open_model(junk)
    assert "\n" not in str(err.value)
    garbage = _zip(tmp_path / "g.ifczip", {"model.ifc": b"ISO-10303-21;\ngarbage\n"})
    with pytest.raises(ModelReadError, match="not an IFC file"):
        open_model(garbage)
    assert list(scratch.iterdir()) == []
