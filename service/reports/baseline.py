"""Revision comparison: this run's report against a previous report (``--baseline``).

Members are matched by ``id`` (the GlobalId for IFC models).  The comparison is added to the
report as ``changes``:

- ``new_failures``: ``fail`` now and not ``fail`` before (an added member that fails counts);
- ``fixed``: ``fail`` before, ``pass`` now;
- ``new_not_checked``: ``not_checked`` now and not before (added members included);
- ``new_skipped``: ``skipped`` now (not steel) and ``pass``, ``fail`` or ``not_checked``
  before (a material renamed from steel to concrete, say).  One that *failed* before is a
  regression (:func:`regressions`): a failure never vanishes by relabelling; one that passed
  or was not checked before is a warning only.  Otherwise skipped members enter no list but
  ``added`` and ``removed`` (a member failing before and skipped now is not ``fixed``);
- ``added`` / ``removed``: ids present on one side only (a removed member is no
  regression: it is no longer in the model to fail; an element whose id changed is
  ``removed`` and ``added``, and the added one counts as a new failure when it fails);
- ``utilization_changes``: members checked on both sides whose utilization moved by more than
  the threshold (an absolute difference: 0.05 is five percentage points).

Every entry carries the id, name and both sides' status, utilization and section.  Ids are
the only key: a baseline or a report that repeats one (two IFC elements with one GlobalId) is
refused, never matched by guess.
"""

from __future__ import annotations

import json
from collections import Counter
from pathlib import Path

from stanchion.service.errors import InputError

STATUSES = ("pass", "fail", "not_checked", "skipped")
DEFAULT_THRESHOLD = 0.05


def _bad(path: Path, what: str) -> InputError:
    return InputError(f"baseline {path}: {what}")


def load_baseline(path: Path) -> dict:
    """Read a previous report; InputError (one line) when it is not one.

    Only what the comparison needs is required: a ``members`` list whose entries have a
    unique string ``id``, a known ``status`` and a numeric or null ``utilization``; a
    ``name`` or ``section``, copied into the comparison, must be a string when given.
    """
    path = Path(path)
    try:
        text = path.read_text(encoding="utf-8")
    except (OSError, UnicodeDecodeError) as exc:
        raise _bad(path, f"cannot read it ({getattr(exc, 'strerror', None) or exc})") from None
    try:
        data = json.loads(text)
    except json.JSONDecodeError as exc:
        raise _bad(path, f"not valid JSON (line {exc.lineno}, column {exc.colno}: "
                         f"{exc.msg})") from None
    if not isinstance(data, dict) or not isinstance(data.get("members"), list):
        raise _bad(path, "not a stanchion report (no 'members' list)")
    seen: set[str] = set()
    for k, m in enumerate(data["members"]):
        if not isinstance(m, dict) or not isinstance(m.get("id"), str) or not m["id"]:
            raise _bad(path, f"members[{k}] has no string 'id'")
        if m.get("status") not in STATUSES:
            raise _bad(path, f"members[{k}] ({m['id']}): status must be one of "
                             f"{', '.join(STATUSES)}")
        u = m.get("utilization")
        if u is not None and (isinstance(u, bool) or not isinstance(u, int | float)):
            raise _bad(path, f"members[{k}] ({m['id']}): utilization must be a number or null")
        for key in ("name", "section"):  # copied into the comparison's entries
            if m.get(key) is not None and not isinstance(m[key], str):
                raise _bad(path, f"members[{k}] ({m['id']}): {key} must be a string")
        if m["id"] in seen:
            raise _bad(path, f"member id {m['id']!r} appears twice")
        seen.add(m["id"])
    return data


def _entry(ident: str, before: dict | None, after: dict | None) -> dict:
    either = after or before or {}
    return {
        "id": ident,
        "name": either.get("name", ident),
        "status_before": before.get("status") if before else None,
        "status_after": after.get("status") if after else None,
        "utilization_before": before.get("utilization") if before else None,
        "utilization_after": after.get("utilization") if after else None,
        "section_before": before.get("section") if before else None,
        "section_after": after.get("section") if after else None,
    }


def _refuse_repeated_ids(side: str, ids: list[str]) -> None:
    """InputError naming the ids ``side`` repeats, if any (one set() when none repeats)."""
    if len(set(ids)) == len(ids):
        return
    dup = sorted(i for i, n in Counter(ids).items() if n > 1)
    more = f" and {len(dup) - 5} more" if len(dup) > 5 else ""
    raise InputError(f"cannot compare with the baseline: {side} repeats the member id(s) "
                     f"{', '.join(dup[:5])}{more} (in a model: one GlobalId on several "
                     "elements); give each element its own GlobalId")


