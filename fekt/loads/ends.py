"""End loads: axial force and in-plane moment as self-equilibrated tractions on two named end edges.

Beam-theory distributions, so that away from notches the field is the one a hand calculation assumes:
sigma_end(y') = F / A + M (y' - yc) / I on each end (uniform for force, linear about the end section's
centroid for moment), applied as traction t = sigma_end * n (n the outward normal).

Conventions: the load axis a is the outward normal of the second end; y' = x . e with e = a rotated
+90 degrees. F > 0 is tension. M > 0 puts the +y' side in tension. The first end carries M1 = M; the
second carries M2 = M1 + F (yc1 - yc2), which balances the couple of the axial forces when the ends'
centroids are offset (reported to the user whenever it differs from M).
Statics then give the resultants on any cut with centroid yc: N = F, M(yc) = M1 + F (yc1 - yc).

Two components, each its own right-hand side: ``force`` (F with the balancing couple) and ``moment``.
"""

from __future__ import annotations

import math
from collections.abc import Mapping
from dataclasses import dataclass

import numpy as np

from ..case import fields as F
from ..case.fields import LoadContext
from ..errors import CaseError, GeometryError
from ..geometry.model import LINE, PartGeometry
from ..geometry.sections import cut_from_intervals, transverse
from ..models.base import Model, Resultants, Section, section_of
from .base import Applied, Component, LoadedEnd, Traction

KIND = "ends"
KEYS = ("type", "ends", "force", "stress", "moment")
#: the analysis models this load type applies to (in-plane forces and moments of a plate)
MODELS = ("plane_stress", "plane_strain")


@dataclass(frozen=True)
class EndsSpec:
    """Self-equilibrated end loads.

    ``ends`` names two straight, parallel outline edges. The load axis is the outward normal of the
    second end (pointing away from the first). ``force`` is the axial force (tension positive);
    ``moment`` is the in-plane bending moment about each end's centroid, positive when it puts the
    side at +90 degrees from the load axis in tension. ``stress``, if given, sets the force to
    stress * area of the first end section.
    """

    ends: tuple[str, str]
    force: float = 0.0
    moment: float = 0.0
    stress: float | None = None
    name: str = "load"

    @property
    def kind(self) -> str:
        return KIND

    def apply(self, part: PartGeometry, model: Model, thickness: float) -> Applied:
        return apply(self, part, model, thickness)


def _ends(raw: object, edges: tuple[str, ...]) -> tuple[str, str]:
    item = "load.ends"
    values = F.array(raw, item)
    if len(values) != 2:
        raise CaseError(f"expected 2 edge names, got {len(values)}", item=item,
                        hint='name two parallel straight edges, e.g. ends = ["left", "right"]')
    first, second = (F.name(v, F.path(item, j)) for j, v in enumerate(values))
    for j, name in enumerate((first, second)):
        if name not in edges:
            raise CaseError(f"the outline has no edge named '{name}'", item=F.path(item, j),
                            hint=F.close_match(name, edges)
                            + f"named edges: {', '.join(edges) or 'none (add edge = ... to the outline)'}")
    if first == second:
        raise CaseError(f"both ends are the edge '{first}'", item=item, hint="the load needs two different edges")
    return first, second


def parse(table: Mapping[str, object], ctx: LoadContext, item: str) -> EndsSpec:
    params = ctx.params
    if "ends" not in table and ctx.default_ends:
        ends = ctx.default_ends  # standard shapes are loaded at their ends "left" and "right"
    else:
        ends = _ends(F.required(table, "ends", item), ctx.edges)
    if "force" in table and "stress" in table:
        raise CaseError("give either force or stress, not both", item=f"{item}.stress",
                        hint="stress is the nominal stress on the first end's section; force = stress * area")
    if not any(key in table for key in ("force", "stress", "moment")):
        raise CaseError("missing load: give force, stress or moment (or a combination)", item=item)
    force = F.optional(table, "force", 0.0, params, item)
    stress = F.number(table["stress"], params, f"{item}.stress") if "stress" in table else None
    moment = F.optional(table, "moment", 0.0, params, item)
    if force == 0 and not stress and moment == 0:
        # A zero load gives zero stress everywhere, and Kt is a ratio of stresses.
        raise CaseError("the load is zero", item=item, hint="give a non-zero force, stress or moment")
    return EndsSpec(ends=ends, force=force, moment=moment, stress=stress)


