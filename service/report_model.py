"""The JSON report and the HTTP response bodies as pydantic models: the contract.

The report is built as plain dicts (``build_report``, then ``source`` and ``changes`` added by
the command line, the model check and the baseline comparison) and serialized with orjson;
nothing on that path builds these models.  They say what those dicts hold:

- the shipped JSON Schema ``service/schemas/report.schema.json`` is generated from
  :class:`Report` by ``tools/generate_schemas.py`` (never edited by hand);
- the tests validate real reports with ``Report.model_validate(report)`` and with the
  generated schema;
- the HTTP app documents its responses with them (:class:`Report`, :class:`JobStatus`,
  :class:`JobAccepted`, :class:`ErrorBody`, :class:`Health`, :class:`SectionList`).

Every model refuses fields it does not name (``additionalProperties: false``) and validates
strictly, as JSON Schema does: a string is not a number, ``true`` is not a count, and NaN or
infinity (which JSON cannot carry) are refused.  A field with a default of None may be left
out; it may be null only where its type says so (``str | None``).  Units are the report's own
(``units``); every strength is in its force unit, every stress in its stress unit.
"""

from __future__ import annotations

from typing import Annotated, Any, Literal

from pydantic import BaseModel, ConfigDict, Field

from stanchion.service.request import ForceUnit, LengthUnit, StressUnit

Status = Literal["pass", "fail", "not_checked", "skipped"]
JobState = Literal["queued", "running", "done", "failed"]
DesignMethod = Literal["LRFD", "ASD"]

Count = Annotated[int, Field(ge=0)]
NonNegative = Annotated[float, Field(ge=0)]


def _tidy(schema: dict[str, Any]) -> None:
    """Drop the per-property titles and ``default: null`` pydantic adds.

    A title repeats the property name; a null default would read as "null is allowed"
    where the property may only be left out.
    """
    for prop in schema.get("properties", {}).values():
        prop.pop("title", None)
        if prop.get("default", ...) is None:
            del prop["default"]


class _Contract(BaseModel):
    """Strict, closed model (see the module notes)."""

    model_config = ConfigDict(extra="forbid", strict=True, allow_inf_nan=False,
                              json_schema_extra=_tidy)


# ------------------------------------------------------------------------------ report


class ReportUnits(_Contract):
    """Units of every number in the report (the request's, or --units for IFC models)."""

    force: ForceUnit = Field(description="force unit of every strength and load effect")
    length: LengthUnit = Field(description="length unit (plan positions, weights per length)")
    stress: StressUnit = Field(description="stress unit (critical stresses)")


class Summary(_Contract):
    """Counts of members by status and the highest utilization."""

    members: Count = Field(description="members in the report")
    pass_: Count = Field(alias="pass", description="members that pass")
    fail: Count = Field(description="members that fail")
    not_checked: Count = Field(description="members not checked (missing or unusable data)")
    skipped: Count = Field(description="members skipped: not steel (concrete, timber, "
                           "aluminium, masonry by their material); no verdict, not a failure")
    max_utilization: NonNegative | None = Field(
        description="highest utilization of the checked members (dimensionless); null when "
        "no member was checked")


class Suggestion(_Contract):
    """A catalog section that carries the member's required strength (lightest first)."""

    section: str = Field(description="catalog designation (AISC Shapes Database v16.0)")
    available_strength: NonNegative = Field(
        description="available strength of the member with this section (phi_c Pn for "
        "LRFD, Pn / Omega_c for ASD), in the report's force unit")
    utilization: NonNegative = Field(
        description="required / available strength with this section (dimensionless)")
    weight: NonNegative = Field(
        description="weight per length in the report's force unit per its length unit "
        "(e.g. kip/ft, kN/m)")


