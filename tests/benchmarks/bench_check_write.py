"""Benchmark: check a generated 20,000-column IFC4 model and write the checked copy, end to end.

Prints, for the same model in the same run, each measured in its own child process (wall
time and peak resident memory, VmHWM, of that child):

* ``open``: ``ifcopenshell.open`` alone -- the memory reference;
* ``floor``: ``ifcopenshell.open`` + one property set of 8 properties per column created
  directly + ``file.write`` -- the floor of issue 12.  The 8 properties are the per-column
  results (Status, Section, Utilization, RequiredStrength, AvailableStrength,
  GoverningCombination, GoverningLimitState, Slenderness), each its own
  IfcPropertySingleValue typed as stanchion types it (numbers at full precision, as a check
  gives them, so they take as much room in the file as ours), in one IfcPropertySet and one
  IfcRelDefinesByProperties per column.  They are made the fastest direct way found:
  ``file.create`` + ``entity_instance.set_attribute_value_py`` by attribute index (the
  primitive stanchion's writer uses; about six times faster than ``create_entity`` with
  keywords), typed texts built once per distinct text, GlobalIds drawn in one vectorized
  batch -- no ``ifcopenshell.api``, no lookups, nothing read;
* ``floor, create_entity``: the same sets made with ``file.create_entity(..., Name=...)``
  keywords and ``ifcopenshell.guid.new`` (the public spelling; for reference);
* ``stanchion``: ``pipeline.check`` with a model output, the path of ``stanchion check --out``:
  open, read every column, check, build the report, write the property sets, write the copy
  atomically;
* ``stanchion, all outputs``: the same plus the JSON report, CSV and JUnit files;
* ``rerun``: ``pipeline.check`` on its own output (every set updated in place);
* ``stanchion by phase``: the same steps called one by one, timed separately.

Every mode frees what it built inside the timed run (``pipeline.check`` drops the model
before it returns, so the floor and the phases drop theirs too; ``open`` discards its file at
once).  Each mode runs ``repeats`` times, round-robin so that load from other processes on a
shared machine spreads over every mode; the fastest run of each mode is printed with the
spread (slowest / fastest) and the least CPU time (user + system) of the child, which load
from other processes changes far less than wall time.  Then the ratios: stanchion / floor
(time, and CPU time; target <= 1.5) and stanchion / open (peak memory; target <= 2), and the
written files' sizes and property counts.  The model comes from
``bench_read.generate_model`` (40 storeys, 4 column types, Stanchion_Loads on every column).
Numbers only; nothing is asserted.

Usage: ``.venv/bin/python tests/benchmarks/bench_check_write.py [n_columns] [repeats]``
"""

from __future__ import annotations

import json
import re
import statistics
import subprocess
import sys
import tempfile
import time
from pathlib import Path

HERE = Path(__file__).resolve().parent
ROOT = HERE.parents[1]

