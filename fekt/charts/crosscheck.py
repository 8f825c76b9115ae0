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
#: widths next to a fillet count as constant within this fraction (our own threshold)
PRISMATIC_TOLERANCE = 0.01


def _u_flanks(part: PartGeometry, f) -> bool:
    """A U-notch: its root is one arc whose neighbouring curves are straight and parallel."""
    if len(f.segments) != 1:
        return False
    li, si = f.segments[0]
    segs = part.loops[li].segments
    before, after = segs[si - 1], segs[(si + 1) % len(segs)]
    if before.kind != "line" or after.kind != "line":
        return False
    d1 = np.subtract(before.end, before.start)
    d2 = np.subtract(after.end, after.start)
    cross = float(d1[0] * d2[1] - d1[1] * d2[0]) / (np.linalg.norm(d1) * np.linalg.norm(d2))
    return abs(cross) < np.sin(np.radians(1.0))


#: reasons for "no chart" (codes; the report words them)
COMBINED_LOAD = "combined load"
NO_FIT = "no fit"
NO_NOTCH_PEAK = "no notch peak"
NOT_RESEMBLING = "resembles no chart"


#: the chart load that each kind of load component is compared with
CHART_LOAD = {"force": "tension", "moment": "bending", "torque": "torsion"}


def load_kind(result: Result) -> str | None:
    """The chart load when the load has one component ('tension', 'bending', 'torsion'), else None."""
    quantities = {c.quantity for c in result.load.components if c.magnitude != 0}
    if len(quantities) == 1:
        return CHART_LOAD.get(quantities.pop())
    return None


def _component_kts(peak) -> list[tuple[str, str, float | None, float | None]]:
    """(component name, chart load, Kt_net, Kt_gross) of each load component of a peak."""
    return [(c.name, CHART_LOAD.get(c.quantity, c.quantity), c.kt_net, c.kt_gross) for c in peak.components]


def _compare(kind: str, fit: ChartFit, dims: dict, fe_net: float | None, fe_gross: float | None,
             component: str = "") -> ChartCheck:
    cov = coverage(fit, **dims)
    chart = fit.kt(**dims)
    fe = fe_net if fit.basis == "net" else fe_gross
    diff = None if fe is None else 100.0 * (fe - chart) / chart
    return ChartCheck(
        kind=kind, family=fit.family, load=fit.load, fit=fit.key, source=fit.source, confidence=fit.confidence,
        from_memory=fit.from_memory, basis=Basis(fit.basis), nominal=fit.nominal, dims=dict(dims), chart_kt=chart,
        fe_kt=fe, difference_pct=diff, band_pct=100.0 * fit.band,
        within_band=(diff is not None and abs(diff) <= 100.0 * fit.band), coverage=cov.verdict,
        coverage_notes=tuple(cov.messages), ratios={k: v for k, v in cov.ratios}, component=component)


def family_dims(case: Case) -> dict:
    return SHAPES[case.part.family].chart_dims(dict(case.part.dimensions))


def family_check(case: Case, result: Result) -> tuple[FamilyCheck, ChartCheck | NoChart | None,
                                                    tuple[ChartCheck | NoChart, ...]]:
    """Chart versus FE for a family case: the check, the compared peak's record for the load case, and one
    record per load component when the load has several (each component against its own chart)."""
    fam = case.part.family
    load = load_kind(result)
    dims = family_dims(case)
    spots = [h for h in result.peaks if h.feature_kind != FeatureKind.EDGE and h.kt_net is not None and h.peak > 0
             and not h.introduction]
    if not spots:
        return FamilyCheck(fam, load, None, NoChart(NO_NOTCH_PEAK, family=fam, load=load)), None, ()
    top = max(spots, key=lambda h: h.kt_net)
    per = tuple(_family_component(fam, name, kind, dims, kn, kg) for name, kind, kn, kg in _component_kts(top)) \
        if len(top.components) > 1 else ()
    if load is None:
        return FamilyCheck(fam, None, top.rank, NoChart(COMBINED_LOAD, family=fam)), NoChart(COMBINED_LOAD), per
    fit = primary_fit(fam, load, dims, allow_low=True)  # low confidence is labelled
    if fit is None:
        gap = gap_for(fam, load)
        no = NoChart(NO_FIT, gap.reason if gap else "", fam, load)
        return FamilyCheck(fam, load, None, no), None, ()
    return FamilyCheck(fam, load, top.rank), _compare("family", fit, dims, top.kt_net, top.kt_gross), per


