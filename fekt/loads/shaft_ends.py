"""Shaft end loads: axial force, bending moment and torque on the two end faces of a round shaft.

Each is applied as the Saint-Venant (beam-theory) traction of a uniform bar on each end face, so away
from notches the field is the one a hand calculation assumes and each component is self-equilibrated:

* ``force`` F (operator ``axial``): sigma = F / A, traction t = sigma n;
* ``moment`` M (operator ``bending``, first circumferential harmonic): sigma = (M / I) r cos(theta),
  traction amplitude t_x = n_x (M / I) r;
* ``torque`` T (operator ``torsion``): tau = T r / J, hoop traction t_theta = n_x T r / J.

A, I, J are those of each end face (disc or annulus). Conventions (docs/conventions.md): the ends are
straight edges perpendicular to the axis; F > 0 is tension; M > 0 puts the drawn meridian (theta = 0,
the +y side of the section) in tension; T > 0 gives tau_z-theta = +T r / J with theta right-handed about
+x, i.e. on the end whose outward normal is +x the torque points along +x. Statics: N = F, M and T are the
same on every cut (no transverse force). The loaded boundaries are the two ends and the axis edge (no
peaks are sought on the axis).
"""

from __future__ import annotations

from collections.abc import Mapping
from dataclasses import dataclass

import numpy as np

from ..case import fields as F
from ..case.fields import LoadContext
from ..errors import CaseError, GeometryError
from ..geometry.model import LINE, PartGeometry
from ..geometry.sections import cut_from_intervals, transverse
from ..models.axisymmetric import axis_edge_names
from ..models.base import Model, Resultants, Section, section_of
from . import ends as plane_ends
from .base import Applied, Component, LoadedEnd, Traction

KIND = "shaft_ends"
KEYS = ("type", "ends", "force", "moment", "torque")
#: the analysis models this load type applies to
MODELS = ("axisymmetric",)
#: the operators it needs
OPERATORS = ("axial", "bending", "torsion")


@dataclass(frozen=True)
class ShaftEndsSpec:
    """Force, bending moment and torque on two end faces of a shaft (any combination, not all zero)."""

    ends: tuple[str, str]
    force: float = 0.0
    moment: float = 0.0
    torque: float = 0.0
    name: str = "load"

    @property
    def kind(self) -> str:
        return KIND

    def apply(self, part: PartGeometry, model: Model, thickness: float) -> Applied:
        return apply(self, part, model, thickness)


def parse(table: Mapping[str, object], ctx: LoadContext, item: str) -> ShaftEndsSpec:
    if "ends" not in table and ctx.default_ends:
        ends = ctx.default_ends  # standard shapes are loaded at their ends "left" and "right"
    else:
        ends = plane_ends._ends(F.required(table, "ends", item), ctx.edges)
    if not any(key in table for key in ("force", "moment", "torque")):
        raise CaseError("missing load: give force, moment or torque (or a combination)", item=item)
    force = F.optional(table, "force", 0.0, ctx.params, item)
    moment = F.optional(table, "moment", 0.0, ctx.params, item)
    torque = F.optional(table, "torque", 0.0, ctx.params, item)
    if force == 0 and moment == 0 and torque == 0:
        raise CaseError("the load is zero", item=item, hint="give a non-zero force, moment or torque")
    return ShaftEndsSpec(ends=ends, force=force, moment=moment, torque=torque)


def _end(part: PartGeometry, name: str, item: str):
    refs = part.edge_segments(name)
    if not refs:
        raise GeometryError(f"no outline edge is named '{name}'", item=item,
                            hint=f"named edges: {', '.join(part.edge_names()) or 'none'}")
    seg = part.segment(refs[0])
    if len(refs) != 1 or seg.kind != LINE or refs[0][0] != 0:
        raise GeometryError(f"edge '{name}' must be a single straight outline edge to carry an end load",
                            item=item, hint="a notch or arc on a loaded end is not supported")
    dx, dy = np.subtract(seg.end, seg.start)
    if abs(dx) > 1e-9 * abs(dy):
        raise GeometryError(f"end '{name}' from ({seg.start[0]:.6g}, {seg.start[1]:.6g}) to ({seg.end[0]:.6g}, "
                            f"{seg.end[1]:.6g}) is not perpendicular to the axis", item=item,
                            hint="a shaft's loaded end is a face x = const (a vertical edge of the meridian section)")
    return seg


def apply(spec: ShaftEndsSpec, part: PartGeometry, model: Model, thickness: float) -> Applied:
    missing = [op for op in OPERATORS if op not in model.operators]
    if missing:
        raise GeometryError(f"load type '{KIND}' (torque, bending of a round shaft) does not apply to model "
                            f"'{model.name}'", item="part.model", hint='use model = "axisymmetric"')
    if spec.ends[0] == spec.ends[1]:
        raise GeometryError("the two loaded ends must be different edges", item="load.ends")
    s1 = _end(part, spec.ends[0], "load.ends[0]")
    s2 = _end(part, spec.ends[1], "load.ends[1]")
    # outward normal: right of travel (material on the left); +-x for a face x = const
    n1 = 1.0 if s1.end[1] > s1.start[1] else -1.0
    n2 = 1.0 if s2.end[1] > s2.start[1] else -1.0
    if n1 == n2:
        raise GeometryError(f"the loaded ends '{spec.ends[0]}' and '{spec.ends[1]}' face the same way",
                            item="load.ends", hint="load the two end faces at opposite ends of the shaft")
    axis = np.array([n2, 0.0])
    e = transverse(axis)
    secs: list[Section] = []
    for seg in (s1, s2):
        ys = sorted([float(np.array(seg.start) @ e), float(np.array(seg.end) @ e)])
        secs.append(section_of(model, cut_from_intervals(float(np.array(seg.start) @ axis), [tuple(ys)]), axis,
                               thickness))
    if secs[1].s <= secs[0].s:
        raise GeometryError("the first loaded end must lie behind the second along the axis", item="load.ends")
    force, moment, torque = spec.force, spec.moment, spec.torque

    def axial(sec: Section):
        sig = force / sec.area
        return lambda x, n: (sig * n[0], sig * n[1])

    def bending(sec: Section):
        k = moment / sec.inertia
        return lambda x, n: (n[0] * k * x[1], 0.0 * x[1], 0.0 * x[1])

    def torsion(sec: Section):
        k = torque / sec.polar
        return lambda x, n: (n[0] * k * x[1],)

    names = spec.ends
    components = []
    for value, cname, op, traction, statics in (
            (force, "force", "axial", axial, Resultants(N=force)),
            (moment, "moment", "bending", bending, Resultants(M=moment)),
            (torque, "torque", "torsion", torsion, Resultants(T=torque))):
        if value != 0:
            components.append(Component(
                name=cname, load=spec.name, quantity=cname, magnitude=value, operator=op,
                tractions=(Traction(names[0], traction(secs[0])), Traction(names[1], traction(secs[1]))),
                statics=lambda sec, st=statics: st))
    if not components:
        raise GeometryError("the load has no resultant (force, moment and torque are all zero)", item="load",
                            hint="give force, moment or torque")
    ends = (LoadedEnd(names[0], names[0], secs[0], moment), LoadedEnd(names[1], names[1], secs[1], moment))
    loaded = frozenset(names) | frozenset(axis_edge_names(part))
    return Applied(name=spec.name, kind=KIND, components=tuple(components), axis=(float(axis[0]), float(axis[1])),
                   ends=ends, loaded=loaded)