class _MemberResult(_Contract):
    """Fields shared by every report row; IFC-only fields are left out for members files."""

    id: str = Field(min_length=1, description="member id: the request's id, or the "
                    "GlobalId of an IFC element")
    name: str = Field(description="member name (the id when the request gives none)")
    section: str = Field(description="catalog designation, parametric profile label, or "
                         "the section as given when it is unknown")
    required_strength: float | None = Field(
        description="governing combination's compression (LRFD factored, ASD service "
        "level), in the report's force unit; null when the demand is unknown")
    available_strength: NonNegative | None = Field(
        description="phi_c Pn (LRFD) or Pn / Omega_c (ASD), AISC 360-22 Chapter E, in the "
        "report's force unit; null when not computed")
    utilization: NonNegative | None = Field(
        description="required / available strength (dimensionless); null when not computed")
    limit_state: str = Field(description="governing limit state, e.g. 'flexural buckling "
                             "about y'; empty when not checked")
    combination: str = Field(description="governing load combination, or 'required strength "
                             "as given'; empty when none governs or the member is not checked")
    slenderness: NonNegative | None = Field(
        description="governing slenderness Lc/r (dimensionless); null when not computed")
    critical_stress: float | None = Field(
        description="critical stress Fcr in the report's stress unit; null when not computed")
    messages: list[str] = Field(description="notes on this member: defaults used, where "
                                "inputs came from, Lc/r above 200, net tension, ...")
    storey: str | None = Field(None, description="IFC input: the building storey")
    grid: str | None = Field(
        None, description="IFC input: grid location, the U and V axis tags of the nearest "
        "grid intersection ('B-2'), with the offsets along those axes in the model's length "
        "unit when off the intersection ('B-2 (+600, -150 mm)'); null when the model has no "
        "grid or the member no plan position; left out for members files")
    tag: str | None = Field(None, description="IFC input: the element's Tag")
    ifc_class: str | None = Field(None, description="IFC input: the element's IFC class")
    profile_source: str | None = Field(
        None, description="IFC input: where the profile came from (e.g. profile_set/catalog)")
    length_source: str | None = Field(
        None, description="IFC input: where the length came from (e.g. axis)")
    load_source: str | None = Field(
        None, description="IFC input: where the loads came from (e.g. analysis, or none)")
    fy_source: str | None = Field(
        None, description="IFC input: where the yield stress came from (override, material, "
        "grade, default_grade or none)")
    tributary_area: NonNegative = Field(
        None, description="IFC input with --takedown, when the loads come from the takedown: "
        "tributary area carried (this column's and those above it), in the report's length "
        "unit squared")
    llr_factor: NonNegative | None = Field(
        None, description="IFC input with --takedown, when the loads come from the takedown: "
        "L / Lo, the ASCE 7-22 section 4.7 live load reduction factor (1: not reduced); null "
        "when the column carries no floor live load")
    x: float | None = Field(None, description="IFC input: plan position x, in the report's "
                            "length unit")
    y: float | None = Field(None, description="IFC input: plan position y, in the report's "
                            "length unit")
    rotation: float | None = Field(
        None, description="IFC input: plan rotation of the section's x axis (parallel to an "
        "I shape's flanges), degrees counter-clockwise from plan x, [0, 360); null when not "
        "known")
    suggestions: list[Suggestion] = Field(
        None, description="suggested sections, lightest first (members with candidates, or "
        "IFC columns with --suggest)")
    combinations: dict[str, float | None] = Field(
        None, description="detail: every load combination's axial effect (compression "
        "positive) by combination name, in the report's force unit")
    requirements: list[str] = Field(
        None, description="with --ids (IFC input): the IDS requirements this element does "
        "not meet, each '<specification>: <what failed>'; empty when it meets them all")


class CheckedMember(_MemberResult):
    """A member that was checked: it passes or fails, with its numbers."""

    status: Literal["pass", "fail"] = Field(
        description="pass: utilization <= 1; fail: utilization > 1")
    required_strength: NonNegative = Field(
        description="governing combination's compression (LRFD factored, ASD service "
        "level), in the report's force unit; 0 when no combination compresses the member")
    available_strength: NonNegative = Field(
        description="phi_c Pn (LRFD) or Pn / Omega_c (ASD), AISC 360-22 Chapter E, in the "
        "report's force unit")
    utilization: NonNegative = Field(description="required / available strength "
                                     "(dimensionless)")


class NotCheckedMember(_MemberResult):
    """A member with missing or unusable data: never a pass, always with its reason."""

    status: Literal["not_checked"] = Field(description="not checked; see reason")
    reason: str = Field(min_length=1, description="why the member was not checked")


class SkippedMember(_MemberResult):
    """A member that is not steel by its material: no capacity, no verdict, not a failure."""

    status: Literal["skipped"] = Field(description="skipped: not a steel member; see reason")
    reason: str = Field(min_length=1, description="why the member was skipped, e.g. 'not "
                        "steel: concrete'")
    required_strength: None = Field(description="null: a skipped member has no numbers")
    available_strength: None = Field(description="null: not computed")
    utilization: None = Field(description="null: not computed")
    slenderness: None = Field(description="null: not computed")
    critical_stress: None = Field(description="null: not computed")


#: One report row: checked (pass / fail), not checked or skipped, told apart by ``status``.
MemberResult = Annotated[CheckedMember | NotCheckedMember | SkippedMember,
                         Field(discriminator="status")]


