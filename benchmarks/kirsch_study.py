"""Kirsch exact-traction case through the study machinery: the reported value, band and Richardson
value beside the true error (exact Kt = 3, Kirsch 1898). Writes benchmarks/KIRSCH_STUDY.md itself."""

from __future__ import annotations

import os
import sys

import numpy as np

HERE = os.path.dirname(os.path.abspath(__file__))
sys.path.insert(0, os.path.join(HERE, "..", "tests"))

from conftest import kirsch_solution  # noqa: E402

from fekt.case.schema import MeshSpec  # noqa: E402
from fekt.post.hotspots import local_scatter  # noqa: E402
from fekt.studies.convergence import Level, Sample, study_spots  # noqa: E402


def level(epr: float, h: float) -> Level:
    _, pm, sol, b = kirsch_solution(elements_per_radius=epr)
    m = np.where(b.loop == 1)[0]
    i = int(m[np.argmax(b.s1[m])])
    s = Sample("hole", float(b.xy[0, i]), float(abs(b.xy[1, i])), float(b.s1[i]), kind="hole",
               scatter=local_scatter(b, i))
    return Level(MeshSpec(elements_per_radius=epr), pm.n_elements, sol.ndofs, h, 0.0, (s,))


def main() -> None:
    lv = [level(8, 8.0), level(16, 4.0), level(32, 2.0), level(64, 1.0)]
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
                     f"{ext} | {s.message} |")
    text = "\n".join(lines) + "\n"
    print(text)
    with open(os.path.join(HERE, "KIRSCH_STUDY.md"), "w", encoding="utf-8") as fh:
        fh.write(text)


if __name__ == "__main__":
    main()
