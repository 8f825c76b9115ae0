"""The analysis-model seam: what every model supplies to the rest of fekt.

A model (plane stress, plane strain, and later axisymmetric shafts) is one module of this package with
one record built from these pieces and registered in :data:`fekt.models.REGISTRY`. It supplies:

* its **operators**: the linear problems it solves on the part's 2D mesh (the plane model has one; a
  shaft has one each for axial load, bending and torsion). Each operator gives its finite element, its
  stiffness (the weak form), the load vector of a boundary traction, the degrees of freedom that remove
  its rigid-body motions, and the stress tensor from the solved field;
* **section properties** of a cut through the part (area, centroid, second and polar moments);
* the **nominal stress** of a set of section resultants at a point of a section;
* its **labels** for reports.

Frames and signs. The mesh lives in the (x, y) plane. A stress state is the full 3x3 tensor in the
frame (x, y, h), where h is the direction out of the mesh plane (the thickness direction of a plate,
the hoop direction of a shaft). Tension is positive. A field of circumferential harmonic 1 (bending of
a shaft) stores amplitudes: the xx, yy, hh, xy components vary as cos(theta) and xh, yh as sin(theta).
"""

from __future__ import annotations

from collections.abc import Callable, Mapping
from dataclasses import dataclass
from typing import Any, Protocol

import numpy as np


@dataclass(frozen=True)
class Stress:
    """Stress tensor components at points (arrays of one shape); see the module docstring."""

    xx: np.ndarray
    yy: np.ndarray
    hh: np.ndarray
    xy: np.ndarray
    xh: np.ndarray
    yh: np.ndarray
    harmonic: int = 0

    def scaled(self, factor: float) -> "Stress":
        return Stress(*(factor * c for c in self.components()), harmonic=self.harmonic)

    def components(self) -> tuple[np.ndarray, ...]:
        return self.xx, self.yy, self.hh, self.xy, self.xh, self.yh

    def take(self, index) -> "Stress":
        """The same stresses at a subset or reordering of the points (numpy indexing of every component)."""
        return Stress(*(c[index] for c in self.components()), harmonic=self.harmonic)

    def flat(self) -> "Stress":
        return Stress(*(np.asarray(c).reshape(-1) for c in self.components()), harmonic=self.harmonic)


def add_stresses(parts: list[tuple[float, Stress]]) -> Stress:
    """Weighted sum of stresses of one harmonic (a load case of several components)."""
    harmonics = {s.harmonic for _, s in parts}
    if len(harmonics) != 1:
        raise ValueError("stresses of different circumferential harmonics are combined at an angle, not summed")
    comps = [sum(f * c for f, c in zip([w for w, _ in parts], cs)) for cs in zip(*(s.components() for _, s in parts))]
    return Stress(*comps, harmonic=harmonics.pop())


