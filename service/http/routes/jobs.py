"""``/v1/jobs/{job_id}``: a model job's status, its outputs once done, and its deletion."""

from __future__ import annotations

from pathlib import Path
from typing import Any

from fastapi import APIRouter
from fastapi.responses import FileResponse, Response
from starlette.exceptions import HTTPException

from stanchion.service.http.dependencies import AUTH, JobDep, RunnerDep, StoreDep, result_file
from stanchion.service.http.responses import download, errors, report_download
from stanchion.service.jobs.store import (
    BCF_FILE,
    CSV_FILE,
    HTML_FILE,
    JUNIT_FILE,
    MODEL_OUT_FILE,
    REPORT_FILE,
)
from stanchion.service.report_model import JobStatus

router = APIRouter(tags=["models"], dependencies=AUTH)

#: Media type of a checked model (IFC-SPF, ISO 10303-21).
IFC_MEDIA_TYPE = "application/x-step"
#: Media type of a BCF file: BCF has no registered media type (the BCF-XML specification
#: names none and IANA lists none), so the generic binary type (RFC 2046 §4.5.1) with a
#: ``.bcf`` file name; ``application/zip`` would be true of its container but invites
#: clients to unpack it as a plain archive.
BCF_MEDIA_TYPE = "application/octet-stream"
#: Media type of JUnit XML (RFC 7303).
JUNIT_MEDIA_TYPE = "application/xml"


def _stem(filename: str) -> str:
    stem = Path(filename).stem or "model"
    return "".join(c if c.isalnum() or c in "-_." else "_" for c in stem)


@router.get("/v1/jobs/{job_id}", response_model=JobStatus, responses=errors(401, 404),
            summary="Job status")
def job_status(job: JobDep) -> dict[str, Any]:
    """The job's status (``queued``, ``running``, ``done``, ``failed`` with ``error``)."""
    return job.public()


@router.get("/v1/jobs/{job_id}/report", response_class=FileResponse,
            responses={**report_download("the job's JSON report"), **errors(401, 404, 409)},
            summary="JSON report of a finished job (409 until it is done)")
def job_report(job: JobDep, store: StoreDep) -> FileResponse:
    """The job's JSON report."""
    path = result_file(store, job, REPORT_FILE, "report")
    return FileResponse(path, media_type="application/json")


@router.get("/v1/jobs/{job_id}/model", response_class=FileResponse,
            responses={**download(IFC_MEDIA_TYPE, "the checked model (IFC-SPF)"),
                       **errors(401, 404, 409)},
            summary="The checked IFC model, with Stanchion_ColumnCheck property sets")
def job_model(job: JobDep, store: StoreDep) -> FileResponse:
    """The checked copy of the uploaded model."""
    path = result_file(store, job, MODEL_OUT_FILE, "checked model")
    return FileResponse(path, media_type=IFC_MEDIA_TYPE,
                        filename=f"{_stem(job.filename)}-checked.ifc")


@router.get("/v1/jobs/{job_id}/csv", response_class=FileResponse,
            responses={**download("text/csv", "one row per member", binary=False),
                       **errors(401, 404, 409)},
            summary="CSV report of a finished job")
def job_csv(job: JobDep, store: StoreDep) -> FileResponse:
    """One CSV row per member."""
    path = result_file(store, job, CSV_FILE, "CSV report")
    return FileResponse(path, media_type="text/csv",
                        filename=f"{_stem(job.filename)}-report.csv")


@router.get("/v1/jobs/{job_id}/junit", response_class=FileResponse,
            responses={**download(JUNIT_MEDIA_TYPE, "JUnit XML: one test case per column, "
                                  "a suite per storey", binary=False),
                       **errors(401, 404, 409)},
            summary="JUnit XML of a finished job")
def job_junit(job: JobDep, store: StoreDep) -> FileResponse:
    """One JUnit test case per column (docs/design.md §3)."""
    path = result_file(store, job, JUNIT_FILE, "JUnit report")
    return FileResponse(path, media_type=JUNIT_MEDIA_TYPE,
                        filename=f"{_stem(job.filename)}-junit.xml")


@router.get("/v1/jobs/{job_id}/bcf", response_class=FileResponse,
            responses={**download(BCF_MEDIA_TYPE, "BCF 3.0 issues: one topic per failing or "
                                  "not-checked column"),
                       **errors(401, 404, 409)},
            summary="BCF issues of a finished job")
def job_bcf(job: JobDep, store: StoreDep) -> FileResponse:
    """BCF 3.0: a topic per failing or not-checked column (docs/design.md §3)."""
    path = result_file(store, job, BCF_FILE, "BCF file")
    return FileResponse(path, media_type=BCF_MEDIA_TYPE,
                        filename=f"{_stem(job.filename)}-issues.bcf")


@router.get("/v1/jobs/{job_id}/html", response_class=FileResponse,
            responses={**download("text/html", "the HTML report: one self-contained page "
                                  "(plans, column schedule, a detail per column)",
                                  binary=False),
                       **errors(401, 404, 409)},
            summary="HTML report of a finished job")
def job_html(job: JobDep, store: StoreDep) -> FileResponse:
    """The HTML report (docs/design.md §3), as a file to save and open (an attachment)."""
    path = result_file(store, job, HTML_FILE, "HTML report")
    return FileResponse(path, media_type="text/html; charset=utf-8",
                        filename=f"{_stem(job.filename)}-report.html")


@router.delete("/v1/jobs/{job_id}", status_code=204, responses=errors(401, 404),
               summary="Delete a job and its files (a running job is stopped first)")
def job_delete(job_id: str, runner: RunnerDep) -> Response:
    """Stop the job if it runs, then remove it and its files."""
    if not runner.delete(job_id):
        raise HTTPException(404, f"no job {job_id!r}")
    return Response(status_code=204)
