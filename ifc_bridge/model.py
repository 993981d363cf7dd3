"""Opening IFC models: one clear line for every file that cannot be used.

Only the schemas the reader understands are accepted: IFC2X3, IFC4 and IFC4X3 (any addendum
ifcopenshell reports, e.g. ``IFC4X3_ADD2``).  Everything else -- a missing file, a directory,
a text file that is not STEP, a STEP file of another schema -- raises :class:`ModelReadError`
whose message is ready to print after ``stanchion:``.
"""

from __future__ import annotations

import re
from pathlib import Path

import ifcopenshell

from stanchion.ifc_bridge.errors import ModelReadError

#: Schema identifiers accepted by :func:`open_model` (prefix match on ``file.schema``).
SUPPORTED_SCHEMAS: tuple[str, ...] = ("IFC2X3", "IFC4", "IFC4X3")

#: File endings ifcopenshell can open (STEP, zipped STEP, IFC-XML).
_SUFFIXES = (".ifc", ".ifczip", ".ifcxml")


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


def open_model(path: str | Path) -> ifcopenshell.file:
    """Open an IFC model for reading.

    Args:
        path: an ``.ifc`` (STEP physical file), ``.ifczip`` or ``.ifcxml`` file.

    Returns:
        The opened :class:`ifcopenshell.file`.  It is only read, never modified.

    Raises:
        ModelReadError: the file does not exist, is not readable, is not an IFC file or uses a
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
    try:
        model = ifcopenshell.open(str(p))
    except Exception as exc:  # ifcopenshell raises several types (Error, SchemaError, ...)
        text = str(exc).strip().splitlines()
        detail = text[0] if text else type(exc).__name__
        if "schema" in detail.lower():
            found = re.search(r"schema:?\s*(\S+)", detail, flags=re.IGNORECASE)
            name = found.group(1) if found else "?"
            raise ModelReadError(f"cannot read {label}: {_unsupported(name)}") from None
        raise ModelReadError(f"cannot read {label}: not an IFC file ({detail})") from None
    schema = getattr(model, "schema_identifier", None) or model.schema
    if not supported_schema(schema):
        raise ModelReadError(f"cannot read {label}: {_unsupported(schema)}")
    return model
