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


def _project_file(tmp_path, schema):
    path = tmp_path / "good.ifc"
    model = ifcopenshell.file(schema=schema)
    model.createIfcProject(ifcopenshell.guid.new())
    model.write(str(path))
    return path.read_text()


def test_entity_foreign_to_the_declared_schema_is_refused(tmp_path):
    # IfcIndexedPolyCurve is new in IFC4 (IFC4 schema, 8.9.3.37); IFC2X3 has no such entity
    text = _project_file(tmp_path, "IFC2X3")
    bad = tmp_path / "bad.ifc"
    bad.write_text(text.replace("ENDSEC;\nEND-ISO",
                                "#900=IFCINDEXEDPOLYCURVE($,$,$);\nENDSEC;\nEND-ISO"))
    line = bad.read_text().splitlines().index("#900=IFCINDEXEDPOLYCURVE($,$,$);") + 1
    with pytest.raises(ModelReadError) as err:
        open_model(bad)
    assert str(err.value) == (f"cannot read {bad}: line {line}: Entity with name "
                              "'IFCINDEXEDPOLYCURVE' not found in schema 'IFC2X3'")


def test_a_reference_to_a_missing_instance_is_refused_also_in_an_ifczip(tmp_path):
    import zipfile

    text = _project_file(tmp_path, "IFC4")
    data = text.replace("ENDSEC;\nEND-ISO", "#900=IFCRELAGGREGATES('0YvctVUKr0kugbFTf53O9L',"
                        "$,$,$,#1,(#77777));\nENDSEC;\nEND-ISO")
    line = data.splitlines().index(next(x for x in data.splitlines()
                                        if x.startswith("#900="))) + 1
    path = tmp_path / "bad.ifczip"
    with zipfile.ZipFile(path, "w") as zf:
        zf.writestr("bad.ifc", data)
    with pytest.raises(ModelReadError) as err:
        open_model(path)
    assert str(err.value) == (f"cannot read {path}: line {line}: Instance reference #77777 "
                              "used by instance #900 at attribute index 5 not found")


def test_attribute_count_warning_is_not_refused(tmp_path):
    # a real export pattern (IFC4 files with pre-final attribute counts): the parser warns
    # "Expected 2 attribute values, found 1" and reads the instance; not damage, so accepted
    text = _project_file(tmp_path, "IFC4")
    path = tmp_path / "old.ifc"
    path.write_text(text.replace(
        "ENDSEC;\nEND-ISO", "#900=IFCCOLOURRGB($,0.5,0.5,0.5);\n"
        "#901=IFCSURFACESTYLESHADING(#900);\nENDSEC;\nEND-ISO"))
    model = open_model(path)
    assert model.by_id(901).is_a("IfcSurfaceStyleShading")


def test_lenient_reading_lists_the_damage_instead_of_refusing(tmp_path):
    # the groundwork of --lenient (issue 13 item 1): the problems refused by default are
    # listed, earliest first, and the model is returned as the parser read it
    text = _project_file(tmp_path, "IFC4")
    data = text.replace("ENDSEC;\nEND-ISO", "#900=IFCRELAGGREGATES('0YvctVUKr0kugbFTf53O9L',"
                        "$,$,$,#1,(#77777));\nENDSEC;\nEND-ISO")
    data = data[:data.rindex("END-ISO-10303-21;")]  # and cut short
    lines = data.splitlines()
    ref = next(i for i, x in enumerate(lines) if x.startswith("#900=")) + 1
    path = tmp_path / "damaged.ifc"
    path.write_text(data)
    problems: list = []
    model = open_model(path, problems=problems)
    assert model.by_id(900).is_a("IfcRelAggregates")
    assert [str(p) for p in problems] == [
        f"line {len(data.rstrip().splitlines())}: the file ends without END-ISO-10303-21; "
        "(cut short?)",
        f"line {ref}: Instance reference #77777 used by instance #900 at attribute index 5 "
        "not found"]
    # the cut touches any element (what followed is missing); the reference names #900
    assert problems[0].everywhere
    assert (problems[1].step_id, problems[1].refs) == (900, (1, 77777))
    with pytest.raises(ModelReadError, match="cut short"):
        open_model(path)  # the default stays strict


def test_lenient_reading_of_a_sound_file_lists_nothing(tmp_path):
    path = tmp_path / "good.ifc"
    path.write_text(_project_file(tmp_path, "IFC4X3"))
    problems: list = []
    open_model(path, problems=problems)
    assert problems == []
