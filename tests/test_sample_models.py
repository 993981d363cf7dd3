"""Sample models (sample_models/) and ``stanchion demo``.

* Regenerating the samples gives byte-identical files (in this process and in a fresh
  interpreter with another hash seed).
* The committed models are schema-valid and read the way the generator meant: the analysis
  forces come back as compression, the load table rows match their columns by Tag.
* Checking them gives the committed ``expected_summary.json`` and exactly the failing /
  not-checked columns the scenario plants (sample_models/README.md).
* ``stanchion demo`` exits 0 and writes the four outputs; it exits 2 when the sample is
  missing.
"""

from __future__ import annotations

import importlib.util
import json
import math
import os
import subprocess
import sys
import xml.etree.ElementTree as ET
from pathlib import Path

import ifcopenshell
import ifcopenshell.validate
import numpy as np
import pandas as pd
import pytest
from bcf.v3.bcfxml import BcfXml

from stanchion.engine.members import LOAD_TYPES
from stanchion.engine.units import factor
from stanchion.ifc_bridge.model import open_model
from stanchion.ifc_bridge.read import read_columns
from stanchion.service.cli import demo as cmd_demo
from stanchion.service.cli import main
from stanchion.service.load_table import read_load_table
from tests.service.checking import check_file as check_model

ROOT = Path(__file__).resolve().parents[1]
SAMPLES = ROOT / "sample_models"
GENERATED = ("workshop_annex.ifc", "garden_pavilion.ifc", "garden_pavilion_loads.csv")
#: Size limit for committed samples (common practice, no source: small enough to review).
MAX_BYTES = 300_000


def _load_generator():
    spec = importlib.util.spec_from_file_location("sample_models_generate",
                                                  SAMPLES / "generate.py")
    module = importlib.util.module_from_spec(spec)
    spec.loader.exec_module(module)
    return module


gen = _load_generator()


def _first_difference(a: bytes, b: bytes) -> str:
    la, lb = a.decode().splitlines(), b.decode().splitlines()
    for i, (x, y) in enumerate(zip(la, lb, strict=False)):
        if x != y:
            return f"line {i + 1}:\n  committed:   {x[:200]}\n  regenerated: {y[:200]}"
    return f"line counts differ: {len(la)} vs {len(lb)}"


@pytest.fixture(scope="module")
def regenerated(tmp_path_factory) -> Path:
    folder = tmp_path_factory.mktemp("regenerated")
    gen.write_samples(folder)
    return folder


@pytest.fixture(scope="module")
def summary() -> dict:
    return json.loads((SAMPLES / gen.SUMMARY).read_text(encoding="utf-8"))


# ---------------------------------------------------------------- reproducibility


@pytest.mark.parametrize("name", GENERATED)
def test_regenerated_file_is_byte_identical(regenerated, summary, name):
    committed, fresh = (SAMPLES / name).read_bytes(), (regenerated / name).read_bytes()
    made_with = summary.get("generated_with", {}).get("ifcopenshell")
    assert fresh == committed, (
        f"{name} differs from a fresh run of sample_models/generate.py "
        f"({_first_difference(committed, fresh)}); committed with ifcopenshell {made_with}, "
        f"running {ifcopenshell.version}. If the change is intended, rerun the generator "
        "and commit its files")


def test_generator_script_is_reproducible_in_a_fresh_interpreter(tmp_path, regenerated):
    env = dict(os.environ, PYTHONHASHSEED="12345")  # another set / dict iteration order
    done = subprocess.run(
        [sys.executable, str(SAMPLES / "generate.py"), "--out-dir", str(tmp_path),
         "--no-summary"], capture_output=True, text=True, env=env, cwd=tmp_path, timeout=120)
    assert done.returncode == 0, done.stderr
    for name in GENERATED:
        assert (tmp_path / name).read_bytes() == (regenerated / name).read_bytes(), name