def _end(part: PartGeometry, name: str, item: str):
    refs = part.edge_segments(name)
    if not refs:
        raise GeometryError(f"no outline edge is named '{name}'", item=item,
                            hint=f"named edges: {', '.join(part.edge_names()) or 'none'}")
    if len(refs) != 1 or part.segment(refs[0]).kind != LINE or refs[0][0] != 0:
        raise GeometryError(f"edge '{name}' must be a single straight outline edge to carry an end load",
                            item=item, hint="a notch or arc on a loaded end is not supported")
    return refs[0]


def apply(spec: EndsSpec, part: PartGeometry, model: Model, thickness: float) -> Applied:
    if model.name not in MODELS:
        raise GeometryError(f"load type '{KIND}' (in-plane force and moment of a plate) does not apply to model "
                            f"'{model.name}'", item="load.type", hint=f"model '{model.name}' takes type = "
                            f"'{model.default_load}'")
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
    secs: list[Section] = []
    for seg in (s1, s2):
        ys = sorted([float(np.array(seg.start) @ e), float(np.array(seg.end) @ e)])
        s = float(np.array(seg.start) @ axis)
        secs.append(section_of(model, cut_from_intervals(s, [tuple(ys)]), axis, thickness))
    if secs[1].s <= secs[0].s:
        raise GeometryError("the first loaded end must lie behind the second along the load axis",
                            item="load.ends")
    force = spec.force if spec.stress is None else spec.stress * secs[0].area
    m1 = spec.moment
    couple = force * (secs[0].yc - secs[1].yc)  # carried by the second end to balance offset centroids
    m2 = m1 + couple
    notes = []
    if abs(m2 - m1) > 1e-12 * (abs(m1) + abs(force) * max(w1, w2)):
        notes.append(f"the end centroids are offset by {secs[0].yc - secs[1].yc:.6g} across the load axis: to keep "
                     f"the part in equilibrium, end '{spec.ends[1]}' carries a moment {m2:.6g} "
                     f"(= {m1:.6g} + force x offset) while end '{spec.ends[0]}' carries {m1:.6g}")
    if force == 0 and m1 == 0 and m2 == 0:
        raise GeometryError("the load has no resultant (force and moment are both zero)", item="load",
                            hint="give force, stress or moment")
    yc1 = secs[0].yc

    def beam(sec: Section, n_force: float, moment: float):
        def traction(x, n):
            y = x[0] * e[0] + x[1] * e[1]
            sig = n_force / sec.area + moment * (y - sec.yc) / sec.inertia
            return sig * n[0], sig * n[1]

        return traction

    names = spec.ends
    components = []
    if force != 0:
        components.append(Component(
            name="force", load=spec.name, quantity="force", magnitude=force, operator=model.default_operator,
            tractions=(Traction(names[0], beam(secs[0], force, 0.0)), Traction(names[1], beam(secs[1], force, couple))),
            statics=lambda sec: Resultants(N=force, M=force * (yc1 - sec.yc))))
    if m1 != 0:
        components.append(Component(
            name="moment", load=spec.name, quantity="moment", magnitude=m1, operator=model.default_operator,
            tractions=(Traction(names[0], beam(secs[0], 0.0, m1)), Traction(names[1], beam(secs[1], 0.0, m1))),
            statics=lambda sec: Resultants(M=m1)))
    ends = (LoadedEnd(names[0], names[0], secs[0], m1), LoadedEnd(names[1], names[1], secs[1], m2))
    return Applied(name=spec.name, kind=KIND, components=tuple(components), axis=(float(axis[0]), float(axis[1])),
                   ends=ends, loaded=frozenset(names), notes=tuple(notes))
