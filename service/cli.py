"""The ``stanchion`` command line (design.md §4).  Thin: parse, call core, format.

Each verb lives in its own module (``service/cmd_*.py``) exposing ``add_parser(subparsers)``
that registers the verb with ``func=`` set.  Exit codes: 0 every member passes; 1 any member
fails or is not checked; 2 unusable input (one line on stderr, nothing written).
"""

from __future__ import annotations

import argparse
import sys
from collections.abc import Sequence

from stanchion.service.errors import EXIT_BAD_INPUT, InputError

VERBS = ("stanchion.service.cmd_check", "stanchion.service.cmd_serve", "stanchion.service.cmd_demo",
         "stanchion.service.cmd_select")


def build_parser() -> argparse.ArgumentParser:
    """The argument parser with every verb that is installed."""
    import importlib

    p = argparse.ArgumentParser(
        prog="stanchion",
        description="Axial compression checks of steel columns, AISC 360-22 Chapter E "
        "with ASCE 7-22 load combinations.",
    )
    sub = p.add_subparsers(dest="command", required=True)
    for name in VERBS:
        try:
            module = importlib.import_module(name)
        except ModuleNotFoundError as exc:
            if exc.name != name:
                raise
            continue
        module.add_parser(sub)
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
