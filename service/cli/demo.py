"""``stanchion demo``: check a sample model end to end and write every output.

The sample models live in ``sample_models/`` of the source checkout (an invented building,
demo data only; see ``sample_models/README.md``).  They are not part of the installed
package: the demo finds them next to this package, which works when the project is
installed in editable mode from a checkout (``pip install -e .``, as ``make demo`` does).

The demo writes the checked model, the JSON report, the CSV, the JUnit XML, the HTML
report and the BCF issues into ``--output-dir`` (default ``demo-output``) and prints the
same summary as ``stanchion check``.
It exits 0 although the workshop sample has failing and not-checked columns on purpose; it
exits 2 with one line on stderr when the demo itself cannot run (sample missing or
unreadable, output folder not writable).
"""

from __future__ import annotations

import argparse
from pathlib import Path

from stanchion.service.errors import EXIT_OK, InputError

#: The repository checkout this package sits in (editable install).
CHECKOUT = Path(__file__).resolve().parents[2]  # service/cli/demo.py -> the checkout
SAMPLE_DIR = CHECKOUT / "sample_models"
#: Sample name -> (model file, load table or None, load takedown project or None), inside
#: :data:`SAMPLE_DIR`.  The workshop's columns carry analysis results; the takedown gives
#: loads to the one without (docs/design.md §5 "Load takedown").
SAMPLES: dict[str, tuple[str, str | None, str | None]] = {
    "workshop": ("workshop_annex.ifc", None, "workshop_annex_takedown.toml"),
    "pavilion": ("garden_pavilion.ifc", "garden_pavilion_loads.csv", None),
    "pavilion-takedown": ("garden_pavilion.ifc", None, "garden_pavilion_takedown.toml"),
}
DEFAULT_OUTPUT = "demo-output"


def sample_paths(name: str, folder: Path) -> tuple[Path, Path | None, Path | None]:
    """The model, load table and takedown project of sample ``name`` (None: not used).

    Raises:
        InputError: a file of the sample is missing.
    """
    model_name, table_name, takedown_name = SAMPLES[name]
    paths = [folder / n if n else None for n in (model_name, table_name, takedown_name)]
    for path in paths:
        if path is not None and not path.is_file():
            raise InputError(
                f"demo: sample file {path} not found; the demo runs from a source checkout "
                "installed with `pip install -e .` (or `make demo`)")
    assert paths[0] is not None
    return paths[0], paths[1], paths[2]


def output_paths(model: Path, output_dir: Path, stem: str | None = None) -> dict[str, Path]:
    """Where the six outputs of a demo run go (named after the sample, or ``stem``)."""
    stem = stem or model.stem
    return {
        "checked model": output_dir / f"{stem}_checked.ifc",
        "JSON report": output_dir / f"{stem}_report.json",
        "CSV": output_dir / f"{stem}_report.csv",
        "JUnit XML": output_dir / f"{stem}_junit.xml",
        "HTML report": output_dir / f"{stem}_report.html",
        "BCF issues": output_dir / f"{stem}_issues.bcf",
    }


def run_demo(args: argparse.Namespace) -> int:
    """Check the sample, write the outputs, print where they are and the summary."""
    from stanchion.service.pipeline import CheckOptions, OutputPaths, check
    from stanchion.service.reports.terminal import format_run

    model, table, takedown = sample_paths(args.sample, SAMPLE_DIR)
    output_dir = Path(args.output_dir)
    try:
        output_dir.mkdir(parents=True, exist_ok=True)
    except OSError as exc:
        raise InputError(f"demo: cannot create {output_dir}: {exc.strerror or exc}") from None
    own_stem = args.sample in ("workshop", "pavilion")  # else the stem names the variant
    outputs = output_paths(model, output_dir, None if own_stem else f"{model.stem}_takedown")
    print(f"stanchion demo: checking {model.name}, an invented sample building "
          "(demo data, not a design)")
    report = check(
        model, CheckOptions(loads_table=table, takedown=takedown, suggest=True),
        OutputPaths(model=outputs["checked model"], report=outputs["JSON report"],
                    csv=outputs["CSV"], junit=outputs["JUnit XML"],
                    html=outputs["HTML report"], bcf=outputs["BCF issues"])).report
    print(format_run(report))
    for m in report["members"]:
        if m.get("suggestions"):
            first = m["suggestions"][0]
            print(f"  suggestion for {m['name']} ({m['section']}, {m['status']}): "
                  f"{first['section']} at utilization {first['utilization']:.2f}")
    estimated = [m for m in report["members"] if m.get("load_source") == "takedown"]
    if estimated:
        print(f"load takedown ({takedown.name if takedown else ''}): estimated service loads "
              f"for {len(estimated)} column(s) without loads of their own:")
        for m in estimated:
            factor = m.get("llr_factor")
            print(f"  {m['name']}: tributary area {m['tributary_area']:,.1f} "
                  f"{report['units']['length']}², live load factor "
                  f"{'-' if factor is None else f'{factor:.2f}'}, {m['status']}")
    print("outputs:")
    for label, path in outputs.items():
        print(f"  {label + ':':<15} {path}")
    s = report["summary"]
    if s["fail"] or s["not_checked"]:
        print(f"demo: the {s['fail']} failing and {s['not_checked']} not-checked columns are "
              "part of the sample; `stanchion check` on this model exits 1, the demo exits 0")
    if s.get("skipped"):
        print(f"demo: {s['skipped']} columns are skipped: their material is not steel "
              "(not a failure)")
    return EXIT_OK


def add_parser(sub: argparse._SubParsersAction) -> None:
    """Register ``demo``."""
    d = sub.add_parser(
        "demo", help="check a sample model and write every output",
        description="Check a sample model of an invented building end to end and write the "
        "checked model, JSON report, CSV, JUnit XML, HTML report and BCF issues. Needs a "
        "source checkout installed with `pip install -e .`. Exit 0 when the demo ran (the "
        "sample fails on purpose), 2 when it could not run.")
    d.add_argument("--output-dir", default=DEFAULT_OUTPUT, metavar="DIR",
                   help=f"folder for the outputs (default {DEFAULT_OUTPUT})")
    d.add_argument("--sample", choices=sorted(SAMPLES), default="workshop",
                   help="workshop: IFC4 with analysis results and a load takedown for the "
                   "column without (default); pavilion: IFC2X3 with a CSV load table; "
                   "pavilion-takedown: the same model with loads from its slabs")
    d.set_defaults(func=run_demo)
