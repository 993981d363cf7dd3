"""Opening IFC models: one clear line for every file that cannot be used.

Only the schemas the reader understands are accepted: IFC2X3, IFC4 and IFC4X3 (any addendum
ifcopenshell reports, e.g. ``IFC4X3_ADD2``).  Everything else -- a missing file, a directory,
a text file that is not STEP, a STEP file of another schema -- raises :class:`ModelReadError`
whose message is ready to print after ``stanchion:``.
"""

from __future__ import annotations

import json
import os
import re
import tempfile
import zipfile
from collections.abc import Callable, Mapping
from pathlib import Path

import ifcopenshell
import ifcopenshell.ifcopenshell_wrapper as wrapper

from stanchion.ifc_bridge.damage import MAX_LOCATED, Damage, statement_at
from stanchion.ifc_bridge.errors import ModelReadError

#: Schema identifiers accepted by :func:`open_model` (prefix match on ``file.schema``).
SUPPORTED_SCHEMAS: tuple[str, ...] = ("IFC2X3", "IFC4", "IFC4X3")

#: File endings ifcopenshell can open (STEP, zipped STEP, IFC-XML).
_SUFFIXES = (".ifc", ".ifczip", ".ifcxml")

#: Environment variable: the largest model an ``.ifczip`` may expand to, MiB.
MAX_MODEL_MB_ENV = "STANCHION_MAX_MODEL_MB"
#: Its default, MiB: five times the server's default upload limit of 200 MiB
#: (docs/design.md §6).  STEP text compresses about 5-10 times (common practice, no source),
#: so a real model fits; a zip bomb (the issue measured 1 MB -> 1.07 GB) does not.
DEFAULT_MAX_MODEL_MB = 1000.0
#: Bytes read from a zip member at a time while it is extracted.
_CHUNK = 1 << 20
_MIB = 1024 * 1024
#: Bytes read from the end of a STEP file to find its trailer (comments and blank lines
#: after ``ENDSEC;`` fit easily; common practice, no source).
_TAIL_BYTES = 64 * 1024
#: The STEP trailer (ISO 10303-21): the DATA section's ``ENDSEC;`` and then this keyword.
_END_KEYWORD = b"END-ISO-10303-21;"
_ENDSEC = b"ENDSEC;"
#: Levels of the parser's log that are not errors (ifcopenshell's logger; a warning such as
#: "Expected 11 attribute values, found 10" is common in real exports and read as written).
_NOT_ERRORS = frozenset({"debug", "perf", "info", "notice", "warning"})
#: Where the parser's messages name the byte offset of the problem.
_OFFSET = re.compile(r"\s*at offset (\d+)")
#: The parser's process-wide log (untyped in the wrapper): JSON lines, drained when read.
_get_log: Callable[[], object] = wrapper.get_log
_set_log_format_json: Callable[[], object] = wrapper.set_log_format_json


def supported_schema(schema: str) -> bool:
    """True when ``schema`` (``file.schema`` / ``schema_identifier``) is one we read."""
    ident = (schema or "").upper()
    if ident.startswith("IFC4X3"):
        return True
    return ident in ("IFC2X3", "IFC4")


def _unsupported(schema: str) -> str:
    return f"unsupported schema {schema} (expected {', '.join(SUPPORTED_SCHEMAS)})"


def _first_line(path: Path) -> str:
    """First 64 bytes of the file as text (for the "is this STEP at all" test)."""
    with path.open("rb") as fh:
        return fh.read(64).decode("latin-1", errors="replace")


def max_model_bytes(environ: Mapping[str, str] | None = None) -> int:
    """The largest size an ``.ifczip`` may expand to, bytes (``STANCHION_MAX_MODEL_MB``).

    Args:
        environ: the environment to read (default ``os.environ``).

    Raises:
        ModelReadError: the variable is not a positive, finite number of MiB.
    """
    env = os.environ if environ is None else environ
    text = env.get(MAX_MODEL_MB_ENV, "").strip()
    if not text:
        return int(DEFAULT_MAX_MODEL_MB * _MIB)
    try:
        value = float(text)
    except ValueError:
        value = float("nan")
    if not (0 < value < float("inf")):
        raise ModelReadError(f"{MAX_MODEL_MB_ENV}={text!r}: expected a positive number of MiB")
    return int(value * _MIB)


