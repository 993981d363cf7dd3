"""Fast forward-attribute access for the reader's per-element hot paths.

``entity.Name`` goes through ``entity_instance.__getattr__`` (attribute category lookup,
then index lookup, then the value: about 1.4 µs).  :func:`get` asks for the index and the
value directly (about 0.4 µs) and returns exactly what ``__getattr__`` returns for a forward
(explicit) attribute.  Inverse and derived attributes must still use normal access.
"""

from __future__ import annotations

from typing import Any, TypeAlias

#: An IFC entity, an ``ifcopenshell.entity_instance``.  Its IFC attributes are dynamic and
#: its methods from the compiled wrapper (``is_a``, ``id`` ...) carry no types, so to the type
#: checker an entity is ``Any``: this alias is that boundary, named.
Entity: TypeAlias = Any


def get(entity: Entity, name: str) -> Any:
    """Value of the explicit attribute ``name`` (raises like getattr for unknown names).

    Args:
        entity: the entity.
        name: the attribute's name.

    Returns:
        The attribute's value, as ``getattr`` gives it.

    Raises:
        AttributeError: the entity has no explicit attribute ``name``.
    """
    try:
        return entity.get_argument(entity.get_argument_index(name))
    except RuntimeError:
        raise AttributeError(f"{entity.is_a()} has no attribute {name}") from None


def get_opt(entity: Entity, name: str) -> Any:
    """Like :func:`get`, but None when this entity's schema/class has no such attribute.

    Args:
        entity: the entity.
        name: the attribute's name.

    Returns:
        The attribute's value, or None.
    """
    try:
        return entity.get_argument(entity.get_argument_index(name))
    except RuntimeError:
        return None