def compare(baseline: dict, report: dict, threshold: float = DEFAULT_THRESHOLD,
            baseline_name: str | None = None) -> dict:
    """The ``changes`` object of ``report`` against ``baseline`` (see the module notes).

    Raises:
        InputError: the baseline or the report repeats a member id (one line).
    """
    for side, data in (("baseline", baseline), ("this run's report", report)):
        _refuse_repeated_ids(side, [m["id"] for m in data["members"]])
    old = {m["id"]: m for m in baseline["members"]}
    new = {m["id"]: m for m in report["members"]}
    changes: dict = {
        "baseline": baseline_name,
        "threshold": threshold,
        "new_failures": [], "fixed": [], "new_not_checked": [], "new_skipped": [],
        "added": [], "removed": [], "utilization_changes": [],
    }
    for ident, after in new.items():
        before = old.get(ident)
        s_after = after["status"]
        s_before = before["status"] if before else None
        if before is None:
            changes["added"].append(_entry(ident, None, after))
        if s_after == "fail" and s_before != "fail":
            changes["new_failures"].append(_entry(ident, before, after))
        if s_after == "not_checked" and s_before != "not_checked":
            changes["new_not_checked"].append(_entry(ident, before, after))
        if s_after == "skipped" and s_before not in (None, "skipped"):
            changes["new_skipped"].append(_entry(ident, before, after))
        if s_before == "fail" and s_after == "pass":
            changes["fixed"].append(_entry(ident, before, after))
        if before is not None:
            u0, u1 = before.get("utilization"), after.get("utilization")
            if u0 is not None and u1 is not None and abs(u1 - u0) > threshold:
                entry = _entry(ident, before, after)
                entry["change"] = round(u1 - u0, 4)
                changes["utilization_changes"].append(entry)
    changes["removed"] = [_entry(i, m, None) for i, m in old.items() if i not in new]
    changes["utilization_changes"].sort(key=lambda e: -abs(e["change"]))
    if baseline.get("design_basis") and baseline.get("design_basis") != report.get(
            "design_basis"):
        changes["design_basis_before"] = baseline["design_basis"]
    changes["counts"] = {k: len(changes[k]) for k in (
        "new_failures", "fixed", "new_not_checked", "new_skipped", "added", "removed",
        "utilization_changes")}
    return changes


def failed_then_skipped(changes: dict) -> list[dict]:
    """The ``new_skipped`` entries that failed in the baseline: regressions, always."""
    return [e for e in changes["new_skipped"] if e["status_before"] == "fail"]


def regressions(changes: dict, allow_not_checked: bool = False) -> int:
    """How many members got worse (docs/design.md §4).

    New failures, members that failed in the baseline and are skipped now (whatever
    ``allow_not_checked``), plus newly not-checked members unless allowed.
    """
    n = len(changes["new_failures"]) + len(failed_then_skipped(changes))
    return n if allow_not_checked else n + len(changes["new_not_checked"])


def skipped_warnings(changes: dict, reasons: dict[str, str], limit: int = 10) -> list[str]:
    """One line per ``new_skipped`` member (failed before first), for stderr.

    Args:
        changes: the comparison (:func:`compare`).
        reasons: each member id's reason in this run's report (why it is skipped).
        limit: lines at most; the rest are counted in one more line.
    """
    entries = sorted(changes["new_skipped"], key=lambda e: e["status_before"] != "fail")
    lines = []
    for e in entries[:limit]:
        why = reasons.get(e["id"]) or "no reason given"
        if e["status_before"] == "fail":
            u = e["utilization_before"]
            was = f"failed in the baseline (utilization {u:.3f})" if u is not None else (
                "failed in the baseline")
            tail = "; a regression against the baseline"
        else:
            was = ("passed in the baseline" if e["status_before"] == "pass"
                   else "was not checked in the baseline")
            tail = "; no longer checked"
        lines.append(f"member {e['name']} ({e['id']}) {was} and is skipped now ({why}){tail}")
    if len(entries) > limit:
        lines.append(f"... and {len(entries) - limit} more members skipped now that were "
                     "checked in the baseline (see the report's changes.new_skipped)")
    return lines


def format_changes(changes: dict, limit: int = 10) -> str:
    """Terminal lines: counts, then the first entries of each kind."""
    c = changes["counts"]
    lines = [
        f"changes against {changes.get('baseline') or 'the baseline'}: "
        f"{c['new_failures']} new failures, {c['fixed']} fixed, "
        f"{c['new_not_checked']} newly not checked, {c['new_skipped']} newly skipped, "
        f"{c['added']} added, "
        f"{c['removed']} removed, {c['utilization_changes']} utilization changes "
        f"> {changes['threshold']:g}"
    ]
    if "design_basis_before" in changes:
        lines.append(f"  note: the baseline was checked to {changes['design_basis_before']}")

    def util(x: float | None) -> str:
        return "-" if x is None else f"{x:.3f}"

    for key, label in (("new_failures", "new failure"), ("new_skipped", "skipped now"),
                       ("new_not_checked", "not checked"),
                       ("fixed", "fixed"), ("utilization_changes", "changed"),
                       ("added", "added"), ("removed", "removed")):
        entries = changes[key]
        for e in entries[:limit]:
            lines.append(
                f"  {label:<12} {e['name'][:24]:<24} {e['id'][:22]:<22} "
                f"{util(e['utilization_before']):>6} -> {util(e['utilization_after']):<6} "
                f"{(e['status_before'] or '-'):>11} -> {e['status_after'] or '-'}"
            )
        if len(entries) > limit:
            lines.append(f"  ... and {len(entries) - limit} more {label}")
    return "\n".join(lines)
