"""The members request (docs/design.md §2): pydantic models shared by the CLI and the HTTP API."""

from __future__ import annotations

from collections import Counter
from typing import Annotated, Literal, get_args

from pydantic import BaseModel, ConfigDict, Field, Strict, field_validator, model_validator

from stanchion.engine import plausibility as limits
from stanchion.engine.catalog import normalize_designation
from stanchion.engine.members import LOAD_TYPES
from stanchion.engine.units import FORCE_UNITS, LENGTH_UNITS, STRESS_UNITS, factor

#: The unit names a request and its report may use (the engine's unit tables, spelled out so
#: that the type checker and the JSON Schema see them alike).
ForceUnit = Literal["kip", "kN", "N", "lbf", "MN"]
LengthUnit = Literal["ft", "in", "m", "mm"]
StressUnit = Literal["ksi", "MPa", "psi", "Pa"]
for _alias, _table in ((ForceUnit, FORCE_UNITS), (LengthUnit, LENGTH_UNITS),
                       (StressUnit, STRESS_UNITS)):
    if set(get_args(_alias)) != set(_table):  # pragma: no cover - a unit added on one side
        raise ImportError(f"unit names out of step with stanchion.engine.units: {_alias}")
#: A number of the request: a JSON number, never a boolean (``true`` is not 1) nor a string;
#: pydantic's strict mode per field, so refusing costs nothing on the hot path.  An integer
#: is taken as a float; NaN and infinities are refused by ``allow_inf_nan=False``.
Number = Annotated[float, Strict()]
#: A whole number of the request, never a boolean.
Count = Annotated[int, Strict()]
#: Most entries a member's ``candidates`` list may hold (docs/design.md §2; our choice): far
#: more than a list written by hand needs (the catalog has 14 families; ``W14`` names one
#: depth of one), small enough that one request cannot make suggestions cost seconds of
#: server time (100,000 entries took 14 s, issue 13).
MAX_CANDIDATES = 200


def _in_smallest(internal_max: float, internal: str, smallest: str) -> float:
    """A plausibility maximum (engine units) in the request's smallest unit of its kind."""
    return internal_max * factor(internal, smallest)


#: Upper bounds of the request's numbers (docs/design.md §2).  A request's unit is chosen by
#: the request, so a schema bound must hold in every unit: each is the largest value the
#: engine's plausibility limits (:mod:`stanchion.engine.plausibility`, the one source) allow,
#: written in the unit that gives the largest number (Pa, mm, N).  A larger number is
#: implausible in every unit and refused whole (HTTP 422, exit 2, naming the field); a
#: smaller one may still be implausible in the request's unit and is then reported not
#: checked ("implausible ...: check the units").
MAX_STRESS_FY = _in_smallest(limits.FY_MAX, "ksi", "pascal")  # 120 ksi = 827.4 MPa
MAX_STRESS_E = _in_smallest(limits.E_MAX, "ksi", "pascal")  # 34,800 ksi = 239.9 GPa
MAX_LENGTH = _in_smallest(limits.LENGTH_MAX, "inch", "millimeter")  # 200 ft = 60,960 mm
MAX_DIMENSION = _in_smallest(limits.DEPTH_MAX, "inch", "millimeter")  # 120 in = 3,048 mm
MAX_FORCE = _in_smallest(limits.LOAD_MAX, "kip", "newton")  # 100,000 kip = 444.8 MN
#: Bounds the plausibility limits do not cover (our choice, common practice, no source):
#: an effective length factor (AISC 360-22 Commentary Table C-A-7.1 recommends up to 2.1;
#: sway frames can need more; beyond 20 the member is no column), a load factor of a custom
#: combination (ASCE 7-22 §2.3 factors are 0.9 to 1.6), the utilization suggestions must
#: meet, and the nominal depths of ``selection`` (inches, the catalog's deepest shape is
#: 44 in; :data:`engine.plausibility.DEPTH_MAX`).
MAX_K = 20.0
MAX_FACTOR = 10.0
MAX_UTILIZATION = 10.0
MAX_NOMINAL_DEPTH = limits.DEPTH_MAX
ProfileShape = Literal["I", "RECT_HOLLOW", "CIRC_HOLLOW", "T", "U", "RECT", "CIRCLE"]


