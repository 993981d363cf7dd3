"""A small model on a grid for the output and load-schedule tests (helper module, no tests).

The 3 x 3 grid of ``tests/ifc_bridge/test_grids.py`` (U axes A, B, C at y = 0, 240, 480 in;
V axes 1, 2, 3 at x = 0, 360, 720 in) in a millimetre / newton model, storey "Level 1":

- ``C1``: W14X48, 16 ft, Fy 50 ksi, on B-2, with D = 95, L = 60 kip (Stanchion_Loads);
- ``C2``: the same section, 24 in along B and -6 in along 2 from B-2, no loads
  (``B-2 (+610, -152 mm)``: 609.6 and -152.4 mm to the mm);
- ``K1``: a concrete column on C-3 (skipped, not steel);
- with ``level2``: ``C3`` on A-1 of storey "Level 2", no loads.
"""

from __future__ import annotations

from pathlib import Path

from tests.ifc_bridge.test_grids import add_grid
from tests.service.test_model_check_files import LENGTH, W14X48, builder_module

ON_GRID = {"C1": "B-2", "C2": "B-2 (+610, -152 mm)", "K1": "C-3", "C3": "A-1"}


def build_grid_model(schema: str = "IFC4", *, level2: bool = False, twin: bool = False):
    """The builder holding the model (``twin``: a second column on B-2 of Level 1)."""
    b = builder_module().ModelBuilder(schema, "mm_N")
    add_grid(b)
    profile = b.profile("I", "W14X48", **W14X48)
    steel = b.material("ASTM A992", fy=50.0)
    c1 = b.column("C1", profile=profile, material=steel, length=LENGTH, at=(360.0, 240.0),
                  tag="T1")
    b.loads(c1, D=95.0, L=60.0)
    b.column("C2", profile=profile, material=steel, length=LENGTH, at=(384.0, 234.0), tag="T2")
    import ifcopenshell.api.material

    concrete = ifcopenshell.api.material.add_material(  # the builder's category is steel
        b.model, name="Structural Concrete", category=None if schema == "IFC2X3" else "concrete")
    b.column("K1", profile=b.profile("RECT", "300x300", H=12.0, B=12.0), material=concrete,
             length=LENGTH, at=(720.0, 480.0), tag="K1", via="body")
    if level2:
        b.column("C3", profile=profile, material=steel, length=LENGTH, at=(0.0, 0.0),
                 storey="Level 2", tag="T3")
    if twin:
        b.column("C1 twin", profile=profile, material=steel, length=LENGTH,
                 at=(360.0, 240.0), tag="T4")
    return b


def write_grid_model(path: Path, schema: str = "IFC4", **kw: bool) -> Path:
    """Write the model to ``path``."""
    return build_grid_model(schema, **kw).write(path)
