"""The grade table: minimum yield stress by grade, each row citing the standard that fixes it.

Read through :func:`stanchion.engine.materials.match_grade`; nothing else holds a grade
table.  The ASTM values are the specified minimum yield stresses also listed in the AISC
Steel Construction Manual, 16th ed., Table 2-4.  EN grades depend on the nominal element
thickness t; the two bands of EN 1993-1-1:2005 Table 3.1 are used (t <= 40 mm,
40 mm < t <= 80 mm), except S460J0/J2/K2, which Table 3.1 predates (EN 10025-2:2019 Table 7).
Grades of other national standards (AS/NZS 3679.1, AS/NZS 1163, CSA G40.21, JIS G 3101 /
G 3106, GB/T 700 / 1591) are read by their own thickness bands, "from memory" where the
source says so.  Thicker elements than the last band get no value (the member is not
checked).
"""

from __future__ import annotations

from dataclasses import dataclass

from stanchion.engine.units import factor

_GR = r"(?:[\s\-/.]*(?:GR(?:ADE)?)?[\s.\-]*)"

#: Families whose yield stress follows the round-HSS value of ASTM A500.
ROUND_FAMILIES = ("HSS_ROUND", "PIPE")


@dataclass(frozen=True)
class Grade:
    """One grade row.

    Attributes:
        name: display name (``"ASTM A572 Gr 50"``).
        pattern: regular expression on the upper-cased material name.
        source: the specification (and table) the value comes from.
        fy: minimum yield stress, ksi, for every shape (None: see the other fields).
        fy_round, fy_rect: ksi for round and for rectangular (shaped) HSS (ASTM A500).
        bands_mpa: ((t_max_mm, fy_MPa), ...) thickness bands (EN grades).
        yields_to: rows that, found in the same text, replace this one (a grade written
            without its standard, ``"Grade 350"``, gives way to ``"AS/NZS 3679.1 350"``).
        tie_to_thicker: a thickness exactly at a band boundary takes the thicker band (the
            lower value) -- for standards whose boundary wording (``< 11`` / ``>= 11`` or
            ``<= 11`` / ``> 11``) is recalled, not read (docs/design.md §8); otherwise the
            band is ``t <= t_max`` as EN 1993-1-1 Table 3.1 writes it.
    """

    name: str
    pattern: str
    source: str
    fy: float | None = None
    fy_round: float | None = None
    fy_rect: float | None = None
    bands_mpa: tuple[tuple[float, float], ...] = ()
    yields_to: tuple[str, ...] = ()
    tie_to_thicker: bool = False


KSI_PER_MPA = factor("megapascal", "ksi")


def _astm_numbered(spec: str, grades: tuple[int, ...], source: str) -> list[Grade]:
    return [
        Grade(f"ASTM {spec} Gr {g}", rf"\b{spec[0]}\s?{spec[1:]}M?\b{_GR}{g}\b",
              f"{source}, Grade {g}: Fy = {g} ksi min.", fy=float(g))
        for g in grades
    ]


_EN_BANDS = "EN 1993-1-1:2005 Table 3.1 (t <= 40 mm / 40 < t <= 80 mm)"


def _en(g: int, bands: tuple[tuple[float, float], ...]) -> Grade:
    return Grade(f"EN S{g}", rf"\bS\s?{g}[A-Z0-9+]*\b",
                 f"EN 10025-2 S{g} (and S{g}H of EN 10210-1 / EN 10219-1); fy per {_EN_BANDS}",
                 bands_mpa=bands)


#: Yield strength bands (t_max mm, fy MPa) of the grades read from their product standard.
#: EN 10025-2:2019 Table 7 added S460J0/J2/K2, which EN 1993-1-1:2005 Table 3.1 predates;
#: values from memory (ReH for t <= 16, 16 < t <= 40, 40 < t <= 63, 63 < t <= 80 mm).
_S460_EN10025_2 = ((16.0, 460.0), (40.0, 440.0), (63.0, 420.0), (80.0, 400.0))
#: AS/NZS 3679.1:2016 Table 2 (also AS 4100:2020 Table 2.1), from memory: Grade 300
#: t <= 11 mm 320 MPa, 11 < t <= 17 mm 300 MPa, over 17 mm 280 MPa; Grade 350 t <= 11 mm
#: 360 MPa, 11 < t <= 40 mm 340 MPa, over 40 mm 330 MPa (read here to 80 mm).
_AS_300 = ((11.0, 320.0), (17.0, 300.0), (80.0, 280.0))
_AS_350 = ((11.0, 360.0), (40.0, 340.0), (80.0, 330.0))
_S460_NM = r"\s?[NM]L?H?\b"  # S460N, NL, M, ML and their hollow sections (NH, MLH ...)
_S460_Q = r"\s?QL?1?\b"  # S460Q, QL, QL1
_AS = r"\b(?:AS\s?/?\s?NZS\s?)?3679(?:\.1)?\b"
_AS_SUFFIX = r"(?:\s?(?:L0|L15|S0))?"


