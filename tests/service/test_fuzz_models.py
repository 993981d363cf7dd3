"""Fuzz test (issue 13 item 6): seeded mutations of the sample models through the real CLI.

Each mutant of ``sample_models/workshop_annex.ifc`` (IFC4, mm / kN / MPa, loads from analysis
results) and ``sample_models/garden_pavilion.ifc`` (IFC2X3, inch / kip / ksi, loads from
``garden_pavilion_loads.csv``) is made here at test time from a fixed seed and run through
``stanchion check`` (:func:`stanchion.service.cli.main`, in-process; a few through a real
subprocess) with ``--report``, ``--csv`` and ``--junit``.  For every mutant
(docs/design.md §4 and §5; issue 13 "What to build" 6):

- no traceback, and the exit code is 0, 1 or 2; nothing on stderr but ``stanchion: `` lines
  (a numpy or Python warning counts as what a process would print);
- exit 2 prints exactly one line on stderr (``stanchion: ...``) and writes no output;
- exit 0 or 1 writes every output, and the report has every column of the original model
  (by GlobalId, or by name when the mutation changed the GlobalId) or a model-level warning
  (a report message the original's report does not have);
- exit 0 only with a verdict: at least one member passes and none fails or is not checked.

A changed digit that still parses (a load of 92.2 kN read as 82.2) cannot be told from a
real value by any reader; such mutants are counted as "changed" (results differ from the
original without a warning) and not failed.  To reproduce a failure, run the test id it was
reported under: mutants are made per (model, kind) from ``SEED`` alone.
"""

from __future__ import annotations

import contextlib
import io
import json
import random
import re
import subprocess
import sys
import traceback
import warnings
from collections import Counter
from collections.abc import Callable, Iterator
from dataclasses import dataclass
from functools import cache
from pathlib import Path
from typing import Any

import pytest

from stanchion.service.cli import main

SAMPLES = Path(__file__).resolve().parents[2] / "sample_models"
#: The fixed seed; with the model and the kind it decides every mutant.
SEED = 13
#: The models, each with the extra command-line arguments it is checked with.
MODELS: dict[str, tuple[str, tuple[str, ...]]] = {
    "workshop": ("workshop_annex.ifc", ()),
    "pavilion": ("garden_pavilion.ifc",
                 ("--loads", str(SAMPLES / "garden_pavilion_loads.csv"))),
}
#: Entity types whose numbers decide a check (loads, profiles, units, properties, lengths).
_DECISIVE = (b"IFCSTRUCTURALLOADSINGLEFORCE", b"IFCISHAPEPROFILEDEF",
             b"IFCRECTANGLEHOLLOWPROFILEDEF", b"IFCPROPERTYSINGLEVALUE", b"IFCSIUNIT",
             b"IFCMEASUREWITHUNIT", b"IFCEXTRUDEDAREASOLID", b"IFCCARTESIANPOINT",
             b"IFCPOLYLINE", b"IFCCOLUMN", b"IFCMATERIAL", b"IFCSTRUCTURALCURVEREACTION",
             b"IFCRELASSOCIATESMATERIAL", b"IFCRELDEFINESBYPROPERTIES",
             b"IFCMECHANICALSTEELMATERIALPROPERTIES", b"IFCRELASSIGNSTOPRODUCT",
             b"IFCRELCONNECTSSTRUCTURALACTIVITY", b"IFCRELASSIGNSTOGROUP",
             b"IFCPROPERTYSET")
_REF = re.compile(rb"#(\d+)")
_NUMBER = re.compile(rb"(?<![#\w.'])-?\d+\.\d*(?:E[+-]?\d+)?")
_GUID = re.compile(rb"^(#\d+=IFC\w+\(')([0-9A-Za-z_$]{22})'")
_EXTREMES = (b"1.E300", b"-1.E300", b"-0.", b"1.E-300", b"1.E400", b"NAN", b"'NaN'", b"INF",
             b"0.")


@dataclass(frozen=True)
class Mutant:
    """One damaged copy of a sample model.

    Attributes:
        model: the key of :data:`MODELS`.
        kind: the mutation kind (a key of :data:`KINDS`).
        index: its number within (model, kind).
        params: what was done, for the test message.
        data: the file's bytes.
        guid_changed: the mutation may have changed a GlobalId (match columns by name too).
    """

    model: str
    kind: str
    index: int
    params: str
    data: bytes
    guid_changed: bool = False

    def label(self) -> str:
        """``model kind #index (params)``."""
        return f"{self.model} {self.kind} #{self.index} ({self.params})"


