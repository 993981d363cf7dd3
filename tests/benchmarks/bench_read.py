"""Benchmark: read a generated 20,000-column IFC4 model.

Prints the seconds of ``ifcopenshell.open`` alone and of ``open_model`` + ``read_columns``,
and their ratio, in one run (after one untimed warm-up open, so that both timings see a
warm file cache).  The model is generated with ``ifcopenshell.api`` into a
temporary directory: a project with 40 storeys, 4 column types with material profile sets
(W14X48, W12X65, HSS8X8X1/2, and an unnamed welded I), one IfcMaterialProfileSetUsage and
one Body extrusion per column, a Stanchion_Loads property set on every column and a
Stanchion_Design set on each type.  It prints numbers only; it asserts nothing.

Usage: ``.venv/bin/python tests/benchmarks/bench_read.py [n_columns]``
"""

from __future__ import annotations

import sys
import tempfile
import time
from pathlib import Path

import ifcopenshell
import ifcopenshell.api.aggregate
import ifcopenshell.api.context
import ifcopenshell.api.geometry
import ifcopenshell.api.material
import ifcopenshell.api.profile
import ifcopenshell.api.pset
import ifcopenshell.api.root
import ifcopenshell.api.spatial
import ifcopenshell.api.type
import ifcopenshell.api.unit
import numpy as np

ROOT = Path(__file__).resolve().parents[2]
sys.path.insert(0, str(ROOT))

from stanchion.ifc_bridge.model import open_model  # noqa: E402
from stanchion.ifc_bridge.read import read_columns  # noqa: E402

# (type name, profile class, ProfileName, dimensions in mm) -- AISC Shapes Database v16.0
# dimensions converted to mm (common practice, no source) for the named shapes.
TYPES = (
    ("C-W14X48", "IfcIShapeProfileDef", "W14X48",
     {"OverallDepth": 350.52, "OverallWidth": 203.962, "WebThickness": 8.636,
      "FlangeThickness": 15.113}),
    ("C-W12X65", "IfcIShapeProfileDef", "W12X65",
     {"OverallDepth": 307.34, "OverallWidth": 305.054, "WebThickness": 9.906,
      "FlangeThickness": 15.367}),
    ("C-HSS8", "IfcRectangleHollowProfileDef", "HSS8X8X1/2",
     {"XDim": 203.2, "YDim": 203.2, "WallThickness": 12.7}),
    ("C-WELDED", "IfcIShapeProfileDef", None,
     {"OverallDepth": 400.0, "OverallWidth": 300.0, "WebThickness": 12.0,
      "FlangeThickness": 20.0}),
)


