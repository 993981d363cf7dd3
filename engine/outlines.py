"""Section properties of a closed outline (outer ring and voids), one SectionTable row.

Pure computation on points in inches (readers convert their units first): shapely validates
the outline, :mod:`engine.outline_families` recognises its family and turns it to the AISC
axes, and sectionproperties (finite elements; geometric and warping analysis) computes A,
Ix, Iy, J, Cw, the centroid and the shear centre of the outline as drawn.  The row has the
fields the parametric builders of ``engine.section_properties`` give, so Chapter E runs on it
unchanged; the element dimensions for Section E7 come from the recognised family.

Entry point: :func:`outline_section` (cached: see :func:`cache_clear`).  An outline that is
not a valid area, or fits no family, gives a reason and no row; an angle is recognised but,
as everywhere in the engine, out of scope.

Mesh: the largest triangle area is :data:`MESH_FACTOR` · t², t = 2A/perimeter (the mean wall
of a thin-walled section), on 6-node triangles.  Measured on W14X90, HSS8X8X1/2, PIPE8STD,
C12X30, WT7X45 built as outlines (tests/engine/test_outlines.py): A, I exact to the outline
(the mesh holds the polygon exactly), J and Cw within 0.2 % of a mesh four times finer
(within 1 % at eight times coarser); 0.2-0.7 s per distinct outline on one shared core, plus
about 1 s once per process to import sectionproperties.

Tubes: the outline's wall is taken as the nominal wall; the design wall follows the engine's
one rule (:func:`engine.tubes.design_wall`, AISC 360-22 §B4.2): where it is thinner the void
is enlarged by the difference (outside dimensions kept) before the analysis.
"""

from __future__ import annotations

import hashlib
import math
import time
from collections.abc import Sequence
from dataclasses import dataclass, field, replace

import numpy as np
import shapely
from numpy.typing import ArrayLike
from shapely.geometry import Polygon
from shapely.geometry.polygon import orient
from shapely.validation import explain_validity

from stanchion.engine.arrays import FloatArray
from stanchion.engine.compression import H_flexural_constant, ro_bar_squared
from stanchion.engine.outline_families import NO_FAMILY, Fit, recognise
from stanchion.engine.section_properties import WEIGHT_PER_AREA, i_flange_class
from stanchion.engine.sections import ElementClass, Kind, SectionTable
from stanchion.engine.tubes import design_wall

#: Largest triangle area of the mesh per t² (t = 2A/perimeter); see the module notes.
MESH_FACTOR = 0.25
#: Outline coordinates are rounded to this many inches for the cache key.
KEY_RESOLUTION = 1e-6
#: Distinct outlines kept in the cache.
CACHE_SIZE = 4096
#: An I outline whose fitted root radius is at most this fraction of tf has no fillets: its
#: flanges are built-up (docs/design.md §8 "Built-up I sections"; a rolled shape's root radius
#: is of the order of tf or more, a sharp outline fits r ~ 0; common practice, no source).
NO_FILLET = 0.05
SOURCE = "outline"

_KINDS = {"I": Kind.I_SHAPE, "U": Kind.CHANNEL, "T": Kind.TEE, "HSS": Kind.RECT_HSS,
          "HSS_ROUND": Kind.ROUND_HSS, "RECT": Kind.SOLID_RECT, "ROUND": Kind.SOLID_ROUND}
_NAMES = {"I": "I-shape", "U": "channel", "T": "tee", "HSS": "rectangular tube",
          "HSS_ROUND": "round tube", "RECT": "solid rectangle", "ROUND": "solid round",
          "L": "angle"}


@dataclass(frozen=True, eq=False)
class Outline:
    """A closed profile outline: the outer ring and the rings of its voids.

    Attributes:
        outer: (n, 2) points of the outer boundary, either direction, closed or not.
        voids: (m, 2) points of each void.
        notes: member messages about how the outline was read (kept by :meth:`scaled`,
            added to the section's notes).
    """

    outer: FloatArray
    voids: tuple[FloatArray, ...] = ()
    notes: tuple[str, ...] = ()

    @classmethod
    def of(cls, outer: ArrayLike, voids: Sequence[ArrayLike] = ()) -> Outline:
        """An outline from point lists.

        Args:
            outer: points of the outer boundary.
            voids: points of each void.

        Returns:
            The outline, as float arrays.
        """
        return cls(np.asarray(outer, dtype=float),
                   tuple(np.asarray(v, dtype=float) for v in voids))

    def scaled(self, factor: float) -> Outline:
        """The outline with every coordinate multiplied by ``factor`` (unit conversion).

        Args:
            factor: the scale, e.g. the model's length unit in inches.

        Returns:
            A new outline.
        """
        return Outline(self.outer * factor, tuple(v * factor for v in self.voids), self.notes)

    def key(self) -> str:
        """Hash of the outline rounded to :data:`KEY_RESOLUTION`, moved to its lowest corner."""
        rings = (self.outer, *self.voids)
        try:
            low = np.min(np.vstack(rings), axis=0)
        except ValueError:
            low = np.zeros(2)
        digest = hashlib.sha1(usedforsecurity=False)
        for ring in rings:
            q = np.round((ring.reshape(-1, 2) - low) / KEY_RESOLUTION)
            digest.update(np.nan_to_num(q).astype(np.int64).tobytes() + b"|")
        return digest.hexdigest()