def _family_component(fam, name, kind, dims, kt_net, kt_gross) -> ChartCheck | NoChart:
    if kind not in ("tension", "bending", "torsion") or fam not in SHAPES:
        return NoChart(NO_FIT, f"no chart load for a {kind}", fam, kind, component=name)
    try:
        fit = primary_fit(fam, kind, dims, allow_low=True)
    except Exception:  # a chart load unknown to this family's fits
        fit = None
    if fit is None:
        gap = gap_for(fam, kind) if kind in ("tension", "bending") else None
        return NoChart(NO_FIT, gap.reason if gap else "", fam, kind, component=name)
    return _compare("family", fit, dims, kt_net, kt_gross, component=name)


# --- nearest chart for free-form parts --------------------------------------------------------------

def nearest_charts(part: PartGeometry, result: Result, carrying: frozenset[str] = frozenset()
                   ) -> dict[int, tuple[ChartCheck | NoChart, tuple]]:
    """Per notch feature (its first tensile peak): the nearest chart's Kt_net beside the FE Kt_net, or why
    there is none; for several load components, one comparison per component. Keyed by the peak's rank.
    ``carrying``: boundaries that carry a load (a pin's hole): the open-notch charts do not apply there."""
    load = load_kind(result)
    axis = np.array(result.load.axis)
    e = transverse(axis)
    poly = part_polygon(part)
    feats = {f.name: f for f in part.features}
    out: dict[int, tuple[ChartCheck | NoChart, tuple]] = {}
    seen = set()
    for hs in result.peaks:
        f = feats.get(hs.feature)
        if f is None or f.name in seen or hs.kt_net is None or hs.peak <= 0 or hs.introduction:
            continue
        seen.add(f.name)
        touched = {part.loops[li].name for li, _ in f.segments} | {part.segment(r).edge for r in f.segments}
        if touched & carrying:
            out[hs.rank] = (NoChart(NOT_RESEMBLING, "it carries a load (a pin, bolt or pressure): the charts are "
                                    "for unloaded notches"), ())
            continue
        if result.model == "axisymmetric":
            family, dims, why = _resemble_shaft(f, part, axis, poly)
        else:
            family, dims, why = _resemble(f, part, axis, e, poly, feats)
        if family is None:
            out[hs.rank] = (NoChart(NOT_RESEMBLING, why), ())
            continue
        per = tuple(_nearest(family, dims, kind, kn, kg, name) for name, kind, kn, kg in _component_kts(hs)) \
            if len(hs.components) > 1 else ()
        if load is None:
            out[hs.rank] = (NoChart(COMBINED_LOAD), per)
            continue
        out[hs.rank] = (_nearest(family, dims, load, hs.kt_net, hs.kt_gross, ""), per)
    return out


def _nearest(family, dims, load, kt_net, kt_gross, component) -> ChartCheck | NoChart:
    loads = ("tension", "bending", "torsion") if family in SHAFT_FAMILIES else ("tension", "bending")
    fit = primary_fit(family, load, dims, allow_low=True) if load in loads else None
    if fit is None:
        gap = gap_for(family, load) if load in ("tension", "bending") else None
        return NoChart(NO_FIT, gap.reason if gap else "", family, load, component=component)
    check = _compare("nearest", fit, dims, kt_net, kt_gross, component)
    chart_net = kt_as(fit, "net", **dims)
    return dataclasses.replace(check, chart_kt_net=chart_net,
                               difference_pct=None if kt_net is None else 100.0 * (kt_net - chart_net) / chart_net)


def _cut_width(part, axis, s, poly) -> float:
    return section_at(part, axis, s, poly).width


#: chart families of round shafts (their dimensions are diameters; the meridian's cut widths are radii)
SHAFT_FAMILIES = ("shaft_shoulder", "shaft_groove")


def _step(f, part, axis, poly) -> tuple[float, float, float, float, float] | None:
    """(narrow width, wide width, far narrow width, far wide width, net width) around a single-arc fillet of
    at most a quarter turn; None when the feature is not one."""
    lo, hi = feature_extent(part, f, axis)
    net = net_section(part, f, axis, poly)
    pad = 1e-3 * (hi - lo + 1.0)
    w_lo = _cut_width(part, axis, lo - pad, poly)
    w_hi = _cut_width(part, axis, hi + pad, poly)
    reach = max(2.0 * f.radius, 0.25 * net.width)
    narrow_far = _cut_width(part, axis, (lo - reach) if w_lo < w_hi else (hi + reach), poly)
    wide_far = _cut_width(part, axis, (hi + reach) if w_lo < w_hi else (lo - reach), poly)
    return min(w_lo, w_hi), max(w_lo, w_hi), narrow_far, wide_far, net.width


