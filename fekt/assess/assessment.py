"""The strength and fatigue assessment of a solved case, peak by peak.

For every stress peak of a :class:`~fekt.records.Result`:

* **static**: the elastic peak stress against the yield strength (with the note that local yielding
  redistributes a static peak in a ductile material) and the largest nominal stress on the peak's net
  section against the yield strength, both at the case's load as stated;
* **fatigue notch factor** Kf by every method the material data allow, side by side: Peterson,
  Neuber/Kuhn-Hardrath and Heywood from the root radius, the FKM and Siebel-Stieler support factors from
  the FE relative stress gradient (:mod:`fekt.post.gradient`), beside the chart gradient from the root
  radius;
* **fatigue**: given a cycle per peak (:class:`PeakCycle`: the elastic peak stress and the net nominal
  stress at both ends of the cycle), the local cycle Kf/Kt x the elastic peak stresses (the same as Kf x the
  nominal stresses; Budynas & Nisbett, Shigley's MED, 9th ed., section 6-12, from memory) and its safety
  factors by the mean-stress criteria (:mod:`.fatigue`), the governing criterion, first-cycle yield.

A singular corner gets no Kf and no fatigue factor, with the reason. Where no notch-factor method applies
to a peak (no stress raiser, Kt < 1, no Kt, a plain edge) the local cycle is the elastic peak stress itself
(q = 1: conservative), and the record says so.

The cycle arrives per peak (:class:`CycleInput`), so it can come from stated factors on the case's load
(:func:`cycles_from_factors`) or from load cases combined elsewhere; the assessment does not care which.
"""

from __future__ import annotations

import dataclasses

import math
from collections.abc import Mapping, Sequence
from dataclasses import dataclass

import numpy as np

from ..errors import InputError
from ..kinds import FeatureKind
from ..records import (Assessment, CriterionRecord, EstimateRecord, FatigueRecord, Governing, GradientCheck,
                       KfSpread, NotchFactorRecord, PeakAssessment, Result, StaticRecord, StrengthFacts, StressPeak)
from . import CAUTION
from .fatigue import (COMPRESSIVE_MEAN_RULE, CRITERIA_SOURCE, DEFAULT_CRITERIA, LOAD_LINE, SPECIMEN_CAUTION,
                      Criterion, cycle_from_extremes, fatigue_check)
from .gradient import chart_gradient, fkm_notch_factor, siebel_stieler_notch_factor
from .material import (STEEL_GROUPS, Estimate, FatigueBasis, MaterialGroup, Strengths, UnitScale,
                       resolve_fatigue_strength, unit_scale)
from .notch import Loading, NotchFactor, NotchMethod, NotchShape, heywood, neuber, peterson
from .static import STATIC_PEAK_NOTE, net_section_check, static_peak_check

# --- the cycle -------------------------------------------------------------------------------------


@dataclass(frozen=True)
class PeakCycle:
    """One peak's cycle: its elastic peak stress and its net nominal stress at the two ends of the cycle
    (signed, case stress unit). ``peak_max`` >= ``peak_min``; the nominal values belong to the same ends."""

    peak_max: float
    peak_min: float
    nominal_max: float
    nominal_min: float


@dataclass(frozen=True)
class CycleInput:
    """The cycle of every peak, by rank, and a sentence saying where it came from."""

    description: str
    per_peak: Mapping[int, PeakCycle]


def cycles_from_factors(peaks: Sequence[StressPeak], max_factor: float, min_factor: float) -> CycleInput:
    """The cycle between the case's load times ``max_factor`` and times ``min_factor`` (linear elastic:
    every stress scales with the factor)."""
    if max_factor < min_factor:
        raise InputError(f"max_factor {max_factor:g} is below min_factor {min_factor:g}", item="cycle.max_factor")
    out = {}
    for p in peaks:
        a, b = max_factor * p.peak, min_factor * p.peak
        na, nb = max_factor * p.sigma_nom_net, min_factor * p.sigma_nom_net
        out[p.rank] = PeakCycle(a, b, na, nb) if a >= b else PeakCycle(b, a, nb, na)
    text = (f"the case's load times {max_factor:g} and times {min_factor:g} (mean factor "
            f"{0.5 * (max_factor + min_factor):g}, alternating factor {0.5 * (max_factor - min_factor):g})")
    return CycleInput(text, out)