@dataclass(frozen=True)
class Analysis:
    """sectionproperties results on the canonical axes (inches).

    Attributes:
        A: area.  Ix, Iy, Ixy: centroidal second moments about x, y.  I1, I2: principal.
        J: torsion constant.  Cw: warping constant.
        cx, cy: centroid.  xs, ys: shear centre (elasticity approach).
        elements: number of finite elements.  seconds: time taken.
    """

    A: float
    Ix: float
    Iy: float
    Ixy: float
    I1: float
    I2: float
    J: float
    Cw: float
    cx: float
    cy: float
    xs: float
    ys: float
    elements: int
    seconds: float


@dataclass(frozen=True)
class OutlineSection:
    """What an outline gives: a section row, or the reason it gives none.

    Attributes:
        table: a one-row :class:`SectionTable` (None when not checkable).
        family: the recognised family (``I``, ``U``, ``T``, ``HSS``, ``HSS_ROUND``, ``RECT``,
            ``ROUND``, ``L``) or None.
        dims: the family's element dimensions, in (see :class:`engine.outline_families.Fit`);
            for tubes ``t`` is the design wall and ``t_nominal`` the outline's wall.
        reason: why the section cannot be checked (None when it can).
        notes: member messages (the basis of the properties, the tube wall rule).
        analysis: the finite-element results (None when not analysed).
        source: provenance of the row: ``"outline"``.
    """

    table: SectionTable | None
    family: str | None
    dims: dict[str, float] = field(default_factory=dict)
    reason: str | None = None
    notes: tuple[str, ...] = ()
    analysis: Analysis | None = None
    source: str = SOURCE


# ---------------------------------------------------------------- validation


def _ring(points: FloatArray, what: str) -> tuple[list[tuple[float, float]], str | None]:
    """Distinct consecutive points of a ring (closing point dropped), or a problem."""
    pts = np.asarray(points, dtype=float)
    if pts.ndim != 2 or pts.shape[1] != 2:
        return [], f"{what} is not a list of 2D points"
    if not np.all(np.isfinite(pts)):
        return [], f"{what} has a coordinate that is not a finite number"
    keep = np.ones(len(pts), dtype=bool)
    keep[1:] = np.any(np.diff(pts, axis=0) != 0.0, axis=1)
    pts = pts[keep]
    if len(pts) > 1 and np.array_equal(pts[0], pts[-1]):
        pts = pts[:-1]
    if len(pts) < 3:
        return [], f"{what} has fewer than 3 distinct points"
    return [(float(x), float(y)) for x, y in pts], None


def polygon_of(outline: Outline) -> Polygon | str:
    """The outline as a valid shapely polygon, or why it is not one.

    Valid: every ring closed with at least 3 distinct finite points, no ring crossing itself
    or another, every void inside the outer ring, positive area.

    Args:
        outline: the outline.

    Returns:
        The polygon (outer ring counter-clockwise), or a one-line reason starting "outline".
    """
    outer, problem = _ring(outline.outer, "outline's outer boundary")
    if problem:
        return problem
    voids = []
    for k, void in enumerate(outline.voids, start=1):
        ring, problem = _ring(void, f"outline's void {k}")
        if problem:
            return problem
        voids.append(ring)
    polygon = Polygon(outer, voids)
    # points closer than 1e-7 of the extent (exporters' duplicates) would only spoil the mesh
    x0, y0, x1, y1 = polygon.bounds
    polygon = shapely.remove_repeated_points(polygon, 1e-7 * max(x1 - x0, y1 - y0))
    if not polygon.is_valid:
        return f"outline is not a valid area: {explain_validity(polygon)}"
    if not polygon.area > 0:
        return "outline encloses no area"
    return orient(polygon, sign=1.0)


# ---------------------------------------------------------------- analysis


def mesh_size(polygon: Polygon) -> float:
    """Largest triangle area: :data:`MESH_FACTOR` · t², t = 2A/perimeter.

    Args:
        polygon: the section.

    Returns:
        The sectionproperties ``mesh_sizes`` value.
    """
    t = 2.0 * polygon.area / polygon.length
    return float(MESH_FACTOR * t * t)


