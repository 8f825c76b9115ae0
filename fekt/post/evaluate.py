"""Finish each stress peak: owning feature, net and gross sections, nominal stresses, Kt per load
component and for the load case, and the equilibrium check on the net section.

Conventions are in docs/conventions.md and in :mod:`fekt.post.kt`.
"""

from __future__ import annotations

import math
from collections.abc import Mapping
from dataclasses import dataclass

import numpy as np

from ..errors import SolveError
from ..geometry.model import Feature, PartGeometry
from ..geometry.sections import gross_cut, net_section, part_polygon, section_at, transverse
from ..kinds import EquilibriumMode, FeatureKind, Measure, PeakReason
from ..loads.base import Applied
from ..mesh.build import PartMesh
from ..models.base import (Model, Resultants, Section, SurfaceStress, maximise_over_angle, section_of, surface_at_angle,
                           surface_stress)
from ..records import ComponentKt, Compressive, SectionRecord, StressPeak
from ..solver.linear import Solution
from .fields import BoundarySamples
from .kt import (EQUILIBRIUM_TOLERANCE, Nominal, check_equilibrium, kt, nominal_height, nominal_stress,
                 require_equilibrium)
from .measures import component_measure, measure_over_angle, measure_values
from .peaks import Candidate, boundary_refs, find_peaks_on_boundary, free_mask, local_scatter

#: an edge maximum (no feature) within this fraction of its own nominal stress is a Saint-Venant
#: ripple, not a stress peak (our own threshold; no published source)
EDGE_MARGIN = 0.05
#: a plain-edge peak with no Kt (no nominal stress there) is listed only when its stress is at least this
#: fraction of the largest peak's (our own threshold: it is then worth a look, e.g. the crown of a lug's eye)
EDGE_SMALL = 0.25
#: sharp corners: their peak is the largest sample within this many local element sizes (our own choice)
CORNER_WINDOW_ELEMENTS = 3.0


@dataclass(frozen=True)
class PeakSet:
    peaks: tuple[StressPeak, ...]
    most_compressive: Compressive
    warnings: tuple[str, ...]


def section_record(sec: Section) -> SectionRecord:
    return SectionRecord(sec.s, sec.width, sec.area, sec.centroid, sec.inertia, sec.intervals, sec.polar)


@dataclass(frozen=True)
class _Sections:
    net: Section
    gross: Section | None
    gross_rule: str


def _feature_sections(model, part, feature: Feature | None, xy, axis, poly, thickness) -> _Sections:
    if feature is None:
        net = section_of(model, section_at(part, axis, float(xy @ axis), poly), axis, thickness)
        return _Sections(net, None, "not applicable: no notch feature")
    net = section_of(model, net_section(part, feature, axis, poly), axis, thickness)
    cut, rule = gross_cut(part, feature, axis, net.s)
    gross = section_of(model, cut, axis, thickness) if cut is not None and cut.width > 0 else None
    return _Sections(net, gross, rule)


def peak_name(p: Candidate, xy) -> str:
    """What a peak belongs to, by a name that does not move when dimensions change."""
    if p.feature is not None:
        return p.feature.name
    if p.edge:
        return f"edge '{p.edge}'"
    if p.vertex is not None:
        return f"edge from vertex {p.vertex}"
    return f"boundary at ({xy[0]:.4g}, {xy[1]:.4g})"