# Runs in a child: argv = mode, model path, output folder.  Prints one JSON line.
CHILD = r"""
import json, os, random, resource, sys, time
from pathlib import Path

def peak_mb():
    try:
        with open("/proc/self/status") as fh:
            for line in fh:
                if line.startswith("VmHWM:"):
                    return int(line.split()[1]) / 1024.0
    except OSError:
        pass
    return resource.getrusage(resource.RUSAGE_SELF).ru_maxrss / 1024.0

mode, src, out = sys.argv[1], Path(sys.argv[2]), Path(sys.argv[3])
def cpu():
    r = resource.getrusage(resource.RUSAGE_SELF)
    return r.ru_utime + r.ru_stime

t0, c0 = time.perf_counter(), cpu()
phases = {}
import ifcopenshell
if mode == "open":
    ifcopenshell.open(str(src))
elif mode in ("floor", "floor_kw"):
    import numpy as np
    f = ifcopenshell.open(str(src))
    t1 = time.perf_counter(); phases["open"] = t1 - t0
    columns = f.by_type("IfcColumn")
    # results as a check gives them: full-precision numbers (as long in the file as ours)
    rnd = random.Random(1).random
    n = len(columns)
    labels = ("PASS", "W14X48", "1.2D+1.6L+0.5Lr", "flexural buckling about y")
    if mode == "floor":
        # 2n GlobalIds at once: version-4 UUIDs in the IFC base-64 compression
        chars = np.frombuffer(b"0123456789ABCDEFGHIJKLMNOPQRSTUVWXYZabcdefghijklmnopqrstuvwxyz_$",
                              dtype=np.uint8)
        raw = np.frombuffer(os.urandom(32 * n), dtype=np.uint8).reshape(2 * n, 16).copy()
        raw[:, 6] = (raw[:, 6] & 0x0F) | 0x40
        raw[:, 8] = (raw[:, 8] & 0x3F) | 0x80
        hi, lo = (w[:, None] for w in raw.view(">u8").astype(np.uint64).T)
        shifts = np.arange(120, -1, -6, dtype=np.uint64)[None, :]
        six = np.where(shifts >= 64, (hi >> (np.maximum(shifts, 64) - 64)) & 63,
                       (lo >> np.minimum(shifts, 63)) & 63)
        six[:, 10] = (lo[:, 0] >> 60) | ((hi[:, 0] & 3) << 4)
        codes = np.empty((2 * n, 22), dtype=np.uint8)
        codes[:, 0] = chars[(hi[:, 0] >> 62).astype(np.intp)]
        codes[:, 1:] = chars[six.astype(np.intp)]
        gids = codes.view("S22").ravel().astype(str).tolist()
        new, put = f.create, ifcopenshell.entity_instance.set_attribute_value_py
        def typed(t, v):
            x = new(t, -1); put(x, 0, v); return x
        def prop(name, value):
            p = new("IfcPropertySingleValue", -1); put(p, 0, name); put(p, 2, value); return p
        text = [typed("IfcLabel", s) for s in labels]
        for i, col in enumerate(columns):
            u, avail, slender = 0.3 + 0.7 * rnd(), 800.0 + 3000.0 * rnd(), 30.0 + 90.0 * rnd()
            props = [prop("Status", text[0]), prop("Section", text[1]),
                     prop("Utilization", typed("IfcRatioMeasure", u)),
                     prop("RequiredStrength", typed("IfcForceMeasure", avail * u)),
                     prop("AvailableStrength", typed("IfcForceMeasure", avail)),
                     prop("GoverningCombination", text[2]),
                     prop("GoverningLimitState", text[3]),
                     prop("Slenderness", typed("IfcRatioMeasure", slender))]
            pset = new("IfcPropertySet", -1)
            put(pset, 0, gids[2 * i]); put(pset, 2, "Stanchion_ColumnCheck"); put(pset, 4, props)
            rel = new("IfcRelDefinesByProperties", -1)
            put(rel, 0, gids[2 * i + 1]); put(rel, 4, [col]); put(rel, 5, pset)
    else:
        import ifcopenshell.guid
        create, gid = f.create_entity, ifcopenshell.guid.new
        text = [create("IfcLabel", s) for s in labels]
        for i, col in enumerate(columns):
            u, avail, slender = 0.3 + 0.7 * rnd(), 800.0 + 3000.0 * rnd(), 30.0 + 90.0 * rnd()
            props = [
                create("IfcPropertySingleValue", Name="Status", NominalValue=text[0]),
                create("IfcPropertySingleValue", Name="Section", NominalValue=text[1]),
                create("IfcPropertySingleValue", Name="Utilization",
                       NominalValue=create("IfcRatioMeasure", u)),
                create("IfcPropertySingleValue", Name="RequiredStrength",
                       NominalValue=create("IfcForceMeasure", avail * u)),
                create("IfcPropertySingleValue", Name="AvailableStrength",
                       NominalValue=create("IfcForceMeasure", avail)),
                create("IfcPropertySingleValue", Name="GoverningCombination",
                       NominalValue=text[2]),
                create("IfcPropertySingleValue", Name="GoverningLimitState",
                       NominalValue=text[3]),
                create("IfcPropertySingleValue", Name="Slenderness",
                       NominalValue=create("IfcRatioMeasure", slender)),
            ]
            pset = create("IfcPropertySet", GlobalId=gid(), Name="Stanchion_ColumnCheck",
                          HasProperties=props)
            create("IfcRelDefinesByProperties", GlobalId=gid(), RelatedObjects=[col],
                   RelatingPropertyDefinition=pset)
    t2 = time.perf_counter(); phases["create"] = t2 - t1
    f.write(str(out / f"{mode}.ifc"))
    t3 = time.perf_counter(); phases["write"] = t3 - t2
    for name in ("f", "columns", "text", "col", "props", "pset", "rel", "new", "create",
                 "typed", "prop"):  # done: free the model and every handle on it, as
        globals().pop(name, None)  # check() does before it returns
    phases["free"] = time.perf_counter() - t3
elif mode in ("stanchion", "all", "rerun"):
    from stanchion.service.pipeline import OutputPaths, check
    target = out / ("stanchion.ifc" if mode != "rerun" else "rerun.ifc")
    extra = {}
    if mode == "all":
        extra = dict(report=out / "r.json", csv=out / "r.csv", junit=out / "j.xml")
    report = check(src, outputs=OutputPaths(model=target, **extra)).report
elif mode == "phases":
    from stanchion.service import model_check as mc
    from stanchion.ifc_bridge.read import read_columns
    model = mc.open_model(src); t = time.perf_counter(); phases["open"] = t - t0
    read = read_columns(model); phases["read"] = time.perf_counter() - t; t = time.perf_counter()
    results = mc.check_members(read.members); phases["check"] = time.perf_counter() - t
    t = time.perf_counter()
    report = mc.build_report(read.members, results, {"force": "kip", "length": "ft",
                                                     "stress": "ksi"})
    phases["report"] = time.perf_counter() - t; t = time.perf_counter()
    mc.write_results(model, read.members, results, design_basis=report["design_basis"],
                     disclaimer=mc.DISCLAIMER, checked_at="2026-01-01T00:00:00+00:00")
    phases["property sets"] = time.perf_counter() - t; t = time.perf_counter()
    mc.write_model_checked(out / "phases.ifc", model)
    phases["write"] = time.perf_counter() - t; t = time.perf_counter()
    for name in ("model", "read", "results", "report"):
        globals().pop(name, None)
    phases["free"] = time.perf_counter() - t
seconds, cpu_seconds = time.perf_counter() - t0, cpu() - c0
print(json.dumps({"seconds": seconds, "cpu": cpu_seconds, "peak_mb": peak_mb(),
                  "phases": phases}))
"""

