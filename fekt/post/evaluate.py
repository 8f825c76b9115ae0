"""Finish each stress peak: owning feature, net and gross sections, nominal stresses, Kt per load
component and for the load case, and the equilibrium check on the net section.

Conventions are in docs/conventions.md and in :mod:`fekt.post.kt`.
"""

from __future__ import annotations

import math
from collections.abc import Mapping
from dataclasses import dataclass

import numpy as np

from ..geometry.model import Feature, PartGeometry
from ..geometry.sections import gross_cut, net_section, part_polygon, section_at, transverse
from ..kinds import EquilibriumMode, FeatureKind, Measure, PeakReason
from ..loads.base import Applied
from ..mesh.build import PartMesh
from ..models.base import Resultants, Section, section_of
from ..records import ComponentKt, Compressive, SectionRecord, StressPeak
from ..solver.linear import Solution
from .fields import BoundarySamples
from .kt import EQUILIBRIUM_TOLERANCE, check_equilibrium, kt, nominal_stress, require_equilibrium
from .measures import component_measure, measure_values, surface_state
from .peaks import Candidate, boundary_refs, find_peaks_on_boundary, free_mask, local_scatter

#: an edge maximum (no feature) within this fraction of its own nominal stress is a Saint-Venant
#: ripple, not a stress peak (our own threshold; no published source)
EDGE_MARGIN = 0.05
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
                   factors: Mapping[str, float] | None = None) -> PeakSet:
    """Ranked stress peaks (tensile and compressive) with sections and Kt; the most compressive stress.

    ``factors``: the load case (component name -> factor; default every component at 1)."""
    model = sol.model
    factors = dict(factors) if factors is not None else {c.name: 1.0 for c in applied.components}
    comps = [c for c in applied.components if factors.get(c.name, 0.0) != 0.0]
    surf = {name: surface_state(st, samples.normal) for name, st in samples.components.items()}
    stt, shh, sth = surface_state(samples.stress, samples.normal)
    m = measure_values(measure, stt, shh, sth)
    loaded = boundary_refs(part, applied.loaded)
    corner_r = {name: CORNER_WINDOW_ELEMENTS * h for name, h in pmesh.feature_sizes.items()}
    found = find_peaks_on_boundary(samples, part, loaded, corner_r, m)
    axis = np.array(applied.axis)
    e = transverse(axis)
    poly = part_polygon(part)
    sections: dict[str, _Sections] = {}
    eq_errors: dict[str, float] = {}
    warnings: list[str] = []
    spots = []
    for p in found:
        xy = samples.xy[:, p.index]
        key = p.feature.name if p.feature is not None else f"cut at ({xy[0]:.6g}, {xy[1]:.6g})"
        if key not in sections:
            sections[key] = _feature_sections(model, part, p.feature, xy, axis, poly, thickness)
        secs = sections[key]
        if key not in eq_errors:
            eq_errors[key] = _equilibrium(sol, secs.net, applied, thickness, equilibrium, p, xy, key, warnings)
        y_peak = float(xy @ e)
        peak = float(m[p.index])
        net_res = _case_resultants(comps, factors, secs.net)
        nom = nominal_stress(model, secs.net, net_res, y_peak)
        gnom = None
        y_gross = _gross_height(p.feature, secs.gross, y_peak)
        if secs.gross is not None:
            gnom = nominal_stress(model, secs.gross, _case_resultants(comps, factors, secs.gross), y_gross)
        per = []
        for c in comps:
            cstt, _, csth = surf[c.name]
            cstress = float(component_measure(c.quantity, cstt, csth)[p.index])
            cn = nominal_stress(model, secs.net, c.statics(secs.net), y_peak)
            cg = nominal_stress(model, secs.gross, c.statics(secs.gross), y_gross) if secs.gross is not None else None
            per.append(ComponentKt(c.name, c.quantity, cstress, cn.sigma, kt(cstress, cn),
                                   cg.sigma if cg else None, kt(cstress, cg) if cg else None))
        f = p.feature
        spots.append(dict(
            x=float(xy[0]), y=float(xy[1]), feature=peak_name(p, xy), feature_kind=f.kind if f else FeatureKind.EDGE,
            singular=bool(f.singular) if f else False, reason=p.why, peak=peak,
            radius=f.radius if f else math.inf,
            element_size=pmesh.feature_sizes.get(f.name, pmesh.size_max) if f else pmesh.size_max,
            net_section=section_record(secs.net), N=nom.N, M=nom.M, sigma_nom_net=nom.sigma,
            kt_net=kt(peak, nom), gross_section=section_record(secs.gross) if secs.gross is not None else None,
            gross_rule=secs.gross_rule, sigma_nom_gross=gnom.sigma if gnom else None,
            kt_gross=kt(peak, gnom) if gnom else None, equilibrium_error=eq_errors[key],
            scatter=local_scatter(samples, p.index, m), components=tuple(per)))
    # drop Saint-Venant ripples on plain edges (EDGE_MARGIN); the largest magnitude always stays
    spots = [d for d in spots if d["feature_kind"] != FeatureKind.EDGE or d["reason"] == PeakReason.OVERALL
             or d["kt_net"] is None or abs(d["kt_net"]) >= 1 + EDGE_MARGIN]
    spots.sort(key=lambda d: -abs(d["peak"]))
    warnings += _saint_venant(spots, applied, axis)
    peaks = tuple(StressPeak(rank=i + 1, **d) for i, d in enumerate(spots))
    free = free_mask(samples, loaded)
    ic = int(np.where(free)[0][np.argmin(stt[free])])
    comp = Compressive(float(stt[ic]), float(samples.xy[0, ic]), float(samples.xy[1, ic]))
    return PeakSet(peaks, comp, tuple(warnings))


def _gross_height(feature: Feature | None, gross: Section | None, y_peak: float) -> float:
    """Where the gross nominal stress is taken: for a notch or a step on the outline, the gross section's
    outer fibre on the peak's side (as 6M/(t H^2) in the charts); for a hole, the hole's edge like the net
    nominal stress (docs/conventions.md)."""
    if gross is None or feature is None or feature.kind in (FeatureKind.HOLE, FeatureKind.CUTOUT):
        return y_peak
    lo = min(a for a, _ in gross.intervals)
    hi = max(b for _, b in gross.intervals)
    return lo if abs(y_peak - lo) <= abs(y_peak - hi) else hi


def _case_resultants(comps, factors: Mapping[str, float], section: Section) -> Resultants:
    total = Resultants()
    for c in comps:
        total = total + c.statics(section).scaled(factors[c.name])
    return total


def _equilibrium(sol, section, applied, thickness, mode, p: Candidate, xy, key: str, warnings: list[str]) -> float:
    if mode == EquilibriumMode.OFF:
        return float("nan")
    chk = check_equilibrium(sol, section, applied, thickness)
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
