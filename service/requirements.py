"""The data a check needs, as an IDS 1.0 document, and reading an IDS for ``--ids``.

``stanchion requirements`` prints the document; ``check MODEL --ids FILE`` reads one with
:func:`load_ids` and validates the model against it (:mod:`stanchion.ifc_bridge.ids_check`).

Built with ifctester (:mod:`ifctester.ids`, :mod:`ifctester.facet`).  What IDS 1.0 can and
cannot say about our inputs (docs/design.md §4, ``stanchion requirements``):

- a profile: IDS has no facet for geometry or profiles, so neither an
  IfcMaterialProfileSetUsage nor a Body extrusion can be required; only a material is
  (specification 1), and the instructions say what the profile must be;
- a grade or a yield stress: IDS cannot join facets with "or", and its property facet reads
  the element's and its type's property sets, never its material's
  (``Pset_MaterialSteel.YieldStress``); so a steel material must *name* a grade or a stress
  (specification 2, an XML Schema pattern approximating our grade table), and
  ``Stanchion_Design.YieldStress``, where given, must be a pressure (specification 4);
- loads: ``Stanchion_Loads`` values must be forces where given, and ``D`` is required with
  ``--loads-in-psets`` (specification 3); analysis results (results of an
  IfcStructuralAnalysisModel linked to the column) and a ``--loads`` table cannot be
  expressed in IDS, so ``D`` is not required by default -- a model loaded that way would
  fail it and still be checked.
"""

from __future__ import annotations

from pathlib import Path
from typing import TYPE_CHECKING, Any

from stanchion.service.errors import InputError
from stanchion.service.reports.files import write_atomic

if TYPE_CHECKING:
    from ifctester.ids import Ids

IFC_VERSIONS = ["IFC2X3", "IFC4", "IFC4X3_ADD2"]
#: XML Schema pattern (implicitly anchored) of material names that say "steel".
STEEL_WORDS = (r".*([Ss]teel|STEEL|[Ss]tahl|STAHL|[Aa]cier|ACIER|[Aa]cero|ACERO|[Ss]taal"
               r"|[Ss]tål).*")
#: XML Schema pattern of material names that name a grade or a stress our grade table
#: reads (docs/design.md §8): ASTM, EN, AS/NZS, CSA, JIS, GB grades, and a number with MPa,
#: N/mm2 or ksi.  An approximation (IDS has no case folding): the check itself reads more.
GRADE_NAMES = (
    r".*(A36|A53|A50[01]|A572|A588|A618|A847|A913|A992|A1085|A1065"
    r"|[Ss]2[0-9]{2}|[Ss][3-9][0-9]{2}|300PLUS|[Gg]rade ?[0-9]{3}|C[0-9]{3}|G40\.21"
    r"|[0-9]{3}W|SS400|SM[0-9]{3}|SN[0-9]{3}|Q[0-9]{3}|[0-9]+ ?([Mm][Pp][Aa]|N/mm2|N/mm²|ksi|KSI))"
    r".*")
#: Columns whose material says steel or names a grade: the ones the check reads as steel.
STEELISH = r"(" + STEEL_WORDS + r")|(" + GRADE_NAMES + r")"
LOADS_PSET, DESIGN_PSET = "Stanchion_Loads", "Stanchion_Design"


def _pattern(text: str) -> Any:
    from ifctester.facet import Restriction

    return Restriction(options={"pattern": text})


def _spec(name: str, identifier: str, description: str, instructions: str) -> Any:
    from ifctester.ids import Specification

    return Specification(name=name, identifier=identifier, description=description,
                         instructions=instructions, ifcVersion=list(IFC_VERSIONS))