def evaluate_peaks(samples: BoundarySamples, part: PartGeometry, pmesh: PartMesh, sol: Solution,
                   applied: Applied, thickness: float, *,
                   equilibrium: EquilibriumMode = EquilibriumMode.FAIL,
                   measure: Measure = Measure.TANGENTIAL,
                   factors: Mapping[str, float] | None = None,
                   stated: tuple[float, str | None] | None = None) -> PeakSet:
    """Ranked stress peaks (tensile and compressive) with sections and Kt; the most compressive stress.

    ``factors``: the load case (component name -> factor; default every component at 1). ``stated``: a
    nominal stress the case states (value, the feature it is for or None for all) instead of statics."""
    model = sol.model
    factors = dict(factors) if factors is not None else {c.name: 1.0 for c in applied.components}
    comps = [c for c in applied.components if factors.get(c.name, 0.0) != 0.0]
    # a component that leans on a point restraint (it does work on a motion no support stops) has no Kt of
    # its own: only the load case it belongs to is in equilibrium
    alone = [c for c in comps if _balanced(sol, c.name)]
    reference = _reference(applied, comps, factors)
    surf = {c.name: surface_stress(samples.components[c.name], samples.normal) for c in comps}
    parts = [(factors[c.name], surf[c.name]) for c in comps]
    by_angle = any(sf.harmonic != 0 for _, sf in parts)  # the state varies around the axis
    loaded = boundary_refs(part, applied.loaded)
    corner_r = {name: CORNER_WINDOW_ELEMENTS * h for name, h in pmesh.feature_sizes.items()}
    picked = []  # (candidate, the measure along the boundary, the angle of each value)
    for m, theta, keep in _measure_sides(parts, measure, by_angle):
        picked += [(p, m, theta) for p in find_peaks_on_boundary(samples, part, loaded, corner_r, m)
                   if keep(m[p.index])]
    axis = np.array(applied.axis)
    e = transverse(axis)
    poly = part_polygon(part)
    sections: dict[str, _Sections] = {}
    eq_errors: dict[str, float] = {}
    warnings: list[str] = []
    spots = []
    for p, m, theta in picked:
        xy = samples.xy[:, p.index]
        key = p.feature.name if p.feature is not None else f"cut at ({xy[0]:.6g}, {xy[1]:.6g})"
        if key not in sections:
            sections[key] = _feature_sections(model, part, p.feature, xy, axis, poly, thickness)
        secs = sections[key]
        side = free_side(applied.supports, secs.net)
        mirrored = bool(mirror_planes(applied.supports, axis))
        if key not in eq_errors:
            eq_errors[key] = _equilibrium(sol, secs.net, alone, side, thickness, equilibrium, p, xy, key, warnings,
                                          moment=not mirrored)
        y_peak = float(xy @ e)
        peak = float(m[p.index])
        angle = float(theta[p.index])
        tx = float(-samples.normal[1, p.index])  # the tangent's axial part (the sign of a torque's surface shear)
        source = ""
        if side is None:
            nom = Nominal(secs.net, Resultants(), y_peak, 0.0)
            source = INDETERMINATE
        else:
            nom = _case_nominal(model, secs.net, section_resultants(comps, factors, secs.net, side, mirrored), y_peak,
                                measure, angle, tx)
        gnom = None
        y_gross = _gross_height(p.feature, secs.gross, y_peak)
        gside = free_side(applied.supports, secs.gross) if secs.gross is not None else None
        if secs.gross is not None and gside is not None:
            gnom = _case_nominal(model, secs.gross, section_resultants(comps, factors, secs.gross, gside, mirrored),
                                 y_gross, measure, angle, tx)
        kt_net = kt(peak, nom) if side is not None else None
        kt_gross = kt(peak, gnom) if gnom is not None else None
        sig_net, sig_gross = nom.sigma, gnom.sigma if gnom else None
        name = peak_name(p, xy)
        if reference is not None:
            sig_net = sig_gross = reference[0]
            kt_net = kt_gross = peak / reference[0]
            source = reference[1]
        elif stated is not None and (stated[1] is None or stated[1] == name):
            sig_net = stated[0]
            kt_net = peak / stated[0]
            source = STATED
        per = []
        for c in alone if side is not None else ():
            sf = surf[c.name]
            cstress = float(component_measure(c.quantity, sf.stt, sf.sth)[p.index])
            cn = _component_nominal(model, c.quantity, secs.net,
                                    section_resultants([c], {c.name: 1.0}, secs.net, side, mirrored), y_peak, tx)
            cg = (_component_nominal(model, c.quantity, secs.gross,
                                     section_resultants([c], {c.name: 1.0}, secs.gross, gside, mirrored), y_gross, tx)
                  if gside is not None else None)
            per.append(ComponentKt(c.load if c.contact is not None else c.name, c.quantity, cstress, cn.sigma,
                                   kt(cstress, cn), cg.sigma if cg else None, kt(cstress, cg) if cg else None,
                                   load=c.load))
        f = p.feature
        spots.append(dict(
            x=float(xy[0]), y=float(xy[1]), feature=name, feature_kind=f.kind if f else FeatureKind.EDGE,
            singular=bool(f.singular) if f else False, reason=p.why, peak=peak,
            radius=f.radius if f else math.inf,
            element_size=pmesh.feature_sizes.get(f.name, pmesh.size_max) if f else pmesh.size_max,
            net_section=section_record(secs.net), N=nom.N, M=nom.M, sigma_nom_net=sig_net,
            kt_net=kt_net, gross_section=section_record(secs.gross) if secs.gross is not None else None,
            gross_rule=secs.gross_rule, sigma_nom_gross=sig_gross,
            kt_gross=kt_gross, equilibrium_error=eq_errors[key],
            scatter=local_scatter(samples, p.index, m), components=tuple(per),
            T=nom.resultants.T, theta=_degrees(angle) if by_angle else None,
            introduction=_introduction(applied, xy), nominal_source=source))
    # drop Saint-Venant ripples on plain edges (EDGE_MARGIN), and plain-edge peaks without a Kt that are
    # small beside the largest peak (EDGE_SMALL); the largest magnitude always stays
    top = max((abs(d["peak"]) for d in spots), default=0.0)
    spots = [d for d in spots if d["feature_kind"] != FeatureKind.EDGE or d["reason"] == PeakReason.OVERALL
             or (d["kt_net"] is None and abs(d["peak"]) >= EDGE_SMALL * top)
             or (d["kt_net"] is not None and abs(d["kt_net"]) >= 1 + EDGE_MARGIN)]
    spots.sort(key=lambda d: -abs(d["peak"]))
    warnings += _saint_venant(spots, applied, axis)
    peaks = tuple(StressPeak(rank=i + 1, **d) for i, d in enumerate(spots))
    free = free_mask(samples, loaded)
    lowest, _ = maximise_over_angle(parts, lambda st: -st[0])  # the most compressive tangential stress
    lowest = -lowest
    ic = int(np.where(free)[0][np.argmin(lowest[free])])
    comp = Compressive(float(lowest[ic]), float(samples.xy[0, ic]), float(samples.xy[1, ic]))
    return PeakSet(peaks, comp, tuple(warnings))


