"""Nominal stress on a section, Kt, and the equilibrium check on each net section.

Conventions (docs/conventions.md):
* net section: the shortest cut normal to the load axis through the feature that owns the peak
  (geometry.sections.net_section); for a peak with no feature, the cut through the peak;
* resultants on a cut from statics of the applied loads (each load component's ``statics``);
* the nominal stress is the model's formula (beam theory for plates: sigma_nom = N / A + M (y - yc) / I),
  with y the peak's transverse coordinate moved to the nearest material of the section (so a fillet or
  notch-root peak uses the outer fibre of the net section, a hole's peak the hole's edge);
* Kt_net = sigma_peak / sigma_nom(net); Kt_gross likewise on the gross section (the same cut without the
  feature: geometry.sections.gross_cut), under the same force system reduced to its own centroid.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

from ..errors import SolveError
from ..geometry.sections import transverse
from ..models.base import Model, Resultants, Section
from ..solver.linear import Solution
from .fields import probe_components

#: relative tolerance of the equilibrium check on each net section (our own requirement: 0.5 %)
EQUILIBRIUM_TOLERANCE = 0.005
#: a nominal stress below this fraction of the section's stress scale counts as zero (no Kt there;
#: our own threshold: a peak on the neutral axis of a bent section)
NOMINAL_ZERO = 1e-6
#: Gauss-Legendre integration of the FE stress over a cut: sub-intervals per material interval and
#: points per sub-interval (our own choice: the equilibrium errors it reports do not change when doubled)
CUT_SUBINTERVALS = 96
CUT_GAUSS_POINTS = 4


@dataclass(frozen=True)
class Nominal:
    section: Section
    resultants: Resultants
    y: float  # transverse coordinate where sigma_nom is evaluated
    sigma: float

    @property
    def N(self) -> float:
        return self.resultants.N

    @property
    def M(self) -> float:
        return self.resultants.M


def nominal_height(section: Section, y_peak: float) -> float:
    """Where on a section the nominal stress of a peak is evaluated: the peak's transverse coordinate, moved
    to the nearest point of material when it falls in a gap of the section (a peak on a hole's edge is
    evaluated at the hole's edge, never inside the hole; docs/conventions.md)."""
    best, dist = y_peak, math.inf
    for lo, hi in section.intervals:
        y = min(max(y_peak, lo), hi)
        if abs(y - y_peak) < dist:
            best, dist = y, abs(y - y_peak)
    return float(best)


def nominal_stress(model: Model, section: Section, resultants: Resultants, y_peak: float) -> Nominal:
    y = nominal_height(section, y_peak)
    return Nominal(section, resultants, y, model.nominal(resultants, section.props, y))


def outer_fibre(section: Section) -> float:
    """Largest distance of the section's material from its centroid (the c of M c / I)."""
    return max((max(abs(lo - section.yc), abs(hi - section.yc)) for lo, hi in section.intervals), default=0.0)


def stress_scales(section: Section, res: Resultants) -> tuple[float, float, float]:
    """The nominal stresses each resultant alone gives at the outer fibre: |N|/A, |M| c/I, |T| c/J."""
    c = outer_fibre(section)
    return (abs(res.N) / section.area if section.area > 0 else 0.0,
            abs(res.M) * c / section.inertia if section.inertia > 0 else 0.0,
            abs(res.T) * c / section.polar if section.polar > 0 else 0.0)


def kt(peak: float, nominal: Nominal) -> float | None:
    """Kt = peak / nominal, or None when the nominal stress vanishes (e.g. a peak on the neutral axis)."""
    scale = sum(stress_scales(nominal.section, nominal.resultants))
    if scale == 0 or abs(nominal.sigma) < NOMINAL_ZERO * scale:
        return None
    return peak / nominal.sigma


@dataclass(frozen=True)
class EquilibriumCheck:
    fe: Resultants
    statics: Resultants
    error_N: float  # each as the nominal stress it would cause, relative to the largest nominal stress
    error_M: float
    error_T: float = 0.0

    @property
    def ok(self) -> bool:
        return self.error <= EQUILIBRIUM_TOLERANCE

    @property
    def error(self) -> float:
        return max(self.error_N, self.error_M, self.error_T)


def cut_points(section: Section, axis: np.ndarray) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    """Gauss-Legendre points (2, n) over the cut's material intervals, their transverse coordinates and weights."""
    e = transverse(axis)
    g, w = np.polynomial.legendre.leggauss(CUT_GAUSS_POINTS)
    ys, ws = [], []
    for a, b in section.intervals:
        edges = np.linspace(a, b, CUT_SUBINTERVALS + 1)
        mid = 0.5 * (edges[:-1] + edges[1:])
        half = 0.5 * (edges[1:] - edges[:-1])
        ys.append((mid[:, None] + half[:, None] * g[None, :]).ravel())
        ws.append((half[:, None] * w[None, :]).ravel())
    y = np.concatenate(ys)
    return section.s * axis[:, None] + y[None, :] * e[:, None], y, np.concatenate(ws)


def check_equilibrium(sol: Solution, section: Section, components, thickness: float,
                      side: int = -1, moment: bool = True) -> EquilibriumCheck:
    """Each load component's FE section forces on the cut against its statics (from the loads on ``side``
    of the cut); the worst error of them. ``moment=False``: the axial force and torque only (a section
    of a half model, whose moment the statics of the applied loads cannot give)."""
    axis = np.array(section.axis)
    pts, y, wt = cut_points(section, axis)
    stresses = probe_components(sol, pts)
    worst = None
    total_fe, total_st = Resultants(), Resultants()
    for comp in components:
        st = comp.statics(section, side)
        fe = sol.model.cut_resultants(stresses[comp.name], axis, y, wt, section.yc, thickness)
        total_fe, total_st = total_fe + fe, total_st + st
        # each resultant's miss as the nominal stress it would cause, over the component's largest one
        scale = max(max(stress_scales(section, st)), 1e-300)
        diff = Resultants(fe.N - st.N, fe.V - st.V, (fe.M - st.M) if moment else 0.0, fe.T - st.T)
        errs = tuple(d / scale for d in stress_scales(section, diff))
        if worst is None or max(errs) > max(worst):
            worst = errs
    worst = worst or (0.0, 0.0, 0.0)
    return EquilibriumCheck(total_fe, total_st, *worst)


def require_equilibrium(check: EquilibriumCheck, where: str) -> None:
    if not check.ok:
        raise SolveError(
            f"equilibrium check failed on the net section of {where}: FE gives N = {check.fe.N:.6g}, "
            f"M = {check.fe.M:.6g}, T = {check.fe.T:.6g}; statics give N = {check.statics.N:.6g}, "
            f"M = {check.statics.M:.6g}, T = {check.statics.T:.6g} (errors {check.error_N:.2%}, "
            f"{check.error_M:.2%}, {check.error_T:.2%}; limit {EQUILIBRIUM_TOLERANCE:.1%}); "
            "the mesh is too coarse on this section or the loads are not what they should be")
