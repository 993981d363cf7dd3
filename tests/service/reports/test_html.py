"""The HTML report's content (service/reports/html.py, docs/design.md §3), without a browser.

The page of the sample building (sample_models/workshop_annex.ifc with its takedown, as
`stanchion demo` checks it) is read back with html.parser: summary numbers, plans, schedule,
details, capacity curves, histogram; escaping of names from models; plan layers from a
PlanData; the colour scale.
"""

from __future__ import annotations

import json
import math
import re
from pathlib import Path

import numpy as np
import pytest

from stanchion.engine.check import check_members
from stanchion.service.pipeline import CheckOptions, OutputPaths, check
from stanchion.service.reports import html as html_report
from stanchion.service.reports.colour_scale import NO_VALUE, STOPS, colour_of
from stanchion.service.reports.plan_data import (
    GridAxis,
    PlanData,
    SlabOutline,
    StoreyPlan,
    TributaryCell,
)
from tests.service.reports.html_page import Node, parse, table_rows

ROOT = Path(__file__).resolve().parents[3]
SAMPLE = ROOT / "sample_models" / "workshop_annex.ifc"
TAKEDOWN = ROOT / "sample_models" / "workshop_annex_takedown.toml"


@pytest.fixture(scope="module")
def sample(tmp_path_factory: pytest.TempPathFactory):
    """The sample run with --html and --report: (run, page text, page tree, report)."""
    folder = tmp_path_factory.mktemp("html")
    page, report = folder / "report.html", folder / "report.json"
    run = check(SAMPLE, CheckOptions(takedown=TAKEDOWN, suggest=True),
                OutputPaths(html=page, report=report))
    text = page.read_text(encoding="utf-8")
    return run, text, parse(text), json.loads(report.read_text(encoding="utf-8"))


def _storey_figures(tree: Node) -> dict[str, Node]:
    return {f.attrs["data-storey"]: f for f in tree.find_all("figure")
            if "storey" in f.classes()}


# ---------------------------------------------------------------------------- content


def test_summary_numbers_are_the_reports(sample) -> None:
    # The report is the one source of every writer (docs/design.md §3).
    _, text, tree, report = sample
    cells = {td.attrs["data-summary"]: td.text().strip() for td in tree.find_all("td")
             if "data-summary" in td.attrs}
    s = report["summary"]
    assert cells["members"] == str(s["members"]) == "40"
    for key in ("pass", "fail", "not_checked", "skipped"):
        assert cells[key] == str(s[key])
    assert float(cells["max_utilization"]) == pytest.approx(s["max_utilization"], rel=1e-3)
    assert report["design_basis"] in text
    assert report["disclaimer"] in text
    assert "reviewed by a licensed engineer" in text
    assert "Not checked here" in text and "Chapter H" in text


def test_each_plan_has_one_mark_per_column_of_its_storey_shaped_by_status(sample) -> None:
    _, _, tree, report = sample
    figures = _storey_figures(tree)
    expected: dict[str, list[dict]] = {}
    for row in report["members"]:
        expected.setdefault(row["storey"], []).append(row)
    assert set(figures) == set(expected)
    shape = {"pass": "circle", "fail": "polygon3", "not_checked": "polygon4",
             "skipped": "rect"}
    for storey, figure in figures.items():
        marks = figure.find_all("g", class_="mark")
        assert sorted(m.attrs["data-member"] for m in marks) == \
            sorted(r["id"] for r in expected[storey])
        by_id = {r["id"]: r for r in expected[storey]}
        for m in marks:
            row = by_id[m.attrs["data-member"]]
            assert m.attrs["data-status"] == row["status"]
            drawn = next(c for c in m.children if c.tag in ("circle", "polygon", "rect"))
            kind = drawn.tag + (str(len(drawn.attrs["points"].split()))
                                if drawn.tag == "polygon" else "")
            assert kind == shape[row["status"]], row["name"]
            if row["status"] in ("pass", "fail"):
                assert drawn.attrs["fill"] == colour_of(row["utilization"])
            else:
                assert drawn.attrs["fill"] in (NO_VALUE, "#ffffff")


