"""``fekt converge CASE``: a refinement ladder with the observed order, Richardson value and GCI band."""

from __future__ import annotations

import json
import sys

from . import review_out
from .output import add_force_argument


def add_parser(sub) -> None:
    p = sub.add_parser("converge", help="refine the mesh systematically and report how each Kt converges")
    p.add_argument("case", help="case file (TOML)")
    p.add_argument("--levels", type=int, default=3, help="number of meshes (default 3; level 0 is the case's mesh)")
    p.add_argument("--ratio", type=float, default=2.0, help="refinement ratio between levels (default 2)")
    p.add_argument("--nested", action="store_true",
                   help="split every element in gmsh instead (ratio 2, the far field is refined too)")
    p.add_argument("--jobs", type=int, default=1, help="levels solved in parallel processes (default 1)")
    p.add_argument("--elements-per-radius", type=float, help="level 0: override the case's elements per radius")
    p.add_argument("--feature", metavar="NAME", help="study only this feature's stress peaks")
    p.add_argument("--json", action="store_true", help="print the study as JSON")
    p.add_argument("--out", metavar="DIR", help="write study.json, study.csv, report.txt and convergence.png")
    add_force_argument(p)
    review_out.add_options(p, html=True)
    p.set_defaults(run=run)


def run(args) -> int:
    from .main import UsageError
    from .output import prepare_output

    if args.jobs < 1:
        raise UsageError(f"--jobs {args.jobs} must be at least 1")
    review_out.check(args)
    names = ["study.json", "study.csv", "report.txt", "convergence.png"] + (["report.html"] if args.html else [])
    with prepare_output(args.out, force=args.force, command="converge", files=names) as out:
        _run(args, out)
    if out and not args.json:
        print(f"wrote {out.shown}: {', '.join(names)}", file=sys.stderr)
    return 0


def _run(args, out) -> None:
    from ..report.convergence import format_study, study_csv, write_study_plot
    from ..studies.convergence import converge
    from .solve_cmd import load

    case = load(args)
    units = review_out.output_units(args, case.units)
    show = not args.json and sys.stderr.isatty()
    bar = None
    if show:
        from tqdm import tqdm

        bar = tqdm(total=args.levels, desc="mesh levels", unit="level", file=sys.stderr)

    def progress(i, level):
        if bar is not None:
            bar.set_postfix_str(f"level {i}: {int(level.dofs)} DOFs, {level.seconds:.1f} s")
            bar.update(1)

    try:
        study = converge(case, levels=args.levels, ratio=args.ratio, nested=args.nested, jobs=args.jobs,
                         feature=args.feature, progress=progress)
    finally:
        if bar is not None:
            bar.close()
    study = review_out.shown_study(study, case, units)
    text = format_study(study)
    print(json.dumps(study.to_dict(), indent=2, allow_nan=False) if args.json else text)
    if out:
        length = units.length if units else case.units.length
        out.write_json("study.json", study.to_dict())
        out.write_text("study.csv", study_csv(study, length))
        out.write_text("report.txt", text + "\n")
        out.write_with("convergence.png", lambda p: write_study_plot(study, p))
        for name, write in review_out.study_files(args, study, case, units).items():
            out.write_with(name, write)
