"""Section designations of other standards: EN 10365, BS 4-1, AS/NZS 3679, EN 10210 / 10219.

:func:`designation_of` recognises a profile name as what it is (family, standard, nominal
dimensions); :func:`section_from_designation` builds its section where the name (tubes) or a
shipped table (EN 10365 IPE, HE, UPE) determines the dimensions; :func:`agrees` cross-checks
a name against a section computed from the model's geometry. AISC designations (W14X48,
HSS8X8X1/4 ...) are not matched here: they are ``engine.catalog``'s.

Spellings (case-insensitive; ``x``, ``X``, ``*``, ``×`` or spaces between numbers; a decimal
comma is read as a point; trailing words after a space, e.g. ``'Steel'`` or a grade, are
ignored unless they continue the numbers):

================================== ============ ===================== ======================
name                               family       standard              nominal (mm, kg/m)
================================== ============ ===================== ======================
IPE 300, IPE300, IPE A 300         IPE, IPEA    EN 10365              size
HEA 200, HE 200 A, HE-B 300, HEM   HEA HEB HEM  EN 10365              size
UPE 200, UPN 200                   UPE, UPN     EN 10365              size
UB 457x191x67, 457x191x67 UB, UKC  UB, UC, PFC  BS 4-1                size_h, size_b, mass
310UC96.8, 250UB37.3, 300PFC40.1   UC, UB, PFC  AS/NZS 3679.1         size, mass
1200WB455                          WB, WC       AS/NZS 3679.2         size, mass
RHS 200x100x6, SHS 100x100x5       RHS, SHS     EN 10210 / EN 10219   H, B, t
CHS 168.3x6.3, B193.7/8            CHS          EN 10210 / EN 10219   D, t
================================== ============ ===================== ======================

A tube name may say hot-finished (``HF``, ``EN 10210``) or cold-formed (``CF``,
``EN 10219``); otherwise its standard is "EN 10210 or EN 10219". ``'B193.7/8'`` is one
authoring application's spelling of a round tube (diameter 193.7 mm, wall 8 mm); it names no
standard, and is read as a metric tube of EN 10210 or EN 10219 (193.7 mm is an outside
diameter of the EN 10220 series, from memory).

Dimensions (``engine/data/en_bs_sections.csv``, see data/DESIGNATION_TABLES_PROVENANCE.md):
IPE, HE A/B/M and UPE sections are built from the table; UB, UC and UPN rows only
cross-check a modelled section (their root radii, resp. tapered flanges, do not fit the
builders); BS PFC, AS/NZS 3679 and IPE A/O, HE AA have no table: the model's geometry is
needed and the name is a cross-check. Tube corner radii for section properties:

* EN 10219-2:2006 (cold-formed), the values its tables are computed with: outer radius
  ro = 2.0 t (t <= 6 mm), 2.5 t (6 < t <= 10 mm), 3.0 t (t > 10 mm), inner ri = ro - t
  (from memory);
* EN 10210-2:2006 (hot-finished): ro = 1.5 t, ri = 1.0 t (from memory).
  ``engine.section_properties.rect_hollow`` has concentric corners (ri = ro - t); a
  hot-finished tube is built with ro = 2.0 t so that its inner radius is the standard's
  1.0 t, which removes 1.5 (4 - π) t² more than the standard (conservative, about 1.5 % of
  the area of RHS 200x100x6);
* standard unknown: the EN 10219 radii (the larger radii; smaller A and I: conservative).

Design wall: :func:`engine.tubes.design_wall` for :func:`engine.tubes.tube_standard` of the
material and the name (EN tubes: the nominal wall).
"""

from __future__ import annotations

import csv
import functools
import re
import unicodedata
from dataclasses import dataclass
from pathlib import Path

from stanchion.engine import section_properties as sp
from stanchion.engine.sections import Kind, SectionRow, SectionTable
from stanchion.engine.tubes import ERW_RATIO, design_wall, tube_standard
from stanchion.engine.units import factor

