"""The HTTP service (design.md §6): FastAPI app factory and routes, all under ``/v1``.

Thin: requests are parsed and handed to :func:`service.core.check_request` (members
requests, answered at once) or queued as model jobs (:mod:`service.jobs`, checked in worker
processes).  Errors are JSON ``{"error": "...", ...}``; no traceback ever reaches a client.

Auth: with ``STANCHION_API_TOKEN`` set, every path but ``GET /v1/health`` -- the API docs
(``/docs``, ``/redoc``, ``/openapi.json``) and unknown paths included -- needs
``Authorization: Bearer <token>``, else 401.  The check runs before any body is read.

Run with ``stanchion serve`` (one server process per data folder; it holds a lock on it).
"""

from __future__ import annotations

import hmac
import json
import logging
import shutil
from collections.abc import AsyncIterator, Callable, Coroutine
from contextlib import asynccontextmanager
from pathlib import Path
from typing import Annotated, Any

import orjson
from fastapi import Depends, FastAPI, Query, Request
from fastapi.concurrency import run_in_threadpool
from fastapi.exceptions import RequestValidationError
from fastapi.openapi.utils import get_openapi
from fastapi.responses import FileResponse, JSONResponse, Response
from fastapi.routing import APIRoute, APIRouter
from fastapi.security import HTTPBearer
from pydantic import ValidationError
from starlette.exceptions import HTTPException
from starlette.types import ASGIApp, Message, Receive, Scope, Send

from stanchion import __version__
from stanchion.service import jobs as jobs_mod
from stanchion.service.core import check_request
from stanchion.service.errors import InputError
from stanchion.service.jobs import Job, JobRunner, JobStore
from stanchion.service.request import MembersRequest
from stanchion.service.settings import Settings, get_settings
from stanchion.service.upload import UploadError, UploadTooLarge, boundary_of, receive_form

log = logging.getLogger("stanchion.http")

API_VERSION = __version__
MODEL_SUFFIXES = (".ifc", ".ifczip", ".ifcxml")
HEALTH_PATH = "/v1/health"
UPLOAD_PATH = "/v1/models"
_bearer = HTTPBearer(auto_error=False, description="STANCHION_API_TOKEN, when the server has one")

SettingsDep = Annotated[Settings, Depends(get_settings)]


# ------------------------------------------------------------------------------ errors


def _error(status: int, message: str, headers: dict[str, str] | None = None,
           **extra: Any) -> JSONResponse:
    return JSONResponse({"error": message, **extra}, status_code=status, headers=headers)


def _loc(parts: tuple | list) -> str:
    """``("body", "members", 0, "fy")`` -> ``"members.0.fy"``."""
    parts = list(parts)
    if parts and parts[0] in ("body", "query", "path", "header", "form"):
        parts = parts[1:]
    if parts and parts[-1] == "[key]":  # a mapping key that is not allowed, e.g. a load type
        parts = parts[:-1]
    return ".".join(str(p) for p in parts) or "request"


def _invalid(errors: list[dict]) -> JSONResponse:
    """422 ``{"error", "details": [{"loc": "members.0.fy", "msg"}]}`` from pydantic errors."""
    details = []
    for err in errors:
        msg = str(err.get("msg", "invalid value")).removeprefix("Value error, ")
        if err.get("type") == "json_invalid":
            ctx = err.get("ctx") or {}
            reason = ctx.get("error") or msg.removeprefix("Invalid JSON: ")
            details.append({"loc": "body", "msg": f"the body is not valid JSON ({reason})"})
            continue
        details.append({"loc": _loc(err.get("loc", ())), "msg": msg})
    first = details[0] if details else {"loc": "request", "msg": "invalid"}
    more = f" (and {len(details) - 1} more)" if len(details) > 1 else ""
    return _error(422, f"invalid request: {first['loc']}: {first['msg']}{more}", details=details)


async def _validation_error(_: Request, exc: RequestValidationError) -> JSONResponse:
    return _invalid(list(exc.errors()))


async def _http_error(_: Request, exc: HTTPException) -> JSONResponse:
    detail = exc.detail if isinstance(exc.detail, str) else "request refused"
    extra = {"details": exc.detail} if isinstance(exc.detail, list) else {}
    return _error(exc.status_code, detail, headers=getattr(exc, "headers", None), **extra)


async def _internal_error(request: Request, exc: Exception) -> JSONResponse:
    log.error("unhandled error on %s %s", request.method, request.url.path, exc_info=exc)
    return _error(500, "internal error")


