"""The load takedown project file (TOML, docs/design.md §5 "Load takedown").

::

    units = "SI"                 # SI: kPa and kN/m3; US: psf and pcf
    [storeys.default]            # every storey not named below
    D = 1.5                      # superimposed dead load on the slabs of the storey
    L = 2.4
    [storeys."Roof"]             # a storey by its name: exactly these values, others 0
    D = 1.0
    Lr = 1.0
    S = 1.5
    [options]
    slab_density = 24.0          # slab self-weight = modelled thickness x density, added to D
    live_load_reduction = true   # ASCE 7-22 section 4.7

Read with :func:`load_project`; :meth:`TakedownProject.level_loads` gives a storey's loads in
engine units (:class:`stanchion.engine.takedown.LevelLoads`).  Numbers are strict (a boolean
or a string is no number; NaN and infinities are refused); unknown keys are refused.
"""

from __future__ import annotations

import tomllib
from pathlib import Path
from typing import Annotated, Literal

from pydantic import BaseModel, ConfigDict, Field, Strict, ValidationError

from stanchion.engine.takedown import LevelLoads, TakedownOptions
from stanchion.engine.units import factor
from stanchion.service.errors import InputError

#: A number of the file: never a boolean nor a string; an integer is taken as a float.
Number = Annotated[float, Strict()]
StrictBool = Annotated[bool, Strict()]
Use = Literal["normal", "heavy", "garage", "assembly"]

#: Upper bounds (our choice, common practice, no source): a floor pressure above 50 kPa
#: (1,044 psf; warehouses and plant rooms stay well below) or a density above 100 kN/m³
#: (637 pcf; steel is 77 kN/m³) is a unit mistake, not a load.
MAX_PRESSURE = {"SI": 50.0, "US": 1000.0}
MAX_DENSITY = {"SI": 100.0, "US": 640.0}
#: ksi per pressure unit and kip/in³ per density unit.
_KSI = {"SI": factor("pascal", "ksi") * 1e3, "US": 1.0 / 144_000.0}
_KCI = {"SI": factor("kilonewton", "kip") / factor("meter", "inch") ** 3,
        "US": 1.0 / 1000.0 / 1728.0}


class _Strict(BaseModel):
    model_config = ConfigDict(extra="forbid", allow_inf_nan=False, frozen=True)


class StoreyLoads(_Strict):
    """Loads of a storey's slabs (kPa or psf by ``units``), each 0 when not given."""

    D: Number = Field(0.0, ge=0.0, description="superimposed dead load")
    L: Number = Field(0.0, ge=0.0, description="floor live load Lo")
    Lr: Number = Field(0.0, ge=0.0, description="roof live load (never reduced)")
    S: Number = Field(0.0, ge=0.0, description="snow load")
    live_load_reduction: StrictBool | None = Field(
        None, description="ASCE 7-22 §4.7 on this storey (default: the options' value)")
    use: Use = Field("normal", description="§4.7.3 heavy, §4.7.4 garage, §4.7.5 assembly")


class Options(_Strict):
    """Project-wide options."""

    slab_density: Number = Field(ge=0.0, description="kN/m³ or pcf; 0: self-weight in D")
    live_load_reduction: StrictBool = Field(
        False, description="ASCE 7-22 §4.7 reduction of L (default off: no reduction)")


class TakedownProject(_Strict):
    """A load takedown project file."""

    units: Literal["SI", "US"]
    storeys: dict[str, StoreyLoads] = Field(default_factory=dict)
    options: Options

    def _check_bounds(self) -> None:
        top_p, top_rho = MAX_PRESSURE[self.units], MAX_DENSITY[self.units]
        unit_p, unit_rho = ("kPa", "kN/m3") if self.units == "SI" else ("psf", "pcf")
        for name, storey in self.storeys.items():
            for key in ("D", "L", "Lr", "S"):
                value = getattr(storey, key)
                if value > top_p:
                    raise InputError(f"storeys.{name}.{key}: {value:g} {unit_p} is more than "
                                     f"{top_p:g} {unit_p}: check the units",
                                     f"storeys.{name}.{key}")
        if self.options.slab_density > top_rho:
            raise InputError(f"options.slab_density: {self.options.slab_density:g} {unit_rho} "
                             f"is more than {top_rho:g} {unit_rho}: check the units",
                             "options.slab_density")

    def storey(self, name: str) -> StoreyLoads | None:
        """The loads of the storey ``name``: its own table, else ``default``, else None."""
        return self.storeys.get(name, self.storeys.get("default"))

    def level_loads(self, name: str) -> LevelLoads | None:
        """The storey's loads in engine units (ksi, kip/in³), or None when none applies.

        Args:
            name: the storey's name as in the model.
        """
        s = self.storey(name)
        if s is None:
            return None
        k = _KSI[self.units]
        allowed = (self.options.live_load_reduction if s.live_load_reduction is None
                   else s.live_load_reduction)
        return LevelLoads(D=s.D * k, L=s.L * k, Lr=s.Lr * k, S=s.S * k,
                          slab_density=self.options.slab_density * _KCI[self.units],
                          live_load_reduction=allowed, use=s.use)

    def slab_only_loads(self) -> LevelLoads:
        """Loads of a storey the file gives none: the slabs' self-weight only."""
        return LevelLoads(slab_density=self.options.slab_density * _KCI[self.units])

    def unused_storeys(self, names: list[str]) -> list[str]:
        """Storeys named in the file that are not in ``names`` (the model's storeys)."""
        return [s for s in self.storeys if s != "default" and s not in names]

    def takedown_options(self) -> TakedownOptions:
        """Engine options with this file's units for messages."""
        return TakedownOptions(units=self.units)


def parse_project(text: str, label: str = "takedown project") -> TakedownProject:
    """A project from TOML text.

    Args:
        text: the file's text.
        label: the file's name, for messages.

    Raises:
        InputError: one line naming the problem (the key at fault).
    """
    try:
        data = tomllib.loads(text)
    except tomllib.TOMLDecodeError as exc:
        raise InputError(f"{label}: not valid TOML: {exc}") from None
    try:
        project = TakedownProject.model_validate(data)
    except ValidationError as exc:
        err = exc.errors()[0]
        key = ".".join(str(p) for p in err["loc"]) or "file"
        more = len(exc.errors()) - 1
        tail = f" (and {more} more)" if more else ""
        raise InputError(f"{label}: {key}: {err['msg']}{tail}", key) from None
    try:
        project._check_bounds()
    except InputError as exc:
        raise InputError(f"{label}: {exc}", exc.field) from None
    return project


def load_project(path: str | Path) -> TakedownProject:
    """Read a project file (TOML, UTF-8).

    Args:
        path: the file.

    Raises:
        InputError: the file cannot be read or is not a usable project (one line).
    """
    p = Path(path)
    try:
        text = p.read_text(encoding="utf-8")
    except (OSError, UnicodeDecodeError) as exc:
        raise InputError(f"cannot read takedown project {p.name}: {exc}") from None
    return parse_project(text, f"takedown project {p.name}")
