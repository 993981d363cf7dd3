"""Small IFC model files for the model-check tests (a helper module: it holds no tests).

Uses the shared :class:`ModelBuilder` of ``tests/ifc_bridge/conftest.py`` (loaded by path, as
the service tests do not see that folder's fixtures).  Numbers are in kip / inch / ksi.

The standard model: three W14X48 columns, Fy = 50 ksi (ASTM A992), 16 ft long --
``C1`` on Level 1 with the docs/design.md §2 loads (D 95, L 60, S 12 kip), ``C2`` on Level 2 with
D = 300 kip (1.4D = 420 kip > φcPn), ``C3`` on Level 2 without loads (not checked).
"""

from __future__ import annotations

import hashlib
import importlib.util
import sys
from collections import Counter
from pathlib import Path

import ifcopenshell

_BUILDER = "stanchion_tests_model_builder"


def builder_module():
    """The module of tests/ifc_bridge/conftest.py, loaded once under its own name."""
    if _BUILDER not in sys.modules:
        path = Path(__file__).resolve().parents[1] / "ifc_bridge" / "conftest.py"
        spec = importlib.util.spec_from_file_location(_BUILDER, path)
        module = importlib.util.module_from_spec(spec)
        sys.modules[_BUILDER] = module
        spec.loader.exec_module(module)
    return sys.modules[_BUILDER]


# W14X48 dimensions from the AISC Shapes Database v16.0 (d, bf, tw, tf; inches).
W14X48 = {"d": 13.8, "bf": 8.03, "tw": 0.34, "tf": 0.595, "r": 0.0}
LENGTH = 192.0  # 16 ft, the docs/design.md §2 example length
LOADS = {"C1": {"D": 95.0, "L": 60.0, "S": 12.0}, "C2": {"D": 300.0}, "C3": None}


def build_model(schema: str = "IFC4", units: str = "mm_N", loads: dict | None = None,
                storeys: dict[str, str] | None = None):
    """A ModelBuilder holding the standard model (``loads`` replaces :data:`LOADS`)."""
    b = builder_module().ModelBuilder(schema, units)
    profile = b.profile("I", "W14X48", **W14X48)
    steel = b.material("ASTM A992", fy=50.0)
    storeys = storeys or {"C1": "Level 1", "C2": "Level 2", "C3": "Level 2"}
    for k, (name, values) in enumerate((loads or LOADS).items()):
        col = b.column(name, profile=profile, material=steel, length=LENGTH,
                       storey=storeys.get(name, "Level 1"), at=(240.0 * k, 0.0), tag=f"T{k}")
        if values:
            b.loads(col, **values)
    return b


def write_model(path: Path, schema: str = "IFC4", units: str = "mm_N",
                loads: dict | None = None) -> Path:
    """Write the standard model to ``path``."""
    return build_model(schema, units, loads).write(path)


def digest(path: Path) -> str:
    """SHA-256 of a file."""
    return hashlib.sha256(Path(path).read_bytes()).hexdigest()


def class_counts(model: ifcopenshell.file) -> Counter:
    """Entity count per IFC class."""
    return Counter(e.is_a() for e in model)


def guids(model: ifcopenshell.file) -> dict[str, str]:
    """GlobalId -> IFC class of every rooted entity."""
    return {e.GlobalId: e.is_a() for e in model.by_type("IfcRoot")}


def column_guids(model: ifcopenshell.file) -> dict[str, str]:
    """Column Name -> GlobalId."""
    return {c.Name: c.GlobalId for c in model.by_type("IfcColumn")}