TABLE_PATH = Path(__file__).resolve().parent / "data" / "en_bs_sections.csv"

EN_ROLLED = "EN 10365"
BS = "BS 4-1"
AS_HOT_ROLLED = "AS/NZS 3679.1"
AS_WELDED = "AS/NZS 3679.2"
EN_HOT = "EN 10210"
EN_COLD = "EN 10219"
#: The name of :data:`engine.materials.STANDARDS`' entry for a tube of either EN standard.
EN_TUBES = "EN 10210 or EN 10219"

#: Relative tolerance on dimensions in :func:`agrees` (as for catalog shapes in the reader).
AGREE_DIMENSION = 0.02
#: Relative tolerance on the mass per metre a BS / AS name gives (see :func:`agrees`).
AGREE_MASS = 0.04
#: Density of steel, kg/m³, with which BS 4-1 and AS/NZS 3679.1 tabulate their masses
#: (EN 1991-1-1 Table A.4 gives 77-78.5 kN/m³; common practice).
STEEL_DENSITY = 7850.0
#: Families built from the table (the others of the table only cross-check).
BUILT_FROM_TABLE = frozenset({"IPE", "HEA", "HEB", "HEM", "UPE"})

_IN_PER_MM = factor("millimeter", "inch")
_M2_PER_IN2 = factor("inch", "meter") ** 2

_KIND = {
    "IPE": Kind.I_SHAPE, "IPEA": Kind.I_SHAPE, "IPEAA": Kind.I_SHAPE, "IPEO": Kind.I_SHAPE,
    "HEA": Kind.I_SHAPE, "HEB": Kind.I_SHAPE, "HEM": Kind.I_SHAPE, "HEAA": Kind.I_SHAPE,
    "UB": Kind.I_SHAPE, "UC": Kind.I_SHAPE, "WB": Kind.I_SHAPE, "WC": Kind.I_SHAPE,
    "UPE": Kind.CHANNEL, "UPN": Kind.CHANNEL, "PFC": Kind.CHANNEL,
    "RHS": Kind.RECT_HSS, "SHS": Kind.RECT_HSS, "CHS": Kind.ROUND_HSS,
}
#: Newer BS 4-1 spellings (UKB, UKC, UKPFC) of the same families.
_UK = {"UKB": "UB", "UKC": "UC", "UKPFC": "PFC"}
_KINDS = frozenset(int(k) for k in Kind)
_WHAT = {
    Kind.I_SHAPE: "I section", Kind.CHANNEL: "channel", Kind.RECT_HSS: "rectangular tube",
    Kind.ROUND_HSS: "round tube",
}


@dataclass(frozen=True)
class Designation:
    """A recognised designation.

    Attributes:
        text: the name as given.
        name: its canonical spelling (``"IPE 300"``, ``"HE 200 A"``, ``"UB 457x191x67"``,
            ``"310UC96.8"``, ``"RHS 200x100x6"``, ``"CHS 193.7x8"``).
        family: ``IPE``, ``HEA``, ``UB``, ``RHS`` ... (see the module table).
        standard: the product standard (``"EN 10365"``, ``"BS 4-1"``, ``"AS/NZS 3679.1"``,
            ``"EN 10210"``, ``"EN 10219"``, ``"EN 10210 or EN 10219"``).
        kind: how Chapter E treats the family.
        nominal: the numbers the name gives, mm (``mass``: kg/m), by key (module table).
    """

    text: str
    name: str
    family: str
    standard: str
    kind: Kind
    nominal: tuple[tuple[str, float], ...]

    @property
    def label(self) -> str:
        """Standard and name as messages show them: ``"EN 10365 IPE 300"``."""
        shown = "EN 10210/10219" if self.standard == EN_TUBES else self.standard
        return f"{shown} {self.name}"

    def dim(self, key: str) -> float | None:
        """One nominal number by key (None when the name does not give it).

        Args:
            key: ``size``, ``size_h``, ``size_b``, ``mass``, ``H``, ``B``, ``D`` or ``t``.
        """
        return dict(self.nominal).get(key)


