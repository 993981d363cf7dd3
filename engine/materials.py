"""Steel materials: moduli, minimum yield stress by grade, and the product standard named.

Every reader (members JSON, IFC) matches grade names here; nothing else holds a grade table.

Moduli: E = 29,000 ksi (AISC 360-22 §E3, "modulus of elasticity of steel") and G = 11,200 ksi
(AISC 360-22 §E4, "shear modulus of elasticity of steel"); a request may override both.

Yield stress by grade: the rows of :data:`stanchion.engine.grades.GRADES`, each citing the
material specification that fixes the value; grades with thickness bands (EN, AS/NZS, JIS,
GB/T ...) are read at t, the thickest element of the section (:func:`band_thickness`);
Table 3.1 of EN 1993-1-1:2005 gives EN 10219 (cold-formed hollow sections) values for
t <= 40 mm only, EN 10210 (hot-finished) for t <= 65 mm (40 < t <= 65 mm the second band;
from memory), as for any hollow section of an EN grade.  Thicker elements get no value
(the member is not checked); an element thickness not known gives the lowest value of the
bands (conservative).  A name that states a stress instead (``"Metal - Steel - 345 MPa"``)
gives that stress, with a note.

Matching is on the upper-cased name, e.g. ``"ASTM A992"``, ``"A572 Gr. 50"``, ``"A572-50"``,
``"A500 Grade C"``, ``"S355JR"``, ``"EN 10025-2 S275J0"``, ``"S355J2H EN 10210"``.  A grade
without its required grade letter / number (``"A572"``, ``"A500"``) gives no yield stress (but
still names its product standard, see :func:`product_standard`).  When a name matches several
rows with different values (dual certification), the lowest value is used and noted.
"""

from __future__ import annotations

import math
import re
import unicodedata
from collections.abc import Iterable
from dataclasses import dataclass
from functools import lru_cache
from typing import Literal

from stanchion.engine.grades import GRADES, KSI_PER_MPA, ROUND_FAMILIES, Grade
from stanchion.engine.units import factor

#: Modulus of elasticity of steel, ksi (AISC 360-22 §E3: E = 29,000 ksi).
E_DEFAULT = 29000.0
#: Shear modulus of elasticity of steel, ksi (AISC 360-22 §E4: G = 11,200 ksi).
G_DEFAULT = 11200.0


@dataclass(frozen=True)
class Standard:
    """A product standard a material name can name.

    Attributes:
        name: display name (``"ASTM A500"``); what :func:`product_standard` returns.
        pattern: regular expression on the upper-cased text.
        tube: how tubes of this standard take their design wall (see
            :func:`engine.tubes.design_wall`): ``"erw"`` (0.93 x nominal), ``"nominal"``, or
            ``""`` (not a tube standard).
        max_en_thickness_mm: EN grades: the thickest element Table 3.1 gives values for.
    """

    name: str
    pattern: str
    tube: str = ""
    max_en_thickness_mm: float = 80.0


STANDARDS: tuple[Standard, ...] = (
    Standard("ASTM A500", r"\bA\s?500M?\b", tube="erw"),
    Standard("ASTM A53", r"\bA\s?53M?\b", tube="erw"),
    Standard("ASTM A1085", r"\bA\s?1085M?\b", tube="nominal"),
    Standard("ASTM A1065", r"\bA\s?1065M?\b", tube="nominal"),
    Standard("EN 10210", r"\bEN\s?10210(?:-[12])?\b", tube="nominal", max_en_thickness_mm=65.0),
    Standard("EN 10219", r"\bEN\s?10219(?:-[12])?\b", tube="nominal", max_en_thickness_mm=40.0),
    Standard("EN 10025", r"\bEN\s?10025(?:-[1-6])?\b"),
    # A hollow-section grade (EN 10210 / EN 10219 name their grades with a final H, e.g.
    # S355J2H, S355NLH) without its standard: either way a nominal-wall tube; Fy limited
    # to the t <= 40 mm EN 10219 values of Table 3.1, the conservative reading.
    Standard("EN 10210 or EN 10219", r"\bS\s?(?:235|275|355|420|460)[A-Z0-9]*H\b",
             tube="nominal", max_en_thickness_mm=40.0),
)

