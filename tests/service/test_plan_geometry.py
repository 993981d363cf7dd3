"""The HTML report's plans from a model (service/plan_geometry.py; docs/design.md §3 HTML).

The model: tests/service/takedown_model.py (nine W10X49 columns per level on a 3 x 3 grid of
x = 0, 300, 600 in and y = 0, 360, 720 in, three levels, each slab 660 x 720 in, a 60 x 100
in stair opening in the Level 2 slab) plus an IfcGrid with U axes A, B, C at y = 0, 360, 720
and V axes 1, 2, 3 at x = 0, 300, 600 (contained in Level 1), checked with a takedown.
Column C-11-1 (the interior one of Level 1) is turned 90° by its placement's RefDirection
(0, 1, 0); C-11-2 by 90° too and its extrusion's Position by a further 30°.
"""

from __future__ import annotations

import math
import re

import pytest

from stanchion.service.pipeline import CheckOptions, OutputPaths, check
from tests.ifc_bridge.conftest import SCHEMAS
from tests.ifc_bridge.test_grids import add_grid
from tests.service import takedown_model as tm
from tests.service.test_takedown_loads import PROJECT

FT2 = 144.0  # in² per ft²


def _turn(b, column, degrees: float) -> None:
    m = b.model
    c, s = math.cos(math.radians(degrees)), math.sin(math.radians(degrees))
    column.ObjectPlacement.RelativePlacement.RefDirection = m.create_entity(
        "IfcDirection", (c, s, 0.0))


def _turn_body(b, column, degrees: float) -> None:
    m = b.model
    c, s = math.cos(math.radians(degrees)), math.sin(math.radians(degrees))
    for rep in column.Representation.Representations:
        for item in rep.Items:
            if item.is_a("IfcExtrudedAreaSolid"):
                # a copy of the position: the solid may be shared with other columns
                item.Position = m.create_entity(
                    "IfcAxis2Placement3D", Location=item.Position.Location,
                    RefDirection=m.create_entity("IfcDirection", (c, s, 0.0)))


def _model(tmp_path, schema: str):
    b, columns = tm.build(schema)
    add_grid(b, storey="Level 1", u={"A": 0.0, "B": 360.0, "C": 720.0},
             v={"1": 0.0, "2": 300.0, "3": 600.0})
    _turn(b, columns["C-11-1"], 90.0)
    _turn(b, columns["C-11-2"], 90.0)
    own = b.model.create_entity  # a body of its own for C-11-2 before turning it
    for rep in columns["C-11-2"].Representation.Representations:
        rep.Items = [own("IfcExtrudedAreaSolid", SweptArea=i.SweptArea, Position=i.Position,
                         ExtrudedDirection=i.ExtrudedDirection, Depth=i.Depth)
                     if i.is_a("IfcExtrudedAreaSolid") else i for i in rep.Items]
    _turn_body(b, columns["C-11-2"], 30.0)
    model = b.write(tmp_path / f"plans_{schema}.ifc")
    project = tmp_path / "project.toml"
    project.write_text(PROJECT, encoding="utf-8")
    return model, project


def _plan(page: str, storey: str) -> str:
    start = page.index(f'aria-label="plan of {storey}"')
    return page[start:page.index("</svg>", start)]


def _ring(d: str) -> list[tuple[float, float]]:
    first = d.split("Z")[0]
    return [tuple(map(float, p.split(","))) for p in re.findall(r"-?[\d.]+,-?[\d.]+", first)]


