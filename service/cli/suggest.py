"""``stanchion suggest``: the lightest adequate catalog sections for one load, at the terminal.

The same search as ``check --suggest`` (:func:`stanchion.engine.selection.select`), for one
required strength typed at the terminal; ``--depth`` limits the nominal depth, in inches.
"""

from __future__ import annotations

import argparse
import math

import numpy as np

from stanchion.engine import catalog
from stanchion.engine.compression import OMEGA_C, PHI_C
from stanchion.engine.members import E_DEFAULT, G_DEFAULT
from stanchion.engine.selection import candidate_indices, select
from stanchion.engine.units import UNIT_SYSTEMS, force_factor, length_factor, stress_factor
from stanchion.service.errors import EXIT_FAILURES, EXIT_OK, InputError


def family_list(text: str) -> list[str]:
    """Comma-separated families or designations, e.g. "W10,W12" (argparse type)."""
    items = [t.strip() for t in text.split(",") if t.strip()]
    if not items:
        raise argparse.ArgumentTypeError("give at least one family, e.g. W10,W12")
    return items


def depth_range(text: str) -> tuple[float | None, float | None]:
    """A nominal depth range in inches (argparse type).

    ``"10-14"`` (10 to 14), ``"12-"`` (12 and deeper), ``"-14"`` (up to 14), ``"14"`` (14 only).
    """
    low, sep, high = text.strip().partition("-")
    try:
        lo = float(low) if low.strip() else None
        hi = float(high) if high.strip() else None
    except ValueError:
        raise argparse.ArgumentTypeError(
            f"expected a nominal depth range in inches such as 10-14, 12- or -14, got {text!r}"
        ) from None
    if not sep:
        hi = lo
    if lo is None and hi is None:
        raise argparse.ArgumentTypeError("give at least one end of the depth range, e.g. 12-")
    if any(v is not None and not v > 0 for v in (lo, hi)):
        raise argparse.ArgumentTypeError(f"depths must be greater than zero, got {text!r}")
    if lo is not None and hi is not None and lo > hi:
        raise argparse.ArgumentTypeError(f"the range {text!r} runs backwards")
    return lo, hi


def run_suggest(args: argparse.Namespace) -> int:
    """Print a small table of the lightest passing sections; exit 1 when none passes."""
    system = UNIT_SYSTEMS[args.units]
    units = (system["force"], system["length"], system["stress"])
    fF, fL, fS = force_factor(units[0]), length_factor(units[1]), stress_factor(units[2])
    for name, v in (("--load", args.load), ("--length", args.length), ("--fy", args.fy),
                    ("--kx", args.kx), ("--ky", args.ky), ("--kz", args.kz)):
        # K = 0 would rate every section at its squash load; no number is taken on trust.
        if not (math.isfinite(v) and v > 0):
            raise InputError(f"{name} must be a number greater than zero (got {v:g})")
    if not args.utilization_limit > 0:
        raise InputError("--utilization-limit must be greater than zero")
    if not args.count >= 1:
        raise InputError("--count must be at least 1")
    min_depth, max_depth = args.depth
    try:
        cand = candidate_indices(args.families, min_depth=min_depth, max_depth=max_depth)
    except ValueError as exc:
        raise InputError(str(exc)) from None
    if len(cand) == 0:
        raise InputError("no catalog shape within the given families and depth limits")
    one = np.ones(1)
    L = args.length * fL
    sug = select(
        np.array([args.load * fF]), one * args.fy * fS, one * args.kx * L, one * args.ky * L,
        one * args.kz * L, cand, method=args.method, max_utilization=args.utilization_limit,
        max_suggestions=args.count, E=E_DEFAULT, G=G_DEFAULT,
    )
    rows = sug.for_member(0, catalog.load_catalog())
    basis = (f"φc = {PHI_C}" if args.method == "LRFD" else f"Ωc = {OMEGA_C}")
    print(f"{args.method} ({basis}), Fy = {args.fy:g} {units[2]}, L = {args.length:g} "
          f"{units[1]} (K = {args.kx:g}/{args.ky:g}/{args.kz:g}), required {args.load:g} "
          f"{units[0]}, utilization <= {args.utilization_limit:g}")
    if not rows:
        print("no candidate passes; try other families or a larger depth")
        return EXIT_FAILURES
    head = f"{'section':<18} {'weight lb/ft':>12} {'available ' + units[0]:>14} {'util':>6}"
    print(head)
    print("-" * len(head))
    for r in rows:
        print(f"{r['section']:<18} {r['weight']:>12.1f} {r['available_strength'] / fF:>14.1f} "
              f"{r['utilization']:>6.3f}")
    print("AISC 360-22 Chapter E, axial compression only; results must be reviewed by a "
          "licensed engineer.")
    return EXIT_OK


def add_parser(sub: argparse._SubParsersAction) -> None:
    """Register ``suggest``."""
    p = sub.add_parser(
        "suggest", help="lightest catalog sections for one axial load",
        description="The lightest catalog sections whose available strength (AISC 360-22 "
        "Chapter E) carries one required axial strength.")
    p.add_argument("--load", type=float, required=True,
                   help="required strength (factored for LRFD, service for ASD)")
    p.add_argument("--length", type=float, required=True, help="member length")
    p.add_argument("--fy", type=float, required=True,
                   help="yield stress in the stress unit of --units (ksi or MPa)")
    p.add_argument("--families", type=family_list, default=["W"],
                   help="comma-separated families or designations, e.g. W10,W12,HSS")
    p.add_argument("--method", type=str.upper, choices=["LRFD", "ASD"], default="LRFD")
    p.add_argument("--kx", type=float, default=1.0,
                   help="effective length factor, x (major) axis (default 1.0)")
    p.add_argument("--ky", type=float, default=1.0,
                   help="effective length factor, y (minor) axis (default 1.0)")
    p.add_argument("--kz", type=float, default=1.0,
                   help="effective length factor, torsion (default 1.0)")
    p.add_argument("--utilization-limit", type=float, default=1.0, metavar="U",
                   help="suggestions pass at this utilization or below (default 1.0)")
    p.add_argument("--depth", type=depth_range, default=(None, None), metavar="RANGE",
                   help="nominal depth range in inches: 10-14, 12- (and deeper), -14, 14")
    p.add_argument("--count", type=int, default=5, help="how many suggestions (default 5)")
    p.add_argument("--units", choices=["us", "si"], default="us",
                   help="us: kip, ft, ksi (default); si: kN, m, MPa")
    p.set_defaults(func=run_suggest)
