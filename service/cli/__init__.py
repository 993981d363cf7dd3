"""The ``stanchion`` command line (docs/design.md §4).  Thin: parse, call the pipeline, format.

Each verb lives in its own module of this package (``check``, ``suggest``, ``serve``,
``demo``) exposing ``add_parser(subparsers)``
that registers the verb with ``func=`` set.  Exit codes: 0 every member passes; 1 any member
fails or is not checked; 2 unusable input (one line on stderr, nothing written).
"""

from __future__ import annotations

import argparse
import importlib
import sys
from collections.abc import Sequence

from stanchion.service.errors import EXIT_BAD_INPUT, InputError

#: The verbs, one module each in this package; each exposes ``add_parser(subparsers)``.
VERBS = ("check", "suggest", "serve", "demo")


def build_parser() -> argparse.ArgumentParser:
    """The argument parser with every verb.

    A verb module that fails to import raises: a verb never disappears silently.
    """
    p = argparse.ArgumentParser(
        prog="stanchion",
        description="Axial compression checks of steel columns, AISC 360-22 Chapter E "
        "with ASCE 7-22 load combinations.",
    )
    sub = p.add_subparsers(dest="command", required=True)
    for name in VERBS:
        importlib.import_module(f"{__name__}.{name}").add_parser(sub)
    return p


def main(argv: Sequence[str] | None = None) -> int:
    """Run one verb and return its exit code."""
    args = build_parser().parse_args(argv)
    try:
        return int(args.func(args))
    except InputError as exc:
        print(f"stanchion: {exc}", file=sys.stderr)
        return EXIT_BAD_INPUT
    except KeyboardInterrupt:
        print("stanchion: interrupted", file=sys.stderr)
        return 130


def run() -> None:  # pragma: no cover - console script wrapper
    """Console-script entry: exit with main()'s code."""
    sys.exit(main())


if __name__ == "__main__":  # pragma: no cover
    run()
