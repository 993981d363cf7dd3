"""Profile specs -> engine section rows: the catalog row, or a section from the dimensions.

The catalog row when the name and dimensions agree, else the section computed from the
modeled dimensions.

Rules, per distinct profile (one computation per distinct spec, not per column):

* A ProfileName found in the catalog (``engine.catalog.lookup``) whose modeled dimensions agree
  within 2 % (d, bf, tw, tf; rectangular HSS: the two outside dimensions in either order and
  the wall; round HSS / pipe: D and the wall) uses the tabulated properties (AISC Shapes
  Database v16.0).  An HSS / pipe wall agrees when it matches the design thickness tdes, or
  when it is a nominal wall whose A500 design wall (:func:`engine.tubes.design_wall`) does.
* Name in the catalog but dimensions disagree (or a profile type that cannot be that shape,
  e.g. a W name on a hollow rectangle): checked with the modeled dimensions, and the member's
  messages say so.
* Name not in the catalog, or no name: properties from the dimensions
  (``engine.section_properties``), with the catalog's "unknown section" text as a message.
* Catalog angles, asymmetric I profiles that are not a verified catalog shape, unsupported
  profile types and broken dimensions: not checked, with the reason.

HSS walls from dimensions: an IFC WallThickness is the nominal thickness of the tube; the
design thickness is the engine's rule (:func:`engine.tubes.design_wall`) for the product
standard named by the material (ASTM A500 / A53: 0.93 tnom; A1085, EN 10210 / 10219: tnom;
unknown: 0.93 tnom, conservatively, with a message).
"""

from __future__ import annotations

from collections.abc import Callable
from dataclasses import dataclass, field

import numpy as np

from stanchion.engine import section_properties as sp
from stanchion.engine.arrays import IntArray
from stanchion.engine.catalog import load_catalog, lookup, unknown_section_reason
from stanchion.engine.materials import band_thickness
from stanchion.engine.sections import Kind, SectionRow, SectionTable
from stanchion.engine.tubes import catalog_wall_note, design_wall
from stanchion.ifc_bridge.profiles import ProfileSpec

AGREE = 0.02
#: The product standard the catalog's HSS and pipe rows are tabulated for (tdes = 0.93 tnom).
_CATALOG_TUBES = "ASTM A500"

_COMPATIBLE: dict[str, Kind] = {
    "I": Kind.I_SHAPE, "ASYM_I": Kind.I_SHAPE, "HSS": Kind.RECT_HSS,
    "HSS_ROUND": Kind.ROUND_HSS, "T": Kind.TEE, "U": Kind.CHANNEL,
}
#: family -> builder taking the dimensions by name and ``label``.
_BUILDERS: dict[str, Callable[..., SectionTable]] = {
    "I": sp.i_section, "HSS": sp.rect_hollow, "HSS_ROUND": sp.circ_hollow, "T": sp.tee,
    "U": sp.channel, "RECT": sp.solid_rect, "ROUND": sp.solid_circle,
}
_CATALOG_SOURCE = "AISC Shapes Database v16.0"


@dataclass(frozen=True)
class SectionRequest:
    """One member's profile and the product standard its material names (None: unknown)."""

    spec: ProfileSpec
    standard: str | None = None


@dataclass
class Resolution:
    """Per-member outcome (lists aligned with the requests)."""

    sections: SectionTable
    index: IntArray
    basis: list[str]
    notes: list[list[str]]
    reasons: list[str | None]
    thickness: list[float | None] = field(default_factory=list)


def _close(a: float | None, b: float) -> bool:
    return a is not None and b > 0 and abs(a - b) <= AGREE * b


def _wall_agrees(t: float | None, tdes: float) -> bool:
    return t is not None and (_close(t, tdes) or _close(design_wall(t, _CATALOG_TUBES)[0], tdes))


def _wall_diff(t: float | None, tdes: float) -> str:
    shown = "unset" if t is None else (f"{t:.4g} in (as nominal: design wall "
                                       f"{design_wall(t, _CATALOG_TUBES)[0]:.4g} in)")
    return f"wall {shown} vs tdes {tdes:.4g} in"


