"""One pass over the model's relationship entities, kept as dictionaries keyed by entity id.

Inverse attributes (``IsDefinedBy``, ``HasAssociations`` ...) would do the same job per
element; building the maps once keeps a 20,000-column model linear and makes the reader's
traversal explicit.  Every map is keyed by ``entity.id()``.
"""

from __future__ import annotations

from collections import defaultdict
from dataclasses import dataclass, field

import ifcopenshell

from stanchion.ifc_bridge.access import Entity, get


def _as_list(value: Entity | list[Entity] | tuple[Entity, ...] | None) -> list[Entity]:
    """``value`` as a list: [] for None, the items of a list or tuple, else [value]."""
    if value is None:
        return []
    if isinstance(value, list | tuple):
        return list(value)
    return [value]


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
    _storey_cache: dict[int, Entity | None] = field(default_factory=dict, repr=False)
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

    def _add_containment(self, model: ifcopenshell.file) -> None:
        """``container`` from IfcRelContainedInSpatialStructure (the first one wins)."""
        for rel in model.by_type("IfcRelContainedInSpatialStructure"):
            structure = get(rel, "RelatingStructure")
            for obj in get(rel, "RelatedElements") or ():
                self.container.setdefault(obj.id(), structure)

    def _add_decomposition(self, model: ifcopenshell.file) -> None:
        """``parent`` from IfcRelAggregates, then IfcRelNests (the first one wins)."""
        for rel_class, whole_attr, parts_attr in (
            ("IfcRelAggregates", "RelatingObject", "RelatedObjects"),
            ("IfcRelNests", "RelatingObject", "RelatedObjects"),
        ):
            for rel in model.by_type(rel_class):
                whole = getattr(rel, whole_attr)
                for part in getattr(rel, parts_attr) or ():
                    self.parent.setdefault(part.id(), whole)

    def _add_property_definitions(self, model: ifcopenshell.file) -> None:
        """``definitions`` from IfcRelDefinesByProperties (definition sets flattened)."""
        for rel in model.by_type("IfcRelDefinesByProperties"):
            defs = _as_list(get(rel, "RelatingPropertyDefinition"))
            for obj in _as_list(get(rel, "RelatedObjects")):
                self.definitions[obj.id()].extend(defs)

    def _add_types(self, model: ifcopenshell.file) -> None:
        """``type_of`` from IfcRelDefinesByType (the last one wins)."""
        for rel in model.by_type("IfcRelDefinesByType"):
            rtype = rel.RelatingType
            for obj in rel.RelatedObjects or ():
                self.type_of[obj.id()] = rtype

    def _add_materials(self, model: ifcopenshell.file) -> None:
        """``material`` from IfcRelAssociatesMaterial (the first one wins)."""
        for rel in model.by_type("IfcRelAssociatesMaterial"):
            mat = get(rel, "RelatingMaterial")
            for obj in get(rel, "RelatedObjects") or ():
                self.material.setdefault(obj.id(), mat)

    def _add_product_links(self, model: ifcopenshell.file) -> None:
        """``linked`` from IfcRelAssignsToProduct, in both directions."""
        for rel in model.by_type("IfcRelAssignsToProduct"):
            product = rel.RelatingProduct
            if product is None:
                continue
            for obj in rel.RelatedObjects or ():
                self.linked[product.id()].append(obj)
                self.linked[obj.id()].append(product)

    def _add_structural_activities(self, model: ifcopenshell.file) -> None:
        """``activities`` from IfcRelConnectsStructuralActivity."""
        for rel in model.by_type("IfcRelConnectsStructuralActivity"):
            element, activity = rel.RelatingElement, rel.RelatedStructuralActivity
            if element is not None and activity is not None:
                self.activities[element.id()].append(activity)

    def _add_result_groups(self, model: ifcopenshell.file) -> None:
        """``result_groups`` from IfcRelAssignsToGroup with an IfcStructuralResultGroup."""
        for rel in model.by_type("IfcRelAssignsToGroup"):
            group = rel.RelatingGroup
            if group is None or not group.is_a("IfcStructuralResultGroup"):
                continue
            for obj in rel.RelatedObjects or ():
                self.result_groups[obj.id()].append(group)

    def _add_steel_properties(self, model: ifcopenshell.file) -> None:
        """``steel_properties`` from IfcMechanicalSteelMaterialProperties (IFC2X3 only)."""
        for props in model.by_type("IfcMechanicalSteelMaterialProperties"):
            if props.Material is not None:
                self.steel_properties.setdefault(props.Material.id(), props)

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
