"""Exact plane-elasticity solutions used to verify fekt (tests and benchmarks).

Kirsch (1898): circular hole of radius a in an infinite plate under remote uniaxial stress S along
x. Cartesian form of the field (derived from the polar form in Sadd, Elasticity, Example 8-7; see
docs/references.md), with q = a^2/r^2 and theta from the x-axis:

    sxx = S [1 - q (3/2 cos2t + cos4t) + 3/2 q^2 cos4t]
    syy = S [  - q (1/2 cos2t - cos4t) - 3/2 q^2 cos4t]
    sxy = S [  - q (1/2 sin2t + sin4t) + 3/2 q^2 sin4t]

Inglis (1913) / Kolosov: elliptical hole, semi-axes a (x) and b (y), remote S at angle alpha from x:
edge hoop stress sigma/S = [1 - m^2 + 2m cos2a - 2cos2(eta - a)] / [1 - 2m cos2eta + m^2],
m = (a-b)/(a+b); peak 1 + 2a/b for alpha = 90 degrees (docs/references.md).
"""

from __future__ import annotations

import numpy as np


def kirsch_stress(x: np.ndarray, y: np.ndarray, a: float = 1.0, S: float = 1.0,
                  x0: float = 0.0, y0: float = 0.0):
    """(sxx, syy, sxy) of the Kirsch field for a hole of radius a centred at (x0, y0)."""
    dx, dy = x - x0, y - y0
    r2 = dx * dx + dy * dy
    q = a * a / r2
    th = np.arctan2(dy, dx)
    c2, c4, s2, s4 = np.cos(2 * th), np.cos(4 * th), np.sin(2 * th), np.sin(4 * th)
    sxx = S * (1 - q * (1.5 * c2 + c4) + 1.5 * q * q * c4)
    syy = S * (-q * (0.5 * c2 - c4) - 1.5 * q * q * c4)
    sxy = S * (-q * (0.5 * s2 + s4) + 1.5 * q * q * s4)
    return sxx, syy, sxy


def kirsch_traction(a: float = 1.0, S: float = 1.0, x0: float = 0.0, y0: float = 0.0):
    """Traction function t(x, n) = sigma_exact . n for :class:`fekt.solver.elasticity.TractionLoad`."""

    def traction(x, n):
        sxx, syy, sxy = kirsch_stress(x[0], x[1], a, S, x0, y0)
        return sxx * n[0] + sxy * n[1], sxy * n[0] + syy * n[1]

    return traction


def inglis_edge_stress(eta: np.ndarray, a: float, b: float, alpha_deg: float = 90.0, S: float = 1.0):
    """Hoop stress on the edge of an elliptical hole at parametric angle eta (x = a cos, y = b sin)."""
    m = (a - b) / (a + b)
    al = np.radians(alpha_deg)
    return S * (1 - m * m + 2 * m * np.cos(2 * al) - 2 * np.cos(2 * (eta - al))) / (
        1 - 2 * m * np.cos(2 * eta) + m * m)


def inglis_kt(a: float, b: float) -> float:
    """Peak edge stress / S for load perpendicular to the a-axis: 1 + 2a/b."""
    return 1.0 + 2.0 * a / b


def kolosov_kappa(nu: float, plane_strain: bool) -> float:
    """Kolosov's constant: (3 - nu)/(1 + nu) in plane stress, 3 - 4 nu in plane strain."""
    return 3 - 4 * nu if plane_strain else (3 - nu) / (1 + nu)


def kirsch_displacement_radial(r, theta, a: float, S: float, E: float, nu: float, plane_strain: bool = False):
    """Radial displacement u_r of the Kirsch field (form as in Barber / Sadd, from memory; its strains
    agree with Hooke's law for the stresses above, docs/references.md). mu = E/(2(1+nu))."""
    mu = E / (2 * (1 + nu))
    kappa = kolosov_kappa(nu, plane_strain)
    return S / (8 * mu * r) * ((kappa - 1) * r ** 2 + 2 * a ** 2
                               + 2 * (r ** 2 + (kappa + 1) * a ** 2 - a ** 4 / r ** 2) * np.cos(2 * theta))


# --- Neuber (1958): deep hyperbolic circumferential groove in a round bar ------------------------------
#
# A round bar necked by a hyperboloid of revolution r^2/a^2 - z^2/(a rho) = 1 (neck radius a, root radius
# rho), infinitely deep (the flanks run to infinity), loaded through the neck. Kt on the neck section:
# sigma_nom = P/(pi a^2) in tension, 4M/(pi a^3) in bending, tau_nom = 2T/(pi a^3) in torsion.
# Tension and bending: H. Neuber, Kerbspannungslehre, 2nd ed. 1958 (Theory of Notch Stresses, English
# translation 1961), deep external hyperbolic notch in a round bar, also quoted in Peterson's Stress
# Concentration Factors; recalled from memory. Checks that do not rely on memory: both give Kt = 1 as
# a/rho -> 0, and as a/rho -> infinity they tend to the crack-tip limits sqrt(a/rho) (tension) and
# (3/4) sqrt(a/rho) (bending) that follow from the stress intensity factors of a deep circumferential
# crack in a round bar, K = sigma_nom sqrt(pi a)/2 and (3/8) sigma_nom sqrt(pi a), with
# sigma_max = 2 K / sqrt(pi rho) (Creager & Paris 1967; Tada, Paris & Irwin, The Stress Analysis of Cracks
# Handbook; from memory). Torsion: derived for fekt (docs/references.md): in oblate spheroidal
# coordinates z + i r = c sinh(xi + i eta), which are conformal, the torsion equation
# d/dxi(r^3 dphi/dxi) + d/deta(r^3 dphi/deta) = 0 has the solution dphi/dxi = C / cosh^3(xi) that leaves
# the hyperboloid eta = eta0 traction-free; the surface shear is largest at the neck and with
# s = sqrt(a/rho + 1) = 1/cos(eta0) the torque integral gives Kts = 3 (1 + s)^2 / (4 (1 + 2 s)) (this
# agrees with the formula recalled from Neuber).


def neuber_deep_groove_tension(a_over_rho: float, nu: float) -> float:
    """Kt of the deep hyperbolic groove in a round bar under tension (Neuber 1958; from memory)."""
    q = float(a_over_rho)
    s = np.sqrt(q + 1.0)
    return float((q * s + (0.5 + nu) * q + (1.0 + nu) * (s + 1.0)) / (q + 2.0 * nu * s + 2.0))


def neuber_deep_groove_bending(a_over_rho: float, nu: float) -> float:
    """Kt of the deep hyperbolic groove in a round bar under bending (Neuber 1958; from memory)."""
    q = float(a_over_rho)
    s = np.sqrt(q + 1.0)
    n = 3.0 * (q + 1.0) + (1.0 + 4.0 * nu) * s + (1.0 + nu) / (1.0 + s)
    return float(3.0 / (4.0 * n) * (1.0 + s) * (3.0 * q - (1.0 - 2.0 * nu) * s + 4.0 + nu))


def neuber_deep_groove_torsion(a_over_rho: float) -> float:
    """Kts of the deep hyperbolic groove in a round bar under torsion (derived above; independent of nu)."""
    s = np.sqrt(float(a_over_rho) + 1.0)
    return float(3.0 * (1.0 + s) ** 2 / (4.0 * (1.0 + 2.0 * s)))