def generate_model(path: Path, n_columns: int, storeys: int = 40) -> None:
    """Write an IFC4 model with ``n_columns`` columns to ``path``."""
    f = ifcopenshell.file(schema="IFC4")
    api = ifcopenshell.api
    project = api.root.create_entity(f, ifc_class="IfcProject", name="Benchmark")
    units = [
        api.unit.add_si_unit(f, unit_type="LENGTHUNIT", prefix="MILLI"),
        api.unit.add_si_unit(f, unit_type="FORCEUNIT", prefix="KILO"),
        api.unit.add_si_unit(f, unit_type="PRESSUREUNIT", prefix="MEGA"),
    ]
    api.unit.assign_unit(f, units=units)
    model_ctx = api.context.add_context(f, context_type="Model")
    body = api.context.add_context(f, context_type="Model", context_identifier="Body",
                                   target_view="MODEL_VIEW", parent=model_ctx)
    site = api.root.create_entity(f, ifc_class="IfcSite")
    building = api.root.create_entity(f, ifc_class="IfcBuilding")
    api.aggregate.assign_object(f, products=[site], relating_object=project)
    api.aggregate.assign_object(f, products=[building], relating_object=site)
    levels = [api.root.create_entity(f, ifc_class="IfcBuildingStorey", name=f"Level {i + 1}")
              for i in range(storeys)]
    api.aggregate.assign_object(f, products=levels, relating_object=building)
    steel = api.material.add_material(f, name="ASTM A992", category="steel")
    pset = api.pset.add_pset(f, product=steel, name="Pset_MaterialSteel")
    api.pset.edit_pset(f, pset=pset, properties={
        "YieldStress": f.createIfcPressureMeasure(345.0)})
    types, profiles = [], []
    for name, cls, pname, dims in TYPES:
        prof = api.profile.add_parameterized_profile(f, ifc_class=cls)
        prof.ProfileName = pname
        for attr, value in dims.items():
            setattr(prof, attr, value)
        ctype = api.root.create_entity(f, ifc_class="IfcColumnType", name=name,
                                       predefined_type="COLUMN")
        mset = api.material.add_material_set(f, name=name, set_type="IfcMaterialProfileSet")
        api.material.add_profile(f, profile_set=mset, material=steel, profile=prof)
        api.material.assign_material(f, products=[ctype], type="IfcMaterialProfileSet",
                                     material=mset)
        design = api.pset.add_pset(f, product=ctype, name="Stanchion_Design")
        api.pset.edit_pset(f, pset=design, properties={
            "KX": f.createIfcPositiveRatioMeasure(1.0), "KY": f.createIfcPositiveRatioMeasure(1.0)})
        types.append(ctype)
        profiles.append(prof)
    columns_by_type: list[list] = [[] for _ in types]
    columns_by_level: list[list] = [[] for _ in levels]
    rng = np.random.default_rng(1)
    for i in range(n_columns):
        t = i % len(types)
        col = api.root.create_entity(f, ifc_class="IfcColumn", name=f"C{i + 1}")
        col.Tag = f"T{i + 1}"
        matrix = np.eye(4)
        matrix[0, 3], matrix[1, 3] = (i % 100) * 6.0, (i // 100) * 6.0
        api.geometry.edit_object_placement(f, product=col, matrix=matrix)
        rep = api.geometry.add_profile_representation(f, context=body, profile=profiles[t],
                                                      depth=3.6)
        api.geometry.assign_representation(f, product=col, representation=rep)
        loads = api.pset.add_pset(f, product=col, name="Stanchion_Loads")
        api.pset.edit_pset(f, pset=loads, properties={
            "D": f.createIfcForceMeasure(float(rng.uniform(200, 800))),
            "L": f.createIfcForceMeasure(float(rng.uniform(100, 400)))})
        columns_by_type[t].append(col)
        columns_by_level[i % storeys].append(col)
    for ctype, cols in zip(types, columns_by_type, strict=True):
        api.type.assign_type(f, related_objects=cols, relating_type=ctype,
                             should_map_representations=False)
        api.material.assign_material(f, products=cols, type="IfcMaterialProfileSetUsage")
    for level, cols in zip(levels, columns_by_level, strict=True):
        api.spatial.assign_container(f, products=cols, relating_structure=level)
    f.write(str(path))


def main(n_columns: int = 20_000) -> None:
    with tempfile.TemporaryDirectory() as tmp:
        path = Path(tmp) / "columns.ifc"
        t0 = time.perf_counter()
        generate_model(path, n_columns)
        t_gen = time.perf_counter() - t0
        size_mb = path.stat().st_size / 1e6

        ifcopenshell.open(str(path))  # warm-up: file cache and imports, not timed
        t0 = time.perf_counter()
        model = ifcopenshell.open(str(path))
        t_open = time.perf_counter() - t0
        del model

        t0 = time.perf_counter()
        result = read_columns(open_model(path))
        t_read = time.perf_counter() - t0

    members = result.members
    checked = int(sum(r is None for r in members.reason))
    print(f"model: {n_columns} columns, {size_mb:.1f} MB (generated in {t_gen:.1f} s)")
    print(f"ifcopenshell.open:         {t_open:.2f} s")
    print(f"open_model + read_columns: {t_read:.2f} s")
    print(f"ratio:                     {t_read / t_open:.2f}")
    print(f"members read: {len(members)}, ready to check: {checked}, "
          f"model messages: {len(result.messages)}")


if __name__ == "__main__":
    main(int(sys.argv[1]) if len(sys.argv) > 1 else 20_000)
