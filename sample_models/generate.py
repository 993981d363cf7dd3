"""Build the sample IFC models of an invented building (demo data, reproducible).

Run from the repository root (with the project installed, ``pip install -e .``)::

    .venv/bin/python sample_models/generate.py            # models, load table, summary
    .venv/bin/python sample_models/generate.py --out-dir /tmp/x --no-summary

Outputs (see ``sample_models/README.md`` for the scenario):

* ``workshop_annex.ifc`` -- IFC4, millimetre / kilonewton / megapascal: a three-storey
  community workshop with a library annex and studios above, 40 columns (W and HSS) with
  analysis results (IfcStructuralAnalysisModel, one IfcStructuralCurveMember per column,
  load cases D, L, Lr, S, W1, W2 and their IfcStructuralResultGroup of
  IfcStructuralCurveReaction forces), slabs per storey (a mezzanine and a roof storey of
  their own, a stair void, a balcony) for the load takedown.
* ``garden_pavilion.ifc`` -- IFC2X3, inch / kip / ksi: a two-storey pavilion of 8 columns
  whose loads come from ``garden_pavilion_loads.csv`` (rows keyed by the columns' Tags), or
  from the slabs of its lookout floor and roof with the load takedown.
* ``expected_summary.json`` -- the counts of a real ``pipeline.check`` run on both, the
  workshop with ``workshop_annex_takedown.toml`` and the pavilion once with its load table and
  once with ``garden_pavilion_takedown.toml`` (not written with ``--no-summary``).  The two
  takedown project files are written by hand, not generated.

Every number below -- grid, storey heights, area loads, wind forces, sections picked, the
scatter added to the forces -- is invented demo data, chosen only so that the sample shows
passing, failing and not-checked columns.  None of it is a design.

Reproducible: a seeded numpy generator gives the scatter and the GlobalIds (UUIDs from the
generator's bytes, compressed with ``ifcopenshell.guid``); owner-history dates and the file
header are fixed; relationship sets are written in entity order.  Running it twice gives
byte-identical files (tests/test_sample_models.py checks that).

The models are built with ``ifcopenshell.api`` (building blocks in
``sample_models/ifc_parts.py``); the few resource entities the api has no function for
(vertices and edges of the analysis members, directions, IFC2X3 steel properties) are made
with ``file.create_entity``.
"""

from __future__ import annotations

import argparse
import json
import sys
from pathlib import Path

import ifcopenshell
import ifcopenshell.api.material
import ifcopenshell.api.owner
import ifcopenshell.api.pset
import ifcopenshell.api.unit
import numpy as np

HERE = Path(__file__).resolve().parent
if str(HERE.parent) not in sys.path:  # run as a script from a checkout
    sys.path.insert(0, str(HERE.parent))

from sample_models.ifc_parts import (  # noqa: E402
    analysis_model,
    api,
    catalog_profile,
    catalog_row,
    column,
    contexts,
    design,
    finish,
    grid,
    slab,
    spatial,
    storey,
)
from stanchion.engine.units import factor  # noqa: E402

SEED = 360_22  # any fixed number; the samples depend on it
WORKSHOP = "workshop_annex.ifc"
PAVILION = "garden_pavilion.ifc"
PAVILION_LOADS = "garden_pavilion_loads.csv"
#: Load takedown project files (written by hand, not generated; docs/design.md §5).
WORKSHOP_TAKEDOWN = "workshop_annex_takedown.toml"
PAVILION_TAKEDOWN = "garden_pavilion_takedown.toml"
SUMMARY = "expected_summary.json"

# ---------------------------------------------------------------- demo data: workshop annex
#: Plan grid, mm (demo data).
GRID_X = {"A": 0.0, "B": 8000.0, "C": 16000.0, "D": 24000.0}
GRID_Y = {"1": 0.0, "2": 7500.0, "3": 15000.0}
#: (key, storey name, elevation mm, column height mm) -- demo data.
LEVELS = (("L0", "Level 0 - Workshop", 0.0, 4800.0),
          ("L1", "Level 1 - Library annex", 4800.0, 4200.0),
          ("L2", "Level 2 - Studios", 9000.0, 4200.0))
