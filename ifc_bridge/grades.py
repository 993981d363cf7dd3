"""Minimum yield stress by steel grade, matched from a material name.

Used only when the model gives no yield stress (neither Stanchion_Design.YieldStress,
Pset_MaterialSteel.YieldStress nor IfcMechanicalSteelMaterialProperties).  Each row cites the
material specification that fixes the value; the ASTM values are the specified minimum
yield stresses also listed in the AISC Steel Construction Manual, 16th ed., Table 2-4.

EN grades depend on the nominal element thickness t; the two bands of EN 1993-1-1:2005
Table 3.1 are used (t <= 40 mm, 40 mm < t <= 80 mm), with t the thickest element of the
section.  Thicker elements get no value (the member is not checked).

Matching is on the upper-cased name, e.g. ``"ASTM A992"``, ``"A572 Gr. 50"``, ``"A572-50"``,
``"A500 Grade C"``, ``"S355JR"``, ``"EN 10025-2 S275J0"``.  A grade without its required
grade letter / number (``"A572"``, ``"A500"``) does not match.  When a name matches several
rows with different values (dual certification), the lowest value is used and noted.
"""

from __future__ import annotations

import re
from dataclasses import dataclass

from stanchion.engine.units import factor

_GR = r"(?:[\s\-/.]*(?:GR(?:ADE)?)?[\s.\-]*)"


@dataclass(frozen=True)
class Grade:
    """One grade row.

    Attributes:
        name: display name (``"ASTM A572 Gr 50"``).
        pattern: regular expression on the upper-cased material name.
        fy: minimum yield stress, ksi, for every shape (None: see the other fields).
        fy_round, fy_rect: ksi for round and for rectangular (shaped) HSS (ASTM A500).
        bands_mpa: ((t_max_mm, fy_MPa), ...) thickness bands (EN grades).
        source: the specification (and table) the value comes from.
    """

    name: str
    pattern: str
    source: str
    fy: float | None = None
    fy_round: float | None = None
    fy_rect: float | None = None
    bands_mpa: tuple[tuple[float, float], ...] = ()


def _astm_numbered(spec: str, grades: tuple[int, ...], source: str) -> list[Grade]:
    return [
        Grade(f"ASTM {spec} Gr {g}", rf"\b{spec[0]}\s?{spec[1:]}M?\b{_GR}{g}\b",
              f"{source}, Grade {g}: Fy = {g} ksi min.", fy=float(g))
        for g in grades
    ]


_EN_BANDS = "EN 1993-1-1:2005 Table 3.1 (t <= 40 mm / 40 < t <= 80 mm)"

GRADES: tuple[Grade, ...] = (
    Grade("ASTM A992", r"\bA\s?992M?\b", "ASTM A992/A992M: Fy = 50 ksi min.", fy=50.0),
    Grade("ASTM A36", r"\bA\s?36M?\b", "ASTM A36/A36M (shapes): Fy = 36 ksi min.", fy=36.0),
    *_astm_numbered("A572", (42, 50, 55, 60, 65), "ASTM A572/A572M"),
    *_astm_numbered("A913", (50, 60, 65, 70), "ASTM A913/A913M"),
    Grade("ASTM A500 Gr B", rf"\bA\s?500M?\b{_GR}B\b",
          "ASTM A500/A500M Grade B: Fy = 42 ksi round, 46 ksi rectangular, min.",
          fy_round=42.0, fy_rect=46.0),
    Grade("ASTM A500 Gr C", rf"\bA\s?500M?\b{_GR}C\b",
          "ASTM A500/A500M Grade C: Fy = 46 ksi round, 50 ksi rectangular, min.",
          fy_round=46.0, fy_rect=50.0),
    Grade("ASTM A1085", r"\bA\s?1085M?\b", "ASTM A1085/A1085M: Fy = 50 ksi min.", fy=50.0),
    Grade("ASTM A53 Gr B", rf"\bA\s?53M?\b{_GR}B\b", "ASTM A53/A53M Grade B: Fy = 35 ksi min.",
          fy=35.0),
    Grade("EN S235", r"\bS\s?235[A-Z0-9+]*\b", f"EN 10025-2 S235; fy per {_EN_BANDS}",
          bands_mpa=((40.0, 235.0), (80.0, 215.0))),
    Grade("EN S275", r"\bS\s?275[A-Z0-9+]*\b", f"EN 10025-2 S275; fy per {_EN_BANDS}",
          bands_mpa=((40.0, 275.0), (80.0, 255.0))),
    Grade("EN S355", r"\bS\s?355[A-Z0-9+]*\b", f"EN 10025-2 S355; fy per {_EN_BANDS}",
          bands_mpa=((40.0, 355.0), (80.0, 335.0))),
    Grade("EN S460", r"\bS\s?460[A-Z0-9+]*\b",
          f"EN 10025-3 S460N/NL, EN 10025-4 S460M/ML; fy per {_EN_BANDS}",
          bands_mpa=((40.0, 460.0), (80.0, 430.0))),
)

