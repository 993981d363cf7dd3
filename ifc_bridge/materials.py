"""Material of a column: its profile (IFC4+ material profile sets) and its yield stress.

Material association: the occurrence's IfcRelAssociatesMaterial wins; without one, the
element type's is used.  Understood material selects: IfcMaterialProfileSetUsage (and the
tapering variant, which is refused), IfcMaterialProfileSet, IfcMaterialProfile, IfcMaterial,
IfcMaterialList, IfcMaterialConstituentSet, IfcMaterialLayerSet(Usage).

Yield stress precedence (first found wins; the source goes in the member's messages):

1. ``Stanchion_Design.YieldStress`` on the column or its type -- an explicit override
   (handled by the reader, see :mod:`ifc_bridge.properties`);
2. ``Pset_MaterialSteel.YieldStress`` of the material (IFC4 / IFC4X3; read with
   ``ifcopenshell.util.element.get_psets`` on the material), or
   ``IfcMechanicalSteelMaterialProperties.YieldStress`` (IFC2X3);
3. the grade named in the material's Name / Description, matched by the engine's grade
   table (:func:`engine.materials.match_grade`, :func:`grade_yield` here).

The product standard named there (ASTM A500, A1085, EN 10219 ...) decides the design wall of
tubes (:func:`material_standard`, :func:`engine.tubes.design_wall`).

None of these -> the member is not checked, reason "no yield strength".

Material class (:func:`element_class`): the names and IFC4 Categories of every material of
the element (the profiles' and layers' materials of a set included) go to the engine's
classifier (:func:`engine.materials.material_class`); a column whose materials all name
another material than steel (concrete, timber, aluminium, masonry) is skipped by the
engine, one with no material is "unknown" and goes the usual way (docs/design.md §5).
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field, replace

import ifcopenshell
import ifcopenshell.util.element

from stanchion.engine.materials import (
    GradeMatch,
    match_grade,
    material_class,
    product_standard,
)
from stanchion.ifc_bridge.access import Entity
from stanchion.ifc_bridge.properties import PropertyValue, to_internal
from stanchion.ifc_bridge.relations import RelationIndex
from stanchion.ifc_bridge.units import ModelUnits


@dataclass(frozen=True)
class MaterialInfo:
    """What an element's material association gives.

    Attributes:
        materials: IfcMaterial entities (the profile's own material first).
        profile: the profile from a material profile set (None if none).
        source: ``"occurrence"``, ``"type"`` or ``""`` (no association).
        notes: member messages.
        problem: why the material's profile cannot be used.
    """

    materials: tuple[Entity, ...] = ()
    profile: Entity | None = None
    source: str = ""
    notes: tuple[str, ...] = ()
    problem: str | None = None


#: Shared between calls of :func:`element_material`: one select's info by its id, and the
#: combined info of an (occurrence, type) pair of selects by their negated ids.
MaterialCache = dict[int | tuple[int, int], MaterialInfo]


def _profiles_of(profile_set: Entity | None) -> list[Entity]:
    if profile_set is None:
        return []
    return list(profile_set.MaterialProfiles or ())


def _from_select(select: Entity) -> MaterialInfo:
    """Unpack one material select."""
    notes: list[str] = []
    profiles: list[Entity] = []
    materials: list[Entity] = []
    problem = None
    if select.is_a("IfcMaterialProfileSetUsage"):
        if select.is_a("IfcMaterialProfileSetUsageTapering"):
            problem = "tapered member (IfcMaterialProfileSetUsageTapering) is not supported"
        profiles = _profiles_of(select.ForProfileSet)
    elif select.is_a("IfcMaterialProfileSet"):
        profiles = _profiles_of(select)
    elif select.is_a("IfcMaterialProfile"):
        profiles = [select]
    elif select.is_a("IfcMaterial"):
        materials = [select]
    elif select.is_a("IfcMaterialList"):
        materials = list(select.Materials or ())
    elif select.is_a("IfcMaterialConstituentSet"):
        materials = [c.Material for c in select.MaterialConstituents or () if c.Material]
    elif select.is_a("IfcMaterialLayerSetUsage"):
        materials = [la.Material for la in select.ForLayerSet.MaterialLayers or () if la.Material]
    elif select.is_a("IfcMaterialLayerSet"):
        materials = [la.Material for la in select.MaterialLayers or () if la.Material]
    profile = None
    if profiles:
        if len(profiles) > 1:
            problem = problem or (f"material profile set with {len(profiles)} profiles "
                                  "(composite section) is not supported")
        first = profiles[0]
        profile = first.Profile
        materials = [p.Material for p in profiles if p.Material is not None]
    return MaterialInfo(tuple(materials), profile, "", tuple(notes), problem)


def element_material(
    element: Entity, etype: Entity | None, index: RelationIndex,
    cache: MaterialCache | None = None,
) -> MaterialInfo:
    """Material of an occurrence, else of its type; a profile set on either is used.

    Args:
        element: the occurrence.
        etype: its type (or None).
        index: relationship maps.
        cache: optional dict shared between calls (results per select and per
            occurrence/type select pair).

    Returns:
        The material facts; ``source`` says whether the occurrence or the type gave them.
    """
    cache = {} if cache is None else cache
    own = index.material.get(element.id())
    typed = index.material.get(etype.id()) if etype is not None else None
    pair = (-(own.id() if own is not None else 0), -(typed.id() if typed is not None else 0))
    if pair not in cache:  # negative keys: combined results; positive: single selects
        cache[pair] = _combine(own, typed, cache)
    return cache[pair]


def _combine(own: Entity | None, typed: Entity | None, cache: MaterialCache) -> MaterialInfo:
    def unpack(select: Entity | None) -> MaterialInfo | None:
        if select is None:
            return None
        key = select.id()
        if key not in cache:
            cache[key] = _from_select(select)
        return cache[key]

    a = unpack(own)
    b = unpack(typed)
    if b is not None and (a is None or (a.profile is None and not a.materials)):
        return replace(b, source="type")  # the occurrence gives nothing: the type's
    if a is None:
        return MaterialInfo()  # neither has a material
    if not a.materials and b is not None:
        a = replace(a, materials=b.materials)
    return replace(a, source="occurrence")


@dataclass
class YieldReader:
    """Yield stress of materials, cached per material (ksi)."""

    model: ifcopenshell.file
    index: RelationIndex
    units: ModelUnits
    _cache: dict[int, tuple[float | None, str, tuple[str, ...]]] = field(default_factory=dict)

    def material_yield(self, material: Entity) -> tuple[float | None, str, tuple[str, ...]]:
        """(Fy ksi or None, source description, notes) from the material's properties."""
        key = material.id()
        if key not in self._cache:
            self._cache[key] = self._read(material)
        return self._cache[key]

    def _read(self, material: Entity) -> tuple[float | None, str, tuple[str, ...]]:
        name = material.Name or f"#{material.id()}"
        if self.model.schema == "IFC2X3":
            props = self.index.steel_properties.get(material.id())
            if props is not None and props.YieldStress is not None:
                pv = PropertyValue(float(props.YieldStress), "IfcPressureMeasure", None)
                return self._convert(pv, f"IfcMechanicalSteelMaterialProperties of '{name}'")
        try:
            psets = ifcopenshell.util.element.get_psets(material)
        except Exception:  # a material without property support in this schema
            psets = {}
        steel = psets.get("Pset_MaterialSteel") or {}
        if steel.get("YieldStress") is not None and "id" in steel:
            found = self._property(steel["id"], "YieldStress")
            if found is not None:
                return self._convert(found, f"Pset_MaterialSteel of '{name}'")
        return None, "", ()

    def _property(self, pset_id: int, prop_name: str) -> PropertyValue | None:
        """The typed value (with its own unit) behind a get_psets entry."""
        pset = self.model.by_id(pset_id)
        for prop in getattr(pset, "Properties", None) or getattr(pset, "HasProperties", ()) or ():
            if prop.Name == prop_name and prop.is_a("IfcPropertySingleValue"):
                nominal = prop.NominalValue
                if nominal is None:
                    return None
                return PropertyValue(nominal.wrappedValue, nominal.is_a(), prop.Unit)
        return None

    def _convert(self, pv: PropertyValue, where: str) -> tuple[float | None, str, tuple[str, ...]]:
        value, note, problem = to_internal(pv, "pressure", self.units, f"{where}: YieldStress")
        notes = tuple(n for n in (note, problem) if n)
        if value is None or not math.isfinite(value) or value <= 0:
            return None, "", notes + (f"{where}: YieldStress is not a positive stress",)
        return value, where, notes


def material_text(material: Entity) -> str:
    """A material's Name and Description (what grades and standards are matched on).

    Only texts: in a damaged model (an entity name changed into IfcMaterial) Name may hold
    an instance; that is no name (the fuzz test found a traceback here).
    """
    return " ".join(t for t in (material.Name, getattr(material, "Description", None))
                    if isinstance(t, str) and t)


def grade_yield(materials: tuple[Entity, ...], family: str | None, thickness: float | None
                ) -> tuple[GradeMatch | None, list[str]]:
    """The first material whose name gives a yield stress by grade (engine grade table).

    Args:
        materials: the element's materials, in order.
        family: the profile family.
        thickness: the section's thickest element, in (EN grades).

    Returns:
        (match or None, notes of every material tried).
    """
    notes: list[str] = []
    for mat in materials:
        found, gnotes = match_grade(material_text(mat), family, thickness)
        notes.extend(gnotes)
        if found is not None:
            return found, notes
    return None, notes


def material_standard(materials: tuple[Entity, ...]) -> str | None:
    """The product standard the materials' names give (engine table), or None."""
    std = product_standard(" ".join(material_text(m) for m in materials))
    return std.name if std is not None else None


def element_class(info: MaterialInfo) -> str:
    """The material class of an element's materials (engine classifier).

    Args:
        info: the element's material facts (:func:`element_material`).

    Returns:
        ``"steel"``, ``"unknown"`` (no material, or none recognised), ``"concrete"`` ...
        (see :func:`engine.materials.material_class`).
    """
    texts: list[str | None] = []
    for mat in info.materials:  # only texts: a damaged Name may hold an instance
        texts.extend(t if isinstance(t, str) else None
                     for t in (mat.Name, getattr(mat, "Category", None)))  # Category: IFC4+
    return material_class(texts)