#: Area loads (kPa) carried at the top of each level's columns -- demo data, not a code
#: value: level 1 floor (library), level 2 floor (studios), roof.  S stands for the roof snow
#: load effect the engine's ASCE 7-22 combinations expect (strength-level snow).
AREA_LOADS = {"L0": {"D": 4.0, "L": 4.8}, "L1": {"D": 4.0, "L": 2.4},
              "L2": {"D": 1.2, "Lr": 1.0, "S": 1.4}}
#: Wind axial force (kN) on an extreme grid line, by level, for W1 (along x) and W2
#: (along y); linear in plan position, zero on the centre line -- demo data.
WIND = {"L0": (90.0, 140.0), "L1": (45.0, 70.0), "L2": (15.0, 25.0)}
#: Sections by level and plan position -- demo picks.
SECTIONS = {"L0": {"interior": "W14X61", "edge": "W12X40", "corner": "HSS6X6X3/8"},
            "L1": {"interior": "W12X40", "edge": "W10X33", "corner": "HSS6X6X1/4"},
            "L2": {"interior": "W8X31", "edge": "W8X24", "corner": "HSS5X5X3/16"}}
#: Deliberate problems of this design-development snapshot (demo scenario).
UNDERSIZED = {"C-C2-L0": "W10X33"}  # still the preliminary section
NO_GRADE = {"C-D3-L2"}  # material modelled as plain "Steel"
#: Column at the stair void: not braced by the level-1 floor (Stanchion_Design, mm).
STAIR_VOID = {"C-A2-L0": {"UnbracedLengthX": 9000.0, "UnbracedLengthY": 9000.0}}
#: Girts at mid-height brace the level-0 edge columns about their minor axis (mm).
GIRT_BRACED_Y = 2400.0
#: Mezzanine posts in the workshop: (name, x, y, section, tributary m2, D kPa, L kPa,
#: has analysis results) -- demo data.  M2 carries a storage area, M4 was added after the
#: analysis run.
POSTS = (("P-M1", 4000.0, 3750.0, "HSS4X4X1/4", 16.0, 3.0, 6.0, True),
         ("P-M2", 12000.0, 3750.0, "HSS4X4X1/4", 20.0, 3.0, 14.0, True),
         ("P-M3", 20000.0, 3750.0, "HSS4.500X0.237", 16.0, 3.0, 6.0, True),
         ("P-M4", 20000.0, 11250.0, "HSS4.500X0.237", 16.0, 3.0, 6.0, False))
POST_HEIGHT = 2400.0
POST_K = 1.2  # Stanchion_Design KX = KY on the posts (demo value)
#: Relative scatter (standard deviation) put on every analysis force (demo data).
SCATTER = 0.02
#: (case key, name, ActionType, ActionSource, description) -- mapped by ifc_bridge.load_cases.
LOAD_CASES = (("D", "D - dead", "PERMANENT_G", "DEAD_LOAD_G", "self weight and floors"),
              ("L", "L - floor live", "VARIABLE_Q", "LIVE_LOAD_Q", "occupancy, floors"),
              ("Lr", "Lr - roof live", "VARIABLE_Q", "LIVE_LOAD_Q", "roof maintenance"),
              ("S", "S - snow", "VARIABLE_Q", "SNOW_S", "balanced roof snow"),
              ("W1", "W1 - wind along x", "VARIABLE_Q", "WIND_W", "wind east-west"),
              ("W2", "W2 - wind along y", "VARIABLE_Q", "WIND_W", "wind north-south"))

#: Slabs (demo data, mm): (storey key, storey name or None for a LEVELS storey, elevation,
#: thickness, outline corners, openings).  Each slab's top is at its storey's elevation;
#: the mezzanine (an L-shaped platform on the four posts, whose tops are at 2.4 m) and the
#: roof get storeys of their own.  The stair void beside line A between lines 2 and 3
#: pierces both floors; the studios floor has a 1.5 m balcony cantilevered beyond line 1.
STAIR = (300.0, 6000.0, 3300.0, 9000.0)
SLABS = (("M", "Level 0M - Mezzanine", 2400.0, 150.0,
          [(2000.0, 1500.0), (22000.0, 1500.0), (22000.0, 12500.0), (18000.0, 12500.0),
           (18000.0, 6000.0), (2000.0, 6000.0)], ()),
         ("L1", None, 4800.0, 130.0,
          [(0.0, 0.0), (24000.0, 0.0), (24000.0, 15000.0), (0.0, 15000.0)], (STAIR,)),
         ("L2", None, 9000.0, 130.0,
          [(0.0, -1500.0), (24000.0, -1500.0), (24000.0, 15000.0), (0.0, 15000.0)], (STAIR,)),
         ("R", "Roof", 13200.0, 130.0,
          [(0.0, 0.0), (24000.0, 0.0), (24000.0, 15000.0), (0.0, 15000.0)], ()))