def cycles_from_cases(result: Result, max_case: str, min_case: str) -> tuple[CycleInput, tuple[StressPeak, ...]]:
    """The cycle between two load cases, for the peaks of the first: at each of its peaks, the other case's
    stress is the sum of the peak's per-load stresses times the other case's factors (linear elasticity:
    exact at the same point). Refused when a load of the second case is missing from the first's peaks (its
    stress there is not known) or is a pin (not linear). Returns the cycles and the peaks they are for."""
    cases = {c.name: c for c in result.load_cases}
    hi, lo = cases[max_case], cases[min_case]
    f_lo = dict(lo.factors)
    f_hi = dict(hi.factors)
    out = {}
    for p in hi.peaks:
        if p.kt_net is None and not p.components:
            continue
        by_load: dict[str, tuple[float, float]] = {}
        for c in p.components:
            load = c.load or c.name.split("/")[0]
            s0, n0 = by_load.get(load, (0.0, 0.0))
            by_load[load] = (s0 + c.stress, n0 + c.sigma_nom_net)
        missing = [ld for ld, f in f_lo.items() if f != 0.0 and ld not in by_load]
        if missing:
            raise InputError(f"the cycle's load case '{min_case}' has load(s) {', '.join(missing)} that load case "
                             f"'{max_case}' does not carry at its peaks: their stress there is not known",
                             item="cycle.min_case", hint="name as max_case a load case in which every load of "
                             "the cycle is present (at any factor but zero)")
        # each per-load stress is that load's at factor 1: the first case's peak must be their sum with its
        # factors, or the peak has parts the per-load stresses do not hold (a load leaning on a support)
        back = sum(f_hi.get(ld, 0.0) * sv for ld, (sv, _) in by_load.items())
        if abs(back - p.peak) > 1e-9 * max(abs(p.peak), 1e-300) + 1e-12:
            raise InputError(f"the peak at ({p.x:.6g}, {p.y:.6g}) of load case '{max_case}' is not the sum of its "
                             "loads' own stresses (a load there needs the others to be in equilibrium), so the "
                             "other end of the cycle cannot be formed from it", item="cycle",
                             hint="state the cycle as factors on one load case instead")
        a = sum(f_lo.get(ld, 0.0) * sv for ld, (sv, _) in by_load.items())
        na = sum(f_lo.get(ld, 0.0) * nv for ld, (_, nv) in by_load.items())
        out[p.rank] = (PeakCycle(p.peak, a, p.sigma_nom_net, na) if p.peak >= a
                       else PeakCycle(a, p.peak, na, p.sigma_nom_net))
    text = f"between load case '{max_case}' and load case '{min_case}'"
    return CycleInput(text, out), hi.peaks


# --- case names -> formula-layer names ---------------------------------------------------------------

#: [assessment] notch_factor -> the method it names
NOTCH_CHOICE = {"peterson": NotchMethod.PETERSON, "neuber": NotchMethod.NEUBER, "heywood": NotchMethod.HEYWOOD,
                "fkm": NotchMethod.FKM_SUPPORT, "siebel_stieler": NotchMethod.SIEBEL_STIELER}
#: [assessment] criteria -> the criterion
CRITERION_CHOICE = {"goodman": Criterion.GOODMAN, "gerber": Criterion.GERBER,
                    "asme_elliptic": Criterion.ASME_ELLIPTIC, "soderberg": Criterion.SODERBERG}
