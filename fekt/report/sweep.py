"""Output of sweeps and goal-seeking: tables, fitted formula text and the Kt-versus-parameter plot.

Formats numbers computed in :mod:`fekt.studies.sweep`; computes none (the plot only draws them).
"""

from __future__ import annotations

import math
from collections.abc import Mapping, Sequence

from ..studies.sweep import COLUMNS, PointResult
from .text import num, table


class SweepFiles:
    """The CSV of a sweep (``sweep.csv``); the points themselves are kept, one JSON line per finished
    point, by the resume file (:mod:`fekt.report.resume`).

    The CSV names a unit in every header: ``[-]`` for Kt values and bands, the stress unit of the peak
    stress, ``[s]`` for times, and ``[case: mm, N]`` for parameters (the case file's numbers, whose
    meaning -- length, ratio, force -- only the case file knows). After the varied parameters come the
    case's other parameters at each point (``parameters``: their names), then both Kt bases with
    their bands. ``shown`` converts the points for the CSV (e.g. to other output units); the resume file
    keeps the case's units."""

    def __init__(self, folder: str, names: Sequence[str], *, parameters: Sequence[str] = (), stress_unit: str = "",
                 case_units: str = "", shown=None):
        self.folder = folder
        self.names = list(names)
        self.others = [n for n in parameters if n not in self.names]
        self.stress_unit = stress_unit or "case stress unit"
        self.case_units = case_units or "case units"
        self.shown = shown

    def headers(self) -> list[str]:
        units = {"kt_net": "-", "kt_net_band": "-", "kt_gross": "-", "kt_gross_band": "-", "chart_kt": "-",
                 "peak": self.stress_unit, "seconds": "s"}
        return (["index", *(f"{n} (varied) [case: {self.case_units}]" for n in self.names),
                 *(f"{n} [case: {self.case_units}]" for n in self.others)]
                + [f"{c} [{units[c]}]" if c in units else c for c in COLUMNS[1:]])

    def write_csv(self, results: Sequence[PointResult], path: str) -> None:
        """Write the CSV of ``results`` to ``path`` (the caller makes it atomic)."""
        import csv

        shown = self.shown(list(results)) if self.shown is not None else results
        with open(path, "w", encoding="utf-8", newline="") as fh:
            w = csv.writer(fh)
            w.writerow(self.headers())
            for r in sorted(shown, key=lambda r: r.index):
                d = r.to_json()
                w.writerow([r.index, *(repr(r.values[n]) for n in self.names),
                            *(repr(r.parameters[n]) if n in r.parameters else "" for n in self.others),
                            *("" if d[c] is None else d[c] for c in COLUMNS[1:])])


def same_values(a: Mapping[str, float], b: Mapping[str, float]) -> bool:
    """Whether two points have the same parameter values (to rounding)."""
    return set(a) == set(b) and all(math.isclose(a[k], b[k], rel_tol=1e-12, abs_tol=1e-15) for k in b)


def followed_text(feature: str | None, results) -> str:
    """Which feature the sweep's Kt belongs to, in words."""
    if feature:
        return f"Kt of the feature '{feature}' (its largest-magnitude peak) at every point"
    seen = sorted({r.feature for r in results if r.status == "ok"})
    if len(seen) == 1:
        return f"Kt of the leading notch peak at every point: '{seen[0]}' (use --feature to choose another)"
    return ("Kt of the leading notch peak at each point, which is not the same feature at every point ("
            + ", ".join(f"'{f}'" for f in seen) + "): use --feature to follow one")


def format_sweep(results, names, basis: str, fit=None, feature: str | None = None) -> str:
    key = "kt_net" if basis == "net" else "kt_gross"
    rows = []
    for r in results:
        kt = getattr(r, key)
        band = getattr(r, f"{key}_band")
        rows.append([str(r.index), *(num(r.values[n], 6) for n in names), r.status,
                     num(kt, 5) if kt is not None else "-", ("+-" + num(band, 2)) if band is not None else "-",
                     num(r.chart_kt, 4) + (f" ({r.chart_basis})" if r.chart_basis else "") if r.chart_kt else "-",
                     r.feature or r.message[:70]])
    lines = [followed_text(feature, results) + ":"]
    lines += table(["#", *names, "status", f"Kt_{basis}", "band", "chart", "feature / message"], rows)
    ok = sum(r.status == "ok" for r in results)
    lines.append(f"{ok} of {len(results)} points solved; invalid or failed points keep their message in the files.")
    if fit is not None:
        lines += ["", format_fit(fit)]
    return "\n".join(lines)


