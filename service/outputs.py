"""Writing output files safely: a temporary file in the target folder, then a rename."""

from __future__ import annotations

import json
import os
import tempfile
from collections.abc import Callable
from pathlib import Path


def write_atomic(path: Path, write: Callable[[Path], None]) -> None:
    """Call ``write(tmp_path)`` and rename the result onto ``path`` (no partial files)."""
    path = Path(path)
    path.parent.mkdir(parents=True, exist_ok=True)
    fd, tmp = tempfile.mkstemp(prefix=f".{path.name}.", suffix=".tmp", dir=path.parent)
    os.close(fd)
    try:
        write(Path(tmp))
        os.replace(tmp, path)
    except BaseException:
        Path(tmp).unlink(missing_ok=True)
        raise


def write_json(path: Path, data: dict) -> None:
    """Write ``data`` as indented UTF-8 JSON, atomically."""

    def _w(tmp: Path) -> None:
        tmp.write_text(json.dumps(data, indent=2, ensure_ascii=False) + "\n", encoding="utf-8")

    write_atomic(path, _w)
