"""Strict reading (issue 13 item 1): a STEP file cut short is refused, exit 2, one line.

Issue 13 measured ``head -n -7 workshop_annex.ifc`` turning two failing columns into passes
and ``head -c 2000`` giving ``result: PASS`` on nothing (docs/design.md §4, §5).  The damaged
files are made here from the sample model; nothing may be written for them.
"""

from __future__ import annotations

from pathlib import Path

import pytest

from stanchion.service.cli import main

SAMPLE = Path(__file__).resolve().parents[3] / "sample_models" / "workshop_annex.ifc"


def _lines() -> list[bytes]:
    return SAMPLE.read_bytes().splitlines(keepends=True)


def _cut_lines(count: int) -> bytes:
    """The sample without its last ``count`` lines (``head -n -count``)."""
    return b"".join(_lines()[:-count])


def _without_data_endsec() -> tuple[bytes, int]:
    """The sample without the DATA section's ``ENDSEC;``, and END-ISO's line number then."""
    lines = _lines()
    index = max(i for i, line in enumerate(lines) if line.strip() == b"ENDSEC;")
    del lines[index]
    end = next(i for i, line in enumerate(lines) if line.strip() == b"END-ISO-10303-21;")
    return b"".join(lines), end + 1


@pytest.mark.parametrize(("data", "line"), [
    # head -n -7 (the case): the file's last line is then line count - 7
    (_cut_lines(7), len(_lines()) - 7),
    # head -n -1: only END-ISO-10303-21; is missing
    (_cut_lines(1), len(_lines()) - 1),
    # head -c 2000 (the case): the last line is the one byte 2000 falls in
    (SAMPLE.read_bytes()[:2000], SAMPLE.read_bytes()[:2000].count(b"\n") + 1),
])
def test_cut_short_model_is_refused_in_one_line_and_nothing_is_written(
        tmp_path: Path, capsys: pytest.CaptureFixture[str], data: bytes, line: int) -> None:
    path = tmp_path / "cut.ifc"
    path.write_bytes(data)
    report, out = tmp_path / "r.json", tmp_path / "checked.ifc"
    junit = tmp_path / "j.xml"
    code = main(["check", str(path), "--report", str(report), "--out", str(out),
                 "--junit", str(junit), "--quiet"])
    assert code == 2  # docs/design.md §4: unusable input
    err = capsys.readouterr().err
    assert err == (f"stanchion: cannot read {path}: line {line}: the file ends without "
                   "END-ISO-10303-21; (cut short?)\n")
    assert sorted(p.name for p in tmp_path.iterdir()) == ["cut.ifc"]


def test_data_section_without_endsec_is_refused(
        tmp_path: Path, capsys: pytest.CaptureFixture[str]) -> None:
    data, line = _without_data_endsec()
    path = tmp_path / "open.ifc"
    path.write_bytes(data)
    report = tmp_path / "r.json"
    assert main(["check", str(path), "--report", str(report), "--quiet"]) == 2
    err = capsys.readouterr().err
    assert err == (f"stanchion: cannot read {path}: line {line}: END-ISO-10303-21; is not "
                   "preceded by ENDSEC; (the DATA section is not closed)\n")
    assert not report.exists()


def test_comments_and_blank_lines_around_the_trailer_are_accepted(
        tmp_path: Path, capsys: pytest.CaptureFixture[str]) -> None:
    text = SAMPLE.read_bytes().replace(b"END-ISO-10303-21;",
                                       b"/* exported */\n\nEND-ISO-10303-21;\n/* end */\n\n")
    path = tmp_path / "commented.ifc"
    path.write_bytes(text)
    # the sample fails on purpose (sample_models/README.md): exit 1, not the refusal's 2
    assert main(["check", str(path), "--quiet"]) == 1
    assert "cannot read" not in capsys.readouterr().err


def _reaction_line() -> int:
    """Index (0-based) of the sample's first IfcStructuralCurveReaction line."""
    return next(i for i, line in enumerate(_lines())
                if b"=IFCSTRUCTURALCURVEREACTION(" in line)


def _deleted_reaction() -> tuple[bytes, str]:
    # the case: one reaction line deleted turned P-M2 from FAIL into PASS; the next
    # line's relationship (#984 in the sample) then refers to the missing instance
    lines = _lines()
    index = _reaction_line()
    step_id = lines[index].split(b"=", 1)[0].decode()
    del lines[index]
    user = next(i for i, line in enumerate(lines) if f",{step_id})".encode() in line)
    user_id = lines[user].split(b"=", 1)[0].decode()
    return b"".join(lines), (f"line {user + 1}: Instance reference {step_id} used by "
                             f"instance {user_id} at attribute index 5 not found")


def _foreign_entity() -> tuple[bytes, str]:
    # the relationship after the reaction renamed to an entity the schema does not have
    lines = _lines()
    index = _reaction_line() + 1
    assert b"=IFCRELCONNECTSSTRUCTURALACTIVITY(" in lines[index]
    lines[index] = lines[index].replace(b"=IFCREL", b"=IFXREL")
    return b"".join(lines), (f"line {index + 1}: Entity with name "
                             "'IFXRELCONNECTSSTRUCTURALACTIVITY' not found in schema 'IFC4'")