def test_schedule_grid_down_storeys_across_section_and_utilization(sample) -> None:
    # Sample building (sample_models/generate.py): column A-2 of the workshop level is a
    # W12X40 failing at 2.012 (the report's own numbers), the post at B-1 + offset HSS4X4X1/4.
    _, _, tree, report = sample
    (table,) = tree.find_all("table", class_="schedule")
    rows = table_rows(table)
    storeys = list(dict.fromkeys(r["storey"] for r in report["members"]))
    assert rows[0] == ["grid", *storeys]
    by_key = {r[0]: r[1:] for r in rows[1:]}
    grids = {r["grid"] for r in report["members"]}
    assert set(by_key) == grids
    for row in report["members"]:
        cell = by_key[row["grid"]][storeys.index(row["storey"])]
        assert row["section"] in cell
        if row["utilization"] is not None:
            assert f"{row['utilization']:.2f}" in cell
        else:
            assert "n/c" in cell or "skip" in cell
    a2 = next(r for r in report["members"] if r["grid"] == "A-2"
              and r["storey"] == storeys[0])
    assert by_key["A-2"][0] == f"{a2['section']} {a2['utilization']:.2f}"


def test_details_worst_first_with_inputs_sources_and_combinations(sample) -> None:
    _, _, tree, report = sample
    details = tree.find_all("article")
    assert len(details) == len(report["members"])  # 40 columns, under DETAIL_LIMIT
    by_id = {r["id"]: r for r in report["members"]}
    shown = [by_id[d.attrs["data-member"]] for d in details]
    # failing first (highest utilization first), then not checked, then passing
    ranks = [html_report.STATUS_RANK[r["status"]] for r in shown]
    assert ranks == sorted(ranks)
    fails = [r["utilization"] for r in shown if r["status"] == "fail"]
    assert fails == sorted(fails, reverse=True) and fails[0] == report["summary"][
        "max_utilization"]
    worst = details[0]
    row = shown[0]
    inputs = {r[0]: r for r in table_rows(worst.find_all("table", class_="inputs")[0])}
    assert inputs["section"][1:] == [row["section"], row["profile_source"]]
    assert inputs["Fy"][2] == row["fy_source"]
    assert inputs["Lx, Kx → Lcx"][2] == row["length_source"]
    assert any(k.startswith("load D") and v[2] == row["load_source"]
               for k, v in inputs.items())
    quantities = {r[0] for r in table_rows(worst.find_all("table", class_="intermediates")[0])}
    assert {"Ag", "Ae", "Fcr", "Pn = Fcr·Ae", "φcPn (φc = 0.9)"} <= quantities
    assert {"Fe, flexural buckling about x", "Fe, flexural buckling about y"} <= quantities
    combos = table_rows(worst.find_all("table", class_="combinations")[0])[1:]
    governs = [c for c in combos if c[0].endswith("(governs)")]
    assert [g[0] for g in governs] == [f"{row['combination']} (governs)"]
    assert float(governs[0][1]) == pytest.approx(row["required_strength"], rel=1e-3)
    assert max(float(c[1]) for c in combos) == pytest.approx(row["required_strength"],
                                                             rel=1e-3)


