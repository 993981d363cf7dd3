"""The load takedown project file (service.takedown_project, docs/design.md §5)."""

from __future__ import annotations

from pathlib import Path

import pytest

from stanchion.engine.takedown import LevelLoads
from stanchion.service.errors import InputError
from stanchion.service.takedown_project import load_project, parse_project

EXAMPLE = Path(__file__).resolve().parents[2] / "sample_models" / "takedown_example.toml"
#: 1 ksi in Pa: 1000 x 0.45359237 kg x 9.80665 m/s² / 0.0254² m² (NIST SP 811 definitions)
KSI_PA = 1000 * 0.45359237 * 9.80665 / 0.0254**2
#: 1 kip/in³ in kN/m³ (same definitions)
KCI_KNM3 = 0.45359237 * 9.80665 / 0.0254**3

ISSUE_EXAMPLE = """
units = "SI"                 # SI: kPa and kN/m3; US: psf and pcf
[storeys.default]            # every storey not named below
D = 1.5
L = 2.4
[storeys."Roof"]             # a storey by its name
D = 1.0
Lr = 1.0
S = 1.5
[options]
slab_density = 24.0
live_load_reduction = true
"""


def test_the_issue_example_in_engine_units():
    p = parse_project(ISSUE_EXAMPLE)
    floor = p.level_loads("Level 2")  # not named: the default
    assert floor is not None
    # 1.5 kPa = 1,500 Pa / 6,894,757 Pa per ksi = 2.1756e-4 ksi (NIST SP 811)
    assert floor.D == pytest.approx(1500 / KSI_PA)
    assert floor.L == pytest.approx(2400 / KSI_PA)
    assert floor.Lr == 0.0 and floor.S == 0.0
    # 24 kN/m³ = 24 / 271,447 kN/m³ per kip/in³ = 8.8415e-5 kip/in³
    assert floor.slab_density == pytest.approx(24.0 / KCI_KNM3)
    assert floor.live_load_reduction is True and floor.use == "normal"
    roof = p.level_loads("Roof")
    assert roof is not None
    # a named storey takes exactly its own values: no L from the default
    assert roof.L == 0.0
    assert roof.S == pytest.approx(1500 / KSI_PA)


def test_us_units():
    p = parse_project('units = "US"\n[storeys.default]\nL = 50\n[options]\nslab_density = 150\n')
    loads = p.level_loads("any")
    assert loads is not None
    # 50 psf = 50 / 144 psi = 3.4722e-4 ksi; 150 pcf = 0.15 kip / 1,728 in³
    assert loads.L == pytest.approx(50 / 144 / 1000)
    assert loads.slab_density == pytest.approx(0.150 / 1728)
    assert loads.live_load_reduction is False  # off unless asked for (conservative)


def test_storey_without_loads_when_there_is_no_default():
    p = parse_project('units = "US"\n[storeys.Roof]\nLr = 20\n[options]\nslab_density = 0\n')
    assert p.level_loads("Level 1") is None
    assert p.unused_storeys(["Level 1"]) == ["Roof"]
    assert p.unused_storeys(["Roof"]) == []


def test_the_shipped_example():
    p = load_project(EXAMPLE)
    assert p.units == "SI"
    garage = p.level_loads("Level 1 - Parking")
    assert isinstance(garage, LevelLoads) and garage.use == "garage"
    hall = p.level_loads("Level 4 - Auditorium")
    assert hall is not None and hall.use == "assembly"
    roof = p.level_loads("Roof")
    assert roof is not None and roof.live_load_reduction is False
    office = p.level_loads("Level 2 - Offices")
    assert office is not None and office.live_load_reduction is True


@pytest.mark.parametrize(
    ("text", "key"),
    [
        ('units = "SI"\n[options]\nslab_density = true\n', "options.slab_density"),  # a bool
        ('units = "SI"\n[storeys.a]\nL = "2.4"\n[options]\nslab_density = 24\n', "storeys.a.L"),
        ('units = "SI"\n[storeys.a]\nL = -1\n[options]\nslab_density = 24\n', "storeys.a.L"),
        ('units = "SI"\n[storeys.a]\nL = nan\n[options]\nslab_density = 24\n', "storeys.a.L"),
        ('units = "SI"\n[storeys.a]\nLL = 2\n[options]\nslab_density = 24\n', "storeys.a.LL"),
        ('units = "SI"\n[storeys.a]\nuse = "office"\n[options]\nslab_density = 24\n',
         "storeys.a.use"),
        ('units = "SI"\n[storeys.a]\nlive_load_reduction = 1\n[options]\nslab_density = 24\n',
         "storeys.a.live_load_reduction"),
        ('units = "kPa"\n[options]\nslab_density = 24\n', "units"),
        ('units = "SI"\n', "options"),  # slab density must be given (0: in D)
        ('units = "SI"\n[options]\n', "options.slab_density"),
        ('units = "SI"\n[storeys.a]\nD = 60\n[options]\nslab_density = 24\n', "storeys.a.D"),
        ('units = "US"\n[options]\nslab_density = 2400\n', "options.slab_density"),  # kg/m3?
    ],
)
def test_unusable_files_name_the_key(text, key):
    with pytest.raises(InputError) as exc:
        parse_project(text, "p.toml")
    message = str(exc.value)
    assert message.startswith(f"p.toml: {key}")
    assert "\n" not in message
    assert exc.value.field == key


def test_not_toml_and_not_a_file(tmp_path):
    with pytest.raises(InputError, match="not valid TOML"):
        parse_project("units = SI")
    with pytest.raises(InputError, match="cannot read takedown project missing.toml"):
        load_project(tmp_path / "missing.toml")
    bad = tmp_path / "latin1.toml"
    bad.write_bytes(b'units = "\xe9"')
    with pytest.raises(InputError, match="cannot read"):
        load_project(bad)
