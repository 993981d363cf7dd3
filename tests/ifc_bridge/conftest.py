"""Shared IFC model builders for the ifc_bridge tests (reader and writer).

:class:`ModelBuilder` makes small in-memory models with ``ifcopenshell.api`` in any of the
three schemas and several unit systems.  Every number handed to the builder is in the
engine's units -- inch, kip, ksi -- and is converted into the model's project units on the
way in (pint factors via :func:`engine.units.factor`; common practice, no source), so the same
test can be run on a millimetre/newton model and an inch/kip model and expect the same
member-table values.

Fixtures:
    schema: "IFC2X3", "IFC4", "IFC4X3" (parametrized: a test using it runs three times).
    builder: a ModelBuilder for ``schema`` in millimetre / newton / N/mm² units.
    make_builder: factory ``make_builder(units="in_kip", schema=None)``.
"""

from __future__ import annotations

from collections.abc import Iterable
from pathlib import Path

import ifcopenshell
import ifcopenshell.api.aggregate
import ifcopenshell.api.context
import ifcopenshell.api.geometry
import ifcopenshell.api.material
import ifcopenshell.api.owner
import ifcopenshell.api.profile
import ifcopenshell.api.pset
import ifcopenshell.api.root
import ifcopenshell.api.spatial
import ifcopenshell.api.structural
import ifcopenshell.api.type
import ifcopenshell.api.unit
import numpy as np
import pytest

from stanchion.engine.units import factor

SCHEMAS = ("IFC2X3", "IFC4", "IFC4X3")

#: Unit systems: name -> (length, force, pressure); each entry is ("si", prefix, name-in-pint)
#: or ("conv", ifcopenshell conversion-unit name, name-in-pint), or None (not declared).
UNIT_SYSTEMS: dict[str, tuple] = {
    "mm_N": (("si", "MILLI", "millimeter"), ("si", None, "newton"),
             ("si", "MEGA", "megapascal")),
    "m_kN": (("si", None, "meter"), ("si", "KILO", "kilonewton"), ("si", "KILO", "kilopascal")),
    "in_kip": (("conv", "inch", "inch"), ("conv", "kip", "kip"), ("conv", "ksi", "ksi")),
    "ft_kip": (("conv", "foot", "foot"), ("conv", "kip", "kip"), ("conv", "ksi", "ksi")),
    "mm_only": (("si", "MILLI", "millimeter"), None, None),
    "mm_MPa": (("si", "MILLI", "millimeter"), None, ("si", "MEGA", "megapascal")),
    "none": (None, None, None),
}

_UNIT_TYPES = ("LENGTHUNIT", "FORCEUNIT", "PRESSUREUNIT")
_SI_DEFAULT = ("meter", "newton", "pascal")


