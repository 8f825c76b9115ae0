"""The sentences users read about bands, convergence verdicts and chart checks.

Studies and charts return numbers and verdicts (:mod:`fekt.records`, :mod:`fekt.studies.convergence`);
this module words them, for the text report, the study report and any other format.
"""

from __future__ import annotations

import math

from ..kinds import Verdict
from ..records import Band, ChartCheck, FamilyCheck, NoChart

#: what the two kinds of band are (methods of fekt.studies.convergence)
TWO_GRID_METHOD = ("two-grid GCI (Roache 1994): second mesh with half the elements per notch radius, Fs = 3, "
                   "formal order p = 2; band on the fine-mesh Kt")
STUDY_METHOD = ("Grid Convergence Index: observed order by Celik et al. (2008), Richardson extrapolation, "
                "Fs = 1.25 when the observed order is within 10 % of 2, else Fs = 3 (Roache 1994; Oberkampf & Roy "
                "2010)")


def decimals_for(u: float) -> int:
    """Decimals giving 2 significant digits of u, at least 3.

    Two significant digits for an uncertainty follow JCGM 100:2008 (GUM) 7.2.6 [from memory]; the
    minimum of 3 decimals is our own convention."""
    d = 1 - math.floor(math.log10(u))
    if round(u, d) >= 10.0 ** (2 - d):  # rounding carried into a third digit (e.g. 0.0996)
        d -= 1
    return max(3, d)


def _fmt_order(p: float) -> str:
    return f"{p:.3g}" if abs(p - round(p)) > 1e-12 else f"{round(p):d}"


def _grids(used: int, total: int) -> str:
    """"3 grids", or "finest 3 of 5 grids" when only some were used."""
    return f"{used} grids" if used == total else f"finest {used} of {total} grids"


def _value_line(name: str, value: float, *, verdict: str, u: float | None, grids: str, fs: float | None,
                order_used: float | None, observed_order: float | None) -> str:
    if verdict == Verdict.DIVERGING or u is None or not math.isfinite(u):
        return f"{name} = {value:.3f} (diverging under refinement, {grids}: no uncertainty estimate)"
    if verdict == Verdict.CONVERGED or u == 0.0:
        return f"{name} = {value:.6f} (converged to solver precision, fine mesh, {grids})"
    d = decimals_for(u)
    head = f"{name} = {value:.{d}f} +- {u:.{d}f}"
    if verdict == Verdict.OSCILLATORY:
        return f"{head} (oscillatory, fine mesh, {grids}, not extrapolated, band {fs:g} x max difference)"
    p = order_used
    p_txt = f"{p:.3g}" if (observed_order is not None and p == observed_order) else _fmt_order(p)
    kind = "formal p" if verdict == Verdict.TWO_GRID else "p"
    return f"{head} (GCI, fine mesh, {grids}, Fs={fs:g}, {kind}={p_txt})"


def format_value(name: str, value: float, est) -> str:
    """One line for a grid-convergence estimate (:class:`fekt.studies.gci.ConvergenceEstimate`), e.g.
    ``"Kt_net = 2.512 +- 0.0031 (GCI, fine mesh, 3 grids, Fs=1.25, p=2.03)"``: the uncertainty with 2
    significant digits (at least 3 decimals) and the value with the same number of decimals."""
    return _value_line(name, value, verdict=est.classification, u=est.uncertainty_abs,
                       grids=_grids(est.n_used, len(est.values)), fs=est.safety_factor, order_used=est.order_used,
                       observed_order=est.observed_order)


def estimate_method(est) -> str:
    """How a grid-convergence estimate was made, in a few words (e.g. "GCI, 3 grids, Fs=1.25, observed p=1.79")."""
    n = _grids(est.n_used, len(est.values))
    c = est.classification
    if c == Verdict.DIVERGING:
        return f"diverging under refinement ({n}): no uncertainty estimate"
    if c == Verdict.CONVERGED:
        return f"converged to solver precision ({n}), band {est.safety_factor:g} x spread"
    if c == Verdict.OSCILLATORY:
        return f"oscillatory ({n}), not extrapolated, band {est.safety_factor:g} x max difference"
    if c == Verdict.TWO_GRID:
        return f"GCI, {n}, Fs={est.safety_factor:g}, formal p={_fmt_order(est.order_used)}"
    if est.order_used == est.observed_order:
        note = f"observed p={est.observed_order:.3g}"
    else:
        note = (f"p={_fmt_order(est.order_used)} (observed p={est.observed_order:.3g} not within 10% of formal "
                f"p={_fmt_order(est.formal_order)})")
    return f"GCI, {n}, Fs={est.safety_factor:g}, {note}"


def gci_value(name: str, value: float, band: Band) -> str:
    """The one-line form of :func:`format_value` for a peak's band (before any scatter floor)."""
    n = len(band.values_fine_to_coarse)
    return _value_line(name, value, verdict=band.verdict, u=band.convergence_band, grids=_grids(min(3, n), n),
                       fs=band.gci_fs, order_used=band.order_used, observed_order=band.observed_order)


