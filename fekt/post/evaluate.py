"""Finish each stress peak: owning feature, net section, nominal stresses, Kt and equilibrium.

Conventions are in docs/conventions.md and in :mod:`fekt.post.kt`.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

from ..geometry.model import PartGeometry
from ..geometry.sections import net_section, part_polygon, section_at, transverse
from ..kinds import EquilibriumMode, FeatureKind, PeakReason
from ..loads.base import Applied
from ..mesh.build import PartMesh
from ..models.base import Section, section_of
from ..records import Compressive, SectionRecord, StressPeak
from ..solver.linear import Solution
from .fields import BoundarySamples
from .kt import check_equilibrium, gross_section, kt, nominal_stress, require_equilibrium
from .peaks import boundary_refs, find_peaks_on_boundary, free_mask, local_scatter

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


def evaluate_peaks(samples: BoundarySamples, part: PartGeometry, pmesh: PartMesh, sol: Solution,
                   applied: Applied, thickness: float, *,
                   equilibrium: EquilibriumMode = EquilibriumMode.FAIL) -> PeakSet:
    """Ranked stress peaks with net sections and Kt; the most compressive boundary stress."""
    model = sol.model
    loaded = boundary_refs(part, applied.loaded)
    corner_r = {name: CORNER_WINDOW_ELEMENTS * h for name, h in pmesh.feature_sizes.items()}
    found = find_peaks_on_boundary(samples, part, loaded, corner_r)
    axis = np.array(applied.axis)
    e = transverse(axis)
    poly = part_polygon(part)
    gross_name, gross = gross_section(applied)
    sections: dict[str, Section] = {}
    eq_errors: dict[str, float] = {}
    warnings: list[str] = []
    spots = []
    for p in found:
        xy = samples.xy[:, p.index]
        if p.feature is not None:
            key = p.feature.name
            if key not in sections:
                sections[key] = section_of(model, net_section(part, p.feature, axis, poly), axis, thickness)
        else:
            key = f"cut at ({xy[0]:.6g}, {xy[1]:.6g})"
            sections[key] = section_of(model, section_at(part, axis, float(xy @ axis), poly), axis, thickness)
        sec = sections[key]
        if key not in eq_errors:
            chk = check_equilibrium(sol, sec, applied, thickness) if equilibrium != EquilibriumMode.OFF else None
            if chk is not None and equilibrium == EquilibriumMode.FAIL and p.feature is not None \
                    and not p.feature.singular:
                require_equilibrium(chk, key)  # feature sections are refined: failure means a real fault
            elif chk is not None and not chk.ok:
                why = ("passes through a singular corner, where the stress cannot be integrated accurately"
                       if p.feature is not None and p.feature.singular else "crosses coarse elements")
                warnings.append(
                    f"the cut through the stress peak at ({xy[0]:.4g}, {xy[1]:.4g}) {why}: FE section forces "
                    f"differ from statics by {chk.error:.2%}; its Kt is rough")
            eq_errors[key] = chk.error if chk else float("nan")
        y_peak = float(xy @ e)
        nom = nominal_stress(model, sec, applied.resultants(sec), y_peak)
        gsec = gross.at(float(xy @ axis))
        gnom = nominal_stress(model, gsec, applied.resultants(gsec), y_peak)
        peak = float(samples.s1[p.index])
        f = p.feature
        name = f.name if f else (f"edge '{p.edge}'" if p.edge else f"boundary at ({xy[0]:.4g}, {xy[1]:.4g})")
        spots.append(dict(
            x=float(xy[0]), y=float(xy[1]), feature=name, feature_kind=f.kind if f else FeatureKind.EDGE,
            singular=bool(f.singular) if f else False, reason=p.why, peak=peak,
            radius=f.radius if f else math.inf,
            element_size=pmesh.feature_sizes.get(f.name, pmesh.size_max) if f else pmesh.size_max,
            net_section=section_record(sec), N=nom.N, M=nom.M, sigma_nom_net=nom.sigma,
            kt_net=kt(peak, nom), gross_end=gross_name, sigma_nom_gross=gnom.sigma, kt_gross=kt(peak, gnom),
            equilibrium_error=eq_errors[key],
            scatter=local_scatter(samples, p.index)))
    # drop Saint-Venant ripples on plain edges (EDGE_MARGIN); the overall maximum always stays
    spots = [d for d in spots if d["feature_kind"] != FeatureKind.EDGE or d["reason"] == PeakReason.OVERALL
             or d["kt_net"] is None or d["kt_net"] >= 1 + EDGE_MARGIN]
    spots.sort(key=lambda d: -d["peak"])
    for d in spots:
        if d["feature_kind"] == FeatureKind.EDGE:
            continue
        s_peak = d["x"] * axis[0] + d["y"] * axis[1]
        for end in applied.ends:
            if abs(s_peak - end.section.s) < end.section.width:
                warnings.append(
                    f"stress peak at ({d['x']:.4g}, {d['y']:.4g}) on {d['feature']} lies "
                    f"{abs(s_peak - end.section.s):.3g} from the loaded end '{end.name}', less than its width "
                    f"{end.section.width:.3g}: the idealised end load (Saint-Venant) still disturbs the stress "
                    "there; lengthen the part in the model")
                break
    peaks = tuple(StressPeak(rank=i + 1, **d) for i, d in enumerate(spots))
    free = free_mask(samples, loaded)
    ic = int(np.where(free)[0][np.argmin(samples.s2[free])])
    comp = Compressive(float(samples.s2[ic]), float(samples.xy[0, ic]), float(samples.xy[1, ic]))
    return PeakSet(peaks, comp, tuple(warnings))
