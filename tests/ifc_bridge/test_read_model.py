"""Opening models: every unusable file is one ModelReadError line; empty models read empty."""

from __future__ import annotations

import ifcopenshell
import pytest

from stanchion.ifc_bridge.model import ModelReadError, open_model
from stanchion.ifc_bridge.read import EXTRA_COLUMNS, read_columns


def test_missing_file_is_one_line(tmp_path):
    with pytest.raises(ModelReadError) as err:
        open_model(tmp_path / "model.ifc")
    assert str(err.value) == f"cannot read {tmp_path / 'model.ifc'}: no such file"


def test_directory_is_refused(tmp_path):
    with pytest.raises(ModelReadError, match="is a directory"):
        open_model(tmp_path)


@pytest.mark.parametrize("content", [b"", b"hello, this is not STEP", b"\x00\x01\x02PK"])
def test_non_ifc_file(tmp_path, content):
    path = tmp_path / "model.ifc"
    path.write_bytes(content)
    with pytest.raises(ModelReadError) as err:
        open_model(path)
    message = str(err.value)
    assert message.startswith(f"cannot read {path}: not an IFC file")
    assert "\n" not in message


def test_step_file_with_broken_header(tmp_path):
    path = tmp_path / "model.ifc"
    path.write_text("ISO-10303-21;\nHEADER;\nthis is not a header\n")
    with pytest.raises(ModelReadError, match="not an IFC file"):
        open_model(path)


@pytest.mark.parametrize("schema_name", ["IFC5", "IFC4X1"])
def test_unknown_schema(tmp_path, schema_name):
    good = tmp_path / "good.ifc"
    model = ifcopenshell.file(schema="IFC4")
    model.createIfcProject(ifcopenshell.guid.new())
    model.write(str(good))
    bad = tmp_path / "bad.ifc"
    bad.write_text(good.read_text().replace("FILE_SCHEMA(('IFC4'))",
                                            f"FILE_SCHEMA(('{schema_name}'))"))
    with pytest.raises(ModelReadError) as err:
        open_model(bad)
    assert str(err.value) == (f"cannot read {bad}: unsupported schema {schema_name} "
                              "(expected IFC2X3, IFC4, IFC4X3)")


def test_each_schema_opens(tmp_path, builder):
    path = builder.write(tmp_path / "model.ifc")
    model = open_model(path)
    assert model.schema_identifier.startswith(builder.schema)


def test_model_without_columns(builder):
    builder.storey("Level 1")
    result = read_columns(builder.model)
    assert len(result.members) == 0
    assert result.messages == ["model has no IfcColumn"]
    assert set(result.members.extra) == set(EXTRA_COLUMNS)
    assert result.members.loads.shape == (0, 7)


def test_model_without_columns_or_members(builder):
    result = read_columns(builder.model, include_members=True)
    assert result.messages == ["model has no IfcColumn or STRUT / POST IfcMember"]


@pytest.mark.parametrize("schema", ["IFC2X3", "IFC4", "IFC4X3"])
def test_trailer_missing_is_refused_for_each_schema(tmp_path, schema):
    # a file written by ifcopenshell ends "ENDSEC;\nEND-ISO-10303-21;\n" (ISO 10303-21)
    good = tmp_path / "good.ifc"
    model = ifcopenshell.file(schema=schema)
    model.createIfcProject(ifcopenshell.guid.new())
    model.write(str(good))
    open_model(good)
    text = good.read_text()
    cut = tmp_path / "cut.ifc"
    cut.write_text(text[:text.rindex("END-ISO-10303-21;")])
    with pytest.raises(ModelReadError) as err:
        open_model(cut)
    last = text[:text.rindex("END-ISO-10303-21;")].rstrip().count("\n") + 1
    assert str(err.value) == (f"cannot read {cut}: line {last}: the file ends without "
                              "END-ISO-10303-21; (cut short?)")


def test_text_after_the_trailer_is_refused(tmp_path):
    good = tmp_path / "good.ifc"
    model = ifcopenshell.file(schema="IFC4")
    model.createIfcProject(ifcopenshell.guid.new())
    model.write(str(good))
    bad = tmp_path / "bad.ifc"
    bad.write_text(good.read_text() + "#99=IFCWALL($);\n")
    with pytest.raises(ModelReadError, match=r"line \d+: the file ends without END-ISO"):
        open_model(bad)
