"""IFC model -> engine member table: every IfcColumn (optionally STRUT / POST members).

:func:`read_columns` walks each element once, using relationship maps built in one pass
(:class:`~ifc_bridge.relations.RelationIndex`) and caches for everything shared between
elements (profiles, mapped representations, materials, load cases).  The section rows are
then resolved in one vectorized step (:func:`~ifc_bridge.sections.resolve_sections`).

Per member, the extra columns say where each input came from:

* ``profile_source``: ``profile_set/catalog``, ``body/dimensions`` ... (where the profile was
  found / what the properties are based on), or ``none``;
* ``length_source``: ``axis``, ``extrusion``, ``quantity``, ``analytical``, ``body`` or
  ``none``;
* ``load_source``: ``analysis``, ``table``, ``pset`` joined with ``+``, or ``none``;
* ``fy_source``: ``override``, ``material``, ``grade``, ``default_grade`` or ``none``.

Anything missing makes only that member "not checked" (``reason``), never the whole read.
"""

from __future__ import annotations

import gc
import math
from collections import Counter
from dataclasses import dataclass, field
from pathlib import PurePath

import ifcopenshell
import ifcopenshell.util.placement
import numpy as np

from stanchion.engine.arrays import AnyArray, FloatArray
from stanchion.engine.loads import LoadTable
from stanchion.engine.materials import UNKNOWN, skip_reason
from stanchion.engine.members import LOAD_TYPES, MemberTable
from stanchion.engine.sections import SectionTable
from stanchion.ifc_bridge.access import Entity, get
from stanchion.ifc_bridge.elements import (
    PlanPositions,
    analysis_columns,
    select_elements,
    skipped_members,
)
from stanchion.ifc_bridge.errors import ModelReadError
from stanchion.ifc_bridge.grids import GridNamer, read_grids
from stanchion.ifc_bridge.lengths import analytical_length, choose_length
from stanchion.ifc_bridge.load_cases import AnalysisLoads
from stanchion.ifc_bridge.loads import Places, match_table, merge_loads
from stanchion.ifc_bridge.materials import (
    MaterialCache,
    MaterialInfo,
    YieldReader,
    assumed_grade,
    element_class,
    element_material,
    material_standard,
    ungraded_steel,
)
from stanchion.ifc_bridge.orientation import plan_rotation
from stanchion.ifc_bridge.outlines import plane_angle_scale
from stanchion.ifc_bridge.profiles import ProfileSpec, is_outline, outline_spec, profile_spec
from stanchion.ifc_bridge.properties import (
    AXES,
    DESIGN_PSET,
    LOADS_PSET,
    DesignInputs,
    PropertyValue,
    default_note,
    design_inputs,
    find_definition,
    pset_loads,
    quantity_length,
    single_values,
)
from stanchion.ifc_bridge.relations import RelationIndex
from stanchion.ifc_bridge.representation import ShapeInfo, ShapeReader
from stanchion.ifc_bridge.sections import Resolution, SectionRequest, resolve_sections
from stanchion.ifc_bridge.units import GivenUnit, ModelUnits, read_units

NO_YIELD = "no yield strength"
BROKEN = "error"  # profile_origin of an element the reader could not walk


@dataclass
class ReadResult:
    """What the reader found.

    Attributes:
        members: the member table (kip, inch, ksi); ``id`` is the GlobalId.
        messages: model-level warnings (undeclared units, ignored load cases, unmatched
            load-table rows, "model has no IfcColumn" ...).
        force_unit_factor: model force unit -> kip (for writing results back).
        length_unit_factor: model length unit -> inch.
        pressure_unit_factor: model pressure unit -> ksi.
        schema: the model's schema identifier.
        unit_names: human names of the model units (or the assumed SI unit).
        unit_given: quantity -> the unit given apart (``--force-unit``) that quantity was
            read in, for a model that declares none.
        unit_given_as: where that unit was given (``on the command line (--force-unit)``;
            :attr:`ifc_bridge.units.GivenUnit.given_as`).
    """

    members: MemberTable
    messages: list[str]
    force_unit_factor: float
    length_unit_factor: float
    pressure_unit_factor: float = 1.0
    schema: str = ""
    unit_names: dict[str, str] = field(default_factory=dict)
    unit_given: dict[str, str] = field(default_factory=dict)
    unit_given_as: str = "on the command line (--force-unit)"


