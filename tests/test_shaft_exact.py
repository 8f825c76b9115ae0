"""The three shaft operators reproduce the Saint-Venant solutions of a uniform round bar to solver precision.

Sources (any elasticity text, e.g. S. P. Timoshenko & J. N. Goodier, Theory of Elasticity, 3rd ed. 1970,
chapters on the extension, torsion and pure bending of prismatic bars; the bending displacement field as
in the verification notes G3):

* tension F: sigma_zz = F / A, all other stresses 0; u_z = F z / (E A) + const, u_r = -nu F r / (E A);
* torsion T: tau_z-theta = T r / J, J = pi R^4 / 2; u_theta = r phi with phi = T z / (G J) + const;
* pure bending M (sigma_zz = M y / I, I = pi R^4 / 4): with kappa = M / (E I) the harmonic-1 amplitudes
  are U_r = -kappa (z^2 + nu r^2) / 2, U_theta = kappa (z^2 - nu r^2) / 2, U_z = kappa r z, up to the two
  rigid modes of the harmonic; hence S = U_r + U_theta = -nu kappa r^2 and D = U_r - U_theta = -kappa z^2
  on the axis, plus a rigid part linear in z.

The exact fields are quadratic at most, so P2 elements contain them: errors are round-off. Stresses alone
cannot reveal a wrong Lame parameter (they are statically determinate here), so displacements are checked
too (notes D1).
"""

from __future__ import annotations

import math

import numpy as np
import pytest

from fekt.case.loader import parse_case
from fekt.models.axisymmetric import AXISYMMETRIC as SHAFT
from fekt.post.fields import corner_stress, probe_displacement, probe_stress
from fekt.registry import CATALOGUE
from fekt.solver.linear import reaction_ratio
from shaft_helpers import solve_case

R, LENGTH, E, NU = 10.0, 100.0, 210000.0, 0.3
F, M, T = 1000.0, 2.0e4, 3.0e4
A, I, J = math.pi * R ** 2, math.pi * R ** 4 / 4, math.pi * R ** 4 / 2
G = E / (2 * (1 + NU))

CASE = f"""
[part]
model = "axisymmetric"
outline = [{{ x = 0, y = 0, edge = "axis" }}, {{ x = {LENGTH}, y = 0, edge = "right" }},
           {{ x = {LENGTH}, y = {R}, edge = "surface" }}, {{ x = 0, y = {R}, edge = "left" }}]
[material]
E = {E}
nu = {NU}
[load]
ends = ["left", "right"]
force = {F}
moment = {M}
torque = {T}
[mesh]
size = 3
"""


@pytest.fixture(scope="module")
def bar():
    return solve_case(parse_case(CASE, CATALOGUE))


def _scale(v):
    return max(abs(float(v)), 1.0)


def test_reactions_vanish(bar):
    assert reaction_ratio(bar.solution) < 1e-10


def test_tension_stress_and_displacement(bar):
    s = bar.samples.components["force"]
    sig = F / A
    assert np.max(np.abs(s.xx - sig)) < 1e-9 * sig
    for c in (s.yy, s.hh, s.xy, s.xh, s.yh):
        assert np.max(np.abs(c)) < 1e-9 * sig
    pts = np.array([[20.0, 20.0, 70.0], [0.0, R, 5.0]])
    u = probe_displacement(bar.solution, pts, "force")
    assert u[1, 1] == pytest.approx(-NU * sig * R / E, rel=1e-9)  # u_r at the surface
    assert u[1, 0] == pytest.approx(0.0, abs=1e-12)  # u_r = 0 on the axis
    assert u[0, 2] - u[0, 0] == pytest.approx(sig * 50.0 / E, rel=1e-9)  # axial stretch over 50


def test_torsion_stress_and_twist(bar):
    s = bar.samples.components["torque"]
    r = bar.samples.xy[1]
    assert np.max(np.abs(s.xh - T * r / J)) < 1e-9 * T * R / J
    for c in (s.xx, s.yy, s.hh, s.xy, s.yh):
        assert np.max(np.abs(c)) < 1e-9 * T * R / J
    phi = probe_displacement(bar.solution, np.array([[20.0, 70.0], [5.0, 5.0]]), "torque")
    assert phi[1] - phi[0] == pytest.approx(T * 50.0 / (G * J), rel=1e-9)  # twist rate T / (G J)


