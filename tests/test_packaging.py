"""One import package: only ``stanchion`` is installed, and a server started from a folder
that holds packages called ``service``, ``engine`` or ``ifc_bridge`` runs none of their code.
"""

from __future__ import annotations

import ast
import shutil
import subprocess
import sys
import time
import zipfile
from pathlib import Path

import httpx
import pytest

import stanchion

ROOT = Path(__file__).resolve().parents[1]
PACKAGE_DIRS = ("engine", "ifc_bridge", "service")


def test_wheel_holds_only_the_stanchion_package(tmp_path: Path) -> None:
    # What `pip install .` puts into site-packages is the wheel's content: build it (no
    # dependencies, this venv's setuptools) and list its top-level names.
    # A copy of the checkout, so that no earlier build folder can add files to the wheel.
    src = tmp_path / "src"
    shutil.copytree(ROOT, src, symlinks=True, ignore=shutil.ignore_patterns(
        ".git", ".venv", "build", "*.egg-info", "__pycache__", ".*_cache", "demo-output",
        "stanchion-data"))
    subprocess.run(
        [sys.executable, "-m", "pip", "wheel", "--quiet", "--no-deps", "--no-build-isolation",
         "--wheel-dir", str(tmp_path), str(src)],
        check=True, capture_output=True, timeout=300)
    (wheel,) = tmp_path.glob("stanchion-*.whl")
    names = zipfile.ZipFile(wheel).namelist()
    top = {n.split("/", 1)[0] for n in names}
    dist_info = {t for t in top if t.endswith(".dist-info")}
    assert top - dist_info == {"stanchion"}, top
    # the package data and the type marker travel with it
    for needed in ("stanchion/py.typed", "stanchion/engine/data/aisc_shapes_v16.csv",
                   "stanchion/service/schemas/report.schema.json",
                   "stanchion/service/reports/templates/report.html",
                   "stanchion/engine/compression.py", "stanchion/ifc_bridge/read.py"):
        assert needed in names


def test_one_version_from_the_package_metadata() -> None:
    from importlib.metadata import version

    from stanchion.ifc_bridge.write import APPLICATION_VERSION
    from stanchion.service.http.app import API_VERSION

    assert stanchion.__version__ == version("stanchion") == APPLICATION_VERSION == API_VERSION
    text = "\n".join(p.read_text(encoding="utf-8")
                     for d in PACKAGE_DIRS for p in (ROOT / d).rglob("*.py"))
    assert stanchion.__version__ not in text.replace("__version__", "")


def _imports(path: Path) -> list[str]:
    tree = ast.parse(path.read_text(encoding="utf-8"))
    found = []
    for node in ast.walk(tree):
        if isinstance(node, ast.Import):
            found += [a.name for a in node.names]
        elif isinstance(node, ast.ImportFrom) and node.level == 0 and node.module:
            found.append(node.module)
    return found


@pytest.mark.parametrize("folder", [*PACKAGE_DIRS, "tests", "sample_models", "tools"])
def test_every_import_of_our_code_goes_through_stanchion(folder: str) -> None:
    bare = [(str(p.relative_to(ROOT)), m) for p in (ROOT / folder).rglob("*.py")
            for m in _imports(p) if m.split(".")[0] in PACKAGE_DIRS]
    assert bare == []


@pytest.mark.skipif(shutil.which("stanchion", path=str(Path(sys.executable).parent)) is None,
                    reason="the stanchion console script is not installed beside this Python")
def test_server_in_a_folder_with_foreign_packages_runs_none_of_them(tmp_path: Path) -> None:
    from tests.service.http.test_server_e2e import _wait, build_model, running_server

    work = tmp_path / "work"
    marker = tmp_path / "foreign-code-ran"
    for name in (*PACKAGE_DIRS, "stanchion"):
        pkg = work / name
        pkg.mkdir(parents=True)
        (pkg / "__init__.py").write_text(
            f"open({str(marker)!r}, 'a').write({name!r} + '\\n')\n"
            "raise ImportError('foreign package')\n")
        for sub in ("worker", "cli", "check", "model_check", "jobs", "read"):
            (pkg / f"{sub}.py").write_text(f"open({str(marker)!r}, 'a').write('{name}.{sub}')\n")
    model = build_model(tmp_path / "tower.ifc").read_bytes()
    script = Path(sys.executable).parent / "stanchion"
    with running_server(tmp_path / "data", cwd=work, command=[str(script)],
                        STANCHION_JOB_TIMEOUT_S="120") as url, \
            httpx.Client(base_url=url, timeout=30) as c:
        r = c.post("/v1/models", files={"file": ("tower.ifc", model)})
        assert r.status_code == 202
        job = _wait(c, r.json()["job_id"])
        assert job["status"] == "done", job["error"]
        assert c.post("/v1/checks", json={"members": [
            {"id": "C1", "section": "W14X48", "fy": 50, "length": 16,
             "loads": {"D": 95.0}}]}).status_code == 200
        time.sleep(0.1)
    assert not marker.exists(), marker.read_text()