class _FieldError(HTTPException):
    """An HTTP error about one input field: ``{"error", "details": [{"loc", "msg"}]}``."""

    def __init__(self, status: int, message: str, field: str) -> None:
        super().__init__(status, f"invalid request: {field}: {message}")
        self.field, self.msg = field, message


async def _field_error(_: Request, exc: _FieldError) -> JSONResponse:
    return _error(exc.status_code, str(exc.detail),
                  details=[{"loc": exc.field, "msg": exc.msg}])


# ------------------------------------------------------------------------------ guard


class _BodyTooLarge(Exception):
    pass


class Guard:
    """ASGI middleware: bearer token on every path but health, and a request-body limit.

    Both are decided before the app reads a byte of the body.  The upload route counts its
    own body (:func:`service.upload.receive_form`); every other route is limited here, by
    Content-Length up front, or by counting what it reads when the body is sent without one
    (chunked).
    """

    def __init__(self, app: ASGIApp, settings: Settings) -> None:
        self.app = app
        self.token = settings.api_token.encode() if settings.api_token else None
        self.max_bytes = settings.max_upload_bytes

    async def __call__(self, scope: Scope, receive: Receive, send: Send) -> None:
        if scope["type"] != "http":
            await self.app(scope, receive, send)
            return
        path = scope.get("path", "")
        if self.token is not None and path != HEALTH_PATH and not self._authorized(scope):
            await _error(401, "missing or wrong bearer token",
                         headers={"WWW-Authenticate": "Bearer"})(scope, receive, send)
            return
        if path == UPLOAD_PATH:
            await self.app(scope, receive, send)
            return
        length = _content_length(scope)
        if length is not None:
            # The declared length frames the body (the HTTP server reads no more), so a
            # declared body within the limit needs no counting.
            if length > self.max_bytes:
                await self._too_large(scope, receive, send)
            else:
                await self.app(scope, receive, send)
            return
        seen = 0
        started = False

        async def counting_receive() -> Message:
            nonlocal seen
            message = await receive()
            if message["type"] == "http.request":
                seen += len(message.get("body", b""))
                if seen > self.max_bytes:
                    raise _BodyTooLarge
            return message

        async def tracking_send(message: Message) -> None:
            nonlocal started
            started = started or message["type"] == "http.response.start"
            await send(message)

        try:
            await self.app(scope, counting_receive, tracking_send)
        except _BodyTooLarge:
            if started:
                raise
            await self._too_large(scope, receive, send)

    def _authorized(self, scope: Scope) -> bool:
        for name, value in scope.get("headers", []):
            if name == b"authorization":
                scheme, _, given = value.partition(b" ")
                return (scheme.lower() == b"bearer"
                        and hmac.compare_digest(given.strip(), self.token or b""))
        return False

    async def _too_large(self, scope: Scope, receive: Receive, send: Send) -> None:
        mb = self.max_bytes / (1024 * 1024)
        await _error(413, f"the request body is larger than {mb:g} MiB "
                     "(STANCHION_MAX_UPLOAD_MB)")(scope, receive, send)


def _content_length(scope: Scope) -> int | None:
    """The declared body length; None when there is none, it is not a number, or the body is
    also declared chunked (then the length does not frame it)."""
    length = None
    for name, value in scope.get("headers", []):
        if name == b"transfer-encoding":
            return None
        if name == b"content-length":
            try:
                length = int(value)
            except ValueError:
                return None
    return length


# ------------------------------------------------------------------------------ app


def create_app(settings: Settings | None = None, *,
               worker_command: list[str] | None = None) -> FastAPI:
    """Build the FastAPI app.

    Args:
        settings: service settings (default: :meth:`Settings.from_env`, read now).
        worker_command: command line of the job worker without the job folder (default
            ``python -m service.worker``); tests pass a stand-in.

    Returns:
        The app; its lifespan opens the job store and starts the job runner.
    """
    settings = settings if settings is not None else Settings.from_env()

    @asynccontextmanager
    async def lifespan(app: FastAPI) -> AsyncIterator[None]:
        store = JobStore(settings.data_dir)
        runner = JobRunner(store, max_workers=settings.max_workers,
                           timeout_s=settings.job_timeout_s, command=worker_command)
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
    app.add_exception_handler(RequestValidationError, _validation_error)
    app.add_exception_handler(_FieldError, _field_error)
    app.add_exception_handler(HTTPException, _http_error)
    app.add_exception_handler(Exception, _internal_error)
    _add_routes(app)
    app.openapi = lambda: _openapi(app)  # type: ignore[method-assign]
    return app