# --------------------------------------------------------------------------- parsing

_NUM = r"\d+(?:\.\d+)?"
_SEP = r"[\s\-]*"
#: Words after the designation: a space, then anything that does not continue the numbers.
_TRAIL = r"(?P<trail>\s+(?![\d.X/]).*)?"
_TIMES = str.maketrans({"×": "X", "✕": "X", "*": "X"})

_PATTERNS: dict[str, re.Pattern[str]] = {
    name: re.compile(body + _TRAIL) for name, body in {
        "ipe": rf"IPE{_SEP}(?P<v1>AA|A|O)?{_SEP}(?P<n>\d+)(?:\s*(?P<v2>AA|A|O))?",
        "he": rf"HE{_SEP}(?P<s1>AA|A|B|M)?{_SEP}(?P<n>\d+)(?:\s*(?P<s2>AA|A|B|M))?",
        "up": rf"(?P<f>UPE|UPN){_SEP}(?P<n>\d+)",
        "bs": rf"(?P<f>UKPFC|UKB|UKC|UB|UC|PFC){_SEP}(?P<h>\d+)X(?P<b>\d+)X(?P<m>{_NUM})",
        "bs_suffix": rf"(?P<h>\d+)X(?P<b>\d+)X(?P<m>{_NUM}){_SEP}(?P<f>UKPFC|UKB|UKC|UB|UC|PFC)",
        "as": rf"(?P<h>\d+){_SEP}(?P<f>UB|UC|PFC|WB|WC){_SEP}(?P<m>{_NUM})",
        "tube": (rf"(?P<p>HF|CF)?{_SEP}(?P<f>RHS|SHS|CHS){_SEP}(?P<a>{_NUM})X(?P<b>{_NUM})"
                 rf"(?:X(?P<c>{_NUM}))?(?:\s*(?P<s>HF|CF)\b)?"),
        "b_round": rf"B{_SEP}(?P<d>{_NUM})\s*/\s*(?P<t>{_NUM})",
    }.items()
}


def _fmt(value: float) -> str:
    """A number as names write it: ``300.0`` -> ``300``, ``6.30`` -> ``6.3``."""
    return f"{value:.6g}"


def _clean(text: str) -> str:
    """Upper case, ``x``/``*``/``×`` -> ``X`` between numbers, decimal commas -> points."""
    s = unicodedata.normalize("NFKC", text).strip().upper().translate(_TIMES)
    s = re.sub(r"(?<=\d),(?=\d)", ".", s)
    return re.sub(r"(?<=[\d.])\s*X\s*(?=\d)", "X", s)


def _tube_standard_named(prefix: str | None, suffix: str | None, trail: str) -> str:
    """EN 10210 (hot-finished), EN 10219 (cold-formed) or either, from the name's words."""
    marks = {prefix, suffix} | set(re.findall(r"\b(?:HF|CF|10210|10219)\b", trail))
    hot, cold = bool(marks & {"HF", "10210"}), bool(marks & {"CF", "10219"})
    if hot and not cold:
        return EN_HOT
    if cold and not hot:
        return EN_COLD
    return EN_TUBES


def _tube(text: str, m: re.Match[str]) -> Designation | None:
    family = m["f"]
    nums = [float(v) for v in (m["a"], m["b"], m["c"]) if v is not None]
    standard = _tube_standard_named(m["p"], m["s"], m["trail"] or "")
    if family == "CHS":
        if len(nums) != 2:
            return None
        D, t = nums
        return _round_tube(text, D, t, standard)
    if family == "SHS" and len(nums) == 2:
        nums = [nums[0], nums[0], nums[1]]
    if len(nums) != 3 or (family == "SHS" and nums[0] != nums[1]):
        return None
    H, B, t = nums
    if not 0 < 2 * t < min(H, B):
        return None
    return Designation(text, f"{family} {_fmt(H)}x{_fmt(B)}x{_fmt(t)}", family, standard,
                       Kind.RECT_HSS, (("H", H), ("B", B), ("t", t)))