_COMPILED = tuple((g, re.compile(g.pattern)) for g in GRADES)
_COMPILED_STANDARDS = tuple((s, re.compile(s.pattern)) for s in STANDARDS)
_STANDARD_BY_NAME = {s.name: s for s in STANDARDS}
#: EN 1993-1-1:2005 Table 3.1, hollow sections (EN 10210-1): t <= 40 mm and 40 < t <= 65 mm
#: (from memory); a tube of an EN grade is read no thicker, whatever standard is named.
EN_HOLLOW_MAX_MM = 65.0
_TUBE_FAMILIES = ("HSS", *ROUND_FAMILIES)
_MM_PER_IN = factor("inch", "millimeter")


def _upper(text: str) -> str:
    return text.upper().replace("_", " ")


@lru_cache(maxsize=1024)
def product_standards(text: str | None) -> tuple[Standard, ...]:
    """Every product standard named in ``text`` (ASTM A500, EN 10219 ...), in table order."""
    if not text:
        return ()
    upper = _upper(text)
    return tuple(s for s, rx in _COMPILED_STANDARDS if rx.search(upper))


def product_standard(text: str | None) -> Standard | None:
    """The product standard ``text`` names (``"A1085"``, ``"S355J2H EN 10219"``), or None.

    A standard given by its display name (``"ASTM A500"``) is returned as is.  When the text
    names several tube standards, the one with the thinner design wall (ERW, 0.93 tnom) is
    returned: the conservative reading of a dual designation; otherwise the first in
    :data:`STANDARDS` order (a standard named explicitly before one inferred from a grade).
    """
    if text in _STANDARD_BY_NAME:
        return _STANDARD_BY_NAME[text]
    found = product_standards(text)
    if not found:
        return None
    return min(found, key=lambda s: {"erw": 0, "nominal": 1}.get(s.tube, 2))


@dataclass(frozen=True)
class GradeMatch:
    """A grade found in a material name and the yield stress it gives."""

    grade: Grade
    fy: float  # ksi
    note: str  # member message (which grade, which source)


def _value(grade: Grade, family: str | None, thickness_in: float | None, max_mm: float
           ) -> tuple[float | None, str]:
    if grade.fy is not None:
        return grade.fy, ""
    if grade.fy_rect is not None:
        if family in ROUND_FAMILIES:
            return grade.fy_round, "round HSS"
        if family == "HSS":
            return grade.fy_rect, "rectangular HSS"
        return None, f"{grade.name} applies to HSS only"
    if thickness_in is None:
        # The lowest value of the bands the standard covers (a thick element is the
        # conservative reading of a thickness not known).
        lows = (0.0, *(t for t, _ in grade.bands_mpa[:-1]))
        t_max, fy_mpa = min(((t, f) for low, (t, f) in zip(lows, grade.bands_mpa, strict=True)
                             if low < max_mm), key=lambda band: band[1])
        return fy_mpa * KSI_PER_MPA, (f"element thickness unknown: the lowest value of the "
                                      f"bands, t <= {min(t_max, max_mm):.0f} mm, assumed")
    t_mm = thickness_in * _MM_PER_IN
    last = len(grade.bands_mpa) - 1
    for k, (t_max, fy_mpa) in enumerate(grade.bands_mpa):
        # A tie at a boundary whose wording is not certain goes to the thicker band
        # (Grade.tie_to_thicker; 1e-6 mm absorbs the inch round trip of 11 mm).
        tie = grade.tie_to_thicker and k < last and abs(t_mm - t_max) <= 1e-6
        if t_mm <= t_max + 1e-6 and not tie and t_mm <= max_mm + 1e-6:
            text = f"t = {t_mm:.1f} mm <= {t_max:.0f} mm"
            below = grade.bands_mpa[k - 1][0] if k > 0 else -1.0
            if grade.tie_to_thicker and abs(t_mm - below) <= 1e-6:
                text += f" (at the {below:.0f} mm boundary: the thicker band)"
            return fy_mpa * KSI_PER_MPA, text
    top = min(grade.bands_mpa[-1][0], max_mm)
    why = (" (EN 1993-1-1 Table 3.1 gives these hollow sections no value "
           f"over {max_mm:.0f} mm)" if max_mm < grade.bands_mpa[-1][0] else "")
    return None, f"{grade.name}: no value for t = {t_mm:.1f} mm > {top:.0f} mm{why}"