def _degrees(angle: float) -> float:
    """An angle around the axis in degrees, in (-180, 180]."""
    d = math.degrees(angle) % 360.0
    return d - 360.0 if d > 180.0 else d


def _measure_sides(parts, measure: Measure, by_angle: bool):
    """The measure along the boundary as the peak finder sees it, with the angle of each value and which
    peaks of it to keep. Where the stress varies around the axis, a signed measure has a tensile extreme
    and a compressive one at each point, at different angles (a shaft in bending): both are searched, so
    that the compressive side of every notch is reported too."""
    if not by_angle or measure not in (Measure.TANGENTIAL, Measure.PRINCIPAL):
        m, theta = measure_over_angle(parts, measure)
        return [(m, theta, lambda v: True)]
    high = Measure.TANGENTIAL if measure == Measure.TANGENTIAL else Measure.MAX_PRINCIPAL
    low = Measure.TANGENTIAL if measure == Measure.TANGENTIAL else Measure.MIN_PRINCIPAL
    hi, th = maximise_over_angle(parts, lambda st: measure_values(high, *st))
    lo, tl = maximise_over_angle(parts, lambda st: -measure_values(low, *st))
    return [(hi, th, lambda v: v > 0), (-lo, tl, lambda v: v < 0)]


def _case_nominal(model: Model, section: Section, res: Resultants, y_peak: float, measure: Measure, theta: float,
                  tx: float) -> Nominal:
    """The nominal stress a load case's peak is compared with: beam theory on the section (plates); for a
    model with torsion and bending harmonics (shafts), the same measure as the peak applied to the nominal
    surface state at the peak's angle: axial N/A + (M r/I) cos(theta), shear T r/J (docs/conventions.md)."""
    if model.shear_nominal is None:
        return nominal_stress(model, section, res, y_peak)
    y = nominal_height(section, y_peak)
    props = section.props
    one = np.ones(1)
    sig0 = model.nominal(Resultants(N=res.N), props, y)
    sig1 = model.nominal(Resultants(M=res.M), props, y)
    tau = model.shear_nominal(res, props, y) * (-1.0 if tx < 0 else 1.0)
    state = surface_at_angle([(1.0, SurfaceStress(sig0 * one, 0 * one, tau * one, 0)),
                              (1.0, SurfaceStress(sig1 * one, 0 * one, 0 * one, 1))], theta)
    return Nominal(section, res, y, float(measure_values(measure, *state)[0]))