def _compare(spec: ProfileSpec, row: SectionRow) -> list[str]:
    """Differences beyond 2 % between modeled dimensions and a catalog row (empty: agree)."""
    diffs: list[str] = []

    def check(label: str, modeled: float | None, tabulated: float) -> None:
        if not _close(modeled, tabulated):
            shown = "unset" if modeled is None else f"{modeled:.4g} in"
            diffs.append(f"{label} {shown} vs {tabulated:.4g} in")

    fam = spec.family
    if fam in ("I", "T", "U", "ASYM_I"):
        for key in ("d", "bf", "tw", "tf"):
            check(key, spec.dim(key), row[key])
        if fam == "ASYM_I":
            check("top bf", spec.dim("bf_top"), row["bf"])
            check("top tf", spec.dim("tf_top"), row["tf"])
    elif fam == "HSS":
        modeled = sorted(v for v in (spec.dim("H"), spec.dim("B")) if v is not None)
        tab = sorted((row["d"], row["bf"]))
        if len(modeled) != 2 or not all(_close(m, t) for m, t in zip(modeled, tab, strict=True)):
            diffs.append(f"outside {'x'.join(f'{v:.4g}' for v in modeled)} in vs "
                         f"{tab[1]:.4g}x{tab[0]:.4g} in")
        if not _wall_agrees(spec.dim("t"), row["tw"]):
            diffs.append(_wall_diff(spec.dim("t"), row["tw"]))
    elif fam == "HSS_ROUND":
        check("D", spec.dim("D"), row["d"])
        if not _wall_agrees(spec.dim("t"), row["tw"]):
            diffs.append(_wall_diff(spec.dim("t"), row["tw"]))
    return diffs


def _builder_dims(req: SectionRequest) -> dict[str, float | None]:
    """Arguments for the section_properties builder (design wall thickness applied)."""
    spec = req.spec
    dims = {k: v for k, v in spec.dims}
    t = dims.get("t")
    if spec.family in ("HSS", "HSS_ROUND") and t is not None:
        t_design = design_wall(t, req.standard, spec.family)[0]
        dims["t"] = t_design
        if spec.family == "HSS" and dims.get("r_out") is None:
            dims["r_out"] = 2.0 * t_design  # the builder's default (AISC practice)
    return dims


def _wall_notes(req: SectionRequest) -> list[str]:
    """The design-wall message of a tube built from its dimensions (none for other shapes)."""
    t = req.spec.dim("t")
    if req.spec.family not in ("HSS", "HSS_ROUND") or t is None:
        return []
    return ["modeled WallThickness taken as the nominal wall; " + design_wall(
        t, req.standard, req.spec.family)[1]]


def _decide(req: SectionRequest, cat_index: int, catalog: SectionTable
            ) -> tuple[int, list[str], str | None]:
    """(catalog row or -1 for "from dimensions" or -2 for "not checked", notes, reason)."""
    spec = req.spec
    name = spec.name
    if spec.family is None:
        if name and cat_index >= 0:
            return -2, [], (f"{spec.problem}; '{name}' is a catalog shape, but a profile of "
                            "this type cannot confirm its dimensions")
        if name:
            return -2, [], f"{spec.problem}; {unknown_section_reason(name)}"
        return -2, [], spec.problem
    if spec.problem:
        return -2, [], spec.problem
    if cat_index >= 0:
        row = catalog.row(cat_index)
        designation = row["designation"]
        if row["kind"] == Kind.UNSUPPORTED:
            return -2, [], unknown_section_reason(designation)
        compatible = _COMPATIBLE.get(spec.family) == row["kind"]
        diffs = _compare(spec, row) if compatible else [
            f"the catalog shape is a {row['family']} but the model has {spec.ifc_class}"]
        if not diffs:
            notes = [f"section properties of {designation} from the catalog "
                     f"({_CATALOG_SOURCE})"]
            wall = catalog_wall_note(req.standard)
            if wall and row["kind"] in (Kind.RECT_HSS, Kind.ROUND_HSS):
                notes.append(wall)
            return cat_index, notes, None
        if spec.family == "ASYM_I":
            return -2, [], (f"{spec.describe()}: modeled dimensions disagree with catalog "
                            f"{designation} ({'; '.join(diffs)}); asymmetric I sections are "
                            "not supported")
        return -1, [f"modeled dimensions disagree with catalog {designation} "
                    f"({'; '.join(diffs)}); checked with the modeled dimensions"], None
    if spec.family == "ASYM_I":
        what = f"'{name}' is not a catalog shape" if name else "no catalog name"
        return -2, [], (f"asymmetric I profile (IfcAsymmetricIShapeProfileDef), {what}: "
                        "not supported")
    notes = []
    if name:
        notes.append(f"{unknown_section_reason(name)}; properties from the modeled dimensions")
    else:
        notes.append(f"unnamed {spec.ifc_class}: properties from the modeled dimensions")
    return -1, notes, None


