"""Checking a members request: request -> member table -> engine -> report.

Units are converted here, at the edge: the request's units in, the engine's kip, inch and
ksi inside, the request's units again in the report.  Used by the pipeline for members files
(:mod:`stanchion.service.pipeline`) and by the HTTP checks route.
"""

from __future__ import annotations

import operator
from typing import Any

import numpy as np

from stanchion.engine import catalog, section_properties
from stanchion.engine.check import CheckResults, check_members
from stanchion.engine.combinations import custom_combinations
from stanchion.engine.materials import (
    E_DEFAULT,
    G_DEFAULT,
    band_thickness,
    match_grade,
    material_class,
    product_standard,
    stainless_reason,
)
from stanchion.engine.members import LOAD_TYPES, MemberTable
from stanchion.engine.sections import Kind, SectionTable
from stanchion.engine.tubes import ERW_RATIO, catalog_wall_note, design_wall
from stanchion.engine.units import force_factor, length_factor, stress_factor
from stanchion.service.errors import InputError
from stanchion.service.reports.report import build_report
from stanchion.service.request import Member, MembersRequest, Profile
from stanchion.service.suggestions import suggest

#: Member fields in the order of the request table's first columns.
_SCALARS = ("fy", "length", "lx", "ly", "lz", "kx", "ky", "kz", "required_strength")
_SCALAR_ITEMS = tuple(map(operator.itemgetter, _SCALARS))
_loads_item = operator.itemgetter("loads")
_id_item = operator.itemgetter("id")
_NO_LOADS: dict = {}
_profile_attr = operator.attrgetter("profile")
_grade_item = operator.itemgetter("grade")
_TUBES = (int(Kind.RECT_HSS), int(Kind.ROUND_HSS))
_candidates_attr = operator.attrgetter("candidates")
_max_utilization_attr = operator.attrgetter("max_utilization")


def _floats(values: list[float | None]) -> np.ndarray:
    """A float array of ``values``, NaN where a value is None."""
    if values.count(None) == len(values):
        return np.full(len(values), np.nan)
    return np.array(values, dtype=float)  # None -> NaN


def _profile_section(p: Profile, default_unit: str, grade: str | None = None
                     ) -> tuple[SectionTable, str | None]:
    """Section properties of a parametric profile (dimensions converted to inches).

    Returns:
        The section row, and for tubes the message naming the design-wall rule applied to
        the nominal ``t`` (:func:`engine.tubes.design_wall` with the member's ``grade``).
    """
    f = length_factor(p.unit or default_unit)

    def v(name: str) -> float:
        """A dimension the shape needs, in inches (the request model requires it)."""
        x = getattr(p, name)
        if x is None:
            raise ValueError(f"{p.shape} needs '{name}'")
        return float(x) * f

    def opt(name: str) -> float | None:
        """A dimension the shape may give (a corner or fillet radius), in inches."""
        x = getattr(p, name)
        return None if x is None else float(x) * f

    r = opt("r") or 0.0
    if p.shape == "I":
        return section_properties.i_section(v("d"), v("bf"), v("tw"), v("tf"), r), None
    if p.shape == "T":
        return section_properties.tee(v("d"), v("bf"), v("tw"), v("tf"), r), None
    if p.shape == "U":
        return section_properties.channel(v("d"), v("bf"), v("tw"), v("tf"), r), None
    if p.shape == "RECT_HOLLOW":
        t, note = design_wall(v("t"), grade, "HSS")
        label = f"HSS {v('h'):.4g}x{v('b'):.4g}x{v('t'):.4g}"  # nominal wall
        return section_properties.rect_hollow(v("h"), v("b"), t, opt("r"), label=label), note
    if p.shape == "CIRC_HOLLOW":
        t, note = design_wall(v("t"), grade, "HSS_ROUND")
        label = f"HSS_ROUND {v('D'):.4g}x{v('t'):.4g}"  # nominal wall
        return section_properties.circ_hollow(v("D"), t, label=label), note
    if p.shape == "RECT":
        return section_properties.solid_rect(v("h"), v("b")), None
    return section_properties.solid_circle(v("D")), None