#: feature kinds -> the notch shape class of Heywood's constants and of the chart gradients (our own mapping:
#: a cut-out is a transverse hole, a notch or a concave arc a groove, a fillet a shoulder)
SHAPE_OF = {FeatureKind.HOLE: NotchShape.HOLE, FeatureKind.CUTOUT: NotchShape.HOLE,
            FeatureKind.NOTCH: NotchShape.GROOVE, FeatureKind.CONCAVE_ARC: NotchShape.GROOVE,
            FeatureKind.FILLET: NotchShape.SHOULDER}

FORMULAS = {
    NotchMethod.PETERSON: "Kf = 1 + q (Kt - 1), q = 1/(1 + a/r) (Peterson 1959)",
    NotchMethod.NEUBER: "Kf = 1 + q (Kt - 1), q = 1/(1 + sqrt(rho'/r)) (Neuber 1958; Kuhn & Hardrath 1952)",
    NotchMethod.HEYWOOD: "Kf = Kt / (1 + 2 ((Kt - 1)/Kt) sqrt(a'/r)) (Heywood 1962)",
    NotchMethod.FKM_SUPPORT: "Kf = Kt / n_sigma(G, Rm, group) (FKM guideline, 6th ed. 2012)",
    NotchMethod.SIEBEL_STIELER: "Kf = Kt / (1 + sqrt(s_g chi*)) (Siebel & Stieler 1955)",
}
ORDER = (NotchMethod.PETERSON, NotchMethod.NEUBER, NotchMethod.HEYWOOD, NotchMethod.FKM_SUPPORT,
         NotchMethod.SIEBEL_STIELER)

LOCAL_RULE = ("local cycle = Kf/Kt x the elastic peak stresses (= Kf x the net nominal stresses), Kf applied to "
              "mean and alternating stress alike (Budynas & Nisbett, Shigley's MED, 9th ed., section 6-12, "
              "from memory); no local-yield correction")
STATIC_LOAD = "static checks at the case's load as stated ([load], factor 1)"


def strengths_of(material) -> Strengths:
    """The formula layer's :class:`Strengths` of a case's :class:`~fekt.case.schema.Material`."""
    return Strengths(yield_strength=material.yield_strength, ultimate_strength=material.ultimate_strength,
                     fatigue_strength=material.fatigue_strength,
                     fatigue_basis=FatigueBasis.CORRECTED if material.fatigue_basis == "corrected"
                     else FatigueBasis.SPECIMEN,
                     peterson_a=material.peterson_a, neuber_rho=material.neuber_rho, siebel_sg=material.siebel_sg,
                     group=MaterialGroup(material.group) if material.group else None)


# --- what is needed ---------------------------------------------------------------------------------

def _steel(m: Strengths) -> bool:
    return m.ultimate_strength is not None and m.group in STEEL_GROUPS


def method_inputs(method: NotchMethod, m: Strengths) -> str | None:
    """None when the material data allow ``method``; else the keys it needs, as a phrase."""
    if method is NotchMethod.PETERSON:
        return None if m.peterson_a is not None or _steel(m) else \
            "material.peterson_a, or material.ultimate_strength with a steel group"
    if method is NotchMethod.NEUBER:
        return None if m.neuber_rho is not None or _steel(m) else \
            "material.neuber_rho, or material.ultimate_strength with a steel group"
    if method is NotchMethod.HEYWOOD:
        return None if _steel(m) else "material.ultimate_strength with a steel group"
    if method is NotchMethod.FKM_SUPPORT:
        return None if m.ultimate_strength is not None and m.group is not None else \
            "material.ultimate_strength and material.group"
    return None if m.siebel_sg is not None else "material.siebel_sg"


