"""``stanchion serve``: run the HTTP service (docs/design.md §6) with uvicorn."""

from __future__ import annotations

import argparse
import logging

from stanchion.service.errors import InputError


def run_serve(args: argparse.Namespace) -> int:
    """Read the settings from the environment and serve until interrupted."""
    import uvicorn

    from stanchion.service.http.app import create_app
    from stanchion.service.http.settings import Settings
    from stanchion.service.jobs.store import data_dir_in_use

    settings = Settings.from_env()  # InputError names a bad variable -> exit 2
    try:
        settings.data_dir.mkdir(parents=True, exist_ok=True)
    except OSError as exc:
        raise InputError(f"STANCHION_DATA_DIR={str(settings.data_dir)!r}: "
                         f"{exc.strerror or exc}") from None
    if data_dir_in_use(settings.data_dir):
        raise InputError(f"another stanchion server is using STANCHION_DATA_DIR="
                         f"{str(settings.data_dir)!r}")
    logging.basicConfig(level=logging.INFO,
                        format="%(asctime)s %(levelname)s %(name)s: %(message)s")
    app = create_app(settings)
    # One process: the job runner in it is the only writer of the job table.
    uvicorn.run(app, host=args.host, port=args.port, log_level=args.log_level,
                access_log=not args.no_access_log)
    return 0


def add_parser(sub: argparse._SubParsersAction) -> None:
    """Register ``serve``."""
    s = sub.add_parser(
        "serve", help="run the HTTP service",
        description="Run the HTTP service. Settings come from the environment: "
        "STANCHION_API_TOKEN, STANCHION_DATA_DIR (default ./stanchion-data), "
        "STANCHION_MAX_UPLOAD_MB (200), STANCHION_MAX_MODEL_MB (5 x the upload limit), "
        "STANCHION_JOB_TIMEOUT_S (600), "
        "STANCHION_MAX_WORKERS (1).",
    )
    s.add_argument("--host", default="127.0.0.1", help="address to listen on (127.0.0.1)")
    s.add_argument("--port", type=int, default=8000, help="port (8000)")
    s.add_argument("--log-level", default="info",
                   choices=["critical", "error", "warning", "info", "debug"])
    s.add_argument("--no-access-log", action="store_true", help="do not log every request")
    s.set_defaults(func=run_serve)
