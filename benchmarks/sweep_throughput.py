"""Sweep throughput on the demo link (demo data): points per minute serial, in a local process pool
and on a Dask LocalCluster with 2 workers, at default accuracy (default mesh and the per-point
uncertainty). Also writes the demo sweep's plot and a fitted formula. Writes benchmarks/SWEEP.md itself."""

from __future__ import annotations

import os
import sys
import time

from fekt.case.loader import read_case_table
from fekt.report.sweep import format_fit, write_sweep_plot
from fekt.cli.sweep_cmd import parse_vary
from fekt.studies.sweep import fit_results, grid, run_points

HERE = os.path.dirname(os.path.abspath(__file__))
sys.path.insert(0, HERE)

from _publish import publish  # noqa: E402
CASE = os.path.join(HERE, "..", "cases", "demo_link.toml")


def main() -> None:
    table = read_case_table(CASE)
    varies = [parse_vary("rf=3:9:6"), parse_vary("dh=8:14:4")]
    points = grid(varies)
    run_points(table, CASE, points[:1], executor="serial")  # warm-up: imports and first-call costs
    rows = []
    results = None
    for name, kw in [("serial", dict(executor="serial")), ("local pool, 2 processes", dict(executor="pool", workers=2))]:
        t0 = time.perf_counter()
        res = run_points(table, CASE, points, **kw)
        rows.append((name, time.perf_counter() - t0, res))
        results = results or res
    from dask.distributed import Client, LocalCluster

    with LocalCluster(n_workers=2, threads_per_worker=1, processes=True, dashboard_address=None) as cl, Client(cl) as c:
        run_points(table, CASE, points[:6], executor="dask", scheduler=c)  # warm both workers (imports)
        t0 = time.perf_counter()
        res = run_points(table, CASE, points, executor="dask", scheduler=c)
        rows.append(("Dask LocalCluster, 2 workers", time.perf_counter() - t0, res))
    same = all([r.kt_net for r in res] == [r.kt_net for r in rows[0][2]] for _, _, res in rows)
    serial_rate = len(points) / rows[0][1] * 60
    lines = ["# Sweep throughput (written by benchmarks/sweep_throughput.py)", "",
             f"Demo link (demo data), {len(points)} points: fillet radius rf x hole diameter dh, default mesh, "
             "per-point two-grid uncertainty. 2-core machine.", "",
             "| executor | wall s | points per minute | parallel efficiency |", "|---|---|---|---|"]
    for name, t, _ in rows:
        rate = len(points) / t * 60
        eff = "-" if name == "serial" else f"{rate / serial_rate / 2:.0%}"
        lines.append(f"| {name} | {t:.1f} | {rate:.0f} | {eff} |")
    lines += ["", f"Identical Kt from every executor: {same}.", ""]
    fit = fit_results([r for r in results if r.values["dh"] == 12.0], ["rf"], "power")
    lines += ["Fit of the largest Kt_net (hole or fillet, whichever governs) against rf at dh = 12:", "", "    " + format_fit(fit).replace(
        "\n", "\n    "), ""]
    write_sweep_plot(results, ["rf", "dh"], "net", os.path.join(HERE, "sweep_demo_link.png"),
                     "demo link (demo data): largest Kt_net over rf and dh")
    publish(lines, os.path.join(HERE, "SWEEP.md"))


if __name__ == "__main__":
    main()
