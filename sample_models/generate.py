"""Build the sample IFC models of an invented building (demo data, reproducible).

Run from the repository root (with the project installed, ``pip install -e .``)::

    .venv/bin/python sample_models/generate.py            # models, load table, summary
    .venv/bin/python sample_models/generate.py --out-dir /tmp/x --no-summary

Outputs (see ``sample_models/README.md`` for the scenario):

* ``workshop_annex.ifc`` -- IFC4, millimetre / kilonewton / megapascal: a three-storey
  community workshop with a library annex and studios above, 40 columns (W and HSS) with
  analysis results (IfcStructuralAnalysisModel, one IfcStructuralCurveMember per column,
  load cases D, L, Lr, S, W1, W2 and their IfcStructuralResultGroup of
  IfcStructuralCurveReaction forces).
* ``garden_pavilion.ifc`` -- IFC2X3, inch / kip / ksi: a two-storey pavilion of 8 columns
  whose loads come from ``garden_pavilion_loads.csv`` (rows keyed by the columns' Tags).
* ``expected_summary.json`` -- the counts of a real ``check_model`` run on both (not written
  with ``--no-summary``).

Every number below -- grid, storey heights, area loads, wind forces, sections picked, the
scatter added to the forces -- is invented demo data, chosen only so that the sample shows
passing, failing and not-checked columns.  None of it is a design.

Reproducible: a seeded numpy generator gives the scatter and the GlobalIds (UUIDs from the
generator's bytes, compressed with ``ifcopenshell.guid``); owner-history dates and the file
header are fixed; relationship sets are written in entity order.  Running it twice gives
byte-identical files (tests/test_sample_models.py checks that).

The model is built with ``ifcopenshell.api``; the few resource entities the api has no
function for (vertices and edges of the analysis members, directions, the shared placement,
IFC2X3 steel properties) are made with ``file.create_entity``.
"""

from __future__ import annotations

import argparse
import json
import sys
import uuid
from pathlib import Path

import ifcopenshell
import ifcopenshell.api.aggregate
import ifcopenshell.api.context
import ifcopenshell.api.geometry
import ifcopenshell.api.grid
import ifcopenshell.api.group
import ifcopenshell.api.material
import ifcopenshell.api.owner
import ifcopenshell.api.profile
import ifcopenshell.api.pset
import ifcopenshell.api.root
import ifcopenshell.api.spatial
import ifcopenshell.api.structural
import ifcopenshell.api.type
import ifcopenshell.api.unit
import ifcopenshell.guid
import numpy as np

HERE = Path(__file__).resolve().parent
if str(HERE.parent) not in sys.path:  # run as a script from a checkout
    sys.path.insert(0, str(HERE.parent))

from engine.catalog import catalog_frame  # noqa: E402
from engine.units import factor  # noqa: E402

SEED = 360_22  # any fixed number; the samples depend on it
WORKSHOP = "workshop_annex.ifc"
PAVILION = "garden_pavilion.ifc"
PAVILION_LOADS = "garden_pavilion_loads.csv"
SUMMARY = "expected_summary.json"
#: Fixed time of every owner history and of the file headers (2024-01-01 00:00 UTC).
FIXED_EPOCH = 1_704_067_200
FIXED_STAMP = "2024-01-01T00:00:00"
GENERATOR = "stanchion sample_models/generate.py"

# ---------------------------------------------------------------- demo data: workshop annex
#: Plan grid, mm (demo data).
GRID_X = {"A": 0.0, "B": 8000.0, "C": 16000.0, "D": 24000.0}
GRID_Y = {"1": 0.0, "2": 7500.0, "3": 15000.0}
#: (key, storey name, elevation mm, column height mm) -- demo data.
LEVELS = (("L0", "Level 0 - Workshop", 0.0, 4800.0),
          ("L1", "Level 1 - Library annex", 4800.0, 4200.0),
          ("L2", "Level 2 - Studios", 9000.0, 4200.0))
