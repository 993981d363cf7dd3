"""US shapes catalog (AISC Shapes Database v16.0) and designation lookup.

The catalog file ``engine/data/aisc_shapes_v16.csv`` is generated once by
``tools/build_catalog.py`` (see ``engine/data/CATALOG_PROVENANCE.md``); this module only reads
it. :func:`load_catalog` turns it into a :class:`~engine.sections.SectionTable` with the
element data Chapter E needs:

========== ============ ====================================================================
families   kind         element groups (b, t, n, class)
========== ============ ====================================================================
W M S HP   I_SHAPE      bf/2, tf, 4, unstiffened flange;  d − 2·kdes, tw, 1, stiffened web
HSS        RECT_HSS     b (flat), tdes, 2, HSS wall;       h (flat), tdes, 2, HSS wall
HSS_ROUND  ROUND_HSS    OD, tdes, 1, round wall
PIPE       ROUND_HSS    OD, tdes, 1, round wall
WT MT ST   TEE          bf/2, tf, 2, unstiffened flange;  d, tw, 1, tee stem
C MC       CHANNEL      bf, tf, 2, unstiffened flange;    d − 2·kdes, tw, 1, stiffened web
L 2L       UNSUPPORTED  none (kept so that a lookup can say angles are out of scope)
========== ============ ====================================================================

Shear centre (AISC 360-22 Section E4): doubly symmetric shapes xo = yo = 0, r̄o = √((Ix+Iy)/A),
H = 1. Tees: xo = 0, yo = ȳ − tf/2 (shear centre at the flange/stem intersection). Channels:
yo = 0, xo = x̄ + eo (eo measured from the outer web face). xo and yo are stored as distances
(non-negative); only their squares enter r̄o and H. For tees and channels r̄o and H are
the tabulated values. Values not tabulated for a family (Cw of closed sections, ...) are 0.
"""

from __future__ import annotations

import csv
import difflib
import functools
import re
import unicodedata
from collections.abc import Sequence
from fractions import Fraction
from pathlib import Path
from typing import TYPE_CHECKING

import numpy as np

from stanchion.engine.arrays import BoolArray, FloatArray, IntArray
from stanchion.engine.sections import ElementClass, Kind, SectionTable

if TYPE_CHECKING:
    import pandas as pd

CATALOG_PATH = Path(__file__).resolve().parent / "data" / "aisc_shapes_v16.csv"

FAMILIES: tuple[str, ...] = (
    "W", "M", "S", "HP", "HSS", "HSS_ROUND", "PIPE", "WT", "MT", "ST", "C", "MC", "L", "2L",
)  # fmt: skip
FAMILY_KIND: dict[str, Kind] = {
    "W": Kind.I_SHAPE,
    "M": Kind.I_SHAPE,
    "S": Kind.I_SHAPE,
    "HP": Kind.I_SHAPE,
    "HSS": Kind.RECT_HSS,
    "HSS_ROUND": Kind.ROUND_HSS,
    "PIPE": Kind.ROUND_HSS,
    "WT": Kind.TEE,
    "MT": Kind.TEE,
    "ST": Kind.TEE,
    "C": Kind.CHANNEL,
    "MC": Kind.CHANNEL,
    "L": Kind.UNSUPPORTED,
    "2L": Kind.UNSUPPORTED,
}
_FAMILY_ALIASES = {"HSS_ROUND": "HSS_ROUND", "HSSROUND": "HSS_ROUND", "ROUND_HSS": "HSS_ROUND"}
_DESCRIPTION = {"L": "a single angle", "2L": "a double angle"}

# Designation prefixes, longest first so that "WT" is not read as "W".
_PREFIX = re.compile(r"(2L|HSS|PIPE|WT|MT|ST|MC|HP|W|M|S|C|L)(.*)")
_PIPE_BODY = re.compile(r"(.+?)(STD|XXS|XS)")
_ANGLE_SUFFIX = re.compile(r"(.*?)(LLBB|SLBB)?")
_VULGAR = {"½": "1/2", "¼": "1/4", "¾": "3/4", "⅛": "1/8", "⅜": "3/8", "⅝": "5/8", "⅞": "7/8"}
_TIMES = str.maketrans({"×": "X", "✕": "X", "*": "X", "–": "-", "—": "-", "‐": "-", "−": "-"})


# --------------------------------------------------------------------------- designations


