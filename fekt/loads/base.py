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

Statics (docs/conventions.md, "Section resultants"): a cut at axial position s splits the part into the
side behind it (points with x . a < s, ``side = -1``) and the side in front (``side = +1``). A
component's ``statics(section, side)`` gives the resultants on the cut from the loads of that component
on that side alone. For a component that is self-equilibrated both sides give the same resultants; for
one that is held by supports, the side without supports must be used (the pipeline chooses it).

Supports (a fixed edge or hole, a symmetry plane) are records of the same seam: ``parse`` and ``apply``
like a load type, registered in :data:`fekt.loads.SUPPORTS`; ``apply`` gives an :class:`AppliedSupport`
(the restrained boundaries and the displacement directions held).
"""

from __future__ import annotations

from collections.abc import Callable
from dataclasses import dataclass
from typing import Any

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
    ``statics(section, side)`` gives the resultants this component causes on a cut from its loads on one
    side (-1 behind the cut, +1 in front; see the module docstring). ``balanced``: the component is
    self-equilibrated on its own (needs no support). ``contact``: solved by the contact iteration of its
    load case (:mod:`fekt.solver.contact`) instead of as a right-hand side."""

    name: str
    load: str
    quantity: str
    magnitude: float
    operator: str
    tractions: tuple[Traction, ...]
    statics: Callable[..., Resultants]
    balanced: bool = True
    contact: Any = None


@dataclass(frozen=True)
class LoadedEnd:
    """An end edge that carries an end load: its section and the moment it carries about its centroid."""

    name: str
    boundary: str
    section: Section
    moment: float


@dataclass(frozen=True)
class Introduction:
    """Where a load or support enters the part: peaks there are load-introduction peaks (kept apart from
    notch peaks). ``near(xy)`` is True for boundary points (2, n) inside the region."""

    boundary: str
    reason: str
    near: Callable[[np.ndarray], np.ndarray]
    load: str = ""  # the load it belongs to ('' for a support: present in every load case)


@dataclass(frozen=True)
class AppliedSupport:
    """A support on the built part: the named boundaries it holds and how (``"fixed"``: both displacement
    components zero; ``"normal"``: the displacement along the boundary's normal zero, a symmetry plane),
    the extent of those boundaries along any axis (for statics: which side of a cut they are on) and
    notes for the report."""

    name: str
    kind: str
    boundaries: tuple[str, ...]
    hold: str
    normal: tuple[float, float] | None
    points: np.ndarray  # points along the held boundaries (2, n), for their extent along an axis
    introductions: tuple[Introduction, ...] = ()
    notes: tuple[str, ...] = ()

    def extent(self, axis: np.ndarray) -> tuple[float, float]:
        s = np.asarray(axis) @ self.points
        return float(s.min()), float(s.max())


@dataclass(frozen=True)
class Applied:
    """A load on the built part (see the module docstring); also the whole set of loads and supports of a
    case once combined (:func:`fekt.loads.combine`)."""

    name: str
    kind: str
    components: tuple[Component, ...]
    axis: tuple[float, float]
    ends: tuple[LoadedEnd, ...]
    loaded: frozenset[str]
    notes: tuple[str, ...] = ()
    introductions: tuple[Introduction, ...] = ()
    supports: tuple[AppliedSupport, ...] = ()
    #: a reference stress the peaks are compared with instead of a net section (a remote stress on an
    #: effectively infinite plate): (value, words); None: net sections from statics
    reference: tuple[float, str] | None = None

    def resultants(self, section: Section, side: int = -1) -> Resultants:
        """Resultants of the whole load on a cut (the sum of its components)."""
        total = Resultants()
        for c in self.components:
            total = total + c.statics(section, side)
        return total
