"""Notched round bars against exact solutions: Neuber's deep hyperbolic groove, the shallow groove in torsion,
and the dependence on Poisson's ratio.

Neuber's deep hyperbolic groove (H. Neuber, Kerbspannungslehre 2nd ed. 1958 / Theory of Notch Stresses):
a bar necked by the hyperboloid r^2/a^2 - z^2/(a rho) = 1. Kt on the neck section (P/(pi a^2),
4M/(pi a^3), 2T/(pi a^3)) from fekt.exact: the tension and bending formulas are recalled from memory,
the torsion formula is derived there (oblate spheroidal coordinates). The exact body is infinitely deep;
the FE model cuts it off where the radius is 40a and loads the end faces with the Saint-Venant tractions
(FE check: halving the cut-off radius changes tension Kt by -0.2 %, bending and torsion by < 0.02 %).
Poisson's ratio: 0.3, and 0 to show that axisymmetric Kt depends on it while torsion does not.

Shallow semicircular groove in torsion: the antiplane solution for a semicircular notch in a half-space
gives Kts = 2 (verification notes 2.7: Kts = 1 + sqrt(t/r) for an elliptical groove, exactly 2 for
t = r), on the unnotched surface shear 16T/(pi D^3).
"""

from __future__ import annotations

import numpy as np
import pytest

from fekt.case.schema import Material, MeshSpec, PartSpec
from fekt.exact import neuber_deep_groove_bending, neuber_deep_groove_tension, neuber_deep_groove_torsion
from fekt.families import expand_family
from fekt.loads.shaft_ends import ShaftEndsSpec
from shaft_helpers import component_peak, hyperbolic_neck, nominal_net, solve_part

A_NECK = 5.0
Q = 4.0  # a / rho
LOAD = ShaftEndsSpec(("left", "right"), force=1000.0, moment=1.0e4, torque=1.0e4)


def neck_kts(nu: float) -> dict[str, float]:
    spec, _ = hyperbolic_neck(A_NECK, A_NECK / Q, 40 * A_NECK)
    s = solve_part(spec, LOAD, Material(nu=nu), MeshSpec(elements_per_radius=24))
    near = np.abs(s.samples.xy[0]) < 2 * A_NECK
    out = {}
    for name, mag in (("force", 1000.0), ("moment", 1.0e4), ("torque", 1.0e4)):
        peak, k = component_peak(s, name, near)
        assert abs(s.samples.xy[0, k]) < 0.1 * A_NECK / Q  # at the neck
        out[name] = peak / nominal_net(name, mag, 2 * A_NECK)
    return out


@pytest.fixture(scope="module")
def neck():
    return {nu: neck_kts(nu) for nu in (0.3, 0.0)}


@pytest.mark.parametrize("nu", [0.3, 0.0])
def test_deep_hyperbolic_groove_against_neuber(neck, nu):
    kt = neck[nu]
    # Neuber 1958 (tension and bending from memory; FE at this mesh: within 0.1 %, at 48 elements per
    # radius within 0.05 %); torsion derived in fekt.exact
    assert kt["force"] == pytest.approx(neuber_deep_groove_tension(Q, nu), rel=0.003)
    assert kt["moment"] == pytest.approx(neuber_deep_groove_bending(Q, nu), rel=0.003)
    assert kt["torque"] == pytest.approx(neuber_deep_groove_torsion(Q), rel=0.001)


def test_axisymmetric_kt_depends_on_nu_torsion_does_not(neck):
    """Tension and bending Kt change with nu (Neuber: 2.363 -> 2.227 in tension for nu 0 -> 0.3 at
    a/rho = 4); torsion stresses come from a scalar problem whose only constant, G, cancels."""
    for name, exact in (("force", neuber_deep_groove_tension), ("moment", neuber_deep_groove_bending)):
        fe_change = neck[0.3][name] / neck[0.0][name] - 1
        exact_change = exact(Q, 0.3) / exact(Q, 0.0) - 1
        assert fe_change < -0.03  # a real dependence, several per cent
        assert fe_change == pytest.approx(exact_change, abs=0.003)
    # equal to round-off of the sparse solve (the two matrices differ by the factor G only)
    assert neck[0.3]["torque"] == pytest.approx(neck[0.0]["torque"], rel=1e-7)


def test_shallow_semicircular_groove_in_torsion_tends_to_two():
    D = 100.0
    kts = []
    ratios = (0.01, 0.005, 0.0025)
    for ratio in ratios:
        t = ratio * D
        spec = expand_family(PartSpec(outline=(), family="shaft_groove", model="axisymmetric",
                                      dimensions=(("D", D), ("t", t), ("r", t), ("L", 2 * D))))
        s = solve_part(spec, ShaftEndsSpec(("left", "right"), torque=1.0e6))
        peak, _ = component_peak(s, "torque")
        kts.append(peak / nominal_net("torque", 1.0e6, D))
    assert kts[0] > kts[1] > kts[2] > 2.0  # falling towards 2 as the groove gets shallower
    # the excess over 2 roughly halves with t/D (first-order effect of curvature and stress gradient)
    assert 1.6 < (kts[1] - 2) / (kts[2] - 2) < 2.6
    extrapolated = 2 * kts[2] - kts[1]  # linear in t/D to t/D = 0
    assert extrapolated == pytest.approx(2.0, abs=0.005)