# ---------------------------------------------------------------- demo data: pavilion
PAVILION_GRID_X = {"A": 0.0, "B": 240.0}  # in
PAVILION_GRID_Y = {"1": 0.0, "2": 192.0}
PAVILION_LEVELS = (("L0", "Level 0 - Deck", 0.0, 144.0, "W6X15"),
                   ("L1", "Level 1 - Lookout", 144.0, 120.0, "HSS3X3X3/16"))
#: Slabs (demo data, in): the lookout floor (5 in, a 4 ft balcony cantilevered south of
#: line 1) and the roof (3 in) on a storey of its own; tops at the storeys' elevations.
PAVILION_SLABS = (("L1", None, 144.0, 5.0,
                   [(0.0, -48.0), (240.0, -48.0), (240.0, 192.0), (0.0, 192.0)]),
                  ("R", "Roof", 264.0, 3.0,
                   [(0.0, 0.0), (240.0, 0.0), (240.0, 192.0), (0.0, 192.0)]))
#: Service loads per column (kip) before scatter: lower columns carry the lookout floor and
#: the roof, upper columns the roof only (demo data).
PAVILION_LOADS_KIP = {"L0": {"D": 6.4, "L": 8.0, "Lr": 1.6, "S": 2.4, "W": 1.5},
                      "L1": {"D": 1.6, "Lr": 1.6, "S": 2.4, "W": 0.6}}

MM_PER_IN = factor("inch", "millimeter")
KN_PER_M_PER_LB_FT = factor("lbf/foot", "kN/m")


def _scatter(rng: np.random.Generator, value: float) -> float:
    """``value`` with a little demo scatter, rounded to 0.1 (one RNG draw per call)."""
    return round(float(value) * (1.0 + SCATTER * rng.standard_normal()), 1)


# ---------------------------------------------------------------- workshop annex (IFC4)


def _position(gx: str, gy: str) -> str:
    on_x_edge = gx in ("A", "D")
    on_y_edge = gy in ("1", "3")
    if on_x_edge and on_y_edge:
        return "corner"
    return "edge" if on_x_edge or on_y_edge else "interior"


def _tributary(gx: str, gy: str) -> float:
    """Tributary area, m2 (half bays at the edges)."""
    xs, ys = sorted(GRID_X.values()), sorted(GRID_Y.values())

    def half(values, v):
        i = values.index(v)
        left = (values[i] - values[i - 1]) / 2 if i > 0 else 0.0
        right = (values[i + 1] - values[i]) / 2 if i < len(values) - 1 else 0.0
        return (left + right) / 1000.0

    return half(xs, GRID_X[gx]) * half(ys, GRID_Y[gy])


def workshop_forces(rng: np.random.Generator) -> dict[str, dict[str, float]]:
    """Axial compression (kN, compression positive) per column and load case -- demo data.

    Each column carries the area loads of its tributary area at its own and every higher
    level, plus the self weight of the columns above and itself; wind is linear in plan
    position.  Mezzanine posts carry only their own tributary loads (no wind).
    """
    forces: dict[str, dict[str, float]] = {}
    keys = [lv[0] for lv in LEVELS]
    cx, cy = np.mean(list(GRID_X.values())), np.mean(list(GRID_Y.values()))
    hx, hy = max(GRID_X.values()) - cx, max(GRID_Y.values()) - cy
    for gy in GRID_Y:
        for gx in GRID_X:
            area = _tributary(gx, gy)
            for i, key in enumerate(keys):
                name = f"C-{gx}{gy}-{key}"
                total = {"D": 0.0, "L": 0.0, "Lr": 0.0, "S": 0.0}
                for above, height in ((k, lv[3]) for k, lv in zip(keys, LEVELS, strict=True)
                                      if keys.index(k) >= i):
                    for case, kpa in AREA_LOADS[above].items():
                        total[case] += kpa * area
                    section = UNDERSIZED.get(f"C-{gx}{gy}-{above}") or \
                        SECTIONS[above][_position(gx, gy)]
                    total["D"] += (catalog_row(section)["weight"] * KN_PER_M_PER_LB_FT
                                   * height / 1000.0)
                w1, w2 = WIND[key]
                total["W1"] = w1 * (GRID_X[gx] - cx) / hx
                total["W2"] = w2 * (GRID_Y[gy] - cy) / hy
                forces[name] = {c: _scatter(rng, v) for c, v in total.items() if v != 0.0}
    for name, _x, _y, section, area, dead, live, has_results in POSTS:
        if has_results:
            weight = catalog_row(section)["weight"] * KN_PER_M_PER_LB_FT * POST_HEIGHT / 1000
            forces[name] = {"D": _scatter(rng, dead * area + weight),
                            "L": _scatter(rng, live * area)}
    return forces


