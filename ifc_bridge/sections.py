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
  e.g. a W name on a hollow rectangle): not checked, the reason naming the name and the
  dimensions.  Name and geometry must agree: a safety check does not pick one of two
  contradicting descriptions of a member (common practice, no source).
* A designation of another standard (``engine.designations``: EN 10365, BS 4-1, AS/NZS
  3679, EN 10210 / 10219) on a usable geometry: the section from the geometry, cross-checked
  by :func:`engine.designations.agrees` -- agreement is a message, disagreement the reason
  the member is not checked.  Without usable geometry (a profile type that is not read, an
  outline that cannot be read or fits no family, a missing dimension): the section the name
  determines (:func:`engine.designations.section_from_designation`: tubes, IPE, HE, UPE),
  else not checked with its reason ("... dimensions from the model's geometry are needed").
  Never the nearest AISC shape.
* Outlines (arbitrary profiles, ``ProfileSpec.outline``): the section of the outline
  (:func:`engine.outlines.outline_section`, basis ``outline``), checked against a catalog
  or other name as above.
* Name not in the catalog, or no name: properties from the dimensions
  (``engine.section_properties``), with the catalog's "unknown section" text as a message.
* Catalog angles, asymmetric I profiles that are not a verified catalog shape, unsupported
  profile types and broken dimensions: not checked, with the reason.

