"""Section property table: one row per cross-section, every property a numpy array.

Internal units: inch, in², in⁴, in⁶; weight in lb/ft. Rows come from the shapes catalog
(``engine.catalog``) or from parametric dimensions (``engine.section_properties``); the
compression engine only ever sees this table, gathered per member with :meth:`SectionTable.take`.

Axis convention (AISC): x is the major (strong) axis, y the minor axis. For tees the axis of
symmetry is y; for channels it is x.

Element slenderness data drive AISC 360-22 Section E7. Each row carries up to two element
groups (``b1, t1, n1, cls1`` and ``b2, t2, n2, cls2``): width, thickness, how many such
elements the section has (for the effective-area deduction) and an element class from
:data:`ELEMENT_CLASSES`.
"""

from __future__ import annotations

from collections.abc import Mapping, Sequence
from dataclasses import dataclass, fields
from enum import IntEnum
from typing import Any, TypedDict

import numpy as np

from stanchion.engine.arrays import FloatArray, IntArray, ObjectArray


class Kind(IntEnum):
    """How a section is treated by Chapter E."""

    I_SHAPE = 0  # doubly symmetric I (W, M, S, HP, parametric I): flexure both axes, torsion
    RECT_HSS = 1  # rectangular / square hollow: E3 both axes, walls by E7
    ROUND_HSS = 2  # round HSS and pipe: E3, wall by the round-HSS effective area
    TEE = 3  # WT, MT, ST, parametric T (y = axis of symmetry): flexure x, flexural-torsional y
    CHANNEL = 4  # C, MC, parametric U (x = axis of symmetry): flexure y, flexural-torsional x
    SOLID_RECT = 5  # solid rectangle: E3 only, no local buckling
    SOLID_ROUND = 6  # solid circle: E3 only
    UNSUPPORTED = 7  # angles, double angles, anything else: not checked


class ElementClass(IntEnum):
    """Element classes for AISC 360-22 Table B4.1a (λr) and Table E7.1 (c1, c2)."""

    NONE = 0
    UNSTIFFENED_FLANGE = 1  # B4.1a case 1 (rolled I flanges, channel and tee flanges)
    TEE_STEM = 2  # B4.1a case 4
    STIFFENED_WEB = 3  # B4.1a case 5 (webs of doubly symmetric I and of channels)
    HSS_WALL = 4  # B4.1a case 6 (walls of rectangular HSS)
    ROUND_WALL = 5  # B4.1a case 9 (round HSS: D/t, λr = 0.11 E/Fy)
    BUILT_UP_FLANGE = 6  # B4.1a case 2 (built-up I flanges: λr = 0.64·√(kc·E/Fy), see kc)


# class -> (λr coefficient k, with λr = k·sqrt(E/Fy); c1; c2).  Table B4.1a and Table E7.1
# (BUILT_UP_FLANGE: k = 0.64 is multiplied by √kc of the row, engine.compression.kc)
# (a) stiffened except HSS walls: c1 = 0.18, c2 = 1.31; (b) rectangular HSS walls: 0.20,
# 1.38; (c) all other elements: 0.22, 1.49.  ROUND_WALL and NONE are handled separately.
ELEMENT_CLASSES: dict[ElementClass, tuple[float, float, float]] = {
    ElementClass.NONE: (np.inf, 0.0, 0.0),
    ElementClass.UNSTIFFENED_FLANGE: (0.56, 0.22, 1.49),
    ElementClass.TEE_STEM: (0.75, 0.22, 1.49),
    ElementClass.STIFFENED_WEB: (1.49, 0.18, 1.31),
    ElementClass.HSS_WALL: (1.40, 0.20, 1.38),
    ElementClass.ROUND_WALL: (np.inf, 0.0, 0.0),
    ElementClass.BUILT_UP_FLANGE: (0.64, 0.22, 1.49),
}

_CLASS_TABLE = np.array([ELEMENT_CLASSES[c] for c in ElementClass], dtype=float)


def class_coefficients(cls: IntArray) -> tuple[FloatArray, FloatArray, FloatArray]:
    """λr coefficient, c1 and c2 arrays for an array of element class codes.

    Args:
        cls: :class:`ElementClass` codes.

    Returns:
        (k with λr = k·√(E/Fy), c1, c2), each shaped like ``cls``.
    """
    row = _CLASS_TABLE[np.asarray(cls, dtype=np.int64)]
    return row[..., 0], row[..., 1], row[..., 2]


def take_flanges_as_built_up(table: SectionTable, rows: IntArray) -> None:
    """Give the I-shaped ``rows`` of ``table`` built-up flanges (Table B4.1a case 2), in place.

    docs/design.md §8 "Built-up I sections": a name of a welded product (AS/NZS 3679.2 WB,
    WC) makes the flanges built-up whatever the modelled root radius.

    Args:
        table: a writable table (not the shared catalog).
        rows: row numbers; rows that are not I shapes are left alone.
    """
    rows = np.asarray(rows, dtype=np.int64)
    rows = rows[(table.kind[rows] == Kind.I_SHAPE)
                & (table.cls1[rows] == ElementClass.UNSTIFFENED_FLANGE)]
    table.cls1[rows] = ElementClass.BUILT_UP_FLANGE


_TEXT_FIELDS = ("designation", "family")
_CODE_FIELDS = ("kind", "cls1", "cls2", "n1", "n2")