def _grade_word(g: int) -> str:
    """``Grade 300``, ``Gr. 300``, ``G300`` (the grade word and the number, any separator)."""
    return rf"\bG(?:R(?:ADE)?)?[\s.\-]*{g}{_AS_SUFFIX}\b"


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
    *(_en(g, bands) for g, bands in (
        (235, ((40.0, 235.0), (80.0, 215.0))),
        (275, ((40.0, 275.0), (80.0, 255.0))),
        (355, ((40.0, 355.0), (80.0, 335.0))),
    )),
    Grade("EN S420", r"\bS\s?420[A-Z0-9+]*\b",
          "EN 10025-3 S420N/NL, EN 10025-4 S420M/ML (and S420NH/NLH of EN 10210-1, "
          f"S420MH/MLH of EN 10219-1); fy per {_EN_BANDS}",
          bands_mpa=((40.0, 420.0), (80.0, 390.0))),
    Grade("EN S450", r"\bS\s?450[A-Z0-9+]*\b",
          f"EN 10025-2:2004 S450J0; fy per {_EN_BANDS}",
          bands_mpa=((40.0, 440.0), (80.0, 410.0))),
    Grade("EN S460N/M", rf"\bS\s?460{_S460_NM}",
          "EN 10025-3 S460N/NL, EN 10025-4 S460M/ML (and S460NH/NLH/MH/MLH of EN 10210-1 / "
          f"EN 10219-1); fy per {_EN_BANDS}",
          bands_mpa=((40.0, 460.0), (80.0, 430.0))),
    Grade("EN S460Q", rf"\bS\s?460{_S460_Q}",
          f"EN 10025-6 S460Q/QL/QL1; fy per {_EN_BANDS} (440 MPa in the second band)",
          bands_mpa=((40.0, 460.0), (80.0, 440.0))),
    # S460 with J0/J2/K2 or no suffix: EN 10025-2:2019's non-alloy S460, the lowest of the
    # S460 variants at every thickness (the conservative reading of a bare "S460").
    Grade("EN S460", rf"\bS\s?460(?!{_S460_NM}|{_S460_Q})[A-Z0-9+]*\b",
          "EN 10025-2:2019 Table 7 S460J0/J2/K2 (from memory): ReH 460 / 440 / 420 / "
          "400 MPa for t <= 16 / 40 / 63 / 80 mm",
          bands_mpa=_S460_EN10025_2),
    Grade("AS/NZS 3679.1 Grade 300", rf"\b300\s?PLUS\b|{_AS}.*\b300{_AS_SUFFIX}\b",
          "AS/NZS 3679.1:2016 Table 2 Grade 300 (from memory; AS 4100 Table 2.1): fy = "
          "320 / 300 / 280 MPa for t <= 11 / 17 / over 17 mm; t at a boundary: the thicker "
          "band", bands_mpa=_AS_300, tie_to_thicker=True),
    Grade("AS/NZS 3679.1 Grade 350", rf"\b350\s?PLUS\b|{_AS}.*\b350{_AS_SUFFIX}\b",
          "AS/NZS 3679.1:2016 Table 2 Grade 350 (from memory; AS 4100 Table 2.1): fy = "
          "360 / 340 / 330 MPa for t <= 11 / 40 / over 40 mm; t at a boundary: the thicker "
          "band", bands_mpa=_AS_350, tie_to_thicker=True),
    # "Grade 300" / "G350" without the standard: AS/NZS 3679.1 sections, but CSA G40.21
    # 300W / 350W and AS/NZS 1163 C350 hollow sections are 300 / 350 MPa at every thickness,
    # so the lower of the readings is used.
    Grade("Grade 300", _grade_word(300),
          "lower of AS/NZS 3679.1:2016 Grade 300 (from memory: 320 / 300 / 280 MPa for "
          "t <= 11 / 17 / over 17 mm) and a flat 300 MPa (CSA G40.21 300W): 300 / 280 MPa "
          "for t <= 17 / over 17 mm; t at a boundary: the thicker band",
          bands_mpa=((17.0, 300.0), (80.0, 280.0)), tie_to_thicker=True,
          yields_to=("AS/NZS 3679.1 Grade 300", "CSA G40.21 300W")),
    Grade("Grade 350", _grade_word(350),
          "lower of AS/NZS 3679.1:2016 Grade 350 (from memory: 360 / 340 / 330 MPa for "
          "t <= 11 / 40 / over 40 mm) and a flat 350 MPa (AS/NZS 1163 C350, CSA G40.21 "
          "350W): 350 / 340 / 330 MPa for t <= 11 / 40 / over 40 mm; t at a boundary: the "
          "thicker band", bands_mpa=((11.0, 350.0), (40.0, 340.0), (80.0, 330.0)),
          tie_to_thicker=True,
          yields_to=("AS/NZS 3679.1 Grade 350", "CSA G40.21 350W", "AS/NZS 1163 C350")),
    Grade("AS/NZS 1163 C350", r"\bC\s?350\s?L(?:0|15)\b",
          "AS/NZS 1163:2016 C350L0 / C350L15 (from memory; AS 4100 Table 2.1): fy = 350 MPa",
          fy=350.0 * KSI_PER_MPA),
    Grade("AS/NZS 1163 C450", r"\bC\s?450\s?L(?:0|15)\b",
          "AS/NZS 1163:2016 C450L0 / C450L15 (from memory; AS 4100 Table 2.1): fy = 450 MPa",
          fy=450.0 * KSI_PER_MPA),
    Grade("CSA G40.21 350W", r"\b350\s?WT?\b",
          "CSA G40.21 350W / 350WT (from memory; CISC Handbook of Steel Construction): "
          "Fy = 350 MPa, 320 MPa for plates and bars over 65 mm; t = 65 mm: 320 MPa",
          bands_mpa=((65.0, 350.0), (80.0, 320.0)), tie_to_thicker=True),
    Grade("CSA G40.21 300W", r"\b300\s?WT?\b",
          "CSA G40.21 300W (from memory; CISC Handbook of Steel Construction): Fy = 300 MPa; "
          "not read over 65 mm (the thick value is not recalled)",
          bands_mpa=((65.0, 300.0),)),
    Grade("JIS SS400", r"\bSS\s?400\b",
          "JIS G 3101:2015 SS400 (from memory): yield point 245 / 235 / 215 MPa for "
          "t <= 16 / 40 / 100 mm", bands_mpa=((16.0, 245.0), (40.0, 235.0), (100.0, 215.0))),
    Grade("JIS SM490", r"\bSM\s?490\s?[ABC]?\b",
          "JIS G 3106:2015 SM490A/B/C (from memory): yield point 325 / 315 / 295 MPa for "
          "t <= 16 / 40 / 100 mm", bands_mpa=((16.0, 325.0), (40.0, 315.0), (100.0, 295.0))),
    Grade("GB/T Q235", r"\bQ\s?235[A-Z]*\b",
          "GB/T 700-2006 Q235 (from memory): ReH 235 / 225 / 215 MPa for t <= 16 / 40 / "
          "100 mm", bands_mpa=((16.0, 235.0), (40.0, 225.0), (100.0, 215.0))),
    Grade("GB/T Q345", r"\bQ\s?345[A-Z]*\b",
          "GB/T 1591-2008 Q345 (from memory): ReH 345 / 335 / 325 / 315 / 305 MPa for "
          "t <= 16 / 40 / 63 / 80 / 100 mm",
          bands_mpa=((16.0, 345.0), (40.0, 335.0), (63.0, 325.0), (80.0, 315.0),
                     (100.0, 305.0))),
    Grade("GB/T Q355", r"\bQ\s?355[A-Z]*\b",
          "GB/T 1591-2018 Q355 (from memory): ReH 355 / 345 / 335 / 325 / 315 MPa for "
          "t <= 16 / 40 / 63 / 80 / 100 mm",
          bands_mpa=((16.0, 355.0), (40.0, 345.0), (63.0, 335.0), (80.0, 325.0),
                     (100.0, 315.0))),
)