@dataclass
class _Row:
    """Everything gathered for one element before the vectorized steps."""

    element: Entity
    gid: str
    name: str
    tag: str
    storey: str
    x: float
    y: float
    spec: ProfileSpec | None
    profile_origin: str
    material: MaterialInfo
    length: float
    length_source: str
    design: DesignInputs
    analysis: dict[str, float]
    pset: dict[str, float]
    notes: list[str]
    reasons: list[str]
    body_kind: str | None = None  # a Body that is not an extrusion (IfcFacetedBrep ...)
    grid: str | None = None  # grid location ("B-2"), named once every row is read
    rotation: float = math.nan  # plan rotation of the section, degrees (ifc_bridge.orientation)


class _Reader:
    """State shared while reading one model."""

    def __init__(self, model: ifcopenshell.file, units: ModelUnits,
                 default_grade: str | None = None,
                 default_grade_option: str = "--default-grade") -> None:
        self.model = model
        self.units = units
        self.default_grade = default_grade  # --default-grade, for steel naming no grade
        self.default_grade_option = default_grade_option  # how the messages name it
        self.index = RelationIndex.build(model)
        self.shapes = ShapeReader()
        self.placements = PlanPositions()
        self.rotations: dict[int, FloatArray] = {}  # parent placements (orientation)
        self.analysis = AnalysisLoads(self.index, units)
        self.yields = YieldReader(model, self.index, units)
        self._specs: dict[tuple[int, float], ProfileSpec] = {}
        self._angle: float | None = None  # radians per plane-angle unit, when first needed
        self._values: dict[int, dict[str, PropertyValue]] = {}
        self._designs: dict[tuple[int, int], DesignInputs] = {}
        self._materials: MaterialCache = {}

    def values(self, definitions: list[Entity], name: str,
               cache: bool = True) -> tuple[int, dict[str, PropertyValue]]:
        """(pset id or 0, single values) of the set ``name``.

        Cached per property set when ``cache`` (a type's sets serve many occurrences); an
        occurrence's own sets are read once each, and caching them would only hold one dict
        per column for the rest of the read.
        """
        pset = find_definition(definitions, name)
        if pset is None:
            return 0, {}
        key = pset.id()
        if not cache:
            return key, single_values(pset)
        if key not in self._values:
            self._values[key] = single_values(pset)
        return key, self._values[key]

    def release_walk_caches(self) -> None:
        """Drop the caches only the element walk uses (shapes, positions, property values).

        On a 20,000-column model they hold about 20 MB that the rest of the read and the
        writer never need; freeing them before the member table is built lowers the peak.
        """
        self.shapes = ShapeReader()
        self.placements = PlanPositions()
        self.rotations = {}
        self._values.clear()

    def design(self, occ_defs: list[Entity], type_defs: list[Entity]) -> DesignInputs:
        """Stanchion_Design inputs, computed once per (occurrence set, type set) pair."""
        occ_key, occ = self.values(occ_defs, DESIGN_PSET, cache=False)
        type_key, typed = self.values(type_defs, DESIGN_PSET)
        key = (occ_key, type_key)
        if key not in self._designs:
            self._designs[key] = design_inputs(occ, typed, self.units)
        return self._designs[key]

    def spec(self, profile: Entity, scale: float) -> ProfileSpec:
        """The profile's spec, read once per (profile definition, mapping scale)."""
        key = (profile.id(), scale)
        if key not in self._specs:
            if is_outline(profile):
                if self._angle is None:
                    self._angle = plane_angle_scale(self.model)
                self._specs[key] = outline_spec(self.model, profile, self.units.length, scale,
                                                self._angle)
            else:
                self._specs[key] = profile_spec(profile, self.units.length, scale)
        return self._specs[key]

    def row(self, element: Entity) -> _Row:
        eid = element.id()
        etype = self.index.type_of.get(eid)
        notes: list[str] = []
        reasons: list[str] = []
        storey = self.index.storey_of(element)
        x, y = self.placements.xy(element)
        occ_defs = self.index.definitions.get(eid, [])
        type_defs = self.index.property_definitions(etype) if etype is not None else []

        shape = self.shapes.read(element)
        if not shape.extrusions and etype is not None:
            typed = self.shapes.read_type(etype)
            shape = ShapeInfo(typed.extrusions, shape.axis_length, shape.notes + typed.notes,
                              shape.body_extent or typed.body_extent,
                              shape.body_kind or typed.body_kind)
        notes.extend(shape.notes)
        material = element_material(element, etype, self.index, self._materials)
        notes.extend(material.notes)
        spec, origin = self._profile(material, shape, notes, reasons)

        quantity, qnote = quantity_length(occ_defs, self.units)
        if quantity is None and type_defs:
            quantity, qnote = quantity_length(type_defs, self.units)
        linked = ([element] if element.is_a("IfcStructuralCurveMember") else
                  [o for o in self.index.linked.get(eid, ())
                   if o.is_a("IfcStructuralCurveMember")])
        length, length_source, lnotes = choose_length(
            shape, quantity, analytical_length(linked), self.units.length)
        notes.extend(lnotes)
        if length_source == "quantity" and qnote:
            notes.append(qnote)

        design = self.design(occ_defs, type_defs)
        notes.extend(design.notes)
        reasons.extend(design.problems)
        analysis, anotes = self.analysis.for_column(element, linked)
        notes.extend(anotes)
        # Stanchion_Loads on the column or its type; the column's value wins per load type.
        load_values = {**self.values(type_defs, LOADS_PSET)[1],
                       **self.values(occ_defs, LOADS_PSET, cache=False)[1]}
        pset, pnotes, pproblems = pset_loads(load_values, self.units)
        notes.extend(pnotes)
        reasons.extend(pproblems)
        gid, name = get(element, "GlobalId"), get(element, "Name")
        return _Row(
            element=element, gid=gid, name=name or gid, tag=getattr(element, "Tag", None) or "",
            storey=(get(storey, "Name") or "") if storey else "",
            x=x, y=y, spec=spec, profile_origin=origin, material=material, length=length,
            length_source=length_source, design=design, analysis=analysis, pset=pset,
            notes=notes, reasons=reasons, body_kind=shape.body_kind,
            rotation=plan_rotation(element, None if shape.main is None else
                                   (shape.main.profile, shape.main.angle), self.rotations),
        )

    def _profile(self, material: MaterialInfo, shape: ShapeInfo, notes: list[str],
                 reasons: list[str]) -> tuple[ProfileSpec | None, str]:
        if material.problem:
            reasons.append(material.problem)
        main = shape.main
        if material.profile is not None:
            spec = self.spec(material.profile, 1.0)
            if main is not None and main.profile is not None and \
                    main.profile.id() != material.profile.id():
                body = self.spec(main.profile, main.scale)
                if body.family != spec.family or any(
                    a is not None and b is not None and abs(a - b) > 0.02 * max(abs(a), 1e-9)
                    for (_, a), (_, b) in zip(spec.dims, body.dims, strict=False)
                ):
                    notes.append(f"Body extrusion profile ({body.label}) differs from the "
                                 f"material profile set's ({spec.label}); the profile set is "
                                 "used")
            return spec, "profile_set"
        if main is not None:
            if main.tapered:
                reasons.append("tapered extrusion (IfcExtrudedAreaSolidTapered) is not "
                               "supported")
            if main.oblique:
                notes.append("Body extrusion is oblique to its profile; the profile is taken "
                             "as the cross-section")
            if len(shape.extrusions) > 1:
                notes.append(f"Body has {len(shape.extrusions)} extruded solids; the longest "
                             "is the column")
            if main.profile is None:
                return None, "body"
            return self.spec(main.profile, main.scale), "body"
        return None, "none"

    def definitions(self, row: _Row) -> list[Entity]:
        """The property sets of the row's element and of its type."""
        eid = row.element.id()
        etype = self.index.type_of.get(eid)
        return self.index.definitions.get(eid, []) + (
            self.index.property_definitions(etype) if etype is not None else [])

    def ungraded_steel(self, row: _Row) -> str | None:
        """The steel material of a row that names no grade (ifc_bridge.materials)."""
        texts = self.yields.grade_texts(row.material.materials, self.definitions(row))
        return ungraded_steel(row.material, texts)

    def fy(self, row: _Row, family: str | None, thickness: float | None
           ) -> tuple[float, str, list[str]]:
        """Yield stress (ksi), its source and notes -- precedence in ifc_bridge.materials."""
        notes: list[str] = []
        if row.design.fy is not None:
            notes.append(f"Fy = {row.design.fy:.4g} ksi from Stanchion_Design.YieldStress "
                         "(override)")
            return row.design.fy, "override", notes
        for mat in row.material.materials:
            value, where, mnotes = self.yields.material_yield(mat)
            notes.extend(mnotes)
            if value is not None:
                notes.append(f"Fy = {value:.4g} ksi from {where}")
                return value, "material", notes
        found, gnotes = self.yields.grade(row.material.materials, family, thickness,
                                          self.definitions(row))
        notes.extend(gnotes)
        if found is not None:
            notes.append(found.note)
            return found.fy, "grade", notes
        if self.default_grade and self.ungraded_steel(row) is not None:
            value, dnotes = assumed_grade(self.default_grade, family, thickness,
                                          self.default_grade_option)
            notes.extend(dnotes)
            if value is not None:
                return value, "default_grade", notes
        return math.nan, "none", notes


