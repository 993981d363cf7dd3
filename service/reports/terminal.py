"""What ``stanchion check`` prints for a person: source, counts, worst members, changes.

Builds on :func:`stanchion.service.reports.report.format_summary` (counts and the highest
utilizations) and adds the input line, a per-storey table for models, the baseline comparison
and a closing verdict that matches the exit code.
"""

from __future__ import annotations

from collections import Counter

from stanchion.service.reports.baseline import (
    failed_then_skipped,
    format_changes,
    regressions,
    skipped_warnings,
)
from stanchion.service.reports.report import format_summary

ALL_STOREYS = 12  # up to this many storeys are all listed, in model order
WORST_STOREYS = 10  # otherwise the worst ones, worst first
MAX_MESSAGES = 5


def _source_line(report: dict) -> str | None:
    src = report.get("source")
    if not src:
        return None
    if "schema" in src:
        kind = "columns and members" if src.get("include_members") else "columns"
        loads = f", loads from {src['loads_table']}" if src.get("loads_table") else ""
        return (f"{src['file']} ({src['schema']}): {src['columns']:,} IfcColumn, "
                f"{src['members']:,} {kind} checked{loads}")
    return f"{src['file']}: {src['members']:,} members"


def storey_table(report: dict) -> list[str]:
    """Rows of counts per storey (models only; empty when no member has a storey)."""
    rows = report["members"]
    if not any("storey" in r for r in rows):
        return []
    table: dict[str, Counter] = {}
    worst: dict[str, float] = {}
    for r in rows:
        key = r.get("storey") or "(no storey)"
        table.setdefault(key, Counter())[r["status"]] += 1
        if r.get("utilization") is not None:
            worst[key] = max(worst.get(key, 0.0), r["utilization"])
    keys = list(table)
    if len(keys) > ALL_STOREYS:
        keys = sorted(keys, key=lambda k: (-table[k]["fail"], -table[k]["not_checked"],
                                           -worst.get(k, 0.0)))[:WORST_STOREYS]
    lines = [f"  {'storey':<24} {'members':>7} {'pass':>6} {'fail':>6} {'n/c':>6} "
             f"{'skip':>6} {'max util':>8}"]
    for key in keys:
        c = table[key]
        u = f"{worst[key]:.3f}" if key in worst else "-"
        lines.append(f"  {key[:24]:<24} {sum(c.values()):>7} {c['pass']:>6} {c['fail']:>6} "
                     f"{c['not_checked']:>6} {c['skipped']:>6} {u:>8}")
    if len(table) > len(keys):
        lines.append(f"  (the {len(keys)} worst of {len(table)} storeys)")
    return lines


def nothing_checked(report: dict) -> bool:
    """True when no member got a verdict (none passed, none failed): never a green run.

    Such a run exits 1 whatever ``--allow-not-checked`` and ``--fail-on`` say
    (docs/design.md §4).
    """
    s = report["summary"]
    return not (s["pass"] or s["fail"])


def nothing_checked_line(report: dict) -> str:
    """The line saying that nothing was checked (stderr and the closing line).

    Skipped members (not steel) are named apart: a model of concrete columns only has
    nothing to check, and that is never a green run either (docs/design.md §4).
    """
    s = report["summary"]
    n, skipped = s["not_checked"], s.get("skipped", 0)
    if n and skipped:
        return (f"nothing was checked: of {n + skipped} members, {n} not checked and "
                f"{skipped} skipped (not steel)")
    what = "not checked" if n or not skipped else "skipped (not steel)"
    if n + skipped == 1:
        return f"nothing was checked: the only member is {what}"
    return (f"nothing was checked: all {n + skipped} members are {what}" if n + skipped
            else "nothing was checked: no members")


def verdict(report: dict, fail_on: str = "any", allow_not_checked: bool = False) -> str:
    """The closing line; agrees with :func:`stanchion.service.cli.check.exit_code`."""
    s = report["summary"]
    if nothing_checked(report):
        return f"result: FAIL ({nothing_checked_line(report)})"
    if fail_on == "new-failures" and "changes" in report:
        n = regressions(report["changes"], allow_not_checked)
        vanished = len(failed_then_skipped(report["changes"]))
        aside = f", {vanished} of them failing before and skipped now" if vanished else ""
        return (f"result: FAIL ({n} regressions against the baseline{aside})" if n
                else "result: PASS (no regressions against the baseline)")
    nc = 0 if allow_not_checked else s["not_checked"]
    skipped = s.get("skipped", 0)
    aside = f"; {skipped} skipped, not steel" if skipped else ""
    if s["fail"] or nc:
        parts = ([f"{s['fail']} failing"] if s["fail"] else []) + (
            [f"{nc} not checked"] if nc else [])
        return f"result: FAIL ({', '.join(parts)}{aside})"
    return f"result: PASS ({skipped} skipped, not steel)" if skipped else "result: PASS"


def format_run(report: dict, fail_on: str = "any", allow_not_checked: bool = False) -> str:
    """The full terminal text of one check run."""
    lines = []
    source = _source_line(report)
    if source:
        lines.append(source)
    lines.append(format_summary(report))
    table = storey_table(report)
    if table:
        lines.append("by storey:")
        lines.extend(table)
    messages = report.get("messages") or []
    for m in messages[:MAX_MESSAGES]:
        lines.append(f"note: {m}")
    if len(messages) > MAX_MESSAGES:
        lines.append(f"note: ... and {len(messages) - MAX_MESSAGES} more (see the report)")
    if "changes" in report:
        lines.append(format_changes(report["changes"]))
    lines.append(verdict(report, fail_on, allow_not_checked))
    return "\n".join(lines)


def warnings(report: dict, allow_not_checked: bool = False) -> list[str]:
    """Warnings for stderr.

    Members skipped now that were checked in the baseline (``changes.new_skipped``, with
    their reason), then not-checked members when they are allowed (with reason counts).
    """
    lines: list[str] = []
    if report.get("changes"):
        why = {m["id"]: m.get("reason", "") for m in report["members"]
               if m["status"] == "skipped"}
        lines = skipped_warnings(report["changes"], why)
    if not allow_not_checked or not report["summary"]["not_checked"]:
        return lines
    reasons = Counter(m.get("reason") or "no reason given" for m in report["members"]
                      if m["status"] == "not_checked")
    top = "; ".join(f"{n} x {r}" for r, n in reasons.most_common(3))
    more = f"; {len(reasons) - 3} other reasons" if len(reasons) > 3 else ""
    return [*lines,
            f"{report['summary']['not_checked']} members not checked (allowed): {top}{more}"]
