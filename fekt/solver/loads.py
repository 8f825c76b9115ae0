"""End loads: axial force and in-plane moment as self-equilibrated tractions on two named end edges.

Beam-theory distributions, so that away from notches the field is the one a hand calculation assumes:
sigma_end(y') = F / A + M (y' - yc) / I on each end (uniform for force, linear about the end section's
centroid for moment), applied as traction t = sigma_end * n (n the outward normal).

Conventions: the load axis a is the outward normal of the second end; y' = x . e with e = a rotated
+90 degrees. F > 0 is tension. M > 0 puts the +y' side in tension. The first end carries M1 = M; the
second carries M2 = M1 + F (yc1 - yc2), which balances the couple of the axial forces when the ends'
centroids are offset (reported to the user whenever it differs from M).
Statics then give the resultants on any cut with centroid yc: N = F, M(yc) = M1 + F (yc1 - yc).
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

from ..case.schema import LoadSpec
from ..errors import GeometryError
from ..geometry.model import LINE, PartGeometry
from ..geometry.sections import Section, section_from_intervals, transverse
from .elasticity import TractionLoad


@dataclass(frozen=True)
class EndLoad:
    name: str
    segment: tuple[int, int]
    section: Section
    moment: float  # moment about this end's centroid


@dataclass(frozen=True)
class LoadState:
    """The applied loads after balancing, with everything needed for statics on a cut."""

    axis: tuple[float, float]
    force: float
    ends: tuple[EndLoad, EndLoad]
    notes: tuple[str, ...]

    def resultants(self, section: Section) -> tuple[float, float]:
        """(N, M) on a cut, M about the cut's centroid (statics of the free body on the first end's side)."""
        e1 = self.ends[0]
        return self.force, e1.moment + self.force * (e1.section.yc - section.yc)


def _end(part: PartGeometry, name: str, item: str):
    refs = part.edge_segments(name)
    if not refs:
        raise GeometryError(f"no outline edge is named '{name}'", item=item,
                            hint=f"named edges: {', '.join(part.edge_names()) or 'none'}")
    if len(refs) != 1 or part.segment(refs[0]).kind != LINE or refs[0][0] != 0:
        raise GeometryError(f"edge '{name}' must be a single straight outline edge to carry an end load",
                            item=item, hint="a notch or arc on a loaded end is not supported")
    return refs[0]


def build_loads(part: PartGeometry, spec: LoadSpec, thickness: float) -> LoadState:
    if spec.ends[0] == spec.ends[1]:
        raise GeometryError("the two loaded ends must be different edges", item="load.ends")
    r1 = _end(part, spec.ends[0], "load.ends[0]")
    r2 = _end(part, spec.ends[1], "load.ends[1]")
    s1, s2 = part.segment(r1), part.segment(r2)
    d2 = np.subtract(s2.end, s2.start)
    w2 = float(np.linalg.norm(d2))
    axis = np.array([d2[1], -d2[0]]) / w2  # outward normal: right of travel (material on the left)
    d1 = np.subtract(s1.end, s1.start)
    w1 = float(np.linalg.norm(d1))
    n1 = np.array([d1[1], -d1[0]]) / w1
    if np.linalg.norm(n1 + axis) > 1e-6:
        ang = math.degrees(math.acos(max(-1.0, min(1.0, float(-n1 @ axis)))))
        raise GeometryError(f"the loaded ends '{spec.ends[0]}' and '{spec.ends[1]}' are not parallel and facing "
                            f"apart (angle {ang:.3g} deg between their normals)", item="load.ends",
                            hint="end loads need two parallel straight edges at opposite ends of the part")
    e = transverse(axis)
    secs = []
    for seg in (s1, s2):
        ys = sorted([float(np.array(seg.start) @ e), float(np.array(seg.end) @ e)])
        s = float(np.array(seg.start) @ axis)
        secs.append(section_from_intervals(s, [tuple(ys)], axis, thickness))
    if secs[1].s <= secs[0].s:
        raise GeometryError("the first loaded end must lie behind the second along the load axis",
                            item="load.ends")
    F = spec.force if spec.stress is None else spec.stress * secs[0].area
    M1 = spec.moment
    M2 = M1 + F * (secs[0].yc - secs[1].yc)
    notes = []
    if abs(M2 - M1) > 1e-12 * (abs(M1) + abs(F) * max(w1, w2)):
        notes.append(f"the end centroids are offset by {secs[0].yc - secs[1].yc:.6g} across the load axis: to keep "
                     f"the part in equilibrium, end '{spec.ends[1]}' carries a moment {M2:.6g} "
                     f"(= {M1:.6g} + force x offset) while end '{spec.ends[0]}' carries {M1:.6g}")
    if F == 0 and M1 == 0 and M2 == 0:
        raise GeometryError("the load has no resultant (force and moment are both zero)", item="load",
                            hint="give force, stress or moment")
    ends = (EndLoad(spec.ends[0], r1, secs[0], M1), EndLoad(spec.ends[1], r2, secs[1], M2))
    return LoadState(axis=(float(axis[0]), float(axis[1])), force=F, ends=ends, notes=tuple(notes))


def traction_loads(state: LoadState, facets_of) -> list[TractionLoad]:
    """Traction loads for the solver; ``facets_of(ref)`` gives the boundary facets of a segment."""
    axis = np.array(state.axis)
    e = transverse(axis)
    loads = []
    for end in state.ends:
        sec = end.section

        def traction(x, n, _sec=sec, _M=end.moment):
            y = x[0] * e[0] + x[1] * e[1]
            sig = state.force / _sec.area + _M * (y - _sec.yc) / _sec.inertia
            return sig * n[0], sig * n[1]

        loads.append(TractionLoad(facets_of([end.segment]), traction, label=end.name))
    return loads