def requirements_ids(loads_required: bool = False) -> Ids:
    """The IDS 1.0 document of the data ``stanchion check`` needs of each column.

    Args:
        loads_required: require ``Stanchion_Loads.D`` on every steel column (for models
            that carry their loads in property sets); by default the loads are only checked
            for their data type where given, as analysis results and load tables cannot be
            expressed in IDS.
    """
    from ifctester.facet import Entity, Material, Property
    from ifctester.ids import Ids

    ids = Ids(title="stanchion: data for axial compression checks of steel columns",
              description="What stanchion reads of each IfcColumn: a material carrying its "
              "profile, a steel grade or yield stress, and its loads.",
              purpose="Model check before an AISC 360-22 Chapter E column check",
              milestone="Design")
    material = _spec(
        "Columns carry a material", "stanchion-1",
        "Each column has a material; the section is read from its material profile set.",
        "Associate an IfcMaterialProfileSetUsage (IFC4+) whose profile is an I, tube, pipe, "
        "channel, tee, rectangle or circle, or model the Body as an extrusion of such a "
        "profile. IDS 1.0 cannot require a profile or a geometry, only the material.")
    material.applicability.append(Entity(name="IFCCOLUMN"))
    material.requirements.append(Material(cardinality="required"))

    grade = _spec(
        "Steel columns name a grade or a stress", "stanchion-2",
        "A steel column's material names its grade (A992, S355, 300PLUS ...) or its yield "
        "stress (345 MPa, 50 ksi).",
        "Name the grade in the material's name. A yield stress in Pset_MaterialSteel or "
        "Stanchion_Design.YieldStress is read by the check too, but IDS 1.0 cannot accept "
        "it in place of the name: its property facet does not read material property sets "
        "and facets cannot be joined with 'or'.")
    grade.applicability += [Entity(name="IFCCOLUMN"), Material(value=_pattern(STEEL_WORDS))]
    grade.requirements.append(Material(value=_pattern(GRADE_NAMES), cardinality="required"))

    loads = _spec(
        "Steel columns carry their loads" if loads_required
        else "Steel columns' load properties are forces", "stanchion-3",
        "Stanchion_Loads gives the axial service loads (D" + (" required" if loads_required
        else "") + "; L, Lr, S, R, W, E where they act) as forces, compression positive.",
        "Loads from analysis results in the model or from a --loads table are read by the "
        "check too; IDS 1.0 cannot express either" + (
            ", so such a column fails here and is still checked." if loads_required else
            ", so Stanchion_Loads is not required here (stanchion requirements "
            "--loads-in-psets requires it)."))
    loads.applicability += [Entity(name="IFCCOLUMN"), Material(value=_pattern(STEELISH))]
    loads.requirements.append(Property(
        propertySet=LOADS_PSET, baseName="D", dataType="IFCFORCEMEASURE",
        cardinality="required" if loads_required else "optional"))
    for name in ("L", "Lr", "S", "R", "W", "E"):
        loads.requirements.append(Property(propertySet=LOADS_PSET, baseName=name,
                                           dataType="IFCFORCEMEASURE", cardinality="optional"))

    design = _spec(
        "Column design inputs are typed", "stanchion-4",
        "Where given, Stanchion_Design's unbraced lengths are lengths and its yield stress "
        "a pressure.",
        "Effective length factors KX, KY, KZ may be IfcPositiveRatioMeasure or IfcReal; "
        "IDS 1.0 cannot accept two data types, so they are not listed.")
    design.applicability.append(Entity(name="IFCCOLUMN"))
    for name, data_type in (("UnbracedLengthX", "IFCLENGTHMEASURE"),
                            ("UnbracedLengthY", "IFCLENGTHMEASURE"),
                            ("UnbracedLengthZ", "IFCLENGTHMEASURE"),
                            ("YieldStress", "IFCPRESSUREMEASURE")):
        design.requirements.append(Property(propertySet=DESIGN_PSET, baseName=name,
                                            dataType=data_type, cardinality="optional"))
    ids.specifications += [material, grade, loads, design]
    return ids


def requirements_text(loads_required: bool = False) -> str:
    """The IDS document as XML text (UTF-8 declaration, newline-terminated)."""
    text = str(requirements_ids(loads_required).to_string())
    if not text.startswith("<?xml"):
        text = '<?xml version="1.0" encoding="utf-8"?>\n' + text
    return text if text.endswith("\n") else text + "\n"