LABELS = {
    "open": "ifcopenshell.open",
    "floor": "floor (open + 8-property sets + write)",
    "floor_kw": "floor, create_entity keywords",
    "stanchion": "stanchion check --out",
    "all": "stanchion, all outputs",
    "phases": "stanchion by phase",
    "rerun": "rerun on its own output",
}


def run_child(mode: str, src: Path, out: Path) -> dict:
    """Run one measurement in a fresh interpreter; its JSON line as a dict."""
    proc = subprocess.run([sys.executable, "-c", CHILD, mode, str(src), str(out)],
                          capture_output=True, text=True, check=False, cwd=ROOT)
    if proc.returncode != 0:
        raise SystemExit(f"{mode} failed:\n{proc.stderr}")
    return json.loads(proc.stdout.strip().splitlines()[-1])


def round_robin(modes: tuple[str, ...], src: Path, out: Path,
                repeats: int) -> dict[str, list[dict]]:
    """Every mode ``repeats`` times, taken in turn."""
    runs: dict[str, list[dict]] = {m: [] for m in modes}
    for _ in range(repeats):
        for mode in modes:
            runs[mode].append(run_child(mode, src, out))
    return runs


def step_counts(path: Path) -> dict[str, int]:
    """Entity counts by class of a STEP file (a text scan, no parsing)."""
    counts: dict[str, int] = {}
    pattern = re.compile(rb"^#\d+=\s*(IFC\w+)\(", re.MULTILINE)
    for match in pattern.finditer(path.read_bytes()):
        name = match.group(1).decode()
        counts[name] = counts.get(name, 0) + 1
    return counts