#: Area loads (kPa) carried at the top of each level's columns -- demo data, not a code
#: value: level 1 floor (library), level 2 floor (studios), roof.
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

# ---------------------------------------------------------------- demo data: pavilion
PAVILION_GRID_X = {"A": 0.0, "B": 240.0}  # in
PAVILION_GRID_Y = {"1": 0.0, "2": 192.0}
PAVILION_LEVELS = (("L0", "Level 0 - Deck", 0.0, 144.0, "W6X15"),
                   ("L1", "Level 1 - Lookout", 144.0, 120.0, "HSS3X3X3/16"))
#: Service loads per column (kip) before scatter: lower columns carry the lookout floor and
#: the roof, upper columns the roof only (demo data).
PAVILION_LOADS_KIP = {"L0": {"D": 6.4, "L": 8.0, "Lr": 1.6, "S": 2.4, "W": 1.5},
                      "L1": {"D": 1.6, "Lr": 1.6, "S": 2.4, "W": 0.6}}

MM_PER_IN = factor("inch", "millimeter")
KN_PER_M_PER_LB_FT = factor("lbf/foot", "kN/m")


# ---------------------------------------------------------------- shared helpers


def _api(model: ifcopenshell.file, ifc_class: str, **kw) -> ifcopenshell.entity_instance:
    return ifcopenshell.api.root.create_entity(model, ifc_class=ifc_class, **kw)


def _catalog_row(designation: str) -> dict:
    frame = catalog_frame()
    rows = frame[frame["designation"] == designation]
    if rows.empty:
        raise KeyError(f"{designation} is not in the catalog")
    return rows.iloc[0].to_dict()


def catalog_profile(model: ifcopenshell.file, designation: str, length_per_in: float):
    """A parameterized profile named ``designation`` with the catalog's dimensions.

    Dimensions of the AISC Shapes Database v16.0 (engine catalog) converted to the model
    length unit.  I-shape FilletRadius = kdes - tf and HSS OuterFilletRadius = 1.5 tdes are
    approximations (common practice, no source); the reader ignores both when matching.
    """
    row = _catalog_row(designation)
    family = row["family"]

    def q(inches: float) -> float:
        return round(float(inches) * length_per_in, 3)

    if family == "W":
        prof = ifcopenshell.api.profile.add_parameterized_profile(
            model, ifc_class="IfcIShapeProfileDef")
        attrs = {"OverallDepth": q(row["d"]), "OverallWidth": q(row["bf"]),
                 "WebThickness": q(row["tw"]), "FlangeThickness": q(row["tf"]),
                 "FilletRadius": q(row["kdes"] - row["tf"])}
    elif family == "HSS":
        prof = ifcopenshell.api.profile.add_parameterized_profile(
            model, ifc_class="IfcRectangleHollowProfileDef")
        attrs = {"XDim": q(row["B"]), "YDim": q(row["Ht"]), "WallThickness": q(row["tnom"]),
                 "OuterFilletRadius": q(1.5 * row["tdes"])}
    elif family == "HSS_ROUND":
        prof = ifcopenshell.api.profile.add_parameterized_profile(
            model, ifc_class="IfcCircleHollowProfileDef")
        attrs = {"Radius": q(row["OD"] / 2.0), "WallThickness": q(row["tnom"])}
    else:
        raise ValueError(f"{designation}: family {family} is not used by the samples")
    prof.ProfileName = designation
    if model.schema == "IFC2X3":  # Position is not optional there
        prof.Position = model.create_entity("IfcAxis2Placement2D", model.create_entity(
            "IfcCartesianPoint", (0.0, 0.0)))
    for key, value in attrs.items():
        setattr(prof, key, value)
    return prof, row


def _contexts(model: ifcopenshell.file):
    root = ifcopenshell.api.context.add_context(model, context_type="Model")
    body = ifcopenshell.api.context.add_context(
        model, context_type="Model", context_identifier="Body", target_view="MODEL_VIEW",
        parent=root)
    axis = ifcopenshell.api.context.add_context(
        model, context_type="Model", context_identifier="Axis", target_view="GRAPH_VIEW",
        parent=root)
    ref = ifcopenshell.api.context.add_context(
        model, context_type="Model", context_identifier="Reference", target_view="GRAPH_VIEW",
        parent=root)
    return body, axis, ref