@pytest.mark.parametrize("name", GENERATED[:2])
def test_samples_are_small_and_schema_valid(name):
    path = SAMPLES / name
    assert path.stat().st_size < MAX_BYTES
    model = ifcopenshell.open(str(path))
    logger = ifcopenshell.validate.json_logger()
    ifcopenshell.validate.validate(model, logger)
    assert logger.statements == []


def test_sample_content_is_as_described():
    model = ifcopenshell.open(str(SAMPLES / "workshop_annex.ifc"))
    assert model.schema == "IFC4"
    assert len(model.by_type("IfcColumn")) == 40
    assert sorted(s.Name for s in model.by_type("IfcBuildingStorey")) == [
        "Level 0 - Workshop", "Level 0M - Mezzanine", "Level 1 - Library annex",
        "Level 2 - Studios", "Roof"]
    # one slab per storey above the ground, the stair void through both floors
    assert len(model.by_type("IfcSlab")) == 4
    assert len(model.by_type("IfcOpeningElement")) == 2
    assert len(model.by_type("IfcStructuralAnalysisModel")) == 1
    # one analysis member per column except the post added after the analysis run
    assert len(model.by_type("IfcStructuralCurveMember")) == 39
    assert {c.Name[0] for c in model.by_type("IfcStructuralLoadCase")} == {"D", "L", "S", "W"}
    assert len(model.by_type("IfcStructuralResultGroup")) == len(gen.LOAD_CASES)
    gids = [e.GlobalId for e in model.by_type("IfcRoot")]
    assert len(set(gids)) == len(gids)
    pavilion = ifcopenshell.open(str(SAMPLES / "garden_pavilion.ifc"))
    assert pavilion.schema == "IFC2X3"
    assert len(pavilion.by_type("IfcColumn")) == 8
    assert not pavilion.by_type("IfcStructuralActivity")
    assert sorted(s.Name for s in pavilion.by_type("IfcSlab")) == [
        "Slab Level 1 - Lookout", "Slab Roof"]


# ---------------------------------------------------------------- what the reader sees


def test_workshop_loads_read_back_as_the_generated_forces():
    # Expected: the generator's own forces (kN, compression positive), converted with pint.
    # W is the larger of W1 / W2 in magnitude (ifc_bridge.load_cases: wind cases are
    # alternatives).  The round trip checks the sign convention: ForceX = -compression.
    forces = gen.workshop_forces(np.random.default_rng(gen.SEED))
    read = read_columns(open_model(SAMPLES / "workshop_annex.ifc"))
    kip_per_kn = factor("kN", "kip")
    members = read.members
    for i, name in enumerate(members.name):
        given = forces.get(str(name), {})
        got = dict(zip(LOAD_TYPES, members.loads[i], strict=True))
        for kind in ("D", "L", "Lr", "S"):
            if kind in given:
                assert got[kind] == pytest.approx(given[kind] * kip_per_kn, rel=1e-9), name
            else:
                assert math.isnan(got[kind]), (name, kind)
        winds = [given[w] for w in ("W1", "W2") if w in given]
        if winds:
            assert got["W"] == pytest.approx(max(winds, key=abs) * kip_per_kn, rel=1e-9)
    assert read.messages == []


def test_pavilion_table_rows_match_columns_by_tag():
    read = read_columns(open_model(SAMPLES / "garden_pavilion.ifc"),
                        loads_table=read_load_table(SAMPLES / "garden_pavilion_loads.csv"))
    table = pd.read_csv(SAMPLES / "garden_pavilion_loads.csv", dtype={"element": str})
    by_tag = table.set_index("element")
    members = read.members
    assert sorted(members.extra["tag"]) == sorted(by_tag.index)
    for i, tag in enumerate(members.extra["tag"]):
        for kind in ("D", "L", "Lr", "S", "W"):
            expected = by_tag.loc[tag, f"{kind} [kip]"]  # model and table are both in kip
            value = members.loads[i][LOAD_TYPES.index(kind)]
            if pd.isna(expected):
                assert math.isnan(value)
            else:
                assert value == pytest.approx(float(expected), rel=1e-12)
    assert read.messages == []


# ---------------------------------------------------------------- check results