def _component_nominal(model: Model, quantity: str, section: Section, res: Resultants, y_peak: float,
                       tx: float) -> Nominal:
    """A single component's nominal stress: the torsion shear T r/J for a torque (with the sign the surface
    shear takes on the traversed surface), beam theory otherwise."""
    if quantity == "torque" and model.shear_nominal is not None:
        y = nominal_height(section, y_peak)
        tau = model.shear_nominal(res, section.props, y) * (-1.0 if tx < 0 else 1.0)
        return Nominal(section, res, y, float(tau))
    return nominal_stress(model, section, res, y_peak)


def _gross_height(feature: Feature | None, gross: Section | None, y_peak: float) -> float:
    """Where the gross nominal stress is taken: for a notch or a step on the outline, the gross section's
    outer fibre on the peak's side (as 6M/(t H^2) in the charts); for a hole, the hole's edge like the net
    nominal stress (docs/conventions.md)."""
    if gross is None or feature is None or feature.kind in (FeatureKind.HOLE, FeatureKind.CUTOUT):
        return y_peak
    lo = min(a for a, _ in gross.intervals)
    hi = max(b for _, b in gross.intervals)
    return lo if abs(y_peak - lo) <= abs(y_peak - hi) else hi


def _case_resultants(comps, factors: Mapping[str, float], section: Section, side: int = -1) -> Resultants:
    total = Resultants()
    for c in comps:
        total = total + c.statics(section, side).scaled(factors[c.name])
    return total


#: the words of a peak's nominal stress when it does not come from net-section statics
INDETERMINATE = ("no nominal stress: supports lie on both sides of the net section, so its forces are "
                 "statically indeterminate (state one with [nominal] stress)")
STATED = "nominal stress stated in the case ([nominal] stress)"


def mirror_planes(supports, axis) -> list:
    """Symmetry planes parallel to the load axis: the part is half of a part mirrored about each, so every
    section is half of the mirrored section (their reactions act across the axis and carry no N)."""
    a = np.asarray(axis, dtype=float)
    return [s for s in supports if s.hold == "normal" and s.normal is not None and abs(float(np.dot(s.normal, a))) < 1e-9]


def free_side(supports, section: Section | None) -> int | None:
    """The side of a cut whose free body carries no support (-1 behind, +1 in front), where the section
    forces follow from the applied loads alone; None when supports lie on both sides. Symmetry planes
    parallel to the load axis do not count (:func:`mirror_planes`); a support lying on the cut itself
    (a symmetry plane across the axis through a notch) sends the free body to the side of the material."""
    if section is None or section.area <= 0:
        return None if supports else -1
    axis = np.asarray(section.axis)
    mirrors = mirror_planes(supports, axis)
    behind = front = False
    prefer = None
    for s in supports:
        if s in mirrors:
            continue
        lo, hi = s.extent(axis)
        tol = 1e-9 * max(abs(lo), abs(hi), 1.0)
        if lo >= section.s - tol and hi <= section.s + tol and s.normal is not None:
            prefer = +1 if float(np.dot(s.normal, axis)) < 0 else -1  # the outward normal points away
            continue
        behind |= lo < section.s - tol
        front |= hi > section.s + tol
    if behind and front:
        return None
    if prefer is not None:
        return None if (prefer < 0 and behind) or (prefer > 0 and front) else prefer
    return +1 if behind else -1


