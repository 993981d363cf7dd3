"""Building blocks of the sample models: profiles from the catalog, spatial structure, grid,
columns, Stanchion_Design, the analysis model with its results, and reproducible output.

Everything is made with ``ifcopenshell.api``; the few resource entities the api has no
function for (vertices and edges of analysis members, directions, the shared placement) are
made with ``file.create_entity``.  Nothing here holds scenario data: that is in
``sample_models/generate.py``.
"""

from __future__ import annotations

import uuid

import ifcopenshell
import ifcopenshell.api.aggregate
import ifcopenshell.api.context
import ifcopenshell.api.feature
import ifcopenshell.api.geometry
import ifcopenshell.api.grid
import ifcopenshell.api.group
import ifcopenshell.api.profile
import ifcopenshell.api.pset
import ifcopenshell.api.root
import ifcopenshell.api.spatial
import ifcopenshell.api.structural
import ifcopenshell.api.type
import ifcopenshell.guid
import numpy as np

from stanchion.engine.catalog import catalog_frame

#: Fixed time of every owner history and of the file headers (2024-01-01 00:00 UTC).
FIXED_EPOCH = 1_704_067_200
FIXED_STAMP = "2024-01-01T00:00:00"
GENERATOR = "stanchion sample_models/generate.py"

Entity = ifcopenshell.entity_instance
#: The three representation contexts the samples use: (Body, Axis, Reference).
Contexts = tuple[Entity, Entity, Entity]


def api(model: ifcopenshell.file, ifc_class: str, **kw) -> Entity:
    """A rooted entity via ``ifcopenshell.api.root.create_entity``."""
    return ifcopenshell.api.root.create_entity(model, ifc_class=ifc_class, **kw)


def catalog_row(designation: str) -> dict:
    """The engine catalog's row (AISC Shapes Database v16.0) for ``designation``."""
    frame = catalog_frame()
    rows = frame[frame["designation"] == designation]
    if rows.empty:
        raise KeyError(f"{designation} is not in the catalog")
    return rows.iloc[0].to_dict()


def catalog_profile(model: ifcopenshell.file, designation: str,
                    length_per_in: float) -> tuple[Entity, dict]:
    """A parameterized profile named ``designation`` with the catalog's dimensions.

    Dimensions of the AISC Shapes Database v16.0 (engine catalog) converted to the model
    length unit.  I-shape FilletRadius = kdes - tf and HSS OuterFilletRadius = 1.5 tdes are
    approximations (common practice, no source); the reader ignores both when matching.
    """
    row = catalog_row(designation)
    family = row["family"]

    def q(inches: float) -> float:
        return round(float(inches) * length_per_in, 3)

    if family == "W":
        prof = ifcopenshell.api.profile.add_parameterized_profile(
            model, ifc_class="IfcIShapeProfileDef")
        attrs = {"OverallDepth": q(row["d"]), "OverallWidth": q(row["bf"]),
                 "WebThickness": q(row["tw"]), "FlangeThickness": q(row["tf"]),
                 "FilletRadius": q(row["kdes"] - row["tf"])}
    elif family == "HSS":
        prof = ifcopenshell.api.profile.add_parameterized_profile(
            model, ifc_class="IfcRectangleHollowProfileDef")
        attrs = {"XDim": q(row["B"]), "YDim": q(row["Ht"]), "WallThickness": q(row["tnom"]),
                 "OuterFilletRadius": q(1.5 * row["tdes"])}
    elif family == "HSS_ROUND":
        prof = ifcopenshell.api.profile.add_parameterized_profile(
            model, ifc_class="IfcCircleHollowProfileDef")
        attrs = {"Radius": q(row["OD"] / 2.0), "WallThickness": q(row["tnom"])}
    else:
        raise ValueError(f"{designation}: family {family} is not used by the samples")
    prof.ProfileName = designation
    if model.schema == "IFC2X3":  # Position is not optional there
        prof.Position = model.create_entity("IfcAxis2Placement2D", model.create_entity(
            "IfcCartesianPoint", (0.0, 0.0)))
    for key, value in attrs.items():
        setattr(prof, key, value)
    return prof, row