def _round_tube(text: str, D: float, t: float, standard: str) -> Designation | None:
    if not 0 < 2 * t < D:
        return None
    return Designation(text, f"CHS {_fmt(D)}x{_fmt(t)}", "CHS", standard, Kind.ROUND_HSS,
                       (("D", D), ("t", t)))


def _rolled(text: str, key: str, m: re.Match[str]) -> Designation | None:
    """IPE, HE, UPE / UPN, BS and AS names from their pattern's match."""
    if key == "ipe":
        if m["v1"] and m["v2"]:
            return None
        variant = m["v1"] or m["v2"] or ""
        family, n = f"IPE{variant}", float(m["n"])
        name = f"IPE {variant} {_fmt(n)}" if variant else f"IPE {_fmt(n)}"
        return Designation(text, name, family, EN_ROLLED, Kind.I_SHAPE, (("size", n),))
    if key == "he":
        if bool(m["s1"]) == bool(m["s2"]):
            return None
        series, n = m["s1"] or m["s2"], float(m["n"])
        return Designation(text, f"HE {_fmt(n)} {series}", f"HE{series}", EN_ROLLED,
                           Kind.I_SHAPE, (("size", n),))
    if key == "up":
        n = float(m["n"])
        return Designation(text, f"{m['f']} {_fmt(n)}", m["f"], EN_ROLLED, Kind.CHANNEL,
                           (("size", n),))
    h, mass = float(m["h"]), float(m["m"])
    if key == "as":
        family = m["f"]
        standard = AS_WELDED if family in ("WB", "WC") else AS_HOT_ROLLED
        return Designation(text, f"{_fmt(h)}{family}{_fmt(mass)}", family, standard,
                           _KIND[family], (("size", h), ("mass", mass)))
    family = _UK.get(m["f"], m["f"])
    b = float(m["b"])
    return Designation(text, f"{family} {_fmt(h)}x{_fmt(b)}x{_fmt(mass)}", family, BS,
                       _KIND[family], (("size_h", h), ("size_b", b), ("mass", mass)))


def designation_of(name: object) -> Designation | None:
    """The designation ``name`` spells, or None when it is none of those recognised here.

    Args:
        name: a profile name as exported (``'IPE300'``, ``'HE 200 A'``,
            ``'UC254*254*73'``, ``'310UC96.8'``, ``'RHS200x100x6 Steel'``, ``'B193.7/8'``).

    Returns:
        The designation, or None (AISC names, ``'Steel'``, an empty or non-text name).
    """
    if not isinstance(name, str) or not name.strip():
        return None
    return _parse(name)


@functools.lru_cache(maxsize=4096)
def _parse(name: str) -> Designation | None:
    """:func:`designation_of` of a non-empty text (cached: a model repeats its names)."""
    s = _clean(name)
    for key, pattern in _PATTERNS.items():
        m = pattern.fullmatch(s)
        if m is None:
            continue
        if key == "tube":
            return _tube(name, m)
        if key == "b_round":
            return _round_tube(name, float(m["d"]), float(m["t"]), EN_TUBES)
        return _rolled(name, key, m)
    return None


# --------------------------------------------------------------------------- dimensions


@functools.lru_cache(maxsize=1)
def _table() -> dict[str, dict[str, str]]:
    """Rows of ``en_bs_sections.csv`` by designation (text values)."""
    with TABLE_PATH.open(newline="", encoding="utf-8") as fh:
        return {row["designation"]: row for row in csv.DictReader(fh)}


def tabulated(designation: Designation) -> dict[str, float] | None:
    """Tabulated h, b, tw, tf, r (mm) of a rolled section, None when not in the table.

    Args:
        designation: a recognised designation.
    """
    row = _table().get(designation.name)
    if row is None or row["family"] != designation.family:
        return None
    return {k: float(row[k]) for k in ("h", "b", "tw", "tf", "r")}


