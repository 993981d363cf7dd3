"""``--default-grade``: the grade assumed for steel whose material names none (docs/design.md §4).

The option (an HTTP job's ``default_grade``) is read by the engine's grade table
(:func:`stanchion.engine.materials.names_grade`); an unknown grade is refused before
anything is read.  The reader applies it only to members whose materials name steel but no
grade (:func:`stanchion.ifc_bridge.materials.ungraded_steel`); this module states the
assumption in the run's messages and design basis, so every output carries it.
"""

from __future__ import annotations

from typing import Any

from stanchion.engine.materials import names_grade
from stanchion.engine.members import MemberTable
from stanchion.service.errors import InputError

#: The ``fy_source`` of a member whose yield stress came from ``--default-grade``.
DEFAULT_GRADE_SOURCE = "default_grade"


def given_default_grade(grade: str | None, option: str = "--default-grade") -> str | None:
    """The grade as given (stripped), None when not given.

    Args:
        grade: a grade as the grade table reads it (``A992``, ``S355``, ``345 MPa`` ...).
        option: how the message names the option.

    Raises:
        InputError: the text names no grade of the table (one line naming ``option``).
    """
    if grade is None:
        return None
    text = grade.strip()
    if not (0 < len(text) <= 60 and names_grade(text)):
        raise InputError(f"{option}: {grade[:60]!r} names no grade stanchion reads (e.g. "
                         "A992, A572 Gr 50, S355, 300PLUS, Q355 or a stress such as 345 MPa; "
                         "docs/design.md §8)")
    return text


def state_default_grade(report: dict[str, Any], members: MemberTable, grade: str,
                        option: str = "--default-grade") -> None:
    """Add the run message and, when it was used, the design-basis clause of the assumption.

    Args:
        report: the report being built (``messages``, ``design_basis``).
        members: the member table read (``extra["fy_source"]``).
        grade: the ``--default-grade`` given.
        option: how the messages name the option (``--default-grade``, or a front end's
            words such as ``the job's default_grade``).
    """
    sources = members.extra.get("fy_source")
    used = 0 if sources is None else sum(1 for s in sources.tolist() if s == DEFAULT_GRADE_SOURCE)
    if not used:
        report["messages"].append(
            f"{option} {grade} was not used: no member's material names steel "
            "without a grade")
        return
    report["messages"].append(
        f"{option} {grade} assumed for {used} member(s) whose material names steel "
        "but no grade (each member's messages give its Fy); members without a material are "
        "never assumed steel")
    report["design_basis"] = (f"{report['design_basis']}; Fy of steel naming no grade "
                              f"assumed from {option} {grade}")