def test_capacity_curve_passes_through_the_members_point(sample) -> None:
    # The curve is the engine's capacity_curve over the member's own lengths times factors
    # that include 1: at its own Lc it is the member's φcPn (the report's available
    # strength, 6 significant digits), and the drawn point is a vertex of the drawn curve.
    run, _, tree, report = sample
    results = check_members(run.members, run.results.method, detail=True)
    units = html_report._Units(report["units"])
    order = html_report._order(report["members"])
    curves = html_report._Curves(order, run.members, results, units)
    checked = 0
    for i, row in enumerate(report["members"]):
        pts = curves.curve_points(i)
        if row["available_strength"] is None:
            assert pts is None
            continue
        lc, strength = pts
        lx = run.members.kx[i] * run.members.lx[i]
        ly = run.members.ky[i] * run.members.ly[i]
        lz = run.members.kz[i] * run.members.lz[i]
        own = max(lx, ly, lz) * units.to_length
        k = int(np.argmin(np.abs(np.asarray(lc) - own)))
        assert lc[k] == pytest.approx(own, rel=1e-12)
        assert strength[k] == pytest.approx(row["available_strength"], rel=1e-5)
        checked += 1
    assert checked >= 38  # every column with a capacity (the sample's one without Fy aside)
    for article in tree.find_all("article"):
        (svg,) = article.find_all("svg", class_="curve") or [None]
        if svg is None:
            continue
        (point,) = svg.find_all("g", class_="member-point")
        (line,) = svg.find_all("polyline", class_="capacity")
        vertices = {tuple(p.split(",")) for p in line.attrs["points"].split()}
        assert (point.attrs["data-x"], point.attrs["data-y"]) in vertices


def test_histogram_counts_checked_columns(sample) -> None:
    _, _, tree, report = sample
    bars = tree.find_all("rect", class_="bar pass") + tree.find_all("rect", class_="bar fail")
    counts = {b.attrs["data-bin"]: int(b.attrs["data-count"]) for b in bars}
    checked = [r["utilization"] for r in report["members"] if r["status"] in ("pass", "fail")]
    assert sum(counts.values()) == len(checked)
    assert counts["over 1"] == report["summary"]["fail"]
    assert counts["0.4–0.5"] == sum(1 for u in checked if 0.4 < u <= 0.5)


def test_page_is_self_contained(sample) -> None:
    # No script, no stylesheet or font or image from elsewhere: every href is an anchor of
    # the page, and no element has a src.
    _, text, tree, _ = sample
    assert not tree.find_all("script") and not tree.find_all("link")
    for node in tree.iter():
        assert "src" not in node.attrs, node.tag
        href = node.attrs.get("href")
        assert href is None or href.startswith("#"), href
    anchors = {n.attrs["id"] for n in tree.iter() if "id" in n.attrs}
    assert all(n.attrs["href"][1:] in anchors for n in tree.iter() if "href" in n.attrs)
    assert not re.search(r"https?://", text)
    assert "@import" not in text and "url(" not in text
    assert "@media print" in text


def test_page_is_written_atomically_and_for_the_demo(tmp_path: Path) -> None:
    from stanchion.service.cli import main as run

    out = tmp_path / "demo"
    assert run(["demo", "--output-dir", str(out)]) == 0
    page = out / "workshop_annex_report.html"
    assert page.read_text(encoding="utf-8").startswith("<!DOCTYPE html>")
    assert not list(out.glob(".*.tmp"))


def test_cli_html_for_a_members_file_and_refused_names(tmp_path: Path, capsys) -> None:
    # A members file has no storeys or positions: no plans, the schedule lists names.
    from stanchion.service.cli import main as run

    members = tmp_path / "members.json"
    members.write_text(json.dumps({"members": [
        {"id": "C-1", "section": "W14X48", "fy": 50, "length": 16,
         "loads": {"D": 95.0, "L": 60.0}}]}), encoding="utf-8")
    page = tmp_path / "out.html"
    assert run(["check", str(members), "--html", str(page), "--quiet"]) == 0
    tree = parse(page.read_text(encoding="utf-8"))
    assert not tree.find_all("figure", class_="storey")
    (table,) = tree.find_all("table", class_="schedule")
    assert table_rows(table)[1][0] == "C-1"
    # AISC Manual Table 4-1a (W14X48, Fy = 50 ksi, Lc = 16 ft, LRFD): φcPn = 303 kips; the
    # detail's curve holds that point and its combinations table the request's own values.
    (article,) = tree.find_all("article")
    rows = {r[0]: r[1] for r in table_rows(article.find_all("table", class_="intermediates")[0])}
    assert float(rows["φcPn (φc = 0.9)"].split()[0]) == pytest.approx(303.0, abs=1.0)
    combos = dict(r for r in table_rows(article.find_all("table", class_="combinations")[0])[1:])
    # ASCE 7-22 §2.3.1 combination 2: 1.2·95 + 1.6·60 = 210 kips (hand computation)
    assert float(combos["1.2D+1.6L+0.5Lr (governs)"]) == pytest.approx(210.0)
    # --html naming the input is refused before anything is read (exit 2, one line)
    assert run(["check", str(members), "--html", str(members)]) == 2
    assert "--html" in capsys.readouterr().err


