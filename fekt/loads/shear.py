"""Uniform shear traction on named edges and cut-outs.

``stress`` = tau is the traction along the boundary's direction of travel (material on the left):
counter-clockwise around the outline, clockwise around a cut-out (fekt orders every loop that way
whichever way it was drawn, so the sign does not depend on the drawing). Traction t = tau s, with s the
unit tangent. Checked for self-equilibrium like a pressure.
"""

from __future__ import annotations

from collections.abc import Mapping
from dataclasses import dataclass

from ..case import fields as F
from ..case.fields import LoadContext
from ..errors import CaseError
from ..geometry.model import PartGeometry
from ..models.base import Model
from . import keys
from .base import Applied
from .pressure import distributed

KIND = "shear"
KEYS = ("type", "name", "on", "stress")
MODELS = ("plane_stress", "plane_strain")


@dataclass(frozen=True)
class ShearSpec:
    on: tuple[str, ...]
    stress: float
    name: str = "load"

    @property
    def kind(self) -> str:
        return KIND

    def apply(self, part: PartGeometry, model: Model, thickness: float) -> Applied:
        return apply(self, part, model, thickness)


def parse(table: Mapping[str, object], ctx: LoadContext, item: str) -> ShearSpec:
    on = keys.boundaries(table, "on", ctx, item)
    tau = F.number(F.required(table, "stress", item), ctx.params, F.path(item, "stress"))
    if tau == 0:
        raise CaseError("the shear traction is zero", item=F.path(item, "stress"))
    return ShearSpec(on=on, stress=tau, name=keys.load_name(table, item, "load"))


def apply(spec: ShearSpec, part: PartGeometry, model: Model, thickness: float) -> Applied:
    tau = spec.stress

    def fn(x, n):
        return -tau * n[1], tau * n[0]  # s = n turned +90 degrees: the direction of travel

    return distributed(spec, part, model, thickness, fn, "shear", "shear traction")