def band_thickness(form: Literal["solid_rect", "solid_round", "walls"],
                   dims: Iterable[float | None]) -> float | None:
    """The nominal thickness at which an EN yield-strength band is read.

    EN 10025-2, EN 10210-1 and EN 10219-1 give the minimum yield strength by the product's
    nominal thickness: a solid rectangular bar's is its smaller side, a solid round's its
    diameter, and a section of walls, webs and flanges is read at its thickest element (the
    lowest band of its elements governs).

    Args:
        form: ``"solid_rect"``, ``"solid_round"`` or ``"walls"``.
        dims: the sides, the diameter, or the element thicknesses (any length unit); None
            for one not known.

    Returns:
        The thickness in the unit of ``dims``, or None when none is known.
    """
    given = [v for v in dims if v is not None and math.isfinite(v) and v > 0]
    if not given:
        return None
    return min(given) if form == "solid_rect" else max(given)


def match_grade(
    text: str | None, family: str | None = None, thickness_in: float | None = None
) -> tuple[GradeMatch | None, list[str]]:
    """Minimum yield stress from a grade (or a stress) named in ``text``.

    Args:
        text: material name (and description), or a members-file ``grade``.
        family: profile family (``"HSS"``, ``"HSS_ROUND"``, ``"PIPE"`` ...) for grades that
            depend on it.
        thickness_in: thickest element of the section, in (grades with thickness bands).

    Returns:
        (match or None, notes).  Notes explain a grade that was recognised but gave no
        value (A500 on a W shape, EN grade over 80 mm, EN hollow sections over 65 mm,
        EN 10219 over 40 mm), a stress not
        read, or several conflicting grades.
    """
    if not text:
        return None, []
    upper = _upper(text)
    standard = product_standard(text)
    max_mm = standard.max_en_thickness_mm if standard is not None else math.inf
    found: list[GradeMatch] = []
    notes: list[str] = []
    hits = [grade for grade, rx in _COMPILED if rx.search(upper)]
    names = {grade.name for grade in hits}
    for grade in hits:
        if names.intersection(grade.yields_to):
            continue  # the same grade, named with its standard
        hollow = family in _TUBE_FAMILIES and grade.name.startswith("EN S")
        fy, detail = _value(grade, family, thickness_in,
                            min(max_mm, EN_HOLLOW_MAX_MM) if hollow else max_mm)
        if fy is None:
            notes.append(f"material grade {grade.name} recognised but {detail}")
            continue
        where = f", {detail}" if detail else ""
        found.append(GradeMatch(grade, fy, f"Fy = {fy:.4g} ksi from material grade "
                                           f"{grade.name}{where} ({grade.source})"))
    found.extend(_stated_stresses(text, upper, notes))
    if not found:
        return None, notes
    best = min(found, key=lambda m: m.fy)
    if len({round(m.fy, 6) for m in found}) > 1:
        listed = ", ".join(m.grade.name for m in found)
        notes.append(f"material name '{text}' names several grades ({listed}); "
                     f"the lowest Fy is used")
    return best, notes


def names_grade(text: str | None) -> bool:
    """True when ``text`` names a grade of the table or states a stress (``--default-grade``).

    Args:
        text: a grade as a user writes it (``"A992"``, ``"S355"``, ``"345 MPa"``).
    """
    if not text:
        return False
    upper = _upper(text)
    return any(rx.search(upper) for _, rx in _COMPILED) or bool(_stated_stresses(text, upper, []))


# ------------------------------------------------------------------ a stress in the name
#
# Some names state the yield stress instead of a grade: an authoring application's default
# steel "Metal - Steel - 345 MPa", "Steel 350 MPa", "50 ksi steel", "fy=355 N/mm2".  Such a
# stress is read as the minimum yield stress, with a note saying it came from the name, when
# the name names no other material than steel (never a concrete "25 MPa concrete"); a stress
# labelled as another property (fu, Rm, tensile, E, G, modulus, fck ...) is not read.  The
# value is not bounded here: the plausibility limits (engine/plausibility.py) judge it.

