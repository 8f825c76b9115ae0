"""Kirsch exact-traction case through the study machinery: the reported value, band and Richardson
value beside the true error (exact Kt = 3, Kirsch 1898). Writes benchmarks/KIRSCH_STUDY.md itself."""

from __future__ import annotations

import os
import sys


HERE = os.path.dirname(os.path.abspath(__file__))
sys.path.insert(0, os.path.join(HERE, "..", "tests"))
sys.path.insert(0, HERE)

from _publish import publish  # noqa: E402

from conftest import kirsch_level  # noqa: E402

from fekt.report.convergence import spot_message  # noqa: E402
from fekt.studies.convergence import study_spots  # noqa: E402


def main() -> None:
    lv = [kirsch_level(8, 8.0), kirsch_level(16, 4.0), kirsch_level(32, 2.0), kirsch_level(64, 1.0)]
    lines = ["# Kirsch: uncertainty bands against the true error (written by benchmarks/kirsch_study.py)", "",
             "| study | meshes (el./radius) | Kt fine | true error | band | band / error | Richardson value | message |",
             "|---|---|---|---|---|---|---|---|"]
    for name, ls in [("fekt solve (two-grid)", lv[:2]), ("fekt converge, 3 levels", lv[:3]),
                     ("fekt converge, 4 levels", lv)]:
        (s,) = study_spots(ls, 20.0)
        err = abs(s.values[0] - 3.0)
        ext = "-" if s.extrapolated is None else f"{s.extrapolated:.6f}"
        meshes = ", ".join(f"{x.spec.elements_per_radius:g}" for x in ls)
        lines.append(f"| {name} | {meshes} | {s.values[0]:.6f} | {err:.2e} | {s.band:.2e} | {s.band / err:.1f} | "
                     f"{ext} | {spot_message(s)} |")
    publish(lines, os.path.join(HERE, "KIRSCH_STUDY.md"))


if __name__ == "__main__":
    main()