def _safe_row(reader: _Reader, element: Entity) -> _Row:
    """One element's row; an entity the reader cannot walk gives a not-checked row."""
    try:
        return reader.row(element)
    except Exception as exc:  # a broken entity must not stop the other columns
        gid = getattr(element, "GlobalId", None) or f"#{element.id()}"
        return _Row(
            element=element, gid=gid, name=getattr(element, "Name", None) or gid,
            tag=getattr(element, "Tag", None) or "", storey="", x=math.nan, y=math.nan,
            spec=None, profile_origin=BROKEN, material=MaterialInfo(), length=math.nan,
            length_source="none", design=DesignInputs(), analysis={}, pset={}, notes=[],
            reasons=[f"element could not be read ({type(exc).__name__}: {exc})"],
        )


EXTRA_COLUMNS = ("global_id", "tag", "storey", "grid", "x", "y", "rotation", "ifc_class",
                 "length_source", "profile_source", "load_source", "fy_source")


@dataclass
class _Columns:
    """The member table's columns, filled one reader row at a time."""

    fy: FloatArray
    length: FloatArray
    k: dict[str, FloatArray]
    unbraced: dict[str, FloatArray]
    loads: FloatArray
    reasons: list[str | None] = field(default_factory=list)
    messages: list[list[str]] = field(default_factory=list)
    extra: dict[str, list[object]] = field(
        default_factory=lambda: {key: [] for key in EXTRA_COLUMNS})

    @classmethod
    def empty(cls, n: int) -> _Columns:
        """Columns for ``n`` members: NaN numbers, K = 1, nothing else yet."""
        return cls(
            fy=np.full(n, math.nan), length=np.full(n, math.nan),
            k={a: np.ones(n) for a in AXES}, unbraced={a: np.full(n, math.nan) for a in AXES},
            loads=np.full((n, len(LOAD_TYPES)), math.nan),
        )

    def add(self, i: int, r: _Row, res: Resolution, reader: _Reader,
            table_loads: dict[str, float] | None) -> None:
        """Fill member ``i`` from its row.

        Args:
            i: the member's index.
            r: the reader's row.
            res: the resolved sections of every member.
            reader: the model's reader (yield stress).
            table_loads: the member's load-table row ({} when unmatched), None without a
                load table.
        """
        notes = list(r.notes)
        broken = r.profile_origin == BROKEN
        why = _section_reasons(r, res.reasons[i])
        notes.extend(res.notes[i])
        family = res.family[i] if res.family else None
        value, fy_source, fnotes = reader.fy(r, family, res.thickness[i])
        notes.extend(fnotes)
        self.fy[i] = value
        if fy_source == "none" and not broken:
            why.append(_no_yield_reason(reader.ungraded_steel(r), reader.default_grade_option))
        self.length[i] = r.length
        for a in AXES:
            self.k[a][i] = r.design.k.get(a, 1.0)
            self.unbraced[a][i] = r.design.unbraced.get(a, r.length)
        if not all(math.isfinite(self.unbraced[a][i]) for a in AXES) and not broken:
            why.append("no length (no Axis or Body extrusion, no Length quantity and no "
                       "analysis member)")
        default = default_note(r.design)
        if default:
            notes.append(default)
        by_source = {"analysis": r.analysis, "pset": r.pset}
        if table_loads is not None:
            by_source["table"] = table_loads
        values, used, lnotes = merge_loads(by_source)
        self.loads[i] = values
        notes.extend(lnotes)
        if not used and not broken:
            why.append("no loads (no analysis results, load table row or Stanchion_Loads)")
        self._add_extra(r, res.basis[i] if res.index[i] >= 0 else "", used, fy_source)
        self.reasons.append("; ".join(dict.fromkeys(why)) if why else None)
        self.messages.append(list(dict.fromkeys(notes)))

    def _add_extra(self, r: _Row, basis: str, used: list[str], fy_source: str) -> None:
        """The writer columns of one member (provenance, position, identity)."""
        extra = self.extra
        extra["global_id"].append(r.gid)
        extra["tag"].append(r.tag)
        extra["storey"].append(r.storey)
        extra["grid"].append(r.grid)
        extra["x"].append(r.x)
        extra["y"].append(r.y)
        extra["rotation"].append(r.rotation)
        extra["ifc_class"].append(r.element.is_a())
        extra["length_source"].append(r.length_source)
        extra["profile_source"].append(
            f"{r.profile_origin}/{basis}" if basis else r.profile_origin)
        extra["load_source"].append("+".join(used) if used else "none")
        extra["fy_source"].append(fy_source)

    def extra_arrays(self) -> dict[str, AnyArray]:
        """The writer columns as arrays (x, y, rotation float; the others object)."""
        numeric = ("x", "y", "rotation")
        return {key: np.array(self.extra[key], dtype=float if key in numeric else object)
                for key in EXTRA_COLUMNS}