#: A number and a stress unit, not part of a word ("S355 MPa" is the grade S355).
_STRESS = re.compile(r"(?<![\w.,])(?P<num>\d{1,6}(?:[.,]\d+)?)\s*"
                     r"(?P<unit>MPA|N/MM2|N/MM²|N/MM\^2|KN/CM2|KN/CM²|KSI)(?![A-Z0-9²])")
#: MPa per unit (ksi: converted apart).
_MPA_PER_UNIT = {"MPA": 1.0, "N/MM2": 1.0, "N/MM²": 1.0, "N/MM^2": 1.0, "KN/CM2": 10.0,
                 "KN/CM²": 10.0}
_UNIT_NAMES = {"MPA": "MPa", "KSI": "ksi", "N/MM2": "N/mm²", "N/MM^2": "N/mm²",
               "KN/CM2": "kN/cm²", "KN/CM²": "kN/cm²", "N/MM²": "N/mm²"}
#: What before a stress makes it another property than the yield stress.
_NOT_YIELD = re.compile(
    r"(?:\b(?:E|G|FU|FT|FUK|RM|FC|FCK|FCM|FCD|F'C|UTS)\s*[=:]?\s*"
    r"|\b(?:TENSILE|ULTIMATE|MODUL\w*|YOUNG\w*|ELASTIC\w*|SHEAR|COMPRESSIVE)\b[^0-9]*)$")
#: A label written after a stress that makes it another property ("510 MPa tensile",
#: "210000 MPa modulus"): words only, so "355 MPa, E 210000 MPa" keeps its 355 MPa.
_NOT_YIELD_AFTER = re.compile(
    r"[\s,;:()\-]*(?:TENSILE|ULTIMATE|UTS|MODUL\w*|YOUNG\w*|ELASTIC\w*|SHEAR|COMPRESSIVE)\b")


def _stated_stresses(text: str, upper: str, notes: list[str]) -> list[GradeMatch]:
    """Yield stresses stated in a name (``"345 MPa"``), as grade matches; notes appended."""
    stresses = list(_STRESS.finditer(upper))
    if not stresses:
        return []
    others = [c for c in text_classes(text) if c != STEEL]
    if others:
        notes.append(f"stress in material name '{text}' not read: the name names "
                     f"{', '.join(sorted(others))}")
        return []
    out = []
    previous = 0
    for m in stresses:
        context, previous = upper[previous:m.start()], m.end()
        if _NOT_YIELD.search(context) or _NOT_YIELD_AFTER.match(upper, m.end()):
            continue
        number = float(m["num"].replace(",", "."))
        unit = m["unit"]
        fy = number if unit == "KSI" else number * _MPA_PER_UNIT[unit] * KSI_PER_MPA
        stated = f"{m['num']} {_UNIT_NAMES.get(unit, unit)}"
        grade = Grade(f"stress {stated}", "", "the stress the name states, read as the "
                      "minimum yield stress", fy=fy)
        out.append(GradeMatch(grade, fy, f"Fy = {fy:.4g} ksi from the stress {stated} stated "
                                         f"in material name '{text}' (read as the minimum "
                                         "yield stress)"))
    return out


# ---------------------------------------------------------------------------- material class
#
# Which material a column is made of, from the words of its material names and IFC4
# categories (docs/design.md §5).  Only steel columns are checked; a column whose materials
# all name another material is skipped ("not steel: concrete"); one whose materials name
# steel and another material (a composite column, e.g. "steel reinforced concrete", the
# usual name of an encased composite column, or an ambiguous name) is not checked, never
# taken for bare steel nor skipped; one whose materials name nothing known (or that has no
# material) goes the usual way: a yield stress must come from somewhere, or it is not
# checked.  The words are common practice, no source: the material names authoring
# programs and their users write in English, German, French, Spanish, Italian, the
# Scandinavian languages, Dutch and Russian.

STEEL, UNKNOWN = "steel", "unknown"
#: Stainless steel: a class of its own (AISC 370 designs it, not AISC 360): never checked
#: here, never given ``--default-grade``; not skipped either, a person must look at it.
STAINLESS = "stainless steel"
CONCRETE, TIMBER, ALUMINIUM, MASONRY = "concrete", "timber", "aluminium", "masonry"
#: The classes other than steel, in the order a reason names them.
NOT_STEEL: tuple[str, ...] = (CONCRETE, TIMBER, ALUMINIUM, MASONRY)