def analyse(polygon: Polygon) -> Analysis:
    """Geometric and warping analysis with sectionproperties (no material: geometry only).

    Args:
        polygon: a valid polygon, inches.

    Returns:
        The :class:`Analysis`.
    """
    from sectionproperties.analysis.section import Section  # imported when needed: 1 s
    from sectionproperties.pre.geometry import Geometry

    start = time.perf_counter()
    geometry = Geometry(polygon)
    geometry.create_mesh(mesh_sizes=[mesh_size(polygon)])
    section = Section(geometry)
    section.calculate_geometric_properties()
    section.calculate_warping_properties()
    Ix, Iy, Ixy = (float(v) for v in section.get_ic())
    principal = [float(v) for v in section.get_ip()]
    cx, cy = (float(v) for v in section.get_c())
    xs, ys = (float(v) for v in section.get_sc())
    return Analysis(
        A=float(section.get_area()), Ix=Ix, Iy=Iy, Ixy=Ixy, I1=principal[0], I2=principal[1],
        J=float(section.get_j()), Cw=float(section.get_gamma()), cx=cx, cy=cy, xs=xs, ys=ys,
        elements=len(section.elements), seconds=time.perf_counter() - start)


# ---------------------------------------------------------------- rows


def _elements(fit: Fit) -> dict[str, float]:
    """Element groups for Section E7 (AISC 360-22 Table B4.1a widths), by family."""
    d = fit.dims
    if fit.family == "I":  # case 1 (fillets) or 2 (none): b = bf/2; case 5: h = d - 2k
        return {"b1": d["bf"] / 2.0, "t1": d["tf"], "n1": 4,
                "cls1": int(i_flange_class(d["r"] > NO_FILLET * d["tf"])),
                "b2": d["d"] - 2.0 * d["k"],
                "t2": d["tw"], "n2": 1, "cls2": ElementClass.STIFFENED_WEB}
    if fit.family == "U":  # case 1: b = bf; case 5: h = d - 2k
        return {"b1": d["bf"], "t1": d["tf"], "n1": 2, "cls1": ElementClass.UNSTIFFENED_FLANGE,
                "b2": d["d"] - 2.0 * d["k"], "t2": d["tw"], "n2": 1,
                "cls2": ElementClass.STIFFENED_WEB}
    if fit.family == "T":  # case 1: b = bf/2; case 4: d
        return {"b1": d["bf"] / 2.0, "t1": d["tf"], "n1": 2,
                "cls1": ElementClass.UNSTIFFENED_FLANGE, "b2": d["d"], "t2": d["tw"], "n2": 1,
                "cls2": ElementClass.TEE_STEM}
    if fit.family == "HSS":  # case 6, B4.1b(d): clear distance less the inside radii
        t, r_in = d["t"], d["r_in"]
        return {"b1": max(d["B"] - 2.0 * (t + r_in), 0.0), "t1": t, "n1": 2,
                "cls1": ElementClass.HSS_WALL, "b2": max(d["H"] - 2.0 * (t + r_in), 0.0),
                "t2": t, "n2": 2, "cls2": ElementClass.HSS_WALL}
    if fit.family == "HSS_ROUND":  # case 9: D/t
        return {"b1": d["D"], "t1": d["t"], "n1": 1, "cls1": ElementClass.ROUND_WALL}
    return {}


def _sizes(fit: Fit) -> dict[str, float]:
    d = fit.dims
    if fit.family in ("I", "U", "T"):
        return {"d": d["d"], "bf": d["bf"], "tw": d["tw"], "tf": d["tf"]}
    if fit.family == "HSS":
        return {"d": d["H"], "bf": d["B"], "tw": d["t"], "tf": d["t"]}
    if fit.family == "HSS_ROUND":
        return {"d": d["D"], "bf": d["D"], "tw": d["t"], "tf": d["t"]}
    if fit.family == "RECT":
        return {"d": d["H"], "bf": d["B"]}
    return {"d": d["D"], "bf": d["D"]}


def _centre_offsets(fit: Fit, a: Analysis) -> dict[str, float]:
    """xo, yo (centroid to shear centre, positive) and x̄ / ȳ as the engine defines them."""
    x0, _, _, y1 = fit.polygon.bounds
    if fit.family == "U":  # x̄ from the back of the web
        return {"xo": abs(a.xs - a.cx), "xbar": a.cx - x0}
    if fit.family == "T":  # ȳ from the top of the flange
        return {"yo": abs(a.ys - a.cy), "ybar": y1 - a.cy}
    return {}