def section_resultants(comps, factors: Mapping[str, float], section: Section, side: int, mirrored: bool
                       ) -> Resultants:
    """Resultants of a load case on a section from the free body on ``side``; on a section mirrored about a
    symmetry plane parallel to the axis, the moment and transverse force of the mirrored pair vanish."""
    res = _case_resultants(comps, factors, section, side)
    return Resultants(N=res.N, T=res.T) if mirrored else res


def _balanced(sol, name: str) -> bool:
    try:
        return sol.field(name).balanced
    except KeyError:
        return True


def _reference(applied: Applied, comps, factors) -> tuple[float, str] | None:
    """The remote stress the peaks are compared with, when the load case is one remote stress alone."""
    if applied.reference is None or len(comps) != 1 or comps[0].quantity != "stress":
        return None
    value = factors[comps[0].name] * comps[0].magnitude
    return value, f"remote stress (principal stress of the largest magnitude, {value:.6g})"


def _introduction(applied: Applied, xy: np.ndarray) -> str:
    for intro in applied.introductions:
        if bool(intro.near(np.asarray(xy, dtype=float).reshape(2, 1))[0]):
            return intro.reason
    return ""


def _equilibrium(sol, section, comps, side, thickness, mode, p: Candidate, xy, key: str,
                 warnings: list[str], moment: bool = True) -> float:
    if mode == EquilibriumMode.OFF or side is None or not comps:
        return float("nan")
    try:
        chk = check_equilibrium(sol, section, comps, thickness, side, moment=moment)
    except SolveError:
        if p.feature is not None and not p.feature.singular:
            raise
        # a cut through a sliver at a convex tip of a curved outline leaves the straight-sided search
        # elements: nothing to integrate there (an edge peak; its Kt is marked as unchecked)
        warnings.append(f"the cut through the stress peak at ({xy[0]:.4g}, {xy[1]:.4g}) runs along the outline, "
                        "where the section forces cannot be integrated: its equilibrium is not checked")
        return float("nan")
    if mode == EquilibriumMode.FAIL and p.feature is not None and not p.feature.singular:
        require_equilibrium(chk, key)  # feature sections are refined: failure means a real fault
    elif not chk.ok:
        if p.feature is not None and p.feature.singular:
            why = "passes through a singular corner, where the stress cannot be integrated accurately"
        elif p.feature is not None:
            why = "lies on a mesh coarser than the default"
        else:
            why = "crosses coarse elements"
        warnings.append(f"the net section of {key} {why}: FE section forces differ from statics by "
                        f"{chk.error:.2%} (limit {EQUILIBRIUM_TOLERANCE:.1%}); its Kt is rough" if p.feature is not None else
                        f"the cut through the stress peak at ({xy[0]:.4g}, {xy[1]:.4g}) {why}: FE section forces "
                        f"differ from statics by {chk.error:.2%}; its Kt is rough")
    return chk.error


def _saint_venant(spots: list[dict], applied: Applied, axis: np.ndarray) -> list[str]:
    out = []
    for d in spots:
        if d["feature_kind"] == FeatureKind.EDGE:
            continue
        s_peak = d["x"] * axis[0] + d["y"] * axis[1]
        for end in applied.ends:
            if abs(s_peak - end.section.s) < end.section.width:
                out.append(
                    f"stress peak at ({d['x']:.4g}, {d['y']:.4g}) on {d['feature']} lies "
                    f"{abs(s_peak - end.section.s):.3g} from the loaded end '{end.name}', less than its width "
                    f"{end.section.width:.3g}: the idealised end load (Saint-Venant) still disturbs the stress "
                    "there; lengthen the part in the model")
                break
    return out