def _no_yield_reason(steel: str | None, option: str = "--default-grade") -> str:
    """Why a member has no yield stress, naming a steel material that names no grade.

    Args:
        steel: the name of the member's steel material that names no grade, or None.
        option: how the reason names the default grade's option (``--default-grade``).
    """
    if steel is not None:
        return (f"{NO_YIELD}: material '{steel}' names no grade (no Stanchion_Design."
                f"YieldStress, no material yield stress or grade property; {option} "
                "would assume one)")
    return (f"{NO_YIELD} (no Stanchion_Design.YieldStress, no material yield stress and no "
            "recognised grade in the material name)")


def _section_reasons(r: _Row, resolution_reason: str | None) -> list[str]:
    """The row's reasons, led by why its section cannot be used (none for a broken row)."""
    why = list(r.reasons)
    broken = r.profile_origin == BROKEN
    if r.spec is None and not broken:
        body = (f"the Body is an {r.body_kind}, from which no section is read" if r.body_kind
                else "no Body extrusion found")
        why.insert(0, f"no profile (no material profile set and {body})")
    elif resolution_reason and not broken:
        why.insert(0, resolution_reason)
    return why


def _repeated_global_ids(rows: list[_Row], reasons: list[str | None]) -> list[str]:
    """Model-level messages for GlobalIds several elements share; those members not checked.

    A GlobalId is an element's identity (reports, baselines and load tables are keyed by
    it): elements sharing one are never checked, whatever else is wrong with them, and the
    model gets one message per repeated id (docs/design.md §5).
    """
    counts = Counter(r.gid for r in rows)
    if len(counts) == len(rows):  # the common case: one Counter, nothing else
        return []
    groups: dict[str, list[int]] = {}
    for i, r in enumerate(rows):
        if counts[r.gid] > 1:
            groups.setdefault(r.gid, []).append(i)
    messages = []
    for gid, where in groups.items():
        n = len(where)
        why = f"GlobalId {gid} is used by {n} elements"
        for i in where:
            reasons[i] = why if reasons[i] is None else f"{why}; {reasons[i]}"
        tags = ", ".join(f"#{rows[i].element.id()}" for i in where[:5])
        messages.append(f"{why} ({tags}{', ...' if n > 5 else ''}): none of them is checked; "
                        "give each element its own GlobalId")
    return messages