def write_requirements(path: Path, loads_required: bool = False) -> None:
    """Write :func:`requirements_text` to ``path``, atomically (InputError when it cannot)."""
    text = requirements_text(loads_required)

    def _w(tmp: Path) -> None:
        tmp.write_text(text, encoding="utf-8")

    try:
        write_atomic(Path(path), _w)
    except OSError as exc:
        raise InputError(f"cannot write {path}: {exc.strerror or exc}") from None


def load_ids(path: Path) -> Ids:
    """Read an IDS file, validated against the IDS 1.0 XML Schema.

    Raises:
        InputError: unreadable, not XML, or not a valid IDS 1.0 document; one line.
    """
    from ifctester import ids as ids_module

    path = Path(path)
    if not path.is_file():
        raise InputError(f"--ids {path}: no such file")
    try:
        return ids_module.open(str(path), validate=True)
    except ids_module.IdsXmlValidationError as exc:
        reason = str(getattr(exc.xml_error, "reason", None) or exc.xml_error).splitlines()[0]
        raise InputError(f"--ids {path}: not a valid IDS 1.0 document: {reason}") from None
    except Exception as exc:  # xmlschema's parse errors: not XML at all
        first = (str(exc).splitlines() or [type(exc).__name__])[0]
        raise InputError(f"--ids {path}: cannot read it as IDS: {first}") from None


def apply_ids(report: dict[str, Any], model: Any, ids: Ids, name: str) -> None:
    """Validate ``model`` against ``ids`` and add the outcome to ``report``.

    Sets the report's ``requirements`` section and, on every member row, ``requirements``:
    the unmet requirements of that element (matched by GlobalId; empty when none).

    Args:
        report: the report of the model's check (docs/design.md §3).
        model: the opened model (an ``ifcopenshell.file``; only read).
        ids: the IDS document (:func:`load_ids`).
        name: the IDS file's name, as the report gives it.

    Raises:
        InputError: ifctester fails on this model or document (one line, no traceback).
    """
    from stanchion.ifc_bridge.ids_check import validate_ids

    try:
        outcome = validate_ids(model, ids)
    except Exception as exc:  # ifctester on a model or document it cannot handle
        first = (str(exc).splitlines() or [""])[0]
        raise InputError(f"--ids {name}: ifctester could not validate the model against it "
                         f"({type(exc).__name__}: {first})") from None
    missing = 0
    for row in report.get("members", []):
        row["requirements"] = list(outcome.missing.get(str(row.get("id")), []))
        missing += bool(row["requirements"])
    report["requirements"] = {
        "ids": name,
        "title": ids.info.get("title") or None,
        "specifications": [
            {"name": s.name, "applicable": s.applicable,
             "failed": s.failed, "passed": s.passed} for s in outcome.specifications],
        "members_missing": missing,
    }


#: Members listed by name in the terminal block; the rest are counted.
TERMINAL_MEMBERS = 5


def requirements_lines(report: dict[str, Any]) -> list[str]:
    """The terminal block of ``--ids``: each specification, then what columns miss."""
    section = report.get("requirements")
    if not section:
        return []
    specs = section["specifications"]
    met = sum(s["passed"] for s in specs)
    lines = [f"IDS {section['ids']}: {met} of {len(specs)} specifications met, "
             f"{section['members_missing']} member(s) miss data"]
    for s in specs:
        mark = "met " if s["passed"] else "MISS"
        lines.append(f"  {mark} {s['name']}: {s['failed']} of {s['applicable']} "
                     "applicable element(s) fail")
    rows = [r for r in report.get("members", []) if r.get("requirements")]
    for row in rows[:TERMINAL_MEMBERS]:
        label = row.get("tag") or row.get("name") or row.get("id")
        more = len(row["requirements"]) - 1
        extra = f" (+{more} more)" if more else ""
        lines.append(f"  {label}: {row['requirements'][0]}{extra}")
    if len(rows) > TERMINAL_MEMBERS:
        lines.append(f"  ... and {len(rows) - TERMINAL_MEMBERS} more member(s): see the "
                     "report's requirements")
    return lines