def _token_value(token: str) -> float | None:
    """``3-1/2`` -> 3.5, ``3/4`` -> 0.75, ``6.625`` -> 6.625; None when not a number."""
    m = re.fullmatch(r"(?:(\d+)-)?(\d+)/(\d+)", token)
    if m:
        whole, num, den = m.groups()
        if int(den) == 0:
            return None
        return (int(whole) if whole else 0) + int(num) / int(den)
    if re.fullmatch(r"\d+(?:\.\d*)?|\.\d+", token):
        return float(token)
    return None


def _as_fraction(token: str) -> str:
    """A dimension written as a mixed number of sixteenths (``0.25`` -> ``1/4``).

    ``3.5`` -> ``3-1/2``; values within 0.0025 in. of a sixteenth snap to it (``.188`` ->
    ``3/16``, the rounding used in tables). Anything else is returned unchanged.
    """
    value = _token_value(token)
    if value is None:
        return token
    sixteenths = round(value * 16)
    if abs(value * 16 - sixteenths) > 0.04:
        return token
    whole, rest = divmod(sixteenths, 16)
    if rest == 0:
        return str(whole)
    frac = Fraction(rest, 16)
    text = f"{frac.numerator}/{frac.denominator}"
    return f"{whole}-{text}" if whole else text


def _as_decimal(token: str, places: int | None = None) -> str:
    """A number in plain decimal form: ``48.0`` -> ``48``, ``15-1/2`` -> ``15.5``.

    With ``places``, a fixed number of decimals (round HSS: ``.28`` -> ``0.280``).
    """
    value = _token_value(token)
    if value is None:
        return token
    if places is not None:
        return f"{value:.{places}f}"
    return f"{value:.4f}".rstrip("0").rstrip(".")


@functools.lru_cache(maxsize=8192)
def normalize_designation(text: str) -> str:
    """Canonical catalog spelling of a shape designation.

    Case-, space- and multiplication-sign-insensitive: ``'w14x48'``, ``'W 14 × 48'`` ->
    ``'W14X48'``; ``'Pipe6Std'`` -> ``'PIPE6STD'``; ``'hss6.625x.280'`` -> ``'HSS6.625X0.280'``;
    ``'HSS 3 1/2 x 3 1/2 x 1/4'`` or ``'HSS3.5X3.5X0.25'`` -> ``'HSS3-1/2X3-1/2X1/4'``.
    Dimensions are written the way the family's designations write them: decimals for
    W/M/S/HP/WT/MT/ST/C/MC and round HSS (three decimals), mixed numbers for rectangular HSS,
    pipes and angles. The result is not checked against the catalog (see :func:`lookup`).

    Args:
        text: a designation as typed or exported by a modelling program.

    Returns:
        The canonical designation; text that does not look like a designation is returned
        upper-cased with spaces removed.
    """
    s = str(text)
    for char, frac in _VULGAR.items():
        s = re.sub(rf"(\d)\s*{char}", rf"\1-{frac}", s).replace(char, frac)
    s = unicodedata.normalize("NFKC", s).replace("⁄", "/").upper().translate(_TIMES)
    s = re.sub(r"(\d)\s+(\d+/\d+)", r"\1-\2", s)  # "3 1/2" -> "3-1/2"
    s = re.sub(r"\s+", "", s)
    s = re.sub(r"^(2L|[A-Z]+)-(?=[\d.])", r"\1", s)  # "W-14X48" -> "W14X48"
    s = re.sub(r"(?<![\d.])\.(\d)", r"0.\1", s)  # ".280" -> "0.280"
    m = _PREFIX.fullmatch(s)
    if m is None or not m.group(2):
        return s
    prefix, body = m.groups()
    if prefix == "PIPE":
        p = _PIPE_BODY.fullmatch(re.sub(r"-(?=(?:STD|XXS|XS)$)", "", body))
        return f"PIPE{_as_fraction(p.group(1))}{p.group(2)}" if p else s
    suffix = ""
    if prefix in ("L", "2L"):
        a = _ANGLE_SUFFIX.fullmatch(body)
        if a is not None:  # the pattern matches every body
            body, suffix = a.group(1), a.group(2) or ""
    tokens = body.split("X")
    if any(_token_value(t) is None for t in tokens):
        return s
    if prefix == "HSS" and len(tokens) == 2:
        tokens = [_as_decimal(t, 3) for t in tokens]
    elif prefix in ("HSS", "L", "2L"):
        tokens = [_as_fraction(t) for t in tokens]
    else:
        tokens = [_as_decimal(t) for t in tokens]
    return prefix + "X".join(tokens) + suffix