def _material_classes(rows: list[_Row]) -> list[str]:
    """Each row's material class (steel, concrete ...), once per shared material info.

    An element sharing its GlobalId with another is "unknown" whatever its material: it is
    not checked for the repeated id (docs/design.md §5), never skipped.
    """
    known: dict[int, str] = {}
    out = []
    for r in rows:
        key = id(r.material)
        if key not in known:
            known[key] = element_class(r.material)
        out.append(known[key])
    if len({r.gid for r in rows}) != len(rows):
        counts = Counter(r.gid for r in rows)
        out = [UNKNOWN if counts[r.gid] > 1 else c for r, c in zip(rows, out, strict=True)]
    return out


def read_columns(
    model: ifcopenshell.file,
    *,
    include_members: bool = False,
    loads_table: LoadTable | None = None,
    analysis_members: bool = False,
    force_unit: GivenUnit | None = None,
    default_grade: str | None = None,
    default_grade_option: str = "--default-grade",
) -> ReadResult:
    """Read every column of an IFC2X3 / IFC4 / IFC4X3 model into a member table.

    Args:
        model: an opened model (:func:`ifc_bridge.model.open_model`); not modified.
        include_members: also read IfcMember elements whose predefined type (own or of
            their type) is STRUT or POST.
        analysis_members: also read the vertical IfcStructuralCurveMembers tied to no
            column (they are read anyway when the model has no column to read).
        loads_table: optional load table, already parsed by the front end
            (``service.load_table.read_load_table``); its rows are matched to the columns
            by element or, for a column load schedule, by grid location and storey
            (:func:`ifc_bridge.loads.match_table`).
        force_unit: the unit the model's forces are read in when it declares none
            (``--force-unit``; :func:`ifc_bridge.units.read_units`).
        default_grade: the grade assumed for members whose materials name steel but no
            grade (``--default-grade``; :func:`ifc_bridge.materials.assumed_grade`); never
            for members without a material.
        default_grade_option: how the messages name where the default grade was given
            (``--default-grade``, or a front end's words such as ``the job's default_grade``).

    Returns:
        :class:`ReadResult`.

    Raises:
        TypeError: ``loads_table`` is a path (parse it first).
        ModelReadError: the model declares no force unit and the load table has columns
            without a unit, or the model carries forces of its own (units are never guessed).
    """
    if isinstance(loads_table, str | PurePath):
        raise TypeError("read_columns takes a parsed load table "
                        "(service.load_table.read_load_table), not a path")
    # The read creates many small, acyclic objects; the cyclic garbage collector's repeated
    # scans of them would cost about a third of the run on large models.
    was_enabled = gc.isenabled()
    gc.disable()
    try:
        return _read(model, include_members, loads_table, analysis_members, force_unit,
                     default_grade, default_grade_option)
    finally:
        if was_enabled:
            gc.enable()


