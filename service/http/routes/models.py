"""``POST /v1/models``: upload an IFC model (a load table, a takedown project) to check as a job."""

from __future__ import annotations

import json
import shutil
from pathlib import Path
from typing import Any

from fastapi import APIRouter, Request
from fastapi.responses import JSONResponse
from starlette.exceptions import HTTPException

from stanchion.service.default_grade import given_default_grade
from stanchion.service.errors import InputError
from stanchion.service.http.dependencies import AUTH, RunnerDep, SettingsDep, StoreDep
from stanchion.service.http.errors import FieldError
from stanchion.service.http.responses import errors
from stanchion.service.http.settings import Settings
from stanchion.service.http.upload import UploadError, UploadTooLarge, boundary_of, receive_form
from stanchion.service.jobs.runner import JobRunner
from stanchion.service.jobs.store import PARAMS_FILE, JobStore
from stanchion.service.load_table import given_force_unit
from stanchion.service.report_model import JobAccepted
from stanchion.service.takedown_project import parse_project

MODEL_SUFFIXES = (".ifc", ".ifczip", ".ifcxml")

router = APIRouter(tags=["models"], dependencies=AUTH)


@router.post(
    "/v1/models", status_code=202, response_model=JobAccepted,
    responses=errors(401, 413, 415, 422),
    summary="Upload an IFC model to check; returns a job id",
    openapi_extra={"requestBody": {"required": True, "content": {"multipart/form-data": {
        "schema": {"type": "object", "required": ["file"], "properties": {
            "file": {"type": "string", "format": "binary",
                     "description": "IFC model (.ifc, .ifczip, .ifcxml)"},
            "loads": {"type": "string", "format": "binary",
                      "description": "optional CSV load table (docs/design.md §5)"},
            "takedown": {"type": "string", "format": "binary", "description":
                         "optional load takedown project file (TOML, docs/design.md §5 "
                         "'Load takedown'; the command line's --takedown): estimated loads "
                         "from the slabs for the columns without any"},
            "design_method": {"type": "string", "enum": ["LRFD", "ASD"], "default": "LRFD"},
            "force_unit": {"type": "string", "maxLength": 40, "description":
                           "optional: the force unit of a model that declares none and of "
                           "the load table's columns whose header names none (kip, kN, N, "
                           "lbf, MN or another force unit; the command line's --force-unit)"},
            "default_grade": {"type": "string", "maxLength": 60, "description":
                              "optional: the grade assumed for columns whose material names "
                              "steel but no grade (A992, S355, 345 MPa ...; the command "
                              "line's --default-grade), stated in every output"},
            "analysis_members": {"type": "boolean", "default": False, "description":
                                 "optional: also check the vertical "
                                 "IfcStructuralCurveMembers tied to no column (the command "
                                 "line's --analysis-members)"},
        }}}}}},
)
async def upload_model(request: Request, settings: SettingsDep, store: StoreDep,
                       runner: RunnerDep) -> JSONResponse:
    """Receive the upload into a new job folder and queue the job."""
    return await _receive_model(request, settings, store, runner)


async def _receive_model(request: Request, settings: Settings, store: JobStore,
                         runner: JobRunner) -> JSONResponse:
    """Stream a multipart model upload into a new job folder and queue the job."""
    try:
        boundary = boundary_of(request.headers.get("content-type"))
    except UploadError as exc:
        raise HTTPException(415, str(exc)) from None
    length = request.headers.get("content-length")
    if length is not None and length.isdigit() and int(length) > settings.max_upload_bytes:
        raise HTTPException(413, f"the upload is larger than {settings.max_upload_mb:g} MiB "
                            "(STANCHION_MAX_UPLOAD_MB)")
    store = store
    job_id = store.new_id()
    incoming = store.incoming_dir(job_id)
    incoming.mkdir(parents=True)
    try:
        try:
            parts = await receive_form(
                request.stream(), boundary, incoming, max_bytes=settings.max_upload_bytes,
                file_fields={"file", "loads", "takedown"},
                text_fields={"design_method", "force_unit", "default_grade",
                             "analysis_members"},
            )
        except UploadTooLarge:
            raise HTTPException(413, f"the upload is larger than {settings.max_upload_mb:g} "
                                "MiB (STANCHION_MAX_UPLOAD_MB)") from None
        except UploadError as exc:
            raise FieldError(422, str(exc), exc.field) from None
        params = _job_params(parts, incoming)
        (incoming / PARAMS_FILE).write_text(json.dumps(params), encoding="utf-8")
        incoming.rename(store.job_dir(job_id))
    except BaseException:
        shutil.rmtree(incoming, ignore_errors=True)
        raise
    store.add(job_id, filename=params["filename"], design_method=params["design_method"],
              has_loads=params["loads"] is not None, options=job_options(params))
    runner.wake()
    url = f"/v1/jobs/{job_id}"
    return JSONResponse({"job_id": job_id, "status": "queued", "url": url},
                        status_code=202, headers={"Location": url})