def corner_radius(t: float, standard: str) -> float:
    """Outer corner radius of a rectangular EN tube for section properties, same unit as t.

    EN 10219-2:2006 (cold-formed): 2.0 t for t <= 6 mm, 2.5 t for 6 < t <= 10 mm, 3.0 t above;
    EN 10210-2:2006 (hot-finished) gives 1.5 t outside and 1.0 t inside, built here as 2.0 t
    (concentric corners, the standard's inner radius; conservative); unknown: EN 10219's
    (module notes; from memory).

    Args:
        t: nominal wall, mm.
        standard: ``EN_HOT``, ``EN_COLD`` or ``EN_TUBES``.
    """
    if standard == EN_HOT:
        return 2.0 * t
    if t <= 6.0:
        return 2.0 * t
    return (2.5 if t <= 10.0 else 3.0) * t


@dataclass(frozen=True)
class NamedSection:
    """What a designation alone gives for Chapter E.

    Attributes:
        section: one :class:`~engine.sections.SectionTable` row (inches), or None.
        notes: messages for the member (where the dimensions and the wall come from).
        reason: why there is no section (None when there is one).
    """

    section: SectionTable | None
    notes: tuple[str, ...] = ()
    reason: str | None = None


def section_from_designation(designation: Designation, material: str | None = None
                             ) -> NamedSection:
    """The section a designation determines without the model's geometry.

    Tubes: outside dimensions and nominal wall from the name, corners per
    :func:`corner_radius`, design wall per :func:`engine.tubes.design_wall` for the product
    standard of the material and the name. IPE, HE A/B/M, UPE: the shipped EN 10365 table.
    Others: no section, with the reason.

    Args:
        designation: a recognised designation.
        material: the member's material name (it may name the tube's standard), or None.

    Returns:
        The section (parametric builders of ``engine.section_properties``, labelled with the
        canonical name), its notes, or the reason it cannot be built.
    """
    d = designation
    if d.kind in (Kind.RECT_HSS, Kind.ROUND_HSS):
        return _tube_section(d, material)
    dims = tabulated(d) if d.family in BUILT_FROM_TABLE else None
    if dims is None:
        return NamedSection(None, (), f"{d.label}: dimensions from the model's geometry are "
                                      f"needed ({_no_table_why(d)})")
    h, b, tw, tf, r = (dims[k] * _IN_PER_MM for k in ("h", "b", "tw", "tf", "r"))
    build = sp.i_section if d.kind == Kind.I_SHAPE else sp.channel
    section = build(h, b, tw, tf, r, label=d.name)
    note = (f"section properties of {d.label} from its dimensions h {dims['h']:g}, b "
            f"{dims['b']:g}, tw {dims['tw']:g}, tf {dims['tf']:g}, r {dims['r']:g} mm "
            "(EN 10365 values as shipped by structuralcodes 0.7.2)")
    return NamedSection(section, (note,))


def _no_table_why(d: Designation) -> str:
    if d.family in ("UB", "UC"):
        return ("the BS 4-1 table at hand has root radii that differ from the standard's; it "
                "serves only to cross-check")
    if d.family == "UPN":
        return "tapered flanges: not built from a table"
    return "no dimension table for this family"


def _tube_section(d: Designation, material: str | None) -> NamedSection:
    t_nom = d.dim("t") or 0.0
    std = tube_standard(material, d.standard)
    family = "HSS" if d.kind == Kind.RECT_HSS else "HSS_ROUND"
    t_design, wall_note = design_wall(t_nom * _IN_PER_MM, std, family)
    if d.kind == Kind.ROUND_HSS:
        section = sp.circ_hollow((d.dim("D") or 0.0) * _IN_PER_MM, t_design, label=d.name)
        return NamedSection(section, (f"dimensions of {d.label} from its name", wall_note))
    r_out = corner_radius(t_nom, d.standard)
    section = sp.rect_hollow((d.dim("H") or 0.0) * _IN_PER_MM, (d.dim("B") or 0.0) * _IN_PER_MM,
                             t_design, r_out * _IN_PER_MM, label=d.name)
    rule = ("EN 10210-2 hot-finished corners built as 2.0 t" if d.standard == EN_HOT
            else "EN 10219-2 corner radius")
    return NamedSection(section, (f"dimensions of {d.label} from its name; outer corner "
                                  f"radius {r_out:g} mm ({rule})", wall_note))