def _analysis_message(n: int, beside_columns: bool) -> str:
    """The run message of analysis members read as columns (docs/design.md §5)."""
    what = f"{n} vertical IfcStructuralCurveMember"
    if beside_columns:
        return f"{what} tied to no column are checked as columns (--analysis-members)"
    return (f"the model has no column to read: its {what} (analysis members) are checked as "
            "columns, with their own analysis results as loads")


def _unitless_table_message(table: LoadTable) -> str:
    """The refusal of a load table without units for a model that declares no force unit.

    Args:
        table: the load table (some of its columns name no unit).

    Returns:
        One line naming the columns and the two fixes.
    """
    kinds = [k for k in LOAD_TYPES if k in table.to_kip and table.to_kip[k] is None]
    return (f"load table {table.label}: column(s) {', '.join(kinds)} name no unit and the "
            "model declares no force unit; units are never guessed: write the unit in the "
            f"header ('{kinds[0]} [kN]') or give --force-unit (an HTTP job's force_unit "
            "field)")


def _name_grid_locations(model: ifcopenshell.file, index: RelationIndex, rows: list[_Row],
                         length_to_inch: float) -> list[str]:
    """Set each row's grid location (:mod:`ifc_bridge.grids`); the grids' run messages."""
    grids, messages = read_grids(model, index)
    names = GridNamer(grids, length_to_inch).names(
        [r.x for r in rows], [r.y for r in rows], [r.storey for r in rows])
    for r, grid_name in zip(rows, names, strict=True):
        r.grid = grid_name
    return messages


