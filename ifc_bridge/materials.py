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
3. the grade named in the material's Name / Description or in a property of the material
   named ``Grade``, ``SteelGrade``, ``Grade name`` or ``MaterialGrade`` (any property set:
   ``Pset_...`` / IfcMaterialProperties, IFC2X3 IfcExtendedMaterialProperties), matched by
   the engine's grade table (:func:`engine.materials.match_grade`, :meth:`YieldReader.grade`
   here); a stress the name states ("Metal - Steel - 345 MPa") is read by the same table.
   Name and property naming different grades: the lower Fy, with a note.  Only when the
   material gives none, such a property on the element or its type (an exporter's common
   property set) is read the same way;
4. ``--default-grade`` for a member whose materials name steel but no grade
   (:func:`ungraded_steel`; never for a member without a material).

The product standard named there (ASTM A500, A1085, EN 10219 ...) decides the design wall of
tubes (:func:`material_standard`, :func:`engine.tubes.design_wall`).

None of these -> the member is not checked, reason "no yield strength" (naming the material
when it names steel but no grade).

Material class (:func:`element_class`): the names and IFC4 Categories of every material of
the element (the profiles' and layers' materials of a set included) go to the engine's
classifier (:func:`engine.materials.material_class`); a column whose materials all name
another material than steel (concrete, timber, aluminium, masonry) is skipped by the
engine, one with no material is "unknown" and goes the usual way (docs/design.md §5).
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field, replace
from typing import Any

import ifcopenshell
import ifcopenshell.util.element

from stanchion.engine.materials import (
    STEEL,
    GradeMatch,
    match_grade,
    material_class,
    names_grade,
    product_standard,
    text_classes,
)
from stanchion.ifc_bridge.access import Entity
from stanchion.ifc_bridge.properties import PropertyValue, single_values, to_internal
from stanchion.ifc_bridge.relations import RelationIndex, describe, instance_of
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
    materials, problem = _only_materials(materials, problem)
    return MaterialInfo(tuple(materials), profile, "", tuple(notes), problem)


def _only_materials(materials: list[Entity], problem: str | None
                    ) -> tuple[list[Entity], str | None]:
    """The IfcMaterial entities, and the member's problem.

    Another instance in their place is a damaged line (the fuzz test found tracebacks
    reading its Name): no name or property is read off it, and it is the member's problem
    (not checked) unless it has one already.
    """
    foreign = [m for m in materials if not instance_of(m, "IfcMaterial")]
    if not foreign:
        return materials, problem
    problem = problem or (f"damaged model: {describe(foreign[0])} stands where an "
                          "IfcMaterial belongs")
    return [m for m in materials if instance_of(m, "IfcMaterial")], problem


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
    _grades: dict[int, tuple[tuple[str, str], ...]] = field(default_factory=dict)
    _element_grades: dict[int, tuple[tuple[str, str], ...]] = field(default_factory=dict)

    def material_yield(self, material: Entity) -> tuple[float | None, str, tuple[str, ...]]:
        """(Fy ksi or None, source description, notes) from the material's properties."""
        key = material.id()
        if key not in self._cache:
            self._cache[key] = self._read(material)
        return self._cache[key]

    def _psets(self, material: Entity) -> dict[str, dict[str, Any]]:
        try:
            return ifcopenshell.util.element.get_psets(material)
        except Exception:  # a material without property support in this schema
            return {}

    def grade_properties(self, material: Entity) -> tuple[tuple[str, str], ...]:
        """(where, text) of the material's grade properties (``Grade`` ...), cached."""
        key = material.id()
        if key not in self._grades:
            name = material.Name if isinstance(material.Name, str) else f"#{key}"
            self._grades[key] = tuple(
                (f"property {pset}.{prop} of '{name}'", value)
                for pset, props in self._psets(material).items()
                for prop, value in props.items()
                if _is_grade_property(prop) and isinstance(value, str) and value.strip())
        return self._grades[key]

    def element_grade_properties(self, definitions: list[Entity]
                                 ) -> tuple[tuple[str, str], ...]:
        """(where, text) of grade properties in an element's (or type's) property sets."""
        found: list[tuple[str, str]] = []
        for pset in definitions:
            key = pset.id()
            if key not in self._element_grades:
                self._element_grades[key] = tuple(
                    (f"property {pset.Name}.{prop}", str(pv.value))
                    for prop, pv in single_values(pset).items()
                    if _is_grade_property(prop) and isinstance(pv.value, str)
                    and pv.value.strip())
            found.extend(self._element_grades[key])
        return tuple(found)

    def grade_texts(self, materials: tuple[Entity, ...], element_definitions: list[Entity]
                    ) -> tuple[str, ...]:
        """The texts of every grade property of the materials and of the element."""
        found = [text for m in materials for _, text in self.grade_properties(m)]
        found.extend(text for _, text in self.element_grade_properties(element_definitions))
        return tuple(found)

    def grade(self, materials: tuple[Entity, ...], family: str | None,
              thickness: float | None, element_definitions: list[Entity] | None = None
              ) -> tuple[GradeMatch | None, list[str]]:
        """Fy by grade from the materials' names and grade properties (lowest on conflict).

        Args:
            materials: the element's materials, in order.
            family: the profile family.
            thickness: the section's thickest element, in (grades with bands).
            element_definitions: the property sets of the element and its type, read for a
                grade property only when the materials give none.

        Returns:
            (match or None, notes).
        """
        notes: list[str] = []
        for mat in materials:
            texts = [("", material_text(mat)), *self.grade_properties(mat)]
            found = _lowest(texts, family, thickness, notes)
            if found is not None:
                return found, notes
        if element_definitions:
            texts = list(self.element_grade_properties(element_definitions))
            found = _lowest(texts, family, thickness, notes)
            if found is not None:
                return found, notes
        return None, notes

    def _read(self, material: Entity) -> tuple[float | None, str, tuple[str, ...]]:
        name = material.Name or f"#{material.id()}"
        if self.model.schema == "IFC2X3":
            props = self.index.steel_properties.get(material.id())
            if props is not None and props.YieldStress is not None:
                pv = PropertyValue(float(props.YieldStress), "IfcPressureMeasure", None)
                return self._convert(pv, f"IfcMechanicalSteelMaterialProperties of '{name}'")
        steel = self._psets(material).get("Pset_MaterialSteel") or {}
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


