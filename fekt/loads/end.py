"""A load on one straight end edge: a force vector and a couple, held by supports or balanced by other loads.

Distributions (beam theory, so that away from the end the field is the one a hand calculation assumes):
on the edge of length L (thickness t, area A = L t, second moment I = t L^3 / 12) with outward normal n,
tangent s = n turned +90 degrees and coordinate eta along s from the edge's midpoint,

* normal traction sigma(eta) n with sigma = F.n / A - Mz eta / I (uniform for the force, linear for the
  couple; Mz counter-clockwise positive, so that the traction's moment about the midpoint is Mz);
* shear traction tau(eta) s with tau = 1.5 (F.s / A) (1 - (2 eta / L)^2), the parabolic shear flow of a
  rectangular section (Timoshenko & Goodier, Theory of Elasticity, the cantilever loaded at its end).

The force is given in the part's axes (``force = [Fx, Fy]``): drawing the outline in the other direction
or naming the edge differently cannot change it. One component, not self-equilibrated: the part needs
supports or other loads.
"""

from __future__ import annotations

from collections.abc import Mapping
from dataclasses import dataclass

import numpy as np

from ..case import fields as F
from ..case.fields import LoadContext
from ..errors import CaseError, GeometryError
from ..geometry.model import PartGeometry
from ..models.base import Model
from . import keys
from .base import Applied, Component, Introduction, Traction
from .statics import SegmentTraction, free_body

KIND = "end"
KEYS = ("type", "name", "edge", "force", "moment")
MODELS = ("plane_stress", "plane_strain")


@dataclass(frozen=True)
class EndSpec:
    """Force [Fx, Fy] (part axes) and couple ``moment`` (counter-clockwise positive) on one straight edge."""

    edge: str
    force: tuple[float, float] = (0.0, 0.0)
    moment: float = 0.0
    name: str = "load"

    @property
    def kind(self) -> str:
        return KIND

    def apply(self, part: PartGeometry, model: Model, thickness: float) -> Applied:
        return apply(self, part, model, thickness)


def parse(table: Mapping[str, object], ctx: LoadContext, item: str) -> EndSpec:
    edge = keys.boundaries(table, "edge", ctx, item, holes=False)
    if len(edge) != 1:
        raise CaseError("an end load acts on one edge", item=F.path(item, "edge"))
    force = keys.vector(table, "force", ctx.params, item, nonzero=False) if "force" in table else (0.0, 0.0)
    moment = F.optional(table, "moment", 0.0, ctx.params, item)
    if force == (0.0, 0.0) and moment == 0.0:
        raise CaseError("the load is zero", item=item, hint="give force = [Fx, Fy] and/or moment")
    return EndSpec(edge=edge[0], force=force, moment=moment, name=keys.load_name(table, item, "load"))


def apply(spec: EndSpec, part: PartGeometry, model: Model, thickness: float) -> Applied:
    item = f"loads.{spec.name}.edge"
    p0, n, refs = keys.straight_edge(part, spec.edge, item)
    if len(refs) != 1:
        raise GeometryError(f"edge '{spec.edge}' must be one straight segment to carry an end load", item=item)
    seg = part.segment(refs[0])
    length = float(np.hypot(*np.subtract(seg.end, seg.start)))
    mid = 0.5 * (np.array(seg.start) + np.array(seg.end))
    s = np.array([-n[1], n[0]])
    area, inertia = length * thickness, thickness * length ** 3 / 12.0
    fn, fs = float(np.dot(spec.force, n)), float(np.dot(spec.force, s))

    def fn_traction(x, nrm):
        eta = (x[0] - mid[0]) * s[0] + (x[1] - mid[1]) * s[1]
        sig = fn / area - spec.moment * eta / inertia
        tau = 1.5 * fs / area * (1.0 - (2.0 * eta / length) ** 2)
        return sig * n[0] + tau * s[0], sig * n[1] + tau * s[1]

    pieces = (SegmentTraction(seg, fn_traction, thickness),)
    quantity = "force" if spec.moment == 0 and fs == 0 else ("moment" if spec.force == (0.0, 0.0) else "end load")
    comp = Component(name=spec.name, load=spec.name, quantity=quantity,
                     magnitude=float(np.hypot(*spec.force)) if spec.force != (0.0, 0.0) else spec.moment,
                     operator=model.default_operator, tractions=(Traction(spec.edge, fn_traction),),
                     statics=lambda sec, side=-1: free_body(pieces, sec, sec.axis, side), balanced=False)
    note = (f"end load '{spec.name}' on edge '{spec.edge}': force ({spec.force[0]:.6g}, {spec.force[1]:.6g}) "
            f"(axial {fn:.6g} outward, shear {fs:.6g}) and couple {spec.moment:.6g}; beam-theory tractions (uniform "
            "and linear normal stress, parabolic shear)")
    corners = np.array([seg.start, seg.end], dtype=float).T
    reach = 0.05 * length
    return Applied(name=spec.name, kind=KIND, components=(comp,), axis=(float(n[0]), float(n[1])), ends=(),
                   loaded=frozenset({spec.edge}), notes=(note,),
                   introductions=(Introduction(spec.edge, f"where end load '{spec.name}' meets a free edge",
                                               lambda xy, c=corners, r=reach: _near_points(xy, c, r), spec.name),))


def _near_points(xy: np.ndarray, points: np.ndarray, reach: float) -> np.ndarray:
    d = np.min(np.hypot(xy[0][:, None] - points[0][None, :], xy[1][:, None] - points[1][None, :]), axis=1)
    return d <= reach
