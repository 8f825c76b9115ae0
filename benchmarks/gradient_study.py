"""The relative stress gradient at a peak: which recovery of d sigma/dn is accurate, on Kirsch's exact field,
and the U-notch root beside the chart approximation 2/r. Writes benchmarks/GRADIENT.md itself.

Kirsch (1898), remote stress along x, hole radius a: at the hole's top sigma_xx(r) = S/2 (2 + a^2/r^2 +
3 a^4/r^4), so chi* = -(d sigma/dr)/sigma = 7/(3a) (derived; tests/test_gradient_fe.py). The plate has the
exact traction on a square of side 20a, so every error is the method's.
"""

from __future__ import annotations

import os
import sys

import numpy as np

HERE = os.path.dirname(os.path.abspath(__file__))
sys.path.insert(0, os.path.join(HERE, "..", "tests"))
sys.path.insert(0, HERE)

from _publish import publish  # noqa: E402

from conftest import kirsch_solution  # noqa: E402

from fekt.api import parse_case  # noqa: E402
from fekt.exact import kirsch_stress  # noqa: E402
from fekt.pipeline import run  # noqa: E402
from fekt.post.fields import probe_stress  # noqa: E402
from fekt.post.gradient import fit_gradient, nearest_sample, sample_window  # noqa: E402

EXACT = 7.0 / 3.0
LEVELS = (8, 16, 32)


def line_fit(sol, depth: float, degree: int, count: int) -> float:
    """chi* of a polynomial in depth through point values along the normal line from (0, a)."""
    t = np.linspace(0.0, depth, count)
    pts = np.vstack([np.zeros_like(t), 1.0 + t])
    pts[1, 0] += 1e-12
    v = probe_stress(sol, pts).xx
    c = np.polynomial.polynomial.polyfit(t / depth, v, degree)
    return -c[1] / depth / c[0]


def band_fit(solved) -> tuple[float, float]:
    """(FE chi*, chi* of the same fit through the exact field) of fekt's Gauss-point band fit."""
    part, pm, sol, b = solved
    i = nearest_sample(b, 0.0, 1.0)
    w = sample_window(sol, pm, part, b, i, element_size=next(iter(pm.feature_sizes.values())), ligament=9.0)
    ex = kirsch_stress(w.xy[0], w.xy[1])[0]
    return fit_gradient(w.zeta, w.offset, w.values)[0], fit_gradient(w.zeta, w.offset, ex)[0]


def pct(x: float) -> str:
    return f"{100 * (x / EXACT - 1):+.2f} %"


def main() -> None:
    rows = {"line, 0.05a deep, quadratic, 11 points": [], "line, 0.5a deep, quartic, 201 points": [],
            "fekt: Gauss-point band, 0.5a x 0.1a": [], "  of which the fit's truncation (exact field, same points)": [],
            "  of which the discretisation (FE fit / exact-data fit - 1)": []}
    surface = {"sigma at (0, a) from the element there (probe)": [], "largest sigma at facet Gauss points": []}
    for epr in LEVELS:
        solved = kirsch_solution(elements_per_radius=epr)
        sol, b = solved[2], solved[3]
        at = probe_stress(sol, np.array([[0.0], [1.0 + 1e-12]])).xx[0]
        surface["sigma at (0, a) from the element there (probe)"].append(f"{100 * (at / 3 - 1):+.3f} %")
        hole = b.loop == 1
        surface["largest sigma at facet Gauss points"].append(f"{100 * (b.stt[hole].max() / 3 - 1):+.3f} %")
        rows["line, 0.05a deep, quadratic, 11 points"].append(pct(line_fit(sol, 0.05, 2, 11)))
        rows["line, 0.5a deep, quartic, 201 points"].append(pct(line_fit(sol, 0.5, 4, 201)))
        fe, ex = band_fit(solved)
        rows["fekt: Gauss-point band, 0.5a x 0.1a"].append(pct(fe))
        rows["  of which the fit's truncation (exact field, same points)"].append(pct(ex))
        rows["  of which the discretisation (FE fit / exact-data fit - 1)"].append(f"{100 * (fe / ex - 1):+.3f} %")
    lines = ["# Relative stress gradient at a peak (written by benchmarks/gradient_study.py)", "",
             "Kirsch plate, exact traction on a square of side 20a; exact chi* a = 7/3 at the hole's top. "
             "Error of chi* by recovery and mesh (elements per hole radius):", "",
             "| recovery | " + " | ".join(f"{e} el./a" for e in LEVELS) + " |",
             "|---|" + "---|" * len(LEVELS)]
    lines += [f"| {k} | " + " | ".join(v) + " |" for k, v in rows.items()]
    lines += ["", "The stress itself at the hole's top (exact 3S): where the line fits start", "",
              "| value | " + " | ".join(f"{e} el./a" for e in LEVELS) + " |", "|---|" + "---|" * len(LEVELS)]
    lines += [f"| {k} | " + " | ".join(v) + " |" for k, v in surface.items()]
    lines += ["", "Opposite U-notches in tension (H = 50, t = 5), fekt's value at the root beside the chart "
              "approximation 2/r (FKM groove entry without its depth term; Creager-Paris crack-tip field; from memory):",
              "", "| t/r | el./r | chi* r (FE) | vs 2/r | fit error estimate x r |", "|---|---|---|---|---|"]
    for t_over_r in (1.0, 4.0, 10.0):
        r = 5.0 / t_over_r
        for epr in (16, 32):
            case = parse_case(f"""
[part]
family = "opposite_u_notches"
thickness = 5
dimensions = {{ H = 50, t = 5, r = {r} }}
[load]
stress = 100
[mesh]
elements_per_radius = {epr}
""")
            g = run(case).result.peaks[0].gradient
            lines.append(f"| {t_over_r:g} | {epr} | {g.chi * r:.4f} | {100 * (g.chi * r / 2 - 1):+.1f} % | "
                         f"{g.error_estimate * r:.4f} |")
    publish(lines, os.path.join(HERE, "GRADIENT.md"))


if __name__ == "__main__":
    main()