#: Property names that hold a grade (compared without case, spaces and underscores).
_GRADE_PROPERTIES = frozenset({"grade", "steelgrade", "gradename", "materialgrade"})


def _is_grade_property(name: object) -> bool:
    return isinstance(name, str) and (
        name.casefold().replace(" ", "").replace("_", "") in _GRADE_PROPERTIES)


def _lowest(texts: list[tuple[str, str]], family: str | None, thickness: float | None,
            notes: list[str]) -> GradeMatch | None:
    """The lowest Fy the texts give (a note when they differ); ``where`` "" is the name."""
    found: list[tuple[str, GradeMatch]] = []
    for where, text in texts:
        match, gnotes = match_grade(text, family, thickness)
        notes.extend(gnotes)
        if match is not None:
            found.append((where, match if not where else replace(
                match, note=f"{match.note}; the grade is given by {where}: '{text}'")))
    if not found:
        return None
    best = min(found, key=lambda wm: wm[1].fy)[1]
    if len({round(m.fy, 6) for _, m in found}) > 1:
        listed = "; ".join(f"{m.grade.name} ({w or 'name'}: Fy = {m.fy:.4g} ksi)"
                           for w, m in found)
        notes.append(f"material grades differ: {listed}; the lowest Fy is used")
    return best


def ungraded_steel(info: MaterialInfo, grade_texts: tuple[str, ...] = ()) -> str | None:
    """The name of the material that names steel but no grade, or None.

    For a member whose materials are steel (:func:`element_class`) and gave no yield
    stress: the first material whose Name or Category names steel.  None for a member
    without material, or whose materials name another class (never assumed steel), and
    for one whose materials' names or ``grade_texts`` (their grade properties, the
    element's) name a grade that gave no value (A500 on a W shape, too thick): that
    material names a grade, and no default replaces it.
    """
    if element_class(info) != STEEL:
        return None
    texts = [material_text(m) for m in info.materials] + list(grade_texts)
    if any(names_grade(t) for t in texts):
        return None
    for mat in info.materials:
        texts = [t for t in (mat.Name, getattr(mat, "Category", None)) if isinstance(t, str)]
        if any(STEEL in text_classes(t) for t in texts):
            return mat.Name if isinstance(mat.Name, str) else f"#{mat.id()}"
    return None


def assumed_grade(default_grade: str, family: str | None, thickness: float | None,
                  option: str = "--default-grade") -> tuple[float | None, list[str]]:
    """Fy (ksi) from ``--default-grade`` for a material that names steel but no grade.

    Args:
        default_grade: the grade the user gave (checked at start with
            :func:`engine.materials.names_grade`).
        family: the profile family.
        thickness: the section's thickest element, in (grades with bands).
        option: how the notes name where the grade was given (``--default-grade``, or a
            front end's own words such as ``the job's default_grade``).

    Returns:
        (Fy or None, notes): the note states the assumption; None when the grade gives no
        value for this section (A500 on a W shape, too thick), with the reason.
    """
    found, notes = match_grade(default_grade, family, thickness)
    if found is None:
        return None, [f"{option} {default_grade} gives no yield stress for this "
                      f"member{': ' + '; '.join(notes) if notes else ''}"]
    return found.fy, [f"Fy = {found.fy:.4g} ksi from {option} {default_grade} "
                      f"(assumed: the material names no grade; {found.grade.source})"]


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
