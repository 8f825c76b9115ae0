"""FE Kt against the published chart fits over a grid of interior parameters, per family and load.

Writes benchmarks/CHARTS.md and one plot per family (benchmarks/charts_<family>_<load>.png) itself.
Fits recalled from memory are marked; nothing is tuned to agree (see docs/known-discrepancies.md).
"""

from __future__ import annotations

import os
import sys
import time
from collections import defaultdict

from fekt.api import solve
from fekt.charts.grid import case_for, default_grid
from fekt.records import to_jsonable

HERE = os.path.dirname(os.path.abspath(__file__))
sys.path.insert(0, HERE)

from _publish import publish  # noqa: E402


def run_grid():
    rows = []
    for p in default_grid():
        t0 = time.perf_counter()
        r = solve(case_for(p), estimate=True)
        check = r.family_check
        if check.peak_rank is None:
            chk = {"verdict": "no chart", "reason": check.no_chart.detail or check.no_chart.reason}
            band = None
        else:
            peak = r.peak(check.peak_rank)
            chk = to_jsonable(peak.chart)
            b = peak.band
            band = None if b is None else (b.kt_net if chk["basis"] == "net" else b.kt_gross)
        rows.append((p, chk, band, time.perf_counter() - t0))
    return rows


def main() -> None:
    rows = run_grid()
    lines = ["# FE against chart fits (written by benchmarks/charts.py)", "",
             "Family cases at default settings; FE Kt in each fit's own convention, with its two-grid band. "
             "Fits marked * are recalled from memory (references section 2).", "",
             "| family | load | point | fit | chart Kt | FE Kt | FE band | diff % | fit band % | verdict | s |",
             "|---|---|---|---|---|---|---|---|---|---|---|"]
    groups = defaultdict(list)
    for p, c, band, sec in rows:
        if c.get("verdict") == "no chart":
            lines.append(f"| {p.family} | {p.load} | {p.label} | - | - | - | - | - | - | no chart: {c['reason'][:60]} | {sec:.1f} |")
            continue
        inside = "within band" if c["within_band"] else "OUTSIDE BAND"
        cov = "" if c["coverage"] == "inside" else " (outside coverage)"
        star = "*" if c["from_memory"] else ""
        lines.append(f"| {p.family} | {p.load} | {p.label} | {c['fit']}{star} | {c['chart_kt']:.4f} | {c['fe_kt']:.4f} | "
                     f"+-{band:.4f} | {c['difference_pct']:+.2f} | {c['band_pct']:.0f} | {inside}{cov} | {sec:.1f} |")
        groups[(p.family, p.load)].append((p, c))
    publish(lines, os.path.join(HERE, "CHARTS.md"))
    _plots(groups)


def _plots(groups) -> None:
    import matplotlib

    matplotlib.use("Agg")
    import matplotlib.pyplot as plt

    for (family, load), items in groups.items():
        fig, ax = plt.subplots(figsize=(6, 4))
        xs = range(len(items))
        ax.plot(xs, [c["chart_kt"] for _, c in items], "s--", color="0.45", mfc="white", label="chart fit")
        ax.plot(xs, [c["fe_kt"] for _, c in items], "o", color="black", label="fekt (FE)")
        ax.set_xticks(list(xs))
        ax.set_xticklabels([p.label for p, _ in items], rotation=60, ha="right", fontsize=7)
        ax.set_ylabel(f"Kt ({items[0][1]['basis']} section) [-]")
        ax.set_title(f"{family}, {load}: FE against {items[0][1]['fit']}", fontsize=9)
        ax.legend(fontsize=8)
        fig.tight_layout()
        fig.savefig(os.path.join(HERE, f"charts_{family}_{load}.png"), dpi=110)
        plt.close(fig)


if __name__ == "__main__":
    main()