class Source(_Contract):
    """What was checked: the input file and, for IFC models, its schema and column count."""

    file: str = Field(description="name of the input file (members JSON or IFC model)")
    members: Count = Field(description="members checked")
    schema_: str = Field(None, alias="schema", description="IFC input: the model's schema "
                         "(IFC2X3, IFC4, IFC4X3)")
    columns: Count = Field(None, description="IFC input: IfcColumn elements in the model")
    include_members: bool = Field(None, description="IFC input: IfcMember elements of type "
                                  "STRUT or POST were checked too")
    analysis_members: bool = Field(None, description="IFC input: vertical "
                                   "IfcStructuralCurveMembers tied to no column were checked "
                                   "too (--analysis-members)")
    loads_table: str | None = Field(None, description="IFC input: name of the CSV load "
                                    "table, null when none was given")
    takedown: str = Field(None, description="IFC input: name of the load takedown project "
                          "file (--takedown), only when one was given")


class ChangeEntry(_Contract):
    """One member in a comparison with the baseline (either side may be absent: null)."""

    id: str = Field(description="member id (GlobalId for IFC models)")
    name: str = Field(description="member name (this run's, else the baseline's)")
    status_before: Status | None = Field(description="status in the baseline")
    status_after: Status | None = Field(description="status now")
    utilization_before: float | None = Field(description="utilization in the baseline")
    utilization_after: float | None = Field(description="utilization now")
    section_before: str | None = Field(description="section in the baseline")
    section_after: str | None = Field(description="section now")


class UtilizationChange(ChangeEntry):
    """A member checked on both sides whose utilization moved by more than the threshold."""

    change: float = Field(description="utilization now minus before (4 decimals)")


class ChangeCounts(_Contract):
    """How many entries each list of the comparison has."""

    new_failures: Count = Field(description="entries in new_failures")
    fixed: Count = Field(description="entries in fixed")
    new_not_checked: Count = Field(description="entries in new_not_checked")
    new_skipped: Count = Field(description="entries in new_skipped")
    added: Count = Field(description="entries in added")
    removed: Count = Field(description="entries in removed")
    utilization_changes: Count = Field(description="entries in utilization_changes")


class Changes(_Contract):
    """Comparison with a previous report (--baseline), by member id (GlobalId for IFC)."""

    baseline: str | None = Field(description="file name of the baseline report, null when "
                                 "it was given as data")
    threshold: NonNegative = Field(description="utilization changes larger than this "
                                   "(absolute difference) are listed")
    new_failures: list[ChangeEntry] = Field(description="fail now, not fail before (added "
                                            "members included)")
    fixed: list[ChangeEntry] = Field(description="fail before, pass now")
    new_not_checked: list[ChangeEntry] = Field(description="not_checked now, not before "
                                               "(added members included)")
    new_skipped: list[ChangeEntry] = Field(
        description="skipped now (not steel) and pass, fail or not_checked before; one that "
        "failed before is a regression for --fail-on new-failures, the others a warning")
    added: list[ChangeEntry] = Field(description="ids only in this report")
    removed: list[ChangeEntry] = Field(description="ids only in the baseline")
    utilization_changes: list[UtilizationChange] = Field(
        description="utilization moved by more than the threshold, largest first")
    design_basis_before: str = Field(None, description="the baseline's design basis, when it "
                                     "differs from this report's")
    counts: ChangeCounts = Field(description="how many entries each list has")


class SpecificationResult(_Contract):
    """One IDS specification against the model."""

    name: str = Field(description="the specification's name")
    applicable: Count = Field(description="elements it applies to")
    failed: Count = Field(description="of those, elements failing a requirement")
    passed: bool = Field(description="the specification holds (its cardinality included)")


class Requirements(_Contract):
    """The model validated against an IDS document (--ids), docs/design.md §3."""

    ids: str = Field(description="name of the IDS file")
    title: str | None = Field(description="the IDS's title; null when it has none")
    specifications: list[SpecificationResult] = Field(description="one per specification, "
                                                       "in the IDS's order")
    members_missing: Count = Field(description="report members with at least one unmet "
                                   "requirement")