class _Strict(BaseModel):
    # Unknown fields are refused; so are NaN and infinite numbers (a JSON 1e400 is infinite).
    model_config = ConfigDict(extra="forbid", allow_inf_nan=False)


class Units(_Strict):
    """Units of every number in the request and in its report."""

    force: ForceUnit = "kip"
    length: LengthUnit = "ft"
    stress: StressUnit = "ksi"


LoadType = Literal[LOAD_TYPES]  # type: ignore[valid-type]
#: Axial service load effects by type (a plain mapping: validated faster than a model).
Loads = dict[LoadType, Annotated[Number, Field(ge=-MAX_FORCE, le=MAX_FORCE)] | None]


class Profile(_Strict):
    """Parametric cross-section dimensions, for sections not in the catalog.

    Dimensions are in ``unit`` (default: the request's length unit).  Which are needed
    depends on ``shape``: I, T, U: d, bf, tw, tf (r optional root radius); RECT_HOLLOW: h,
    b, t (r optional outer corner radius); CIRC_HOLLOW: D, t; RECT: h, b; CIRCLE: D.

    A tube's ``t`` is its nominal wall.  The design wall follows the member's ``grade``
    (:func:`engine.tubes.design_wall`, AISC 360-22 §B4.2): ASTM A500 / A53 0.93 t; A1085,
    A1065, EN 10210 and EN 10219 t; no grade or an unknown standard 0.93 t, conservatively,
    with a message saying so.
    """

    shape: ProfileShape
    unit: LengthUnit | None = None
    d: Number | None = Field(None, gt=0, le=MAX_DIMENSION)
    bf: Number | None = Field(None, gt=0, le=MAX_DIMENSION)
    tw: Number | None = Field(None, gt=0, le=MAX_DIMENSION)
    tf: Number | None = Field(None, gt=0, le=MAX_DIMENSION)
    r: Number | None = Field(None, ge=0, le=MAX_DIMENSION)
    h: Number | None = Field(None, gt=0, le=MAX_DIMENSION)
    b: Number | None = Field(None, gt=0, le=MAX_DIMENSION)
    t: Number | None = Field(None, gt=0, le=MAX_DIMENSION)
    D: Number | None = Field(None, gt=0, le=MAX_DIMENSION)

    @model_validator(mode="after")
    def _has_dimensions(self) -> Profile:
        need = {
            "I": ("d", "bf", "tw", "tf"), "T": ("d", "bf", "tw", "tf"),
            "U": ("d", "bf", "tw", "tf"), "RECT_HOLLOW": ("h", "b", "t"),
            "CIRC_HOLLOW": ("D", "t"), "RECT": ("h", "b"), "CIRCLE": ("D",),
        }[self.shape]
        missing = [k for k in need if getattr(self, k) is None]
        if missing:
            raise ValueError(f"profile {self.shape} needs {', '.join(missing)}")
        return self


class Member(_Strict):
    """One member to check (docs/design.md §2)."""

    id: str = Field(min_length=1)
    name: str | None = None
    section: str | None = None
    profile: Profile | None = None
    grade: str | None = Field(
        None, min_length=1, description="material grade / product standard, e.g. "
        "'A500 Gr. C', 'A1085', 'A992', 'S355J2H EN 10210': decides a tube's design wall "
        "(AISC 360-22 §B4.2; without it, 0.93 t with a message) and, when fy is absent, "
        "gives the specified minimum yield stress (stated in the member's messages)")
    fy: Number | None = Field(
        None, le=MAX_STRESS_FY,
        description="yield stress, stress unit; absent: from grade (if it names one)")
    length: Number | None = Field(None, le=MAX_LENGTH)
    kx: Number = Field(1.0, le=MAX_K)
    ky: Number = Field(1.0, le=MAX_K)
    kz: Number = Field(1.0, le=MAX_K)
    lx: Number | None = Field(None, le=MAX_LENGTH)
    ly: Number | None = Field(None, le=MAX_LENGTH)
    lz: Number | None = Field(None, le=MAX_LENGTH)
    loads: Loads | None = Field(
        None, description="axial service load effects by type (D, L, Lr, S, R, W, E), force "
        "unit, compression positive; W and E are reversible; absent or null: none")
    required_strength: Number | None = Field(None, ge=-MAX_FORCE, le=MAX_FORCE)
    candidates: list[str] | None = Field(
        None, max_length=MAX_CANDIDATES,
        description=f"families (W12, HSS) or designations to suggest sections from; at most "
        f"{MAX_CANDIDATES}, repeats (as designations compare: case and spaces ignored) dropped")
    max_utilization: Number | None = Field(
        None, gt=0, le=MAX_UTILIZATION,
        description="reserve margin for suggestions (default 1.0)")

    @field_validator("candidates")
    @classmethod
    def _distinct_candidates(cls, v: list[str] | None) -> list[str] | None:
        # The first spelling of each designation or family is kept, in the order given.
        if v is None or len(v) < 2:
            return v
        keys = list(map(normalize_designation, v))
        if len(set(keys)) == len(keys):
            return v
        first = dict(zip(reversed(keys), reversed(v), strict=True))  # the first spelling wins
        return [first[k] for k in dict.fromkeys(keys)]