HSS walls from dimensions: an IFC WallThickness is the nominal thickness of the tube; the
design thickness is the engine's rule (:func:`engine.tubes.design_wall`) for the product
standard of :func:`engine.tubes.tube_standard`: the material's, else the one an EN tube
name gives (ASTM A500 / A53: 0.93 tnom; A1085, EN 10210 / 10219: tnom; unknown: 0.93 tnom,
conservatively, with a message).
"""

from __future__ import annotations

from collections.abc import Callable
from dataclasses import dataclass, field

import numpy as np

from stanchion.engine import section_properties as sp
from stanchion.engine.arrays import IntArray
from stanchion.engine.catalog import load_catalog, lookup, unknown_section_reason
from stanchion.engine.designations import (
    AS_WELDED,
    Designation,
    agrees,
    designation_of,
    section_from_designation,
)
from stanchion.engine.materials import band_thickness
from stanchion.engine.outlines import outline_section
from stanchion.engine.sections import Kind, SectionRow, SectionTable, take_flanges_as_built_up
from stanchion.engine.tubes import catalog_wall_note, design_wall, tube_standard
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
    family: list[str | None] = field(default_factory=list)


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


def _tube_standard(req: SectionRequest) -> str | None:
    """The tube standard of a member: its material's, else its EN tube name's (or None)."""
    named = designation_of(req.spec.name)
    std = tube_standard(req.standard, named.standard if named is not None else None)
    return std.name if std is not None else None


def _builder_dims(req: SectionRequest) -> dict[str, float | None]:
    """Arguments for the section_properties builder (design wall thickness applied)."""
    spec = req.spec
    dims = {k: v for k, v in spec.dims}
    t = dims.get("t")
    if spec.family in ("HSS", "HSS_ROUND") and t is not None:
        t_design = design_wall(t, _tube_standard(req), spec.family)[0]
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
        t, _tube_standard(req), req.spec.family)[1]]


#: Decision codes besides a catalog row index (>= 0).
_DIMENSIONS, _NOT_CHECKED, _OWN_ROW = -1, -2, -3
_FAMILY_OF_KIND = {Kind.I_SHAPE: "I", Kind.CHANNEL: "U", Kind.TEE: "T", Kind.RECT_HSS: "HSS",
                   Kind.ROUND_HSS: "HSS_ROUND", Kind.SOLID_RECT: "RECT",
                   Kind.SOLID_ROUND: "ROUND"}


@dataclass
class _Decision:
    """One distinct request's outcome before the rows are gathered.

    ``code``: a catalog row (>= 0), ``_DIMENSIONS`` (parametric builder), ``_NOT_CHECKED``
    or ``_OWN_ROW`` (``table``: the outline's or the designation's row); ``basis`` the
    provenance word; ``named``: a designation still to be cross-checked with the row.
    """

    code: int
    notes: list[str] = field(default_factory=list)
    reason: str | None = None
    table: SectionTable | None = None
    basis: str = ""
    named: Designation | None = None
    family: str | None = None


def _not_checked(reason: str | None) -> _Decision:
    return _Decision(_NOT_CHECKED, reason=reason)


def _from_name(req: SectionRequest, named: Designation) -> _Decision:
    """A profile without usable geometry whose name is a designation of another standard."""
    spec = req.spec
    built = section_from_designation(named, req.standard)
    why = spec.problem or f"profile {spec.describe()} gives no usable geometry"
    if built.section is None:
        return _not_checked(f"{why}; {built.reason}")
    notes = [f"{why}: the section is built from its name {named.label}", *built.notes]
    return _Decision(_OWN_ROW, notes, table=built.section, basis="designation",
                     family=_FAMILY_OF_KIND.get(named.kind))


def _catalog(req: SectionRequest, cat_index: int, catalog: SectionTable) -> _Decision:
    """A catalog name on a usable geometry: the tabulated row when they agree."""
    spec = req.spec
    row = catalog.row(cat_index)
    designation = row["designation"]
    if row["kind"] == Kind.UNSUPPORTED:
        return _not_checked(unknown_section_reason(designation))
    what = "outline" if spec.outline is not None else "modeled dimensions"
    compatible = _COMPATIBLE.get(spec.family or "") == row["kind"]
    diffs = _compare(spec, row) if compatible else [
        f"the catalog shape is a {row['family']} but the model has "
        + (f"a {spec.family} outline" if spec.outline is not None else spec.ifc_class)]
    if diffs:
        extra = ("; asymmetric I sections are not supported" if spec.family == "ASYM_I"
                 else "; name and geometry must agree")
        return _not_checked(f"{spec.describe()}: {what} disagree with catalog {designation} "
                            f"({'; '.join(diffs)}){extra}")
    notes = [f"section properties of {designation} from the catalog ({_CATALOG_SOURCE}); "
             f"the {what} agree within 2 %"]
    wall = catalog_wall_note(req.standard)
    if wall and row["kind"] in (Kind.RECT_HSS, Kind.ROUND_HSS):
        notes.append(wall)
    return _Decision(cat_index, notes, basis="catalog", family=spec.family)


def _outline(req: SectionRequest, named: Designation | None) -> _Decision:
    """An outline's own row (the tube wall by the member's standard)."""
    spec = req.spec
    assert spec.outline is not None
    tube = spec.family in ("HSS", "HSS_ROUND")
    found = outline_section(spec.outline, spec.label, _tube_standard(req) if tube else None)
    if found.table is None:
        return _not_checked(f"profile {spec.describe()}: {found.reason}")
    notes = list(found.notes)
    if spec.name and named is None:
        notes.append(f"{unknown_section_reason(spec.name)}; properties from the outline")
    return _Decision(_OWN_ROW, notes, table=found.table, basis="outline", named=named,
                     family=spec.family)


def _decide(req: SectionRequest, cat_index: int, catalog: SectionTable) -> _Decision:
    """What one distinct profile request gives (see the module rules)."""
    spec = req.spec
    name = spec.name
    named = designation_of(name) if cat_index < 0 else None
    usable = spec.family is not None and spec.problem is None
    if not usable and named is not None and spec.family != "L":
        return _from_name(req, named)
    if spec.family is None:
        if name and cat_index >= 0:
            return _not_checked(f"{spec.problem}; '{name}' is a catalog shape, but a profile "
                                "of this type cannot confirm its dimensions")
        if name and named is None:
            return _not_checked(f"{spec.problem}; {unknown_section_reason(name)}")
        return _not_checked(spec.problem)
    if spec.problem:
        return _not_checked(spec.problem)
    if cat_index >= 0:
        return _catalog(req, cat_index, catalog)
    if spec.outline is not None:
        return _outline(req, named)
    if spec.family == "ASYM_I":
        what = f"'{name}' is not a catalog shape" if name else "no catalog name"
        return _not_checked(f"asymmetric I profile (IfcAsymmetricIShapeProfileDef), {what}: "
                            "not supported")
    if named is not None:
        notes = []
    elif name:
        notes = [f"{unknown_section_reason(name)}; properties from the modeled dimensions"]
    else:
        notes = [f"unnamed {spec.ifc_class}: properties from the modeled dimensions"]
    return _Decision(_DIMENSIONS, notes, basis="dimensions", named=named, family=spec.family)


def _thickest(spec: ProfileSpec, row: SectionRow | None = None) -> float | None:
    """The thickness EN grades are banded by, in (:func:`engine.materials.band_thickness`)."""
    if row is not None and spec.family is None:  # a section built from its name
        return band_thickness("walls", (row["tw"], row["tf"]))
    dims = dict(spec.dims)
    if spec.family == "RECT":
        return band_thickness("solid_rect", (dims.get("B"), dims.get("D")))
    if spec.family == "ROUND":
        return band_thickness("solid_round", (dims.get("D"),))
    return band_thickness("walls", (dims.get(k) for k in ("tw", "tf", "t", "tf_top")))


def _name_check(decided: _Decision, sections: SectionTable, row: int) -> None:
    """Cross-check a designation with the row built from the geometry (in place)."""
    named = decided.named
    if named is None or row < 0:
        return
    if named.standard == AS_WELDED:  # welded plate I: built-up flanges (engine rule)
        take_flanges_as_built_up(sections, np.array([row], dtype=np.int64))
    problem = agrees(named, sections.row(row))
    if problem is None:
        decided.notes.append(f"profile name {named.label} agrees with the geometry (2 %)")
        return
    decided.reason = f"{problem}; name and geometry must agree"
    decided.code = _NOT_CHECKED


def _parametric(reqs: list[SectionRequest], decided: list[_Decision], offset: int
                ) -> tuple[list[SectionTable], dict[int, int]]:
    """Rows from the modeled dimensions, per family: (tables, request -> row)."""
    tables: list[SectionTable] = []
    rows: dict[int, int] = {}
    by_family: dict[str, list[int]] = {}
    for u, d in enumerate(decided):
        family = reqs[u].spec.family
        if d.code == _DIMENSIONS and family is not None:
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
                decided[u].code = _NOT_CHECKED
                decided[u].reason = (f"profile {reqs[u].spec.describe()} has invalid "
                                     f"dimensions: {p}")
        if not good:
            continue
        sel = np.array(good, dtype=np.int64)
        labels = np.array([reqs[members[k]].spec.label for k in good], dtype=object)
        tables.append(_BUILDERS[family](**{k: v[sel] for k, v in arrays.items()},
                                        label=labels))
        for j, k in enumerate(good):
            u = members[k]
            rows[u] = offset + j
            decided[u].notes.extend(reqs[u].spec.notes)
            decided[u].notes.extend(_wall_notes(reqs[u]))
        offset += len(good)
    return tables, rows


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

    u_row = np.full(len(reqs), -1, dtype=np.int64)
    tables: list[SectionTable] = []
    cat_rows = sorted({d.code for d in decided if d.code >= 0})
    if cat_rows:
        tables.append(catalog.take(np.array(cat_rows, dtype=np.int64)))
        where = {c: k for k, c in enumerate(cat_rows)}
        for u, d in enumerate(decided):
            if d.code >= 0:
                u_row[u] = where[d.code]
    offset = len(cat_rows)
    for u, d in enumerate(decided):
        if d.code == _OWN_ROW and d.table is not None:
            tables.append(d.table)
            u_row[u] = offset
            offset += len(d.table)
    built, rows = _parametric(reqs, decided, offset)
    tables.extend(built)
    for u, r in rows.items():
        u_row[u] = r
    sections = SectionTable.concat(tables) if tables else SectionTable.empty()
    for u, d in enumerate(decided):
        _name_check(d, sections, int(u_row[u]) if d.code != _NOT_CHECKED else -1)
        if d.code == _NOT_CHECKED:
            u_row[u] = -1
    thickness = [_thickest(r.spec, sections.row(int(u_row[u]))
                           if u_row[u] >= 0 and r.spec.family is None else None)
                 for u, r in enumerate(reqs)]
    return Resolution(
        sections=sections,
        index=u_row[member_key] if n else np.zeros(0, dtype=np.int64),
        basis=[decided[k].basis if u_row[k] >= 0 else "" for k in member_key],
        notes=[list(decided[k].notes) for k in member_key],
        reasons=[decided[k].reason for k in member_key],
        thickness=[thickness[k] for k in member_key],
        family=[decided[k].family or reqs[k].spec.family for k in member_key],
    )