#: Members requests up to this size are checked on the event loop (see the checks route).
INLINE_CHECK_BYTES = 32 * 1024


#: Allocations between young-generation garbage collections in the server (Python's default
#: is 700): a members request allocates a few thousand short-lived objects, freed by
#: reference counting, so collecting every 700 mostly traverses live request data.
GC_YOUNG_THRESHOLD = 20_000


def _warm_up() -> None:
    """Load the catalog and default combinations once, then keep the long-lived objects out
    of the garbage collector's generations (gc.freeze) and collect the young generation less
    often (:data:`GC_YOUNG_THRESHOLD`), so requests do not pay for either."""
    import gc

    from stanchion.engine import catalog
    from stanchion.engine.combinations import default_combinations

    catalog.load_catalog()
    catalog.designations()
    for method in ("LRFD", "ASD"):
        default_combinations(method)
    gc.freeze()
    _, older, oldest = gc.get_threshold()
    gc.set_threshold(max(GC_YOUNG_THRESHOLD, gc.get_threshold()[0]), older, oldest)


def _check_body(body: bytes) -> Response:
    """Members request JSON -> report response (422 for a malformed request)."""
    try:
        req = MembersRequest.model_validate_json(body)
    except ValidationError as exc:
        return _invalid(exc.errors())
    try:
        report = check_request(req)
    except InputError as exc:
        return _error(422, str(exc))
    return Response(orjson.dumps(report), media_type="application/json")


def _openapi(app: FastAPI) -> dict:
    """The OpenAPI document, with the members request schema the checks route reads."""
    if app.openapi_schema is None:
        schema = get_openapi(title=app.title, version=app.version, summary=app.summary,
                             routes=app.routes)
        request = MembersRequest.model_json_schema(ref_template="#/components/schemas/{model}")
        components = schema.setdefault("components", {}).setdefault("schemas", {})
        components.update(request.pop("$defs", {}))
        components["MembersRequest"] = request
        app.openapi_schema = schema
    return app.openapi_schema


def _store(request: Request) -> JobStore:
    return request.app.state.store


def _runner(request: Request) -> JobRunner:
    return request.app.state.runner


def _job(request: Request, job_id: str) -> Job:
    job = _store(request).get(job_id)
    if job is None:
        raise HTTPException(404, f"no job {job_id!r}")
    return job


def _result_file(request: Request, job_id: str, name: str, what: str) -> Path:
    """Path of a finished job's output; 404 / 409 when there is none (yet)."""
    job = _job(request, job_id)
    if job.status in ("queued", "running"):
        raise HTTPException(409, f"job {job_id} is {job.status}; its {what} is not ready")
    if job.status == "failed":
        raise HTTPException(409, f"job {job_id} failed, it has no {what}: {job.error}")
    path = _store(request).job_dir(job_id) / name
    if not path.is_file():
        raise HTTPException(404, f"job {job_id} has no {what}")
    return path


def _stem(filename: str) -> str:
    stem = Path(filename).stem or "model"
    return "".join(c if c.isalnum() or c in "-_." else "_" for c in stem)


class _DirectRoute(APIRoute):
    """A documented route whose endpoint is called with the request and returns the response
    (FastAPI's "custom APIRoute class" hook): no dependency or parameter solving."""

    def get_route_handler(self) -> Callable[[Request], Coroutine[Any, Any, Response]]:
        return self.endpoint


