"""The HTML report in a real browser: headless Chromium (Debian's ``chromium``).

The sample building's page (sample_models/workshop_annex.ifc, as ``stanchion demo`` checks
it) is loaded with the network cut off (a proxy that does not exist, every host name
unresolvable); Chromium's own log (``--enable-logging=stderr``) carries every console
message, and ``--dump-dom`` the document as the browser built it.  A control page with a
script error shows that a console error would be seen.  ``.ci/run`` installs chromium when
it is missing; where it cannot be had the tests skip, saying so.
"""

from __future__ import annotations

import re
import shutil
import subprocess
from pathlib import Path

import pytest

from stanchion.service.pipeline import CheckOptions, OutputPaths, check
from tests.service.reports.html_page import parse

ROOT = Path(__file__).resolve().parents[3]
SAMPLE = ROOT / "sample_models" / "workshop_annex.ifc"
TAKEDOWN = ROOT / "sample_models" / "workshop_annex_takedown.toml"
BROWSER = shutil.which("chromium") or shutil.which("chromium-browser")
#: A console message in Chromium's log: ``[...:INFO:CONSOLE:12] "text", source: ...``
#: (older builds: ``CONSOLE(12)``).
CONSOLE = re.compile(r":CONSOLE[:(]\d+\)?\]\s*\"(?P<text>.*)\", source:")
OFFLINE = ["--proxy-server=127.0.0.1:9", "--host-resolver-rules=MAP * ~NOTFOUND"]

pytestmark = pytest.mark.skipif(
    BROWSER is None, reason="no chromium on this machine (.ci/run installs Debian's chromium "
    "as root: apt-get install chromium); the browser test of the HTML report did not run")


def _chromium(page: Path, *args: str, timeout: float = 120.0) -> subprocess.CompletedProcess:
    assert BROWSER is not None
    return subprocess.run(
        [BROWSER, "--headless", "--disable-gpu", "--no-sandbox", "--no-first-run",
         "--disable-dev-shm-usage", "--enable-logging=stderr", "--v=0", *OFFLINE, *args,
         page.as_uri()], capture_output=True, text=True, timeout=timeout)


def _console(stderr: str) -> list[str]:
    return [m.group("text") for m in CONSOLE.finditer(stderr)]


@pytest.fixture(scope="module")
def sample_page(tmp_path_factory: pytest.TempPathFactory):
    folder = tmp_path_factory.mktemp("browser")
    page, report = folder / "report.html", folder / "report.json"
    run = check(SAMPLE, CheckOptions(takedown=TAKEDOWN, suggest=True),
                OutputPaths(html=page, report=report))
    return page, run.report


def test_console_errors_are_seen_on_a_broken_page(tmp_path: Path) -> None:
    # The control: without it, "no console errors" below could pass on a log format change.
    page = tmp_path / "broken.html"
    page.write_text("<!DOCTYPE html><html><body><p>x</p><script>console.error('seen');"
                    "missing_function();</script></body></html>", encoding="utf-8")
    done = _chromium(page, "--dump-dom")
    messages = _console(done.stderr)
    assert "seen" in messages
    assert any("missing_function is not defined" in m for m in messages)


def test_sample_report_loads_offline_with_one_mark_per_column(sample_page) -> None:
    page, report = sample_page
    done = _chromium(page, "--dump-dom")
    assert done.returncode == 0, done.stderr[-2000:]
    assert _console(done.stderr) == []
    dom = parse(done.stdout)
    figures = {f.attrs["data-storey"]: f for f in dom.find_all("figure")
               if "storey" in f.classes()}
    per_storey: dict[str, int] = {}
    for row in report["members"]:
        per_storey[row["storey"]] = per_storey.get(row["storey"], 0) + 1
    assert {k: len(f.find_all("g", class_="mark")) for k, f in figures.items()} == per_storey
    # works offline: nothing in the built document loads from elsewhere
    for node in dom.iter():
        assert "src" not in node.attrs, node.tag
        href = node.attrs.get("href", "#")
        assert href.startswith("#"), href
    assert not re.search(r"(src|href)\s*=\s*\"?https?:", done.stdout)


def test_sample_report_screenshot(sample_page, tmp_path: Path) -> None:
    # A full-width rendering: a PNG of the asked size that is not blank (the pictures and
    # text drew). Kept at STANCHION_HTML_SCREENSHOT when set, to look at.
    import os

    from PIL import Image

    page, _ = sample_page
    shot = tmp_path / "report.png"
    done = _chromium(page, f"--screenshot={shot}", "--window-size=1280,2000",
                     "--hide-scrollbars")
    assert done.returncode == 0 and shot.is_file(), done.stderr[-2000:]
    assert _console(done.stderr) == []
    image = Image.open(shot).convert("L")
    assert image.size == (1280, 2000)
    histogram = image.histogram()
    dark = sum(histogram[:128])
    assert dark > 0.005 * 1280 * 2000  # text and marks, not an empty page
    keep = os.environ.get("STANCHION_HTML_SCREENSHOT")
    if keep:
        shutil.copy(shot, keep)
