"""The pipeline with keyword arguments, for tests that check one file with a few options."""

from __future__ import annotations

from pathlib import Path
from typing import Any

from stanchion.service.pipeline import CheckOptions, OutputPaths, Progress, check


def check_file(path: Path, *, out_model: Path | None = None, out_report: Path | None = None,
               out_csv: Path | None = None, out_junit: Path | None = None,
               progress: Progress | None = None, **options: Any) -> dict[str, Any]:
    """Check ``path`` with :func:`stanchion.service.pipeline.check`; return the report.

    ``options`` are :class:`CheckOptions` fields; the outputs are named as the command line
    names them (``out_model`` is ``--out``).
    """
    outputs = OutputPaths(model=out_model, report=out_report, csv=out_csv, junit=out_junit)
    return check(Path(path), CheckOptions(**options), outputs, progress).report