class SectionRow(TypedDict):
    """One row of a :class:`SectionTable` as Python scalars (see its attributes)."""

    designation: str
    family: str
    kind: int
    weight: float
    A: float
    d: float
    bf: float
    tw: float
    tf: float
    Ix: float
    Iy: float
    rx: float
    ry: float
    J: float
    Cw: float
    xo: float
    yo: float
    xbar: float
    ybar: float
    ro: float
    H: float
    b1: float
    t1: float
    n1: int
    cls1: int
    b2: float
    t2: float
    n2: int
    cls2: int


@dataclass
class SectionTable:
    """Cross-section properties, one row per section (all arrays have the same length).

    Attributes:
        designation: catalog designation (``W14X48``) or a parametric label.
        family: display / filter family (``W``, ``HSS``, ``HSS_ROUND``, ``PIPE``, ``WT`` ...).
        kind: :class:`Kind` codes.
        weight: nominal weight, lb/ft (catalog) or 3.40·A (parametric; 490 lb/ft³ steel).
        A: gross area Ag, in².
        d: overall depth (OD for round sections), in.
        bf: overall width (flange width, B for HSS), in.
        tw: web (or wall) thickness, in (design thickness for HSS).
        tf: flange thickness, in (design thickness for HSS).
        Ix, Iy: moments of inertia, in⁴.  rx, ry: radii of gyration, in.
        J: torsional constant, in⁴.  Cw: warping constant, in⁶.
        xo, yo: shear-centre coordinates with respect to the centroid, in.
        xbar, ybar: centroid location: x̄ from the back of a channel's web, ȳ from the top of
            a tee's flange, in (0 for doubly symmetric sections).
        ro: polar radius of gyration about the shear centre r̄o, in (compression.ro_bar_squared).
        H: flexural constant (engine.compression.H_flexural_constant).
        b1, t1, n1, cls1, b2, t2, n2, cls2: element groups for Section E7.
    """

    designation: ObjectArray
    family: ObjectArray
    kind: IntArray
    weight: FloatArray
    A: FloatArray
    d: FloatArray
    bf: FloatArray
    tw: FloatArray
    tf: FloatArray
    Ix: FloatArray
    Iy: FloatArray
    rx: FloatArray
    ry: FloatArray
    J: FloatArray
    Cw: FloatArray
    xo: FloatArray
    yo: FloatArray
    xbar: FloatArray
    ybar: FloatArray
    ro: FloatArray
    H: FloatArray
    b1: FloatArray
    t1: FloatArray
    n1: IntArray
    cls1: IntArray
    b2: FloatArray
    t2: FloatArray
    n2: IntArray
    cls2: IntArray

    def __len__(self) -> int:
        return len(self.A)

    def take(self, index: IntArray) -> SectionTable:
        """Rows at ``index`` (fancy indexing; used to gather one row per member).

        Args:
            index: row numbers, in the order wanted.

        Returns:
            A new table whose row i is row ``index[i]`` of this one.
        """
        return SectionTable(**{f.name: getattr(self, f.name)[index] for f in fields(self)})

    @classmethod
    def concat(cls, tables: Sequence[SectionTable]) -> SectionTable:
        """Rows of several tables, in order.

        Args:
            tables: the tables to join.

        Returns:
            One table with the rows of ``tables`` one after the other.
        """
        return cls(
            **{f.name: np.concatenate([getattr(t, f.name) for t in tables]) for f in fields(cls)}
        )

    @classmethod
    def empty(cls) -> SectionTable:
        """A table with no rows."""
        return cls.from_rows([])

    @classmethod
    def from_rows(cls, rows: Sequence[Mapping[str, str | float]]) -> SectionTable:
        """Build a table from dicts keyed by field name; missing numeric fields are 0.

        Args:
            rows: one mapping per row, keyed by the attribute names.

        Returns:
            The table, one row per mapping.
        """
        data: dict[str, Any] = {}  # field name -> column, each with its field's dtype
        for f in fields(cls):
            if f.name in _TEXT_FIELDS:
                data[f.name] = np.array([r.get(f.name, "") for r in rows], dtype=object)
            elif f.name in _CODE_FIELDS:
                data[f.name] = np.array([int(r.get(f.name, 0)) for r in rows], dtype=np.int64)
            else:
                data[f.name] = np.array([float(r.get(f.name, 0.0)) for r in rows], dtype=float)
        return cls(**data)

    def row(self, i: int) -> SectionRow:
        """One row as Python scalars.

        Args:
            i: the row number.

        Returns:
            The row, keyed by attribute name.
        """
        return SectionRow(
            designation=str(self.designation[i]), family=str(self.family[i]),
            kind=int(self.kind[i]), weight=float(self.weight[i]), A=float(self.A[i]),
            d=float(self.d[i]), bf=float(self.bf[i]), tw=float(self.tw[i]), tf=float(self.tf[i]),
            Ix=float(self.Ix[i]), Iy=float(self.Iy[i]), rx=float(self.rx[i]),
            ry=float(self.ry[i]), J=float(self.J[i]), Cw=float(self.Cw[i]),
            xo=float(self.xo[i]), yo=float(self.yo[i]), xbar=float(self.xbar[i]),
            ybar=float(self.ybar[i]), ro=float(self.ro[i]), H=float(self.H[i]),
            b1=float(self.b1[i]), t1=float(self.t1[i]), n1=int(self.n1[i]),
            cls1=int(self.cls1[i]), b2=float(self.b2[i]), t2=float(self.t2[i]),
            n2=int(self.n2[i]), cls2=int(self.cls2[i]),
        )