def check_inputs(m: Strengths, *, fatigue: bool, notch_factor: str, criteria: Sequence[Criterion]) -> None:
    """Refuse, naming every missing key and what needs it, when the strengths do not cover the checks."""
    missing: list[str] = []
    if m.yield_strength is None:
        users = ["static checks"] + (["first-cycle yield"] if fatigue else []) + \
            [c.value for c in criteria if fatigue and c in (Criterion.ASME_ELLIPTIC, Criterion.SODERBERG)]
        missing.append(f"material.yield_strength ({', '.join(users)})")
    if fatigue:
        if m.fatigue_strength is None and not _steel(m):
            missing.append("material.fatigue_strength (fatigue criteria; for a steel it can be estimated from "
                           "material.ultimate_strength with group = \"steel\")")
        needs_su = [c.value for c in criteria if c in (Criterion.GOODMAN, Criterion.GERBER)]
        if needs_su and m.ultimate_strength is None:
            missing.append(f"material.ultimate_strength ({', '.join(needs_su)})")
        if notch_factor in NOTCH_CHOICE:
            need = method_inputs(NOTCH_CHOICE[notch_factor], m)
            if need:
                missing.append(f"{need} (notch_factor = \"{notch_factor}\")")
        elif notch_factor == "largest" and all(method_inputs(x, m) for x in ORDER):
            missing.append("for a fatigue notch factor: material.peterson_a, material.neuber_rho or "
                           "material.siebel_sg, or material.ultimate_strength with material.group "
                           "(or set [assessment] notch_factor = \"kt\" to use Kt itself)")
    if missing:
        raise InputError("the assessment needs " + "; ".join(missing) + (", which is" if len(missing) == 1 else
                         ", which are") + " not given", item=", ".join(x.split(" (")[0] for x in missing),
                         hint="state the strengths in [material] of the case file (docs/case-format.md)")


# --- per peak ---------------------------------------------------------------------------------------

def loading_of(peak: StressPeak) -> Loading:
    """The load component type that makes most of the peak stress: torsion (a torque), bending (a moment:
    the chart gradient then adds 2/d) or axial."""
    share = {Loading.AXIAL: sum(abs(c.stress) for c in peak.components if c.quantity in ("force", "stress")),
             Loading.BENDING: sum(abs(c.stress) for c in peak.components if c.quantity == "moment"),
             Loading.TORSION: sum(abs(c.stress) for c in peak.components if c.quantity == "torque")}
    return max(share, key=lambda k: (share[k], k is Loading.AXIAL))


def _estimate_record(e: Estimate) -> EstimateRecord:
    dim = "stress" if e.quantity == "fatigue_strength" else "length"
    inputs = ", ".join(f"{k} = {v:.4g}" for k, v in e.inputs)
    return EstimateRecord(e.quantity, e.value, dim, e.rule.value, e.source, e.from_memory, inputs, tuple(e.notes))


def _notch_record(nf: NotchFactor) -> NotchFactorRecord:
    c = nf.constant
    notes = tuple(nf.notes)
    if nf.support is not None and nf.method is NotchMethod.FKM_SUPPORT:
        s = nf.support
        notes = (f"branch {s.branch}; G = {s.gradient_per_mm:.4g} /mm, Rm = {s.rm_mpa:.4g} MPa, group "
                 f"{s.group.value}: aG = {s.a_g:g}, bG = {s.b_g:g} MPa",) + notes
    return NotchFactorRecord(nf.method.value, nf.kf, nf.q, FORMULAS[nf.method], c.name if c else "",
                             c.value if c else None, c.origin.value if c else "", nf.support_factor, nf.gradient,
                             notes, nf.reason)


def _refused(method: NotchMethod, reason: str) -> NotchFactorRecord:
    return NotchFactorRecord(method.value, None, None, FORMULAS[method], reason=reason)


