"""The ``stanchion`` command line (docs/design.md §4).  Thin: parse, call the pipeline, format.

Each verb lives in its own module of this package (``check``, ``suggest``,
``requirements``, ``serve``, ``demo``; the module ``loads_template`` is the verb
``loads-template``) exposing ``add_parser(subparsers)`` that registers the verb with
``func=`` set.  Exit codes: 0 every member passes; 1 any member fails or is not checked; 2
unusable input (one line on stderr, nothing written); 130 when interrupted (SIGINT, Ctrl-C)
and 143 when terminated (SIGTERM), after the temporary files of unfinished writes are
removed (one line on stderr).
"""

from __future__ import annotations

import argparse
import importlib
import signal
import sys
import threading
from collections.abc import Sequence
from types import FrameType

from stanchion.service.errors import EXIT_BAD_INPUT, InputError

#: The verbs, one module each in this package; each exposes ``add_parser(subparsers)``.
VERBS = ("check", "suggest", "requirements", "serve", "demo", "loads_template")
#: Exit codes when interrupted (SIGINT) and terminated (SIGTERM): 128 + the signal number,
#: as a shell reports a process ended by that signal (common practice, no source).
EXIT_INTERRUPTED, EXIT_TERMINATED = 128 + signal.SIGINT, 128 + signal.SIGTERM


class Terminated(BaseException):
    """Raised in the main thread on SIGTERM, so every ``finally`` and cleanup runs.

    A :class:`BaseException` like :class:`KeyboardInterrupt`: ``except Exception`` handlers do
    not swallow it; :func:`stanchion.service.reports.files.write_atomic` removes its
    temporary file and an ``.ifczip``'s extraction folder is removed on the way out.
    """


def _terminate(signum: int, frame: FrameType | None) -> None:
    raise Terminated


def _run(args: argparse.Namespace) -> int:
    """Run the verb with SIGTERM raising :class:`Terminated` (``serve``: uvicorn's own)."""
    if args.command == "serve" or threading.current_thread() is not threading.main_thread():
        return int(args.func(args))  # uvicorn handles SIGTERM itself (graceful shutdown)
    previous = signal.signal(signal.SIGTERM, _terminate)
    try:
        return int(args.func(args))
    finally:
        signal.signal(signal.SIGTERM, previous)


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


def one_line(text: str) -> str:
    """``text`` with every unprintable character (line breaks, control bytes) escaped.

    An error quotes what it found -- a file name, the parser's words about a damaged line --
    and a damaged model's bytes (a vertical tab, a form feed) would otherwise break the one
    line of exit 2 (issue 13 item 6, found by the fuzz test).
    """
    return "".join(c if c.isprintable() else repr(c)[1:-1] for c in text)


def main(argv: Sequence[str] | None = None) -> int:
    """Run one verb and return its exit code."""
    args = build_parser().parse_args(argv)
    try:
        return _run(args)
    except InputError as exc:
        print(f"stanchion: {one_line(str(exc))}", file=sys.stderr)
        return EXIT_BAD_INPUT
    except KeyboardInterrupt:
        print("stanchion: interrupted", file=sys.stderr)
        return EXIT_INTERRUPTED
    except Terminated:
        print("stanchion: terminated", file=sys.stderr)
        return EXIT_TERMINATED


def run() -> None:  # pragma: no cover - console script wrapper
    """Console-script entry: exit with main()'s code."""
    sys.exit(main())


if __name__ == "__main__":  # pragma: no cover
    run()