def _sections(members: list[Member], length_unit: str
              ) -> tuple[SectionTable, np.ndarray, list[str | None], list[str],
                         dict[int, list[str]]]:
    """Section rows for the members: catalog rows plus one row per parametric profile.

    Returns:
        The section table, each member's row (-1: none), reasons, labels, and messages by
        member row (tube design walls).
    """
    cat = catalog.load_catalog()
    names = [m.section or "" for m in members]
    idx = catalog.lookup(names)
    reasons: list[str | None] = [None] * len(members)
    found = idx >= 0
    # Catalog rows: the canonical designation; the rest one by one below.
    designations = catalog.designations()
    labels = [designations[i] if i >= 0 else name
              for i, name in zip(idx.tolist(), names, strict=True)]
    extra: list[SectionTable] = []
    notes: dict[int, list[str]] = {}
    odd = sorted({*(~found).nonzero()[0].tolist(),
                  *(i for i, p in enumerate(map(_profile_attr, members)) if p is not None)})
    for i in odd:
        m = members[i]
        if m.section and m.profile:
            reasons[i] = "give either 'section' or 'profile', not both"
            idx[i] = -1
            labels[i] = m.section
        elif m.profile is not None:
            try:
                row, wall = _profile_section(m.profile, length_unit, m.grade)
            except ValueError as exc:
                reasons[i] = f"profile: {exc}"
                idx[i] = -1
                continue
            idx[i] = len(cat) + sum(len(t) for t in extra)
            labels[i] = str(row.designation[0])
            extra.append(row)
            if wall:
                notes[i] = [wall]
        elif not m.section:
            reasons[i] = "no section or profile given"
        else:
            reasons[i] = catalog.unknown_section_reason(m.section)
    table = SectionTable.concat([cat, *extra]) if extra else cat
    return table, idx, reasons, labels, notes


def _thickest(sections: SectionTable, row: int, profile: Profile | None, length_unit: str
              ) -> float | None:
    """The thickness EN grades are banded by, nominal, in.

    :func:`engine.materials.band_thickness` of a profile's dimensions as given (a tube's
    ``t`` is nominal) or of a catalog row (a catalog tube's nominal wall is its tabulated
    tdes / 0.93, the catalog's A500 rule, :data:`engine.tubes.ERW_RATIO`).
    """
    if profile is not None:
        f = length_factor(profile.unit or length_unit)
        scaled = [None if v is None else v * f for v in
                  (profile.h, profile.b, profile.D, profile.t, profile.tw, profile.tf)]
        h, b, d, t, tw, tf = scaled
        if profile.shape == "RECT":
            return band_thickness("solid_rect", (h, b))
        if profile.shape == "CIRCLE":
            return band_thickness("solid_round", (d,))
        return band_thickness("walls", (t, tw, tf))
    kind = int(sections.kind[row])
    if kind == Kind.SOLID_RECT:
        return band_thickness("solid_rect", (float(sections.d[row]), float(sections.bf[row])))
    if kind == Kind.SOLID_ROUND:
        return band_thickness("solid_round", (float(sections.d[row]),))
    if kind in _TUBES:
        return band_thickness("walls", (float(sections.tw[row]) / ERW_RATIO,))
    return band_thickness("walls", (float(sections.tw[row]), float(sections.tf[row])))


def _apply_grades(
    req: MembersRequest, grades: list[str | None], sections: SectionTable, idx: np.ndarray,
    Fy: np.ndarray, reasons: list[str | None], notes: dict[int, list[str]],
) -> None:
    """Members with a ``grade``: Fy from it where ``fy`` is absent, and their messages.

    ``Fy`` (ksi) is filled in place; a grade that gives no yield stress for a member without
    ``fy`` makes it not checked, with the reason.
    """
    stress = req.units.stress
    to_user = 1.0 / stress_factor(stress)
    for i, grade in enumerate(grades):
        if grade is None:
            continue
        stainless = stainless_reason(material_class([grade]))
        if stainless is not None:  # AISC 370's, whatever fy is given (docs/design.md §8)
            reasons[i] = stainless
            continue
        row = int(idx[i])
        family = str(sections.family[row]) if row >= 0 else None
        thickness = (_thickest(sections, row, req.members[i].profile, req.units.length)
                     if row >= 0 else None)
        found, gnotes = match_grade(grade, family, thickness)
        said = notes.setdefault(i, [])
        said.extend(gnotes)
        if found is None and product_standard(grade) is None:
            said.append(f"grade '{grade}' is not a grade or product standard stanchion knows")
        if row >= 0 and int(sections.kind[row]) in _TUBES and row < len(catalog.load_catalog()):
            wall = catalog_wall_note(grade)
            if wall:
                said.append(wall)
        if not np.isnan(Fy[i]):
            if found is not None and abs(Fy[i] - found.fy) > 0.005 * found.fy:
                said.append(f"fy = {Fy[i] * to_user:.4g} {stress} given is used; grade "
                            f"{found.grade.name} specifies {found.fy * to_user:.4g} {stress} "
                            f"min. ({found.grade.source})")
        elif found is not None:
            Fy[i] = found.fy
            said.append(found.note)
        elif reasons[i] is None:
            reasons[i] = (f"no yield stress: fy is not given and grade '{grade}' gives none "
                          "(name the grade, e.g. 'A500 Gr C', 'A992', 'S355', or give fy)")