def notch_factors(peak: StressPeak, m: Strengths, units: UnitScale, loading: Loading, shape: NotchShape | None,
                  estimates: dict) -> tuple[NotchFactorRecord, ...]:
    """Kf of one peak by every method, in :data:`ORDER` (records with a reason where there is none)."""
    out = []
    kt = peak.kt_net
    r = root_radius_of(peak)
    radius = r if math.isfinite(r) else None
    chi = peak.gradient.chi if peak.gradient is not None else None
    for method in ORDER:
        if peak.singular:
            out.append(_refused(method, "singular corner: the elastic peak grows without bound under mesh "
                                        "refinement, so Kt and Kf are undefined"))
            continue
        if kt is None:
            out.append(_refused(method, "no Kt: the nominal stress at the peak is zero"))
            continue
        if kt < 1.0:
            out.append(_refused(method, f"Kt = {kt:.4g} < 1: no stress raiser (the peak is not amplified above "
                                        "its nominal stress), the notch-factor methods do not apply"))
            continue
        need = method_inputs(method, m)
        if need:
            out.append(_refused(method, f"needs {need}"))
            continue
        if method in (NotchMethod.FKM_SUPPORT, NotchMethod.SIEBEL_STIELER) and chi is None:
            why = peak.gradient.reason if peak.gradient is not None else "not computed"
            out.append(_refused(method, f"no FE stress gradient at this peak ({why})"))
            continue
        if method is NotchMethod.HEYWOOD and shape is None and radius is not None:
            out.append(_refused(method, f"no Heywood constant for a {peak.feature_kind.value} (hole, shoulder and "
                                        "groove only)"))
            continue
        if method in (NotchMethod.FKM_SUPPORT, NotchMethod.SIEBEL_STIELER) and chi < 0:
            out.append(_refused(method, f"the stress rises inward from this peak (chi* = {chi:.4g}): it is not a "
                                        "peak along the normal, no support effect"))
            continue
        try:
            if method is NotchMethod.PETERSON:
                nf = peterson(kt, radius, m, loading=loading, units=units)
            elif method is NotchMethod.NEUBER:
                nf = neuber(kt, radius, m, loading=loading, units=units)
            elif method is NotchMethod.HEYWOOD:
                nf = heywood(kt, radius, m, shape=shape or NotchShape.GROOVE, loading=loading, units=units)
            elif method is NotchMethod.FKM_SUPPORT:
                nf = fkm_notch_factor(kt, chi, m, units=units)
            else:
                nf = siebel_stieler_notch_factor(kt, chi, m)
        except InputError as exc:  # the method refuses this peak (e.g. a steel fit in torsion): say why
            out.append(_refused(method, exc.message))
            continue
        if nf.constant is not None and nf.constant.estimate is not None:
            e = nf.constant.estimate
            estimates[(e.quantity, e.rule, round(e.value, 12))] = _estimate_record(e)
        out.append(_notch_record(nf))
    return tuple(out)


def root_radius_of(peak: StressPeak) -> float:
    """The notch root radius at the peak: the boundary's radius of curvature at the peak point (recorded with
    the FE gradient; it differs from the feature's smallest radius on an ellipse, say), else the feature's."""
    g = peak.gradient
    if g is not None and g.radius is not None and math.isfinite(g.radius) and g.radius > 0:
        return float(g.radius)
    return peak.radius


def gradient_check(peak: StressPeak, loading: Loading, shape: NotchShape | None) -> GradientCheck:
    """The FE gradient beside the chart approximation of its root radius."""
    g = peak.gradient
    fe = g.chi if g is not None else None
    err = g.error_estimate if g is not None else None
    reason = None if fe is not None else (g.reason if g is not None else "FE gradient not computed")
    why = None
    if peak.singular:
        why = "singular corner"
    elif shape is None:
        why = "no chart gradient for a peak on a " + ("plain edge" if peak.feature_kind == FeatureKind.EDGE else
                                                      peak.feature_kind.value.replace("_", " "))
    elif not (math.isfinite(root_radius_of(peak)) and root_radius_of(peak) > 0):
        why = "no root radius"
    elif peak.kt_net is None or peak.kt_net < 1.0:
        why = "the chart gradients are for the stress-raising peak of a notch (Kt >= 1)"
    if why is not None:
        return GradientCheck(fe, err, None, reason=reason, notes=(f"chart: {why}",))
    try:
        ch = chart_gradient(shape, root_radius_of(peak), loading, net_size=peak.net_section.width)
    except InputError as exc:
        return GradientCheck(fe, err, None, reason=reason, notes=(f"chart: {exc.message}",))
    diff = 100.0 * (ch.value / fe - 1.0) if fe else None
    return GradientCheck(fe, err, ch.value, f"{ch.formula} ({ch.shape.value}, {ch.loading.value})", ch.source, diff,
                         tuple(ch.notes), reason)