def section_row(fit: Fit, a: Analysis, label: str) -> SectionTable:
    """The one-row table of a recognised outline (closed and solid sections: Cw = 0).

    Args:
        fit: the recognised family on its canonical axes.
        a: the analysis of ``fit.polygon`` (tube voids enlarged to the design wall).
        label: the designation shown.

    Returns:
        A :class:`SectionTable` with one row.
    """
    closed = fit.family in ("HSS", "HSS_ROUND", "RECT", "ROUND")
    row: dict[str, float | str] = {
        "designation": label, "family": fit.family, "kind": _KINDS[fit.family],
        "weight": WEIGHT_PER_AREA * a.A, "A": a.A, "Ix": a.Ix, "Iy": a.Iy,
        "rx": math.sqrt(a.Ix / a.A), "ry": math.sqrt(a.Iy / a.A), "J": a.J,
        "Cw": 0.0 if closed else a.Cw,
        **_sizes(fit), **_elements(fit), **_centre_offsets(fit, a),
    }
    table = SectionTable.from_rows([row])
    ro2 = ro_bar_squared(table.xo, table.yo, table.Ix, table.Iy, table.A)
    table.ro = np.sqrt(ro2)
    table.H = H_flexural_constant(table.xo, table.yo, ro2)
    return table


def _design_wall(fit: Fit, standard: str | None) -> tuple[Fit, list[str]]:
    """Tubes: the void enlarged to the design wall of the standard, with its message."""
    if fit.family not in ("HSS", "HSS_ROUND"):
        return fit, []
    t = fit.dims["t"]
    t_design, note = design_wall(t, standard, fit.family)
    notes = ["outline's wall taken as the nominal wall; " + note]
    grow = t - t_design
    if grow <= 0:
        return replace(fit, dims={**fit.dims, "t_nominal": t}), notes
    outer = Polygon(fit.polygon.exterior)
    # a mitred offset moves every vertex of the (discretised) void, adding none
    void = Polygon(fit.polygon.interiors[0]).buffer(grow, join_style="mitre", mitre_limit=10.0)
    dims = {**fit.dims, "t": t_design, "t_nominal": t}
    if "r_in" in dims:
        dims["r_in"] = dims["r_in"] + grow
    return replace(fit, polygon=orient(outer.difference(void), sign=1.0), dims=dims), notes


def _describe(fit: Fit) -> str:
    shown = ", ".join(f"{k} {v:.4g}" for k, v in fit.dims.items() if k != "slope")
    return f"{_NAMES[fit.family]} ({shown} in)"


def _compute(outline: Outline, standard: str | None) -> OutlineSection:
    polygon = polygon_of(outline)
    if isinstance(polygon, str):
        return OutlineSection(None, None, reason=polygon)
    fit = recognise(polygon)
    if isinstance(fit, str):
        return OutlineSection(None, None, reason=fit)
    if fit.family == "L":
        return OutlineSection(None, "L", fit.dims, reason=(
            f"outline is an {_describe(fit)}; angles (L, 2L) are outside the scope of these "
            "checks"))
    fit, notes = _design_wall(fit, standard)
    try:
        a = analyse(fit.polygon)
    except Exception as error:  # any failure of the library is a reason, never a traceback
        return OutlineSection(None, fit.family, fit.dims, reason=(
            f"section properties of the {_NAMES[fit.family]} outline could not be computed "
            f"(sectionproperties: {type(error).__name__}: {error})"))
    notes.insert(0, f"section properties from the profile outline, recognised as a "
                    f"{_describe(fit)} (sectionproperties, {a.elements} elements)")
    return OutlineSection(section_row(fit, a, ""), fit.family, fit.dims, notes=tuple(notes),
                          analysis=a)


_CACHE: dict[tuple[str, str | None], OutlineSection] = {}


def cache_clear() -> None:
    """Forget every cached outline."""
    _CACHE.clear()


def outline_section(outline: Outline, label: str = "outline", standard: str | None = None
                    ) -> OutlineSection:
    """Section row of a closed outline, or the reason there is none.

    Identical outlines (to :data:`KEY_RESOLUTION`, wherever they lie) are analysed once.

    Args:
        outline: outer ring and voids, inches.
        label: the designation of the row (a profile name).
        standard: the product standard the material names (tube design wall), or None.

    Returns:
        The :class:`OutlineSection`; ``reason`` is set when it cannot be checked (invalid
        outline, :data:`engine.outline_families.NO_FAMILY`, angle).
    """
    key = (outline.key(), standard)
    found = _CACHE.get(key)
    if found is None:
        found = _compute(outline, standard)
        if len(_CACHE) >= CACHE_SIZE:
            _CACHE.pop(next(iter(_CACHE)))
        _CACHE[key] = found
    notes = found.notes + outline.notes
    if found.table is None:
        return replace(found, notes=notes)
    table = replace(found.table, designation=np.array([label], dtype=object))
    return replace(found, table=table, notes=notes)


__all__ = ["NO_FAMILY", "Analysis", "Outline", "OutlineSection", "analyse", "cache_clear",
           "outline_section", "polygon_of"]
