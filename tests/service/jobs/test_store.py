"""The job table keeps the options a job was started with; older tables still read (§6)."""

from __future__ import annotations

import sqlite3
from pathlib import Path

from stanchion.service.jobs.store import JobStore

#: The job table as servers before the options column created it.
OLD_SCHEMA = """
CREATE TABLE jobs (
    id TEXT PRIMARY KEY, status TEXT NOT NULL, error TEXT, created TEXT NOT NULL,
    started TEXT, finished TEXT, filename TEXT NOT NULL, design_method TEXT NOT NULL,
    has_loads INTEGER NOT NULL DEFAULT 0, summary TEXT
);
"""
OLD_ID = "a" * 32


def test_options_are_stored_and_shown(tmp_path: Path) -> None:
    store = JobStore(tmp_path)
    options = {"force_unit": "kN", "default_grade": "A992", "analysis_members": True,
               "loads": "loads.csv", "takedown": None}
    store.add("b" * 32, filename="m.ifc", design_method="ASD", has_loads=True,
              options=options)
    job = store.get("b" * 32)
    assert job is not None and job.options == options
    assert job.public()["options"] == options


def test_a_table_from_before_the_options_still_reads(tmp_path: Path) -> None:
    con = sqlite3.connect(tmp_path / "jobs.sqlite3")
    con.executescript(OLD_SCHEMA)
    con.execute("INSERT INTO jobs (id, status, created, filename, design_method, has_loads) "
                "VALUES (?, 'done', '2026-01-01T00:00:00.000Z', 'old.ifc', 'LRFD', 0)",
                (OLD_ID,))
    con.commit()
    con.close()
    store = JobStore(tmp_path)
    old = store.get(OLD_ID)
    assert old is not None and old.options is None and old.filename == "old.ifc"
    assert old.public()["options"] is None
    store.add("c" * 32, filename="new.ifc", design_method="LRFD", has_loads=False,
              options={"force_unit": None, "default_grade": None, "analysis_members": False,
                       "loads": None, "takedown": None})
    assert store.get("c" * 32).options["analysis_members"] is False  # type: ignore[union-attr]
    JobStore(tmp_path)  # opening it again adds nothing twice