def net_stress(peak: StressPeak, model, axis) -> float:
    """The largest nominal stress (by magnitude, signed) on the peak's net section: the model's nominal stress
    of the section's resultants at every edge of its material intervals."""
    from ..models.base import Resultants, SectionProps

    s = peak.net_section
    e = np.array([-axis[1], axis[0]])
    yc = float(np.asarray(s.centroid) @ e)
    props = SectionProps(s.area, yc, s.inertia, s.polar)
    res = Resultants(N=peak.N, M=peak.M)
    values = [model.nominal(res, props, y) for iv in s.intervals for y in iv] or [peak.sigma_nom_net]
    return float(max(values, key=abs))


def _fatigue(peak: StressPeak, cyc: PeakCycle, factors: Sequence[NotchFactorRecord], m: Strengths,
             units: UnitScale, notch_factor: str, criteria: tuple[Criterion, ...]) -> FatigueRecord:
    kt = peak.kt_net
    with_kf = [f for f in factors if f.kf is not None]
    notes = []
    if notch_factor == "kt" or kt is None or kt < 1.0:
        chosen = None
        if notch_factor == "kt":
            label = "Kt (q = 1, chosen)"
        else:
            label = "elastic (q = 1)"
            notes.append("no notch-factor method applies to this peak (" + (
                "no Kt" if kt is None else f"Kt = {kt:.4g} < 1") + "): the local cycle is the elastic peak stress")
    elif notch_factor == "largest":
        chosen = max(with_kf, key=lambda f: f.kf) if with_kf else None
        label = chosen.method if chosen else "Kt (q = 1)"
    else:
        want = NOTCH_CHOICE[notch_factor].value
        chosen = next((f for f in with_kf if f.method == want), None)
        label = want if chosen else "Kt (q = 1)"
        if chosen is None:
            notes.append(f"{want} gives no Kf for this peak")
    ratio = chosen.kf / kt if chosen is not None else 1.0
    if chosen is None and kt is not None and kt >= 1.0 and notch_factor != "kt":
        notes.append("no fatigue notch factor for this peak: Kf = Kt used (conservative)")
    lo_c = cycle_from_extremes(ratio * cyc.peak_max, ratio * cyc.peak_min)
    chk = fatigue_check(lo_c, m, units=units, criteria=criteria)
    if chk.cycle.mean < 0:
        notes.append(COMPRESSIVE_MEAN_RULE)
    crit = tuple(CriterionRecord(r.criterion.value, r.factor, r.compressive_mean, r.reason) for r in chk.results)
    return FatigueRecord(notch_method=label, kf=chosen.kf if chosen else (kt if kt is not None and kt >= 1 else None),
                         local_ratio=ratio, nominal_max=cyc.nominal_max, nominal_min=cyc.nominal_min,
                         elastic_max=cyc.peak_max, elastic_min=cyc.peak_min, local_max=lo_c.maximum,
                         local_min=lo_c.minimum, local_mean=lo_c.mean, local_amplitude=lo_c.amplitude,
                         fatigue_strength=chk.fatigue_strength, criteria=crit,
                         governing=chk.governing.value if chk.governing else None,
                         governing_factor=chk.governing_factor,
                         first_cycle_yield=chk.first_cycle_yield.factor if chk.first_cycle_yield else None,
                         notes=tuple(notes))