@pytest.mark.parametrize("name", list(gen.CHECKS))
def test_check_reproduces_expected_summary(summary, name):
    # Expected: sample_models/expected_summary.json, recorded by running the real check
    # once (sample_models/generate.py); a regression record, not an independent value.
    expected = summary[name]
    table, takedown = expected["loads_table"], expected["takedown"]
    report = check_model(SAMPLES / gen.CHECKS[name][0],
                         loads_table=SAMPLES / table if table else None,
                         takedown=SAMPLES / takedown if takedown else None)
    assert sorted({m["load_source"] for m in report["members"]}) == expected["load_sources"]
    s = report["summary"]
    hint = ("the check no longer reproduces sample_models/expected_summary.json; if the "
            "engine / reader change is intended, rerun sample_models/generate.py and commit")
    for key in ("members", "pass", "fail", "not_checked"):
        assert s[key] == expected[key], f"{key}: {hint}"
    assert s["max_utilization"] == pytest.approx(expected["max_utilization"], rel=1e-3), hint
    assert sorted(m["name"] for m in report["members"] if m["status"] == "fail") == \
        expected["failing"]
    assert sorted(m["name"] for m in report["members"] if m["status"] == "not_checked") == \
        expected["not_checked_members"]


def test_workshop_fails_exactly_where_the_scenario_plants_problems():
    # Expected: the generator's scenario (sample_models/README.md): undersized section,
    # stair-void unbraced length, overloaded post fail; ungraded steel and the post without
    # results are not checked; every other column passes.
    report = check_model(SAMPLES / "workshop_annex.ifc")
    status = {m["name"]: m for m in report["members"]}
    planted_fail = set(gen.UNDERSIZED) | set(gen.STAIR_VOID) | {"P-M2"}
    no_results = {p[0] for p in gen.POSTS if not p[-1]}
    planted_nc = set(gen.NO_GRADE) | no_results
    assert {n for n, m in status.items() if m["status"] == "fail"} == planted_fail
    assert {n for n, m in status.items() if m["status"] == "not_checked"} == planted_nc
    for name in gen.NO_GRADE:
        assert "no yield strength" in status[name]["reason"]
    for name in no_results:
        assert "no loads" in status[name]["reason"]
    # A992 via Pset_MaterialSteel, A500 Gr C via the grade name (docs/design.md §5 order)
    sources = {m["fy_source"] for n, m in status.items() if n not in planted_nc}
    assert sources == {"material", "grade"}


def test_pavilion_takedown_by_hand():
    # Every column gets the takedown's loads; two deck columns within 1 % of a hand
    # takedown.  Pavilion (sample_models/generate.py): one 240 x 192 in bay; lookout slab
    # 5 in, y = -48 .. 192 (a 48 in balcony south of line 1), roof slab 3 in over the bay.
    # garden_pavilion_takedown.toml: lookout D 10, L 100 psf (assembly: not reduced, ASCE
    # 7-22 §4.7.5), roof D 8, Lr 20, S 25 psf, slabs 145 pcf.  Cells are quarter bays:
    # C-A1-L0 (0, 0): lookout 120 x 144 in = 120 ft², roof 120 x 96 in = 80 ft²;
    # C-A2-L0 (0, 192): lookout 120 x 96 in = 80 ft², roof 80 ft².  Self-weight: W6X15
    # 15 lb/ft x 12 ft and HSS3X3X3/16 6.87 lb/ft x 10 ft (AISC Shapes Database v16.0).
    report = check_model(SAMPLES / "garden_pavilion.ifc",
                         takedown=SAMPLES / gen.PAVILION_TAKEDOWN)
    rows = {m["name"]: m for m in report["members"]}
    assert {m["load_source"] for m in rows.values()} == {"takedown"}
    assert {m["status"] for m in rows.values()} == {"pass"}
    columns = 15.0 * 12.0 + 6.87 * 10.0
    for name, lookout in (("C-A1-L0", 120.0), ("C-A2-L0", 80.0)):
        D = (10.0 + 145.0 * 5.0 / 12.0) * lookout + (8.0 + 145.0 * 3.0 / 12.0) * 80.0 + columns
        L, roof_live, snow = 100.0 * lookout, 20.0 * 80.0, 25.0 * 80.0
        # ASCE 7-22 Eq. 2.3.1-2 governs: 1.2D + 1.6L + 0.5(Lr or S), here S
        want = (1.2 * D + 1.6 * L + 0.5 * max(roof_live, snow)) / 1000.0
        assert rows[name]["required_strength"] == pytest.approx(want, rel=0.01), name
        assert rows[name]["tributary_area"] == pytest.approx(lookout + 80.0, rel=1e-3)
        assert rows[name]["llr_factor"] == pytest.approx(1.0)