def main(n_columns: int = 20_000, repeats: int = 3) -> None:
    sys.path.insert(0, str(HERE))
    sys.path.insert(0, str(ROOT))
    from bench_read import generate_model

    with tempfile.TemporaryDirectory() as tmp:
        out = Path(tmp)
        src = out / "columns.ifc"
        t0 = time.perf_counter()
        generate_model(src, n_columns)
        print(f"model: {n_columns:,} columns, IFC4, {src.stat().st_size / 1e6:.1f} MB "
              f"(generated in {time.perf_counter() - t0:.1f} s); {repeats} runs per mode")
        runs = round_robin(("open", "floor", "floor_kw", "stanchion", "all", "phases"), src,
                           out, repeats)
        runs.update(round_robin(("rerun",), out / "stanchion.ifc", out, 1))
        sizes = {m: (out / f"{m}.ifc").stat().st_size / 1e6
                 for m in ("floor", "floor_kw", "stanchion", "rerun")}
        sizes["input"] = src.stat().st_size / 1e6
        counts = {m: step_counts(out / f"{m}.ifc") for m in ("floor", "stanchion", "rerun")}
        base = step_counts(src)

    best = {m: min(r, key=lambda x: x["seconds"]) for m, r in runs.items()}
    print(f"{'':<40} {'fastest':>8} {'median':>8} {'spread':>7} {'CPU':>8} {'peak':>9}")
    for mode, r in runs.items():
        times = [x["seconds"] for x in r]
        print(f"{LABELS[mode]:<40} {min(times):7.2f}s {statistics.median(times):7.2f}s "
              f"{max(times) / min(times):6.2f}x {min(x['cpu'] for x in r):7.2f}s "
              f"{best[mode]['peak_mb']:6.0f} MB")
    for mode in ("floor", "floor_kw", "phases"):
        parts = ", ".join(f"{k} {v:.2f} s" for k, v in best[mode]["phases"].items())
        print(f"  {LABELS[mode]}: {parts}")
    print("files: " + ", ".join(f"{m} {v:.1f} MB" for m, v in sizes.items()))
    for mode, c in counts.items():
        added = {k: c.get(k, 0) - base.get(k, 0) for k in
                 ("IFCPROPERTYSET", "IFCPROPERTYSINGLEVALUE", "IFCRELDEFINESBYPROPERTIES")}
        print(f"  {mode}: added " + ", ".join(f"{v:,} {k}" for k, v in added.items()))

    def ratio(a: str, b: str, key: str = "seconds", pick=min) -> float:
        return pick(x[key] for x in runs[a]) / pick(x[key] for x in runs[b])

    med = statistics.median
    print(f"time   stanchion / floor:          {ratio('stanchion', 'floor'):.2f} fastest, "
          f"{ratio('stanchion', 'floor', pick=med):.2f} median  (target <= 1.5)")
    print(f"CPU    stanchion / floor:          {ratio('stanchion', 'floor', 'cpu'):.2f} least, "
          f"{ratio('stanchion', 'floor', 'cpu', med):.2f} median  (user + system)")
    print(f"time   stanchion / floor (create_entity): {ratio('stanchion', 'floor_kw'):.2f}")
    print(f"time   all outputs / floor:        {ratio('all', 'floor'):.2f}")
    print(f"time   rerun / floor:              {ratio('rerun', 'floor'):.2f}")
    print(f"memory stanchion / open:           "
          f"{best['stanchion']['peak_mb'] / best['open']['peak_mb']:.2f}  (target <= 2)")
    print(f"memory all outputs / open:         "
          f"{best['all']['peak_mb'] / best['open']['peak_mb']:.2f}")
    print(f"memory floor / open:               "
          f"{best['floor']['peak_mb'] / best['open']['peak_mb']:.2f}")


if __name__ == "__main__":
    main(int(sys.argv[1]) if len(sys.argv) > 1 else 20_000,
         int(sys.argv[2]) if len(sys.argv) > 2 else 3)
