"""The one pipeline: members files and models through the same ``check``, with the same
refusals, baseline comparison and writers; the front ends only call it."""

from __future__ import annotations

import ast
import json
from pathlib import Path

import pytest
from pydantic import ValidationError

from stanchion.service import pipeline
from stanchion.service.errors import InputError
from stanchion.service.pipeline import CheckOptions, CheckRun, OutputPaths, check
from tests.service.test_model_check_files import write_model

SERVICE = Path(pipeline.__file__).resolve().parent
# docs/design.md §2 example member: W14X48, Fy 50 ksi, 16 ft, D 95 / L 60 / S 12 kip.
MEMBER = {"id": "C-12", "section": "W14X48", "fy": 50, "length": 16,
          "loads": {"D": 95.0, "L": 60.0, "S": 12.0}}


def _members_file(tmp_path: Path) -> Path:
    path = tmp_path / "members.json"
    path.write_text(json.dumps({"members": [MEMBER]}))
    return path


def test_members_file_and_model_go_through_the_same_check(tmp_path: Path) -> None:
    members = check(_members_file(tmp_path),
                    outputs=OutputPaths(report=tmp_path / "m.json", csv=tmp_path / "m.csv"))
    model = check(write_model(tmp_path / "tower.ifc"),
                  outputs=OutputPaths(report=tmp_path / "t.json", csv=tmp_path / "t.csv"))
    assert isinstance(members, CheckRun) and isinstance(model, CheckRun)
    assert (members.kind, model.kind) == ("members", "model")
    assert len(members.members) == 1 and len(model.members) == 3  # the standard test model
    for run, name in ((members, "m.json"), (model, "t.json")):
        assert json.loads((tmp_path / name).read_text()) == run.report
        assert (tmp_path / name.replace(".json", ".csv")).is_file()
    # 1.2D + 1.6L + 0.3S = 1.2·95 + 1.6·60 + 0.3·12 = 213.6 kip (ASCE 7-22 §2.3.1, hand)
    assert members.report["members"][0]["required_strength"] == pytest.approx(213.6)
    assert model.report["source"]["members"] == 3


def test_baseline_comparison_for_both_kinds(tmp_path: Path) -> None:
    for source in (_members_file(tmp_path), write_model(tmp_path / "tower.ifc")):
        first = tmp_path / f"{source.stem}-first.json"
        check(source, outputs=OutputPaths(report=first))
        again = check(source, CheckOptions(baseline=first)).report
        assert again["changes"]["baseline"] == first.name
        assert again["changes"]["counts"]["new_failures"] == 0  # nothing changed


@pytest.mark.parametrize("options", [
    {"loads_table": "loads.csv"}, {"include_members": True}, {"units": "si"},
    {"suggest": True},
])
def test_model_options_are_refused_for_a_members_file(tmp_path, options) -> None:
    with pytest.raises(InputError, match="applies to IFC models"):
        check(_members_file(tmp_path), CheckOptions(**options))


def test_a_checked_model_is_only_written_for_a_model(tmp_path: Path) -> None:
    with pytest.raises(InputError, match="--out applies to IFC models"):
        check(_members_file(tmp_path), outputs=OutputPaths(model=tmp_path / "x.ifc"))


@pytest.mark.parametrize("which", ["loads", "baseline"])
def test_no_output_overwrites_an_input(tmp_path: Path, which: str) -> None:
    model = write_model(tmp_path / "tower.ifc")
    table = tmp_path / "loads.csv"
    table.write_text("element,D\nC1,10\n")
    base = tmp_path / "base.json"
    check(model, outputs=OutputPaths(report=base))
    before = {p: p.read_bytes() for p in (table, base)}
    target = table if which == "loads" else base
    with pytest.raises(InputError, match="inputs are never overwritten"):
        check(model, CheckOptions(loads_table=table, baseline=base),
              OutputPaths(csv=target))
    assert {p: p.read_bytes() for p in (table, base)} == before


@pytest.mark.parametrize("bad", [{"utilization_limit": 0}, {"oversized": -1},
                                 {"change_threshold": -0.1}, {"method": "WSD"},
                                 {"units": "imperial"}, {"unknown": 1}])
def test_options_refuse_unusable_values(bad: dict) -> None:
    with pytest.raises(ValidationError):
        CheckOptions(**bad)


def test_suggestion_limits_go_with_suggest(tmp_path: Path) -> None:
    with pytest.raises(InputError, match="go with --suggest"):
        check(write_model(tmp_path / "tower.ifc"), CheckOptions(utilization_limit=0.9))


@pytest.mark.parametrize("module", ["pipeline.py", "model_check.py", "members_check.py",
                                    "jobs/worker.py", "suggestions.py"])
def test_the_pipeline_knows_nothing_of_the_command_line(module: str) -> None:
    tree = ast.parse((SERVICE / module).read_text())
    imported = {a.name for n in ast.walk(tree) if isinstance(n, ast.Import) for a in n.names}
    imported |= {n.module for n in ast.walk(tree) if isinstance(n, ast.ImportFrom) and n.module}
    assert "argparse" not in imported or module == "jobs/worker.py"  # the worker's own argv
    assert not any(m.startswith("stanchion.service.cli") for m in imported)


def test_the_front_ends_call_the_pipeline(tmp_path: Path, monkeypatch) -> None:
    from stanchion.service.cli import main
    from stanchion.service.jobs import worker

    calls = []
    real = pipeline.check

    def spy(source, options=None, outputs=None, progress=None):
        calls.append(Path(source).suffix)
        return real(source, options, outputs, progress)

    monkeypatch.setattr(pipeline, "check", spy)
    monkeypatch.setattr("stanchion.service.cli.check.check", spy)
    monkeypatch.setattr(worker, "check", spy)
    model = write_model(tmp_path / "tower.ifc")
    assert main(["check", str(_members_file(tmp_path)), "--quiet"]) == 0
    assert main(["check", str(model), "--quiet"]) == 1  # C2 fails, C3 is not checked
    job = tmp_path / "job"
    job.mkdir()
    (job / "model.ifc").write_bytes(model.read_bytes())
    (job / "job.json").write_text(json.dumps({"model": "model.ifc", "filename": "t.ifc",
                                              "design_method": "LRFD", "loads": None}))
    assert worker.run_job(job)["status"] == "done"
    assert calls == [".json", ".ifc", ".ifc"]


def test_messages_name_an_option_as_the_front_end_does() -> None:
    # the command line names its option; an HTTP job names its form field (docs/design.md §6)
    assert CheckOptions().option_name("--force-unit") == "--force-unit"
    http = CheckOptions(front_end="HTTP job")
    assert http.option_name("--force-unit") == "the job's force_unit"
    assert http.option_name("--default-grade") == "the job's default_grade"
