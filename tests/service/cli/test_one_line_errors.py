"""Exit 2 prints one line even when the error quotes control bytes (issue 13 item 6).

The fuzz test (tests/service/test_fuzz_models.py) found a byte flip turning
``IFCCARTESIANPOINT`` into ``IFCCAR<vertical tab>ESIANPOINT``: the parser's words, quoted in
the refusal, then broke the line in two (``str.splitlines`` and terminals split at \\x0b,
\\x0c, \\x1c ...).  docs/design.md §4: exit 2 prints one line on stderr.
"""

from __future__ import annotations

from pathlib import Path

import pytest

from stanchion.service.cli import main, one_line

SAMPLE = Path(__file__).resolve().parents[3] / "sample_models" / "workshop_annex.ifc"


@pytest.mark.parametrize("byte", [b"\x0b", b"\x0c", b"\x1c", b"\n"])
def test_control_byte_in_an_entity_name_is_escaped_in_the_one_line(
        tmp_path: Path, capsys: pytest.CaptureFixture[str], byte: bytes) -> None:
    path = tmp_path / "flipped.ifc"
    path.write_bytes(SAMPLE.read_bytes().replace(b"IFCCARTESIANPOINT", b"IFCCAR" + byte
                                                 + b"ESIANPOINT", 1))
    report = tmp_path / "r.json"
    assert main(["check", str(path), "--report", str(report), "--quiet"]) == 2
    err = capsys.readouterr().err
    assert len(err.splitlines()) == 1 and err.startswith("stanchion: cannot read ")
    assert repr(byte.decode())[1:-1] in err or byte == b"\n"
    assert not report.exists()


def test_one_line_keeps_printable_text_and_escapes_the_rest() -> None:
    assert one_line("Stütze C-1: 'IFCCAR\x0bESIANPOINT'\n") == (
        "Stütze C-1: 'IFCCAR\\x0bESIANPOINT'\\n")


PAVILION = SAMPLE.with_name("garden_pavilion.ifc")


@pytest.mark.parametrize("lenient", [False, True])
def test_dangling_unit_reference_is_refused_in_one_line(
        tmp_path: Path, capsys: pytest.CaptureFixture[str], lenient: bool) -> None:
    """Issue 13 measured an AttributeError traceback (read_units) and exit 1 for a unit
    naming a conversion factor that is not in the file: the pavilion's inch (#10) here.
    Strict: the parser's missing reference, naming the line; --lenient reads the file, and
    the unit it cannot read is refused in one line (before ifc_bridge/units.py caught it,
    the traceback again)."""
    text = PAVILION.read_bytes()
    inch = b"#10=IFCCONVERSIONBASEDUNIT(#7,.LENGTHUNIT.,'inch',#9);"
    assert inch in text  # IFC2X3, inch / kip / ksi (sample_models/README.md)
    path = tmp_path / "dangling.ifc"
    path.write_bytes(text.replace(inch, inch.replace(b"#9)", b"#999999)")))
    report = tmp_path / "r.json"
    argv = ["check", str(path), "--report", str(report), "--quiet", "--loads",
            str(PAVILION.with_name("garden_pavilion_loads.csv"))]
    assert main(argv + (["--lenient"] if lenient else [])) == 2
    err = capsys.readouterr().err
    if lenient:
        assert err == ("stanchion: damaged model: its length unit #10, an "
                       "IfcConversionBasedUnit, cannot be read ('NoneType' object has no "
                       "attribute 'ValueComponent')\n")
    else:
        line = text[:text.index(inch)].count(b"\n") + 1
        assert err == (f"stanchion: cannot read {path}: line {line}: Instance reference "
                       "#999999 used by instance #10 at attribute index 3 not found\n")
    assert not report.exists()
