"""Settings of the HTTP service, read from the environment when the app is built.

Nothing is read at import time: :func:`stanchion.service.http.app.create_app` takes a
:class:`Settings` (tests build their own) or calls :meth:`Settings.from_env` (pydantic-settings
reads the ``STANCHION_`` variables); routes receive it through the
:func:`stanchion.service.http.dependencies.get_settings` dependency.

Environment variables (docs/design.md §6):

- ``STANCHION_API_TOKEN``: when set (non-empty), every endpoint but ``GET /v1/health``
  requires ``Authorization: Bearer <token>``.
- ``STANCHION_DATA_DIR``: where the job database and job files live (default
  ``./stanchion-data``).
- ``STANCHION_MAX_UPLOAD_MB``: largest request body accepted, in MiB (default 200).
- ``STANCHION_MAX_MODEL_MB``: largest size an uploaded ``.ifczip`` may expand to, in MiB
  (default five times ``STANCHION_MAX_UPLOAD_MB``: 1000); a larger one fails its job.
- ``STANCHION_JOB_TIMEOUT_S``: a model job still running after this many seconds is
  stopped and marked failed (default 600).
- ``STANCHION_MAX_WORKERS``: how many model jobs run at the same time, each in its own
  process (default 1; the others wait, queued).
"""

from __future__ import annotations

import os
from collections.abc import Mapping
from pathlib import Path
from typing import Any

from pydantic import Field, ValidationError, field_validator
from pydantic_settings import BaseSettings, SettingsConfigDict

from stanchion.service.errors import InputError

ENV_PREFIX = "STANCHION_"


class Settings(BaseSettings):
    """Service settings (immutable once built), from ``STANCHION_*`` environment variables.

    Attributes:
        api_token: bearer token required on every endpoint but health; ``None``: no auth.
        data_dir: folder holding ``jobs.sqlite3`` and one sub-folder per job.
        max_upload_mb: largest request body, MiB (model upload including its load table).
        max_model_mb: largest size an ``.ifczip`` may expand to, MiB; ``None``: five times
            ``max_upload_mb`` (:attr:`model_limit_mb`).
        job_timeout_s: longest a model job may run before it is stopped and failed.
        max_workers: model jobs processed at the same time (one process each).
    """

    model_config = SettingsConfigDict(env_prefix=ENV_PREFIX, frozen=True, extra="forbid")

    api_token: str | None = None
    data_dir: Path = Path("stanchion-data")
    # finite: an infinite upload limit cannot become a byte count (every request answered 500)
    max_upload_mb: float = Field(200.0, gt=0, allow_inf_nan=False)
    max_model_mb: float | None = Field(None, gt=0, allow_inf_nan=False)
    job_timeout_s: float = Field(600.0, gt=0, allow_inf_nan=False)
    max_workers: int = Field(1, ge=1, le=16)

    @field_validator("api_token")
    @classmethod
    def _empty_is_none(cls, v: str | None) -> str | None:
        return v if v else None

    @property
    def max_upload_bytes(self) -> int:
        """``max_upload_mb`` in bytes (1 MiB = 1,048,576 bytes)."""
        return int(self.max_upload_mb * 1024 * 1024)

    @property
    def model_limit_mb(self) -> float:
        """The ``.ifczip`` expanded-size limit, MiB: ``max_model_mb`` or 5 × the upload limit.

        Five times: STEP text compresses about 5-10 times (common practice, no source), and
        the default, 1000 MiB, is the command line's (``ifc_bridge.model``).
        """
        return self.max_model_mb if self.max_model_mb is not None else 5 * self.max_upload_mb

    @classmethod
    def env_name(cls, field: str) -> str:
        """The environment variable of a setting."""
        return f"{ENV_PREFIX}{field.upper()}"

    @classmethod
    def from_env(cls, environ: Mapping[str, str] | None = None) -> Settings:
        """Build the settings from the environment (or from ``environ``, for tests).

        Raises:
            InputError: a variable holds an unusable value; the message names the variable.
        """
        env = os.environ if environ is None else environ
        given: dict[str, Any] = {f: env[cls.env_name(f)] for f in cls.model_fields
                                 if cls.env_name(f) in env}
        try:
            return cls() if environ is None else cls.model_validate(given)
        except ValidationError as exc:
            err = exc.errors()[0]
            field = str(err["loc"][0]) if err["loc"] else ""
            name = cls.env_name(field) if field in cls.model_fields else field
            raise InputError(f"{name}={given.get(field)!r}: {err['msg']}") from None
