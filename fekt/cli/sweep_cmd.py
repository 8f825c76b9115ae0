"""``fekt sweep CASE --vary NAME=START:STOP:COUNT`` and ``fekt target CASE --vary NAME --kt VALUE``."""

from __future__ import annotations

import json
import os
import sys

from ..errors import InputError
from . import review_out
from .output import add_force_argument


def parse_vary(spec: str) -> tuple[str, list[float]]:
    """'NAME=START:STOP:COUNT' (evenly spaced, both ends included) or 'NAME=v1,v2,...'."""
    import numpy as np

    if "=" not in spec:
        raise InputError(f"'{spec}' is not NAME=START:STOP:COUNT or NAME=v1,v2,...", item="--vary")
    name, rhs = (t.strip() for t in spec.split("=", 1))
    try:
        if ":" in rhs:
            parts = rhs.split(":")
            if len(parts) != 3:
                raise ValueError
            a, b, n = float(parts[0]), float(parts[1]), int(parts[2])
            if n < 1:
                raise ValueError
            values = list(np.linspace(a, b, n)) if n > 1 else [a]
        else:
            values = [float(v) for v in rhs.split(",") if v.strip()]
    except ValueError:
        raise InputError(f"'{spec}': the values must be START:STOP:COUNT (COUNT a whole number >= 1) or a "
                         "comma-separated list of numbers", item="--vary") from None
    if not name.isidentifier() or not values:
        raise InputError(f"'{spec}': need a parameter name and at least one value", item="--vary")
    return name, [float(v) for v in values]


def add_parser(sub) -> None:
    p = sub.add_parser("sweep", help="Kt over ranges of the case's named parameters (your own chart)")
    p.add_argument("case", help="case file (TOML) with a [parameters] table")
    p.add_argument("--vary", action="append", required=True, metavar="NAME=START:STOP:COUNT",
                   help="a parameter and its values (START:STOP:COUNT or v1,v2,...); repeat for a grid")
    p.add_argument("--out", metavar="DIR", help="results folder (default: <case>-sweep next to the case)")
    p.add_argument("--resume", action="store_true", help="keep the points already in DIR and compute the rest")
    add_force_argument(p)
    p.add_argument("--executor", choices=("pool", "serial", "dask"), default="pool",
                   help="where points run: local processes (default), one process, or a Dask cluster")
    p.add_argument("--workers", type=int, help="local processes (default: all cores)")
    p.add_argument("--scheduler", metavar="ADDRESS", help="Dask scheduler address (implies --executor dask)")
    p.add_argument("--no-estimate", action="store_true", help="skip the per-point uncertainty (faster)")
    p.add_argument("--basis", choices=("net", "gross"), default="net", help="which Kt to report and fit")
    p.add_argument("--fit", metavar="FORM", help="fit the results: poly:N, power, or cubic-sqrt (two parameters: "
                   "cubic in the first, coefficients linear in sqrt(second) and second)")
    p.add_argument("--feature", metavar="NAME", help="the feature whose Kt the sweep reports and fits (default: the "
                   "leading notch peak at each point); every peak of every point is kept in the files anyway")
    p.add_argument("--json", action="store_true", help="print the results as JSON")
    review_out.add_options(p, html=True)
    p.set_defaults(run=run_sweep)

    t = sub.add_parser("target", help="find the parameter value that gives a target Kt")
    t.add_argument("case", help="case file (TOML) with a [parameters] table")
    t.add_argument("--vary", required=True, metavar="NAME", help="the parameter to adjust")
    t.add_argument("--kt", type=float, required=True, help="the Kt wanted")
    t.add_argument("--bounds", metavar="LO:HI", help="search range (default: half to one and a half times the "
                   "case's value)")
    t.add_argument("--basis", choices=("net", "gross"), default="net", help="Kt on the net or gross section")
    t.add_argument("--feature", metavar="NAME", help="the feature whose Kt is held (default: the leading notch peak)")
    t.add_argument("--out", metavar="DIR", help="write the search (target.json, report.txt) into DIR")
    add_force_argument(t)
    t.add_argument("--json", action="store_true", help="print the answer as JSON")
    review_out.add_options(t, html=False)
    t.set_defaults(run=run_target)


def run_sweep(args) -> int:
    from ..api import case_from_dict, read_case_table
    from ..studies.sweep import grid
    from .main import UsageError
    from .output import prepare_sweep_folder

    if not os.path.isfile(args.case):
        raise UsageError(f"case file '{args.case}' not found")
    table = read_case_table(args.case)
    varies = [parse_vary(v) for v in args.vary]
    names = [n for n, _ in varies]
    # check the names and the unvaried case once, before any work
    case = case_from_dict(table, args.case, overrides={n: v[0] for n, v in varies})
    points = grid(varies)
    out = args.out or os.path.splitext(args.case)[0] + "-sweep"
    with prepare_sweep_folder(out, force=args.force, resume=args.resume) as folder:
        return _sweep_in(folder, args, table, case, names, points)


