"""The HTTP tests' app: ``client`` serves it as ``stanchion serve`` does (docs/design.md §6).

Model jobs run in real worker processes with the real pipeline; the data folder is the
test's own.  ``test_app.py`` has its own ``client`` (jobs run by the stand-in worker).
"""

from __future__ import annotations

from collections.abc import Iterator
from pathlib import Path

import pytest
from fastapi.testclient import TestClient

from stanchion.service.http.app import create_app
from stanchion.service.http.settings import Settings


@pytest.fixture
def client(tmp_path: Path) -> Iterator[TestClient]:
    """The app with the default worker command, its data under ``tmp_path / "data"``."""
    with TestClient(create_app(Settings(data_dir=tmp_path / "data")),
                    raise_server_exceptions=False) as c:
        yield c
