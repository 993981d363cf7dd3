"""``stanchion serve``: arguments, settings from the environment, refusals (exit 2)."""

from __future__ import annotations

from pathlib import Path

import pytest
import uvicorn

from stanchion.service.cli import main
from stanchion.service.http.settings import Settings
from stanchion.service.jobs.runner import JobRunner
from stanchion.service.jobs.store import JobStore


@pytest.fixture
def clean_env(monkeypatch, tmp_path: Path) -> Path:
    for name in ("STANCHION_API_TOKEN", "STANCHION_DATA_DIR", "STANCHION_MAX_UPLOAD_MB",
                 "STANCHION_JOB_TIMEOUT_S", "STANCHION_MAX_WORKERS", "STANCHION_MAX_MODEL_MB"):
        monkeypatch.delenv(name, raising=False)
    monkeypatch.chdir(tmp_path)
    return tmp_path


def test_serve_defaults_and_settings_from_env(clean_env, monkeypatch) -> None:
    seen = {}

    def fake_run(app, **kw):
        seen.update(kw, settings=app.state.settings)

    monkeypatch.setattr(uvicorn, "run", fake_run)
    monkeypatch.setenv("STANCHION_API_TOKEN", "tok")
    monkeypatch.setenv("STANCHION_MAX_UPLOAD_MB", "5")
    assert main(["serve"]) == 0
    assert (seen["host"], seen["port"]) == ("127.0.0.1", 8000)  # docs/design.md §4 defaults
    s: Settings = seen["settings"]
    assert s.api_token == "tok" and s.max_upload_mb == 5 and s.max_upload_bytes == 5 * 2**20
    assert s.data_dir == Path("stanchion-data") and s.job_timeout_s == 600
    assert (clean_env / "stanchion-data").is_dir()
    assert main(["serve", "--host", "0.0.0.0", "--port", "9001"]) == 0
    assert (seen["host"], seen["port"]) == ("0.0.0.0", 9001)


@pytest.mark.parametrize(("name", "value"), [
    ("STANCHION_MAX_UPLOAD_MB", "lots"), ("STANCHION_MAX_UPLOAD_MB", "0"),
    ("STANCHION_JOB_TIMEOUT_S", "-1"), ("STANCHION_MAX_WORKERS", "0"),
    # infinite: int(inf) bytes raised OverflowError on every request (each answered 500)
    ("STANCHION_MAX_UPLOAD_MB", "inf"), ("STANCHION_JOB_TIMEOUT_S", "inf"),
    ("STANCHION_MAX_UPLOAD_MB", "nan"),
    ("STANCHION_MAX_MODEL_MB", "0"), ("STANCHION_MAX_MODEL_MB", "inf"),
    ("STANCHION_MAX_MODEL_MB", "lots"),
])
def test_serve_refuses_bad_settings(clean_env, monkeypatch, capsys, name, value) -> None:
    monkeypatch.setattr(uvicorn, "run", lambda *a, **k: pytest.fail("must not start"))
    monkeypatch.setenv(name, value)
    assert main(["serve"]) == 2
    err = capsys.readouterr().err
    assert err.startswith(f"stanchion: {name}=") and "Traceback" not in err


def test_serve_refuses_a_data_folder_in_use(clean_env, monkeypatch, capsys) -> None:
    monkeypatch.setattr(uvicorn, "run", lambda *a, **k: pytest.fail("must not start"))
    data = clean_env / "shared"
    monkeypatch.setenv("STANCHION_DATA_DIR", str(data))
    runner = JobRunner(JobStore(data))
    runner.start()
    try:
        assert main(["serve"]) == 2
        assert "another stanchion server" in capsys.readouterr().err
    finally:
        runner.stop()


def test_empty_token_means_no_auth() -> None:
    assert Settings.from_env({"STANCHION_API_TOKEN": ""}).api_token is None
    assert Settings.from_env({}).api_token is None


def test_model_size_limit_setting() -> None:
    # 5 x the upload limit unless set (service/http/settings.py; docs/design.md §6); the
    # default 1000 MiB is the command line's (ifc_bridge/model.py DEFAULT_MAX_MODEL_MB).
    assert Settings.from_env({}).model_limit_mb == 1000
    assert Settings.from_env({"STANCHION_MAX_UPLOAD_MB": "5"}).model_limit_mb == 25
    assert Settings.from_env({"STANCHION_MAX_MODEL_MB": "50"}).model_limit_mb == 50


def test_the_app_gives_its_runner_the_model_size_limit(tmp_path: Path) -> None:
    from fastapi.testclient import TestClient

    from stanchion.service.http.app import create_app

    app = create_app(Settings(data_dir=tmp_path / "data", max_model_mb=42))
    with TestClient(app):
        assert app.state.runner.max_model_mb == 42