#: Whole words (accents removed, lower case; an English plural "s" is also accepted).
_WORDS: dict[str, tuple[str, ...]] = {
    STEEL: ("steel", "stahl", "acier", "acero", "acciaio", "staal", "stal", "stål", "сталь"),
    STAINLESS: ("stainless", "inox", "edelstahl", "rostfrei", "inoxydable", "inoxidable",
                "inossidabile", "roestvrij", "roestvast", "rostfri", "rostfritt",
                "нержавеющая"),
    CONCRETE: ("concrete", "beton", "béton", "betong", "бетон", "hormigón", "calcestruzzo",
               "cement", "shotcrete", "precast"),
    TIMBER: ("timber", "wood", "lumber", "holz", "glulam", "bois", "madera", "legno", "clt",
             "lvl", "glt", "trä", "tre", "hout", "drewno", "дерево", "древесина", "softwood",
             "hardwood", "plywood"),
    ALUMINIUM: ("aluminium", "aluminum", "alu", "alluminio", "aluminio", "алюминий"),
    MASONRY: ("masonry", "brick", "brickwork", "block", "blockwork", "cmu", "stone",
              "mauerwerk", "ziegel", "maçonnerie", "brique", "mampostería", "ladrillo",
              "muratura", "mattone", "tegel", "кирпич", "кладка"),
}
#: Heads of German and Scandinavian compounds: a word ending in one takes its class
#: ("Stahlbeton" is concrete, "Baustahl" steel, "Brettschichtholz" timber, the head of a
#: compound being its last part).
_HEADS: dict[str, tuple[str, ...]] = {
    STEEL: ("stahl",),
    CONCRETE: ("beton", "betong"),
    TIMBER: ("holz",),
    MASONRY: ("mauerwerk", "ziegel"),
}
#: Reinforcement is part of a concrete member: a material naming it counts as concrete
#: whatever steel word it also holds ("reinforcing steel", "Betonstahl B500").
_REINFORCEMENT = ("rebar", "reinforcing", "reinforcement", "bewehrung", "betonstahl",
                  "armature", "armadura", "armatura", "арматура")
#: Glued-laminated timber strength classes of EN 14080 (GL24h, GL28c ...).
_GLULAM_CLASS = re.compile(r"\bGL\s?\d{2}[HC]\b")
#: Concrete strength classes of EN 206 / EN 1992-1-1 Table 3.1 written with their slash
#: (C30/37, LC25/28): what some programs name a concrete material by, and nothing else.
_CONCRETE_CLASS = re.compile(r"\bL?C\s?\d{1,3}\s?/\s?\d{1,3}\b")
#: Stainless grades by number: EN 10088 material numbers 1.40xx-1.46xx (1.4301, 1.4404,
#: 1.4462), AISI / JIS 3xx and 4xx with their prefix or suffix letters (AISI 304, SUS316,
#: 316L, 304L); a bare "304" / "316" is not enough, nor "SS" (JIS SS400 is carbon steel)
#: (common practice, no source).
_STAINLESS_GRADE = re.compile(
    r"\b1\.4[0-6]\d{2}\b|\b(?:AISI|SUS)\s?[34]\d{2}[A-Z]{0,2}\b|\b3[01]\d[LHN]{1,2}\b")
#: German word starts for stainless ("nichtrostender Stahl").
_STAINLESS_STARTS = ("nichtrostend", "rostfrei")


def _fold(text: str) -> str:
    """Lower case without accents ("Béton" -> "beton", "Алюминий" -> "алюминии")."""
    decomposed = unicodedata.normalize("NFKD", text.casefold())
    return "".join(c for c in decomposed if not unicodedata.combining(c))


_WORD_CLASS = {_fold(w): cls for cls, words in _WORDS.items() for w in words}
_HEAD_CLASS = sorted(((_fold(h), cls) for cls, heads in _HEADS.items() for h in heads),
                     key=lambda hc: -len(hc[0]))
_REINFORCEMENT_FOLDED = tuple(_fold(w) for w in _REINFORCEMENT)
_LETTERS = re.compile(r"[^\W\d_]+")  # runs of letters: digits, "_", "-", "/" separate words


