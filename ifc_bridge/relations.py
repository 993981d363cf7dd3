"""One pass over the model's relationship entities, kept as dictionaries keyed by entity id.

Inverse attributes (``IsDefinedBy``, ``HasAssociations`` ...) would do the same job per
element; building the maps once keeps a 20,000-column model linear and makes the reader's
traversal explicit.  Every map is keyed by ``entity.id()``.
"""

from __future__ import annotations

from collections import defaultdict
from dataclasses import dataclass, field

import ifcopenshell

from stanchion.ifc_bridge.access import get

Entity = ifcopenshell.entity_instance


def _as_list(value) -> list:
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
        """Scan each relationship class once."""
        index = cls()
        for rel in model.by_type("IfcRelContainedInSpatialStructure"):
            structure = get(rel, "RelatingStructure")
            for obj in get(rel, "RelatedElements") or ():
                index.container.setdefault(obj.id(), structure)
        for rel_class, whole_attr, parts_attr in (
            ("IfcRelAggregates", "RelatingObject", "RelatedObjects"),
            ("IfcRelNests", "RelatingObject", "RelatedObjects"),
        ):
            for rel in model.by_type(rel_class):
                whole = getattr(rel, whole_attr)
                for part in getattr(rel, parts_attr) or ():
                    index.parent.setdefault(part.id(), whole)
        for rel in model.by_type("IfcRelDefinesByProperties"):
            defs = _as_list(get(rel, "RelatingPropertyDefinition"))
            for obj in _as_list(get(rel, "RelatedObjects")):
                index.definitions[obj.id()].extend(defs)
        for rel in model.by_type("IfcRelDefinesByType"):
            rtype = rel.RelatingType
            for obj in rel.RelatedObjects or ():
                index.type_of[obj.id()] = rtype
        for rel in model.by_type("IfcRelAssociatesMaterial"):
            mat = get(rel, "RelatingMaterial")
            for obj in get(rel, "RelatedObjects") or ():
                index.material.setdefault(obj.id(), mat)
        for rel in model.by_type("IfcRelAssignsToProduct"):
            product = rel.RelatingProduct
            if product is None:
                continue
            for obj in rel.RelatedObjects or ():
                index.linked[product.id()].append(obj)
                index.linked[obj.id()].append(product)
        for rel in model.by_type("IfcRelConnectsStructuralActivity"):
            element, activity = rel.RelatingElement, rel.RelatedStructuralActivity
            if element is not None and activity is not None:
                index.activities[element.id()].append(activity)
        for rel in model.by_type("IfcRelAssignsToGroup"):
            group = rel.RelatingGroup
            if group is None or not group.is_a("IfcStructuralResultGroup"):
                continue
            for obj in rel.RelatedObjects or ():
                index.result_groups[obj.id()].append(group)
        if model.schema == "IFC2X3":
            for props in model.by_type("IfcMechanicalSteelMaterialProperties"):
                if props.Material is not None:
                    index.steel_properties.setdefault(props.Material.id(), props)
        return index

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