def contexts(model: ifcopenshell.file) -> Contexts:
    """Model context with Body, Axis and Reference (analysis members) sub-contexts."""
    root = ifcopenshell.api.context.add_context(model, context_type="Model")
    body = ifcopenshell.api.context.add_context(
        model, context_type="Model", context_identifier="Body", target_view="MODEL_VIEW",
        parent=root)
    axis = ifcopenshell.api.context.add_context(
        model, context_type="Model", context_identifier="Axis", target_view="GRAPH_VIEW",
        parent=root)
    ref = ifcopenshell.api.context.add_context(
        model, context_type="Model", context_identifier="Reference", target_view="GRAPH_VIEW",
        parent=root)
    return body, axis, ref


def place(model: ifcopenshell.file, product: Entity, x_m: float, y_m: float,
          z_m: float) -> None:
    """World position of ``product`` in metres (the api stores it relative to its parent)."""
    matrix = np.eye(4)
    matrix[:3, 3] = (x_m, y_m, z_m)
    ifcopenshell.api.geometry.edit_object_placement(model, product=product, matrix=matrix)


def spatial(model: ifcopenshell.file, project: Entity, site_name: str, building_name: str,
            levels: tuple, length_m: float) -> tuple[Entity, dict[str, Entity]]:
    """Site, building and named storeys placed at their elevations.

    Args:
        levels: rows ``(key, storey name, elevation in model units, ...)``.
        length_m: metres per model length unit.

    Returns:
        (building, {level key: storey}).
    """
    site = api(model, "IfcSite", name=site_name)
    building = api(model, "IfcBuilding", name=building_name)
    ifcopenshell.api.aggregate.assign_object(model, products=[site], relating_object=project)
    ifcopenshell.api.aggregate.assign_object(model, products=[building], relating_object=site)
    place(model, site, 0.0, 0.0, 0.0)
    place(model, building, 0.0, 0.0, 0.0)
    storeys = {key: storey(model, building, name, elevation, length_m)
               for key, name, elevation, *_ in levels}
    return building, storeys


def storey(model: ifcopenshell.file, building: Entity, name: str, elevation: float,
           length_m: float) -> Entity:
    """A storey of ``building`` named ``name`` placed at ``elevation`` (model units)."""
    st = api(model, "IfcBuildingStorey", name=name)
    st.Elevation = elevation
    ifcopenshell.api.aggregate.assign_object(model, products=[st], relating_object=building)
    place(model, st, 0.0, 0.0, elevation * length_m)
    return st


def slab(model: ifcopenshell.file, ctx: Contexts, storey: Entity, name: str,
         corners: list[tuple[float, float]], top: float, thickness: float, length_m: float,
         openings: tuple[tuple[float, float, float, float], ...] = ()) -> Entity:
    """An IfcSlab (FLOOR) in ``storey``: a vertical extrusion of ``corners`` whose top is at
    ``top``, with rectangular openings (x0, y0, x1, y1) through it.  Model units throughout.
    """
    body = ctx[0]
    s = api(model, "IfcSlab", name=name, predefined_type="FLOOR")
    ifcopenshell.api.spatial.assign_container(model, products=[s], relating_structure=storey)
    place(model, s, 0.0, 0.0, (top - thickness) * length_m)
    rep = ifcopenshell.api.geometry.add_slab_representation(
        model, context=body, depth=thickness * length_m,
        polyline=[(x * length_m, y * length_m) for x, y in corners])
    ifcopenshell.api.geometry.assign_representation(model, product=s, representation=rep)
    for k, (x0, y0, x1, y1) in enumerate(openings, start=1):
        hole = api(model, "IfcOpeningElement", name=f"{name} opening {k}")
        place(model, hole, 0.0, 0.0, (top - thickness - 50.0 * 0.001 / length_m) * length_m)
        rep = ifcopenshell.api.geometry.add_slab_representation(
            model, context=body, depth=thickness * length_m + 0.1,
            polyline=[(x * length_m, y * length_m)
                      for x, y in ((x0, y0), (x1, y0), (x1, y1), (x0, y1))])
        ifcopenshell.api.geometry.assign_representation(model, product=hole,
                                                        representation=rep)
        ifcopenshell.api.feature.add_feature(model, feature=hole, element=s)
    return s