class ModelBuilder:
    """Build an IFC model column by column; inputs in inch / kip / ksi.

    Attributes:
        model: the ifcopenshell file being built.
        schema: "IFC2X3", "IFC4" or "IFC4X3".
        body: the Model/Body/MODEL_VIEW context.  axis: the Model/Axis/GRAPH_VIEW context.
    """

    def __init__(self, schema: str = "IFC4", units: str = "mm_N") -> None:
        self.schema = schema
        self.model = ifcopenshell.file(schema=schema)
        self.units = units
        if schema == "IFC2X3":  # IFC2X3 requires owner history: the api finds these
            ifcopenshell.api.owner.add_application(
                self.model, application_full_name="stanchion tests",
                application_identifier="stanchion-tests")
            person = ifcopenshell.api.owner.add_person(
                self.model, identification="tester", family_name="Tester", given_name="Test")
            org = ifcopenshell.api.owner.add_organisation(
                self.model, identification="TESTS", name="stanchion test suite")
            ifcopenshell.api.owner.add_person_and_organisation(
                self.model, person=person, organisation=org
            )
        self.project = self._create("IfcProject", name="Test project")
        self._per_internal = self._assign_units(UNIT_SYSTEMS[units])
        model_ctx = ifcopenshell.api.context.add_context(self.model, context_type="Model")
        self.body = ifcopenshell.api.context.add_context(
            self.model, context_type="Model", context_identifier="Body",
            target_view="MODEL_VIEW", parent=model_ctx,
        )
        self.axis = ifcopenshell.api.context.add_context(
            self.model, context_type="Model", context_identifier="Axis",
            target_view="GRAPH_VIEW", parent=model_ctx,
        )
        self._building = None
        self._storeys: dict[str, ifcopenshell.entity_instance] = {}
        self._result_groups: dict[int, ifcopenshell.entity_instance] = {}
        self._group_rels: dict[int, ifcopenshell.entity_instance] = {}

    # ------------------------------------------------------------------ units

    def _assign_units(self, system: tuple) -> dict[str, float]:
        units, per_internal = [], {}
        internal = ("inch", "kip", "ksi")
        for (unit_type, spec, si, inner, key) in zip(
            _UNIT_TYPES, system, _SI_DEFAULT, internal, ("length", "force", "pressure"),
            strict=True,
        ):
            if spec is None:
                per_internal[key] = factor(inner, si)
                continue
            kind, name, pint_name = spec
            if kind == "si":
                units.append(ifcopenshell.api.unit.add_si_unit(
                    self.model, unit_type=unit_type, prefix=name))
            else:
                units.append(ifcopenshell.api.unit.add_conversion_based_unit(
                    self.model, name=name))
            per_internal[key] = factor(inner, pint_name)
        if units:
            ifcopenshell.api.unit.assign_unit(self.model, units=units)
        return per_internal

    def L(self, inches: float) -> float:
        """A length in inches, in the model's length unit."""
        return inches * self._per_internal["length"]

    def F(self, kips: float) -> float:
        """A force in kips, in the model's force unit."""
        return kips * self._per_internal["force"]

    def P(self, ksi: float) -> float:
        """A stress in ksi, in the model's pressure unit."""
        return ksi * self._per_internal["pressure"]

    # ------------------------------------------------------------------ basics

    def _create(self, ifc_class: str, **kw) -> ifcopenshell.entity_instance:
        return ifcopenshell.api.root.create_entity(self.model, ifc_class=ifc_class, **kw)

    def storey(self, name: str = "Level 1") -> ifcopenshell.entity_instance:
        """The storey named ``name`` (site and building are made on first use)."""
        if self._building is None:
            site = self._create("IfcSite", name="Site")
            self._building = self._create("IfcBuilding", name="Building")
            ifcopenshell.api.aggregate.assign_object(
                self.model, products=[site], relating_object=self.project)
            ifcopenshell.api.aggregate.assign_object(
                self.model, products=[self._building], relating_object=site)
        if name not in self._storeys:
            st = self._create("IfcBuildingStorey", name=name)
            ifcopenshell.api.aggregate.assign_object(
                self.model, products=[st], relating_object=self._building)
            self._storeys[name] = st
        return self._storeys[name]

    def measure(self, ifc_type: str, value: float) -> ifcopenshell.entity_instance:
        """A typed IFC value (IfcForceMeasure(12.0) ...), value already in model units."""
        return self.model.create_entity(ifc_type, value)

    # ------------------------------------------------------------------ profiles

    def profile(self, kind: str, name: str | None = None, **dims: float):
        """A parameterized profile; dimensions in inches.

        kinds and dimensions: ``I`` (d, bf, tw, tf, r), ``RHS`` (H, B, t, r_out; H along the
        profile Y axis), ``CHS`` (D, t), ``T`` (d, bf, tw, tf, r), ``U`` (d, bf, tw, tf, r),
        ``RECT`` (H, B), ``CIRCLE`` (D), ``L`` (d, b, t), ``ASYM_I`` (d, bf, tw, tf: equal
        flanges), ``ARBITRARY`` (b: a square outline).  Missing dimensions stay unset.
        """
        spec = {
            "I": ("IfcIShapeProfileDef", {"d": "OverallDepth", "bf": "OverallWidth",
                                          "tw": "WebThickness", "tf": "FlangeThickness",
                                          "r": "FilletRadius"}),
            "RHS": ("IfcRectangleHollowProfileDef", {"H": "YDim", "B": "XDim",
                                                     "t": "WallThickness",
                                                     "r_out": "OuterFilletRadius"}),
            "CHS": ("IfcCircleHollowProfileDef", {"t": "WallThickness"}),
            "T": ("IfcTShapeProfileDef", {"d": "Depth", "bf": "FlangeWidth",
                                          "tw": "WebThickness", "tf": "FlangeThickness",
                                          "r": "FilletRadius"}),
            "U": ("IfcUShapeProfileDef", {"d": "Depth", "bf": "FlangeWidth",
                                          "tw": "WebThickness", "tf": "FlangeThickness",
                                          "r": "FilletRadius"}),
            "RECT": ("IfcRectangleProfileDef", {"H": "YDim", "B": "XDim"}),
            "CIRCLE": ("IfcCircleProfileDef", {}),
            "L": ("IfcLShapeProfileDef", {"d": "Depth", "b": "Width", "t": "Thickness"}),
        }
        if kind == "ARBITRARY":
            return self._arbitrary(name, dims["b"])
        if kind == "ASYM_I":
            return self._asymmetric_i(name, **dims)
        ifc_class, attrs = spec[kind]
        prof = ifcopenshell.api.profile.add_parameterized_profile(self.model, ifc_class=ifc_class)
        prof.ProfileName = name
        if self.schema == "IFC2X3":  # Position is mandatory before IFC4
            prof.Position = self.model.createIfcAxis2Placement2D(
                self.model.createIfcCartesianPoint((0.0, 0.0)))
        for key, value in dims.items():
            if key == "D":
                prof.Radius = self.L(value) / 2.0
            else:
                setattr(prof, attrs[key], self.L(value))
        return prof

    def _arbitrary(self, name: str | None, b: float):
        h = self.L(b) / 2.0
        pts = [self.model.createIfcCartesianPoint(p) for p in
               ((-h, -h), (h, -h), (h, h), (-h, h), (-h, -h))]
        curve = self.model.createIfcPolyline(pts)
        return self.model.createIfcArbitraryClosedProfileDef("AREA", name, curve)

    def _asymmetric_i(self, name, d, bf, tw, tf):
        prof = self.model.create_entity("IfcAsymmetricIShapeProfileDef", ProfileType="AREA",
                                        ProfileName=name)
        prof.OverallDepth = self.L(d)
        prof.WebThickness = self.L(tw)
        prof.TopFlangeWidth = self.L(bf)
        prof.TopFlangeThickness = self.L(tf)
        if self.schema == "IFC2X3":
            prof.OverallWidth = self.L(bf)
            prof.FlangeThickness = self.L(tf)
        else:
            prof.BottomFlangeWidth = self.L(bf)
            prof.BottomFlangeThickness = self.L(tf)
        return prof

    # ------------------------------------------------------------------ materials

    def material(self, name: str = "Steel", fy: float | None = None):
        """An IfcMaterial; ``fy`` (ksi) is stored the schema's way.

        IFC4/IFC4X3: Pset_MaterialSteel.YieldStress (IfcPressureMeasure).  IFC2X3:
        IfcMechanicalSteelMaterialProperties.YieldStress.
        """
        category = None if self.schema == "IFC2X3" else "steel"
        mat = ifcopenshell.api.material.add_material(self.model, name=name, category=category)
        if fy is not None:
            if self.schema == "IFC2X3":
                self.model.create_entity("IfcMechanicalSteelMaterialProperties", Material=mat,
                                         YieldStress=self.P(fy))
            else:
                pset = ifcopenshell.api.pset.add_pset(self.model, product=mat,
                                                      name="Pset_MaterialSteel")
                ifcopenshell.api.pset.edit_pset(self.model, pset=pset, properties={
                    "YieldStress": self.measure("IfcPressureMeasure", self.P(fy))})
        return mat

    def profile_set(self, profile, material, name: str = "profile set"):
        """IfcMaterialProfileSet with one profile (IFC4 / IFC4X3 only)."""
        pset = ifcopenshell.api.material.add_material_set(
            self.model, name=name, set_type="IfcMaterialProfileSet")
        ifcopenshell.api.material.add_profile(
            self.model, profile_set=pset, material=material, profile=profile)
        return pset

    # ------------------------------------------------------------------ elements

    def column_type(self, name: str, profile=None, material=None, ifc_class="IfcColumnType",
                    predefined_type: str = "COLUMN", length: float | None = None):
        """An element type; IFC4+: material profile set; with ``length``: a Body map."""
        ctype = self._create(ifc_class, name=name, predefined_type=predefined_type)
        if profile is not None and self.schema != "IFC2X3":
            pset = self.profile_set(profile, material, name=name)
            ifcopenshell.api.material.assign_material(
                self.model, products=[ctype], type="IfcMaterialProfileSet", material=pset)
        elif material is not None:
            ifcopenshell.api.material.assign_material(
                self.model, products=[ctype], type="IfcMaterial", material=material)
        if length is not None and profile is not None:
            rep = ifcopenshell.api.geometry.add_profile_representation(
                self.model, context=self.body, profile=profile, depth=length * 0.0254)
            ifcopenshell.api.geometry.assign_representation(
                self.model, product=ctype, representation=rep)
        return ctype

    def column(
        self,
        name: str | None = "C1",
        *,
        profile=None,
        material=None,
        length: float | None = 144.0,
        via: str = "auto",
        storey: str | None = "Level 1",
        at: tuple[float, float] = (0.0, 0.0),
        tag: str | None = None,
        ifc_class: str = "IfcColumn",
        predefined_type: str | None = None,
        column_type=None,
        axis: bool = False,
        body: bool = True,
    ):
        """A column (or other element) with its placement, geometry and material.

        Args:
            name, tag: Name and Tag.  length: extrusion depth / axis length, in (None: none).
            profile, material: from :meth:`profile` / :meth:`material`.
            via: where the profile lives -- ``"usage"`` (IfcMaterialProfileSetUsage, IFC4+,
                plus a Body extrusion unless ``body=False``), ``"body"`` (extrusion only,
                material as IfcMaterial), ``"mapped"`` (IfcMappedItem of a representation
                map), ``"clipped"`` (IfcBooleanClippingResult), ``"auto"`` (usage on IFC4+,
                body on IFC2X3).
            storey: containing storey name (None: not contained).  at: plan position, in.
            column_type: an element type to assign (its psets / material apply).
            axis: also add an Axis representation of ``length``.
        """
        if via == "auto":
            via = "body" if self.schema == "IFC2X3" else "usage"
        kw = {"name": name}
        if predefined_type and not (self.schema == "IFC2X3" and ifc_class == "IfcMember"):
            kw["predefined_type"] = predefined_type
        col = self._create(ifc_class, **kw)
        if tag is not None:
            col.Tag = tag
        matrix = [[1.0, 0, 0, at[0] * 0.0254], [0, 1.0, 0, at[1] * 0.0254],
                  [0, 0, 1.0, 0], [0, 0, 0, 1.0]]
        ifcopenshell.api.geometry.edit_object_placement(
            self.model, product=col, matrix=np.array(matrix))
        if storey is not None:
            ifcopenshell.api.spatial.assign_container(
                self.model, products=[col], relating_structure=self.storey(storey))
        if column_type is not None:
            ifcopenshell.api.type.assign_type(
                self.model, related_objects=[col], relating_type=column_type,
                should_map_representations=False)
        reps = []
        if profile is not None and length is not None and (via != "usage" or body):
            reps.append(self._body(profile, length, via))
        if axis and length is not None:
            reps.append(ifcopenshell.api.geometry.add_axis_representation(
                self.model, context=self.axis,
                axis=[(0.0, 0.0, 0.0), (0.0, 0.0, length * 0.0254)]))  # api takes metres
        for rep in reps:
            ifcopenshell.api.geometry.assign_representation(
                self.model, product=col, representation=rep)
        if via == "usage" and profile is not None:
            pset = self.profile_set(profile, material, name=profile.ProfileName or "set")
            usage = self.model.create_entity("IfcMaterialProfileSetUsage", ForProfileSet=pset)
            self._associate(col, usage)
        elif material is not None:
            self._associate(col, material)
        return col

    def _associate(self, product, material) -> None:
        rel = self._create("IfcRelAssociatesMaterial")
        rel.RelatedObjects = [product]
        rel.RelatingMaterial = material

    def _body(self, profile, length: float, via: str):
        depth_si = length * 0.0254  # the api takes the depth in metres
        if via == "clipped":
            clip = {"type": "IfcBooleanClippingResult", "operand_type": "IfcHalfSpaceSolid",
                    "matrix": [[1, 0, 0, 0], [0, 1, 0, 0], [0, 0, 1, depth_si], [0, 0, 0, 1]]}
            return ifcopenshell.api.geometry.add_profile_representation(
                self.model, context=self.body, profile=profile, depth=depth_si,
                clippings=[clip])
        rep = ifcopenshell.api.geometry.add_profile_representation(
            self.model, context=self.body, profile=profile, depth=depth_si)
        if via == "mapped":
            return ifcopenshell.api.geometry.map_representation(self.model, representation=rep)
        return rep

    # ------------------------------------------------------------------ properties

    def pset(self, product, name: str, properties: dict):
        """A property set; values are passed to ifcopenshell.api.pset.edit_pset as given."""
        pset = ifcopenshell.api.pset.add_pset(self.model, product=product, name=name)
        ifcopenshell.api.pset.edit_pset(self.model, pset=pset, properties=properties)
        return pset

    def design(self, product, **values: float):
        """Stanchion_Design: KX/KY/KZ (ratios), UnbracedLength* (in), YieldStress (ksi)."""
        props = {}
        for key, value in values.items():
            if key.startswith("K"):
                props[key] = self.measure("IfcPositiveRatioMeasure", value)
            elif key.startswith("UnbracedLength"):
                props[key] = self.measure("IfcLengthMeasure", self.L(value))
            elif key == "YieldStress":
                props[key] = self.measure("IfcPressureMeasure", self.P(value))
            else:
                props[key] = value
        return self.pset(product, "Stanchion_Design", props)

    def loads(self, product, **kips: float):
        """Stanchion_Loads: D, L, Lr, S, R, W, E as IfcForceMeasure (inputs in kip)."""
        props = {k: self.measure("IfcForceMeasure", self.F(v)) for k, v in kips.items()}
        return self.pset(product, "Stanchion_Loads", props)

    def qto_length(self, product, length: float):
        """Base quantity Length (in): Qto_ColumnBaseQuantities (IFC4+), BaseQuantities (2X3)."""
        name = "BaseQuantities" if self.schema == "IFC2X3" else "Qto_ColumnBaseQuantities"
        qto = ifcopenshell.api.pset.add_qto(self.model, product=product, name=name)
        quantity = self.model.create_entity("IfcQuantityLength", Name="Length",
                                            LengthValue=self.L(length))
        qto.Quantities = [quantity]
        return qto

    # ------------------------------------------------------------------ analysis

    def analysis_member(self, column, length: float = 144.0, relating: str = "member"):
        """IfcStructuralCurveMember with an edge of ``length`` in, tied to ``column``.

        relating: ``"member"`` -- IfcRelAssignsToProduct.RelatingProduct is the analysis
        member (the api's convention); ``"column"`` -- the column relates the member.
        """
        kw = {"predefined_type": "RIGID_JOINED_MEMBER"} if self.schema != "IFC2X3" else {}
        member = self._create("IfcStructuralCurveMember", name=f"M-{column.Name}", **kw)
        if self.schema == "IFC2X3":
            member.PredefinedType = "RIGID_JOINED_MEMBER"
        else:
            member.Axis = self.model.createIfcDirection((1.0, 0.0, 0.0))
        v0 = self.model.createIfcVertexPoint(self.model.createIfcCartesianPoint((0.0, 0.0, 0.0)))
        v1 = self.model.createIfcVertexPoint(
            self.model.createIfcCartesianPoint((0.0, 0.0, self.L(length))))
        edge = self.model.createIfcEdge(v0, v1)
        rep = self.model.createIfcTopologyRepresentation(self.body, "Reference", "Edge", [edge])
        member.Representation = self.model.createIfcProductDefinitionShape(None, None, [rep])
        if relating == "member":
            ifcopenshell.api.structural.assign_product(
                self.model, relating_product=member, related_object=column)
        else:
            ifcopenshell.api.structural.assign_product(
                self.model, relating_product=column, related_object=member)
        return member

    def load_case(self, name: str, source: str = "NOTDEFINED", action_type: str = "NOTDEFINED",
                  description: str | None = None, predefined_type: str = "LOAD_CASE"):
        """A load case: IfcStructuralLoadCase (IFC4+) or IfcStructuralLoadGroup (IFC2X3)."""
        if self.schema == "IFC2X3" or predefined_type != "LOAD_CASE":
            case = self._create("IfcStructuralLoadGroup", name=name,
                                predefined_type=predefined_type)
            case.ActionType = action_type
            case.ActionSource = source
        else:
            case = ifcopenshell.api.structural.add_structural_load_case(
                self.model, name=name, action_type=action_type, action_source=source)
        case.Description = description
        return case

    def result_group(self, case):
        """The IfcStructuralResultGroup holding results for ``case`` (one per case)."""
        if case.id() not in self._result_groups:
            group = self._create("IfcStructuralResultGroup", name=f"Results {case.Name}")
            group.TheoryType = "FIRST_ORDER_THEORY"
            group.ResultForLoadGroup = case
            group.IsLinear = True
            self._result_groups[case.id()] = group
        return self._result_groups[case.id()]

    def reaction(self, member, case, force_x: float | Iterable[float],
                 global_or_local: str = "LOCAL_COORDS"):
        """An axial-force result on ``member`` for ``case``: ForceX in kip (tension +).

        IFC4+: IfcStructuralCurveReaction; IFC2X3: IfcStructuralPointReaction.  A list of
        forces gives an IfcStructuralLoadConfiguration (IFC4+) or one reaction each (2X3).
        """
        forces = [force_x] if isinstance(force_x, int | float) else list(force_x)
        cls = ("IfcStructuralPointReaction" if self.schema == "IFC2X3"
               else "IfcStructuralCurveReaction")
        single = [self.model.create_entity("IfcStructuralLoadSingleForce", Name=case.Name,
                                           ForceX=self.F(f)) for f in forces]
        loads = [single[0]] if len(single) == 1 else single
        if self.schema != "IFC2X3" and len(single) > 1:
            locations = [[self.L(i)] for i in range(len(single))]
            loads = [self.model.create_entity("IfcStructuralLoadConfiguration",
                                              Values=single, Locations=locations)]
        created = []
        for load in loads:
            activity = ifcopenshell.api.structural.add_structural_activity(
                self.model, applied_load=load, structural_member=member, ifc_class=cls,
                predefined_type="CONST" if cls.endswith("CurveReaction") else None,
                global_or_local=global_or_local)
            created.append(activity)
        group = self.result_group(case)
        rel = self._group_rels.get(group.id())
        if rel is None:
            rel = self._create("IfcRelAssignsToGroup")
            rel.RelatingGroup = group
            rel.RelatedObjects = created
            self._group_rels[group.id()] = rel
        else:
            rel.RelatedObjects = list(rel.RelatedObjects) + created
        return created[0] if len(created) == 1 else created

    # ------------------------------------------------------------------ output

    def write(self, path: str | Path) -> Path:
        """Write the model to ``path`` and return it."""
        self.model.write(str(path))
        return Path(path)


@pytest.fixture(params=SCHEMAS)
def schema(request) -> str:
    """Each IFC schema in turn."""
    return request.param


@pytest.fixture
def builder(schema) -> ModelBuilder:
    """A millimetre / newton / N/mm² model builder for ``schema``."""
    return ModelBuilder(schema, "mm_N")


@pytest.fixture
def make_builder(schema):
    """Factory: ``make_builder(units="in_kip", schema=None)`` (default: the test's schema)."""

    def make(units: str = "mm_N", schema_name: str | None = None) -> ModelBuilder:
        return ModelBuilder(schema_name or schema, units)

    return make