def _zip_member(zf: zipfile.ZipFile, label: str) -> zipfile.ZipInfo:
    """The one IFC file (``.ifc`` or ``.ifcxml``) of an archive; other files are ignored."""
    members = [i for i in zf.infolist()
               if not i.is_dir() and Path(i.filename).suffix.lower() in (".ifc", ".ifcxml")]
    if not members:
        raise ModelReadError(f"cannot read {label}: the archive holds no .ifc or .ifcxml file")
    if len(members) > 1:
        names = ", ".join(i.filename for i in members[:3]) + (", ..." if len(members) > 3
                                                              else "")
        raise ModelReadError(f"cannot read {label}: the archive holds {len(members)} IFC "
                             f"files ({names}); expected one")
    return members[0]


def _extract(path: Path, label: str, folder: Path, limit: int) -> Path:
    """Stream the archive's one IFC file into ``folder``, stopping at ``limit`` bytes."""
    too_big = (f"cannot read {label}: the model expands beyond {limit / _MIB:g} MiB "
               f"(the limit, {MAX_MODEL_MB_ENV})")
    try:
        with zipfile.ZipFile(path) as zf:
            info = _zip_member(zf, label)
            if info.file_size > limit:
                raise ModelReadError(too_big)
            target = folder / ("model" + Path(info.filename).suffix.lower())
            written = 0
            with zf.open(info) as src, target.open("wb") as dst:
                while chunk := src.read(_CHUNK):
                    written += len(chunk)
                    if written > limit:
                        raise ModelReadError(too_big)
                    dst.write(chunk)
            return target
    except (zipfile.BadZipFile, zipfile.LargeZipFile, RuntimeError, NotImplementedError,
            EOFError, ValueError) as exc:  # damaged, encrypted, unsupported compression
        detail = str(exc).strip().splitlines()[0] if str(exc).strip() else type(exc).__name__
        raise ModelReadError(f"cannot read {label}: not a usable zip archive ({detail})"
                             ) from None
    except OSError as exc:
        raise ModelReadError(f"cannot read {label}: {exc.strerror or exc}") from None


def _open_zipped(path: Path, label: str, limit: int, problems: list[Damage] | None
                 ) -> ifcopenshell.file:
    """Open an ``.ifczip``: extract its IFC file into a temporary folder, open it, remove it.

    The folder is made in :func:`tempfile.gettempdir` (``TMPDIR``; a job worker's is inside
    its job folder) and removed on every way out of here: a read, an error, the size limit,
    or an exception raised by a signal handler (SIGINT, SIGTERM).
    """
    with tempfile.TemporaryDirectory(prefix="stanchion-unzip-") as folder:
        return _open_file(_extract(path, label, Path(folder), limit), label, problems)


def _line_of(p: Path, position: int) -> int:
    """The 1-based line number of byte ``position`` of file ``p`` (counted in chunks)."""
    newlines = 0
    with p.open("rb") as fh:
        remaining = position
        while remaining > 0 and (chunk := fh.read(min(_CHUNK, remaining))):
            newlines += chunk.count(b"\n")
            remaining -= len(chunk)
    return newlines + 1


def _lines_of(p: Path, positions: list[int]) -> dict[int, int]:
    """The 1-based line numbers of several byte positions of ``p``, in one pass."""
    lines: dict[int, int] = {}
    newlines, done = 0, 0
    with p.open("rb") as fh:
        for position in sorted(set(positions)):
            while done < position and (chunk := fh.read(min(_CHUNK, position - done))):
                newlines += chunk.count(b"\n")
                done += len(chunk)
            lines[position] = newlines + 1
    return lines


def _strip_trailing_comments(text: bytes) -> bytes:
    """``text`` without the whitespace and complete ``/* ... */`` comments at its end."""
    text = text.rstrip()
    while text.endswith(b"*/") and (start := text.rfind(b"/*", 0, len(text) - 2)) >= 0:
        text = text[:start].rstrip()
    return text