def _read(model: ifcopenshell.file, include_members: bool,
          table: LoadTable | None, analysis_members: bool = False,
          force_unit: GivenUnit | None = None, default_grade: str | None = None,
          default_grade_option: str = "--default-grade") -> ReadResult:
    units = read_units(model, force_unit)
    if table is not None and table.uses_model_unit and not units.declared["force"]:
        raise ModelReadError(_unitless_table_message(table))
    reader = _Reader(model, units, default_grade, default_grade_option)
    elements = select_elements(model, reader.index, include_members)
    messages = [m for m in [skipped_members(model, reader.index)] if m] if include_members else []
    if analysis_members or not elements:
        analysis = analysis_columns(model, reader.index, elements)
        if analysis:
            messages.append(_analysis_message(len(analysis), bool(elements)))
            elements = elements + analysis
    if not elements:
        what = "IfcColumn or STRUT / POST IfcMember" if include_members else "IfcColumn"
        messages.append(f"model has no {what}")
    else:
        units.note_use("length")
    rows = [_safe_row(reader, e) for e in elements]
    reader.release_walk_caches()
    grid_messages = _name_grid_locations(model, reader.index, rows, units.length)

    requests = []
    for r in rows:
        spec = r.spec or ProfileSpec("none", None, None, problem="no profile")
        requests.append(SectionRequest(spec, material_standard(r.material.materials)))
    res = resolve_sections(requests)

    matched = None
    if table is not None:
        places = Places([r.grid for r in rows], [r.storey for r in rows],
                        [skip_reason(c) is None for c in _material_classes(rows)])
        matched = match_table(table, units.force, [r.gid for r in rows],
                              [r.tag for r in rows], [r.element.Name for r in rows], places)
        if table.uses_model_unit:
            units.note_use("force")
    cols = _Columns.empty(len(rows))
    for i, r in enumerate(rows):
        cols.add(i, r, res, reader, matched.by_member.get(i, {}) if matched is not None else None)

    if (refusal := units.refusal()) is not None:
        raise ModelReadError(refusal)  # an undeclared length, pressure or force unit
    messages.extend(_repeated_global_ids(rows, cols.reasons))
    if matched is not None:
        messages.extend(matched.messages)
    messages.extend(reader.analysis.model_messages)
    messages.extend(reader.index.notes)
    messages.extend(grid_messages)
    messages.extend(units.warnings)
    if not rows:
        members = MemberTable.build([], SectionTable.empty(), np.zeros(0, dtype=np.int64),
                                    np.zeros(0), np.zeros(0), extra=cols.extra_arrays())
    else:
        members = MemberTable.build(
            [r.gid for r in rows], res.sections, res.index, cols.fy, cols.length,
            name=[r.name for r in rows],
            section_label=[r.spec.label if r.spec is not None else "" for r in rows],
            lx=cols.unbraced["X"], ly=cols.unbraced["Y"], lz=cols.unbraced["Z"],
            kx=cols.k["X"], ky=cols.k["Y"], kz=cols.k["Z"],
            loads=cols.loads, reason=cols.reasons, messages=cols.messages,
            extra=cols.extra_arrays(), material=_material_classes(rows),
        )
    return ReadResult(
        members=members, messages=messages, force_unit_factor=units.force,
        length_unit_factor=units.length, pressure_unit_factor=units.pressure,
        schema=model.schema_identifier if hasattr(model, "schema_identifier") else model.schema,
        unit_names=dict(units.names), unit_given=dict(units.given),
        unit_given_as=units.given_as,
    )
