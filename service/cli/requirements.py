"""``stanchion requirements``: print the IDS 1.0 document of the data a check needs.

Exit 0 when printed or written; 2 when ``-o FILE`` cannot be written (one line).  The
document and what IDS cannot express: :mod:`stanchion.service.requirements`.
"""

from __future__ import annotations

import argparse
import sys

from stanchion.service.errors import EXIT_OK
from stanchion.service.requirements import requirements_text, write_requirements


def run_requirements(args: argparse.Namespace) -> int:
    """Run the requirements verb."""
    if args.output:
        write_requirements(args.output, args.loads_in_psets)
    else:
        sys.stdout.write(requirements_text(args.loads_in_psets))
    return EXIT_OK


def add_parser(sub: argparse._SubParsersAction) -> None:
    """Register ``requirements``."""
    r = sub.add_parser(
        "requirements", help="print the IDS 1.0 document of the data a check needs",
        description="Print an IDS 1.0 document (buildingSMART Information Delivery "
        "Specification) of what stanchion reads of each IfcColumn: a material, a steel "
        "grade or stress named by it, and typed load and design properties. Give it to "
        "whoever models, or validate a model against it with 'stanchion check MODEL --ids "
        "FILE'. Profiles, material property sets and analysis results cannot be expressed "
        "in IDS 1.0; the document's instructions say so.")
    r.add_argument("-o", "--output", metavar="FILE.ids",
                   help="write the document here (atomically) instead of printing it")
    r.add_argument("--loads-in-psets", action="store_true",
                   help="require Stanchion_Loads.D on every steel column (for models that "
                   "carry their loads in property sets, not in analysis results or a load "
                   "table)")
    r.set_defaults(func=run_requirements)