_COMPILED = tuple((g, re.compile(g.pattern)) for g in GRADES)
_MM_PER_IN = factor("inch", "millimeter")
_KSI_PER_MPA = factor("megapascal", "ksi")


@dataclass(frozen=True)
class GradeMatch:
    """A grade found in a material name and the yield stress it gives."""

    grade: Grade
    fy: float  # ksi
    note: str  # member message (which grade, which source)


def _value(grade: Grade, family: str | None, thickness_in: float | None
           ) -> tuple[float | None, str]:
    if grade.fy is not None:
        return grade.fy, ""
    if grade.fy_rect is not None:
        if family == "HSS_ROUND":
            return grade.fy_round, "round HSS"
        if family == "HSS":
            return grade.fy_rect, "rectangular HSS"
        return None, f"{grade.name} applies to HSS only"
    if thickness_in is None:
        t_mm, extra = 0.0, "element thickness unknown: t <= 40 mm assumed"
    else:
        t_mm, extra = thickness_in * _MM_PER_IN, ""
    for t_max, fy_mpa in grade.bands_mpa:
        if t_mm <= t_max:
            text = extra or f"t = {t_mm:.1f} mm <= {t_max:.0f} mm"
            return fy_mpa * _KSI_PER_MPA, text
    return None, f"{grade.name}: no value for t = {t_mm:.1f} mm > 80 mm"


def match_grade(
    text: str | None, family: str | None = None, thickness_in: float | None = None
) -> tuple[GradeMatch | None, list[str]]:
    """Yield stress from a grade named in ``text``.

    Args:
        text: material name (and description).
        family: profile family (``"HSS"``, ``"HSS_ROUND"`` ...) for grades that depend on it.
        thickness_in: thickest element of the section, in (EN grades).

    Returns:
        (match or None, notes).  Notes explain a grade that was recognised but gave no
        value (A500 on a W shape, EN grade over 80 mm) or several conflicting grades.
    """
    if not text:
        return None, []
    upper = text.upper().replace("_", " ")
    found: list[GradeMatch] = []
    notes: list[str] = []
    for grade, rx in _COMPILED:
        if not rx.search(upper):
            continue
        fy, detail = _value(grade, family, thickness_in)
        if fy is None:
            notes.append(f"material grade {grade.name} recognised but {detail}")
            continue
        where = f", {detail}" if detail else ""
        found.append(GradeMatch(grade, fy, f"Fy = {fy:.4g} ksi from material grade "
                                           f"{grade.name}{where} ({grade.source})"))
    if not found:
        return None, notes
    best = min(found, key=lambda m: m.fy)
    if len({round(m.fy, 6) for m in found}) > 1:
        names = ", ".join(m.grade.name for m in found)
        notes.append(f"material name '{text}' names several grades ({names}); "
                     f"the lowest Fy is used")
    return best, notes
