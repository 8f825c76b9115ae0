"""``fekt solve CASE``: one case, ranked stress peaks with Kt and an uncertainty on each."""

from __future__ import annotations

import dataclasses
import json
import os
import sys
import time

from . import review_out
from .output import add_force_argument


def add_parser(sub) -> None:
    p = sub.add_parser("solve", help="solve one case file and report every stress peak with its Kt")
    p.add_argument("case", help="case file (TOML)")
    p.add_argument("--json", action="store_true", help="print the full result as JSON instead of the table")
    p.add_argument("--out", metavar="DIR", help="write result.json, report.txt and stress.png into DIR (and "
                   "report.html, field.vtu with --html, --vtu)")
    add_force_argument(p)
    p.add_argument("--elements-per-radius", type=float, help="override the case's mesh.elements_per_radius")
    p.add_argument("--no-estimate", action="store_true",
                   help="skip the second, coarser mesh that gives each Kt its uncertainty band")
    review_out.add_options(p, html=True, vtu=True)
    p.set_defaults(run=run)


def load(args):
    """The case named on the command line, with mesh overrides applied."""
    import dataclasses

    from ..api import load_case
    from .main import UsageError

    if not os.path.isfile(args.case):
        raise UsageError(f"case file '{args.case}' not found")
    case = load_case(args.case)
    if getattr(args, "elements_per_radius", None) is not None:
        if not args.elements_per_radius > 0:
            raise UsageError(f"--elements-per-radius {args.elements_per_radius:g} must be positive")
        case = dataclasses.replace(case, mesh=dataclasses.replace(case.mesh,
                                                                   elements_per_radius=args.elements_per_radius))
    return case


def run(args) -> int:
    from ..api import solve_full
    from ..report.text import format_result
    from .main import STARTED
    from .output import prepare_output

    review_out.check(args)
    names = ["result.json", "report.txt", "stress.png"] + [n for n, flag in (("report.html", "html"),
                                                                            ("field.vtu", "vtu"))
                                                           if getattr(args, flag, False)]
    with prepare_output(args.out, force=args.force, command="solve", files=names) as out:
        case = load(args)
        units = review_out.output_units(args, case.units)
        solved = solve_full(case, estimate=not args.no_estimate)
        timed = dataclasses.replace(solved.result, timings=dataclasses.replace(
            solved.result.timings, wall_s=time.perf_counter() - STARTED))
        solved = dataclasses.replace(solved, result=timed)
        result = review_out.shown_result(solved.result, units)
        text = format_result(result)
        print(json.dumps(result.to_dict(), indent=2) if args.json else text)
        if out:
            from ..report.plots import write_figure

            out.write_json("result.json", result.to_dict())
            out.write_text("report.txt", text + "\n")
            out.write_with("stress.png", lambda p: write_figure(solved, p))
            for name, write in review_out.solve_files(args, solved, result, units).items():
                out.write_with(name, write)
    if out and not args.json:
        print(f"wrote {out.shown}: {', '.join(names)}", file=sys.stderr)
    return 0