def _dangling_reference() -> tuple[bytes, str]:
    # the reaction's applied load (attribute 7) pointing at an instance not in the file
    lines = _lines()
    index = _reaction_line()
    step_id = lines[index].split(b"=", 1)[0].decode()
    load = lines[index].rsplit(b",#", 1)[1].split(b",", 1)[0]
    lines[index] = lines[index].replace(b",#" + load + b",", b",#999999,")
    return b"".join(lines), (f"line {index + 1}: Instance reference #999999 used by "
                             f"instance {step_id} at attribute index 7 not found")


def _syntax_error() -> tuple[bytes, str]:
    # a comma deleted between a reference and an enumeration: "#982.LOCAL_COORDS."
    lines = _lines()
    index = _reaction_line()
    broken = lines[index].replace(b",.LOCAL_COORDS.", b".LOCAL_COORDS.")
    assert broken != lines[index]
    lines[index] = broken
    load = broken.split(b"#")[-1].split(b".LOCAL")[0].decode()
    return b"".join(lines), (f"line {index + 1}: token {load}.LOCAL_COORDS. invalid "
                             "instance name")


@pytest.mark.parametrize("damage", [_deleted_reaction, _foreign_entity, _dangling_reference,
                                    _syntax_error])
def test_damaged_line_is_refused_naming_its_line(
        tmp_path: Path, capsys: pytest.CaptureFixture[str], damage) -> None:
    # the messages are ifcopenshell's parser log (its wording), with the offset as a line
    data, problem = damage()
    path = tmp_path / "damaged.ifc"
    path.write_bytes(data)
    report, out = tmp_path / "r.json", tmp_path / "checked.ifc"
    code = main(["check", str(path), "--report", str(report), "--out", str(out), "--quiet"])
    assert code == 2  # docs/design.md §4: unusable input
    assert capsys.readouterr().err == f"stanchion: cannot read {path}: {problem}\n"
    assert sorted(p.name for p in tmp_path.iterdir()) == ["damaged.ifc"]


def test_lenient_checks_a_damaged_model_with_a_warning_in_every_output(
        tmp_path: Path, capsys: pytest.CaptureFixture[str]) -> None:
    import json

    import ifcopenshell
    import ifcopenshell.util.element

    data, problem = _deleted_reaction()
    # the deleted reaction is one of column A1/L0's results (the relationship after it ties
    # it to A1/L0's analysis member, which is assigned to that column); the result group's
    # list naming it loses only that entry
    damaged_gid = next(c.GlobalId for c in ifcopenshell.open(str(SAMPLE)).by_type("IfcColumn")
                       if c.Tag == "A1/L0")
    path = tmp_path / "damaged.ifc"
    path.write_bytes(data)
    report, junit, out = tmp_path / "r.json", tmp_path / "j.xml", tmp_path / "checked.ifc"
    code = main(["check", str(path), "--lenient", "--report", str(report), "--junit",
                 str(junit), "--out", str(out)])
    assert code == 1  # the sample fails on purpose (sample_models/README.md)
    warning = (f"damaged model read with --lenient: {problem} (touches column A1/L0 "
               f"({damaged_gid})); ")
    assert f"note: {warning}" in capsys.readouterr().out
    body = json.loads(report.read_text())
    assert body["messages"][0].startswith(warning)
    own = (f"damaged model read with --lenient: this column's inputs are touched by "
           f"{problem}; ")
    plain = "damaged model read with --lenient (see the run messages): none of the damage"
    members = {m["id"]: m["messages"][0] for m in body["members"]}
    assert len(members) == 40 and members[damaged_gid].startswith(own)
    assert all(m.startswith(plain) for gid, m in members.items() if gid != damaged_gid)
    xml = junit.read_text()
    assert xml.count("damaged model read with --lenient") >= len(members)
    assert xml.count("this column&apos;s inputs are touched by") + xml.count(
        "this column's inputs are touched by") >= 1
    model = ifcopenshell.open(str(out))
    notes = {c.GlobalId: ifcopenshell.util.element.get_psets(c)["Stanchion_ColumnCheck"].get(
        "Notes", "") for c in model.by_type("IfcColumn")}
    assert notes[damaged_gid].startswith(own)
    assert all(n.startswith(plain) for gid, n in notes.items() if gid != damaged_gid)


def test_lenient_does_not_open_what_the_parser_cannot(
        tmp_path: Path, capsys: pytest.CaptureFixture[str]) -> None:
    data, problem = _syntax_error()  # ifcopenshell refuses the whole file
    path = tmp_path / "damaged.ifc"
    path.write_bytes(data)
    assert main(["check", str(path), "--lenient", "--quiet"]) == 2
    assert capsys.readouterr().err == f"stanchion: cannot read {path}: {problem}\n"


def test_lenient_is_refused_for_a_members_file(
        tmp_path: Path, capsys: pytest.CaptureFixture[str]) -> None:
    path = tmp_path / "members.json"
    path.write_text("{}")
    assert main(["check", str(path), "--lenient", "--quiet"]) == 2
    assert capsys.readouterr().err.startswith("stanchion: --lenient applies to IFC models")