@cache
def _original(model: str) -> bytes:
    return (SAMPLES / MODELS[model][0]).read_bytes()


def _lines(data: bytes) -> list[bytes]:
    return data.splitlines(keepends=True)


def _data_lines(lines: list[bytes]) -> list[int]:
    """Indices of the DATA section's entity lines."""
    return [i for i, line in enumerate(lines) if line.startswith(b"#")]


def _pick_line(rng: random.Random, lines: list[bytes], pattern: re.Pattern[bytes] | None = None
               ) -> int:
    """A data line, half of the time one of a decisive type; with ``pattern``, one matching it."""
    candidates = _data_lines(lines)
    if pattern is not None:
        candidates = [i for i in candidates if pattern.search(lines[i].partition(b"=")[2])]
    decisive = [i for i in candidates if lines[i].partition(b"=")[2].startswith(_DECISIVE)]
    return rng.choice(decisive if decisive and rng.random() < 0.5 else candidates)


def _entity_type(line: bytes) -> bytes:
    return line.partition(b"=")[2].partition(b"(")[0]


# --- the mutation kinds: (rng, original bytes, index) -> (params, bytes, GlobalId touched?) ---

Mutation = Callable[[random.Random, bytes, int], tuple[str, bytes, bool]]


def _truncate_lines(rng: random.Random, data: bytes, index: int
        ) -> tuple[str, bytes, bool]:
    lines = _lines(data)
    keep = rng.choice([len(lines) - 1, len(lines) - 2, rng.randrange(1, len(lines) - 1)])
    return f"first {keep} of {len(lines)} lines", b"".join(lines[:keep]), False


def _truncate_bytes(rng: random.Random, data: bytes, index: int
        ) -> tuple[str, bytes, bool]:
    where = rng.choice(["anywhere", "trailer", "mid-entity"])
    if where == "trailer":
        cut = rng.randrange(len(data) - 30, len(data))
    elif where == "mid-entity":
        lines = _lines(data)
        i = _pick_line(rng, lines)
        start = sum(len(x) for x in lines[:i])
        cut = start + rng.randrange(1, len(lines[i]) - 1)
    else:
        cut = rng.randrange(1, len(data))
    return f"first {cut} of {len(data)} bytes ({where})", data[:cut], False


def _byte_flips(rng: random.Random, data: bytes, index: int
        ) -> tuple[str, bytes, bool]:
    body = bytearray(data)
    start = data.index(b"DATA;")
    done = []
    for _ in range(rng.choice([1, 1, 2, 3])):
        pos = rng.randrange(start, len(data))
        new = body[pos] ^ rng.randrange(1, 256)
        done.append(f"byte {pos} {body[pos]:#04x}->{new:#04x}")
        body[pos] = new
    return ", ".join(done), bytes(body), True


def _delete_line(rng: random.Random, data: bytes, index: int
        ) -> tuple[str, bytes, bool]:
    lines = _lines(data)
    i = _pick_line(rng, lines)
    removed = lines.pop(i)
    return f"line {i + 1} {removed[:40].decode('latin-1')!r} deleted", b"".join(lines), False


def _dangling_ref(rng: random.Random, data: bytes, index: int
        ) -> tuple[str, bytes, bool]:
    lines = _lines(data)
    top = max(int(m) for m in _REF.findall(data))
    i = _pick_line(rng, lines, re.compile(rb"#\d+"))
    head, eq, tail = lines[i].partition(b"=")
    refs = list(_REF.finditer(tail))
    ref = rng.choice(refs)
    missing = top + rng.randrange(1, 1000)
    tail = tail[:ref.start()] + b"#%d" % missing + tail[ref.end():]
    lines[i] = head + eq + tail
    return (f"line {i + 1} {head.decode()}: #{ref.group(1).decode()} -> missing #{missing}",
            b"".join(lines), False)


def _wrong_type(rng: random.Random, data: bytes, index: int
        ) -> tuple[str, bytes, bool]:
    lines = _lines(data)
    types = sorted({_entity_type(lines[i]) for i in _data_lines(lines)})
    i = _pick_line(rng, lines)
    old = _entity_type(lines[i])
    new = rng.choice([t for t in types if t != old])
    lines[i] = lines[i].replace(old + b"(", new + b"(", 1)
    return f"line {i + 1} {old.decode()} -> {new.decode()}", b"".join(lines), False


