"""A remote (far-field) stress: the part as a piece of a plate under a uniform stress state.

The stresses at infinity (``sigma_x``, ``sigma_y``, ``tau_xy``, part axes) are applied as the traction
t = sigma . n on the outline (every outline edge, or the edges named in ``on``), which is the exact
boundary condition of a plate of the drawn outline in that uniform stress. For an effectively infinite
plate, draw the outline far from the features: the finite-size effect on Kt falls as the square of
(feature size / distance to the outline) (Kirsch's field decays as (a/r)^2); the verification tests show
it at the distances they use.

Kt is reported against the remote stress: the principal stress of the largest magnitude of the remote
state (so that the classical results read directly: uniaxial 3, equal biaxial 2, pure shear 4 for a
circular hole; Kirsch 1898), not against a net section.
"""

from __future__ import annotations

import math
from collections.abc import Mapping
from dataclasses import dataclass

import numpy as np

from ..case import fields as F
from ..case.fields import LoadContext
from ..errors import CaseError
from ..geometry.model import OUTLINE, PartGeometry
from ..models.base import Model
from . import keys
from .base import Applied, Component, Traction
from .pressure import BALANCE_TOLERANCE, boundary_pieces
from .statics import free_body, total_force

KIND = "remote"
KEYS = ("type", "name", "sigma_x", "sigma_y", "tau_xy", "on")
MODELS = ("plane_stress", "plane_strain")


@dataclass(frozen=True)
class RemoteSpec:
    sigma_x: float = 0.0
    sigma_y: float = 0.0
    tau_xy: float = 0.0
    on: tuple[str, ...] = ()
    name: str = "load"

    @property
    def kind(self) -> str:
        return KIND

    def apply(self, part: PartGeometry, model: Model, thickness: float) -> Applied:
        return apply(self, part, model, thickness)


def parse(table: Mapping[str, object], ctx: LoadContext, item: str) -> RemoteSpec:
    sx = F.optional(table, "sigma_x", 0.0, ctx.params, item)
    sy = F.optional(table, "sigma_y", 0.0, ctx.params, item)
    txy = F.optional(table, "tau_xy", 0.0, ctx.params, item)
    if sx == 0 and sy == 0 and txy == 0:
        raise CaseError("the remote stress is zero", item=item, hint="give sigma_x, sigma_y and/or tau_xy")
    on = keys.boundaries(table, "on", ctx, item, holes=False) if "on" in table else ()
    return RemoteSpec(sx, sy, txy, on, keys.load_name(table, item, "load"))


def reference_stress(sx: float, sy: float, txy: float) -> float:
    """The principal stress of the largest magnitude, with its sign."""
    c, r = 0.5 * (sx + sy), math.hypot(0.5 * (sx - sy), txy)
    return c - r if abs(c - r) > abs(c + r) else c + r


def apply(spec: RemoteSpec, part: PartGeometry, model: Model, thickness: float) -> Applied:
    sx, sy, txy = spec.sigma_x, spec.sigma_y, spec.tau_xy

    def fn(x, n):
        return sx * n[0] + txy * n[1], txy * n[0] + sy * n[1]

    names = spec.on or (OUTLINE,)
    pieces = boundary_pieces(part, names, fn, thickness, f"loads.{spec.name}.on")
    F_, Mz = total_force(pieces)
    scale = max(abs(sx), abs(sy), abs(txy)) * sum(q.segment.length() for q in pieces) * thickness
    x0, y0, x1, y1 = part.bounding_box()
    balanced = bool(np.hypot(*F_) <= BALANCE_TOLERANCE * scale and abs(Mz) <= BALANCE_TOLERANCE * scale * max(x1 - x0, y1 - y0))
    ref = reference_stress(sx, sy, txy)
    comp = Component(name=spec.name, load=spec.name, quantity="stress", magnitude=ref,
                     operator=model.default_operator, tractions=tuple(Traction(nm, fn) for nm in names),
                     statics=lambda sec, side=-1: free_body(pieces, sec, sec.axis, side), balanced=balanced)
    # the load axis: the direction of the reference principal stress
    ang = 0.5 * math.atan2(2 * txy, sx - sy) + (0.5 * math.pi if abs(ref - (0.5 * (sx + sy) + math.hypot(
        0.5 * (sx - sy), txy))) > 1e-12 * max(abs(ref), 1e-300) else 0.0)
    words = (f"remote stress '{spec.name}': sigma_x {sx:.6g}, sigma_y {sy:.6g}, tau_xy {txy:.6g} applied as sigma.n "
             f"on {'the outline' if not spec.on else ', '.join(repr(n) for n in spec.on)}; Kt against the remote "
             f"principal stress of the largest magnitude, {ref:.6g}")
    return Applied(name=spec.name, kind=KIND, components=(comp,), axis=(math.cos(ang), math.sin(ang)), ends=(),
                   loaded=frozenset(names), notes=(words,), reference=(ref, "remote stress"))