def assess_peak(peak: StressPeak, m: Strengths, units: UnitScale, *, model, axis, cycle: PeakCycle | None,
                notch_factor: str = "largest", criteria: tuple[Criterion, ...] = DEFAULT_CRITERIA,
                estimates: dict | None = None) -> PeakAssessment:
    """The assessment of one peak (see the module docstring)."""
    estimates = {} if estimates is None else estimates
    loading = loading_of(peak)
    shape = SHAPE_OF.get(peak.feature_kind)
    factors = notch_factors(peak, m, units, loading, shape, estimates)
    sp = static_peak_check(peak.peak, m, singular=peak.singular)
    sn = net_section_check(net_stress(peak, model, axis), m)
    static_peak = StaticRecord(sp.kind.value, sp.stress, sp.yield_strength, sp.factor, sp.note, sp.reason)
    static_net = StaticRecord(sn.kind.value, sn.stress, sn.yield_strength, sn.factor, sn.note, sn.reason)
    given = [f for f in factors if f.kf is not None]
    spread = None
    if len(given) > 1:
        lo, hi = min(given, key=lambda f: f.kf), max(given, key=lambda f: f.kf)
        spread = KfSpread(lo.method, lo.kf, hi.method, hi.kf, 100.0 * (hi.kf / lo.kf - 1.0))
    fatigue, reason = None, None
    if peak.singular:
        reason = ("singular corner: no Kf and no fatigue safety factor (its elastic peak depends on the mesh); "
                  "give the corner a radius")
    elif cycle is None:
        reason = "no cycle given for this peak"
    else:
        fatigue = _fatigue(peak, cycle, factors, m, units, notch_factor, criteria)
    return PeakAssessment(rank=peak.rank, feature=peak.feature, feature_kind=peak.feature_kind, singular=peak.singular,
                          x=peak.x, y=peak.y, radius=root_radius_of(peak), kt=peak.kt_net, peak=peak.peak,
                          sigma_nom_net=peak.sigma_nom_net, loading=loading.value,
                          shape=shape.value if shape else None,
                          relative_gradient=gradient_check(peak, loading, shape),
                          notch_factors=factors, kf_spread=spread, static_peak=static_peak, static_net=static_net, fatigue=fatigue,
                          reason=reason)


def _governing(peaks: Sequence[PeakAssessment], get) -> Governing | None:
    found = [(v, p, c) for p in peaks for v, c in [get(p)] if v is not None]
    if not found:
        return None
    v, p, c = min(found, key=lambda t: (t[0], t[1].rank))
    return Governing(p.rank, p.feature, c, v)