def _single_arc(part, f) -> str:
    """Why a feature is not a single circular arc of at most a quarter turn ('' when it is)."""
    if len(f.segments) != 1 or part.segment(f.segments[0]).kind != "arc":
        return "the feature is not a single circular arc"
    if abs(part.segment(f.segments[0]).sweep()) > np.radians(90.0 + 1.0):
        return "the arc turns through more than a quarter turn: not a shoulder fillet"
    return ""


def _resemble_shaft(f, part, axis, poly) -> tuple[str | None, dict, str]:
    """Which round-shaft chart a feature of a meridian section resembles: a shoulder fillet between two
    plain diameters, or a U-groove; diameters are twice the meridian's radii."""
    if f.kind in (FeatureKind.FILLET, FeatureKind.CONCAVE_ARC):
        why = _single_arc(part, f)
        if why:
            return None, {}, why
        narrow, wide, narrow_far, wide_far, net = _step(f, part, axis, poly)
        if wide <= net * (1 + 1e-6):
            return None, {}, "no diameter step at this fillet"
        if abs(narrow_far - narrow) > PRISMATIC_TOLERANCE * narrow or abs(wide_far - wide) > PRISMATIC_TOLERANCE * wide:
            return None, {}, "the diameters on either side do not stay constant next to the fillet (no plain shoulder)"
        return "shaft_shoulder", {"D": 2 * wide, "d": 2 * net, "r": f.radius}, ""
    if f.kind == FeatureKind.NOTCH:
        if not _u_flanks(part, f):
            return None, {}, "the groove flanks are not parallel (not a U-groove)"
        net = net_section(part, f, axis, poly)
        lo, hi = feature_extent(part, f, axis)
        R = _cut_width(part, axis, hi + max(hi - lo, 1e-9) * 2.0, poly)
        if R <= net.width:
            return None, {}, "could not measure the groove depth"
        return "shaft_groove", {"D": 2 * R, "d": 2 * net.width, "r": f.radius}, ""
    return None, {}, f"no round-shaft chart for a {f.kind.replace('_', ' ')}"


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
        # a flat shoulder: one circular arc of at most a quarter turn between a step and a narrow part that
        # both keep their width (prismatic) for a while, with a mirror fillet on the other side
        why = _single_arc(part, f)
        if why:
            return None, {}, why
        narrow, D, narrow_far, wide_far, net_width = _step(f, part, axis, poly)
        if D <= net_width * (1 + 1e-6):
            return None, {}, "no width step at this fillet"
        lo, hi = feature_extent(part, f, axis)
        if abs(narrow_far - narrow) > PRISMATIC_TOLERANCE * narrow or abs(wide_far - D) > PRISMATIC_TOLERANCE * D:
            return None, {}, "the widths on either side do not stay constant next to the fillet (no plain step)"
        twins = [g for g in feats.values() if g is not f and g.kind == f.kind
                 and abs(float(np.mean(feature_extent(part, g, axis))) - 0.5 * (lo + hi)) < 1e-6 * (1 + abs(lo))]
        if not twins:
            return None, {}, "one-sided step: the flat-shoulder chart is for a symmetric step"
        return "shoulder_fillet", {"D": D, "d": net_width, "r": f.radius}, ""
    if f.kind == FeatureKind.NOTCH:
        if not _u_flanks(part, f):
            return None, {}, "the notch flanks are not parallel (not a U-notch)"
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
        check, record, per = family_check(case, result)
        peaks = tuple(dataclasses.replace(p, chart=record, component_charts=per) if p.rank == check.peak_rank else p
                      for p in result.peaks)
        return dataclasses.replace(result, peaks=peaks, family_check=check)
    carrying = frozenset(n for ld in case.loads for n in ((getattr(ld, "hole", None),) + tuple(getattr(ld, "on", ())))
                         if n)
    nearest = nearest_charts(part, result, carrying)
    peaks = tuple(dataclasses.replace(p, chart=nearest[p.rank][0], component_charts=nearest[p.rank][1])
                  if p.rank in nearest else p for p in result.peaks)
    return dataclasses.replace(result, peaks=peaks)


__all__ = ["family_check", "nearest_charts", "with_charts", "load_kind"]
