"""A bolt or pin bearing on a hole, by the cosine distribution of radial pressure.

The resultant force F (given in the part's axes, ``force = [Fx, Fy]``: the force the bolt puts on the
part) is spread over the half of the hole that faces it: at the point of the hole at angle phi from the
direction of F, the radial pressure is p(phi) = p0 cos(phi) for |phi| < 90 degrees and 0 elsewhere,
with p0 = 2 |F| / (pi R t), so that the pressures add up to F (integral of p0 cos^2 phi R t dphi over
-90..90 degrees = p0 R t pi / 2). This is the usual engineering idealisation of a close-fitting pin (common
practice; no single published source); the contact solution of a rigid pin is :mod:`fekt.loads.pin`.
The pressure pushes the hole's surface away from its centre, into the material.

One component, not self-equilibrated: the part needs supports or other loads. Peaks on the loaded
half where the pressure is at least 10 % of p0 are load-introduction peaks (our own threshold).
"""

from __future__ import annotations

import math
from collections.abc import Mapping
from dataclasses import dataclass

import numpy as np

from ..case.fields import LoadContext
from ..geometry.model import PartGeometry
from ..models.base import Model
from . import keys
from .base import Applied, Component, Introduction, Traction
from .statics import SegmentTraction, free_body

KIND = "bearing"
KEYS = ("type", "name", "hole", "force")
MODELS = ("plane_stress", "plane_strain")
#: pressure, as a fraction of its largest value, above which a peak is where the load enters (our own)
INTRODUCTION_FRACTION = 0.1


@dataclass(frozen=True)
class BearingSpec:
    hole: str
    force: tuple[float, float]
    name: str = "load"

    @property
    def kind(self) -> str:
        return KIND

    def apply(self, part: PartGeometry, model: Model, thickness: float) -> Applied:
        return apply(self, part, model, thickness)


def parse(table: Mapping[str, object], ctx: LoadContext, item: str) -> BearingSpec:
    hole = keys.boundaries(table, "hole", ctx, item, edges=False)
    return BearingSpec(hole=hole[0], force=keys.vector(table, "force", ctx.params, item),
                       name=keys.load_name(table, item, "load"))


def cosine_traction(center: np.ndarray, radius: float, force, thickness: float):
    """The traction (x, n) -> (tx, ty) of the cosine distribution on a circular hole."""
    f = np.asarray(force, dtype=float)
    mag = float(np.hypot(*f))
    d = f / mag
    p0 = 2.0 * mag / (math.pi * radius * thickness)

    def traction(x, n):
        rx, ry = (x[0] - center[0]) / radius, (x[1] - center[1]) / radius
        p = p0 * np.maximum(rx * d[0] + ry * d[1], 0.0)
        return p * rx, p * ry

    return traction, p0


def arc_breaks(seg, center: np.ndarray, direction: np.ndarray) -> tuple[float, ...]:
    """Parameters on an arc of the hole where the angle from ``direction`` is +-90 degrees (the kinks of
    the cosine distribution)."""
    out = []
    for sign in (1.0, -1.0):
        q = center + seg.radius * sign * np.array([-direction[1], direction[0]])
        t = float(seg.parameter(q[:, None])[0])
        if 0.0 < t < 1.0 and np.hypot(*(seg.point(t)[:, 0] - q)) < 1e-9 * seg.radius:
            out.append(t)
    return tuple(out)


def apply(spec: BearingSpec, part: PartGeometry, model: Model, thickness: float) -> Applied:
    item = f"loads.{spec.name}.hole"
    center, radius, refs = keys.circle_of(part, spec.hole, item)
    traction, p0 = cosine_traction(center, radius, spec.force, thickness)
    d = np.asarray(spec.force) / np.hypot(*spec.force)
    pieces = tuple(SegmentTraction(part.segment(r), traction, thickness, arc_breaks(part.segment(r), center, d))
                   for r in refs)
    comp = Component(name=spec.name, load=spec.name, quantity="force", magnitude=float(np.hypot(*spec.force)),
                     operator=model.default_operator, tractions=(Traction(spec.hole, traction),),
                     statics=lambda sec, side=-1: free_body(pieces, sec, sec.axis, side), balanced=False)

    def near(xy, c=center, R=radius, dd=d):
        rx, ry = (xy[0] - c[0]) / R, (xy[1] - c[1]) / R
        on = np.abs(np.hypot(rx, ry) - 1.0) < 1e-3
        return on & (rx * dd[0] + ry * dd[1] >= INTRODUCTION_FRACTION)

    note = (f"bearing load '{spec.name}' on hole '{spec.hole}': force ({spec.force[0]:.6g}, {spec.force[1]:.6g}) "
            f"({keys.angle_text(spec.force)}) spread by the cosine distribution of radial pressure over the half "
            f"of the hole facing it (peak pressure {p0:.6g}; common practice)")
    return Applied(name=spec.name, kind=KIND, components=(comp,), axis=(float(d[0]), float(d[1])), ends=(),
                   loaded=frozenset(), notes=(note,),
                   introductions=(Introduction(spec.hole, f"bearing arc of '{spec.name}'", near, spec.name),))