def _add_routes(app: FastAPI) -> None:  # noqa: C901 - one place for the route table
    auth = [Depends(_bearer)]  # documents the scheme; Guard enforces it

    @app.get("/v1/health", tags=["service"], summary="Liveness (never needs a token)")
    async def health() -> dict:
        return {"status": "ok", "version": API_VERSION}

    # The hottest route takes the request and returns the response itself (_DirectRoute: no
    # parameter solving, which costs more than the check of a few members); Guard enforces
    # the token and the scheme is documented directly.
    direct = APIRouter(route_class=_DirectRoute)

    @direct.post("/v1/checks", tags=["checks"],
              summary="Check a members request (design.md §2) and return the report (§3)",
              openapi_extra={"security": [{"HTTPBearer": []}],
                             "requestBody": {"required": True, "content": {
                  "application/json": {"schema": {
                      "$ref": "#/components/schemas/MembersRequest"}}}}},
              responses={422: {"description": "malformed request; details name the fields"}})
    async def checks(request: Request) -> Response:
        # The raw body is validated by pydantic in one pass (model_validate_json).  A small
        # request (a few hundred members: about a millisecond of work) is answered on the
        # event loop, where a thread hop would cost more than the check; larger ones go to
        # the thread pool so the loop stays free for other requests.
        body = await request.body()
        if len(body) <= INLINE_CHECK_BYTES:
            return _check_body(body)
        return await run_in_threadpool(_check_body, body)

    app.include_router(direct)

    @app.post(
        UPLOAD_PATH, tags=["models"], dependencies=auth, status_code=202,
        summary="Upload an IFC model to check; returns a job id",
        openapi_extra={"requestBody": {"required": True, "content": {"multipart/form-data": {
            "schema": {"type": "object", "required": ["file"], "properties": {
                "file": {"type": "string", "format": "binary",
                         "description": "IFC model (.ifc, .ifczip, .ifcxml)"},
                "loads": {"type": "string", "format": "binary",
                          "description": "optional CSV load table (design.md §5)"},
                "design_method": {"type": "string", "enum": ["LRFD", "ASD"],
                                  "default": "LRFD"},
            }}}}}},
        responses={413: {"description": "larger than STANCHION_MAX_UPLOAD_MB"}},
    )
    async def upload_model(request: Request, settings: SettingsDep) -> JSONResponse:
        return await _receive_model(request, settings)

    @app.get("/v1/jobs/{job_id}", tags=["models"], dependencies=auth, summary="Job status")
    def job_status(request: Request, job_id: str) -> dict:
        return _job(request, job_id).public()

    @app.get("/v1/jobs/{job_id}/report", tags=["models"], dependencies=auth,
             summary="JSON report of a finished job (409 until it is done)")
    def job_report(request: Request, job_id: str) -> FileResponse:
        path = _result_file(request, job_id, jobs_mod.REPORT_FILE, "report")
        return FileResponse(path, media_type="application/json")

    @app.get("/v1/jobs/{job_id}/model", tags=["models"], dependencies=auth,
             summary="The checked IFC model, with Stanchion_ColumnCheck property sets")
    def job_model(request: Request, job_id: str) -> FileResponse:
        path = _result_file(request, job_id, jobs_mod.MODEL_OUT_FILE, "checked model")
        name = f"{_stem(_job(request, job_id).filename)}-checked.ifc"
        return FileResponse(path, media_type="application/x-step", filename=name)

    @app.get("/v1/jobs/{job_id}/csv", tags=["models"], dependencies=auth,
             summary="CSV report of a finished job")
    def job_csv(request: Request, job_id: str) -> FileResponse:
        path = _result_file(request, job_id, jobs_mod.CSV_FILE, "CSV report")
        name = f"{_stem(_job(request, job_id).filename)}-report.csv"
        return FileResponse(path, media_type="text/csv", filename=name)

    @app.delete("/v1/jobs/{job_id}", tags=["models"], dependencies=auth, status_code=204,
                summary="Delete a job and its files (a running job is stopped first)")
    def job_delete(request: Request, job_id: str) -> Response:
        if not _runner(request).delete(job_id):
            raise HTTPException(404, f"no job {job_id!r}")
        return Response(status_code=204)

    @app.get("/v1/sections", tags=["catalog"], dependencies=auth,
             summary="Catalog shapes (AISC Shapes Database v16.0) with key properties")
    def sections(family: Annotated[str | None, Query(
        max_length=40, description="family (W, HSS, PIPE ...), family with nominal depth "
        "(W14, HSS8) or a designation; all shapes when omitted")] = None) -> JSONResponse:
        try:
            return JSONResponse(list_sections(family))
        except LookupError as exc:
            raise HTTPException(404, str(exc.args[0])) from None
        except ValueError as exc:
            raise _FieldError(422, str(exc), "family") from None


