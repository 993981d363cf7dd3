"""Fast forward-attribute access for the reader's per-element hot paths.

``entity.Name`` goes through ``entity_instance.__getattr__`` (attribute category lookup,
then index lookup, then the value: about 1.4 µs).  :func:`get` asks for the index and the
value directly (about 0.4 µs) and returns exactly what ``__getattr__`` returns for a forward
(explicit) attribute.  Inverse and derived attributes must still use normal access.
"""

from __future__ import annotations

from typing import Any

import ifcopenshell


def get(entity: ifcopenshell.entity_instance, name: str) -> Any:
    """Value of the explicit attribute ``name`` (raises like getattr for unknown names)."""
    try:
        return entity.get_argument(entity.get_argument_index(name))
    except RuntimeError:
        raise AttributeError(f"{entity.is_a()} has no attribute {name}") from None


def get_opt(entity: ifcopenshell.entity_instance, name: str) -> Any:
    """Like :func:`get`, but None when this entity's schema/class has no such attribute."""
    try:
        return entity.get_argument(entity.get_argument_index(name))
    except RuntimeError:
        return None
