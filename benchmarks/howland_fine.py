"""Howland strip: converged FE (64 elements per radius, and a 3-level study from 16) against the
Howland (1930) table recalled from memory. Writes benchmarks/HOWLAND.md itself."""

from __future__ import annotations

import os
import sys

HERE = os.path.dirname(os.path.abspath(__file__))
sys.path.insert(0, os.path.join(HERE, "..", "tests"))
sys.path.insert(0, HERE)

from _publish import publish  # noqa: E402

from conftest import strip_case  # noqa: E402

from fekt.case.schema import MeshSpec  # noqa: E402
from fekt.studies.convergence import converge  # noqa: E402

HOWLAND = {0.1: 3.03, 0.2: 3.14, 0.3: 3.36, 0.4: 3.74, 0.5: 4.32}  # gross Kt, from memory (references 1.4)


def main() -> None:
    lines = ["# Howland strip: converged FE against the recalled table (written by benchmarks/howland_fine.py)", "",
             "Strip W = 40, length 8W, central hole; Kt on the gross section. Study: 16, 32, 64 elements per "
             "radius, GCI band on the finest value.", "",
             "| d/W | Howland (from memory) | FE, 64 el./radius | Richardson value | GCI band | FE - table |",
             "|---|---|---|---|---|---|"]
    for x, ref in HOWLAND.items():
        case = strip_case(W=40.0, L=320.0, d=40.0 * x, mesh=MeshSpec(elements_per_radius=16))
        study = converge(case, levels=3)
        s = max((s for s in study.spots if s.key == "cut-out 'hole'"), key=lambda s: s.values[0])
        g = s.gross_over_net
        fine = s.values[0] * g
        ext = f"{s.extrapolated * g:.4f}" if s.extrapolated is not None else f"- ({s.verdict})"
        band = f"+-{s.band * g:.4f}" if s.band is not None else "-"
        lines.append(f"| {x} | {ref:.2f} | {fine:.4f} | {ext} | {band} | {100 * (fine - ref) / ref:+.2f} % |")
    publish(lines, os.path.join(HERE, "HOWLAND.md"))


if __name__ == "__main__":
    main()