def _query_family(designation: str) -> str | None:
    """Family a (normalized) designation belongs to, judged from its prefix."""
    m = _PREFIX.fullmatch(designation)
    if m is None:
        return None
    prefix, body = m.groups()
    if prefix == "HSS":
        return "HSS_ROUND" if body.count("X") == 1 else "HSS"
    return prefix


def _designation_numbers(designation: str) -> list[float]:
    """Numbers named by a designation (``HSS8X6X1/4`` -> [8, 6, 0.25]); [] if none."""
    m = _PREFIX.fullmatch(designation)
    if m is None:
        return []
    body = re.sub(r"(LLBB|SLBB|STD|XXS|XS)$", "", m.group(2))
    values = [_token_value(t) for t in body.split("X")]
    numbers = [v for v in values if v is not None]
    return numbers if len(numbers) == len(values) else []


# --------------------------------------------------------------------------- loading


#: Text columns of the catalog file; every other column is a number (blank: not applicable).
TEXT_COLUMNS = ("designation", "family", "source_label")


@functools.lru_cache(maxsize=1)
def _columns() -> dict[str, np.ndarray]:
    """The catalog file by column: text as object arrays, numbers as floats (blank -> NaN).

    Read with the standard library: the file is small, and pandas would cost the model
    check a third of a second and 40 MB just to import.
    """
    with CATALOG_PATH.open(newline="", encoding="utf-8") as fh:
        header, *rows = list(csv.reader(fh))
    out: dict[str, np.ndarray] = {}
    for j, name in enumerate(header):
        values = [row[j] for row in rows]
        if name in TEXT_COLUMNS:
            out[name] = np.array(values, dtype=object)
        else:
            out[name] = np.array([float(v) if v else np.nan for v in values], dtype=float)
        out[name].flags.writeable = False
    return out


def catalog_frame() -> pd.DataFrame:
    """The catalog file as a DataFrame (a copy): tabulated values, blank = not applicable."""
    import pandas as pd  # for tests and tools only

    return pd.DataFrame({k: v.copy() for k, v in _columns().items()})


def _build_table(columns: dict[str, np.ndarray]) -> SectionTable:
    """SectionTable from catalog rows, vectorized over families (conventions: module doc)."""
    fam = columns["family"].copy()
    unknown = set(fam) - set(FAMILIES)
    if unknown:
        raise ValueError(f"{CATALOG_PATH.name}: unknown families {sorted(unknown)}")

    def col(name: str) -> FloatArray:
        return np.array(columns[name], dtype=float)  # a writable copy

    is_i = np.isin(fam, ["W", "M", "S", "HP"])
    is_rect = fam == "HSS"
    is_round = np.isin(fam, ["HSS_ROUND", "PIPE"])
    is_tee = np.isin(fam, ["WT", "MT", "ST"])
    is_chan = np.isin(fam, ["C", "MC"])
    is_angle = np.isin(fam, ["L", "2L"])
    is_hollow = is_rect | is_round
    is_flanged = is_i | is_tee | is_chan

    A, Ix, Iy = col("A"), col("Ix"), col("Iy")
    d, bf, tw, tf, kdes = col("d"), col("bf"), col("tw"), col("tf"), col("kdes")
    tdes, od, t_angle = col("tdes"), col("OD"), col("t")
    web_h = d - 2.0 * kdes
    r_polar = np.sqrt((Ix + Iy) / A)
    tabulated_shear_centre = is_tee | is_chan | is_angle

    def pick(default: float | FloatArray, *pairs: tuple[BoolArray, float | FloatArray]
             ) -> FloatArray:
        """``default`` where no mask is set, else the value of the (disjoint) mask that is."""
        out = np.broadcast_to(np.asarray(default, dtype=float), fam.shape)
        for mask, value in pairs:
            out = np.where(mask, value, out)
        return out

    def code(*pairs: tuple[BoolArray, int]) -> IntArray:
        return pick(0.0, *pairs).astype(np.int64)

    data = {
        "designation": columns["designation"].copy(),
        "family": fam.copy(),
        "kind": np.array([FAMILY_KIND[f] for f in fam], dtype=np.int64),
        "weight": col("weight"),
        "A": A,
        "d": pick(d, (is_rect, col("Ht")), (is_round, od)),
        "bf": pick(bf, (is_rect, col("B")), (is_round, od), (is_angle, col("b"))),
        "tw": pick(tw, (is_hollow, tdes), (is_angle, t_angle)),
        "tf": pick(tf, (is_hollow, tdes), (is_angle, t_angle)),
        "Ix": Ix,
        "Iy": Iy,
        "rx": col("rx"),
        "ry": col("ry"),
        "J": col("J"),
        "Cw": col("Cw"),
        "xo": pick(0.0, (is_chan, col("x") + col("eo"))),
        "yo": pick(0.0, (is_tee, col("y") - tf / 2.0)),
        "xbar": pick(0.0, (is_chan, col("x"))),
        "ybar": pick(0.0, (is_tee, col("y"))),
        "ro": pick(r_polar, (tabulated_shear_centre, col("ro"))),
        "H": pick(1.0, (tabulated_shear_centre, col("H"))),
        "b1": pick(
            0.0, (is_i | is_tee, bf / 2.0), (is_chan, bf), (is_rect, col("b")), (is_round, od)
        ),
        "t1": pick(0.0, (is_flanged, tf), (is_hollow, tdes)),
        "n1": code((is_i, 4), (is_tee | is_chan | is_rect, 2), (is_round, 1)),
        "cls1": code(
            (is_flanged, ElementClass.UNSTIFFENED_FLANGE),
            (is_rect, ElementClass.HSS_WALL),
            (is_round, ElementClass.ROUND_WALL),
        ),
        "b2": pick(0.0, (is_i | is_chan, web_h), (is_tee, d), (is_rect, col("h"))),
        "t2": pick(0.0, (is_flanged, tw), (is_rect, tdes)),
        "n2": code((is_i | is_tee | is_chan, 1), (is_rect, 2)),
        "cls2": code(
            (is_i | is_chan, ElementClass.STIFFENED_WEB),
            (is_tee, ElementClass.TEE_STEM),
            (is_rect, ElementClass.HSS_WALL),
        ),
    }
    for name, values in data.items():
        if values.dtype == float:
            values = np.nan_to_num(values, nan=0.0)  # not tabulated for the family -> 0
        values.flags.writeable = False  # shared cache: gather with take() to get a copy
        data[name] = values
    return SectionTable(**data)