def _sweep_in(folder, args, table, case, names, points) -> int:
    from ..records import SWEEP_SCHEMA, to_jsonable
    from ..report.resume import SWEEP_POINT_SCHEMA, file_sha256
    from ..report.sweep import SweepFiles, format_sweep, point_line, same_values, write_sweep_plot
    from ..studies.sweep import PointResult, fit_results, run_points

    units = review_out.output_units(args, case.units)
    shown = review_out.points_shown(case, units)
    # the resume file holds the points in the case's own units; a resumed point must come from the same
    # case file and the same settings (the store refuses others before anything is removed)
    store = folder.open_store(case_sha256=file_sha256(args.case), schema=SWEEP_POINT_SCHEMA,
                              settings={"varied": names, "estimate": not args.no_estimate,
                                        "feature": args.feature})
    for note in store.notes:
        print(f"fekt: warning: {note}", file=sys.stderr)
    done: dict[int, PointResult] = {}
    for d in store.records:
        i = d["index"]
        if i < len(points) and same_values(d["values"], points[i]):
            done[i] = PointResult.from_json(d)
    files = SweepFiles(folder.path, names, parameters=[n for n, _ in case.parameters], shown=shown,
                       stress_unit=units.stress if units else case.units.stress,
                       case_units=f"{case.units.length}, {case.units.force}")
    executor = "dask" if args.scheduler else args.executor
    progress = review_out.Progress("sweep", total=len(points) - len(done))
    results = list(done.values())

    def on_result(r):
        store.append(r.to_json())
        results.append(r)
        progress.step(point_line(r, names, args.basis))

    try:
        run_points(table, args.case, points, estimate=not args.no_estimate, executor=executor,
                   workers=args.workers, scheduler=args.scheduler, skip=done.keys(), on_result=on_result,
                   feature=args.feature)
    finally:
        progress.close()
        folder.write_with("sweep.csv", lambda p: files.write_csv(results, p))
    results.sort(key=lambda r: r.index)
    fit = fit_results(results, names, args.fit, args.basis) if args.fit else None
    text = format_sweep(results, names, args.basis, fit, args.feature)
    data = {"schema": SWEEP_SCHEMA, "case": args.case, "varied": names, "basis": args.basis,
            "feature": args.feature, "units": {"peak": files.stress_unit, "parameters": files.case_units},
            "points": [r.to_json() for r in shown(results)], "resumed_points": len(done), "fit": to_jsonable(fit)}
    folder.write_json("sweep.json", data)
    folder.write_text("report.txt", text + "\n")
    followed = args.feature or ", ".join(sorted({r.feature for r in results if r.status == "ok"})) or "-"
    title = (f"{os.path.basename(args.case)}: Kt_{args.basis} of {followed} over {', '.join(names)} "
             "(your own FE chart)")
    folder.write_with("sweep.png", lambda p: write_sweep_plot(results, names, args.basis, p, title, fit))
    html = review_out.sweep_html(args, folder, results, names, fit, case)
    print(json.dumps(data, indent=2) if args.json else text)
    if not args.json:
        print(f"wrote {folder.shown}: points.jsonl, sweep.csv, sweep.json, report.txt, sweep.png"
              + (f", {html}" if html else "") + (f" ({len(done)} points reused)" if done else ""), file=sys.stderr)
    return 0


def run_target(args) -> int:
    from ..api import case_from_dict, read_case_table
    from .main import UsageError
    from .output import prepare_output

    if not os.path.isfile(args.case):
        raise UsageError(f"case file '{args.case}' not found")
    table = read_case_table(args.case)
    case = case_from_dict(table, args.case)
    params = dict(case.parameters)
    if args.vary not in params:
        raise UsageError(f"the case has no parameter named '{args.vary}'",
                         hint=f"parameters: {', '.join(params) or 'none'}")
    if args.bounds:
        try:
            lo, hi = (float(v) for v in args.bounds.split(":"))
        except ValueError:
            raise UsageError(f"--bounds '{args.bounds}' must be LO:HI") from None
    else:
        lo, hi = 0.5 * params[args.vary], 1.5 * params[args.vary]
    if lo == hi:
        raise UsageError("--bounds must span a range")

    with prepare_output(args.out, force=args.force, command="target", files=("target.json", "report.txt")) as out:
        return _target_in(out, args, table, case, lo, hi)


def _target_in(out, args, table, case, lo: float, hi: float) -> int:
    from ..records import TARGET_SCHEMA, to_jsonable
    from ..report.sweep import format_target, target_line
    from ..studies.sweep import goal_seek

    units = review_out.output_units(args, case.units)
    bar = review_out.Progress("target", unit="solve")
    try:
        t = goal_seek(table, args.case, args.vary, args.kt, (lo, hi), basis=args.basis, feature=args.feature,
                      progress=(lambda p: bar.step(target_line(args.vary, p, args.basis))) if bar else None)
    finally:
        if bar is not None:
            bar.close()
    t = review_out.points_shown(case, units)(t)
    stress = units.stress if units else case.units.stress
    data = {"schema": TARGET_SCHEMA, "case": args.case, **to_jsonable(t), "units": {"peak": stress}}
    text = format_target(t, stress)
    print(json.dumps(data, indent=2) if args.json else text)
    if out:
        out.write_json("target.json", data)
        out.write_text("report.txt", text + "\n")
    return 0 if t.reached else 2
