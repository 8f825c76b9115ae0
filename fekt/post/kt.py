"""Net section, nominal stress by beam theory, Kt, and the equilibrium check on each net section.

Conventions (documented in docs/conventions.md):
* net section: the shortest cut normal to the load axis through the feature that owns the hot spot
  (geometry.sections.net_section); for a hot spot with no feature, the cut through the hot spot;
* resultants on a cut from statics of the applied loads (solver.loads.LoadState.resultants);
* sigma_nom = N / A + M (y - yc) / I, with y the hot spot's transverse coordinate clamped to the
  section's extent (so a fillet or notch-root hot spot uses the outer fibre of the net section);
* Kt_net = sigma_peak / sigma_nom(net); Kt_gross likewise on the gross section, which is the larger
  of the two loaded end sections, carried to the hot spot's position.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from ..errors import SolveError
from ..geometry.sections import Section, transverse
from ..solver.elasticity import ElasticSolution
from ..solver.loads import LoadState
from .fields import probe_stress

#: relative tolerance of the equilibrium check on each net section (issue requirement: 0.5 %)
EQUILIBRIUM_TOLERANCE = 0.005


@dataclass(frozen=True)
class Nominal:
    section: Section
    N: float
    M: float
    y: float  # transverse coordinate where sigma_nom is evaluated
    sigma: float


def nominal_stress(section: Section, loads: LoadState, y_hot: float) -> Nominal:
    N, M = loads.resultants(section)
    lo = min(a for a, _ in section.intervals)
    hi = max(b for _, b in section.intervals)
    y = float(np.clip(y_hot, lo, hi))
    sigma = N / section.area + (M * (y - section.yc) / section.inertia if section.inertia > 0 else 0.0)
    return Nominal(section, N, M, y, sigma)


def kt(peak: float, nominal: Nominal) -> float | None:
    """Kt = peak / nominal, or None when the nominal stress vanishes (e.g. hot spot on the neutral axis)."""
    sec = nominal.section
    half = 0.5 * sec.width
    scale = abs(nominal.N) / sec.area + (abs(nominal.M) * half / sec.inertia if sec.inertia > 0 else 0.0)
    if scale == 0 or abs(nominal.sigma) < 1e-6 * scale:
        return None
    return peak / nominal.sigma


def gross_section(loads: LoadState) -> tuple[str, Section]:
    e1, e2 = loads.ends
    return (e1.name, e1.section) if e1.section.area >= e2.section.area else (e2.name, e2.section)


@dataclass(frozen=True)
class EquilibriumCheck:
    N_fe: float
    M_fe: float
    N: float
    M: float
    error_N: float  # relative to the section's force scale
    error_M: float

    @property
    def ok(self) -> bool:
        return max(self.error_N, self.error_M) <= EQUILIBRIUM_TOLERANCE


def section_resultants_fe(sol: ElasticSolution, section: Section, axis: np.ndarray,
                          n_sub: int = 96, n_gauss: int = 4) -> tuple[float, float]:
    """(N, M) from integrating the FE axial stress over the cut (Gauss-Legendre on sub-intervals)."""
    e = transverse(axis)
    g, w = np.polynomial.legendre.leggauss(n_gauss)
    ys, ws = [], []
    for a, b in section.intervals:
        edges = np.linspace(a, b, n_sub + 1)
        mid = 0.5 * (edges[:-1] + edges[1:])
        half = 0.5 * (edges[1:] - edges[:-1])
        ys.append((mid[:, None] + half[:, None] * g[None, :]).ravel())
        ws.append((half[:, None] * w[None, :]).ravel())
    y = np.concatenate(ys)
    wt = np.concatenate(ws)
    pts = section.s * axis[:, None] + y[None, :] * e[:, None]
    sxx, syy, sxy = probe_stress(sol, pts)
    saa = sxx * axis[0] ** 2 + 2 * sxy * axis[0] * axis[1] + syy * axis[1] ** 2
    h = section.thickness
    return float(h * np.sum(wt * saa)), float(h * np.sum(wt * saa * (y - section.yc)))


def check_equilibrium(sol: ElasticSolution, section: Section, loads: LoadState) -> EquilibriumCheck:
    axis = np.array(loads.axis)
    N, M = loads.resultants(section)
    N_fe, M_fe = section_resultants_fe(sol, section, axis)
    c = 0.5 * section.width
    # scales: the larger of the axial and the bending contributions, as force and as moment
    f_scale = max(abs(N), abs(M) * c / section.inertia * section.area if section.inertia else 0.0, 1e-300)
    m_scale = max(abs(M), abs(N) * section.inertia / (c * section.area) if section.area else 0.0, 1e-300)
    return EquilibriumCheck(N_fe, M_fe, N, M, abs(N_fe - N) / f_scale, abs(M_fe - M) / m_scale)


def require_equilibrium(check: EquilibriumCheck, where: str) -> None:
    if not check.ok:
        raise SolveError(
            f"equilibrium check failed on the net section of {where}: FE gives N = {check.N_fe:.6g}, "
            f"M = {check.M_fe:.6g}; statics give N = {check.N:.6g}, M = {check.M:.6g} "
            f"(errors {check.error_N:.2%}, {check.error_M:.2%}; limit {EQUILIBRIUM_TOLERANCE:.1%}); "
            "the mesh is too coarse on this section or the loads are not what they should be")
