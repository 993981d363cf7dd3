"""The member table: what every reader produces and the engine consumes.

One row per member, every column a numpy array, internal units (kip, inch, ksi).  Missing
numbers are NaN; a member that a reader already knows it cannot check carries a ``reason``
(it is then reported ``not_checked`` with that reason, never ``pass``).
"""

from __future__ import annotations

from dataclasses import dataclass, field

import numpy as np

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
    """

    id: np.ndarray
    name: np.ndarray
    section_label: np.ndarray
    section_index: np.ndarray
    sections: SectionTable
    Fy: np.ndarray
    lx: np.ndarray
    ly: np.ndarray
    lz: np.ndarray
    kx: np.ndarray
    ky: np.ndarray
    kz: np.ndarray
    E: np.ndarray
    G: np.ndarray
    loads: np.ndarray
    required_strength: np.ndarray
    reason: np.ndarray
    messages: list[list[str]]
    extra: dict[str, np.ndarray] = field(default_factory=dict)

    def __len__(self) -> int:
        return len(self.id)

    @classmethod
    def build(
        cls,
        ids: list[str],
        sections: SectionTable,
        section_index: np.ndarray,
        Fy: np.ndarray,
        length: np.ndarray,
        *,
        name: list[str] | None = None,
        section_label: list[str] | None = None,
        lx: np.ndarray | None = None,
        ly: np.ndarray | None = None,
        lz: np.ndarray | None = None,
        kx: np.ndarray | None = None,
        ky: np.ndarray | None = None,
        kz: np.ndarray | None = None,
        E: np.ndarray | float = E_DEFAULT,
        G: np.ndarray | float = G_DEFAULT,
        loads: np.ndarray | None = None,
        required_strength: np.ndarray | None = None,
        reason: list[str | None] | None = None,
        messages: list[list[str]] | None = None,
        extra: dict[str, np.ndarray] | None = None,
    ) -> MemberTable:
        """Convenience constructor: defaults K = 1 and unbraced lengths = member length."""
        n = len(ids)
        length = np.asarray(length, dtype=float)

        def arr(v, default):
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
            E=arr(None, E) if np.isscalar(E) else arr(E, E_DEFAULT),
            G=arr(None, G) if np.isscalar(G) else arr(G, G_DEFAULT),
            loads=(
                np.full((n, len(LOAD_TYPES)), np.nan)
                if loads is None
                else np.asarray(loads, dtype=float).reshape(n, len(LOAD_TYPES))
            ),
            required_strength=arr(required_strength, np.nan),
            reason=np.array(reason if reason is not None else [None] * n, dtype=object),
            messages=messages if messages is not None else [[] for _ in range(n)],
            extra=extra or {},
        )