@pytest.mark.parametrize("schema", SCHEMAS)
def test_plans_hold_grid_slabs_cells_and_turned_sections(tmp_path, schema):
    model, project = _model(tmp_path, schema)
    html = tmp_path / "report.html"
    run = check(model, CheckOptions(takedown=project), OutputPaths(html=html))
    rows = {r["name"]: r for r in run.report["members"]}
    # the rotation the model gives (hand: RefDirection (0, 1, 0) is 90°; plus 30° of the body)
    assert rows["C-11-1"]["rotation"] == pytest.approx(90.0)
    assert rows["C-11-2"]["rotation"] == pytest.approx(120.0)
    assert rows["C-00-1"]["rotation"] == pytest.approx(0.0)
    page = html.read_text(encoding="utf-8")
    for storey, hole in (("Level 1", True), ("Level 2", False), ("Level 3", False)):
        svg = _plan(page, storey)
        # grid lines with their tags (the grid is in Level 1, the only grid: every plan)
        start = svg.index('<g class="grid">')
        grid = svg[start:svg.index("</g>", start)]
        assert grid.count("<line") == 6
        tags = re.findall(r">([ABC123])</text>", grid)
        assert sorted(set(tags)) == ["1", "2", "3", "A", "B", "C"]
        # the slab the storey's columns carry: Level 1's columns carry the Level 2 slab and
        # its opening (outer ring and a hole), the others a slab without one
        slabs = re.findall(r'<g class="slabs"><path d="([^"]+)"', svg)
        assert len(slabs) == 1 and slabs[0].count("M") == (2 if hole else 1)
        # one tributary cell per column; together they tile the slab less the opening
        # (hand: 660 x 720 in less 60 x 100 in on Level 2's slab, in ft²)
        areas = [float(a) for a in re.findall(r'data-area="([\d.]+)"', svg)]
        assert len(areas) == 9
        expected = (660 * 720 - (60 * 100 if hole else 0)) / FT2
        assert sum(areas) == pytest.approx(expected, rel=2e-3)
        # one mark per column, each drawn as its section
        assert 'data-marks="9"' in svg
        assert svg.count('class="mark"') == 9 and svg.count('class="section"') == 9
    # the turned columns: the web (ring points 3 -> 4, along the section's y axis) runs
    # horizontal on the page at 90°, vertical at 0°, at 120° from plan x: 30° past vertical
    for name, storey, expect in (("C-11-1", "Level 1", 90.0), ("C-00-1", "Level 1", 0.0),
                                 ("C-11-2", "Level 2", 120.0)):
        svg = _plan(page, storey)
        gid = rows[name]["id"]
        mark = svg[svg.index(f'data-member="{gid}"'):]
        path = re.search(r'<path d="([^"]+)"[^>]*class="section"', mark)
        assert path is not None
        pts = _ring(path.group(1))
        (x3, y3), (x4, y4) = pts[3], pts[4]
        web = math.degrees(math.atan2(-(y4 - y3), x4 - x3)) % 180.0  # plan angle of the web
        assert web == pytest.approx((expect + 90.0) % 180.0, abs=1.0)
        assert f'data-rotation="{expect:g}"' in mark[:mark.index("</g>")]


def test_columns_in_no_storey_get_the_grid_on_their_plan(tmp_path) -> None:
    # Columns contained in no storey are drawn on the "(no storey)" plan, with the grid
    # (held by no storey: every plan draws it) and no slab.
    from tests.ifc_bridge.conftest import ModelBuilder

    b = ModelBuilder("IFC4", "mm_N")
    add_grid(b, storey=None, u={"A": 0.0, "B": 240.0}, v={"1": 0.0, "2": 360.0})
    profile = b.profile("I", "W10X49", d=10.0, bf=10.0, tw=0.34, tf=0.56, r=0.5)
    steel = b.material("ASTM A992", fy=50.0)
    for k, at in enumerate(((0.0, 0.0), (360.0, 240.0))):
        b.column(f"N{k}", profile=profile, material=steel, storey=None, at=at)
    html = tmp_path / "loose.html"
    check(b.write(tmp_path / "loose.ifc"), CheckOptions(), OutputPaths(html=html))
    svg = _plan(html.read_text(encoding="utf-8"), "(no storey)")
    start = svg.index('<g class="grid">')
    assert svg[start:svg.index("</g>", start)].count("<line") == 4
    assert 'class="slabs"' not in svg and svg.count('class="section"') == 2
