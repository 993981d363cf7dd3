"""``GET /v1/health``: liveness, never behind the token."""

from __future__ import annotations

from fastapi import APIRouter

from stanchion import __version__
from stanchion.service.report_model import Health

router = APIRouter(tags=["service"])


@router.get("/v1/health", response_model=Health, summary="Liveness (never needs a token)")
async def health() -> dict[str, str]:
    """The service answers, and its version."""
    return {"status": "ok", "version": __version__}