def _place(model, product, x_m: float, y_m: float, z_m: float) -> None:
    matrix = np.eye(4)
    matrix[:3, 3] = (x_m, y_m, z_m)
    ifcopenshell.api.geometry.edit_object_placement(model, product=product, matrix=matrix)


def _spatial(model, project, site_name: str, building_name: str, levels, length_m: float):
    """Site, building and named storeys (placed at their elevations)."""
    site = _api(model, "IfcSite", name=site_name)
    building = _api(model, "IfcBuilding", name=building_name)
    ifcopenshell.api.aggregate.assign_object(model, products=[site], relating_object=project)
    ifcopenshell.api.aggregate.assign_object(model, products=[building], relating_object=site)
    _place(model, site, 0.0, 0.0, 0.0)
    _place(model, building, 0.0, 0.0, 0.0)
    storeys = {}
    for key, name, elevation, *_ in levels:
        storey = _api(model, "IfcBuildingStorey", name=name)
        storey.Elevation = elevation
        ifcopenshell.api.aggregate.assign_object(model, products=[storey],
                                                 relating_object=building)
        _place(model, storey, 0.0, 0.0, elevation * length_m)
        storeys[key] = storey
    return building, storeys


def _grid(model, storey, xs: dict, ys: dict, length_m: float, margin: float) -> None:
    """An IfcGrid with lettered U axes (along y) and numbered V axes (along x)."""
    grid = _api(model, "IfcGrid", name="Structural grid")
    ifcopenshell.api.spatial.assign_container(model, products=[grid], relating_structure=storey)
    _place(model, grid, 0.0, 0.0, 0.0)
    x0, x1 = min(xs.values()) - margin, max(xs.values()) + margin
    y0, y1 = min(ys.values()) - margin, max(ys.values()) + margin
    for tag, x in xs.items():
        axis = ifcopenshell.api.grid.create_grid_axis(model, grid=grid, axis_tag=tag,
                                                      uvw_axes="UAxes")
        ifcopenshell.api.grid.create_axis_curve(
            model, p1=np.array((x, y0, 0.0)) * length_m, p2=np.array((x, y1, 0.0)) * length_m,
            grid_axis=axis)
    for tag, y in ys.items():
        axis = ifcopenshell.api.grid.create_grid_axis(model, grid=grid, axis_tag=tag,
                                                      uvw_axes="VAxes")
        ifcopenshell.api.grid.create_axis_curve(
            model, p1=np.array((x0, y, 0.0)) * length_m, p2=np.array((x1, y, 0.0)) * length_m,
            grid_axis=axis)


def _column(model, ctx, storey, ctype, profile, name: str, tag: str,
            at: tuple[float, float], height: float, length_m: float):
    """An IfcColumn of ``ctype`` with Body extrusion and Axis, placed at ``at``."""
    body, axis, _ = ctx
    col = _api(model, "IfcColumn", name=name)
    col.Tag = tag
    ifcopenshell.api.spatial.assign_container(model, products=[col], relating_structure=storey)
    _place(model, col, at[0] * length_m, at[1] * length_m, storey.Elevation * length_m)
    ifcopenshell.api.type.assign_type(model, related_objects=[col], relating_type=ctype)
    rep = ifcopenshell.api.geometry.add_profile_representation(
        model, context=body, profile=profile, depth=height * length_m)
    ifcopenshell.api.geometry.assign_representation(model, product=col, representation=rep)
    line = ifcopenshell.api.geometry.add_axis_representation(
        model, context=axis, axis=[(0.0, 0.0, 0.0), (0.0, 0.0, height * length_m)])
    ifcopenshell.api.geometry.assign_representation(model, product=col, representation=line)
    return col