def grid(model: ifcopenshell.file, storey: Entity, xs: dict[str, float],
         ys: dict[str, float], length_m: float, margin: float) -> None:
    """An IfcGrid with lettered U axes (lines of constant x) and numbered V axes.

    Args:
        xs, ys: axis tag -> coordinate in model units.  margin: overhang of the axis lines.
    """
    ifc_grid = api(model, "IfcGrid", name="Structural grid")
    ifcopenshell.api.spatial.assign_container(model, products=[ifc_grid],
                                              relating_structure=storey)
    place(model, ifc_grid, 0.0, 0.0, 0.0)
    x0, x1 = min(xs.values()) - margin, max(xs.values()) + margin
    y0, y1 = min(ys.values()) - margin, max(ys.values()) + margin
    for tag, x in xs.items():
        axis = ifcopenshell.api.grid.create_grid_axis(model, grid=ifc_grid, axis_tag=tag,
                                                      uvw_axes="UAxes")
        ifcopenshell.api.grid.create_axis_curve(
            model, p1=np.array((x, y0, 0.0)) * length_m, p2=np.array((x, y1, 0.0)) * length_m,
            grid_axis=axis)
    for tag, y in ys.items():
        axis = ifcopenshell.api.grid.create_grid_axis(model, grid=ifc_grid, axis_tag=tag,
                                                      uvw_axes="VAxes")
        ifcopenshell.api.grid.create_axis_curve(
            model, p1=np.array((x0, y, 0.0)) * length_m, p2=np.array((x1, y, 0.0)) * length_m,
            grid_axis=axis)


def column(model: ifcopenshell.file, ctx: Contexts, storey: Entity, ctype: Entity,
           profile: Entity, name: str, tag: str, at: tuple[float, float], height: float,
           length_m: float) -> Entity:
    """An IfcColumn of type ``ctype`` in ``storey`` with Body extrusion and Axis.

    Args:
        at: plan position, model units.  height: column length, model units.
        length_m: metres per model length unit (the api takes metres).
    """
    body, axis, _ = ctx
    col = api(model, "IfcColumn", name=name)
    col.Tag = tag
    ifcopenshell.api.spatial.assign_container(model, products=[col], relating_structure=storey)
    place(model, col, at[0] * length_m, at[1] * length_m, storey.Elevation * length_m)
    ifcopenshell.api.type.assign_type(model, related_objects=[col], relating_type=ctype)
    rep = ifcopenshell.api.geometry.add_profile_representation(
        model, context=body, profile=profile, depth=height * length_m)
    ifcopenshell.api.geometry.assign_representation(model, product=col, representation=rep)
    line = ifcopenshell.api.geometry.add_axis_representation(
        model, context=axis, axis=[(0.0, 0.0, 0.0), (0.0, 0.0, height * length_m)])
    ifcopenshell.api.geometry.assign_representation(model, product=col, representation=line)
    return col


def design(model: ifcopenshell.file, product: Entity,
           values: dict[str, tuple[str, float]]) -> None:
    """Stanchion_Design on ``product``: {property: (IFC measure type, value)}."""
    pset = ifcopenshell.api.pset.add_pset(model, product=product, name="Stanchion_Design")
    ifcopenshell.api.pset.edit_pset(model, pset=pset, properties={
        k: model.create_entity(t, v) for k, (t, v) in values.items()})


def finish(model: ifcopenshell.file, rng: np.random.Generator, file_name: str) -> None:
    """Make the file reproducible: GlobalIds from ``rng``, fixed dates and header, sorted sets.

    IFC relationship attributes such as RelatedObjects are SETs; the api fills some from
    Python sets, whose order is not reproducible, so every SET of entities is written in
    entity-number order.
    """
    for entity in sorted(model.by_type("IfcRoot"), key=lambda e: e.id()):
        entity.GlobalId = ifcopenshell.guid.compress(uuid.UUID(bytes=rng.bytes(16),
                                                               version=4).hex)
    for history in model.by_type("IfcOwnerHistory"):
        history.CreationDate = FIXED_EPOCH
        history.LastModifiedDate = FIXED_EPOCH
        history.ChangeAction = "ADDED"
    schema = ifcopenshell.schema_by_name(model.schema)
    set_attrs: dict[str, list[int]] = {}
    for entity in model:
        cls = entity.is_a()
        if cls not in set_attrs:
            decl = schema.declaration_by_name(cls)
            set_attrs[cls] = [
                i for i, attr in enumerate(decl.all_attributes())
                if (agg := attr.type_of_attribute().as_aggregation_type()) is not None
                and agg.type_of_aggregation_string() == "set"]
        for i in set_attrs[cls]:
            value = entity[i]
            if value and all(isinstance(v, ifcopenshell.entity_instance) for v in value):
                ordered = sorted(value, key=lambda e: e.id())
                if list(value) != ordered:
                    entity[i] = ordered
    header = model.header.file_name
    header.name = file_name
    header.time_stamp = FIXED_STAMP
    header.author = ("stanchion sample data (invented)",)
    header.organization = ("none",)
    header.preprocessor_version = "IfcOpenShell (ifcopenshell.api)"
    header.originating_system = GENERATOR
    header.authorization = "none"