def in_plane_principal(xx: np.ndarray, yy: np.ndarray, xy: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
    """Largest and smallest principal stress of the in-plane part of a stress state.

    Written with hypot so that stresses of any magnitude neither underflow nor overflow when squared."""
    c = 0.5 * (xx + yy)
    r = np.hypot(0.5 * (xx - yy), xy)
    return c + r, c - r


@dataclass(frozen=True)
class SectionProps:
    """Properties of a cut through the part that nominal stresses need.

    ``yc`` is the centroid's transverse coordinate, ``inertia`` the second moment about the centroidal
    axis (bending), ``polar`` the polar moment (torsion; 0 where the model carries no torque)."""

    area: float
    yc: float
    inertia: float
    polar: float = 0.0


@dataclass(frozen=True)
class Resultants:
    """Section resultants from statics: axial force N, transverse shear V, bending moment M about the
    section's centroid, torque T (sign conventions in docs/conventions.md)."""

    N: float = 0.0
    V: float = 0.0
    M: float = 0.0
    T: float = 0.0

    def __add__(self, other: "Resultants") -> "Resultants":
        return Resultants(self.N + other.N, self.V + other.V, self.M + other.M, self.T + other.T)

    def scaled(self, f: float) -> "Resultants":
        return Resultants(f * self.N, f * self.V, f * self.M, f * self.T)


class Operator(Protocol):
    """One linear problem of a model on the part's mesh (one stiffness matrix, one factorisation)."""

    name: str
    harmonic: int
    intorder: int  # quadrature order of the stiffness

    def element(self, mesh: Any) -> Any:
        """The scikit-fem element for this mesh (quadratic on curved quadratic meshes)."""

    def stiffness(self, basis: Any, E: float, nu: float) -> Any:
        """The assembled stiffness matrix."""

    def load_vector(self, facet_basis: Any, traction: Callable[[np.ndarray, np.ndarray], tuple]) -> np.ndarray:
        """The load vector of a boundary traction ``traction(x, n)`` (components as the operator names them)."""

    def fixed_dofs(self, basis: Any) -> np.ndarray:
        """Degrees of freedom held at zero in every solve (e.g. conditions on a shaft's axis)."""

    def rigid_restraints(self, basis: Any) -> np.ndarray:
        """Degrees of freedom whose restraint removes exactly the rigid-body motions left."""

    def stress(self, field: Any, x: np.ndarray, E: float, nu: float) -> Stress:
        """Stress from a solved field interpolated at points (scikit-fem DiscreteField) with coordinates x."""


@dataclass(frozen=True)
class Model:
    """An analysis model: operators, section properties, nominal stress and labels."""

    name: str
    label: str
    operators: Mapping[str, Operator]
    default_operator: str
    needs_thickness: bool
    section: Callable[[np.ndarray, float], SectionProps]
    nominal: Callable[[Resultants, SectionProps, float], float]
    #: resultants of an FE stress along a cut, for the equilibrium check:
    #: (stress, axis, y, quadrature weights in y, section centroid yc, thickness) -> Resultants
    cut_resultants: Callable[[Stress, np.ndarray, np.ndarray, np.ndarray, float, float], Resultants]
    coordinates: tuple[str, str] = ("x", "y")
    default_load: str = "ends"
    element_label: str = "6-node curved triangle (P2)"
    #: whether a case file may give a thickness (a plate has one; a solid of revolution has none)
    has_thickness: bool = True
    #: nominal shear stress of resultants at a point of a section, (resultants, props, y) -> tau; None
    #: where the model carries no torque (plane models)
    shear_nominal: Callable[[Resultants, SectionProps, float], float] | None = None
    #: model-specific rules for the case's part description (a PartSpec; e.g. a shaft's outline must lie
    #: above its axis), raising GeometryError; called before the part is built; None where the model
    #: takes any valid planar part
    check_part: Callable[[Any], None] | None = None

    def operator(self, name: str | None = None) -> Operator:
        return self.operators[name or self.default_operator]

    def validate(self, part: Any) -> None:
        """Apply the model's own rules to a part description (:attr:`check_part`); nothing when it has none."""
        if self.check_part is not None:
            self.check_part(part)


@dataclass(frozen=True)
class Section:
    """A cut through the part with the model's section properties; ``centroid`` is the point (x, y) on
    the cut line at the centroid's transverse coordinate ``yc``."""

    s: float
    intervals: tuple[tuple[float, float], ...]
    width: float
    area: float
    yc: float
    inertia: float
    polar: float
    centroid: tuple[float, float]

    @property
    def props(self) -> SectionProps:
        return SectionProps(self.area, self.yc, self.inertia, self.polar)

    def at(self, s: float) -> "Section":
        """The same section carried to another axial position (the gross section at a peak)."""
        from dataclasses import replace

        return replace(self, s=s)


def section_of(model: Model, cut: Any, axis: np.ndarray, thickness: float) -> Section:
    """The model's section of a geometric cut (:class:`fekt.geometry.sections.Cut`)."""
    if cut.width <= 0:
        return Section(cut.s, (), 0.0, 0.0, 0.0, 0.0, 0.0, (float("nan"), float("nan")))
    p = model.section(np.array(cut.intervals, dtype=float), thickness)
    e = np.array([-axis[1], axis[0]])
    c = cut.s * np.asarray(axis) + p.yc * e
    return Section(cut.s, cut.intervals, cut.width, p.area, p.yc, p.inertia, p.polar, (float(c[0]), float(c[1])))