# --------------------------------------------------------------------------- cross-check


def _off(a: float, b: float, tol: float) -> bool:
    return not (b > 0 and abs(a - b) <= tol * b)


def agrees(designation: Designation, section: SectionRow) -> str | None:
    """Whether a section computed from the model's geometry is the one its name gives.

    Compared, each within :data:`AGREE_DIMENSION` (2 %) unless stated:

    * the kind (I section, channel, rectangular or round tube);
    * tubes: outside dimensions (either order) and the wall, taken as agreeing when the
      section's wall is the nominal one or 0.93 of it (the reader may have applied the ERW
      design wall);
    * names in the table (IPE, HE A/B/M, UPE, UPN, UB, UC): d, bf, tw, tf;
    * names giving a mass (BS 4-1, AS/NZS 3679): the mass of the section's area at
      7850 kg/m³ within :data:`AGREE_MASS` (4 %: fillets drawn or left out).

    IPE A/O and HE AA (no table) are compared by kind only.

    Args:
        designation: the profile name's designation.
        section: the section row (``SectionTable.row``, inches): kind, d, bf, tw, tf, A.

    Returns:
        None when they agree, else one line naming the differences.
    """
    d = designation
    kind = section["kind"]
    if kind != d.kind:
        other = _WHAT.get(Kind(kind), "section of another kind") if kind in _KINDS else "?"
        return f"profile name {d.label} is a {_WHAT[d.kind]} but the geometry is a {other}"
    diffs = _tube_diffs(d, section) if d.kind in (Kind.RECT_HSS, Kind.ROUND_HSS) else []
    dims = tabulated(d)
    if dims is not None:
        modelled = (section["d"], section["bf"], section["tw"], section["tf"])
        for key, value in zip(("h", "b", "tw", "tf"), modelled, strict=True):
            got = value / _IN_PER_MM
            if _off(got, dims[key], AGREE_DIMENSION):
                diffs.append(f"{key} {got:.4g} mm vs {dims[key]:g} mm")
    mass = d.dim("mass")
    if mass is not None:
        got = section["A"] * _M2_PER_IN2 * STEEL_DENSITY
        if _off(got, mass, AGREE_MASS):
            diffs.append(f"mass {got:.4g} kg/m (area at {STEEL_DENSITY:g} kg/m³) vs "
                         f"{mass:g} kg/m")
    if not diffs:
        return None
    return f"profile name {d.label} disagrees with the geometry: {'; '.join(diffs)}"


def _tube_diffs(d: Designation, section: SectionRow) -> list[str]:
    diffs: list[str] = []
    if d.kind == Kind.RECT_HSS:
        named = sorted((d.dim("H") or 0.0, d.dim("B") or 0.0))
        got = sorted((section["d"] / _IN_PER_MM, section["bf"] / _IN_PER_MM))
        if any(_off(g, n, AGREE_DIMENSION) for g, n in zip(got, named, strict=True)):
            diffs.append(f"outside {got[1]:.4g}x{got[0]:.4g} mm vs {named[1]:g}x{named[0]:g} mm")
    elif _off(section["d"] / _IN_PER_MM, d.dim("D") or 0.0, AGREE_DIMENSION):
        diffs.append(f"D {section['d'] / _IN_PER_MM:.4g} mm vs {d.dim('D'):g} mm")
    t_named = d.dim("t") or 0.0
    wall = section["tw"] / _IN_PER_MM
    if _off(wall, t_named, AGREE_DIMENSION) and _off(wall, ERW_RATIO * t_named, AGREE_DIMENSION):
        diffs.append(f"wall {wall:.4g} mm vs {t_named:g} mm")
    return diffs