def analysis_model(model: ifcopenshell.file, ref_ctx: Entity, building: Entity,
                   columns: dict[str, tuple[Entity, tuple[float, float, float], float]],
                   forces: dict[str, dict[str, float]], load_cases: tuple) -> None:
    """The analysis model: load cases, result groups, one curve member per column.

    Each column in ``forces`` gets an IfcStructuralCurveMember (an edge from its base to its
    top, tied to the column by IfcRelAssignsToProduct with the member relating) and, per load
    case, an IfcStructuralCurveReaction whose IfcStructuralLoadSingleForce ForceX is the
    member-local axial force, tension positive -- so a compression C is ForceX = -C
    (docs/design.md §5).  Reactions of one case are grouped in that case's
    IfcStructuralResultGroup.

    Args:
        columns: name -> (column, base point in model units, height in model units).
        forces: name -> {case key: axial compression in the model force unit}; columns
            missing here get no analysis member (no results).
        load_cases: rows ``(case key, name, ActionType, ActionSource, description)``.
    """
    analysis = ifcopenshell.api.structural.add_structural_analysis_model(model)
    analysis.Name = "Gravity and wind, first order (demo results)"
    ifcopenshell.api.structural.assign_to_building(
        model, structural_analysis_model=analysis, building=building)
    origin = model.create_entity("IfcLocalPlacement", RelativePlacement=model.create_entity(
        "IfcAxis2Placement3D", Location=model.create_entity("IfcCartesianPoint",
                                                            (0.0, 0.0, 0.0))))
    cases, groups, reactions = {}, {}, {}
    for key, name, action_type, source, description in load_cases:
        case = ifcopenshell.api.structural.add_structural_load_case(
            model, name=name, action_type=action_type, action_source=source)
        case.Description = description
        group = api(model, "IfcStructuralResultGroup", name=f"Results {name}")
        group.TheoryType = "FIRST_ORDER_THEORY"
        group.ResultForLoadGroup = case
        group.IsLinear = True
        cases[key], groups[key], reactions[key] = case, group, []
    members = []
    for name, (col, (x, y, z), height) in columns.items():
        if name not in forces:
            continue  # no results for this column
        member = api(model, "IfcStructuralCurveMember", name=f"A-{name}",
                     predefined_type="RIGID_JOINED_MEMBER")
        member.Axis = model.create_entity("IfcDirection", (1.0, 0.0, 0.0))
        member.ObjectPlacement = origin
        v0, v1 = (model.create_entity("IfcVertexPoint", model.create_entity(
            "IfcCartesianPoint", p)) for p in ((x, y, z), (x, y, z + height)))
        edge = model.create_entity("IfcEdge", v0, v1)
        rep = ifcopenshell.api.geometry.add_topology_representation(
            model, context=ref_ctx, item=edge, representation_identifier="Reference")
        ifcopenshell.api.geometry.assign_representation(model, product=member,
                                                        representation=rep)
        ifcopenshell.api.structural.assign_product(model, relating_product=member,
                                                   related_object=col)
        members.append(member)
        for key, compression in forces[name].items():
            load = ifcopenshell.api.structural.add_structural_load(
                model, name=f"{key} at base", ifc_class="IfcStructuralLoadSingleForce")
            # member-local ForceX, tension positive: compression is negative (docs/design.md §5)
            ifcopenshell.api.structural.edit_structural_load(
                model, structural_load=load, attributes={"ForceX": -compression})
            reactions[key].append(ifcopenshell.api.structural.add_structural_activity(
                model, applied_load=load, structural_member=member,
                ifc_class="IfcStructuralCurveReaction", predefined_type="CONST",
                global_or_local="LOCAL_COORDS"))
    ifcopenshell.api.structural.assign_structural_analysis_model(
        model, products=members, structural_analysis_model=analysis)
    for key, group in groups.items():
        ifcopenshell.api.group.assign_group(model, products=reactions[key], group=group)
    ifcopenshell.api.structural.edit_structural_analysis_model(
        model, structural_analysis_model=analysis,
        attributes={"SharedPlacement": origin, "LoadedBy": list(cases.values()),
                    "HasResults": list(groups.values())})