def band_message(band: Band, *, x: float = math.nan, y: float = math.nan) -> str:
    """What a peak's band means, in one sentence (the study report's per-peak line)."""
    vals = band.values_fine_to_coarse
    v0 = vals[0] if vals else math.nan
    v = band.verdict
    if v == Verdict.UNTRACKED:
        return "this stress peak has no counterpart on the coarser mesh; no estimate"
    if v == Verdict.NOT_REFINED:
        return (f"Kt_net = {v0:.5g} +- {band.kt_net:.2g} (plain edge: this ladder refines only at notch features, "
                "so no order is estimated; band = the larger of 3 x the largest change and the local stress "
                "scatter; use --nested to refine here)")
    if v == Verdict.SINGULAR:
        return (f"singular: the peak at the sharp corner ({x:.4g}, {y:.4g}) keeps rising with refinement "
                f"({', '.join(f'{w:.4g}' for w in reversed(vals))} from coarse to fine); it has no finite value: "
                "give the corner a radius")
    if band.kt_net is None:
        return ("diverging: the value moves more on finer meshes "
                f"({', '.join(f'{w:.5g}' for w in reversed(vals))} from coarse to fine); not extrapolated, no band")
    if v in (Verdict.OSCILLATORY, Verdict.SCATTER):
        msg = (f"Kt_net = {v0:.5g} +- {band.convergence_band:.2g} ({v}: changes between meshes are not monotone; "
               f"not extrapolated; band = 3 x the largest change, {band.largest_change:.2g})")
    else:
        msg = gci_value("Kt_net", v0, band)
    if band.scatter_floor:
        msg = (f"Kt_net = {v0:.5g} +- {band.kt_net:.2g} (band set by the local stress scatter at the peak; the "
               f"convergence band alone was {band.convergence_band:.2g}: {msg})")
    return msg


NO_CHART_WORDS = {
    "combined load": "several loads at once: the charts cover one load at a time",
    "no notch peak": "no notch stress peak found",
}


def no_chart_text(n: NoChart) -> str:
    if n.reason == "resembles no chart":
        return f"no chart resembles it ({n.detail})"
    if n.reason == "no fit":
        where = f" for {n.family} in {n.load}" if n.family else ""
        return f"no chart{where}" + (f": {n.detail}" if n.detail else "")
    return "no chart: " + NO_CHART_WORDS.get(n.reason, n.reason)


def family_check_lines(check: FamilyCheck, record: ChartCheck | NoChart | None,
                       per_component: tuple = ()) -> list[str]:
    lines = [f"Chart cross-check ({check.family}, {check.load or 'combined'}):"]
    if not isinstance(record, ChartCheck):
        n = check.no_chart
        text = NO_CHART_WORDS.get(n.reason) if n else None
        lines.append(f"  no chart: {n.detail or text or n.reason}" if n else "  no chart")
        for c in per_component:
            lines += component_chart_lines(c)
        return lines
    mem = " (fit recalled from memory)" if record.from_memory else ""
    lines.append(f"  {record.fit}{mem}: chart Kt_{record.basis} = {record.chart_kt:.4g}, FE "
                 f"Kt_{record.basis} = {record.fe_kt:.4g}, difference {record.difference_pct:+.2f} % "
                 f"(fit band +-{record.band_pct:.0f} %, confidence {record.confidence})")
    if record.coverage == "outside":
        lines.append("  OUTSIDE CHART COVERAGE: " + "; ".join(record.coverage_notes))
    else:
        ratios = ", ".join(f"{k} = {v:.4g}" for k, v in record.ratios.items())
        lines.append(f"  within coverage ({ratios}); nominal stress {record.nominal}")
    lines.append(f"  source: {record.source}")
    return lines


def component_chart_lines(c: ChartCheck | NoChart) -> list[str]:
    """One load component of a peak against its own chart."""
    if isinstance(c, NoChart):
        return [f"  component '{c.component}': {no_chart_text(c)}"]
    cov = "within coverage" if c.coverage == "inside" else "OUTSIDE CHART COVERAGE: " + "; ".join(c.coverage_notes)
    diff = "-" if c.difference_pct is None else f"{c.difference_pct:+.2f} %"
    fe = "-" if c.fe_kt is None else f"{c.fe_kt:.4g}"
    return [f"  component '{c.component}' ({c.load}): {c.fit}: chart Kt_{c.basis} = {c.chart_kt:.4g}, FE {fe}, "
            f"difference {diff} (fit band +-{c.band_pct:.0f} %); {cov}"]


def nearest_chart_line(feature: str, fe_kt_net: float, record: ChartCheck | NoChart) -> str:
    if isinstance(record, NoChart):
        return f"  {feature}: {no_chart_text(record)}"
    cov = "" if record.coverage == "inside" else " [outside coverage: " + "; ".join(record.coverage_notes) + "]"
    dims = ", ".join(f"{k} = {v:.4g}" for k, v in record.dims.items())
    return (f"  {feature}: FE Kt_net {fe_kt_net:.4g} vs {record.fit} {record.chart_kt_net:.4g} "
            f"({dims}; FE {record.difference_pct:+.1f} %){cov}")
