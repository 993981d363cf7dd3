"""The design wall thickness of tubes (rectangular and round HSS, pipe): one rule for all.

Catalog rows (AISC Shapes Database v16.0, ASTM A500 HSS and ASTM A53 pipe) tabulate
tdes = 0.93 tnom, which is :func:`design_wall` for ``"ASTM A500"`` / ``"ASTM A53"`` (checked
row by row in tests/engine/test_tubes.py); members-file profiles (``service.members_check``) and
IFC profiles (``ifc_bridge.sections``) get their design wall from :func:`design_wall`.
"""

from __future__ import annotations

from typing import TypeVar

from stanchion.engine.arrays import FloatArray
from stanchion.engine.materials import Standard, product_standard

#: Design / nominal wall of electric-resistance-welded tubes (AISC 360-22 §B4.2).
ERW_RATIO = 0.93

#: A wall thickness: one number or one per member.
T = TypeVar("T", float, FloatArray)


def design_wall(t_nominal: T, standard: str | Standard | None, kind: str = "HSS"
                ) -> tuple[T, str]:
    """Design wall thickness of a tube from its nominal wall (AISC 360-22 §B4.2).

    * ERW tubes, ASTM A500 and ASTM A53: t = 0.93 tnom (AISC 360-22 §B4.2);
    * ASTM A1085 and A1065: t = tnom (AISC 360-22 §B4.2);
    * EN 10210 and EN 10219 tubes: t = tnom, the nominal thickness EN 1993-1-1 designs them
      with (their product standards bound the wall tolerance); note that AISC 360-22 §B4.2
      itself names only A1065 and A1085 for the nominal wall;
    * standard unknown, or not a tube standard: t = 0.93 tnom, conservatively, and the
      message says so.

    Args:
        t_nominal: nominal wall thickness (float or numpy array; any length unit).
        standard: the product standard or a text naming it (``"A1085"``, ``"ASTM A500 Gr C"``,
            ``"S355J2H EN 10219"``), or None when unknown.
        kind: ``"HSS"`` (rectangular), ``"HSS_ROUND"`` or ``"PIPE"``; used in the message.

    Returns:
        (design wall thickness, same type as ``t_nominal``; the member message naming the
        rule used).
    """
    std = standard if isinstance(standard, Standard) else product_standard(standard)
    what = "round tube" if kind in ("HSS_ROUND", "PIPE") else "rectangular tube"
    if std is not None and std.tube == "erw":
        return (t_nominal * ERW_RATIO,
                f"{what} design wall = 0.93 x nominal wall ({std.name}, electric-resistance-"
                "welded; AISC 360-22 §B4.2)")
    if std is not None and std.tube == "nominal":
        if std.name.startswith("EN "):
            return (t_nominal,
                    f"{what} design wall = nominal wall ({std.name} tube, designed with its "
                    "nominal thickness as in EN 1993-1-1; AISC 360-22 §B4.2 names only "
                    "ASTM A1065/A1085 for the nominal wall)")
        return t_nominal, f"{what} design wall = nominal wall ({std.name}, AISC 360-22 §B4.2)"
    named = f" ({std.name} is not a tube standard)" if std is not None else ""
    return (t_nominal * ERW_RATIO,
            f"{what} product standard unknown{named}: design wall taken as 0.93 x nominal "
            "wall, conservatively (AISC 360-22 §B4.2); name the tube's standard (e.g. "
            "A500, A1085, EN 10219) to apply its rule")


def tube_standard(material: str | None, designation_standard: str | None = None
                  ) -> Standard | None:
    """The product standard a tube's wall follows: the material's, else the profile name's.

    A material naming a tube standard (``"A500 Gr C"``, ``"S355J2H"``, ``"EN 10219"``)
    decides; one naming none (``"Steel"``, ``"S355JR"``, ``"A992"``) leaves it to the
    standard the profile name gives (``engine.designations``: ``"EN 10210"``,
    ``"EN 10219"``, ``"EN 10210 or EN 10219"``).

    Args:
        material: the material's name (and description), or None.
        designation_standard: the standard of the profile's designation, or None.

    Returns:
        The standard for :func:`design_wall`, or None when neither names a tube standard.
    """
    own = product_standard(material)
    if own is not None and own.tube:
        return own
    named = product_standard(designation_standard)
    return named if named is not None and named.tube else own


def catalog_wall_note(standard: str | Standard | None) -> str | None:
    """Message for a catalog tube whose standard would permit the nominal wall, else None.

    The catalog's HSS and pipe rows tabulate tdes = 0.93 tnom (:func:`design_wall` for ASTM
    A500 / A53); they are used as tabulated, which is conservative for ASTM A1085 or EN
    tubes (AISC 360-22 §B4.2).
    """
    std = standard if isinstance(standard, Standard) else product_standard(standard)
    if std is None or std.tube != "nominal":
        return None
    return (f"the catalog tabulates the design wall 0.93 tnom (ASTM A500, AISC 360-22 §B4.2); "
            f"{std.name} would permit the nominal wall: the catalog values are conservative")
