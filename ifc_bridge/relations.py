"""One pass over the model's relationship entities, kept as dictionaries keyed by entity id.

Inverse attributes (``IsDefinedBy``, ``HasAssociations`` ...) would do the same job per
element; building the maps once keeps a 20,000-column model linear and makes the reader's
traversal explicit.  Every map is keyed by ``entity.id()``.

A relationship whose attribute holds something other than the instance its schema declares
(a text, a number, an instance of another class: a damaged line the parser read without
complaint, e.g. an entity name changed to another of the schema) is refused with
:class:`ModelReadError`: reading past it would drop a link -- a column, a property set, an
analysis result -- without a word (issue 13 item 6, found by the fuzz test).
"""

from __future__ import annotations

from collections import defaultdict
from dataclasses import dataclass, field

import ifcopenshell

from stanchion.ifc_bridge.access import Entity, get
from stanchion.ifc_bridge.errors import ModelReadError


def _as_list(value: Entity | list[Entity] | tuple[Entity, ...] | None) -> list[Entity]:
    """``value`` as a list: [] for None, the items of a list or tuple, else [value]."""
    if value is None:
        return []
    if isinstance(value, list | tuple):
        return list(value)
    return [value]


#: IfcMaterialSelect's members (IFC2X3 and IFC4 / IFC4X3; a name foreign to the schema is
#: simply never matched): ``is_a`` does not resolve select types.
MATERIAL_SELECT = ("IfcMaterialDefinition", "IfcMaterialList", "IfcMaterialUsageDefinition",
                   "IfcMaterial", "IfcMaterialLayerSetUsage", "IfcMaterialLayerSet",
                   "IfcMaterialLayer")


def instance_of(value: object, *classes: str) -> bool:
    """True when ``value`` is an IFC instance of one of ``classes`` (subtypes included)."""
    if not isinstance(value, ifcopenshell.entity_instance):
        return False
    entity: Entity = value
    return any(entity.is_a(c) for c in classes)


def describe(value: object) -> str:
    """``#N, an IfcX,`` for an instance, else the value's text (40 characters) quoted."""
    if isinstance(value, ifcopenshell.entity_instance):
        entity: Entity = value
        return f"#{entity.id()}, an {entity.is_a()},"
    return repr(str(value)[:40])


def _refuse(rel: Entity, attr: str, value: object, classes: tuple[str, ...]) -> ModelReadError:
    """The error for ``rel.attr`` holding ``value`` where one of ``classes`` belongs."""
    what = describe(value)
    return ModelReadError(f"damaged model: #{rel.id()} {rel.is_a()}.{attr} holds {what} where "
                          f"{' or '.join(f'an {c}' for c in classes[:3])} belongs")


