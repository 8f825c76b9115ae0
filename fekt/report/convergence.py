"""Output of a refinement study: terminal table, CSV, and the Kt-versus-DOFs plot.

Formats numbers computed in :mod:`fekt.studies.convergence`; computes none.
"""

from __future__ import annotations

import csv
import io
import math

from ..studies.convergence import STUDY, band_record
from .text import num
from .text import table
from .words import band_message


def spot_message(s) -> str:
    """The sentence for one tracked peak of a study."""
    return band_message(band_record(s, STUDY), x=s.x, y=s.y)


def format_study(study) -> str:
    lines = [f"fekt converge: {study.case_name}" + ("   [demo data: invented part]" if study.demo else "")]
    ladder = "nested splitting (ratio 2)" if study.nested else f"elements per notch radius x {study.ratio:g} per level"
    lines.append(f"{len(study.levels)} levels, {ladder}; {study.seconds:.1f} s")
    lines += table(["level", "elements/radius", "splits", "elements", "DOFs", "seconds"],
                    [[str(lv.level), num(lv.elements_per_radius, 4), str(lv.refine), str(int(lv.elements)),
                      str(int(lv.dofs)), f"{lv.seconds:.2f}"] for lv in study.levels])
    lines.append("")
    rows = []
    for s in study.spots:
        vals = " ".join(num(v, 6) for v in reversed(s.values))
        rows.append([str(s.rank), s.key + (" [SINGULAR]" if s.singular else ""), vals, s.verdict,
                     num(s.estimate.observed_order, 3) if s.estimate and s.estimate.observed_order else "-",
                     num(s.extrapolated, 6) if s.extrapolated is not None else "-",
                     ("+-" + num(s.band, 2)) if s.band is not None else "none"])
    lines.append("Kt_net per level (coarse -> fine), classification, observed order p, Richardson value, band:")
    lines += table(["#", "feature", "Kt_net by level", "sequence", "p", "extrapolated", "band (fine)"], rows)
    lines.append("")
    for s in study.spots:
        lines.append(f"  {s.rank}. {s.key}: {spot_message(s)}")
    lines.append("")
    lines.append("Band: Grid Convergence Index on the finest mesh (Roache 1994; observed order after Celik et al. "
                 "2008; Fs = 1.25 if p is within 10 % of 2, else Fs = 3 with p clipped to [0.5, 2]). Non-monotone "
                 "sequences are never extrapolated.")
    lines.append(f"Caution: {study.caution}")
    return "\n".join(lines)


def study_csv(study, length_unit: str = "case units") -> str:
    """One row per peak and mesh level; every header names its unit (``[-]`` for ratios and counts)."""
    buf = io.StringIO()
    w = csv.writer(buf)
    w.writerow(["rank", "feature", f"x [{length_unit}]", f"y [{length_unit}]", "level", "elements_per_radius [-]",
                "refine [-]", "dofs [-]", "kt_net [-]", "verdict", "observed_order [-]", "kt_net_extrapolated [-]",
                "kt_net_band [-]"])
    n = len(study.levels)
    for s in study.spots:
        for j, v in enumerate(s.values):  # fine -> coarse
            lv = study.levels[n - 1 - j]
            w.writerow([s.rank, s.key, f"{s.x:.6g}", f"{s.y:.6g}", n - 1 - j, lv.elements_per_radius,
                        lv.refine, int(lv.dofs), repr(float(v)), str(s.verdict),
                        "" if not (s.estimate and s.estimate.observed_order) else repr(float(s.estimate.observed_order)),
                        "" if s.extrapolated is None else repr(float(s.extrapolated)),
                        "" if s.band is None else repr(float(s.band))])
    return buf.getvalue()


def write_study_plot(study, path: str) -> None:
    """Kt_net against DOFs per stress peak: markers per level, extrapolated value and band as lines.
    Greyscale-safe: one marker shape and line style per peak, no reliance on colour."""
    from matplotlib.figure import Figure

    spots = [s for s in study.spots if len(s.values) >= 2]
    n = max(1, len(spots))
    cols = min(3, n)
    rows = math.ceil(n / cols)
    fig = Figure(figsize=(4.4 * cols, 3.4 * rows))
    axes = fig.subplots(rows, cols, squeeze=False)
    for ax, s in zip(axes.ravel(), spots):
        dofs = list(reversed(s.dofs))
        vals = list(reversed(s.values))
        ax.plot(dofs, vals, "o-", color="black", mfc="white", lw=1.2, label="Kt_net per mesh")
        if s.extrapolated is not None:
            ax.axhline(s.extrapolated, color="0.3", ls="--", lw=1.0, label="Richardson value")
        if s.band is not None:
            ax.axhspan(s.values[0] - s.band, s.values[0] + s.band, color="0.85", zorder=0, label="band on the finest value")
        ax.set_xscale("log")
        ax.set_xlabel("degrees of freedom")
        ax.set_ylabel("Kt_net [-]")
        title = f"{s.rank}. {s.key}"
        ax.set_title(title if len(title) < 40 else title[:37] + "...", fontsize=9)
        ax.text(0.02, 0.04, str(s.verdict), transform=ax.transAxes, fontsize=8, color="0.25")
        ax.legend(fontsize=7, loc="best")
    for ax in axes.ravel()[len(spots):]:
        ax.axis("off")
    fig.suptitle(f"{study.case_name}: convergence of Kt_net" + (" (demo data)" if study.demo else ""), fontsize=10)
    fig.tight_layout()
    fig.savefig(path, dpi=120)
