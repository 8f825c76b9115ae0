"""Chart cross-checks: the published fit beside the FE Kt, with the difference and chart coverage.

* Family cases (standard shapes from handbook dimensions): the family's own chart, FE Kt in the
  chart's nominal-stress convention, the difference in %, and a coverage verdict.
* Free-form parts: for each hot spot whose feature looks like a chart shape (a circular hole in a
  strip-like section, a fillet at a symmetric width step, a pair of opposite notches), the local chart
  parameters are measured from the geometry and the "nearest chart" value is shown. It ignores any
  interaction with other features, which is exactly what the comparison is meant to reveal.

Conventions match: chart net sections are fekt's net sections for these shapes, and the chart's
sigma_nom (P/(h d), 6M/(h d^2), P/(h W)) equals fekt's beam-theory nominal stress there.
"""

from __future__ import annotations

import numpy as np

from ..case.schema import Case
from ..geometry.model import PartGeometry
from ..geometry.sections import feature_extent, net_section, part_polygon, section_at, transverse
from ..pipeline import Result
from .fits import ChartFit, coverage, gap_for, kt_as, primary_fit

#: a hole counts as central in its strip if its centre is within this fraction of the local width
#: from the strip's mid-line (our own threshold)
CENTRAL_TOLERANCE = 0.02


def load_kind(case: Case) -> str | None:
    """'tension' or 'bending' when the case is one of them alone, else None (combined load)."""
    F = case.load.force if case.load.stress is None else case.load.stress
    M = case.load.moment
    if F and not M:
        return "tension"
    if M and not F:
        return "bending"
    return None


def _compare(fit: ChartFit, dims: dict, fe_net: float, fe_gross: float | None) -> dict:
    cov = coverage(fit, **dims)
    chart = fit.kt(**dims)
    fe = fe_net if fit.basis == "net" else fe_gross
    diff = None if fe is None else 100.0 * (fe - chart) / chart
    return {
        "fit": fit.key, "source": fit.source, "confidence": fit.confidence, "from_memory": fit.from_memory,
        "basis": fit.basis, "nominal": fit.nominal, "chart_kt": chart, "fe_kt": fe, "difference_pct": diff,
        "band_pct": 100.0 * fit.band, "within_band": (diff is not None and abs(diff) <= 100.0 * fit.band),
        "coverage": cov.verdict, "coverage_notes": list(cov.messages),
        "ratios": {k: v for k, v in cov.ratios},
    }


def _family_dims(case: Case) -> dict:
    d = dict(case.part.dimensions)
    fam = case.part.family
    if fam == "strip_hole":
        return {"d": d["d"], "W": d["W"]}
    if fam in ("opposite_u_notches", "single_u_notch"):
        return {"H": d["H"], "t": d["t"], "r": d["r"]}
    if fam == "shoulder_fillet":
        return {"D": d["D"], "d": d["d"], "r": d["r"]}
    if fam == "elliptical_hole":
        return {"a": d["a"], "b": d["b"], "W": d.get("W", 20 * d["a"])}
    return d


def family_check(case: Case, result: Result) -> dict:
    """Chart versus FE for a family case (see the module docstring)."""
    fam = case.part.family
    load = load_kind(case)
    out: dict = {"family": fam, "load": load}
    if load is None:
        out.update(verdict="no chart", reason="combined tension and bending: the charts cover one load at a time")
        return out
    fit = primary_fit(fam, load, _family_dims(case), allow_low=True)  # low confidence is labelled
    if fit is None:
        gap = gap_for(fam, load)
        out.update(verdict="no chart", reason=gap.reason if gap else f"no chart for {fam} in {load}")
        return out
    spots = [h for h in result.hot_spots if h.feature_kind != "edge" and h.kt_net is not None]
    if not spots:
        out.update(verdict="no chart", reason="no notch hot spot found")
        return out
    top = max(spots, key=lambda h: h.kt_net)
    cmp = _compare(fit, _family_dims(case), top.kt_net, top.kt_gross)
    out.update(cmp, verdict="outside coverage" if cmp["coverage"] == "outside" else "within coverage",
               hot_spot=top.rank)
    return out


# --- nearest chart for free-form parts --------------------------------------------------------------

def nearest_charts(case: Case, part: PartGeometry, result: Result) -> list[dict]:
    """Per notch hot spot: the nearest chart's Kt_net beside the FE Kt_net, or why there is none."""
    load = load_kind(case)
    axis = np.array(result.load["axis"])
    e = transverse(axis)
    poly = part_polygon(part)
    h_ = case.part.thickness
    feats = {f.name: f for f in part.features}
    out = []
    seen = set()
    for hs in result.hot_spots:
        f = feats.get(hs.feature)
        if f is None or f.name in seen or hs.kt_net is None:
            continue
        seen.add(f.name)
        row = {"rank": hs.rank, "feature": f.name, "fe_kt_net": hs.kt_net}
        if load is None:
            row["verdict"] = "no chart: combined tension and bending"
            out.append(row)
            continue
        family, dims, why = _resemble(f, part, axis, e, poly, h_, feats)
        if family is None:
            row["verdict"] = f"no chart resembles it ({why})"
            out.append(row)
            continue
        fit = primary_fit(family, load, dims, allow_low=True)
        if fit is None:
            gap = gap_for(family, load)
            row["verdict"] = f"no chart for {family} in {load}" + (f": {gap.reason}" if gap else "")
            out.append(row)
            continue
        chart_net = kt_as(fit, "net", **dims)
        cov = coverage(fit, **dims)
        row.update(verdict="nearest chart (ignores interaction with other features)", family=family,
                   fit=fit.key, source=fit.source, from_memory=fit.from_memory, dims=dims,
                   chart_kt_net=chart_net, difference_pct=100.0 * (hs.kt_net - chart_net) / chart_net,
                   coverage=cov.verdict, coverage_notes=list(cov.messages))
        out.append(row)
    return out


