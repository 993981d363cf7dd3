"""What each route answers besides its success, for OpenAPI.

The error body by status code, and downloads with their real media types.
"""

from __future__ import annotations

from typing import Any

from stanchion.service.report_model import ErrorBody, Report

#: Why each error status is given, as OpenAPI shows it.
_WHY: dict[int, str] = {
    401: "missing or wrong bearer token (only when the server has STANCHION_API_TOKEN)",
    404: "no such job, or no such output of it",
    409: "the job is queued or running, or it failed: its outputs are not there",
    413: "the request body is larger than STANCHION_MAX_UPLOAD_MB",
    415: "the body is not multipart/form-data with a boundary",
    422: "malformed request; details name the fields",
}


def errors(*codes: int, **why: str) -> dict[int | str, dict[str, Any]]:
    """OpenAPI responses for ``codes``, each with the error body.

    Args:
        *codes: the status codes the route gives.
        **why: the text of a code, given as ``_404="..."``, where the usual one does not fit.

    Returns:
        The ``responses`` of a route decorator.
    """
    out: dict[int | str, dict[str, Any]] = {}
    for code in codes:
        out[code] = {"model": ErrorBody, "description": why.get(f"_{code}", _WHY[code])}
    return out


def download(media_type: str, description: str, binary: bool = True) -> dict[int | str, Any]:
    """OpenAPI 200 response of a file download with its media type."""
    schema: dict[str, Any] = {"type": "string", "format": "binary"} if binary else {
        "type": "string"}
    return {200: {"description": description, "content": {media_type: {"schema": schema}}}}


def report_download(description: str) -> dict[int | str, Any]:
    """OpenAPI 200 response of a stored JSON report."""
    return {200: {"description": description, "model": Report,
                  "content": {"application/json": {}}}}
