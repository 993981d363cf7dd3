"""Receiving a multipart upload straight to disk, chunk by chunk, with a size limit.

The request body is read as it arrives (``request.stream()``) and fed to python-multipart's
streaming parser; file parts are written to files in a folder as their bytes come in, so an
upload is never held in memory and never spooled twice.  The whole body is counted while it
streams and the upload is abandoned as soon as it passes the limit.
"""

from __future__ import annotations

from collections.abc import AsyncIterator
from dataclasses import dataclass, field
from pathlib import Path
from typing import IO

from python_multipart.exceptions import FormParserError
from python_multipart.multipart import MultipartParser, parse_options_header


class UploadTooLarge(Exception):
    """The body passed the size limit (HTTP 413)."""


class UploadError(Exception):
    """The body is not a usable multipart form; ``field`` names the part when known."""

    def __init__(self, msg: str, field: str = "body") -> None:
        super().__init__(msg)
        self.field = field


@dataclass
class Part:
    """One received form part: a file written to ``path`` or a short text ``value``."""

    name: str
    filename: str | None = None
    path: Path | None = None
    value: str | None = None
    size: int = 0


@dataclass
class _State:
    dest: Path
    file_fields: frozenset[str]
    text_fields: frozenset[str]
    max_text: int
    parts: dict[str, Part] = field(default_factory=dict)
    current: Part | None = None
    fh: IO[bytes] | None = None
    text: bytearray = field(default_factory=bytearray)
    header_name: bytearray = field(default_factory=bytearray)
    header_value: bytearray = field(default_factory=bytearray)
    disposition: bytes = b""
    ended: bool = False


def _safe_name(raw: bytes) -> str:
    """The file name a client gave, without any folder part."""
    name = raw.decode("utf-8", errors="replace").replace("\\", "/").rsplit("/", 1)[-1]
    return name.strip()[:255]


def boundary_of(content_type: str | None) -> bytes:
    """The multipart boundary of a Content-Type header.

    Raises:
        UploadError: not ``multipart/form-data`` or no boundary.
    """
    kind, params = parse_options_header(content_type or "")
    if kind.lower() != b"multipart/form-data":
        raise UploadError("the body must be multipart/form-data")
    if not params.get(b"boundary"):
        raise UploadError("the multipart body has no boundary")
    return params[b"boundary"]


async def receive_form(  # noqa: C901 - the parser's callbacks close over one state
    chunks: AsyncIterator[bytes],
    boundary: bytes,
    dest: Path,
    *,
    max_bytes: int,
    file_fields: set[str],
    text_fields: set[str],
    max_text_bytes: int = 1024,
) -> dict[str, Part]:
    """Parse a streamed multipart body, writing file parts into ``dest``.

    Args:
        chunks: the request body as it arrives.
        boundary: the multipart boundary.
        dest: an existing folder; file part ``name`` is written to ``dest / "part-<name>"``.
        max_bytes: largest body accepted (all parts and multipart framing).
        file_fields: part names written to files (whatever their Content-Disposition says).
        text_fields: part names kept as short text (``max_text_bytes`` at most).
        max_text_bytes: largest text part.

    Returns:
        The parts received, by name.

    Raises:
        UploadTooLarge: the body passed ``max_bytes`` (reading stops there).
        UploadError: malformed, incomplete, unknown or repeated parts.
    """
    st = _State(Path(dest), frozenset(file_fields), frozenset(text_fields), max_text_bytes)

    def on_header_field(data: bytes, start: int, end: int) -> None:
        st.header_name += data[start:end]

    def on_header_value(data: bytes, start: int, end: int) -> None:
        st.header_value += data[start:end]

    def on_header_end() -> None:
        if bytes(st.header_name).strip().lower() == b"content-disposition":
            st.disposition = bytes(st.header_value)
        st.header_name.clear()
        st.header_value.clear()

    def on_part_begin() -> None:
        st.disposition = b""
        st.text.clear()

    def on_headers_finished() -> None:
        _, opts = parse_options_header(st.disposition)
        name = opts.get(b"name", b"").decode("utf-8", errors="replace")
        if not name:
            raise UploadError("a form part has no name")
        if name not in st.file_fields and name not in st.text_fields:
            expected = ", ".join(sorted(st.file_fields | st.text_fields))
            raise UploadError(f"unexpected form field (expected {expected})", name)
        if name in st.parts:
            raise UploadError("form field given more than once", name)
        fname = _safe_name(opts[b"filename"]) if b"filename" in opts else None
        st.current = Part(name=name, filename=fname)
        st.parts[name] = st.current
        if name in st.file_fields:
            st.current.path = st.dest / f"part-{name}"
            st.fh = st.current.path.open("wb")

    def on_part_data(data: bytes, start: int, end: int) -> None:
        part = st.current
        assert part is not None
        part.size += end - start
        if st.fh is not None:
            st.fh.write(data[start:end])
        else:
            if part.size > st.max_text:
                raise UploadError(f"longer than {st.max_text} bytes", part.name)
            st.text += data[start:end]

    def on_part_end() -> None:
        if st.fh is not None:
            st.fh.close()
            st.fh = None
        elif st.current is not None:
            st.current.value = bytes(st.text).decode("utf-8", errors="replace").strip()
        st.current = None

    def on_end() -> None:
        st.ended = True

    parser = MultipartParser(boundary, {
        "on_part_begin": on_part_begin, "on_part_data": on_part_data,
        "on_part_end": on_part_end, "on_header_field": on_header_field,
        "on_header_value": on_header_value, "on_header_end": on_header_end,
        "on_headers_finished": on_headers_finished, "on_end": on_end,
    })
    total = 0
    try:
        async for chunk in chunks:
            total += len(chunk)
            if total > max_bytes:
                raise UploadTooLarge(f"the upload is larger than {max_bytes} bytes")
            if chunk:
                parser.write(chunk)
        parser.finalize()
    except FormParserError as exc:
        raise UploadError(f"malformed multipart body ({exc})") from None
    finally:
        if st.fh is not None:
            st.fh.close()
    if not st.ended:
        raise UploadError("the multipart body is incomplete")
    return st.parts