def check_trailer(path: str | Path, label: str | None = None) -> None:
    """Refuse a STEP file that does not end with ``ENDSEC;`` and ``END-ISO-10303-21;``.

    A file cut short (a failed upload or copy, ``head``) otherwise opens without complaint
    and is checked as if complete (issue 13).  Only the last :data:`_TAIL_BYTES` bytes are
    read; whitespace and ``/* ... */`` comments around the trailer are allowed.

    Args:
        path: the ``.ifc`` (STEP) file.
        label: the name used in the message (default ``path``).

    Raises:
        ModelReadError: the trailer is missing; the message names the line where the file
            ends (or where ``END-ISO-10303-21;`` stands) and what is missing.
    """
    p = Path(path)
    name = str(path) if label is None else label
    try:
        size = p.stat().st_size
        start = max(0, size - _TAIL_BYTES)
        with p.open("rb") as fh:
            fh.seek(start)
            tail = fh.read()
    except OSError as exc:
        raise ModelReadError(f"cannot read {name}: {exc.strerror or exc}") from None
    end = tail.rfind(_END_KEYWORD)
    if end < 0 or _strip_trailing_comments(tail[end + len(_END_KEYWORD):]):
        last = _line_of(p, len(_strip_trailing_comments(tail)) + start)
        raise ModelReadError(f"cannot read {name}: line {last}: the file ends without "
                             "END-ISO-10303-21; (cut short?)")
    if not _strip_trailing_comments(tail[:end]).endswith(_ENDSEC):
        line = _line_of(p, start + end)
        raise ModelReadError(f"cannot read {name}: line {line}: END-ISO-10303-21; is not "
                             "preceded by ENDSEC; (the DATA section is not closed)")


def _parser_errors() -> list[tuple[int | None, str]]:
    """The errors ifcopenshell's parser logged since the last call (the log is drained).

    Returns:
        ``(byte offset or None, message without "at offset N")`` per error, in log order.
    """
    errors: list[tuple[int | None, str]] = []
    for raw in str(_get_log()).splitlines():
        try:
            entry = json.loads(raw)
            level, message = str(entry.get("level", "")), str(entry.get("message", ""))
        except (ValueError, AttributeError):
            level, message = "error", raw
        if not message.strip() or level.lower() in _NOT_ERRORS:
            continue
        found = _OFFSET.search(message)
        offset = int(found.group(1)) if found else None
        errors.append((offset, _OFFSET.sub("", message).strip()))
    return errors


def _first_error(p: Path, errors: list[tuple[int | None, str]]) -> str | None:
    """``"line N: what"`` for the error earliest in the file (one without an offset last)."""
    if not errors:
        return None
    offset, message = min(errors, key=lambda e: (e[0] is None, e[0] or 0))
    if offset is None:
        return message
    return f"line {_line_of(p, offset)}: {message}"


def _damage(p: Path, errors: list[tuple[int | None, str]]) -> list[Damage]:
    """The parser's errors as :class:`Damage`, earliest in the file first.

    Each located error names its line and the instance written there (and what that
    statement refers to); beyond :data:`MAX_LOCATED` errors the rest are not looked up
    and count as touching every element.
    """
    out: list[Damage] = []
    lines = _lines_of(p, [e[0] for e in errors if e[0] is not None])
    for offset, message in sorted(errors, key=lambda e: (e[0] is None, e[0] or 0)):
        if offset is None:
            out.append(Damage(message, everywhere=True))
            continue
        line = lines[offset]
        text = f"line {line}: {message}"
        if len(out) >= MAX_LOCATED:
            out.append(Damage(text, line, everywhere=True))
            continue
        step_id, refs = statement_at(p, offset)
        out.append(Damage(text, line, step_id, refs, everywhere=step_id is None))
    return out