# ---------------------------------------------------------------------------- escaping


def _row(**kw) -> dict:
    row = {"id": "c1", "name": "c1", "section": "W14X48", "status": "pass",
           "required_strength": 100.0, "available_strength": 300.0, "utilization": 0.3333,
           "limit_state": "flexural buckling about y", "combination": "1.4D",
           "slenderness": 100.0, "critical_stress": 23.0, "messages": [],
           "storey": "L1", "x": 0.0, "y": 0.0}
    row.update(kw)
    return row


def _report(rows: list[dict]) -> dict:
    util = [r["utilization"] for r in rows if r["utilization"] is not None]
    return {"schema_version": "1", "design_basis": "AISC 360-22 Chapter E, LRFD; ASCE 7-22",
            "disclaimer": "aid only", "units": {"force": "kip", "length": "ft", "stress": "ksi"},
            "summary": {"members": len(rows), "pass": len(rows), "fail": 0, "not_checked": 0,
                        "skipped": 0, "max_utilization": max(util) if util else None},
            "messages": ["<img src=x onerror=alert(2)>"], "members": rows,
            "source": {"file": "<b>model</b>.ifc", "members": len(rows)}}


def test_names_from_models_are_escaped_everywhere() -> None:
    evil = "<script>alert(1)</script>"
    rows = [_row(id='c1"><script>', name=evil, section="<b>W</b>", tag=evil,
                 storey="<i>L1</i>", messages=[evil], grid="<A>-1"),
            _row(id="c2", name="c2", x=10.0, y=5.0, storey="<i>L1</i>")]
    text = html_report.render_html(_report(rows))
    assert "<script" not in text and "<b>W</b>" not in text and "<i>L1</i>" not in text
    assert "<img src=x" not in text and "<b>model</b>" not in text and "<A>" not in text
    assert "&lt;script&gt;alert(1)&lt;/script&gt;" in text
    tree = parse(text)
    assert not tree.find_all("script") and not tree.find_all("img")
    marks = tree.find_all("g", class_="mark")
    assert sorted(m.attrs["data-member"] for m in marks) == sorted(['c1"><script>', "c2"])
    # the tooltip and the label beside the mark carry the name as text
    assert any(t.text().startswith(evil + " · ") for t in tree.find_all("title"))
    assert evil in [t.text() for m in marks for t in m.find_all("text")]


# ---------------------------------------------------------------------------- plan layers


def test_plan_draws_grid_slab_and_tributary_layers_only_when_given() -> None:
    rows = [_row(id=f"c{k}", name=f"c{k}", x=float(x), y=float(y))
            for k, (x, y) in enumerate([(0, 0), (30, 0), (0, 20), (30, 20)])]
    rows.append(_row(id="c9", name="c9", storey="L2", x=0.0, y=0.0))
    plans = PlanData(storeys={"L1": StoreyPlan(
        grid_axes=(GridAxis("A", (0.0, -5.0), (0.0, 25.0)), GridAxis("1", (-5.0, 0.0),
                                                                        (35.0, 0.0))),
        slabs=(SlabOutline(((-2.0, -2.0), (32.0, -2.0), (32.0, 22.0), (-2.0, 22.0)),
                           holes=(((10.0, 5.0), (14.0, 5.0), (14.0, 9.0)),)),),
        tributary=(TributaryCell("c0", ((-2.0, -2.0), (15.0, -2.0), (15.0, 10.0)), 150.0),),
    )}, unit="ft")
    tree = parse(html_report.render_html(_report(rows), plans=plans))
    figures = _storey_figures(tree)
    l1, l2 = figures["L1"], figures["L2"]
    (grid,) = l1.find_all("g", class_="grid")
    assert len(grid.find_all("line")) == 2
    assert sorted(t.text() for t in grid.find_all("text")) == ["1", "1", "A", "A"]
    (slab,) = l1.find_all("g", class_="slabs")
    assert slab.find_all("path")[0].attrs["d"].count("Z") == 2  # outline and its opening
    (cell,) = l1.find_all("path", data_tributary="c0")
    assert cell.attrs["data-area"] == "150"
    assert "grid lines, slab outlines, tributary areas" in l1.text()
    assert not l2.find_all("g", class_="grid") and not l2.find_all("g", class_="slabs")
    assert len(l1.find_all("g", class_="mark")) == 4 and len(l2.find_all("g", class_="mark")) == 1