def _cut_width(part, axis, s, h, poly) -> float:
    return section_at(part, axis, s, h, poly).width


def _resemble(f, part, axis, e, poly, h, feats) -> tuple[str | None, dict, str]:
    """Which chart family a feature resembles, with its local dimensions; or why none does."""
    if f.kind == "hole":
        seg = part.segment(f.segments[0])
        c = np.array(seg.center)
        s = float(c @ axis)
        sec = section_at(part, axis, s, h, poly)
        yc, R = float(c @ e), seg.radius
        lo = [iv for iv in sec.intervals if iv[1] <= yc - R + 1e-9 * R]
        hi = [iv for iv in sec.intervals if iv[0] >= yc + R - 1e-9 * R]
        if len(sec.intervals) != 2 or not lo or not hi:
            return None, {}, "the cut through the hole meets other cut-outs"
        W = hi[0][1] - lo[-1][0]
        mid = 0.5 * (hi[0][1] + lo[-1][0])
        if abs(yc - mid) > CENTRAL_TOLERANCE * W:
            return None, {}, f"the hole is off the strip's mid-line by {abs(yc - mid) / W:.1%} of the width"
        return "strip_hole", {"d": 2 * R, "W": W}, ""
    if f.kind in ("fillet", "concave_arc"):
        lo, hi = feature_extent(part, f, axis)
        net = net_section(part, f, axis, h, poly)
        pad = 1e-3 * (hi - lo + 1.0)
        w_lo = _cut_width(part, axis, lo - pad, h, poly)
        w_hi = _cut_width(part, axis, hi + pad, h, poly)
        D = max(w_lo, w_hi)
        if D <= net.width * (1 + 1e-6):
            return None, {}, "no width step at this fillet"
        twins = [g for g in feats.values() if g is not f and g.kind == f.kind
                 and abs(float(np.mean(feature_extent(part, g, axis))) - 0.5 * (lo + hi)) < 1e-6 * (1 + abs(lo))]
        if not twins:
            return None, {}, "one-sided step: the flat-shoulder chart is for a symmetric step"
        return "shoulder_fillet", {"D": D, "d": net.width, "r": f.radius}, ""
    if f.kind == "notch":
        net = net_section(part, f, axis, h, poly)
        twins = [g for g in feats.values() if g is not f and g.kind == "notch"
                 and abs(net_section(part, g, axis, h, poly).s - net.s) < 1e-6 * (1 + abs(net.s))]
        lo, hi = feature_extent(part, f, axis)
        H = _cut_width(part, axis, hi + max(hi - lo, 1e-9) * 2.0, h, poly)
        if not twins:
            return None, {}, "a single notch: only the semi-infinite limit applies as 2t/H -> 0"
        t = (H - net.width) / 2
        if t <= 0:
            return None, {}, "could not measure the notch depth"
        return "opposite_u_notches", {"H": H, "t": t, "r": f.radius}, ""
    return None, {}, f"no chart family for a {f.kind.replace('_', ' ')}"


def chart_lines(check: dict | None, nearest: list[dict] | None, stress_unit: str = "") -> list[str]:
    """Human lines for the text report."""
    lines = []
    if check:
        lines.append("Chart cross-check (" + f"{check['family']}, {check['load'] or 'combined'}):")
        if check.get("verdict") == "no chart":
            lines.append(f"  no chart: {check['reason']}")
        else:
            mem = " (fit recalled from memory)" if check["from_memory"] else ""
            lines.append(f"  {check['fit']}{mem}: chart Kt_{check['basis']} = {check['chart_kt']:.4g}, FE "
                         f"Kt_{check['basis']} = {check['fe_kt']:.4g}, difference {check['difference_pct']:+.2f} % "
                         f"(fit band +-{check['band_pct']:.0f} %, confidence {check['confidence']})")
            if check["coverage"] == "outside":
                lines.append("  OUTSIDE CHART COVERAGE: " + "; ".join(check["coverage_notes"]))
            else:
                ratios = ", ".join(f"{k} = {v:.4g}" for k, v in check["ratios"].items())
                lines.append(f"  within coverage ({ratios}); nominal stress {check['nominal']}")
            lines.append(f"  source: {check['source']}")
    if nearest:
        lines.append("Nearest chart per feature (each notch alone; ignores interaction with other features):")
        for n in nearest:
            if "chart_kt_net" in n:
                cov = "" if n["coverage"] == "inside" else " [outside coverage: " + "; ".join(n["coverage_notes"]) + "]"
                dims = ", ".join(f"{k} = {v:.4g}" for k, v in n["dims"].items())
                lines.append(f"  {n['feature']}: FE Kt_net {n['fe_kt_net']:.4g} vs {n['fit']} {n['chart_kt_net']:.4g} "
                             f"({dims}; FE {n['difference_pct']:+.1f} %){cov}")
            else:
                lines.append(f"  {n['feature']}: {n['verdict']}")
    return lines


def chart_report(case: Case, part: PartGeometry, result: Result) -> dict:
    """What ``Result.charts`` holds: the family check or the nearest charts, plus report lines."""
    if case.part.family:
        check = family_check(case, result)
        return {"family_check": check, "lines": chart_lines(check, None)}
    nearest = nearest_charts(case, part, result)
    return {"nearest": nearest, "lines": chart_lines(None, nearest)}


__all__ = ["family_check", "nearest_charts", "chart_report", "chart_lines", "load_kind"]