def _digit_change(rng: random.Random, data: bytes, index: int
        ) -> tuple[str, bytes, bool]:
    lines = _lines(data)
    i = _pick_line(rng, lines, re.compile(rb"\d"))
    head, eq, tail = lines[i].partition(b"=")
    positions = [k for k, c in enumerate(tail) if chr(c).isdigit()]
    k = rng.choice(positions)
    old = tail[k]
    new = rng.choice([d for d in b"0123456789" if d != old])
    tail = tail[:k] + bytes([new]) + tail[k + 1:]
    lines[i] = head + eq + tail
    return (f"line {i + 1} {_entity_type(lines[i]).decode()} char {k}: {chr(old)} -> "
            f"{chr(new)}", b"".join(lines), True)


def _extreme_number(rng: random.Random, data: bytes, index: int
        ) -> tuple[str, bytes, bool]:
    lines = _lines(data)
    i = _pick_line(rng, lines, _NUMBER)
    head, eq, tail = lines[i].partition(b"=")
    number = rng.choice(list(_NUMBER.finditer(tail)))
    value = rng.choice([v for v in _EXTREMES if v != number.group()])
    tail = tail[:number.start()] + value + tail[number.end():]
    lines[i] = head + eq + tail
    return (f"line {i + 1} {_entity_type(lines[i]).decode()}: {number.group().decode()} -> "
            f"{value.decode()}", b"".join(lines), False)


def _unit_ids(data: bytes) -> dict[bytes, bytes]:
    """The unit assignment's units by their unit type (``.FORCEUNIT.`` ...) -> ``#N``."""
    assignment = re.search(rb"IFCUNITASSIGNMENT\(\(([^)]*)\)\)", data)
    assert assignment is not None
    found = {}
    for ref in assignment.group(1).split(b","):
        line = re.search(rb"^" + re.escape(ref) + rb"=.*$", data, flags=re.MULTILINE)
        assert line is not None
        kind = re.search(rb"\.(\w+UNIT)\.", line.group())
        if kind:
            found[kind.group(1)] = ref
    return found


def _unit_swap(rng: random.Random, data: bytes, index: int
        ) -> tuple[str, bytes, bool]:
    units = _unit_ids(data)
    choices: list[tuple[str, bytes, bytes]] = [
        (f"{unit.decode()} removed from the unit assignment", b"," + ref + b",", b",")
        for unit, ref in units.items()]
    choices += [(f"{unit.decode()} removed from the unit assignment (first)", b"((" + ref + b",",
                 b"((") for unit, ref in units.items()]
    choices += [("prefix MILLI removed (mm -> m)", b".LENGTHUNIT.,.MILLI.", b".LENGTHUNIT.,$"),
                ("prefix KILO removed (kN -> N)", b".FORCEUNIT.,.KILO.", b".FORCEUNIT.,$"),
                ("prefix MEGA removed (MPa -> Pa)", b".PRESSUREUNIT.,.MEGA.",
                 b".PRESSUREUNIT.,$"),
                ("force unit KILO -> MILLI", b".FORCEUNIT.,.KILO.", b".FORCEUNIT.,.MILLI."),
                ("inch factor 0.0254 -> 1.", b"IFCREAL(0.0254)", b"IFCREAL(1.)"),
                ("kip factor -> 1.", b"IFCREAL(4448.2216153)", b"IFCREAL(1.)"),
                ("ksi factor -> 1.", b"IFCREAL(6894757.2932)", b"IFCREAL(1.)"),
                ("no unit assignment", b",(#13),#8);", b",(#13),$);"),
                ("no unit assignment", b",(#24),#19);", b",(#24),$);"),
                ("length and force unit types swapped", b".LENGTHUNIT.", b".FORCEUNIT."),
                ("unit assignment empty", b"IFCUNITASSIGNMENT((", b"IFCUNITASSIGNMENT(("
                 + b"),$);/*"),  # closes the list early: a syntax error
                ]
    usable = [c for c in choices if c[1] in data]
    what, old, new = usable[index % len(usable)]
    return what, data.replace(old, new, 1), False


