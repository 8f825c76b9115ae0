"""Normal pressure on named edges and cut-outs (a pressurised hole, a fluid on a face), constant or
varying linearly in space.

p(x) = p0 + g . (x - x0), with ``pressure`` = p0, ``gradient`` = g = [gx, gy] (pressure change per unit
length, default none) and ``origin`` = x0 (default [0, 0]); a positive pressure pushes on the surface
(traction t = -p n, n the outward normal). Written in the part's axes, so drawing the outline in the
other direction cannot change it. Self-equilibrated when the pressure is uniform over closed cut-outs;
otherwise the part needs supports or other loads (fekt checks, see :mod:`fekt.pipeline`).
"""

from __future__ import annotations

from collections.abc import Mapping
from dataclasses import dataclass

import numpy as np

from ..case import fields as F
from ..case.fields import LoadContext
from ..errors import CaseError
from ..geometry.model import PartGeometry
from ..models.base import Model
from . import keys
from .base import Applied, Component, Traction
from .statics import SegmentTraction, free_body, total_force

KIND = "pressure"
KEYS = ("type", "name", "on", "pressure", "gradient", "origin")
MODELS = ("plane_stress", "plane_strain")
#: a resultant below this fraction of |p| x loaded length counts as zero (self-equilibrated; our own)
BALANCE_TOLERANCE = 1e-9


@dataclass(frozen=True)
class PressureSpec:
    on: tuple[str, ...]
    pressure: float
    gradient: tuple[float, float] = (0.0, 0.0)
    origin: tuple[float, float] = (0.0, 0.0)
    name: str = "load"

    @property
    def kind(self) -> str:
        return KIND

    def apply(self, part: PartGeometry, model: Model, thickness: float) -> Applied:
        return apply(self, part, model, thickness)


def parse(table: Mapping[str, object], ctx: LoadContext, item: str) -> PressureSpec:
    on = keys.boundaries(table, "on", ctx, item)
    p0 = F.number(F.required(table, "pressure", item), ctx.params, F.path(item, "pressure"))
    g = keys.vector(table, "gradient", ctx.params, item, nonzero=False) if "gradient" in table else (0.0, 0.0)
    x0 = keys.vector(table, "origin", ctx.params, item, nonzero=False) if "origin" in table else (0.0, 0.0)
    if p0 == 0 and g == (0.0, 0.0):
        raise CaseError("the pressure is zero everywhere", item=F.path(item, "pressure"))
    return PressureSpec(on=on, pressure=p0, gradient=g, origin=x0, name=keys.load_name(table, item, "load"))


def pressure_traction(p0: float, g, x0):
    gx, gy = float(g[0]), float(g[1])

    def traction(x, n):
        p = p0 + gx * (x[0] - x0[0]) + gy * (x[1] - x0[1])
        return -p * n[0], -p * n[1]

    return traction


def boundary_pieces(part: PartGeometry, names, fn, thickness: float, item: str) -> tuple[SegmentTraction, ...]:
    return tuple(SegmentTraction(part.segment(r), fn, thickness)
                 for nm in names for r in keys.segments_of(part, nm, item))


def distributed(spec, part: PartGeometry, model: Model, thickness: float, fn, quantity: str, words: str) -> Applied:
    """The Applied record of a traction ``fn`` on the named boundaries ``spec.on`` (pressure and shear)."""
    pieces = boundary_pieces(part, spec.on, fn, thickness, f"loads.{spec.name}.on")
    F_, Mz = total_force(pieces)
    length = sum(float(np.sum(q.segment.length())) for q in pieces) * thickness
    scale = max(abs(spec_value(spec)) * length, 1e-300)
    x0, y0, x1, y1 = part.bounding_box()
    size = max(x1 - x0, y1 - y0)
    balanced = bool(np.hypot(*F_) <= BALANCE_TOLERANCE * scale and abs(Mz) <= BALANCE_TOLERANCE * scale * size)
    comp = Component(name=spec.name, load=spec.name, quantity=quantity, magnitude=spec_value(spec),
                     operator=model.default_operator, tractions=tuple(Traction(nm, fn) for nm in spec.on),
                     statics=lambda sec, side=-1: free_body(pieces, sec, sec.axis, side), balanced=balanced)
    note = (f"{words} '{spec.name}' on {', '.join(repr(n) for n in spec.on)}: resultant force ({F_[0]:.6g}, "
            f"{F_[1]:.6g}), moment {Mz:.6g} about the origin" + (" (self-equilibrated)" if balanced else ""))
    d = F_ / np.hypot(*F_) if np.hypot(*F_) > 0 else np.array([1.0, 0.0])
    return Applied(name=spec.name, kind=spec.kind, components=(comp,), axis=(float(d[0]), float(d[1])), ends=(),
                   loaded=frozenset(), notes=(note,))


def spec_value(spec) -> float:
    return float(getattr(spec, "pressure", getattr(spec, "stress", 0.0)))


def apply(spec: PressureSpec, part: PartGeometry, model: Model, thickness: float) -> Applied:
    fn = pressure_traction(spec.pressure, spec.gradient, spec.origin)
    return distributed(spec, part, model, thickness, fn, "pressure", "pressure")
