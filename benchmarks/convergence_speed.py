"""Wall time of a 4-level refinement study on the demo link (goal: at most 10 s on 2 cores), serial
and with levels in 2 processes. Writes benchmarks/CONVERGENCE.md itself."""

from __future__ import annotations

import dataclasses
import os
import sys
import time

from fekt.api import load_case
from fekt.pipeline import run
from fekt.report.convergence import spot_message
from fekt.studies.convergence import converge

HERE = os.path.dirname(os.path.abspath(__file__))
sys.path.insert(0, HERE)

from _publish import publish  # noqa: E402


def main() -> None:
    case = load_case(os.path.join(HERE, "..", "cases", "demo_link.toml"))
    case = dataclasses.replace(case, mesh=dataclasses.replace(case.mesh, elements_per_radius=8))
    run(case)  # warm-up: imports and first-call costs out of the timings
    rows = []
    for jobs in (1, 2):
        t0 = time.perf_counter()
        study = converge(case, levels=4, jobs=jobs)
        rows.append((jobs, time.perf_counter() - t0, study))
    lines = ["# 4-level convergence study on the demo link (written by benchmarks/convergence_speed.py)", "",
             "Level 0 at 8 elements per notch radius, ratio 2 (8, 16, 32, 64). Demo data: invented part.", "",
             "| processes | wall s | DOFs per level | ratio to serial |", "|---|---|---|---|"]
    for jobs, t, study in rows:
        dofs = ", ".join(str(int(lv.dofs)) for lv in study.levels)
        lines.append(f"| {jobs} | {t:.2f} | {dofs} | {t / rows[0][1]:.2f} |")
    lines += ["", "Stress peaks of the finest level:", ""]
    for s in rows[0][2].spots:
        lines.append(f"- {s.rank}. {s.key}: {spot_message(s)}")
    publish(lines, os.path.join(HERE, "CONVERGENCE.md"))


if __name__ == "__main__":
    main()