def _duplicate_guid(rng: random.Random, data: bytes, index: int
        ) -> tuple[str, bytes, bool]:
    lines = _lines(data)
    rooted = [i for i in _data_lines(lines) if _GUID.match(lines[i])]
    columns = [i for i in rooted if b"=IFCCOLUMN(" in lines[i]]
    which = rng.choice(["two columns", "column and other", "any two"])
    if which == "two columns":
        a, b = rng.sample(columns, 2)
    elif which == "column and other":
        a, b = rng.choice(columns), rng.choice([i for i in rooted if i not in columns])
        if rng.random() < 0.5:
            a, b = b, a
    else:
        a, b = rng.sample(rooted, 2)
    match_a, match_b = _GUID.match(lines[a]), _GUID.match(lines[b])
    assert match_a is not None and match_b is not None
    lines[b] = match_b.group(1) + match_a.group(2) + lines[b][match_b.end() - 1:]
    return (f"{which}: line {b + 1} takes the GlobalId of line {a + 1}", b"".join(lines),
            True)


def _bad_encoding(rng: random.Random, data: bytes, index: int
        ) -> tuple[str, bytes, bool]:
    lines = _lines(data)
    bad = rng.choice([b"\xff\xfe", b"\xc3", b"\xe9", b"\x00", b"\x00\x00\x00", b"\x80"])
    where = rng.choice(["string", "anywhere", "header"])
    if where == "header":
        i = rng.randrange(0, lines.index(b"DATA;\n"))
        k = rng.randrange(0, len(lines[i]))
    else:
        i = _pick_line(rng, lines, re.compile(rb"'[^']+'") if where == "string" else None)
        line = lines[i]
        if where == "string":
            quotes = [m.start() + 1 for m in re.finditer(rb"'[^']+'", line)]
            k = rng.choice(quotes) + 1
        else:
            k = rng.randrange(0, len(line))
    lines[i] = lines[i][:k] + bad + lines[i][k:]
    return f"{bad!r} inserted at line {i + 1} char {k} ({where})", b"".join(lines), True


def _in_turn(index: int, variants: list[tuple[str, bytes]]) -> tuple[str, bytes]:
    """Variant ``index`` (modulo their number): each variant once per round."""
    return variants[index % len(variants)]


def _empty(rng: random.Random, data: bytes, index: int
        ) -> tuple[str, bytes, bool]:
    what, text = _in_turn(index, [("empty", b""), ("one newline", b"\n"), ("blanks", b"   \n\t\n"),
                             ("only the magic line", b"ISO-10303-21;\n"),
                             ("NUL bytes", b"\x00" * 64)])
    return what, text, False


def _header_only(rng: random.Random, data: bytes, index: int
        ) -> tuple[str, bytes, bool]:
    header = data[:data.index(b"DATA;")]
    what, text = _in_turn(index, [
        ("header", header),
        ("header and END-ISO", header + b"END-ISO-10303-21;\n"),
        ("header and an empty DATA section", header + b"DATA;\nENDSEC;\nEND-ISO-10303-21;\n"),
        ("header and an open DATA section", header + b"DATA;\n"),
    ])
    return what, text, False


#: Mutation kinds and how many mutants of each are made per model in ``make test``.
KINDS: dict[str, tuple[Mutation, int]] = {
    "truncate_lines": (_truncate_lines, 12),
    "truncate_bytes": (_truncate_bytes, 16),
    "byte_flip": (_byte_flips, 40),
    "delete_line": (_delete_line, 40),
    "dangling_ref": (_dangling_ref, 12),
    "wrong_type": (_wrong_type, 40),
    "digit_change": (_digit_change, 30),
    "extreme_number": (_extreme_number, 30),
    "unit_swap": (_unit_swap, 12),
    "duplicate_guid": (_duplicate_guid, 8),
    "bad_encoding": (_bad_encoding, 12),
    "empty": (_empty, 5),
    "header_only": (_header_only, 4),
}


#: Kinds that damage the file's structure, not its numbers: a result may change only with a
#: refusal or a message (a changed digit, an extreme number, a unit, a byte flip or a shared
#: GlobalId may change results in ways no reader can tell from a real model).
STRUCTURAL = frozenset({"truncate_lines", "truncate_bytes", "delete_line", "dangling_ref",
                        "wrong_type", "empty", "header_only"})


def mutants(model: str, kind: str, count: int | None = None) -> Iterator[Mutant]:
    """The seeded mutants of one kind for one model (``count`` default: :data:`KINDS`')."""
    mutate, default = KINDS[kind]
    rng = random.Random(f"{SEED}-{model}-{kind}")
    data = _original(model)
    for index in range(default if count is None else count):
        params, text, guid = mutate(rng, data, index)
        yield Mutant(model, kind, index, params, text, guid)


# --- running one mutant and judging the outcome ---

