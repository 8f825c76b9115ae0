"""Chart cross-checks: the published fit beside the FE Kt, with the difference and chart coverage.

Numbers and verdicts only (records of :mod:`fekt.records`); the report words them.

* Family cases (standard shapes from handbook dimensions): the family's own chart, FE Kt in the
  chart's nominal-stress convention, the difference in %, and a coverage verdict.
* Free-form parts: for each stress peak whose feature looks like a chart shape (a circular hole in a
  strip-like section, a fillet at a symmetric width step, a pair of opposite notches), the local chart
  parameters are measured from the geometry and the "nearest chart" value is shown. It ignores any
  interaction with other features, which is exactly what the comparison is meant to reveal.

Conventions match: chart net sections are fekt's net sections for these shapes, and the chart's
sigma_nom (P/(h d), 6M/(h d^2), P/(h W)) equals fekt's beam-theory nominal stress there.
"""

from __future__ import annotations

import dataclasses

import numpy as np

from ..case.schema import Case
from ..families import REGISTRY as SHAPES
from ..geometry.model import PartGeometry
from ..geometry.sections import feature_extent, net_section, part_polygon, section_at, transverse
from ..kinds import Basis, FeatureKind
from ..records import ChartCheck, FamilyCheck, NoChart, Result
from .fits import ChartFit, coverage, gap_for, kt_as, primary_fit

#: a hole counts as central in its strip if its centre is within this fraction of the local width
#: from the strip's mid-line (our own threshold)
CENTRAL_TOLERANCE = 0.02


#: reasons for "no chart" (codes; the report words them)
COMBINED_LOAD = "combined load"
NO_FIT = "no fit"
NO_NOTCH_PEAK = "no notch peak"
NOT_RESEMBLING = "resembles no chart"


def load_kind(result: Result) -> str | None:
    """'tension', 'bending' or 'torsion' when the load is one of them alone, else None (combined load)."""
    quantities = {c.quantity for c in result.load.components if c.magnitude != 0}
    return {frozenset({"force"}): "tension", frozenset({"moment"}): "bending",
            frozenset({"torque"}): "torsion"}.get(frozenset(quantities))


def _compare(kind: str, fit: ChartFit, dims: dict, fe_net: float | None, fe_gross: float | None) -> ChartCheck:
    cov = coverage(fit, **dims)
    chart = fit.kt(**dims)
    fe = fe_net if fit.basis == "net" else fe_gross
    diff = None if fe is None else 100.0 * (fe - chart) / chart
    return ChartCheck(
        kind=kind, family=fit.family, load=fit.load, fit=fit.key, source=fit.source, confidence=fit.confidence,
        from_memory=fit.from_memory, basis=Basis(fit.basis), nominal=fit.nominal, dims=dict(dims), chart_kt=chart,
        fe_kt=fe, difference_pct=diff, band_pct=100.0 * fit.band,
        within_band=(diff is not None and abs(diff) <= 100.0 * fit.band), coverage=cov.verdict,
        coverage_notes=tuple(cov.messages), ratios={k: v for k, v in cov.ratios})


def family_dims(case: Case) -> dict:
    return SHAPES[case.part.family].chart_dims(dict(case.part.dimensions))


def family_check(case: Case, result: Result) -> tuple[FamilyCheck, ChartCheck | None]:
    """Chart versus FE for a family case: the check and the record for the compared peak."""
    fam = case.part.family
    load = load_kind(result)
    if load is None:
        return FamilyCheck(fam, None, None, NoChart(COMBINED_LOAD, family=fam)), None
    dims = family_dims(case)
    fit = primary_fit(fam, load, dims, allow_low=True)  # low confidence is labelled
    if fit is None:
        gap = gap_for(fam, load)
        return FamilyCheck(fam, load, None, NoChart(NO_FIT, gap.reason if gap else "", fam, load)), None
    spots = [h for h in result.peaks if h.feature_kind != FeatureKind.EDGE and h.kt_net is not None]
    if not spots:
        return FamilyCheck(fam, load, None, NoChart(NO_NOTCH_PEAK, family=fam, load=load)), None
    top = max(spots, key=lambda h: h.kt_net)
    return FamilyCheck(fam, load, top.rank), _compare("family", fit, dims, top.kt_net, top.kt_gross)


# --- nearest chart for free-form parts --------------------------------------------------------------