def format_fit(fit) -> str:
    coeffs = ", ".join(f"{k} = {v:.6g}" for k, v in fit.coefficients.items())
    ranges = "; ".join(f"{n} in [{a:.6g}, {b:.6g}]" for n, (a, b) in fit.ranges.items())
    lines = [f"Fit ({fit.form}) over {fit.points} points: Kt = {fit.formula}", f"  {coeffs}",
             f"  largest residual {fit.max_residual:.3g}, rms {fit.rms_residual:.3g}; valid only for {ranges} "
             "(your own chart: do not extrapolate)"]
    if fit.typical_band is not None and fit.max_residual > 2 * fit.typical_band:
        lines.append(f"  WARNING: the largest residual is {fit.max_residual / fit.typical_band:.1f} times the typical "
                     f"FE band ({fit.typical_band:.2g}): this form does not follow the FE values; try another form")
    if fit.residual_dof < 3:
        lines.append(f"  WARNING: only {fit.residual_dof} residual degree(s) of freedom ({fit.points} points, "
                     f"{len(fit.coefficients)} coefficients): the fit passes close to every point by construction; "
                     "add points before trusting it between them")
    return "\n".join(lines)


def format_target(t, stress_unit: str = "") -> str:
    history = "; ".join(f"{t.name} = {p.value:.6g}: " + (f"Kt_{t.basis} {p.kt:.5g}" if p.kt is not None else p.status)
                        for p in sorted(t.history, key=lambda p: p.value))
    if not t.reached:
        return (f"Kt_{t.basis} = {t.target:g} is not crossed for {t.name} in the bounds by '{t.feature}' "
                f"({t.stop_reason}). Solves in order of {t.name}: {history}")
    band = f" +- {t.kt_band:.2g}" if t.kt_band is not None else ""
    vband = f" +- {t.value_band:.3g}" if t.value_band is not None else ""
    side = {"above": f"{t.name} >= {t.value:.6g}", "below": f"{t.name} <= {t.value:.6g}"}.get(t.keeps_below, "")
    peak = f" (peak stress {num(t.peak)} {stress_unit})".replace(" )", ")") if t.peak is not None else ""
    return (f"{side}{vband} keeps Kt_{t.basis} of '{t.feature}' at or below {t.target:g}; at the bound Kt_{t.basis} = "
            f"{t.kt:.5g}{band}{peak}. {t.evaluations} solves; stopped because {t.stop_reason}. The band on {t.name} "
            f"is the Kt band divided by the local slope dKt/d{t.name}.\nSolves in order of {t.name}: {history}")


def point_line(r, names: Sequence[str], basis: str) -> str:
    """One finished sweep point, for the progress log."""
    values = ", ".join(f"{n} = {num(r.values[n], 6)}" for n in names)
    if r.status != "ok":
        return f"point {r.index} ({values}): {r.status}: {r.message[:100]}"
    kt = r.kt_net if basis == "net" else r.kt_gross
    return f"point {r.index} ({values}): Kt_{basis} = {num(kt, 5)} at {r.feature} ({r.seconds:.1f} s)"


def target_line(name: str, p, basis: str) -> str:
    """One solve of goal-seeking (a SearchPoint), for the progress log."""
    if p.kt is None:
        return f"{name} = {p.value:.6g}: {p.status}: {p.message[:80]}"
    return f"{name} = {p.value:.6g}: Kt_{basis} = {p.kt:.5g}"


def write_sweep_plot(results, names, basis: str, path: str, title: str, fit=None, units: str = "") -> None:
    from matplotlib.figure import Figure

    key = "kt_net" if basis == "net" else "kt_gross"
    ok = [r for r in results if r.status == "ok"]
    fig = Figure(figsize=(6.4, 4.4))
    ax = fig.subplots()
    x_name = names[0]
    groups = {}
    for r in ok:
        groups.setdefault(tuple(r.values[n] for n in names[1:]), []).append(r)
    markers = "osD^v<>p"
    styles = ["-", "--", "-.", ":"]
    for g, (k, rs) in enumerate(sorted(groups.items())):
        rs = sorted(rs, key=lambda r: r.values[x_name])
        x = [r.values[x_name] for r in rs]
        y = [getattr(r, key) for r in rs]
        err = [getattr(r, f"{key}_band") or 0.0 for r in rs]
        label = ", ".join(f"{n} = {v:.4g}" for n, v in zip(names[1:], k)) or "fekt (FE)"
        ax.errorbar(x, y, yerr=err, fmt=markers[g % len(markers)] + styles[g % len(styles)], color="black",
                    mfc="white", capsize=3, lw=1.0, label=label)
        chart = [(r.values[x_name], r.chart_kt) for r in rs if r.chart_kt is not None and r.chart_basis == basis]
        if chart:
            cx, cy = zip(*chart)
            ax.plot(cx, cy, styles[g % len(styles)], color="0.55", lw=2.0,
                    label="published chart" + (f" ({label})" if names[1:] else ""))
    if fit is not None and fit.curve is not None and ok:
        ax.plot(*fit.curve, ":", color="0.3", label=f"fit {fit.form} (max residual {fit.max_residual:.2g})")
    ax.set_xlabel(x_name)
    ax.set_ylabel(f"Kt_{basis} [-]")
    ax.set_title(title, fontsize=10)
    ax.legend(fontsize=8)
    fig.tight_layout()
    fig.savefig(path, dpi=120)