@dataclass(frozen=True)
class Outcome:
    """What one run did.

    Attributes:
        code: the exit code (None: an exception escaped ``main``).
        out: stdout.
        err: stderr (with the traceback of an escaped exception).
        written: names of the files in the output folder.
        report: the JSON report, when written.
    """

    code: int | None
    out: str
    err: str
    written: list[str]
    report: dict[str, Any] | None


def _argv(model: str, path: Path, folder: Path) -> list[str]:
    return ["check", str(path), "--report", str(folder / "r.json"), "--csv",
            str(folder / "r.csv"), "--junit", str(folder / "j.xml"), *MODELS[model][1]]


def _collect(code: int | None, out: str, err: str, folder: Path) -> Outcome:
    written = sorted(p.name for p in folder.iterdir())
    report_path = folder / "r.json"
    report = json.loads(report_path.read_text()) if report_path.exists() else None
    return Outcome(code, out, err, written, report)


def run_in_process(model: str, data: bytes, tmp: Path) -> Outcome:
    """``stanchion check`` on ``data`` through :func:`main`, stdout and stderr captured."""
    tmp.mkdir(parents=True, exist_ok=True)
    path = tmp / "model.ifc"
    path.write_bytes(data)
    folder = tmp / "out"
    folder.mkdir()
    out, err = io.StringIO(), io.StringIO()
    code: int | None
    with (contextlib.redirect_stdout(out), contextlib.redirect_stderr(err),
          warnings.catch_warnings(record=True) as caught):
        warnings.simplefilter("always")  # a process would print them on stderr
        try:
            code = main(_argv(model, path, folder))
        except SystemExit as exc:  # argparse; never expected here
            code = exc.code if isinstance(exc.code, int) else None
        except Exception:  # noqa: BLE001 - an escaped exception is the finding
            err.write(traceback.format_exc())
            code = None
    for w in caught:
        err.write(warnings.formatwarning(w.message, w.category, w.filename, w.lineno))
    return _collect(code, out.getvalue(), err.getvalue(), folder)


def run_subprocess(model: str, data: bytes, tmp: Path) -> Outcome:
    """``python -m stanchion.service.cli check ...`` on ``data``: the real exit path."""
    tmp.mkdir(parents=True, exist_ok=True)
    path = tmp / "model.ifc"
    path.write_bytes(data)
    folder = tmp / "out"
    folder.mkdir()
    proc = subprocess.run([sys.executable, "-m", "stanchion.service.cli",
                           *_argv(model, path, folder)],
                          capture_output=True, text=True, errors="replace", timeout=120,
                          check=False)
    return _collect(proc.returncode, proc.stdout, proc.stderr, folder)


@cache
def _baseline_report(model: str, tmp: Path) -> dict[str, Any]:
    outcome = run_in_process(model, _original(model), tmp / f"original-{model}")
    assert outcome.report is not None, outcome.err
    return outcome.report


def _columns(report: dict[str, Any]) -> tuple[set[str], set[str]]:
    return ({m["id"] for m in report["members"]},
            {m["name"] for m in report["members"] if m.get("name")})


def _refusal_problems(outcome: Outcome) -> list[str]:
    """Exit 2: one ``stanchion: `` line on stderr, nothing written."""
    broken = []
    lines = outcome.err.splitlines()
    if len(lines) != 1 or not lines[0].startswith("stanchion: "):
        broken.append(f"exit 2 must print one 'stanchion: ' line, printed {lines!r}")
    if outcome.written:
        broken.append(f"exit 2 wrote {outcome.written}")
    return broken


def _run_problems(mutant: Mutant, outcome: Outcome, report: dict[str, Any],
                  original: dict[str, Any], warned: bool) -> list[str]:
    """Exit 0 or 1: only our lines on stderr, every column or a warning, 0 with a verdict."""
    broken = []
    foreign = [line for line in outcome.err.splitlines() if not line.startswith("stanchion: ")]
    if foreign:
        broken.append(f"stderr holds lines that are not ours: {foreign[:3]!r}")
    ids, names = _columns(report)
    missing = [m for m in original["members"]
               if m["id"] not in ids and not (mutant.guid_changed and m["name"] in names)]
    if missing and not warned:
        broken.append(f"{len(missing)} column(s) of the original missing without a "
                      f"model-level warning: {[m['name'] for m in missing][:5]}")
    summary = report["summary"]
    if outcome.code == 0 and (summary["pass"] < 1 or summary["fail"] or summary["not_checked"]):
        broken.append(f"exit 0 with summary {summary}")
    return broken


