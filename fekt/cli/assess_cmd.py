"""``fekt assess CASE``: solve a case, then check every stress peak against the material's strengths.

Static checks (peak and net-section stress against yield), the fatigue notch factor by several methods side
by side with the FE stress gradient, and the fatigue safety factors of the case's ``[cycle]``. The strengths
are checked before the solve: a missing one stops the command with exit code 2 and its name.
"""

from __future__ import annotations

import dataclasses
import json
import sys
import time

from . import review_out
from .output import add_force_argument


def add_parser(sub) -> None:
    p = sub.add_parser("assess", help="solve one case file and check every stress peak for static strength and "
                                      "fatigue (needs the strengths in [material])")
    p.add_argument("case", help="case file (TOML) with strengths in [material] and, for fatigue, a [cycle]")
    p.add_argument("--json", action="store_true",
                   help="print the result and the assessment as JSON ({\"result\": ..., \"assessment\": ...})")
    p.add_argument("--out", metavar="DIR", help="write result.json, assessment.json, report.txt and stress.png into "
                   "DIR (and report.html with --html)")
    add_force_argument(p)
    p.add_argument("--elements-per-radius", type=float, help="override the case's mesh.elements_per_radius")
    p.add_argument("--no-estimate", action="store_true",
                   help="skip the second, coarser mesh that gives each Kt its uncertainty band")
    review_out.add_options(p, html=True, vtu=False)
    p.set_defaults(run=run)


def run(args) -> int:
    from ..api import solve_full
    from ..assess.assessment import assess_solved, check_case
    from ..report.assessment import format_assessment
    from ..report.text import format_result
    from .main import STARTED
    from .output import prepare_output
    from .solve_cmd import load

    review_out.check(args)
    names = ["result.json", "assessment.json", "report.txt", "stress.png"] + (
        ["report.html"] if getattr(args, "html", False) else [])
    with prepare_output(args.out, force=args.force, command="assess", files=names) as out:
        case = load(args)
        check_case(case)  # before the solve: a missing strength is named at once
        units = review_out.output_units(args, case.units)
        solved = solve_full(case, estimate=not args.no_estimate)
        timed = dataclasses.replace(solved.result, timings=dataclasses.replace(
            solved.result.timings, wall_s=time.perf_counter() - STARTED))
        solved = dataclasses.replace(solved, result=timed)
        assessment = assess_solved(case, solved.result)
        result = review_out.shown_result(solved.result, units)
        shown = review_out.shown_assessment(assessment, units)
        text = format_result(result) + "\n\n" + format_assessment(shown)
        print(json.dumps({"result": result.to_dict(), "assessment": shown.to_dict()}, indent=2) if args.json
              else text)
        if out:
            from ..report.plots import write_figure

            out.write_json("result.json", result.to_dict())
            out.write_json("assessment.json", shown.to_dict())
            out.write_text("report.txt", text + "\n")
            out.write_with("stress.png", lambda p: write_figure(solved, p))
            if getattr(args, "html", False):
                from ..report.review import solve_document, write_html

                doc = solve_document(solved, case_text=review_out.case_text(args.case), result=result,
                                     assessment=shown)
                out.write_with("report.html", lambda p: write_html(p, doc))
    if out and not args.json:
        print(f"wrote {out.shown}: {', '.join(names)}", file=sys.stderr)
    return 0