@functools.lru_cache(maxsize=1)
def load_catalog() -> SectionTable:
    """All catalog shapes as a read-only :class:`SectionTable` (cached; row order = file)."""
    return _build_table(_columns())


@functools.lru_cache(maxsize=1)
def designations() -> tuple[str, ...]:
    """The catalog designations in row order (cached, as Python strings)."""
    return tuple(load_catalog().designation.tolist())


@functools.lru_cache(maxsize=1)
def _index() -> dict[str, int]:
    return {name: i for i, name in enumerate(load_catalog().designation)}


@functools.lru_cache(maxsize=1)
def _nominal_depth() -> FloatArray:
    out = np.array(
        [(n[0] if n else np.nan) for n in map(_designation_numbers, load_catalog().designation)],
        dtype=float,
    )
    out.flags.writeable = False
    return out


def nominal_depth() -> FloatArray:
    """Nominal depth named by each catalog designation, row-aligned with :func:`load_catalog`.

    W14X48 -> 14, HSS8X6X1/4 -> 8, PIPE1-1/2STD -> 1.5, HSS6.625X0.280 -> 6.625; NaN when a
    designation names none. Read-only.
    """
    return _nominal_depth()


# --------------------------------------------------------------------------- lookup


def lookup(designations: Sequence[object]) -> IntArray:
    """Row indices into :func:`load_catalog` for each designation (-1 when unknown).

    Args:
        designations: designations in any spelling :func:`normalize_designation` accepts;
            entries that are not strings (None, NaN) count as unknown.

    Returns:
        int64 array, one entry per designation.
    """
    values = [designations] if isinstance(designations, str) else list(designations)
    try:
        return np.fromiter(map(_row_of, values), dtype=np.int64, count=len(values))
    except TypeError:  # an unhashable entry (not a designation): count it as unknown
        return np.fromiter((_row_of(v) if isinstance(v, str) else -1 for v in values),
                           dtype=np.int64, count=len(values))


@functools.lru_cache(maxsize=8192)
def _row_of(value: object) -> int:
    """Catalog row of one designation, -1 when unknown or not a string (see :func:`lookup`)."""
    if not isinstance(value, str):
        return -1
    return _index().get(normalize_designation(value), -1)


def _numeric_distance(query: list[float], name: str) -> float:
    """Sum of relative differences of the numbers two designations name (common length)."""
    other = _designation_numbers(name)
    pairs = list(zip(query, other, strict=False))
    return sum(abs(a - b) / max(abs(a), 1e-9) for a, b in pairs) if pairs else 0.0


