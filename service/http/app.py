"""The HTTP service (docs/design.md §6): the FastAPI app factory, all routes under ``/v1``.

Thin: a members request is checked at once (:mod:`.routes.checks`); a model upload becomes a
job checked in a worker process (:mod:`.routes.models`, :mod:`stanchion.service.jobs`).
Errors are JSON ``{"error": "...", ...}`` (:mod:`.errors`); no traceback reaches a client.

Auth: with ``STANCHION_API_TOKEN`` set, every path but ``GET /v1/health`` -- the API docs
(``/docs``, ``/redoc``, ``/openapi.json``) and unknown paths included -- needs
``Authorization: Bearer <token>``, else 401 (:class:`.guard.Guard`, before any body is read).

Run with ``stanchion serve`` (one server process per data folder; it holds a lock on it).
"""

from __future__ import annotations

import gc
from collections.abc import AsyncIterator
from contextlib import asynccontextmanager
from typing import Any

from fastapi import FastAPI
from fastapi.openapi.utils import get_openapi

from stanchion import __version__
from stanchion.engine import catalog
from stanchion.engine.combinations import default_combinations
from stanchion.service.http.errors import install_error_handlers
from stanchion.service.http.guard import Guard
from stanchion.service.http.routes import checks, health, jobs, models, sections
from stanchion.service.http.settings import Settings
from stanchion.service.jobs.runner import JobRunner
from stanchion.service.jobs.store import JobStore
from stanchion.service.request import MembersRequest

API_VERSION = __version__

#: Allocations between young-generation garbage collections in the server (Python's default
#: is 700): a members request allocates a few thousand short-lived objects, freed by
#: reference counting, so collecting every 700 mostly traverses live request data.
GC_YOUNG_THRESHOLD = 20_000


def create_app(settings: Settings | None = None, *,
               worker_command: list[str] | None = None) -> FastAPI:
    """Build the FastAPI app.

    Args:
        settings: service settings (default: read from the environment now).
        worker_command: command line of the job worker without the job folder (default
            :func:`stanchion.service.jobs.runner.worker_command`); tests pass a stand-in.

    Returns:
        The app; its lifespan opens the job store and starts the job runner.
    """
    settings = settings if settings is not None else Settings.from_env()

    @asynccontextmanager
    async def lifespan(app: FastAPI) -> AsyncIterator[None]:
        store = JobStore(settings.data_dir)
        runner = JobRunner(store, max_workers=settings.max_workers,
                           timeout_s=settings.job_timeout_s, command=worker_command,
                           max_model_mb=settings.model_limit_mb)
        app.state.store, app.state.runner = store, runner
        _warm_up()
        runner.start()
        try:
            yield
        finally:
            runner.stop()

    app = FastAPI(
        title="stanchion",
        version=API_VERSION,
        summary="Axial compression checks of steel columns (AISC 360-22 Chapter E, ASCE "
        "7-22 load combinations) from members requests and IFC models.",
        lifespan=lifespan,
    )
    app.state.settings = settings
    app.add_middleware(Guard, settings=settings)
    install_error_handlers(app)
    for module in (health, checks, models, jobs, sections):
        app.include_router(module.router)
    app.openapi = lambda: _openapi(app)  # type: ignore[method-assign]
    return app


def _warm_up() -> None:
    """Load the catalog and default combinations once, before the first request.

    Then keep the long-lived objects out of the garbage collector's generations (gc.freeze)
    and collect the young generation less often (:data:`GC_YOUNG_THRESHOLD`), so requests
    do not pay for either.
    """
    catalog.load_catalog()
    catalog.designations()
    for method in ("LRFD", "ASD"):
        default_combinations(method)
    gc.freeze()
    _, older, oldest = gc.get_threshold()
    gc.set_threshold(max(GC_YOUNG_THRESHOLD, gc.get_threshold()[0]), older, oldest)


def _openapi(app: FastAPI) -> dict[str, Any]:
    """The OpenAPI document, with the members request schema the checks route reads."""
    if app.openapi_schema is None:
        schema = get_openapi(title=app.title, version=app.version, summary=app.summary,
                             routes=app.routes)
        request = MembersRequest.model_json_schema(ref_template="#/components/schemas/{model}")
        components = schema.setdefault("components", {}).setdefault("schemas", {})
        components.update(request.pop("$defs", {}))
        components["MembersRequest"] = request
        _errors_are_error_bodies(schema)
        app.openapi_schema = schema
    return app.openapi_schema


def _errors_are_error_bodies(schema: dict[str, Any]) -> None:
    """Replace FastAPI's default 422 (its own validation body) by ours, where it can occur.

    Every route that reads a body or a query declares its 422 with the error body; the
    default FastAPI adds for a path parameter (a job id is any string) never occurs.
    """
    default = "#/components/schemas/HTTPValidationError"
    for operations in schema.get("paths", {}).values():
        for operation in operations.values():
            answer = operation.get("responses", {}).get("422", {})
            content = answer.get("content", {}).get("application/json", {})
            if content.get("schema", {}).get("$ref") == default:
                del operation["responses"]["422"]
    components = schema.get("components", {}).get("schemas", {})
    for name in ("HTTPValidationError", "ValidationError"):
        components.pop(name, None)
