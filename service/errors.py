"""Errors and exit codes shared by the command line and the HTTP service."""

from __future__ import annotations

from pydantic import ValidationError

EXIT_OK, EXIT_FAILURES, EXIT_BAD_INPUT = 0, 1, 2


class InputError(Exception):
    """Unusable input: the message is one line naming the problem (CLI exit code 2).

    Attributes:
        field: the request field at fault, dotted (``combinations.1.name``), when one is.
    """

    def __init__(self, message: str, field: str | None = None) -> None:
        super().__init__(message)
        self.field = field


def validation_message(exc: ValidationError) -> str:
    """One line naming the first problems of a pydantic validation error, with field paths."""
    errors = exc.errors()
    parts = []
    for err in errors[:3]:
        loc = ".".join(str(p) for p in err["loc"]) or "request"
        parts.append(f"{loc}: {err['msg']}")
    more = len(errors) - 3
    return "; ".join(parts) + (f" (and {more} more)" if more > 0 else "")