def _open_file(p: Path, label: str, problems: list[Damage] | None = None
               ) -> ifcopenshell.file:
    """``ifcopenshell.open`` with its errors as one ModelReadError line; then the trailer.

    A file the parser opens is still refused when its log holds an error: an instance it
    skipped (a damaged line, an entity foreign to the schema, an invalid enumeration) or a
    reference to an instance that is not in the file.  Warnings are not refused.  With
    ``problems`` (lenient reading) the missing trailer and the parser's errors are appended
    there instead (each a :class:`Damage`, ``"line N: what"``); a file the parser cannot
    open is still refused.
    """
    _set_log_format_json()
    _parser_errors()  # drop what earlier reads left in the (process-wide) log
    try:
        model = ifcopenshell.open(str(p))
    except Exception as exc:  # ifcopenshell raises several types (Error, SchemaError, ...)
        located = [e for e in _parser_errors() if e[0] is not None]
        if located:
            raise ModelReadError(f"cannot read {label}: {_first_error(p, located)}") from None
        text = str(exc).strip().splitlines()
        detail = text[0] if text else type(exc).__name__
        if "schema" in detail.lower():
            found = re.search(r"schema:?\s*(\S+)", detail, flags=re.IGNORECASE)
            name = found.group(1) if found else "?"
            raise ModelReadError(f"cannot read {label}: {_unsupported(name)}") from None
        raise ModelReadError(f"cannot read {label}: not an IFC file ({detail})") from None
    errors = _parser_errors()
    damage: list[Damage] = []
    if p.suffix.lower() == ".ifc":
        try:
            check_trailer(p, label)
        except ModelReadError as exc:
            cut = str(exc).removeprefix(f"cannot read {label}: ")
            damage.append(Damage(cut, everywhere=True))  # whatever followed is missing
    if errors and problems is None:
        damage.append(Damage(_first_error(p, errors) or ""))
    elif errors:
        damage.extend(_damage(p, errors))
    if damage and problems is None:
        raise ModelReadError(f"cannot read {label}: {damage[0]}")
    if problems is not None:
        problems.extend(damage)
    return model


def open_model(path: str | Path, *, max_expanded_bytes: int | None = None,
               problems: list[Damage] | None = None) -> ifcopenshell.file:
    """Open an IFC model for reading.

    An ``.ifczip`` must hold exactly one ``.ifc`` or ``.ifcxml`` file (other files in it are
    ignored); it is extracted in chunks into a temporary folder that is always removed, and
    refused once it expands beyond ``max_expanded_bytes``.

    Args:
        path: an ``.ifc`` (STEP physical file), ``.ifczip`` or ``.ifcxml`` file.
        max_expanded_bytes: largest size an ``.ifczip`` may expand to (default
            :func:`max_model_bytes`: ``STANCHION_MAX_MODEL_MB`` or 1000 MiB).
        problems: lenient reading (``--lenient``): the damage that is refused by default
            (a missing trailer, the parser's errors) is appended here, earliest first, as
            :class:`~stanchion.ifc_bridge.damage.Damage` (``str()`` gives ``"line N:
            what"``; :func:`~stanchion.ifc_bridge.damage.touched_global_ids` finds the
            elements it touches) and the model is returned as the parser read it.  None
            (the default): refused.

    Returns:
        The opened :class:`ifcopenshell.file`.  It is only read, never modified.

    Raises:
        ModelReadError: the file does not exist, is not readable, is not an IFC file, is an
            archive without exactly one IFC file or expanding beyond the limit, is a STEP
            file without its ``ENDSEC;`` / ``END-ISO-10303-21;`` trailer, or uses a
            schema other than IFC2X3 / IFC4 / IFC4X3; the message reads like
            ``"cannot read model.ifc: not an IFC file"``.
    """
    p = Path(path)
    label = str(path)
    if not p.exists():
        raise ModelReadError(f"cannot read {label}: no such file")
    if p.is_dir():
        raise ModelReadError(f"cannot read {label}: is a directory")
    try:
        head = _first_line(p)
    except OSError as exc:
        raise ModelReadError(f"cannot read {label}: {exc.strerror or exc}") from None
    suffix = p.suffix.lower()
    if suffix not in (".ifczip", ".ifcxml") and not head.lstrip().startswith("ISO-10303-21"):
        raise ModelReadError(f"cannot read {label}: not an IFC file")
    if suffix == ".ifczip":
        limit = max_model_bytes() if max_expanded_bytes is None else max_expanded_bytes
        model = _open_zipped(p, label, limit, problems)
    else:
        model = _open_file(p, label, problems)
    schema = getattr(model, "schema_identifier", None) or model.schema
    if not supported_schema(schema):
        raise ModelReadError(f"cannot read {label}: {_unsupported(schema)}")
    return model
