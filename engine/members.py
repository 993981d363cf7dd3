"""The member table: what every reader produces and the engine consumes.

One row per member, every column a numpy array, internal units (kip, inch, ksi).  Missing
numbers are NaN; a member that a reader already knows it cannot check carries a ``reason``
(it is then reported ``not_checked`` with that reason, never ``pass``).
"""

from __future__ import annotations

from dataclasses import dataclass, field

import numpy as np

from stanchion.engine.arrays import AnyArray, FloatArray, IntArray, ObjectArray
from stanchion.engine.materials import E_DEFAULT, G_DEFAULT
from stanchion.engine.sections import SectionTable

# Order of the load-type columns of MemberTable.loads (docs/design.md §2).  W and E are reversible.
LOAD_TYPES: tuple[str, ...] = ("D", "L", "Lr", "S", "R", "W", "E")
REVERSIBLE: tuple[str, ...] = ("W", "E")

__all__ = ["E_DEFAULT", "G_DEFAULT", "LOAD_TYPES", "REVERSIBLE", "MemberTable"]


@dataclass
class MemberTable:
    """Members to check.

    Attributes:
        id: unique ids (GlobalId for IFC inputs).
        name: display names.
        section_label: the designation or profile description as given.
        section_index: row in ``sections`` for each member, -1 where no usable section.
        sections: the section rows the members point into (catalog and/or parametric).
        Fy: yield stress, ksi.
        lx, ly, lz: unbraced lengths for x, y and torsion, in.
        kx, ky, kz: effective length factors.
        E, G: moduli, ksi.
        loads: (n, len(LOAD_TYPES)) axial service load effects, kip, compression positive;
            NaN where a type is absent.
        required_strength: (n,) already-factored compression, kip; NaN where not given.
        reason: None, or why the member cannot be checked.
        messages: per-member notes carried into the report.
        extra: further per-member columns (storey, x, y, candidates ...) for writers.
        material: material class of each member (:func:`engine.materials.material_class`:
            ``"steel"``, ``"unknown"``, ``"concrete"`` ...); None when the reader knows
            none (members files: every member is taken as steel by its grade).
    """

    id: ObjectArray
    name: ObjectArray
    section_label: ObjectArray
    section_index: IntArray
    sections: SectionTable
    Fy: FloatArray
    lx: FloatArray
    ly: FloatArray
    lz: FloatArray
    kx: FloatArray
    ky: FloatArray
    kz: FloatArray
    E: FloatArray
    G: FloatArray
    loads: FloatArray
    required_strength: FloatArray
    reason: ObjectArray
    messages: list[list[str]]
    extra: dict[str, AnyArray] = field(default_factory=dict)
    material: ObjectArray | None = None

    def __len__(self) -> int:
        return len(self.id)

    @classmethod
    def build(  # noqa: PLR0913 - a keyword-only table constructor, one argument per column
        cls,
        ids: list[str],
        sections: SectionTable,
        section_index: IntArray,
        Fy: FloatArray,
        length: FloatArray,
        *,
        name: list[str] | None = None,
        section_label: list[str] | None = None,
        lx: FloatArray | None = None,
        ly: FloatArray | None = None,
        lz: FloatArray | None = None,
        kx: FloatArray | None = None,
        ky: FloatArray | None = None,
        kz: FloatArray | None = None,
        E: FloatArray | float = E_DEFAULT,
        G: FloatArray | float = G_DEFAULT,
        loads: FloatArray | None = None,
        required_strength: FloatArray | None = None,
        reason: list[str | None] | None = None,
        messages: list[list[str]] | None = None,
        extra: dict[str, AnyArray] | None = None,
        material: list[str] | None = None,
    ) -> MemberTable:
        """Convenience constructor: defaults K = 1 and unbraced lengths = member length.

        Args:
            ids: unique member ids.
            sections: the section rows the members point into.
            section_index: row in ``sections`` for each member, -1 where none is usable.
            Fy: yield stress, ksi.
            length: member length, in: the unbraced lengths not given.
            name: display names (default: the ids).
            section_label: the designation or profile description as given (default "").
            lx: unbraced length for flexure about x, in.
            ly: unbraced length for flexure about y, in.
            lz: unbraced length for torsion, in.
            kx: effective length factor for ``lx`` (default 1).
            ky: effective length factor for ``ly`` (default 1).
            kz: effective length factor for ``lz`` (default 1).
            E: modulus of elasticity, ksi (one value or one per member).
            G: shear modulus, ksi (one value or one per member).
            loads: (n, len(LOAD_TYPES)) service load effects, kip (default: all NaN).
            required_strength: already-factored compression, kip (default NaN).
            reason: why each member cannot be checked, or None.
            messages: per-member notes (default: none).
            extra: further per-member columns for writers.
            material: material class of each member (default: none known).

        Returns:
            The member table.
        """
        n = len(ids)
        length = np.asarray(length, dtype=float)

        def arr(v: FloatArray | float | None, default: FloatArray | float) -> FloatArray:
            if v is None:
                return np.broadcast_to(np.asarray(default, dtype=float), (n,)).copy()
            return np.asarray(v, dtype=float).reshape(n)

        return cls(
            id=np.array(ids, dtype=object),
            name=np.array(name if name is not None else ids, dtype=object),
            section_label=np.array(
                section_label if section_label is not None else [""] * n, dtype=object
            ),
            section_index=np.asarray(section_index, dtype=np.int64).reshape(n),
            sections=sections,
            Fy=arr(Fy, np.nan),
            lx=arr(lx, length),
            ly=arr(ly, length),
            lz=arr(lz, length),
            kx=arr(kx, 1.0),
            ky=arr(ky, 1.0),
            kz=arr(kz, 1.0),
            E=arr(E, E_DEFAULT) if isinstance(E, np.ndarray) else arr(None, E),
            G=arr(G, G_DEFAULT) if isinstance(G, np.ndarray) else arr(None, G),
            loads=(
                np.full((n, len(LOAD_TYPES)), np.nan)
                if loads is None
                else np.asarray(loads, dtype=float).reshape(n, len(LOAD_TYPES))
            ),
            required_strength=arr(required_strength, np.nan),
            reason=np.array(reason if reason is not None else [None] * n, dtype=object),
            messages=messages if messages is not None else [[] for _ in range(n)],
            extra=extra or {},
            material=np.array(material, dtype=object) if material is not None else None,
        )