def test_grid_line_and_columns_share_one_frame() -> None:
    # A grid axis through x = 0 passes through the marks of the columns at x = 0: the
    # layers and the marks are drawn with the same plan-to-picture transform.
    rows = [_row(id="a", name="a", x=0.0, y=0.0), _row(id="b", name="b", x=0.0, y=20.0),
            _row(id="c", name="c", x=30.0, y=0.0)]
    plans = PlanData(storeys={"L1": StoreyPlan(grid_axes=(
        GridAxis("A", (0.0, -5.0), (0.0, 25.0)),))}, unit="ft")
    tree = parse(html_report.render_html(_report(rows), plans=plans))
    (line,) = tree.find_all("g", class_="grid")[0].find_all("line")
    for ident in ("a", "b"):
        (mark,) = tree.find_all("g", data_member=ident)
        circle = mark.find_all("circle")[0]
        assert circle.attrs["cx"] == line.attrs["x1"] == line.attrs["x2"]


# ---------------------------------------------------------------------------- colours


def _lightness(hex_colour: str) -> float:
    # CIE 1976 L* of an sRGB colour (IEC 61966-2-1 transfer function, D65 white; the
    # luminance weights of ITU-R BT.709): the perceptual lightness the scale must order.
    def lin(c: int) -> float:
        s = c / 255.0
        return s / 12.92 if s <= 0.04045 else ((s + 0.055) / 1.055) ** 2.4

    r, g, b = (lin(int(hex_colour[k:k + 2], 16)) for k in (1, 3, 5))
    y = 0.2126 * r + 0.7152 * g + 0.0722 * b
    return 116.0 * (y ** (1 / 3) if y > 216 / 24389 else (24389 / 27 * y + 16) / 116) - 16.0


def test_colours_darken_monotonically_with_utilization() -> None:
    u = np.linspace(0.0, 1.0, 201)
    lightness = np.array([_lightness(colour_of(float(x))) for x in u])
    assert (np.diff(lightness) < 0).all()
    assert lightness[0] - lightness[-1] > 60  # light yellow to dark purple
    # beyond 1.0 the colour stays at the dark end; no utilization is a grey off the scale
    assert colour_of(2.0) == colour_of(1.0) == STOPS[-1] and colour_of(-1.0) == STOPS[0]
    assert colour_of(None) == colour_of(math.nan) == NO_VALUE
    assert NO_VALUE not in {colour_of(float(x)) for x in u}


def test_colour_table_is_matplotlibs_viridis() -> None:
    # The table is viridis sampled at 17 even stops, light end first (matplotlib 3.x).
    from matplotlib import colormaps

    cmap = colormaps["viridis"]
    for k, hex_colour in enumerate(STOPS):
        r, g, b, _ = cmap(1.0 - k / (len(STOPS) - 1))
        want = (round(r * 255), round(g * 255), round(b * 255))
        got = tuple(int(hex_colour[j:j + 2], 16) for j in (1, 3, 5))
        assert max(abs(a - b) for a, b in zip(got, want, strict=True)) <= 1, (k, hex_colour)


