"""A rigid pin in a hole, in frictionless contact with it: the load of a lug or a pinned link.

The pin (diameter ``pin_diameter``, default the hole's: a neat fit) carries the force F (part axes, the
force the pin puts on the part) and touches the hole only where it is pressed against it; the contact
arc, and with it the peak, depend on the clearance and on the part's stiffness. Solved by an active-set
iteration on the hole's boundary nodes (:mod:`fekt.solver.contact`): the contact forces are radial,
never pulling, their sum is F exactly, and no node of the hole passes into the pin. Peaks on the
contact arc are load-introduction peaks.

Not linear when there is clearance (the arc grows with the load), so a load case with a pin is solved as
its own contact problem (the other loads of the case included), never scaled from another case.
"""

from __future__ import annotations

from collections.abc import Mapping
from dataclasses import dataclass

import numpy as np

from ..case import fields as F
from ..case.fields import LoadContext
from ..errors import GeometryError, SolveError
from ..geometry.model import PartGeometry
from ..models.base import Model
from . import keys
from .base import Applied, Component

KIND = "pin"
KEYS = ("type", "name", "hole", "force", "pin_diameter")
MODELS = ("plane_stress", "plane_strain")


@dataclass(frozen=True)
class PinSpec:
    hole: str
    force: tuple[float, float]
    pin_diameter: float | None = None
    name: str = "load"

    @property
    def kind(self) -> str:
        return KIND

    def apply(self, part: PartGeometry, model: Model, thickness: float) -> Applied:
        return apply(self, part, model, thickness)


@dataclass(frozen=True)
class PinContact:
    """What the contact iteration needs: the hole (its boundary name, centre, radius), the radial gap
    between pin and hole, the force on the part, and the plate thickness."""

    hole: str
    center: tuple[float, float]
    radius: float
    clearance: float
    force: tuple[float, float]
    thickness: float


def parse(table: Mapping[str, object], ctx: LoadContext, item: str) -> PinSpec:
    hole = keys.boundaries(table, "hole", ctx, item, edges=False)
    pin = F.positive(table["pin_diameter"], ctx.params, F.path(item, "pin_diameter")) if "pin_diameter" in table \
        else None
    return PinSpec(hole=hole[0], force=keys.vector(table, "force", ctx.params, item), pin_diameter=pin,
                   name=keys.load_name(table, item, "load"))


def _unsolved(section, side=-1):
    raise SolveError("internal: the statics of a pin load are known only after its contact solve")


def apply(spec: PinSpec, part: PartGeometry, model: Model, thickness: float) -> Applied:
    item = f"loads.{spec.name}.hole"
    center, radius, _ = keys.circle_of(part, spec.hole, item)
    pin = 2 * radius if spec.pin_diameter is None else spec.pin_diameter
    if pin > 2 * radius * (1 + 1e-12):
        raise GeometryError(f"the pin ({pin:.6g}) is larger than the hole '{spec.hole}' ({2 * radius:.6g})",
                            item=f"loads.{spec.name}.pin_diameter", hint="an interference fit is not modelled")
    contact = PinContact(spec.hole, (float(center[0]), float(center[1])), radius, radius - pin / 2,
                         spec.force, thickness)
    comp = Component(name=spec.name, load=spec.name, quantity="force", magnitude=float(np.hypot(*spec.force)),
                     operator=model.default_operator, tractions=(), statics=_unsolved, balanced=False,
                     contact=contact)
    d = np.asarray(spec.force) / np.hypot(*spec.force)
    fit = "neat fit" if contact.clearance == 0 else f"radial clearance {contact.clearance:.6g}"
    note = (f"pin load '{spec.name}' on hole '{spec.hole}': force ({spec.force[0]:.6g}, {spec.force[1]:.6g}) "
            f"({keys.angle_text(spec.force)}) through a rigid pin of diameter {pin:.6g} ({fit}), frictionless "
            "contact solved by an active-set iteration")
    return Applied(name=spec.name, kind=KIND, components=(comp,), axis=(float(d[0]), float(d[1])), ends=(),
                   loaded=frozenset(), notes=(note,))
