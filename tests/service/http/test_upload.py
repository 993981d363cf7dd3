"""The streaming upload parser behind ``POST /v1/models`` (service/http/upload.py)."""

from __future__ import annotations

import asyncio
import tracemalloc
from pathlib import Path

import pytest

from stanchion.service.http.upload import UploadError, UploadTooLarge, boundary_of, receive_form

B = b"----stanchion-test-boundary"
CHUNK = 64 * 1024


def _head(name: str, filename: str | None = None) -> bytes:
    fn = f'; filename="{filename}"' if filename is not None else ""
    return (b"--" + B + b"\r\nContent-Disposition: form-data; name=\"" + name.encode() + b"\""
            + fn.encode() + b"\r\nContent-Type: application/octet-stream\r\n\r\n")


def _tail() -> bytes:
    return b"\r\n--" + B + b"--\r\n"


class _Source:
    """An async body that yields ``n`` chunks of file data and counts what was read."""

    def __init__(self, n: int, *, head: bytes | None = None, tail: bytes | None = None):
        self.n, self.read = n, 0
        self.head = _head("file", "big.ifc") if head is None else head
        self.tail = _tail() if tail is None else tail

    async def __aiter__(self):
        yield self.head
        block = b"S" * CHUNK
        for _ in range(self.n):
            self.read += 1
            yield block
        yield self.tail


def _run(coro):
    return asyncio.run(coro)


def test_large_file_goes_to_disk_without_being_held_in_memory(tmp_path: Path) -> None:
    src = _Source(480)  # 30 MiB
    tracemalloc.start()
    try:
        parts = _run(receive_form(src.__aiter__(), B, tmp_path, max_bytes=10**9,
                                  file_fields={"file"}, text_fields=set()))
        _, peak = tracemalloc.get_traced_memory()
    finally:
        tracemalloc.stop()
    part = parts["file"]
    assert part.filename == "big.ifc" and part.size == 480 * CHUNK
    assert part.path.stat().st_size == 480 * CHUNK
    assert peak < 2 * 1024 * 1024  # a few chunks at most, never the 30 MiB body


def test_reading_stops_at_the_limit(tmp_path: Path) -> None:
    src = _Source(1000)
    with pytest.raises(UploadTooLarge):
        _run(receive_form(src.__aiter__(), B, tmp_path, max_bytes=10 * CHUNK,
                          file_fields={"file"}, text_fields=set()))
    assert src.read == 10  # head + 10 blocks pass the limit; nothing after that is read


def test_text_fields_and_file_names(tmp_path: Path) -> None:
    body = (_head("file", "C:\\models\\tower.ifc") + b"ISO-10303-21;" + b"\r\n"
            + _head("design_method") + b" asd " + _tail())

    async def chunks():
        for i in range(0, len(body), 7):  # awkward chunk boundaries
            yield body[i:i + 7]

    parts = _run(receive_form(chunks(), B, tmp_path, max_bytes=10_000,
                              file_fields={"file"}, text_fields={"design_method"}))
    assert parts["file"].filename == "tower.ifc"  # folder part of the client's name dropped
    assert parts["file"].path.read_bytes() == b"ISO-10303-21;"
    assert parts["design_method"].value == "asd"


@pytest.mark.parametrize(("body", "message"), [
    (_head("file", "a.ifc") + b"cut off here", "incomplete"),
    (_head("other") + b"x" + _tail(), "unexpected form field"),
    (_head("design_method") + b"x" * 2000 + _tail(), "longer than"),
    (_head("file", "a.ifc") + b"x\r\n" + _head("file", "b.ifc") + b"y" + _tail(),
     "more than once"),
])
def test_malformed_forms(tmp_path: Path, body: bytes, message: str) -> None:
    async def chunks():
        yield body

    with pytest.raises(UploadError, match=message):
        _run(receive_form(chunks(), B, tmp_path, max_bytes=10_000, file_fields={"file"},
                          text_fields={"design_method"}))


def test_boundary_of() -> None:
    assert boundary_of("multipart/form-data; boundary=abc") == b"abc"
    for bad in (None, "application/json", "multipart/form-data"):
        with pytest.raises(UploadError):
            boundary_of(bad)
