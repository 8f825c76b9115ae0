"""Output of sweeps and goal-seeking: tables, fitted formula text and the Kt-versus-parameter plot.

Formats numbers computed in :mod:`fekt.studies.sweep`; computes none (the plot only draws them).
"""

from __future__ import annotations

from .text import _num, _table


def format_sweep(results, names, basis: str, fit=None) -> str:
    key = "kt_net" if basis == "net" else "kt_gross"
    rows = []
    for r in results:
        kt = getattr(r, key)
        band = getattr(r, f"{key}_band")
        rows.append([str(r.index), *(_num(r.values[n], 6) for n in names), r.status,
                     _num(kt, 5) if kt is not None else "-", ("+-" + _num(band, 2)) if band is not None else "-",
                     _num(r.chart_kt, 4) + (f" ({r.chart_basis})" if r.chart_basis else "") if r.chart_kt else "-",
                     r.feature or r.message[:70]])
    lines = _table(["#", *names, "status", f"Kt_{basis}", "band", "chart", "feature / message"], rows)
    ok = sum(r.status == "ok" for r in results)
    lines.append(f"{ok} of {len(results)} points solved; invalid or failed points keep their message in the files.")
    if fit is not None:
        lines += ["", format_fit(fit)]
    return "\n".join(lines)


def format_fit(fit) -> str:
    coeffs = ", ".join(f"{k} = {v:.6g}" for k, v in fit.coefficients.items())
    ranges = "; ".join(f"{n} in [{a:.6g}, {b:.6g}]" for n, (a, b) in fit.ranges.items())
    return (f"Fit ({fit.form}) over {fit.points} points: Kt = {fit.formula}\n  {coeffs}\n  largest residual "
            f"{fit.max_residual:.3g}, rms {fit.rms_residual:.3g}; valid only for {ranges} (your own chart: do not "
            "extrapolate)")


def format_target(t) -> str:
    band = f" +- {t.kt_net_band:.2g}" if t.kt_net_band is not None else ""
    vband = f" +- {t.value_band:.3g}" if t.value_band is not None else ""
    return (f"{t.name} = {t.value:.6g}{vband} gives Kt_{t.basis} = {t.kt_net:.5g}{band} (target {t.target:g}; "
            f"{t.evaluations} solves; Brent's method on a bracket). The band on {t.name} is the Kt band divided by "
            "the local slope dKt/d" + t.name + ".")


def write_sweep_plot(results, names, basis: str, path: str, title: str, fit=None) -> None:
    import matplotlib

    matplotlib.use("Agg")
    import matplotlib.pyplot as plt
    import numpy as np

    key = "kt_net" if basis == "net" else "kt_gross"
    ok = [r for r in results if r.status == "ok"]
    fig, ax = plt.subplots(figsize=(6.4, 4.4))
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
    if fit is not None and len(names) == 1 and ok:
        xs = np.linspace(*fit.ranges[x_name], 200)
        if fit.form.startswith("poly"):
            deg = len(fit.coefficients) - 1
            ys = sum(fit.coefficients[f"c{k}"] * xs ** k for k in range(deg + 1))
        elif fit.form == "power":
            ys = fit.coefficients["A"] * xs ** fit.coefficients["b"]
        else:
            ys = None
        if ys is not None:
            ax.plot(xs, ys, ":", color="0.3", label=f"fit {fit.form} (max residual {fit.max_residual:.2g})")
    ax.set_xlabel(x_name)
    ax.set_ylabel(f"Kt_{basis} [-]")
    ax.set_title(title, fontsize=10)
    ax.legend(fontsize=8)
    fig.tight_layout()
    fig.savefig(path, dpi=120)
    plt.close(fig)
