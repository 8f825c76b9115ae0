"""Assess each hot spot: owning feature, net section, nominal stress, Kt and equilibrium.

Conventions are in docs/conventions.md and in :mod:`fekt.post.kt`.
"""

from __future__ import annotations

import dataclasses
import math
from dataclasses import dataclass

import numpy as np

from ..geometry.model import PartGeometry
from ..geometry.sections import Section, net_section, part_polygon, section_at, transverse
from ..mesh.build import PartMesh
from ..solver.elasticity import ElasticSolution
from ..solver.loads import LoadState
from .fields import BoundarySamples
from .hotspots import find_hot_spots, local_scatter
from .kt import check_equilibrium, gross_section, kt, nominal_stress, require_equilibrium

#: an edge maximum (no feature) within this fraction of its own nominal stress is a Saint-Venant
#: ripple, not a hot spot (our own threshold; no published source)
EDGE_MARGIN = 0.05


@dataclass(frozen=True)
class SectionInfo:
    s: float
    width: float
    area: float
    centroid: tuple[float, float]
    inertia: float
    intervals: tuple[tuple[float, float], ...]

    @classmethod
    def of(cls, sec: Section) -> "SectionInfo":
        return cls(sec.s, sec.width, sec.area, sec.centroid, sec.inertia, sec.intervals)


@dataclass(frozen=True)
class HotSpot:
    rank: int
    x: float
    y: float
    feature: str
    feature_kind: str
    singular: bool
    found_as: str
    peak: float  # maximum principal stress at the boundary point
    radius: float  # radius of curvature of the feature (0 for sharp corners, inf for straight edges)
    element_size: float  # element size requested at the feature
    net_section: SectionInfo
    N: float
    M: float
    sigma_nom_net: float
    kt_net: float | None
    gross_end: str
    sigma_nom_gross: float
    kt_gross: float | None
    equilibrium_error: float  # largest relative error of N, M on the net section
    scatter: float  # roughness of the boundary stress at the peak (stress units; see post.hotspots.local_scatter)


@dataclass(frozen=True)
class Assessment:
    hot_spots: tuple[HotSpot, ...]
    most_compressive: dict
    warnings: tuple[str, ...]


def assess(samples: BoundarySamples, part: PartGeometry, pmesh: PartMesh, sol: ElasticSolution,
           loads: LoadState, thickness: float, *, equilibrium: str = "fail") -> Assessment:
    """Ranked hot spots with net sections and Kt; the most compressive boundary stress."""
    loaded = {e.segment for e in loads.ends}
    corner_r = {name: 3.0 * h for name, h in pmesh.feature_sizes.items()}
    peaks = find_hot_spots(samples, part, loaded, corner_r)
    axis = np.array(loads.axis)
    e = transverse(axis)
    poly = part_polygon(part)
    gross_name, gross = gross_section(loads)
    sections: dict[str, Section] = {}
    eq_errors: dict[str, float] = {}
    warnings: list[str] = []
    spots = []
    for p in peaks:
        xy = samples.xy[:, p.index]
        if p.feature is not None:
            key = p.feature.name
            if key not in sections:
                sections[key] = net_section(part, p.feature, axis, thickness, poly)
        else:
            key = f"cut at ({xy[0]:.6g}, {xy[1]:.6g})"
            sections[key] = section_at(part, axis, float(xy @ axis), thickness, poly)
        sec = sections[key]
        if key not in eq_errors:
            chk = check_equilibrium(sol, sec, loads) if equilibrium != "off" else None
            if chk is not None and equilibrium == "fail" and p.feature is not None and not p.feature.singular:
                require_equilibrium(chk, key)  # feature sections are refined: failure means a real fault
            elif chk is not None and not chk.ok:
                why = ("passes through a singular corner, where the stress cannot be integrated accurately"
                       if p.feature is not None and p.feature.singular else "crosses coarse elements")
                warnings.append(
                    f"the cut through the hot spot at ({xy[0]:.4g}, {xy[1]:.4g}) {why}: FE section forces differ "
                    f"from statics by {max(chk.error_N, chk.error_M):.2%}; its Kt is rough")
            eq_errors[key] = max(chk.error_N, chk.error_M) if chk else float("nan")
        y_hot = float(xy @ e)
        nom = nominal_stress(sec, loads, y_hot)
        gsec = dataclasses.replace(gross, s=float(xy @ axis))
        gnom = nominal_stress(gsec, loads, y_hot)
        peak = float(samples.s1[p.index])
        f = p.feature
        name = f.name if f else (f"edge '{p.edge}'" if p.edge else f"boundary at ({xy[0]:.4g}, {xy[1]:.4g})")
        spots.append(dict(
            x=float(xy[0]), y=float(xy[1]), feature=name, feature_kind=f.kind if f else "edge",
            singular=bool(f.singular) if f else False, found_as=p.why, peak=peak,
            radius=f.radius if f else math.inf,
            element_size=pmesh.feature_sizes.get(f.name, pmesh.size_max) if f else pmesh.size_max,
            net_section=SectionInfo.of(sec), N=nom.N, M=nom.M, sigma_nom_net=nom.sigma,
            kt_net=kt(peak, nom), gross_end=gross_name, sigma_nom_gross=gnom.sigma, kt_gross=kt(peak, gnom),
            equilibrium_error=eq_errors[key],
            scatter=local_scatter(samples, p.index)))
    # drop Saint-Venant ripples on plain edges (EDGE_MARGIN); the overall maximum always stays
    spots = [d for d in spots if d["feature_kind"] != "edge" or d["found_as"] == "overall maximum"
             or d["kt_net"] is None or d["kt_net"] >= 1 + EDGE_MARGIN]
    spots.sort(key=lambda d: -d["peak"])
    for d in spots:
        if d["feature_kind"] == "edge":
            continue
        s_hot = d["x"] * axis[0] + d["y"] * axis[1]
        for end in loads.ends:
            if abs(s_hot - end.section.s) < end.section.width:
                warnings.append(
                    f"hot spot at ({d['x']:.4g}, {d['y']:.4g}) on {d['feature']} lies {abs(s_hot - end.section.s):.3g} "
                    f"from the loaded end '{end.name}', less than its width {end.section.width:.3g}: the idealised "
                    "end load (Saint-Venant) still disturbs the stress there; lengthen the part in the model")
                break
    hot = tuple(HotSpot(rank=i + 1, **d) for i, d in enumerate(spots))
    free = np.array([(int(li), int(si)) not in loaded for li, si in zip(samples.loop, samples.segment)])
    ic = int(np.where(free)[0][np.argmin(samples.s2[free])])
    comp = {"sigma": float(samples.s2[ic]), "x": float(samples.xy[0, ic]), "y": float(samples.xy[1, ic])}
    return Assessment(hot, comp, tuple(warnings))