@dataclass
class RelationIndex:
    """Relationship maps of one model.

    Attributes:
        container: element -> spatial structure element (IfcRelContainedInSpatialStructure).
        parent: part -> whole (IfcRelAggregates; also IfcRelNests for IFC4+ nesting).
        definitions: object -> property sets / element quantities (IfcRelDefinesByProperties;
            an IfcPropertySetDefinitionSet is flattened).
        type_of: occurrence -> element type (IfcRelDefinesByType).
        material: object or type -> RelatingMaterial (IfcRelAssociatesMaterial).
        linked: product -> products tied to it by IfcRelAssignsToProduct, in either direction.
        activities: structural item or element -> structural activities
            (IfcRelConnectsStructuralActivity).
        result_groups: activity -> IfcStructuralResultGroup(s) it is assigned to
            (IfcRelAssignsToGroup).
        steel_properties: material -> IfcMechanicalSteelMaterialProperties (IFC2X3).
        notes: model-level notes on relationships read with a doubt (a spatial structure
            element contained like an element, which IFC's rule WR31 forbids).
    """

    container: dict[int, Entity] = field(default_factory=dict)
    parent: dict[int, Entity] = field(default_factory=dict)
    definitions: dict[int, list[Entity]] = field(default_factory=lambda: defaultdict(list))
    type_of: dict[int, Entity] = field(default_factory=dict)
    material: dict[int, Entity] = field(default_factory=dict)
    linked: dict[int, list[Entity]] = field(default_factory=lambda: defaultdict(list))
    activities: dict[int, list[Entity]] = field(default_factory=lambda: defaultdict(list))
    result_groups: dict[int, list[Entity]] = field(default_factory=lambda: defaultdict(list))
    steel_properties: dict[int, Entity] = field(default_factory=dict)
    notes: list[str] = field(default_factory=list)
    _storey_cache: dict[int, Entity | None] = field(default_factory=dict, repr=False)
    _allowed: dict[tuple[str | None, tuple[str, ...]], bool] = field(default_factory=dict,
                                                                      repr=False)
    _type_defs: dict[int, list[Entity]] = field(default_factory=dict, repr=False)

    @classmethod
    def build(cls, model: ifcopenshell.file) -> RelationIndex:
        """Scan each relationship class once.

        Args:
            model: the model.

        Returns:
            The model's relationship maps.
        """
        index = cls()
        index._add_containment(model)
        index._add_decomposition(model)
        index._add_property_definitions(model)
        index._add_types(model)
        index._add_materials(model)
        index._add_product_links(model)
        index._add_structural_activities(model)
        index._add_result_groups(model)
        if model.schema == "IFC2X3":
            index._add_steel_properties(model)
        return index

    def _require(self, rel: Entity, attr: str, value: object, classes: tuple[str, ...]
                 ) -> Entity:
        """``value`` when it is an instance of one of ``classes``; else ModelReadError.

        Decided once per (class name, classes): the check costs a dictionary look-up.
        """
        entity: Entity = value if isinstance(value, ifcopenshell.entity_instance) else None
        key = (None if entity is None else entity.is_a(), classes)
        ok = self._allowed.get(key)
        if ok is None:
            ok = self._allowed[key] = entity is not None and any(
                entity.is_a(c) for c in classes)
        if not ok:
            raise _refuse(rel, attr, value, classes)
        return value

    def _one(self, rel: Entity, attr: str, *classes: str) -> Entity | None:
        """The instance in ``rel.attr`` (None when unset), required to be of ``classes``."""
        value = get(rel, attr)
        return None if value is None else self._require(rel, attr, value, classes)

    def _many(self, rel: Entity, attr: str, *classes: str) -> list[Entity]:
        """The instances in ``rel.attr`` (a list or one), each required to be of ``classes``."""
        return [self._require(rel, attr, v, classes) for v in _as_list(get(rel, attr))]

    def _add_containment(self, model: ifcopenshell.file) -> None:
        """``container`` from IfcRelContainedInSpatialStructure (the first one wins)."""
        for rel in model.by_type("IfcRelContainedInSpatialStructure"):
            structure = self._one(rel, "RelatingStructure", "IfcProduct")
            for obj in self._many(rel, "RelatedElements", "IfcProduct"):
                self.container.setdefault(obj.id(), structure)
                if obj.is_a("IfcSpatialStructureElement") and not obj.is_a("IfcSpace"):
                    self.notes.append(
                        f"#{rel.id()} IfcRelContainedInSpatialStructure contains #{obj.id()}, "
                        f"an {obj.is_a()} (a spatial structure element is never contained, "
                        "IFC rule WR31): the model may be damaged (an element retyped?)")

    def _add_decomposition(self, model: ifcopenshell.file) -> None:
        """``parent`` from IfcRelAggregates, then IfcRelNests (the first one wins)."""
        for rel_class, whole_attr, parts_attr in (
            ("IfcRelAggregates", "RelatingObject", "RelatedObjects"),
            ("IfcRelNests", "RelatingObject", "RelatedObjects"),
        ):
            for rel in model.by_type(rel_class):
                whole = self._one(rel, whole_attr, "IfcObjectDefinition")
                for part in self._many(rel, parts_attr, "IfcObjectDefinition"):
                    self.parent.setdefault(part.id(), whole)

    def _add_property_definitions(self, model: ifcopenshell.file) -> None:
        """``definitions`` from IfcRelDefinesByProperties (definition sets flattened)."""
        for rel in model.by_type("IfcRelDefinesByProperties"):
            defs = self._many(rel, "RelatingPropertyDefinition", "IfcPropertySetDefinition")
            for obj in self._many(rel, "RelatedObjects", "IfcObjectDefinition"):
                self.definitions[obj.id()].extend(defs)

    def _add_types(self, model: ifcopenshell.file) -> None:
        """``type_of`` from IfcRelDefinesByType (the last one wins)."""
        for rel in model.by_type("IfcRelDefinesByType"):
            rtype = self._one(rel, "RelatingType", "IfcTypeObject")
            for obj in self._many(rel, "RelatedObjects", "IfcObject"):
                self.type_of[obj.id()] = rtype

    def _add_materials(self, model: ifcopenshell.file) -> None:
        """``material`` from IfcRelAssociatesMaterial (the first one wins)."""
        for rel in model.by_type("IfcRelAssociatesMaterial"):
            mat = self._one(rel, "RelatingMaterial", *MATERIAL_SELECT)
            for obj in self._many(rel, "RelatedObjects", "IfcRoot"):
                self.material.setdefault(obj.id(), mat)

    def _add_product_links(self, model: ifcopenshell.file) -> None:
        """``linked`` from IfcRelAssignsToProduct, in both directions."""
        for rel in model.by_type("IfcRelAssignsToProduct"):
            product = self._one(rel, "RelatingProduct", "IfcObjectDefinition")
            if product is None:
                continue
            for obj in self._many(rel, "RelatedObjects", "IfcObjectDefinition"):
                self.linked[product.id()].append(obj)
                self.linked[obj.id()].append(product)

    def _add_structural_activities(self, model: ifcopenshell.file) -> None:
        """``activities`` from IfcRelConnectsStructuralActivity."""
        for rel in model.by_type("IfcRelConnectsStructuralActivity"):
            element = self._one(rel, "RelatingElement", "IfcProduct")
            activity = self._one(rel, "RelatedStructuralActivity", "IfcStructuralActivity")
            if element is not None and activity is not None:
                self.activities[element.id()].append(activity)

    def _add_result_groups(self, model: ifcopenshell.file) -> None:
        """``result_groups`` from IfcRelAssignsToGroup with an IfcStructuralResultGroup."""
        for rel in model.by_type("IfcRelAssignsToGroup"):
            group = self._one(rel, "RelatingGroup", "IfcGroup")
            if group is None or not group.is_a("IfcStructuralResultGroup"):
                continue
            for obj in self._many(rel, "RelatedObjects", "IfcObjectDefinition"):
                self.result_groups[obj.id()].append(group)

    def _add_steel_properties(self, model: ifcopenshell.file) -> None:
        """``steel_properties`` from IfcMechanicalSteelMaterialProperties (IFC2X3 only)."""
        for props in model.by_type("IfcMechanicalSteelMaterialProperties"):
            material = self._one(props, "Material", "IfcMaterial")
            if material is not None:
                self.steel_properties.setdefault(material.id(), props)

    def storey_of(self, element: Entity) -> Entity | None:
        """Nearest IfcBuildingStorey above ``element`` (containment, then aggregation)."""
        eid = element.id()
        above = self.container.get(eid) or self.parent.get(eid)
        if above is None:
            return None
        key = above.id()
        if key not in self._storey_cache:
            current: Entity | None = above
            found = None
            for _ in range(32):  # guard against cyclic decomposition in a broken model
                if current is None:
                    break
                if current.is_a("IfcBuildingStorey"):
                    found = current
                    break
                cid = current.id()
                current = self.container.get(cid) or self.parent.get(cid)
            self._storey_cache[key] = found
        return self._storey_cache[key]

    def property_definitions(self, obj: Entity) -> list[Entity]:
        """Property sets / quantities of an occurrence, or of a type (HasPropertySets)."""
        key = obj.id()
        if key in self._type_defs:
            return self._type_defs[key]
        if obj.is_a("IfcTypeObject"):
            found = list(get(obj, "HasPropertySets") or ()) + self.definitions.get(key, [])
            self._type_defs[key] = found
            return found
        return self.definitions.get(key, [])