def _design(model, product, values: dict[str, tuple[str, float]]) -> None:
    """Stanchion_Design on ``product``: {property: (IFC measure type, value)}."""
    pset = ifcopenshell.api.pset.add_pset(model, product=product, name="Stanchion_Design")
    ifcopenshell.api.pset.edit_pset(model, pset=pset, properties={
        k: model.create_entity(t, v) for k, (t, v) in values.items()})


def finish(model: ifcopenshell.file, rng: np.random.Generator, file_name: str) -> None:
    """Make the file reproducible: GlobalIds from ``rng``, fixed dates and header, sorted sets.

    IFC relationship attributes such as RelatedObjects are SETs; the api fills some from
    Python sets, whose order is not reproducible, so every SET of entities is written in
    entity-number order.
    """
    for entity in sorted(model.by_type("IfcRoot"), key=lambda e: e.id()):
        entity.GlobalId = ifcopenshell.guid.compress(uuid.UUID(bytes=rng.bytes(16),
                                                               version=4).hex)
    for history in model.by_type("IfcOwnerHistory"):
        history.CreationDate = FIXED_EPOCH
        history.LastModifiedDate = FIXED_EPOCH
        history.ChangeAction = "ADDED"
    schema = ifcopenshell.schema_by_name(model.schema)
    set_attrs: dict[str, list[int]] = {}
    for entity in model:
        cls = entity.is_a()
        if cls not in set_attrs:
            decl = schema.declaration_by_name(cls)
            set_attrs[cls] = [
                i for i, attr in enumerate(decl.all_attributes())
                if (agg := attr.type_of_attribute().as_aggregation_type()) is not None
                and agg.type_of_aggregation_string() == "set"]
        for i in set_attrs[cls]:
            value = entity[i]
            if value and all(isinstance(v, ifcopenshell.entity_instance) for v in value):
                ordered = sorted(value, key=lambda e: e.id())
                if list(value) != ordered:
                    entity[i] = ordered
    header = model.header.file_name
    header.name = file_name
    header.time_stamp = FIXED_STAMP
    header.author = ("stanchion sample data (invented)",)
    header.organization = ("none",)
    header.preprocessor_version = "IfcOpenShell (ifcopenshell.api)"
    header.originating_system = GENERATOR
    header.authorization = "none"


