"""The load-type seam: what every load type supplies to the rest of fekt.

A load type is one module of this package, registered in :data:`fekt.loads.REGISTRY`. It supplies:

* ``KIND`` (the name a case file uses) and ``KEYS`` (the keys of its table in the case file);
* ``parse(table, ctx, item)``: the values of its table, checked, as a frozen record (the case layer calls
  it while reading the file, so every mistake is reported before any work starts);
* ``apply(spec, part, model, thickness)``: an :class:`Applied` load on the built geometry: its
  **components** (each one right-hand side on the model's factorised stiffness: its boundary tractions
  and the section resultants it causes, from statics of the applied loads), the load axis that net
  sections are cut across, the loaded boundaries (no peaks are sought there) and notes for the report.

Boundaries are referred to by name (an outline edge's name, a cut-out's name); the mesh carries the
name -> facets map.
"""

from __future__ import annotations

from collections.abc import Callable
from dataclasses import dataclass

import numpy as np

from ..models.base import Resultants, Section


@dataclass(frozen=True)
class Traction:
    """A traction ``fn(x, n)`` on the named boundary; components as the component's operator names them
    (the plane model: (t_x, t_y)); x are points (2, ...), n the outward unit normals there."""

    boundary: str
    fn: Callable[[np.ndarray, np.ndarray], tuple]


@dataclass(frozen=True)
class Component:
    """One load component: one right-hand side solved on the operator's factorised stiffness.

    ``quantity`` says what the magnitude is (``force``, ``moment``, ...), for reports and chart checks;
    ``statics(section)`` gives the resultants this component causes on a cut (free body on the side of the
    first loaded end; docs/conventions.md)."""

    name: str
    load: str
    quantity: str
    magnitude: float
    operator: str
    tractions: tuple[Traction, ...]
    statics: Callable[[Section], Resultants]


@dataclass(frozen=True)
class LoadedEnd:
    """An end edge that carries an end load: its section and the moment it carries about its centroid."""

    name: str
    boundary: str
    section: Section
    moment: float


@dataclass(frozen=True)
class Applied:
    """A load on the built part (see the module docstring)."""

    name: str
    kind: str
    components: tuple[Component, ...]
    axis: tuple[float, float]
    ends: tuple[LoadedEnd, ...]
    loaded: frozenset[str]
    notes: tuple[str, ...] = ()

    def resultants(self, section: Section) -> Resultants:
        """Resultants of the whole load on a cut (the sum of its components)."""
        total = Resultants()
        for c in self.components:
            total = total + c.statics(section)
        return total
