"""tools/corpus.py: the per-model table of what the reader made of a folder of models."""

from __future__ import annotations

import importlib.util
import sys
from pathlib import Path

from tests.service.test_model_check_files import builder_module, write_model

_PATH = Path(__file__).resolve().parents[2] / "tools" / "corpus.py"


def _corpus():
    if "stanchion_tools_corpus" not in sys.modules:
        spec = importlib.util.spec_from_file_location("stanchion_tools_corpus", _PATH)
        module = importlib.util.module_from_spec(spec)
        sys.modules["stanchion_tools_corpus"] = module
        spec.loader.exec_module(module)
    return sys.modules["stanchion_tools_corpus"]


def _concrete_model(path: Path) -> Path:
    b = builder_module().ModelBuilder("IFC4", "mm_N")
    prof = b.profile("RECT", "300x300", H=11.81, B=11.81)
    for name, material in (("K1", "Concrete C30/37"), ("K2", "Beton C30/37")):
        mat = b.material(material)
        mat.Category = None  # the builder's default category is steel
        b.column(name, profile=prof, material=mat)
    return b.write(path)


def test_the_table_counts_each_model_and_the_total(tmp_path, capsys) -> None:
    folder = tmp_path / "models"
    folder.mkdir()
    # The standard model: C1 and C2 carry loads (checked), C3 none (capacity only); all
    # three are W14X48 in ASTM A992 (tests/service/test_model_check_files.py).
    write_model(folder / "a_steel.ifc")
    _concrete_model(folder / "b_concrete.ifc")
    (folder / "c_cut.ifc").write_text("ISO-10303-21;\nHEADER;\n")  # cut short: refused
    (folder / "notes.txt").write_text("not a model")
    before = {p.name: p.read_bytes() for p in folder.iterdir()}
    assert _corpus().main([str(folder), "--markdown"]) == 0
    out = capsys.readouterr().out.splitlines()
    assert out[0].startswith("| model | columns | steel | checked | capacity only |")
    rows = {line.split(" | ")[0].lstrip("| "): line.split(" | ") for line in out[2:]}
    assert rows["a_steel.ifc"][1:7] == ["3", "3", "2", "1", "0", "1"]
    assert rows["a_steel.ifc"][8].startswith("1 no loads")
    assert rows["b_concrete.ifc"][1:7] == ["2", "0", "0", "0", "2", "0"]
    assert rows["c_cut.ifc"][8].startswith("refused: cannot read ")
    assert "c_cut.ifc: not an IFC file" in rows["c_cut.ifc"][8]
    assert rows["total (3 models)"][1:7] == ["5", "3", "2", "1", "2", "1"]
    assert "1 model refused" in rows["total (3 models)"][8]
    assert {p.name: p.read_bytes() for p in folder.iterdir()} == before  # only read


def test_an_empty_folder_is_refused(tmp_path, capsys) -> None:
    assert _corpus().main([str(tmp_path)]) == 2
    assert capsys.readouterr().err == f"corpus: no IFC model in {tmp_path}\n"