def _column_types(model: ifcopenshell.file, materials: dict, length_per_in: float):
    """A getter ``(section, material key) -> (IfcColumnType, profile)``, made on first use.

    Each type carries an IfcMaterialProfileSet (the catalog profile and the material); the
    api gives every occurrence assigned to it an IfcMaterialProfileSetUsage.
    """
    types: dict[tuple[str, str], ifcopenshell.entity_instance] = {}
    profiles: dict[str, ifcopenshell.entity_instance] = {}

    def get(section: str, material: str):
        key = (section, material)
        if key not in types:
            if section not in profiles:
                profiles[section] = catalog_profile(model, section, length_per_in)[0]
            ctype = api(model, "IfcColumnType", name=f"{section} {material}",
                        predefined_type="COLUMN")
            pset = ifcopenshell.api.material.add_material_set(
                model, name=f"{section} {material}", set_type="IfcMaterialProfileSet")
            ifcopenshell.api.material.add_profile(
                model, profile_set=pset, material=materials[material], profile=profiles[section])
            ifcopenshell.api.material.assign_material(
                model, products=[ctype], type="IfcMaterialProfileSet", material=pset)
            types[key] = ctype
        return types[key], profiles[section]

    return get


def _steel_materials(model: ifcopenshell.file) -> dict:
    """A992 (Pset_MaterialSteel), A500 Gr C (grade in the name), and an ungraded steel."""
    a992 = ifcopenshell.api.material.add_material(model, name="ASTM A992", category="steel")
    pset = ifcopenshell.api.pset.add_pset(model, product=a992, name="Pset_MaterialSteel")
    # ASTM A992/A992M: Fy = 345 MPa (50 ksi) min., Fu = 450 MPa (65 ksi) min.
    ifcopenshell.api.pset.edit_pset(model, pset=pset, properties={
        "YieldStress": model.create_entity("IfcPressureMeasure", 345.0),
        "UltimateStress": model.create_entity("IfcPressureMeasure", 450.0)})
    a500 = ifcopenshell.api.material.add_material(model, name="ASTM A500 Grade C",
                                                  category="steel")
    plain = ifcopenshell.api.material.add_material(model, name="Steel", category="steel")
    plain.Description = "grade to be confirmed"
    return {"A992": a992, "A500C": a500, "plain": plain}