# ---------------------------------------------------------------- stanchion demo


def test_demo_writes_the_four_outputs(tmp_path, capsys, summary):
    out = tmp_path / "demo out"
    assert main(["demo", "--output-dir", str(out)]) == 0
    printed = capsys.readouterr().out
    paths = cmd_demo.output_paths(SAMPLES / "workshop_annex.ifc", out)
    for path in paths.values():
        assert path.is_file() and path.stat().st_size > 0
        assert str(path) in printed
    expected = summary["workshop_annex.ifc"]
    assert f"members {expected['members']}: {expected['pass']} pass" in printed
    # the takedown gives the post without analysis results its loads
    assert "load takedown (workshop_annex_takedown.toml)" in printed
    assert "  P-M4: tributary area" in printed
    report = json.loads(paths["JSON report"].read_text(encoding="utf-8"))
    assert report["summary"]["fail"] == expected["fail"]
    assert len(pd.read_csv(paths["CSV"])) == expected["members"]
    cases = ET.parse(paths["JUnit XML"]).getroot().iter("testcase")
    assert sum(1 for _ in cases) == expected["members"]
    checked = ifcopenshell.open(str(paths["checked model"]))
    psets = [p for p in checked.by_type("IfcPropertySet") if p.Name == "Stanchion_ColumnCheck"]
    assert len(psets) == expected["members"]
    issues = BcfXml.load(paths["BCF issues"])  # one topic per failing or not-checked column
    assert len(issues.topics) == expected["fail"] + expected["not_checked"]
    issues.close()


def test_demo_console_script_from_another_folder(tmp_path):
    done = subprocess.run(
        [sys.executable, "-m", "stanchion.service.cli", "demo", "--sample", "pavilion",
         "--output-dir", "out"], capture_output=True, text=True, cwd=tmp_path, timeout=120)
    assert done.returncode == 0, done.stderr
    assert len(list((tmp_path / "out").iterdir())) == 6  # model, JSON, CSV, JUnit, HTML, BCF


def test_demo_without_sample_exits_2_with_one_line(tmp_path, capsys, monkeypatch):
    monkeypatch.setattr(cmd_demo, "SAMPLE_DIR", tmp_path / "missing")
    out = tmp_path / "out"
    assert main(["demo", "--output-dir", str(out)]) == 2
    err = capsys.readouterr().err
    assert len(err.strip().splitlines()) == 1
    assert "workshop_annex.ifc not found" in err and "pip install -e" in err
    assert not out.exists()


def test_demo_pavilion_takedown_writes_its_own_outputs(tmp_path, capsys):
    out = tmp_path / "out"
    assert main(["demo", "--sample", "pavilion-takedown", "--output-dir", str(out)]) == 0
    printed = capsys.readouterr().out
    assert "load takedown (garden_pavilion_takedown.toml): estimated service loads for 8" \
        in printed
    paths = cmd_demo.output_paths(SAMPLES / "garden_pavilion.ifc", out,
                                  "garden_pavilion_takedown")
    assert all(p.is_file() for p in paths.values())
    report = json.loads(paths["JSON report"].read_text(encoding="utf-8"))
    assert report["source"]["takedown"] == "garden_pavilion_takedown.toml"
    assert {m["load_source"] for m in report["members"]} == {"takedown"}