def _thickest(spec: ProfileSpec) -> float | None:
    """The thickness EN grades are banded by, in (:func:`engine.materials.band_thickness`)."""
    dims = dict(spec.dims)
    if spec.family == "RECT":
        return band_thickness("solid_rect", (dims.get("B"), dims.get("D")))
    if spec.family == "ROUND":
        return band_thickness("solid_round", (dims.get("D"),))
    return band_thickness("walls", (dims.get(k) for k in ("tw", "tf", "t", "tf_top")))


def resolve_sections(requests: list[SectionRequest]) -> Resolution:
    """Section rows for every member (vectorized catalog lookup and builders per family)."""
    n = len(requests)
    unique: dict[SectionRequest, int] = {}
    member_key = np.empty(n, dtype=np.int64)
    for i, req in enumerate(requests):
        member_key[i] = unique.setdefault(req, len(unique))
    reqs = list(unique)
    catalog = load_catalog()
    names = [r.spec.name if r.spec.name else None for r in reqs]
    cat = lookup(names) if reqs else np.zeros(0, dtype=np.int64)
    decided = [_decide(r, int(c), catalog) for r, c in zip(reqs, cat, strict=True)]

    u_notes = [list(d[1]) for d in decided]
    u_reason: list[str | None] = [d[2] for d in decided]
    u_row = np.full(len(reqs), -1, dtype=np.int64)
    u_basis = ["" for _ in reqs]
    tables: list[SectionTable] = []
    offset = 0
    cat_rows = sorted({d[0] for d in decided if d[0] >= 0})
    if cat_rows:
        tables.append(catalog.take(np.array(cat_rows, dtype=np.int64)))
        where = {c: k for k, c in enumerate(cat_rows)}
        for u, d in enumerate(decided):
            if d[0] >= 0:
                u_row[u], u_basis[u] = where[d[0]], "catalog"
        offset = len(cat_rows)
    by_family: dict[str, list[int]] = {}
    for u, d in enumerate(decided):
        family = reqs[u].spec.family
        if d[0] == -1 and family is not None:  # -1 is only decided for a known family
            by_family.setdefault(family, []).append(u)
    for family, members in by_family.items():
        dims = [_builder_dims(reqs[u]) for u in members]
        keys = list(dims[0])
        arrays = {k: np.array([dd[k] for dd in dims], dtype=float) for k in keys}
        problems = sp.dimension_problems(family, **arrays)
        good = [k for k, p in enumerate(problems) if not p]
        for k, p in enumerate(problems):
            if p:
                u = members[k]
                u_reason[u] = f"profile {reqs[u].spec.describe()} has invalid dimensions: {p}"
        if not good:
            continue
        sel = np.array(good, dtype=np.int64)
        labels = np.array([reqs[members[k]].spec.label for k in good], dtype=object)
        table = _BUILDERS[family](**{k: v[sel] for k, v in arrays.items()}, label=labels)
        tables.append(table)
        for j, k in enumerate(good):
            u = members[k]
            u_row[u], u_basis[u] = offset + j, "dimensions"
            u_notes[u].extend(reqs[u].spec.notes)
            u_notes[u].extend(_wall_notes(reqs[u]))
        offset += len(good)
    sections = SectionTable.concat(tables) if tables else SectionTable.empty()
    thickness = [_thickest(r.spec) for r in reqs]
    return Resolution(
        sections=sections,
        index=u_row[member_key] if n else np.zeros(0, dtype=np.int64),
        basis=[u_basis[k] for k in member_key],
        notes=[list(u_notes[k]) for k in member_key],
        reasons=[u_reason[k] for k in member_key],
        thickness=[thickness[k] for k in member_key],
    )