def build_workshop(seed: int = SEED) -> ifcopenshell.file:
    """The IFC4 sample: three storeys, 36 grid columns and 4 mezzanine posts, with results."""
    rng = np.random.default_rng(seed)
    model = ifcopenshell.file(schema="IFC4")
    project = api(model, "IfcProject", name="Community workshop and library annex (demo)")
    project.Description = "Invented sample building for stanchion; all data is demo data."
    units = [ifcopenshell.api.unit.add_si_unit(model, unit_type="LENGTHUNIT", prefix="MILLI"),
             ifcopenshell.api.unit.add_si_unit(model, unit_type="AREAUNIT"),
             ifcopenshell.api.unit.add_si_unit(model, unit_type="VOLUMEUNIT"),
             ifcopenshell.api.unit.add_si_unit(model, unit_type="PLANEANGLEUNIT"),
             ifcopenshell.api.unit.add_si_unit(model, unit_type="FORCEUNIT", prefix="KILO"),
             ifcopenshell.api.unit.add_si_unit(model, unit_type="PRESSUREUNIT", prefix="MEGA")]
    ifcopenshell.api.unit.assign_unit(model, units=units)
    ctx = contexts(model)
    mm = 0.001
    building, storeys = spatial(model, project, "Demo site", "Workshop annex", LEVELS, mm)
    grid(model, storeys["L0"], GRID_X, GRID_Y, mm, 2000.0)
    for key, name, elevation, thickness, corners, openings in SLABS:
        held = storeys[key] if name is None else storey(model, building, name, elevation, mm)
        slab(model, ctx, held, f"Slab {held.Name}", corners, elevation, thickness, mm,
             openings)
    materials = _steel_materials(model)
    column_type = _column_types(model, materials, MM_PER_IN)

    columns: dict[str, tuple[ifcopenshell.entity_instance, tuple, float]] = {}
    for key, _name, elevation, height in LEVELS:
        for gy in GRID_Y:
            for gx in GRID_X:
                name = f"C-{gx}{gy}-{key}"
                position = _position(gx, gy)
                section = UNDERSIZED.get(name) or SECTIONS[key][position]
                grade = "plain" if name in NO_GRADE else (
                    "A500C" if section.startswith("HSS") else "A992")
                col = column(model, ctx, storeys[key], *column_type(section, grade), name,
                             f"{gx}{gy}/{key}", (GRID_X[gx], GRID_Y[gy]), height, mm)
                if name in STAIR_VOID:
                    design(model, col, {"KX": ("IfcPositiveRatioMeasure", 1.0),
                                        "KY": ("IfcPositiveRatioMeasure", 1.0),
                                        **{k: ("IfcLengthMeasure", v)
                                           for k, v in STAIR_VOID[name].items()}})
                elif key == "L0" and position == "edge":
                    design(model, col, {"UnbracedLengthY": ("IfcLengthMeasure",
                                                            GIRT_BRACED_Y)})
                columns[name] = (col, (GRID_X[gx], GRID_Y[gy], elevation), height)
    for name, x, y, section, *_rest in POSTS:
        col = column(model, ctx, storeys["L0"], *column_type(section, "A500C"), name,
                     f"{name[2:]}/L0", (x, y), POST_HEIGHT, mm)
        design(model, col, {"KX": ("IfcPositiveRatioMeasure", POST_K),
                            "KY": ("IfcPositiveRatioMeasure", POST_K)})
        columns[name] = (col, (x, y, 0.0), POST_HEIGHT)

    analysis_model(model, ctx[2], building, columns, workshop_forces(rng), LOAD_CASES)
    finish(model, rng, WORKSHOP)
    return model


# ---------------------------------------------------------------- garden pavilion (IFC2X3)


def build_pavilion(seed: int = SEED + 1) -> tuple[ifcopenshell.file, str]:
    """The IFC2X3 sample (inch / kip / ksi) and its CSV load table text."""
    rng = np.random.default_rng(seed)
    model = ifcopenshell.file(schema="IFC2X3")
    developer = ifcopenshell.api.owner.add_organisation(
        model, identification="DEMO", name="stanchion sample data (invented)")
    ifcopenshell.api.owner.add_application(
        model, application_developer=developer, version="1",
        application_full_name="stanchion sample generator",
        application_identifier="stanchion-samples")
    person = ifcopenshell.api.owner.add_person(
        model, identification="sample-author", family_name="Author", given_name="Sample")
    ifcopenshell.api.owner.add_person_and_organisation(model, person=person,
                                                       organisation=developer)
    project = api(model, "IfcProject", name="Garden pavilion (demo)")
    project.Description = "Invented sample building for stanchion; all data is demo data."
    units = [ifcopenshell.api.unit.add_conversion_based_unit(model, name=n)
             for n in ("inch", "kip", "ksi")]
    ifcopenshell.api.unit.assign_unit(model, units=units)
    ctx = contexts(model)
    inch = MM_PER_IN / 1000.0
    building, storeys = spatial(model, project, "Demo site", "Garden pavilion",
                                PAVILION_LEVELS, inch)
    grid(model, storeys["L0"], PAVILION_GRID_X, PAVILION_GRID_Y, inch, 48.0)
    for key, name, elevation, thickness, corners in PAVILION_SLABS:
        held = storeys[key] if name is None else storey(model, building, name, elevation, inch)
        slab(model, ctx, held, f"Slab {held.Name}", corners, elevation, thickness, inch)
    a992 = ifcopenshell.api.material.add_material(model, name="ASTM A992")
    # IFC2X3 steel properties: ASTM A992/A992M Fy = 50 ksi min. (model pressure unit ksi)
    model.create_entity("IfcMechanicalSteelMaterialProperties", Material=a992,
                        YieldStress=50.0)
    a500 = ifcopenshell.api.material.add_material(model, name="ASTM A500 Grade C")
    rows = ["element,D [kip],L [kip],Lr [kip],S [kip],W [kip]"]
    mark = 0
    for key, _name, _elevation, height, section in PAVILION_LEVELS:
        profile, _row = catalog_profile(model, section, 1.0)
        material = a500 if section.startswith("HSS") else a992
        ctype = api(model, "IfcColumnType", name=f"{section} {material.Name}",
                    predefined_type="COLUMN")
        ifcopenshell.api.material.assign_material(model, products=[ctype], type="IfcMaterial",
                                                  material=material)
        for gy in PAVILION_GRID_Y:
            for gx in PAVILION_GRID_X:
                mark += 1
                name = f"C-{gx}{gy}-{key}"
                column(model, ctx, storeys[key], ctype, profile, name, f"PV{mark:02d}",
                       (PAVILION_GRID_X[gx], PAVILION_GRID_Y[gy]), height, inch)
                loads = PAVILION_LOADS_KIP[key]
                cells = [f"{_scatter(rng, loads[c]):.1f}" if c in loads else ""
                         for c in ("D", "L", "Lr", "S", "W")]
                rows.append(",".join([f"PV{mark:02d}", *cells]))
    finish(model, rng, PAVILION)
    return model, "\n".join(rows) + "\n"


