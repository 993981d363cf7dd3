"""Progress lines on stderr for long model checks (reading, checking, writing phases).

Plain text, one line per phase (``stanchion: reading model.ifc (48.2 MB) ... 6.1 s``); on a
terminal the writing phase also shows a running count.  Small jobs print nothing: a phase is
shown only once the model is big enough to make someone wait (:data:`MIN_BYTES` for reading,
:data:`MIN_ITEMS` columns for the later phases).
"""

from __future__ import annotations

import sys
import time
from collections.abc import Iterator
from contextlib import contextmanager
from typing import TextIO

MIN_BYTES = 2_000_000
MIN_ITEMS = 300


class Progress:
    """Phase reporter; :meth:`phase` is a context manager timing one phase."""

    def __init__(self, stream: TextIO | None = None, *, min_bytes: int = MIN_BYTES,
                 min_items: int = MIN_ITEMS) -> None:
        self.stream = stream if stream is not None else sys.stderr
        self.min_bytes = min_bytes
        self.min_items = min_items
        self.active = False
        self._tty = bool(getattr(self.stream, "isatty", lambda: False)())
        self._label: str | None = None

    def consider(self, *, size: int | None = None, items: int | None = None) -> bool:
        """Turn reporting on once the job is known to be large; returns whether it is on."""
        if (size is not None and size >= self.min_bytes) or (
                items is not None and items >= self.min_items):
            self.active = True
        return self.active

    def _print(self, text: str, end: str = "\n") -> None:
        print(text, end=end, file=self.stream, flush=True)

    @contextmanager
    def phase(self, label: str) -> Iterator[None]:
        """Print ``label``, run the block, print the elapsed time (when active)."""
        shown = self.active
        self._label = label
        if shown:
            self._print(f"stanchion: {label} ...", end="")
        t0 = time.perf_counter()
        try:
            yield
        finally:
            self._label = None
            if shown:
                elapsed = time.perf_counter() - t0
                if self._tty:
                    self._print(f"\rstanchion: {label} ... {elapsed:.1f} s\033[K")
                else:
                    self._print(f" {elapsed:.1f} s")

    def count(self, done: int, total: int) -> None:
        """A running count inside the current phase (terminals only)."""
        if self.active and self._tty and self._label:
            self._print(f"\rstanchion: {self._label} ... {done:,} / {total:,}\033[K", end="")