def _results(report: dict[str, Any]) -> set[tuple[str, str, float | None]]:
    return {(m["id"], m["status"], m.get("utilization")) for m in report["members"]}


def _difference(report: dict[str, Any], original: dict[str, Any]) -> str:
    """``same``, ``flagged``, ``noted`` or ``changed`` (see :func:`judge`)."""
    if _results(report) == _results(original):
        return "same"
    before = {m["id"]: m for m in original["members"]}
    if any(m["status"] == "not_checked" and before.get(m["id"], {}).get("status")
           != "not_checked" for m in report["members"]):
        return "flagged"
    if any(set(m["messages"]) - set(before.get(m["id"], {}).get("messages", ()))
           for m in report["members"]):
        return "noted"
    return "changed"


def judge(mutant: Mutant, outcome: Outcome, original: dict[str, Any]) -> tuple[str, list[str]]:
    """The outcome's class and the rules it breaks (empty: none).

    Classes: ``refused`` (exit 2), ``warned`` (0 or 1 with a model-level message the original
    has not), ``same`` (every column, results as the original's), ``flagged`` (some column is
    newly not checked, with its reason), ``noted`` (results differ, and some column has a
    message the original has not), ``changed`` (results differ without any new message: e.g.
    a changed digit of a load, which no reader can tell from a real value).
    """
    broken = []
    if outcome.code is None or "Traceback" in outcome.err:
        broken.append("traceback: " + outcome.err[-1500:])
    if outcome.code == 2:
        return "refused", broken + _refusal_problems(outcome)
    if outcome.code not in (0, 1):
        return "broken", [*broken, f"exit code {outcome.code}"]
    report = outcome.report
    if outcome.written != ["j.xml", "r.csv", "r.json"] or report is None:
        return "broken", [*broken, f"exit {outcome.code} wrote {outcome.written}"]
    warned = any(m not in original["messages"] for m in report["messages"])
    broken += _run_problems(mutant, outcome, report, original, warned)
    return ("warned" if warned else _difference(report, original)), broken


# --- the tests ---

_OUTCOMES: dict[tuple[str, str], Counter[str]] = {}


@pytest.mark.parametrize("kind", list(KINDS))
@pytest.mark.parametrize("model", list(MODELS))
def test_mutants_are_refused_or_checked_completely(
        model: str, kind: str, tmp_path_factory: pytest.TempPathFactory,
        record_property: Callable[[str, object], None]) -> None:
    base = tmp_path_factory.getbasetemp()
    original = _baseline_report(model, base)
    counts: Counter[str] = Counter()
    failures = []
    for mutant in mutants(model, kind):
        folder = tmp_path_factory.mktemp(f"{model}-{kind}-{mutant.index}")
        outcome = run_in_process(model, mutant.data, folder)
        verdict, broken = judge(mutant, outcome, original)
        counts[verdict] += 1
        failures += [f"{mutant.label()}: {b}" for b in broken]
        if verdict == "changed" and kind in STRUCTURAL:
            failures.append(f"{mutant.label()}: results changed without a refusal or a message")
    _OUTCOMES[(model, kind)] = counts
    record_property("outcomes", dict(counts))
    print(f"{model} {kind}: {dict(sorted(counts.items()))}")
    assert not failures, "\n".join(failures)


#: One mutant per kind through a real process (the exit code and stderr a shell sees).
_SUBPROCESS_KINDS = ("truncate_bytes", "byte_flip", "dangling_ref", "bad_encoding",
                     "unit_swap", "empty")


@pytest.mark.parametrize("kind", _SUBPROCESS_KINDS)
def test_mutant_through_a_real_process(kind: str, tmp_path: Path) -> None:
    original = _baseline_report("workshop", tmp_path)
    mutant = next(mutants("workshop", kind, 1))
    outcome = run_subprocess("workshop", mutant.data, tmp_path / "run")
    verdict, broken = judge(mutant, outcome, original)
    assert not broken, f"{mutant.label()}: {broken}"
    assert verdict in ("refused", "warned", "same", "changed")


def test_every_kind_makes_distinct_mutants() -> None:
    """The generator makes damaged files: none equal to the original, few repeated."""
    for model in MODELS:
        for kind in KINDS:
            made = [m.data for m in mutants(model, kind)]
            assert _original(model) not in made, (model, kind)
            assert len(set(made)) >= min(3, len(made)), (model, kind)
