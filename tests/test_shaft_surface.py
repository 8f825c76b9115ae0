"""The combined peak on a shaft's surface: components of harmonics 0 and 1 superposed at the critical angle.

References: on the surface of a uniform bar under bending M, torsion T and axial force F the stress at
angle theta is sigma = F/A + (M r / I) cos(theta) and tau = T r / J (Saint-Venant; any strength-of-materials
text); the largest principal stress of that plane state is sigma/2 + sqrt(sigma^2/4 + tau^2) and the
von Mises stress sqrt(sigma^2 + 3 tau^2), both largest at theta = 0 (the classical combined bending and
torsion of shafts). Elsewhere the maximisation is checked against a brute-force search over 20000 angles.
"""

from __future__ import annotations

import math

import numpy as np
import pytest

from fekt.models.axisymmetric import (CombinedPeak, SurfaceStress, combined_surface_peak, surface_principal,
                                      surface_state, surface_stress)
from fekt.models.base import Stress


def test_uniform_bar_combined_bending_torsion_tension():
    sa, sb, tau = 30.0, 200.0, 90.0  # F/A, M R / I, T R / J
    one = np.ones(1)
    parts = [(1.0, SurfaceStress(sa * one, 0 * one, 0 * one, 0)),     # axial force
             (1.0, SurfaceStress(sb * one, 0 * one, 0 * one, 1)),     # bending (cos amplitude)
             (1.0, SurfaceStress(0 * one, 0 * one, tau * one, 0))]    # torsion
    p = combined_surface_peak(parts)
    s = sa + sb
    assert p.s1[0] == pytest.approx(s / 2 + math.sqrt(s ** 2 / 4 + tau ** 2), rel=1e-12)
    assert p.von_mises[0] == pytest.approx(math.sqrt(s ** 2 + 3 * tau ** 2), rel=1e-12)
    assert min(p.theta_s1[0], 2 * math.pi - p.theta_s1[0]) < 1e-6
    assert min(p.theta_von_mises[0], 2 * math.pi - p.theta_von_mises[0]) < 1e-6


def test_negative_moment_peaks_on_the_far_side():
    one = np.ones(1)
    p = combined_surface_peak([(-1.0, SurfaceStress(100 * one, 0 * one, 0 * one, 1))])
    assert p.s1[0] == pytest.approx(100.0, rel=1e-12) and p.theta_s1[0] == pytest.approx(math.pi, abs=1e-6)


def test_harmonic_zero_only_is_independent_of_the_angle():
    one = np.ones(3)
    p = combined_surface_peak([(2.0, SurfaceStress(one, 0.5 * one, 0.2 * one, 0))])
    s1, vm = surface_principal(2 * one, one, 0.4 * one)
    assert np.allclose(p.s1, s1) and np.allclose(p.von_mises, vm) and np.all(p.theta_s1 == 0)


def test_against_brute_force_on_random_states():
    """Random harmonic-0 and harmonic-1 parts (bending shear amplitudes included): the maximisation over
    theta agrees with a dense search to 1e-9 of the stress scale."""
    rng = np.random.default_rng(7)
    n = 400
    parts = [(1.0, SurfaceStress(*(rng.normal(size=n) for _ in range(3)), 0)),
             (0.7, SurfaceStress(*(rng.normal(size=n) for _ in range(3)), 1)),
             (1.3, SurfaceStress(*(rng.normal(size=n) for _ in range(3)), 1))]
    p = combined_surface_peak(parts)
    theta = np.linspace(0, 2 * math.pi, 20001)[None, :]
    flat = [(f, SurfaceStress(*(a[:, None] for a in (s.stt, s.shh, s.sth)), s.harmonic)) for f, s in parts]
    s1, vm = surface_principal(*surface_state(flat, theta))
    assert np.all(p.s1 >= s1.max(axis=1) - 1e-9)
    assert np.allclose(p.s1, s1.max(axis=1), atol=1e-6)
    assert np.allclose(p.von_mises, vm.max(axis=1), atol=1e-6)
    back, _ = surface_principal(*surface_state(flat, p.theta_s1[:, None]))
    assert np.allclose(back[:, 0], p.s1, atol=1e-12)


def test_surface_stress_frame():
    """Tangent t = (-n_y, n_x): on the outer surface of a shaft (n = +y) the tangential stress is the
    axial stress and the tangential-hoop shear is -tau_xh (travel runs towards -x there)."""
    one = np.ones(1)
    st = Stress(5 * one, 1 * one, 2 * one, 0 * one, 3 * one, 0 * one, harmonic=1)
    s = surface_stress(st, np.array([[0.0], [1.0]]))
    assert (s.stt[0], s.shh[0], s.sth[0], s.harmonic) == (5.0, 2.0, -3.0, 1)
    assert isinstance(combined_surface_peak([(1.0, s)]), CombinedPeak)