def assess(result: Result, strengths: Strengths, units: UnitScale, *, model, cycles: CycleInput | None = None,
           notch_factor: str = "largest", criteria: Sequence[str] = ("goodman", "gerber", "asme_elliptic"),
           notes: Sequence[str] = ()) -> Assessment:
    """The assessment of every peak of ``result`` (see the module docstring).

    ``model``: the analysis model (for the nominal stress over the net section); ``cycles``: the cycle of
    each peak, or None for the static checks and Kf alone; ``notch_factor``: ``largest``, a method
    (:data:`NOTCH_CHOICE`) or ``kt``; ``criteria``: names of :data:`CRITERION_CHOICE`. Refuses with one
    :class:`InputError` naming every strength the requested checks need and lack."""
    crits = tuple(CRITERION_CHOICE[c] for c in criteria)
    if notch_factor not in (*NOTCH_CHOICE, "largest", "kt"):
        raise InputError(f"notch_factor '{notch_factor}' is not one of largest, kt, {', '.join(NOTCH_CHOICE)}",
                         item="assessment.notch_factor")
    check_inputs(strengths, fatigue=cycles is not None, notch_factor=notch_factor, criteria=crits)
    estimates: dict = {}
    axis = result.load.axis
    peaks = tuple(assess_peak(p, strengths, units, model=model, axis=axis,
                              cycle=cycles.per_peak.get(p.rank) if cycles is not None else None,
                              notch_factor=notch_factor, criteria=crits, estimates=estimates)
                  for p in result.peaks)
    cautions = [CAUTION, STATIC_PEAK_NOTE, result.caution]
    extra = list(notes) + [STATIC_LOAD]
    if cycles is not None:
        se, est = resolve_fatigue_strength(strengths, units=units)
        if est is not None:
            estimates[(est.quantity, est.rule, round(est.value, 12))] = _estimate_record(est)
        if est is not None or strengths.fatigue_basis is FatigueBasis.SPECIMEN:
            cautions.append(SPECIMEN_CAUTION)
        extra += [LOCAL_RULE, "safety factors along a " + LOAD_LINE, f"mean-stress criteria: {CRITERIA_SOURCE}"]
    sf = StrengthFacts(strengths.yield_strength, strengths.ultimate_strength, strengths.fatigue_strength,
                       strengths.fatigue_basis.value, strengths.peterson_a, strengths.neuber_rho, strengths.siebel_sg,
                       strengths.group.value if strengths.group else None)
    return Assessment(
        case_name=result.case_name, source=result.source, demo=result.demo, units=result.units, strengths=sf,
        estimates=tuple(estimates.values()), cycle=cycles.description if cycles is not None else None,
        notch_factor=notch_factor, criteria=tuple(c.value for c in crits), peaks=peaks,
        static_peak_governing=_governing(peaks, lambda p: (p.static_peak.factor, p.static_peak.kind)),
        static_net_governing=_governing(peaks, lambda p: (p.static_net.factor, p.static_net.kind)),
        fatigue_governing=_governing(peaks, lambda p: (p.fatigue.governing_factor, p.fatigue.governing)
                                     if p.fatigue is not None else (None, None)),
        notes=tuple(extra), cautions=tuple(cautions))


def check_case(case, *, cycle: bool | None = None) -> None:
    """Refuse before any solve when the case's strengths do not cover the checks it asks for (``cycle``: a
    cycle will be given; default: the case has a ``[cycle]``)."""
    fatigue = case.cycle is not None if cycle is None else cycle
    check_inputs(strengths_of(case.material), fatigue=fatigue, notch_factor=case.assessment.notch_factor,
                 criteria=tuple(CRITERION_CHOICE[c] for c in case.assessment.criteria))


def assess_solved(case, result: Result, *, cycles: CycleInput | None = None) -> Assessment:
    """The assessment of a case's solved ``result``: strengths, options and (unless ``cycles`` is given, e.g.
    from load cases) the cycle from the case file's ``[cycle]`` factors."""
    from ..models import REGISTRY as MODELS

    if cycles is None and case.cycle is not None and case.cycle.form == "cases":
        if any(getattr(ld, "kind", "") == "pin" and dict(lc.factors).get(ld.name, 0.0) != 0.0
               for ld in case.loads for lc in case.load_cases if lc.name in (case.cycle.max_case, case.cycle.min_case)):
            raise InputError("a cycle between load cases with a pin load cannot be formed point by point (the "
                             "contact is not linear)", item="cycle",
                             hint="use the cosine bearing load (type = \"bearing\") for the cycle, or factors")
        cycles, peaks = cycles_from_cases(result, case.cycle.max_case, case.cycle.min_case)
        result = dataclasses.replace(result, peaks=peaks)
    elif cycles is None and case.cycle is not None:
        cycles = cycles_from_factors(result.peaks, case.cycle.max_factor, case.cycle.min_factor)
    units = unit_scale(case.units.length, case.units.force)
    return assess(result, strengths_of(case.material), units, model=MODELS[case.part.model], cycles=cycles,
                  notch_factor=case.assessment.notch_factor, criteria=case.assessment.criteria)


__all__ = ["CycleInput", "PeakCycle", "cycles_from_cases", "assess", "assess_peak", "assess_solved", "check_case", "check_inputs", "cycles_from_factors",
           "gradient_check", "loading_of", "method_inputs", "root_radius_of", "net_stress", "notch_factors", "strengths_of"]
