"""Write the shipped JSON Schemas from the pydantic models; never edit those files by hand.

    .venv/bin/python tools/generate_schemas.py           # (re)write the files
    .venv/bin/python tools/generate_schemas.py --check   # exit 1 when a shipped file differs

``service/schemas/report.schema.json`` is :class:`stanchion.service.report_model.Report`'s
validation schema and ``service/schemas/members-request.schema.json``
:class:`stanchion.service.request.MembersRequest`'s (the members file and ``POST /v1/checks``
body, with every number's bounds, docs/design.md §2), each with a ``$schema`` (JSON Schema
draft 2020-12) and an ``$id`` in front.
The output is deterministic (keys sorted, two-space indents, ASCII, one final newline), so a
test can compare the shipped file with :func:`render` byte for byte.
"""

from __future__ import annotations

import argparse
import json
import sys
from collections.abc import Sequence
from pathlib import Path
from typing import Any

from pydantic import BaseModel

from stanchion.service.report_model import Report
from stanchion.service.request import MembersRequest

ROOT = Path(__file__).resolve().parents[1]
SCHEMAS_DIR = ROOT / "service" / "schemas"
DRAFT = "https://json-schema.org/draft/2020-12/schema"

#: Shipped schema files: file name -> (model, $id).
SCHEMAS: dict[str, tuple[type[BaseModel], str]] = {
    "report.schema.json": (Report, "stanchion/report.schema.json"),
    "members-request.schema.json": (MembersRequest, "stanchion/members-request.schema.json"),
}


def schema_document(model: type[BaseModel], schema_id: str) -> dict[str, Any]:
    """The model's JSON Schema as a standalone document (``$schema`` and ``$id`` added)."""
    return {"$schema": DRAFT, "$id": schema_id, **model.model_json_schema(mode="validation")}


def render() -> dict[Path, str]:
    """The text of every shipped schema file, by path."""
    return {
        SCHEMAS_DIR / name: json.dumps(schema_document(model, schema_id), indent=2,
                                       sort_keys=True, ensure_ascii=True) + "\n"
        for name, (model, schema_id) in SCHEMAS.items()
    }


def main(argv: Sequence[str] | None = None) -> int:
    """Write the schema files, or with ``--check`` report the ones that differ (exit 1)."""
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--check", action="store_true",
                        help="write nothing; exit 1 when a shipped file is not the generated one")
    args = parser.parse_args(argv)
    stale = []
    for path, text in render().items():
        current = path.read_text(encoding="utf-8") if path.is_file() else None
        if current == text:
            continue
        stale.append(path)
        if not args.check:
            path.write_text(text, encoding="utf-8")
    for path in stale:
        verb = "differs from the models" if args.check else "written"
        print(f"{path.relative_to(ROOT)}: {verb}")
    return 1 if args.check and stale else 0


if __name__ == "__main__":
    sys.exit(main())
