"""The terminal text of a check run: storey table, verdict, warnings (hand-made reports)."""

from __future__ import annotations

from stanchion.service.reports.terminal import format_run, storey_table, verdict, warnings


def _report(rows: list[tuple[str, str, float | None]]) -> dict:
    members = [{"id": f"id{i}", "name": f"C{i}", "section": "W14X48", "status": s,
                "utilization": u, "required_strength": None if u is None else u * 100,
                "available_strength": None if u is None else 100.0, "storey": storey,
                "messages": [], **({"reason": "no loads"} if s == "not_checked" else {})}
               for i, (storey, s, u) in enumerate(rows)]
    return {
        "design_basis": "AISC 360-22 Chapter E, LRFD; ASCE 7-22 combinations",
        "units": {"force": "kip", "length": "ft", "stress": "ksi"},
        "summary": {"members": len(rows), "pass": sum(r[1] == "pass" for r in rows),
                    "fail": sum(r[1] == "fail" for r in rows),
                    "not_checked": sum(r[1] == "not_checked" for r in rows),
                    "max_utilization": None},
        "messages": [],
        "members": members,
    }


def test_storey_table_counts_per_storey_in_model_order() -> None:
    lines = storey_table(_report([("L1", "pass", 0.5), ("L2", "fail", 1.2),
                                  ("L2", "not_checked", None), ("L1", "pass", 0.7)]))
    assert lines[1].split() == ["L1", "2", "2", "0", "0", "0", "0.700"]
    assert lines[2].split() == ["L2", "2", "0", "1", "1", "0", "1.200"]


def test_many_storeys_show_the_worst_first() -> None:
    rows = [(f"L{k}", "pass", 0.1 + k / 100) for k in range(30)] + [("L5", "fail", 1.5)]
    lines = storey_table(_report(rows))
    assert lines[1].split()[0] == "L5"  # the one with a failure leads
    assert lines[-1] == "  (the 10 worst of 30 storeys)"


def test_verdict_agrees_with_the_exit_rule() -> None:
    report = _report([("L1", "pass", 0.5), ("L1", "not_checked", None)])
    assert verdict(report) == "result: FAIL (1 not checked)"
    assert verdict(report, allow_not_checked=True) == "result: PASS"
    assert warnings(report, allow_not_checked=True) == [
        "1 members not checked (allowed): 1 x no loads"]
    assert warnings(report) == []
    assert format_run(report).endswith("result: FAIL (1 not checked)")
