"""``stanchion loads-template MODEL``: the model's column load schedule, loads left empty.

One CSV row per column the check reads (docs/design.md §4): ``grid,level`` (the grid
location, :mod:`stanchion.ifc_bridge.grids`, and the storey name) -- the keys ``check
--loads`` matches on -- then ``GlobalId``, ``Tag`` and ``Name`` for the reader, then one
empty cell per load type with the force unit in its header (``D [kN]``).  The unit:
``--force-unit``, else kN for a model in SI units and kip for one in US customary units
(its declared force unit decides, else its length unit); it is always written in the
header, never implied.  Filled in a spreadsheet and given back to ``check --loads``, every
column whose grid location and level are its own gets the loads of its row.  When a column
has no grid location, or shares its grid location and level with another column, a
schedule could not reach it: the template is then keyed by ``element`` (the GlobalId) with
``grid``, ``level``, ``Tag`` and ``Name`` for the reader, so that every row has a key, and a
line on stderr says why.
"""

from __future__ import annotations

import argparse
import csv
import io
import sys
from collections import Counter
from pathlib import Path

from stanchion.engine.members import LOAD_TYPES
from stanchion.ifc_bridge.errors import ModelReadError
from stanchion.ifc_bridge.model import open_model
from stanchion.ifc_bridge.read import ReadResult, read_columns
from stanchion.ifc_bridge.units import GivenUnit
from stanchion.service.errors import EXIT_OK, InputError
from stanchion.service.load_table import given_force_unit
from stanchion.service.reports.files import write_atomic

REFERENCE = ("GlobalId", "Tag", "Name")
#: Words of IFC SI unit names (IfcSIUnitName) that mark a model in SI units.
_SI_WORDS = ("NEWTON", "METRE", "METER")


def default_unit(read: ReadResult) -> str:
    """The default force unit: kN for a model in SI units, kip for US customary units.

    The model's declared force unit decides; a model that declares none is judged by its
    length unit (which every model read declares).

    Args:
        read: what the reader found (``unit_names``).

    Returns:
        ``"kN"`` or ``"kip"``.
    """
    force = read.unit_names.get("force", "")
    declared = force and "not declared" not in force
    basis = force if declared else read.unit_names.get("length", "")
    return "kN" if any(word in basis.upper() for word in _SI_WORDS) else "kip"


def schedule_text(read: ReadResult, unit: str, by_element: bool = False) -> str:
    """The template as CSV text (a header and one row per member, loads empty).

    Args:
        read: the model's members (grid, storey, GlobalId, Tag, Name).
        unit: the force unit written in every load header.
        by_element: key the rows by GlobalId (``element``) instead of grid and level, with
            grid and level kept for the reader.

    Returns:
        The CSV text, one line per row.
    """
    m = read.members
    extra = m.extra
    buffer = io.StringIO()
    writer = csv.writer(buffer, lineterminator="\n")
    loads = [f"{t} [{unit}]" for t in LOAD_TYPES]
    tags = ["Tag", "Name"]
    writer.writerow(["element", "grid", "level", *tags, *loads] if by_element
                    else ["grid", "level", *REFERENCE, *loads])
    for i in range(len(m)):
        place = [extra["grid"][i] or "", extra["storey"][i] or ""]
        names = [extra["tag"][i] or "", m.name[i]]
        key = [extra["global_id"][i], *place] if by_element else [*place, extra["global_id"][i]]
        writer.writerow([*key, *names, *([""] * len(LOAD_TYPES))])
    return buffer.getvalue()


def unmatchable(read: ReadResult) -> str | None:
    """The warning naming columns a filled template cannot give loads to, or None."""
    extra = read.members.extra
    places = [(g, s) for g, s in zip(extra["grid"].tolist(), extra["storey"].tolist(),
                                     strict=True)]
    shared = Counter(p for p in places if p[0])
    names = read.members.name.tolist()
    gridless = [names[i] for i, p in enumerate(places) if not p[0]]
    twins = [names[i] for i, p in enumerate(places) if p[0] and shared[p] > 1]
    parts = []
    if gridless:
        parts.append(f"{len(gridless)} without a grid location ({', '.join(gridless[:5])}"
                     f"{', ...' if len(gridless) > 5 else ''})")
    if twins:
        parts.append(f"{len(twins)} sharing their grid location and level with another "
                     f"column ({', '.join(twins[:5])}{', ...' if len(twins) > 5 else ''})")
    if not parts:
        return None
    return (f"stanchion: the template is keyed by element (GlobalId), not by grid and level: "
            f"{' and '.join(parts)} could not be matched by grid and level")


def _read_model(path: Path, include_members: bool, force_unit: str | None) -> ReadResult:
    given = given_force_unit(force_unit)
    try:
        model = open_model(path)
        return read_columns(model, include_members=include_members,
                            force_unit=GivenUnit(*given) if given else None)
    except ModelReadError as exc:
        raise InputError(str(exc)) from None


def _output(path: Path, model: Path) -> Path:
    """The ``-o`` path, refused when it names the model or a folder."""
    if path.is_dir():
        raise InputError(f"-o {path}: is a folder")
    if path.exists() and model.exists() and path.resolve() == model.resolve():
        raise InputError(f"-o {path}: names the model; the model is never written")
    return path


def run_loads_template(args: argparse.Namespace) -> int:
    """Write the template to stdout or ``-o``; exit 0 (2 for unusable input)."""
    model = Path(args.model)
    out = _output(Path(args.output), model) if args.output else None
    given = given_force_unit(args.force_unit)  # refused before the model is read
    read = _read_model(model, args.include_members, args.force_unit)
    if not len(read.members):
        raise InputError(f"no columns found in {model.name}: the model has no IfcColumn"
                         + (" or STRUT / POST IfcMember" if args.include_members else ""))
    unit = given[0] if given else default_unit(read)
    warning = unmatchable(read)
    text = schedule_text(read, unit, by_element=warning is not None)
    if out is None:
        sys.stdout.write(text)
    else:
        def write(tmp: Path) -> None:
            tmp.write_text(text, encoding="utf-8")

        try:
            write_atomic(out, write)
        except OSError as exc:
            raise InputError(f"cannot write {out}: {exc.strerror or exc}") from None
    if warning:
        print(warning, file=sys.stderr)
    return EXIT_OK


def add_parser(sub: argparse._SubParsersAction) -> None:
    """Register ``loads-template``."""
    p = sub.add_parser(
        "loads-template",
        help="print the model's column load schedule (grid, level) with empty load cells",
        description="Print a CSV load schedule of the model's columns -- grid location, "
        "level (storey), GlobalId, Tag, Name and one empty cell per load type -- to fill "
        "in a spreadsheet and give to 'check --loads'.",
    )
    p.add_argument("model", help="the IFC model (.ifc, .ifczip, .ifcxml)")
    p.add_argument("-o", "--output", help="write the CSV to this file (atomically) "
                   "instead of stdout")
    p.add_argument("--force-unit", help="force unit of the load columns (kip, kN, ...); "
                   "default kN for a model in SI units, kip for US customary units; also "
                   "the force unit of a model that declares none")
    p.add_argument("--include-members", action="store_true",
                   help="also list IfcMember elements of type STRUT or POST")
    p.set_defaults(func=run_loads_template)