def job_options(params: dict[str, Any]) -> dict[str, Any]:
    """The options a job was started with, as ``GET /v1/jobs/{id}`` shows them (``JobOptions``).

    Args:
        params: the job's ``job.json`` (:func:`_job_params`).
    """
    return {"force_unit": params["force_unit"], "default_grade": params["default_grade"],
            "analysis_members": params["analysis_members"],
            "loads": params["loads_filename"], "takedown": params["takedown_filename"]}


_TRUE, _FALSE = ("true", "1", "yes", "on"), ("false", "0", "no", "off", "")


def _flag(part: Any, name: str) -> bool:
    """A boolean form field: true / false (1 / 0, yes / no, on / off); blank or absent: false."""
    text = (part.value or "").strip().lower() if part is not None else ""
    if text in _TRUE:
        return True
    if text in _FALSE:
        return False
    raise FieldError(422, f"expected true or false, got {part.value!r}", name)


def _job_params(parts: dict[str, Any], folder: Path) -> dict[str, Any]:
    """Validate the received parts, give the files their job names, return job.json."""
    model = parts.get("file")
    if model is None:
        raise FieldError(422, "field required (the IFC model)", "file")
    filename = model.filename or "model.ifc"
    suffix = Path(filename).suffix.lower()
    if suffix not in MODEL_SUFFIXES:
        raise FieldError(422, f"expected an IFC model ({', '.join(MODEL_SUFFIXES)}), "
                          f"got {filename!r}", "file")
    if model.size == 0:
        raise FieldError(422, "the uploaded model is empty", "file")
    method_part = parts.get("design_method")
    given = method_part.value if method_part is not None else None
    method = (given or "LRFD").upper()
    if method not in ("LRFD", "ASD"):
        raise FieldError(422, f"expected LRFD or ASD, got {given!r}", "design_method")
    unit_part = parts.get("force_unit")
    force_unit = (unit_part.value or "").strip() or None if unit_part is not None else None
    try:
        given_force_unit(force_unit, "force_unit")
    except InputError as exc:
        raise FieldError(422, str(exc).removeprefix("force_unit: "), "force_unit") from None
    grade_part = parts.get("default_grade")
    try:
        grade = given_default_grade(  # a field left blank: not given
            (grade_part.value or "").strip() or None if grade_part is not None else None,
            "default_grade")
    except InputError as exc:
        raise FieldError(422, str(exc).removeprefix("default_grade: "), "default_grade"
                         ) from None
    analysis_members = _flag(parts.get("analysis_members"), "analysis_members")
    model.path.rename(folder / f"model{suffix}")
    loads = parts.get("loads")
    loads_name = None
    if loads is not None and (loads.size > 0 or loads.filename):
        if loads.size == 0:
            raise FieldError(422, "the uploaded load table is empty", "loads")
        loads.path.rename(folder / "loads.csv")
        loads_name = "loads.csv"
    elif loads is not None:  # an empty, unnamed part: a form field left blank
        loads.path.unlink(missing_ok=True)
    takedown_name, takedown_filename = _takedown(parts.get("takedown"), folder)
    return {"model": f"model{suffix}", "filename": filename, "design_method": method,
            "takedown": takedown_name, "takedown_filename": takedown_filename,
            "force_unit": force_unit, "default_grade": grade,
            "analysis_members": analysis_members, "loads": loads_name,
            "loads_filename": loads.filename if loads is not None and loads_name else None}


def _takedown(part: Any, folder: Path) -> tuple[str | None, str | None]:
    """Validate an uploaded takedown project file and keep it under its own name.

    It is kept as ``takedown/NAME`` (characters other than letters, digits, ``.``, ``_``,
    ``-`` and space replaced), so the report names the file the user sent.

    Returns:
        (the job's file name, the uploaded name), or (None, None) when none was given.

    Raises:
        FieldError: 422 naming ``takedown`` -- the file is empty, not UTF-8 or not a usable
            project (the one line the command line prints).
    """
    if part is None:
        return None, None
    if part.size == 0 and not part.filename:  # an empty, unnamed part: left blank
        part.path.unlink(missing_ok=True)
        return None, None
    if part.size == 0:
        raise FieldError(422, "the uploaded takedown project file is empty", "takedown")
    name = Path(part.filename or "takedown.toml").name
    try:
        parse_project(part.path.read_text(encoding="utf-8"), f"takedown project {name}")
    except UnicodeDecodeError:
        raise FieldError(422, f"takedown project {name}: not UTF-8 text", "takedown") from None
    except InputError as exc:
        raise FieldError(422, str(exc), "takedown") from None
    safe = "".join(c if c.isalnum() or c in "._- " else "_" for c in name)[:100].strip()
    if not safe.strip("."):
        safe = "takedown.toml"
    (folder / "takedown").mkdir()
    part.path.rename(folder / "takedown" / safe)
    return f"takedown/{safe}", name
