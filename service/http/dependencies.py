"""What the routes share.

The settings, the job store and runner, a job by id, and the bearer scheme as OpenAPI
documents it (:class:`stanchion.service.http.guard.Guard` enforces it).
"""

from __future__ import annotations

from pathlib import Path
from typing import Annotated

from fastapi import Depends, Request
from fastapi.security import HTTPBearer
from starlette.exceptions import HTTPException

from stanchion.service.http.settings import Settings
from stanchion.service.jobs.runner import JobRunner
from stanchion.service.jobs.store import Job, JobStore

bearer = HTTPBearer(auto_error=False, description="STANCHION_API_TOKEN, when the server has one")
#: Route dependencies that document the bearer scheme (the guard enforces it).
AUTH = [Depends(bearer)]


def get_settings(request: Request) -> Settings:
    """The settings the app was built with."""
    settings: Settings = request.app.state.settings
    return settings


def get_store(request: Request) -> JobStore:
    """The job store of the running app."""
    store: JobStore = request.app.state.store
    return store


def get_runner(request: Request) -> JobRunner:
    """The job runner of the running app."""
    runner: JobRunner = request.app.state.runner
    return runner


SettingsDep = Annotated[Settings, Depends(get_settings)]
StoreDep = Annotated[JobStore, Depends(get_store)]
RunnerDep = Annotated[JobRunner, Depends(get_runner)]


def get_job(store: StoreDep, job_id: str) -> Job:
    """The job ``job_id``; 404 when there is none."""
    job = store.get(job_id)
    if job is None:
        raise HTTPException(404, f"no job {job_id!r}")
    return job


JobDep = Annotated[Job, Depends(get_job)]


def result_file(store: JobStore, job: Job, name: str, what: str) -> Path:
    """Path of a finished job's output; 409 while it runs or when it failed, 404 if absent."""
    if job.status in ("queued", "running"):
        raise HTTPException(409, f"job {job.id} is {job.status}; its {what} is not ready")
    if job.status == "failed":
        raise HTTPException(409, f"job {job.id} failed, it has no {what}: {job.error}")
    path = store.job_dir(job.id) / name
    if not path.is_file():
        raise HTTPException(404, f"job {job.id} has no {what}")
    return path