def members_from_request(req: MembersRequest) -> MemberTable:
    """Convert a members request into the engine's member table (kip, inch, ksi)."""
    ms = req.members
    fL = length_factor(req.units.length)
    fF = force_factor(req.units.force)
    fS = stress_factor(req.units.stress)
    sections, idx, reasons, labels, notes = _sections(ms, req.units.length)

    # The members' numbers, one float column per field (None -> NaN), each read in one pass
    # over the models' field dicts (itemgetter) or load mappings (a type may be absent):
    # column by column is much cheaper than member by member for a small request.
    fields = list(map(vars, ms))
    loads_of = [_NO_LOADS if x is None else x for x in map(_loads_item, fields)]
    fy, length, lx, ly, lz, kx, ky, kz, required = (
        _floats(list(map(get, fields))) for get in _SCALAR_ITEMS)
    loads = np.stack([_floats([d.get(t) for d in loads_of]) for t in LOAD_TYPES], axis=1) * fF
    length = length * fL
    lx, ly, lz = (lx * fL, ly * fL, lz * fL)
    # A bad length given is named "length", the field given, even where lx, ly and lz are
    # all given (the engine names a bad lx "unbraced length x"; docs/design.md §2).
    bad_length = ~np.isnan(length) & ~(np.isfinite(length) & (length > 0))
    for i in np.flatnonzero(bad_length):
        reasons[i] = reasons[i] or "length must be a finite number greater than zero"
    Fy = fy * fS
    grades = list(map(_grade_item, fields))
    if grades.count(None) != len(grades):
        _apply_grades(req, grades, sections, idx, Fy, reasons, notes)
    E = (req.E * fS) if req.E is not None else E_DEFAULT
    G = (req.G * fS) if req.G is not None else G_DEFAULT
    return MemberTable.build(
        ids=list(map(_id_item, fields)),
        name=[f["name"] or f["id"] for f in fields],
        section_label=labels,
        sections=sections,
        section_index=idx,
        Fy=Fy,
        length=length,
        lx=np.where(np.isnan(lx), length, lx),
        ly=np.where(np.isnan(ly), length, ly),
        lz=np.where(np.isnan(lz), length, lz),
        kx=kx,
        ky=ky,
        kz=kz,
        E=E,
        G=G,
        loads=loads,
        required_strength=required * fF,
        reason=reasons,
        messages=[notes.get(i, []) for i in range(len(ms))] if notes else None,
    )


def run_request(req: MembersRequest) -> tuple[MemberTable, CheckResults]:
    """Check every member of a request."""
    members = members_from_request(req)
    try:
        combos = (custom_combinations([c.model_dump() for c in req.combinations])
                  if req.combinations else None)
    except ValueError as exc:
        raise InputError(f"combinations: {exc}", field="combinations") from None
    results = check_members(members, req.design_method, combos,
                            half_live=req.half_live_exception, detail=req.detail)
    return members, results


def check_members_request(req: MembersRequest
                          ) -> tuple[MemberTable, CheckResults, dict[str, Any]]:
    """Check a members request: the member table, the results and the report.

    Members with ``candidates`` get suggestions (:func:`stanchion.service.suggestions.suggest`).
    """
    members, results = run_request(req)
    suggestions = suggest(
        members, results, list(map(_candidates_attr, req.members)),
        list(map(_max_utilization_attr, req.members)),
        min_depth=req.selection.min_depth, max_depth=req.selection.max_depth,
        count=req.selection.max_suggestions,
    )
    report = build_report(members, results, req.units.model_dump(), detail=req.detail,
                          custom_combinations=bool(req.combinations), suggestions=suggestions)
    return members, results, report


def check_request(req: MembersRequest) -> dict[str, Any]:
    """Members request -> report (docs/design.md §3); the HTTP checks route's whole work."""
    return check_members_request(req)[2]