def nearest_designations(text: str, n: int = 3) -> list[str]:
    """Up to ``n`` catalog designations resembling ``text``, same family first.

    Score = :class:`difflib.SequenceMatcher` ratio of the normalized names minus twice the
    summed relative difference of the numbers they name, so that W14X47 gives W14X48, W14X43,
    W14X53 rather than names that merely share characters. Other families (similarity ratio
    at least 0.5) only fill up a short list.
    """
    if n <= 0:
        return []
    query = normalize_designation(text) if isinstance(text, str) else ""
    table = load_catalog()
    family = _query_family(query)
    numbers = _designation_numbers(query)

    def ranked(pool: list[str], cutoff: float, count: int) -> list[str]:
        scored = []
        for name in pool:
            ratio = difflib.SequenceMatcher(None, query, name).ratio()
            if ratio >= cutoff:
                score = ratio - 2.0 * min(_numeric_distance(numbers, name), 1.0)
                scored.append((-score, name))
        return [name for _, name in sorted(scored)[:count]]

    names = [str(nm) for nm in table.designation]
    same = [nm for nm, f in zip(names, table.family, strict=True) if f == family]
    out = ranked(same, 0.0, n)
    if len(out) < n:
        taken = set(out)
        out += ranked([nm for nm in names if nm not in taken], 0.5, n - len(out))
    return out


def unknown_section_reason(text: str) -> str:
    """Why ``text`` cannot be checked from the catalog ("" when it can).

    Returns e.g. ``"unknown section 'W14X47'; nearest: W14X48, W14X43, W14X53"``, or, for a
    known angle, that angles are outside the scope of the checks. A designation of another
    standard (``engine.designations``) is named as such, with no nearest AISC shape:
    ``"section 'IPE300' is EN 10365 IPE 300, not an AISC catalog shape"``.
    """
    if not isinstance(text, str) or not text.strip():
        return "no section designation given"
    given = text.strip()
    name = normalize_designation(given)
    i = _index().get(name)
    if i is not None:
        table = load_catalog()
        if table.kind[i] != Kind.UNSUPPORTED:
            return ""
        what = _DESCRIPTION.get(table.family[i], f"a {table.family[i]} shape")
        return f"section '{name}' is {what}; angles (L, 2L) are outside the scope of these checks"
    from stanchion.engine.designations import designation_of  # it imports the builders

    other = designation_of(given)
    if other is not None:  # a designation of another standard: no nearest AISC shape
        return f"section '{given}' is {other.label}, not an AISC catalog shape"
    plain = re.sub(r"\s+", "", given.upper())
    read_as = f" (read as {name})" if name != plain else ""
    nearest = nearest_designations(given, 3)
    hint = f"; nearest: {', '.join(nearest)}" if nearest else ""
    return f"unknown section '{given}'{read_as}{hint}"


def family_indices(spec: str) -> IntArray:
    """Catalog rows selected by a family, a family with nominal depth, or a designation.

    Args:
        spec: ``'W'`` (all W rows), ``'W14'`` (W shapes of 14 in. nominal depth), ``'HSS'``
            (rectangular and square HSS), ``'HSS_ROUND'``, ``'PIPE'``, any other family in
            :data:`FAMILIES`, or an exact designation (``'W14X48'``). ``'HSS8'`` selects the
            rectangular and round HSS with 8 in. nominal depth; ``'PIPE6'`` the three
            6 in. pipes.

    Returns:
        Sorted int64 row indices into :func:`load_catalog` (empty when a valid family and
        depth select nothing, e.g. ``'W13'``).

    Raises:
        ValueError: ``spec`` is neither a family, a family with depth, nor a catalog
            designation.
    """
    table = load_catalog()
    key = re.sub(r"\s+", "", str(spec)).upper()
    key = _FAMILY_ALIASES.get(key, key)
    if key in FAMILIES:
        return np.flatnonzero(table.family == key)
    name = normalize_designation(str(spec))
    i = _index().get(name)
    if i is not None:
        return np.array([i], dtype=np.int64)
    m = _PREFIX.fullmatch(name)
    depth = _token_value(m.group(2)) if m else None
    if m is None or depth is None:
        raise ValueError(
            f"'{spec}' is not a section family ({', '.join(FAMILIES)}), a family with a "
            "nominal depth (e.g. W14) or a catalog designation"
        )
    prefix = m.group(1)
    wanted = ["HSS", "HSS_ROUND"] if prefix == "HSS" else [prefix]
    rows = np.isin(table.family, wanted) & np.isclose(nominal_depth(), depth, atol=1e-9)
    return np.flatnonzero(rows)