def nearest_charts(part: PartGeometry, result: Result) -> dict[int, ChartCheck | NoChart]:
    """Per notch feature (its first peak): the nearest chart's Kt_net beside the FE Kt_net, or why there is
    none; keyed by the peak's rank."""
    load = load_kind(result)
    axis = np.array(result.load.axis)
    e = transverse(axis)
    poly = part_polygon(part)
    feats = {f.name: f for f in part.features}
    out: dict[int, ChartCheck | NoChart] = {}
    seen = set()
    for hs in result.peaks:
        f = feats.get(hs.feature)
        if f is None or f.name in seen or hs.kt_net is None:
            continue
        seen.add(f.name)
        if load is None:
            out[hs.rank] = NoChart(COMBINED_LOAD)
            continue
        family, dims, why = _resemble(f, part, axis, e, poly, feats)
        if family is None:
            out[hs.rank] = NoChart(NOT_RESEMBLING, why)
            continue
        fit = primary_fit(family, load, dims, allow_low=True)
        if fit is None:
            gap = gap_for(family, load)
            out[hs.rank] = NoChart(NO_FIT, gap.reason if gap else "", family, load)
            continue
        check = _compare("nearest", fit, dims, hs.kt_net, hs.kt_gross)
        chart_net = kt_as(fit, "net", **dims)
        out[hs.rank] = dataclasses.replace(check, chart_kt_net=chart_net,
                                           difference_pct=100.0 * (hs.kt_net - chart_net) / chart_net)
    return out


def _cut_width(part, axis, s, poly) -> float:
    return section_at(part, axis, s, poly).width


def _resemble(f, part, axis, e, poly, feats) -> tuple[str | None, dict, str]:
    """Which chart family a feature resembles, with its local dimensions; or why none does."""
    if f.kind == FeatureKind.HOLE:
        seg = part.segment(f.segments[0])
        c = np.array(seg.center)
        s = float(c @ axis)
        sec = section_at(part, axis, s, poly)
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
    if f.kind in (FeatureKind.FILLET, FeatureKind.CONCAVE_ARC):
        lo, hi = feature_extent(part, f, axis)
        net = net_section(part, f, axis, poly)
        pad = 1e-3 * (hi - lo + 1.0)
        w_lo = _cut_width(part, axis, lo - pad, poly)
        w_hi = _cut_width(part, axis, hi + pad, poly)
        D = max(w_lo, w_hi)
        if D <= net.width * (1 + 1e-6):
            return None, {}, "no width step at this fillet"
        twins = [g for g in feats.values() if g is not f and g.kind == f.kind
                 and abs(float(np.mean(feature_extent(part, g, axis))) - 0.5 * (lo + hi)) < 1e-6 * (1 + abs(lo))]
        if not twins:
            return None, {}, "one-sided step: the flat-shoulder chart is for a symmetric step"
        return "shoulder_fillet", {"D": D, "d": net.width, "r": f.radius}, ""
    if f.kind == FeatureKind.NOTCH:
        net = net_section(part, f, axis, poly)
        twins = [g for g in feats.values() if g is not f and g.kind == FeatureKind.NOTCH
                 and abs(net_section(part, g, axis, poly).s - net.s) < 1e-6 * (1 + abs(net.s))]
        lo, hi = feature_extent(part, f, axis)
        H = _cut_width(part, axis, hi + max(hi - lo, 1e-9) * 2.0, poly)
        if not twins:
            return None, {}, "a single notch: only the semi-infinite limit applies as 2t/H -> 0"
        t = (H - net.width) / 2
        if t <= 0:
            return None, {}, "could not measure the notch depth"
        return "opposite_u_notches", {"H": H, "t": t, "r": f.radius}, ""
    return None, {}, f"no chart family for a {f.kind.replace('_', ' ')}"


def with_charts(case: Case, part: PartGeometry, result: Result) -> Result:
    """The result with each peak's chart check (the family check, or the nearest chart per feature)."""
    if case.part.family:
        check, record = family_check(case, result)
        peaks = tuple(dataclasses.replace(p, chart=record) if p.rank == check.peak_rank else p for p in result.peaks)
        return dataclasses.replace(result, peaks=peaks, family_check=check)
    nearest = nearest_charts(part, result)
    peaks = tuple(dataclasses.replace(p, chart=nearest.get(p.rank)) for p in result.peaks)
    return dataclasses.replace(result, peaks=peaks)


__all__ = ["family_check", "nearest_charts", "with_charts", "load_kind"]
