"""Check every IFC model in a folder and print what the reader made of each, and in total.

Usage::

    .venv/bin/python tools/corpus.py FOLDER [--lenient] [--force-unit UNIT] [--markdown]

Per model: columns read, of which steel (by material, docs/design.md §5), checked (pass or
fail), capacity only (not checked for want of loads alone, available strength computed),
skipped (not steel), not checked, the not-checked reasons by their first clause, and the
seconds the check took.  A model the tool refuses (exit 2 of ``stanchion check``) gets its
one-line message instead.  Nothing is written next to the models; they are only read.
"""

from __future__ import annotations

import argparse
import sys
import time
from collections import Counter
from dataclasses import dataclass, field
from pathlib import Path

MODEL_SUFFIXES = (".ifc", ".ifczip", ".ifcxml")


@dataclass
class Row:
    """One model's counts (or its refusal)."""

    name: str
    columns: int = 0
    steel: int = 0
    checked: int = 0
    capacity_only: int = 0
    skipped: int = 0
    not_checked: int = 0
    seconds: float = 0.0
    reasons: Counter[str] = field(default_factory=Counter)
    refused: str | None = None


def first_clause(reason: str) -> str:
    """The first reason of a member, without its parenthesised detail."""
    head = reason.split("; ")[0]
    return head.split(" (")[0].split(": check")[0].strip()


def check_one(path: Path, lenient: bool, force_unit: str | None) -> Row:
    """Check one model in memory (no outputs) and count its members."""
    from stanchion.service.errors import InputError
    from stanchion.service.pipeline import CheckOptions, check

    row = Row(path.name)
    start = time.perf_counter()
    try:
        run = check(path, CheckOptions(lenient=lenient, force_unit=force_unit,
                                       checked_at=None))
    except InputError as exc:
        row.refused = str(exc)
        row.seconds = time.perf_counter() - start
        return row
    row.seconds = time.perf_counter() - start
    material = run.members.material
    for i, member in enumerate(run.report["members"]):
        row.columns += 1
        if material is not None and str(material[i]) == "steel":
            row.steel += 1
        status = member["status"]
        if status in ("pass", "fail"):
            row.checked += 1
        elif status == "skipped":
            row.skipped += 1
        else:
            row.not_checked += 1
            if member.get("available_strength") is not None:
                row.capacity_only += 1
            row.reasons[first_clause(member.get("reason") or "")] += 1
    return row


HEADER = ("model", "columns", "steel", "checked", "capacity only", "skipped", "not checked",
          "s", "not checked by reason / refusal")


def _cells(row: Row) -> list[str]:
    why = (f"refused: {row.refused}" if row.refused else
           ", ".join(f"{n} {k}" for k, n in row.reasons.most_common()))
    return [row.name, str(row.columns), str(row.steel), str(row.checked),
            str(row.capacity_only), str(row.skipped), str(row.not_checked),
            f"{row.seconds:.2f}", why]


def total(rows: list[Row]) -> Row:
    """The sum of every row (refusals counted in the reasons)."""
    out = Row(f"total ({len(rows)} models)")
    for r in rows:
        for name in ("columns", "steel", "checked", "capacity_only", "skipped", "not_checked",
                     "seconds"):
            setattr(out, name, getattr(out, name) + getattr(r, name))
        out.reasons.update(r.reasons)
        if r.refused:
            out.reasons["model refused"] += 1
    return out


def render(rows: list[Row], markdown: bool) -> str:
    """The table, as Markdown or as aligned text."""
    table = [list(HEADER)] + [_cells(r) for r in rows] + [_cells(total(rows))]
    if markdown:
        lines = ["| " + " | ".join(table[0]) + " |",
                 "|" + "---|" * len(HEADER)]
        lines += ["| " + " | ".join(c.replace("|", "/") for c in r) + " |" for r in table[1:]]
        return "\n".join(lines)
    widths = [max(len(r[i]) for r in table) for i in range(len(HEADER) - 1)]
    return "\n".join("  ".join(c.ljust(w) for c, w in zip(r, widths, strict=False)) + "  " + r[-1]
                     for r in table)


def main(argv: list[str] | None = None) -> int:
    """Run the corpus check; exit 2 when the folder holds no model."""
    parser = argparse.ArgumentParser(description=__doc__.split("\n\n")[0])
    parser.add_argument("folder", type=Path)
    parser.add_argument("--lenient", action="store_true", help="read damaged models anyway")
    parser.add_argument("--force-unit", help="force unit of models that declare none")
    parser.add_argument("--markdown", action="store_true", help="print a Markdown table")
    args = parser.parse_args(argv)
    paths = sorted(p for p in args.folder.iterdir() if p.suffix.lower() in MODEL_SUFFIXES)
    if not paths:
        print(f"corpus: no IFC model in {args.folder}", file=sys.stderr)
        return 2
    rows = [check_one(p, args.lenient, args.force_unit) for p in paths]
    print(render(rows, args.markdown))
    return 0


if __name__ == "__main__":
    sys.exit(main())