def _scatter(rng: np.random.Generator, value: float) -> float:
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
    """Axial compression (kN, before scatter sign) per column and case, demo data.

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
                    total["D"] += (_catalog_row(section)["weight"] * KN_PER_M_PER_LB_FT
                                   * height / 1000.0)
                w1, w2 = WIND[key]
                total["W1"] = w1 * (GRID_X[gx] - cx) / hx
                total["W2"] = w2 * (GRID_Y[gy] - cy) / hy
                forces[name] = {c: _scatter(rng, v) for c, v in total.items() if v != 0.0}
    for name, _x, _y, section, area, dead, live, has_results in POSTS:
        if has_results:
            weight = _catalog_row(section)["weight"] * KN_PER_M_PER_LB_FT * POST_HEIGHT / 1000
            forces[name] = {"D": _scatter(rng, dead * area + weight),
                            "L": _scatter(rng, live * area)}
    return forces


def _column_types(model, materials: dict, length_per_in: float) -> dict:
    """One IfcColumnType per (section, material) with its IfcMaterialProfileSet."""
    types: dict[tuple[str, str], ifcopenshell.entity_instance] = {}
    profiles: dict[str, ifcopenshell.entity_instance] = {}

    def get(section: str, material: str):
        key = (section, material)
        if key not in types:
            if section not in profiles:
                profiles[section] = catalog_profile(model, section, length_per_in)[0]
            ctype = _api(model, "IfcColumnType", name=f"{section} {material}",
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


def _steel_materials(model) -> dict:
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
    project = _api(model, "IfcProject", name="Community workshop and library annex (demo)")
    project.Description = "Invented sample building for stanchion; all data is demo data."
    units = [ifcopenshell.api.unit.add_si_unit(model, unit_type="LENGTHUNIT", prefix="MILLI"),
             ifcopenshell.api.unit.add_si_unit(model, unit_type="AREAUNIT"),
             ifcopenshell.api.unit.add_si_unit(model, unit_type="VOLUMEUNIT"),
             ifcopenshell.api.unit.add_si_unit(model, unit_type="PLANEANGLEUNIT"),
             ifcopenshell.api.unit.add_si_unit(model, unit_type="FORCEUNIT", prefix="KILO"),
             ifcopenshell.api.unit.add_si_unit(model, unit_type="PRESSUREUNIT", prefix="MEGA")]
    ifcopenshell.api.unit.assign_unit(model, units=units)
    ctx = _contexts(model)
    mm = 0.001
    building, storeys = _spatial(model, project, "Demo site", "Workshop annex", LEVELS, mm)
    _grid(model, storeys["L0"], GRID_X, GRID_Y, mm, 2000.0)
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
                col = _column(model, ctx, storeys[key], *column_type(section, grade), name,
                              f"{gx}{gy}/{key}", (GRID_X[gx], GRID_Y[gy]), height, mm)
                if name in STAIR_VOID:
                    _design(model, col, {"KX": ("IfcPositiveRatioMeasure", 1.0),
                                         "KY": ("IfcPositiveRatioMeasure", 1.0),
                                         **{k: ("IfcLengthMeasure", v)
                                            for k, v in STAIR_VOID[name].items()}})
                elif key == "L0" and position == "edge":
                    _design(model, col, {"UnbracedLengthY": ("IfcLengthMeasure",
                                                             GIRT_BRACED_Y)})
                columns[name] = (col, (GRID_X[gx], GRID_Y[gy], elevation), height)
    for name, x, y, section, *_rest in POSTS:
        col = _column(model, ctx, storeys["L0"], *column_type(section, "A500C"), name,
                      f"{name[2:]}/L0", (x, y), POST_HEIGHT, mm)
        _design(model, col, {"KX": ("IfcPositiveRatioMeasure", POST_K),
                             "KY": ("IfcPositiveRatioMeasure", POST_K)})
        columns[name] = (col, (x, y, 0.0), POST_HEIGHT)

    _analysis(model, ctx[2], building, columns, workshop_forces(rng))
    finish(model, rng, WORKSHOP)
    return model


def _analysis(model, ref_ctx, building, columns: dict, forces: dict) -> None:
    """Analysis model, one curve member per column with results, load cases, result groups."""
    analysis = ifcopenshell.api.structural.add_structural_analysis_model(model)
    analysis.Name = "Gravity and wind, first order (demo results)"
    ifcopenshell.api.structural.assign_to_building(
        model, structural_analysis_model=analysis, building=building)
    origin = model.create_entity("IfcLocalPlacement", RelativePlacement=model.create_entity(
        "IfcAxis2Placement3D", Location=model.create_entity("IfcCartesianPoint",
                                                            (0.0, 0.0, 0.0))))
    cases, groups, reactions = {}, {}, {}
    for key, name, action_type, source, description in LOAD_CASES:
        case = ifcopenshell.api.structural.add_structural_load_case(
            model, name=name, action_type=action_type, action_source=source)
        case.Description = description
        group = _api(model, "IfcStructuralResultGroup", name=f"Results {name}")
        group.TheoryType = "FIRST_ORDER_THEORY"
        group.ResultForLoadGroup = case
        group.IsLinear = True
        cases[key], groups[key], reactions[key] = case, group, []
    members = []
    for name, (col, (x, y, z), height) in columns.items():
        if name not in forces:
            continue  # added after the analysis run: no results
        member = _api(model, "IfcStructuralCurveMember", name=f"A-{name}",
                      predefined_type="RIGID_JOINED_MEMBER")
        member.Axis = model.create_entity("IfcDirection", (1.0, 0.0, 0.0))
        member.ObjectPlacement = origin
        v0, v1 = (model.create_entity("IfcVertexPoint", model.create_entity(
            "IfcCartesianPoint", p)) for p in ((x, y, z), (x, y, z + height)))
        edge = model.create_entity("IfcEdge", v0, v1)
        rep = ifcopenshell.api.geometry.add_topology_representation(
            model, context=ref_ctx, item=edge, representation_identifier="Reference")
        ifcopenshell.api.geometry.assign_representation(model, product=member,
                                                        representation=rep)
        ifcopenshell.api.structural.assign_product(model, relating_product=member,
                                                   related_object=col)
        members.append(member)
        for key, compression in forces[name].items():
            load = ifcopenshell.api.structural.add_structural_load(
                model, name=f"{key} at base", ifc_class="IfcStructuralLoadSingleForce")
            # member-local ForceX, tension positive: compression is negative (design.md §5)
            ifcopenshell.api.structural.edit_structural_load(
                model, structural_load=load, attributes={"ForceX": -compression})
            reactions[key].append(ifcopenshell.api.structural.add_structural_activity(
                model, applied_load=load, structural_member=member,
                ifc_class="IfcStructuralCurveReaction", predefined_type="CONST",
                global_or_local="LOCAL_COORDS"))
    ifcopenshell.api.structural.assign_structural_analysis_model(
        model, products=members, structural_analysis_model=analysis)
    for key, group in groups.items():
        ifcopenshell.api.group.assign_group(model, products=reactions[key], group=group)
    ifcopenshell.api.structural.edit_structural_analysis_model(
        model, structural_analysis_model=analysis,
        attributes={"SharedPlacement": origin, "LoadedBy": list(cases.values()),
                    "HasResults": list(groups.values())})


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
    project = _api(model, "IfcProject", name="Garden pavilion (demo)")
    project.Description = "Invented sample building for stanchion; all data is demo data."
    units = [ifcopenshell.api.unit.add_conversion_based_unit(model, name=n)
             for n in ("inch", "kip", "ksi")]
    ifcopenshell.api.unit.assign_unit(model, units=units)
    ctx = _contexts(model)
    inch = MM_PER_IN / 1000.0
    _building, storeys = _spatial(model, project, "Demo site", "Garden pavilion",
                                  PAVILION_LEVELS, inch)
    _grid(model, storeys["L0"], PAVILION_GRID_X, PAVILION_GRID_Y, inch, 48.0)
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
        ctype = _api(model, "IfcColumnType", name=f"{section} {material.Name}",
                     predefined_type="COLUMN")
        ifcopenshell.api.material.assign_material(model, products=[ctype], type="IfcMaterial",
                                                  material=material)
        for gy in PAVILION_GRID_Y:
            for gx in PAVILION_GRID_X:
                mark += 1
                name = f"C-{gx}{gy}-{key}"
                _column(model, ctx, storeys[key], ctype, profile, name, f"PV{mark:02d}",
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


def summarize(folder: Path) -> dict:
    """Check both samples with the real check and keep what the tests compare."""
    from service.model_check import check_model

    out = {}
    for model_name, table in ((WORKSHOP, None), (PAVILION, PAVILION_LOADS)):
        report = check_model(Path(folder) / model_name,
                             loads_table=Path(folder) / table if table else None)
        s = report["summary"]
        by_status = {st: sorted(m["name"] for m in report["members"] if m["status"] == st)
                     for st in ("fail", "not_checked")}
        out[model_name] = {
            "schema": report["source"]["schema"], "loads_table": table,
            "members": s["members"], "pass": s["pass"], "fail": s["fail"],
            "not_checked": s["not_checked"], "max_utilization": s["max_utilization"],
            "failing": by_status["fail"], "not_checked_members": by_status["not_checked"],
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
        summary = summarize(args.out_dir)
        target = args.out_dir / SUMMARY
        target.write_text(json.dumps(summary, indent=2) + "\n", encoding="utf-8")
        print(f"wrote {target}")
    return 0


if __name__ == "__main__":
    sys.exit(main())