def _word_class(word: str) -> str | None:
    """The class one word names, or None."""
    found = _WORD_CLASS.get(word)
    if found is None and len(word) > 3 and word.endswith("s"):
        found = _WORD_CLASS.get(word[:-1])
    if found is None:
        found = next((cls for head, cls in _HEAD_CLASS if word.endswith(head)), None)
    return found


@lru_cache(maxsize=1024)
def text_classes(text: str | None) -> frozenset[str]:
    """The material classes one name (or IFC4 Category) names.

    Words are runs of letters (so ``"_Beton_C30-37_wg"`` holds ``Beton``), compared whole
    or, for compound heads, as the end of a word; a steel grade or product standard of the
    grade table (S235, A992, EN 10025 ...) names steel, a concrete strength class with its
    slash (C30/37) concrete, a glulam class (GL24h) timber; a reinforcement word makes the
    text concrete alone.

    Args:
        text: a material's Name or Category (None or empty: nothing).

    Returns:
        The classes named: empty, one, or several (an ambiguous or composite name).
    """
    if not text:
        return frozenset()
    words = _LETTERS.findall(_fold(text))
    if any(w.startswith(_REINFORCEMENT_FOLDED) for w in words):
        return frozenset({CONCRETE})
    found = {cls for cls in map(_word_class, words) if cls is not None}
    upper = _upper(text)
    if _GLULAM_CLASS.search(upper):
        found.add(TIMBER)
    if _CONCRETE_CLASS.search(upper):
        found.add(CONCRETE)
    if any(rx.search(upper) for _, rx in _COMPILED) or product_standards(text):
        found.add(STEEL)
    if _STAINLESS_GRADE.search(upper) or any(w.startswith(_STAINLESS_STARTS) for w in words):
        found.add(STAINLESS)
    if STAINLESS in found:  # "stainless steel", "Edelstahl 1.4301": stainless, not steel
        found.discard(STEEL)
    return frozenset(found)


def material_class(texts: Iterable[str | None]) -> str:
    """One member's material class from the names and categories of all its materials.

    Args:
        texts: every material's Name and IFC4 Category (None where absent).

    Returns:
        ``"steel"``, ``"unknown"`` (nothing recognised, or no material), one class of
        :data:`NOT_STEEL`, or several classes joined with ", " in :data:`NOT_STEEL` order,
        steel first (``"steel, concrete"``: composite or ambiguous).
    """
    found: set[str] = set()
    for text in texts:
        found |= text_classes(text)
    if not found:
        return UNKNOWN
    if STAINLESS in found:  # a category "steel" beside a name "stainless steel 1.4301"
        found.discard(STEEL)
    return ", ".join(c for c in (STEEL, STAINLESS, *NOT_STEEL) if c in found)


def skip_reason(label: str) -> str | None:
    """The skip reason of a member of material class ``label`` ("not steel: concrete").

    None for steel, unknown, stainless (:func:`stainless_reason`: not checked, not skipped)
    and composite (steel with another class) members.
    """
    classes = label.split(", ")
    if label in (STEEL, UNKNOWN) or STEEL in classes or STAINLESS in classes:
        return None
    return f"not steel: {label}"


def composite_reason(label: str) -> str | None:
    """Why a member whose materials name steel and another class is not checked, or None.

    Such a member is a composite column (AISC 360-22 Chapter I, not implemented) or its
    material is named ambiguously; it is neither taken for a bare steel column nor skipped.
    """
    classes = label.split(", ")
    if STEEL not in classes or len(classes) < 2:
        return None
    others = ", ".join(c for c in classes if c != STEEL)
    return (f"material names steel and {others}: a composite or ambiguously named member "
            "(composite members, AISC 360-22 Chapter I, are not checked)")


def stainless_reason(label: str) -> str | None:
    """Why a member whose materials name stainless steel is not checked, or None.

    AISC 360-22 does not cover stainless steel (AISC 370 does): such a member is not
    checked, with this reason, rather than skipped, so that a person looks at it.

    Args:
        label: the member's material class (:func:`material_class`).
    """
    if STAINLESS not in label.split(", "):
        return None
    return "stainless steel: designed to AISC 370, not checked here"
