"""The HTTP error body and the exception handlers that produce it.

Every error is JSON ``{"error": "one line", "details": [{"loc": "members.0.fy", "msg": ...}]}``
(``details`` only where fields are named); no traceback ever reaches a client.
"""

from __future__ import annotations

import logging
from typing import Any

from fastapi import FastAPI, Request
from fastapi.exceptions import RequestValidationError
from fastapi.responses import JSONResponse
from starlette.exceptions import HTTPException

log = logging.getLogger("stanchion.http")


def error_response(status: int, message: str, headers: dict[str, str] | None = None,
                   **extra: Any) -> JSONResponse:
    """An error response: ``{"error": message, **extra}``."""
    return JSONResponse({"error": message, **extra}, status_code=status, headers=headers)


def field_path(parts: tuple[Any, ...] | list[Any]) -> str:
    """``("body", "members", 0, "fy")`` -> ``"members.0.fy"``."""
    parts = list(parts)
    if parts and parts[0] in ("body", "query", "path", "header", "form"):
        parts = parts[1:]
    if parts and parts[-1] == "[key]":  # a mapping key that is not allowed, e.g. a load type
        parts = parts[:-1]
    return ".".join(str(p) for p in parts) or "request"


def invalid_response(errors: list[Any]) -> JSONResponse:
    """422 ``{"error", "details": [{"loc": "members.0.fy", "msg"}]}`` from pydantic errors."""
    details = []
    for err in errors:
        msg = str(err.get("msg", "invalid value")).removeprefix("Value error, ")
        if err.get("type") == "json_invalid":
            ctx = err.get("ctx") or {}
            reason = ctx.get("error") or msg.removeprefix("Invalid JSON: ")
            details.append({"loc": "body", "msg": f"the body is not valid JSON ({reason})"})
            continue
        details.append({"loc": field_path(err.get("loc", ())), "msg": msg})
    first = details[0] if details else {"loc": "request", "msg": "invalid"}
    more = f" (and {len(details) - 1} more)" if len(details) > 1 else ""
    return error_response(422, f"invalid request: {first['loc']}: {first['msg']}{more}",
                          details=details)


class FieldError(HTTPException):
    """An HTTP error about one input field: ``{"error", "details": [{"loc", "msg"}]}``."""

    def __init__(self, status: int, message: str, field: str) -> None:
        """Name the field and the problem."""
        super().__init__(status, f"invalid request: {field}: {message}")
        self.field, self.msg = field, message


async def _validation_error(_: Request, exc: Exception) -> JSONResponse:
    assert isinstance(exc, RequestValidationError)
    return invalid_response(list(exc.errors()))


async def _field_error(_: Request, exc: Exception) -> JSONResponse:
    assert isinstance(exc, FieldError)
    return error_response(exc.status_code, str(exc.detail),
                          details=[{"loc": exc.field, "msg": exc.msg}])


async def _http_error(_: Request, exc: Exception) -> JSONResponse:
    assert isinstance(exc, HTTPException)
    detail = exc.detail if isinstance(exc.detail, str) else "request refused"
    extra: dict[str, Any] = {"details": exc.detail} if isinstance(exc.detail, list) else {}
    return error_response(exc.status_code, detail, headers=getattr(exc, "headers", None),
                          **extra)


async def _internal_error(request: Request, exc: Exception) -> JSONResponse:
    log.error("unhandled error on %s %s", request.method, request.url.path, exc_info=exc)
    return error_response(500, "internal error")


def install_error_handlers(app: FastAPI) -> None:
    """Answer every error with the error body."""
    app.add_exception_handler(RequestValidationError, _validation_error)
    app.add_exception_handler(FieldError, _field_error)
    app.add_exception_handler(HTTPException, _http_error)
    app.add_exception_handler(Exception, _internal_error)