async def _receive_model(request: Request, settings: Settings) -> JSONResponse:
    """Stream a multipart model upload into a new job folder and queue the job."""
    try:
        boundary = boundary_of(request.headers.get("content-type"))
    except UploadError as exc:
        raise HTTPException(415, str(exc)) from None
    length = request.headers.get("content-length")
    if length is not None and length.isdigit() and int(length) > settings.max_upload_bytes:
        raise HTTPException(413, f"the upload is larger than {settings.max_upload_mb:g} MiB "
                            "(STANCHION_MAX_UPLOAD_MB)")
    store = _store(request)
    job_id = store.new_id()
    incoming = store.incoming_dir(job_id)
    incoming.mkdir(parents=True)
    try:
        try:
            parts = await receive_form(
                request.stream(), boundary, incoming, max_bytes=settings.max_upload_bytes,
                file_fields={"file", "loads"}, text_fields={"design_method"},
            )
        except UploadTooLarge:
            raise HTTPException(413, f"the upload is larger than {settings.max_upload_mb:g} "
                                "MiB (STANCHION_MAX_UPLOAD_MB)") from None
        except UploadError as exc:
            raise _FieldError(422, str(exc), exc.field) from None
        params = _job_params(parts, incoming)
        (incoming / jobs_mod.PARAMS_FILE).write_text(json.dumps(params), encoding="utf-8")
        incoming.rename(store.job_dir(job_id))
    except BaseException:
        shutil.rmtree(incoming, ignore_errors=True)
        raise
    store.add(job_id, filename=params["filename"], design_method=params["design_method"],
              has_loads=params["loads"] is not None)
    _runner(request).wake()
    url = f"/v1/jobs/{job_id}"
    return JSONResponse({"job_id": job_id, "status": "queued", "url": url},
                        status_code=202, headers={"Location": url})


def _job_params(parts: dict, folder: Path) -> dict:
    """Validate the received parts, give the files their job names, return job.json."""
    model = parts.get("file")
    if model is None:
        raise _FieldError(422, "field required (the IFC model)", "file")
    filename = model.filename or "model.ifc"
    suffix = Path(filename).suffix.lower()
    if suffix not in MODEL_SUFFIXES:
        raise _FieldError(422, f"expected an IFC model ({', '.join(MODEL_SUFFIXES)}), "
                          f"got {filename!r}", "file")
    if model.size == 0:
        raise _FieldError(422, "the uploaded model is empty", "file")
    method_part = parts.get("design_method")
    method = (method_part.value or "LRFD").upper() if method_part else "LRFD"
    if method not in ("LRFD", "ASD"):
        raise _FieldError(422, f"expected LRFD or ASD, got {method_part.value!r}",
                          "design_method")
    model.path.rename(folder / f"model{suffix}")
    loads = parts.get("loads")
    loads_name = None
    if loads is not None and (loads.size > 0 or loads.filename):
        if loads.size == 0:
            raise _FieldError(422, "the uploaded load table is empty", "loads")
        loads.path.rename(folder / "loads.csv")
        loads_name = "loads.csv"
    elif loads is not None:  # an empty, unnamed part: a form field left blank
        loads.path.unlink(missing_ok=True)
    return {"model": f"model{suffix}", "filename": filename, "design_method": method,
            "loads": loads_name, "loads_filename": loads.filename if loads_name else None}


#: Properties listed by ``GET /v1/sections`` and their units (catalog units).
SECTION_PROPERTIES: dict[str, str] = {
    "weight": "lb/ft", "A": "in2", "d": "in", "bf": "in", "tw": "in", "tf": "in",
    "Ix": "in4", "Iy": "in4", "rx": "in", "ry": "in", "J": "in4", "Cw": "in6",
}


def list_sections(family: str | None) -> dict:
    """Catalog rows of a family (all rows when None) with :data:`SECTION_PROPERTIES`.

    Raises:
        ValueError: ``family`` is not a family, family with depth or designation.
        LookupError: a valid family selects no shape.
    """
    import numpy as np

    from stanchion.engine import catalog
    from stanchion.engine.sections import Kind

    table = catalog.load_catalog()
    if family is None:
        rows = np.arange(len(table))
    else:
        rows = catalog.family_indices(family)
        if len(rows) == 0:
            raise LookupError(f"no catalog shapes in family {family!r}")
    columns = {k: getattr(table, k)[rows].tolist() for k in SECTION_PROPERTIES}
    designations = table.designation[rows].tolist()
    families = table.family[rows].tolist()
    supported = (table.kind[rows] != Kind.UNSUPPORTED).tolist()
    shapes = []
    for i, name in enumerate(designations):
        row = {"designation": name, "family": families[i], "supported": supported[i]}
        # 0 in the catalog means "not tabulated for this family" (e.g. Cw of an HSS).
        row.update({k: (v[i] if v[i] != 0 else None) for k, v in columns.items()})
        shapes.append(row)
    return {"family": family, "count": len(shapes), "units": SECTION_PROPERTIES,
            "sections": shapes}