class CombinationSpec(_Strict):
    """A custom load combination: factors by load type."""

    name: str = Field(min_length=1)
    factors: dict[str, Annotated[Number, Field(ge=-MAX_FACTOR, le=MAX_FACTOR)]]

    @field_validator("factors")
    @classmethod
    def _known_types(cls, v: dict[str, float]) -> dict[str, float]:
        unknown = [k for k in v if k not in LOAD_TYPES]
        if unknown:
            raise ValueError(
                f"unknown load type(s) {', '.join(unknown)}; expected {', '.join(LOAD_TYPES)}"
            )
        if not v:
            raise ValueError("a combination needs at least one factor")
        return v


class SelectionOptions(_Strict):
    """Limits for section suggestions (members that carry ``candidates``)."""

    min_depth: Number | None = Field(None, ge=0, le=MAX_NOMINAL_DEPTH,
                                     description="smallest nominal depth, in")
    max_depth: Number | None = Field(None, gt=0, le=MAX_NOMINAL_DEPTH,
                                     description="largest nominal depth, in")
    max_suggestions: Count = Field(5, ge=1, le=100)


class MembersRequest(_Strict):
    """The whole request: ``stanchion check members.json`` or ``POST /v1/checks``."""

    design_method: Literal["LRFD", "ASD"] = "LRFD"
    units: Units = Field(default_factory=Units)
    members: list[Member] = Field(min_length=1)
    combinations: list[CombinationSpec] | None = None
    half_live_exception: bool = Field(
        False,
        description="ASCE 7-22 §2.3.1 exception: 0.5L in the combinations with 1.0L "
        "(occupancies with Lo <= 100 psf other than garages and public assembly).",
    )
    detail: bool = Field(False, description="add every combination's value to each member")
    selection: SelectionOptions = Field(default_factory=SelectionOptions)
    E: Number | None = Field(None, gt=0, le=MAX_STRESS_E,
                             description="modulus of elasticity, stress unit")
    G: Number | None = Field(None, gt=0, le=MAX_STRESS_E,
                             description="shear modulus, stress unit (G < E)")

    @field_validator("design_method", mode="before")
    @classmethod
    def _upper(cls, v: object) -> object:
        return v.upper() if isinstance(v, str) else v

    @model_validator(mode="after")
    def _half_live_applies(self) -> MembersRequest:
        # Refused rather than ignored: the engine would otherwise drop it silently.
        if self.half_live_exception and self.design_method == "ASD":
            raise ValueError("half_live_exception is the ASCE 7-22 §2.3.1 strength design "
                             "(LRFD) exception; it does not apply to ASD")
        if self.half_live_exception and self.combinations:
            raise ValueError("half_live_exception changes the default combinations; custom "
                             "combinations carry their own factors")
        return self

    @model_validator(mode="after")
    def _unique_ids(self) -> MembersRequest:
        ids = [m.id for m in self.members]
        if len(set(ids)) < len(ids):  # the common case (no repeats) costs one set()
            dup = sorted(i for i, n in Counter(ids).items() if n > 1)  # linear, not ids.count
            raise ValueError(f"member ids must be unique; repeated: {', '.join(dup)}")
        return self