class Report(_Contract):
    """Axial compression check report (AISC 360-22 Chapter E), in the report's units."""

    model_config = ConfigDict(title="stanchion check report")

    schema_version: Literal["1"] = Field(description="version of this report format")
    design_basis: str = Field(min_length=1, description="specification, design method and "
                              "load combinations, e.g. 'AISC 360-22 Chapter E, LRFD; ASCE "
                              "7-22 combinations'")
    disclaimer: str = Field(min_length=1, description="the scope and review caution every "
                            "report carries")
    units: ReportUnits = Field(description="units of every number in the report")
    summary: Summary = Field(description="counts by status and the highest utilization")
    messages: list[str] = Field(description="notes on the whole input (e.g. IFC reader "
                                "notes, units added to the model)")
    members: list[MemberResult] = Field(description="one row per member, in input order")
    source: Source = Field(None, description="what was checked (command line and model "
                           "jobs; not in a POST /v1/checks response)")
    changes: Changes = Field(None, description="comparison with a previous report (--baseline "
                             "only)")
    requirements: Requirements = Field(
        None, description="the model validated against an IDS before the check (--ids only)")


# ------------------------------------------------------------------------------ HTTP bodies


class JobOptions(_Contract):
    """The options a model job was started with (the fields of POST /v1/models)."""

    force_unit: str | None = Field(description="the force_unit field as given (stripped); "
                                   "null when not given")
    default_grade: str | None = Field(description="the default_grade field as given "
                                      "(stripped); null when not given")
    analysis_members: bool = Field(description="the analysis_members field")
    loads: str | None = Field(description="the uploaded load table's file name; null "
                              "without one")
    takedown: str | None = Field(description="the uploaded takedown project file's name; "
                                 "null without one")


class JobStatus(_Contract):
    """A model job, as GET /v1/jobs/{id} shows it."""

    job_id: str = Field(pattern=r"^[0-9a-f]{32}$", description="the job id")
    status: JobState = Field(description="queued, running, done or failed")
    error: str | None = Field(description="why the job failed; null otherwise")
    created: str = Field(description="when the upload was accepted (ISO 8601, UTC)")
    started: str | None = Field(description="when a worker started it (ISO 8601, UTC)")
    finished: str | None = Field(description="when it ended (ISO 8601, UTC)")
    filename: str = Field(description="the uploaded model's file name")
    design_method: DesignMethod = Field(description="LRFD or ASD")
    loads: bool = Field(description="a CSV load table was uploaded with the model")
    summary: Summary | None = Field(description="the report's summary once done; null before "
                                    "and on failure")
    options: JobOptions | None = Field(description="the options the job was started with "
                                       "(design_method above); null for a job recorded by "
                                       "a server that did not store them")


class JobAccepted(_Contract):
    """202 of POST /v1/models: the queued job (its URL is also the Location header)."""

    job_id: str = Field(pattern=r"^[0-9a-f]{32}$", description="the job id")
    status: Literal["queued"] = Field(description="always queued")
    url: str = Field(description="where to poll the job: /v1/jobs/{job_id}")


class ErrorDetail(_Contract):
    """One problem with one input field."""

    loc: str = Field(description="the field, dotted (e.g. members.0.fy), or body / request")
    msg: str = Field(description="what is wrong with it")


class ErrorBody(_Contract):
    """Every error response (401, 404, 409, 413, 415, 422, 500)."""

    error: str = Field(description="one line naming the problem")
    details: list[ErrorDetail] = Field(None, description="the fields at fault (validation "
                                       "errors only)")


class Health(_Contract):
    """GET /v1/health: the service answers."""

    status: Literal["ok"] = Field(description="always ok when the service answers")
    version: str = Field(description="stanchion version")


class SectionRow(_Contract):
    """One catalog shape; a property the catalog does not tabulate for its family is null."""

    designation: str = Field(description="AISC designation, e.g. W14X48")
    family: str = Field(description="catalog family, e.g. W, HSS")
    supported: bool = Field(description="Chapter E covers this shape (angles do not)")
    weight: float | None = Field(description="nominal weight, lb/ft")
    A: float | None = Field(description="gross area, in2")
    d: float | None = Field(description="depth, in")
    bf: float | None = Field(description="flange width, in")
    tw: float | None = Field(description="web thickness, in")
    tf: float | None = Field(description="flange thickness, in")
    Ix: float | None = Field(description="moment of inertia about x, in4")
    Iy: float | None = Field(description="moment of inertia about y, in4")
    rx: float | None = Field(description="radius of gyration about x, in")
    ry: float | None = Field(description="radius of gyration about y, in")
    J: float | None = Field(description="torsional constant, in4")
    Cw: float | None = Field(description="warping constant, in6")


class SectionList(_Contract):
    """GET /v1/sections: catalog shapes (AISC Shapes Database v16.0), catalog units."""

    family: str | None = Field(description="the family asked for; null for all shapes")
    count: Count = Field(description="shapes listed")
    units: dict[str, str] = Field(description="unit of each listed property (lb/ft, in, "
                                  "in2, in4, in6)")
    sections: list[SectionRow] = Field(description="the shapes, in catalog order")