def test_axis_ticks_are_round_and_cover_the_data() -> None:
    # Common practice, no source: steps of 1, 2, 2.5 or 5 × 10^n (whole steps for counts)
    # from 0 past the largest value.
    from stanchion.service.reports.pictures import ticks

    for hi in (0.4, 3.0, 12.0, 59.06, 893.0, 20000.0):
        t = ticks(hi)
        assert t[0] == 0 and t[-1] >= hi and 2 <= len(t) <= 11
        steps = np.diff(t)
        assert np.allclose(steps, steps[0])
        mantissa = steps[0] / 10 ** math.floor(math.log10(steps[0]))
        assert round(mantissa, 9) in (1.0, 2.0, 2.5, 5.0)
        assert all(float(v).is_integer() for v in ticks(hi, integer=True))


def test_takedown_loads_show_their_tributary_area(sample) -> None:
    # The sample's post without analysis results gets takedown loads (sample_models/README.md);
    # its detail names the takedown as the source of its loads, area and L/Lo.
    _, _, tree, report = sample
    rows = [r for r in report["members"] if r.get("load_source") == "takedown"]
    assert rows
    for row in rows:
        (article,) = tree.find_all("article", data_member=row["id"])
        inputs = {r[0]: r for r in table_rows(article.find_all("table", class_="inputs")[0])}
        assert inputs["tributary area"][1] == f"{row['tributary_area']:.4g} ft²"
        assert inputs["tributary area"][2] == "load takedown"
        assert all(v[2] == "takedown" for k, v in inputs.items() if k.startswith("load "))


def test_baseline_changes_are_counted(tmp_path: Path) -> None:
    members = tmp_path / "members.json"
    members.write_text(json.dumps({"members": [
        {"id": "C-1", "section": "W14X48", "fy": 50, "length": 16,
         "loads": {"D": 95.0, "L": 60.0}}]}), encoding="utf-8")
    first = tmp_path / "first.json"
    check(members, outputs=OutputPaths(report=first))
    members.write_text(json.dumps({"members": [
        {"id": "C-1", "section": "W14X48", "fy": 50, "length": 16,
         "loads": {"D": 195.0, "L": 160.0}}]}), encoding="utf-8")
    page = tmp_path / "second.html"
    run = check(members, CheckOptions(baseline=first), OutputPaths(html=page))
    tree = parse(page.read_text(encoding="utf-8"))
    (table,) = [t for t in tree.find_all("table") if "new failures" in t.text()]
    header, values = table_rows(table)
    counts = dict(zip(header, values, strict=True))
    assert counts["new failures"] == str(run.report["changes"]["counts"]["new_failures"]) == "1"


def test_sample_plans_hold_the_models_grid_slabs_and_takedown_cells(sample) -> None:
    # The sample building (sample_models/generate.py): grid A-D (x) by 1-3 (y); the
    # Level 1 columns carry the Level 2 floor, 24 m x 16.5 m (a 1.5 m balcony beyond line 1)
    # less the 3 m x 3 m stair void: hand, 396 - 9 = 387 m² = 4,165.6 ft² (1 m² = 10.7639
    # ft²), tiled by the cells of the 12 Level 1 columns (service/plan_geometry.py).
    _, _, tree, report = sample
    figures = _storey_figures(tree)
    assert len(figures) == 3
    for storey, figure in figures.items():
        grid = figure.find_all("g", class_="grid")
        assert len(grid) == 1 and len(grid[0].find_all("line")) == 7, storey
        assert {t.text() for t in grid[0].find_all("text")} == set("ABCD123")
        assert figure.find_all("g", class_="slabs"), storey
        marks = figure.find_all("g", class_="mark")
        assert len(figure.find_all("path", class_="section")) == len(marks)
    level1 = figures["Level 1 - Library annex"]
    slabs = level1.find_all("g", class_="slabs")[0].find_all("path")
    assert len(slabs) == 1 and slabs[0].attrs["d"].count("M") == 2  # the stair void
    cells = level1.find_all("g", class_="tributary")[0].find_all("path")
    assert len(cells) == 12
    total = sum(float(c.attrs["data-area"]) for c in cells)
    assert total == pytest.approx(387 * 10.7639, rel=2e-3)
    assert report["units"]["length"] == "ft"