# ---------------------------------------------------------------- outputs


def write_samples(out_dir: Path) -> list[Path]:
    """Write the two models and the load table into ``out_dir``; return the paths."""
    out_dir = Path(out_dir)
    out_dir.mkdir(parents=True, exist_ok=True)
    workshop = out_dir / WORKSHOP
    build_workshop().write(str(workshop))
    pavilion, table = build_pavilion()
    pavilion.write(str(out_dir / PAVILION))
    (out_dir / PAVILION_LOADS).write_text(table, encoding="utf-8", newline="\n")
    return [workshop, out_dir / PAVILION, out_dir / PAVILION_LOADS]


#: The checks recorded in the summary: key -> (model, load table, takedown project).
CHECKS = {WORKSHOP: (WORKSHOP, None, WORKSHOP_TAKEDOWN),
          PAVILION: (PAVILION, PAVILION_LOADS, None),
          f"{PAVILION} --takedown": (PAVILION, None, PAVILION_TAKEDOWN)}


def summarize(folder: Path) -> dict:
    """Check the samples with the real check (``CHECKS``) and keep what the tests compare.

    The takedown project files are read from this folder (they are written by hand).
    """
    from stanchion.service.pipeline import CheckOptions, check

    out = {}
    for key, (model_name, table, takedown) in CHECKS.items():
        options = CheckOptions(loads_table=Path(folder) / table if table else None,
                               takedown=HERE / takedown if takedown else None)
        report = check(Path(folder) / model_name, options).report
        s = report["summary"]
        by_status = {st: sorted(m["name"] for m in report["members"] if m["status"] == st)
                     for st in ("fail", "not_checked")}
        out[key] = {
            "schema": report["source"]["schema"], "loads_table": table, "takedown": takedown,
            "members": s["members"], "pass": s["pass"], "fail": s["fail"],
            "not_checked": s["not_checked"], "max_utilization": s["max_utilization"],
            "failing": by_status["fail"], "not_checked_members": by_status["not_checked"],
            "load_sources": sorted({m["load_source"] for m in report["members"]}),
        }
    return out


def main(argv: list[str] | None = None) -> int:
    """Command line: write the samples (and the expected summary)."""
    p = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    p.add_argument("--out-dir", type=Path, default=HERE, help="target folder (this folder)")
    p.add_argument("--no-summary", action="store_true",
                   help=f"do not run the check and write {SUMMARY}")
    args = p.parse_args(argv)
    for path in write_samples(args.out_dir):
        print(f"wrote {path} ({path.stat().st_size:,} bytes)")
    if not args.no_summary:
        summary = {"generated_with": {"ifcopenshell": ifcopenshell.version, "seed": SEED},
                   **summarize(args.out_dir)}
        target = args.out_dir / SUMMARY
        target.write_text(json.dumps(summary, indent=2) + "\n", encoding="utf-8")
        print(f"wrote {target}")
    return 0


if __name__ == "__main__":
    sys.exit(main())