def test_bending_stress_and_displacement(bar):
    s = bar.samples.components["moment"]
    r = bar.samples.xy[1]
    assert s.harmonic == 1
    assert np.max(np.abs(s.xx - M * r / I)) < 1e-9 * M * R / I
    for c in (s.yy, s.hh, s.xy, s.xh, s.yh):
        assert np.max(np.abs(c)) < 1e-9 * M * R / I
    kappa = M / (E * I)
    z = np.linspace(10.0, 90.0, 5)
    U = probe_displacement(bar.solution, np.vstack([z, np.zeros_like(z)]), "moment")  # on the axis
    assert np.max(np.abs(U[0])) < 1e-12 and np.max(np.abs(U[1])) < 1e-12  # axis conditions U_z = S = 0
    quad = np.polyfit(z, U[2], 2)  # D = -kappa z^2 + rigid part linear in z
    assert quad[0] == pytest.approx(-kappa, rel=1e-8)
    Us = probe_displacement(bar.solution, np.array([[50.0], [R]]), "moment")
    assert Us[1, 0] == pytest.approx(-NU * kappa * R ** 2, rel=1e-8)  # S = -nu kappa r^2 (no rigid part)


def test_axis_points_use_the_limit(bar):
    """Stress at element corners on the axis: the limit of u_r / r, never 0/0 (notes G1)."""
    for name, sig in (("force", F / A), ("moment", 0.0), ("torque", 0.0)):
        st = corner_stress(bar.solution, bar.pmesh, {name: 1.0})
        for c in st.components():
            assert np.all(np.isfinite(c))
        if name == "force":
            assert np.max(np.abs(st.hh)) < 1e-9 * sig and np.max(np.abs(st.xx - sig)) < 1e-9 * sig


@pytest.mark.parametrize("name,expected", [("force", dict(N=F)), ("moment", dict(M=M)), ("torque", dict(T=T))])
def test_cut_resultants(bar, name, expected):
    """The FE stress of each component integrated over a cut gives its resultant (N, M or T)."""
    g, w = np.polynomial.legendre.leggauss(40)
    y = 0.5 * R * (g + 1)
    pts = np.vstack([np.full_like(y, 37.0), y])
    st = probe_stress(bar.solution, pts, {name: 1.0})
    res = SHAFT.cut_resultants(st, np.array([1.0, 0.0]), y, 0.5 * R * w, 0.0, 1.0)
    for key, value in expected.items():
        assert getattr(res, key) == pytest.approx(value, rel=1e-9)
    for key in {"N", "M", "T"} - set(expected):
        assert abs(getattr(res, key)) < 1e-9 * _scale(list(expected.values())[0])


def test_section_and_nominal_stresses():
    """Disc and annulus properties; 4F/(pi d^2), 32M/(pi d^3), 16T/(pi d^3) on the surface (notes, section 0)."""
    d = 2 * R
    p = SHAFT.section(np.array([[0.0, R]]), 1.0)
    assert (p.area, p.yc, p.inertia, p.polar) == pytest.approx((A, 0.0, I, J))
    from fekt.models.base import Resultants

    assert SHAFT.nominal(Resultants(N=F), p, R) == pytest.approx(4 * F / (math.pi * d ** 2))
    assert SHAFT.nominal(Resultants(M=M), p, R) == pytest.approx(32 * M / (math.pi * d ** 3))
    assert SHAFT.nominal(Resultants(M=M), p, -R) == pytest.approx(32 * M / (math.pi * d ** 3))  # load axis -x
    assert SHAFT.shear_nominal(Resultants(T=T), p, R) == pytest.approx(16 * T / (math.pi * d ** 3))
    ring = SHAFT.section(np.array([[-R, -4.0]]), 1.0)  # an annulus given in y' = -r
    assert ring.area == pytest.approx(math.pi * (R ** 2 - 16.0))
    assert ring.polar == pytest.approx(math.pi * (R ** 4 - 4.0 ** 4) / 2)
