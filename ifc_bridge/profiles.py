"""IFC profile definitions -> what the engine needs: a shape family and dimensions in inches.

Supported parameterized profiles and the dimensions read (exact class, not subtypes):

============================  ===========  ================================================
IFC class                     family       dimensions (engine builder arguments)
============================  ===========  ================================================
IfcIShapeProfileDef           ``I``        d=OverallDepth, bf=OverallWidth, tw=WebThickness,
                                           tf=FlangeThickness, r=FilletRadius (0 if unset)
IfcRectangleHollowProfileDef  ``HSS``      H=max(XDim, YDim), B=min(...), t=WallThickness,
                                           r_out=OuterFilletRadius (unset: builder default)
IfcCircleHollowProfileDef     ``HSS_ROUND``  D=2·Radius, t=WallThickness
IfcTShapeProfileDef           ``T``        d=Depth, bf=FlangeWidth, tw, tf, r=FilletRadius
IfcUShapeProfileDef           ``U``        d=Depth, bf=FlangeWidth, tw, tf, r=FilletRadius
IfcRectangleProfileDef        ``RECT``     H=max(XDim, YDim), B=min(...)
IfcCircleProfileDef           ``ROUND``    D=2·Radius
============================  ===========  ================================================

H is the larger outside dimension so that the engine's x axis is the major axis whatever
the profile's orientation (Stanchion_Design's X/Y are the section's major/minor axes).

IfcAsymmetricIShapeProfileDef is read (family ``ASYM_I``) only so that a catalog name can be
verified against it; it cannot be checked from its dimensions.

Outlines (:func:`outline_spec`): ``IfcArbitraryClosedProfileDef``,
``IfcArbitraryProfileDefWithVoids`` and an ``IfcDerivedProfileDef`` of either are read by
:func:`ifc_bridge.outlines.outline_of`, converted to inches (model length unit times the
mapping scale) and analysed by :func:`engine.outlines.outline_section`; the spec carries the
recognised family with its dimensions under the builder names above (a tube's ``t`` is the
outline's nominal wall) and the outline itself, which ``ifc_bridge.sections`` analyses again
with the tube standard of the member (a cache hit for every other family).  An outline that
cannot be read, fits no family, or is an angle gives the reason.

Angles (IfcLShapeProfileDef) and every other profile type (composite, C, Z, ellipse ...)
are unsupported: the reason names the profile type.
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Any

import ifcopenshell

from stanchion.engine.outlines import Outline, outline_section
from stanchion.ifc_bridge.access import Entity
from stanchion.ifc_bridge.outlines import outline_of

#: family -> (IFC class, builder names in order)
FAMILIES: dict[str, tuple[str, tuple[str, ...]]] = {
    "I": ("IfcIShapeProfileDef", ("d", "bf", "tw", "tf", "r")),
    "HSS": ("IfcRectangleHollowProfileDef", ("H", "B", "t", "r_out")),
    "HSS_ROUND": ("IfcCircleHollowProfileDef", ("D", "t")),
    "T": ("IfcTShapeProfileDef", ("d", "bf", "tw", "tf", "r")),
    "U": ("IfcUShapeProfileDef", ("d", "bf", "tw", "tf", "r")),
    "RECT": ("IfcRectangleProfileDef", ("H", "B")),
    "ROUND": ("IfcCircleProfileDef", ("D",)),
    "ASYM_I": ("IfcAsymmetricIShapeProfileDef", ("d", "bf", "tw", "tf", "bf_top", "tf_top")),
}
_BY_CLASS = {cls: fam for fam, (cls, _) in FAMILIES.items()}


@dataclass(frozen=True)
class ProfileSpec:
    """One profile, read and converted.

    Attributes:
        ifc_class: the profile entity's class.
        name: ProfileName (stripped) or None.
        family: a :data:`FAMILIES` key, or None when the type is unsupported.
        dims: builder dimensions in inches (None where the model leaves an optional one unset).
        notes: member messages (sloped flanges treated as parallel, ...).
        problem: why the profile cannot be used (unsupported type, missing dimension).
        outline: the profile's outline in inches (arbitrary profiles only); compared by
            identity, so the members sharing a profile definition share one spec.
    """

    ifc_class: str
    name: str | None
    family: str | None
    dims: tuple[tuple[str, float | None], ...] = ()
    notes: tuple[str, ...] = ()
    problem: str | None = None
    outline: Outline | None = None

    def dim(self, key: str) -> float | None:
        """One dimension by builder name."""
        return dict(self.dims).get(key)

    @property
    def label(self) -> str:
        """ProfileName, else the class and dimensions (``IfcIShapeProfileDef 13.8x8.03...``)."""
        if self.name:
            return self.name
        shown = "x".join(f"{v:.4g}" for k, v in self.dims if v is not None and k != "r")
        return f"{self.ifc_class} {shown} in".strip()

    def describe(self) -> str:
        """``IfcIShapeProfileDef 'W14X48'`` for messages."""
        return f"{self.ifc_class} '{self.name}'" if self.name else self.ifc_class


def _get(profile: Entity, attr: str) -> Any:
    try:
        return getattr(profile, attr)
    except (AttributeError, RuntimeError):
        return None


def _num(profile: Entity, attr: str, f: float, scale: float, required: bool,
         missing: list[str]) -> float | None:
    value = _get(profile, attr)
    if value is None:
        if required:
            missing.append(attr)
        return None
    try:
        return float(value) * f * scale
    except (TypeError, ValueError):
        missing.append(attr)
        return None


def _slopes(profile: Entity, attrs: tuple[str, ...]) -> tuple[str, ...]:
    for attr in attrs:
        value = _get(profile, attr)
        if value:
            return ("sloped flanges or web modeled as parallel, with the given thicknesses",)
    return ()


def profile_spec(profile: Entity | None, length_factor: float, scale: float = 1.0) -> ProfileSpec:
    """Read one IFC profile definition.

    Args:
        profile: an IfcProfileDef (None gives a problem spec).
        length_factor: model length unit -> inch.
        scale: mapping scale of the representation the profile came from.

    Returns:
        A :class:`ProfileSpec`; ``problem`` is set when the profile cannot be used.
    """
    if profile is None:
        return ProfileSpec("none", None, None, problem="no profile")
    cls = profile.is_a()
    raw_name = _get(profile, "ProfileName")
    name = str(raw_name).strip() or None if raw_name is not None else None
    family = _BY_CLASS.get(cls)
    if family is None:
        kind = "angle profile" if cls == "IfcLShapeProfileDef" else "profile type"
        return ProfileSpec(cls, name, None, problem=f"unsupported {kind} {cls}")
    f = length_factor
    missing: list[str] = []

    def need(attr: str) -> float | None:
        return _num(profile, attr, f, scale, True, missing)

    def opt(attr: str) -> float | None:
        return _num(profile, attr, f, scale, False, missing)

    notes: tuple[str, ...] = ()
    if family in ("I", "T", "U"):
        if family == "I":
            d, bf = need("OverallDepth"), need("OverallWidth")
        else:
            d, bf = need("Depth"), need("FlangeWidth")
        tw, tf, r = need("WebThickness"), need("FlangeThickness"), opt("FilletRadius")
        dims = {"d": d, "bf": bf, "tw": tw, "tf": tf, "r": r or 0.0}
        notes = _slopes(profile, ("FlangeSlope", "WebSlope"))
    elif family in ("HSS", "RECT"):
        x, y = need("XDim"), need("YDim")
        big, small = (None, None) if x is None or y is None else (max(x, y), min(x, y))
        dims = {"H": big, "B": small}
        if family == "HSS":
            dims["t"] = need("WallThickness")
            dims["r_out"] = opt("OuterFilletRadius")
    elif family in ("HSS_ROUND", "ROUND"):
        radius = need("Radius")
        dims = {"D": None if radius is None else 2.0 * radius}
        if family == "HSS_ROUND":
            dims["t"] = need("WallThickness")
    else:  # ASYM_I
        # IFC2X3 derives it from IfcIShapeProfileDef (OverallWidth / FlangeThickness are the
        # bottom flange); IFC4+ names them BottomFlangeWidth / BottomFlangeThickness.
        legacy = profile.is_a("IfcIShapeProfileDef")
        bw = need("OverallWidth" if legacy else "BottomFlangeWidth")
        bt = need("FlangeThickness" if legacy else "BottomFlangeThickness")
        dims = {"d": need("OverallDepth"), "bf": bw, "tw": need("WebThickness"), "tf": bt,
                "bf_top": need("TopFlangeWidth"), "tf_top": opt("TopFlangeThickness") or bt}
    ordered = tuple((k, dims.get(k)) for k in FAMILIES[family][1])
    if missing:
        label = f"{cls} '{name}'" if name else cls
        return ProfileSpec(cls, name, family, ordered, notes,
                           problem=f"profile {label} has no usable {', '.join(missing)}")
    return ProfileSpec(cls, name, family, ordered, notes)


#: Builder names of the dimensions an outline's family gives (engine.outline_families.Fit).
_OUTLINE_DIMS: dict[str, tuple[str, ...]] = {
    "I": ("d", "bf", "tw", "tf", "r"), "U": ("d", "bf", "tw", "tf", "r"),
    "T": ("d", "bf", "tw", "tf", "r"), "HSS": ("H", "B", "t", "r_out"),
    "HSS_ROUND": ("D", "t"), "RECT": ("H", "B"), "ROUND": ("D",),
}


def is_outline(profile: Entity) -> bool:
    """Whether the profile is an arbitrary one (or derived from one) read as an outline.

    Args:
        profile: an IfcProfileDef.
    """
    while profile is not None and profile.is_a("IfcDerivedProfileDef"):
        profile = _get(profile, "ParentProfile")
    return profile is not None and bool(profile.is_a("IfcArbitraryClosedProfileDef"))


def outline_spec(model: ifcopenshell.file, profile: Entity, length_factor: float,
                 scale: float = 1.0, angle_scale: float | None = None) -> ProfileSpec:
    """Read an arbitrary profile as an outline: family and dimensions, or the reason.

    Args:
        model: the IFC model (its plane-angle unit, when ``angle_scale`` is None).
        profile: an IfcProfileDef for which :func:`is_outline` holds.
        length_factor: model length unit -> inch.
        scale: mapping scale of the representation the profile came from.
        angle_scale: radians per model plane-angle unit
            (:func:`ifc_bridge.outlines.plane_angle_scale`), when the caller has it.

    Returns:
        A :class:`ProfileSpec` with the outline; ``problem`` is set when it cannot be used
        (``family`` ``"L"`` for an angle).
    """
    cls = profile.is_a()
    raw_name = _get(profile, "ProfileName")
    name = str(raw_name).strip() or None if raw_name is not None else None
    label = f"{cls} '{name}'" if name else cls
    outline, problem = outline_of(model, profile, angle_scale)
    if outline is None:
        return ProfileSpec(cls, name, None, problem=f"profile {label}: {problem}")
    inches = outline.scaled(length_factor * scale)
    found = outline_section(inches, name or cls)
    if found.reason is not None:
        return ProfileSpec(cls, name, found.family, problem=f"profile {label}: {found.reason}",
                           outline=inches)
    dims = dict(found.dims)
    if "t_nominal" in dims:
        dims["t"] = dims["t_nominal"]
    family = found.family or ""
    ordered = tuple((k, dims.get(k)) for k in _OUTLINE_DIMS[family])
    return ProfileSpec(cls, name, family, ordered, outline=inches)
