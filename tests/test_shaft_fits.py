"""Sanity of the round-shaft chart fits (fekt.charts.fits) and of Neuber's deep-groove formulas (fekt.exact).

Sources beside each check. The shoulder coefficients are recalled from memory (verification notes 2.6,
Peterson's SCF 3rd ed.); the reference numbers below are the notes' own evaluation of those coefficients,
with Norton's independently recalled power-law fits (notes 2.8, from memory) as the outside check.
"""

from __future__ import annotations

import math

import numpy as np
import pytest
from scipy.integrate import quad

from fekt.charts import fits as F
from fekt.exact import neuber_deep_groove_bending, neuber_deep_groove_tension, neuber_deep_groove_torsion


def shoulder(load, D_over_d, r_over_d):
    return F.fit_by_key(f"shaft-shoulder/{load}/cubic-sqrt-fit").kt(D=D_over_d, d=1.0, r=r_over_d)


@pytest.mark.parametrize("Dd,rd,tension,bending,torsion", [
    # notes 2.6 table (fit values; from memory)
    (2.0, 0.10, 1.965, 1.802, None),
    (2.0, 0.20, 1.629, 1.475, 1.252),
    (1.5, 0.05, 2.261, 2.169, None),
    (1.2, 0.05, 2.018, 1.956, 1.560),
    (1.2, 0.10, 1.690, 1.666, 1.357),
    (1.1, 0.05, 1.812, 1.814, None),
])
def test_shoulder_fit_values(Dd, rd, tension, bending, torsion):
    assert shoulder("tension", Dd, rd) == pytest.approx(tension, abs=0.0015)
    assert shoulder("bending", Dd, rd) == pytest.approx(bending, abs=0.0015)
    if torsion is not None:
        assert shoulder("torsion", Dd, rd) == pytest.approx(torsion, abs=0.0015)


@pytest.mark.parametrize("load,Dd,rd,A,b", [
    # Norton, Machine Design, Appendix C power fits Kt = A (r/d)^b (notes 2.8, from memory)
    ("tension", 2.0, 0.10, 1.01470, -0.30035), ("tension", 1.2, 0.05, 0.96272, -0.25527),
    ("bending", 2.0, 0.20, 0.90879, -0.28598), ("bending", 1.2, 0.10, 0.97098, -0.21796),
    ("torsion", 2.0, 0.20, 0.86331, -0.23865), ("torsion", 1.2, 0.05, 0.83425, -0.21649),
])
def test_shoulder_fits_agree_with_independent_power_fits(load, Dd, rd, A, b):
    """Two recollections of the same charts agree within the fits' bands (5 % tension and torsion, 7 %
    bending)."""
    fit = F.fit_by_key(f"shaft-shoulder/{load}/cubic-sqrt-fit")
    assert shoulder(load, Dd, rd) == pytest.approx(A * rd ** b, rel=fit.band)


def test_shoulder_fits_tend_to_one_for_a_vanishing_step():
    """u = 2t/D -> 1 ... the fits are near-constrained to Kt ~ 1 (notes 2.6: 0.98-1.03); and as the step
    vanishes (D -> d at fixed t/r the cubic's C1 alone) Kt stays above 1."""
    for load in ("tension", "bending"):
        for q in (0.5, 1.0, 5.0, 15.0):
            kt = F.shaft_shoulder_kt(load, q, 1.0)
            assert 0.97 < kt < 1.04, (load, q, kt)
    for q in (0.5, 1.0, 3.0):
        assert 0.97 < F.shaft_shoulder_kt("torsion", q, 1.0) < 1.06


def test_shoulder_ranges_and_coverage():
    t = F.fit_by_key("shaft-shoulder/torsion/cubic-sqrt-fit")
    assert F.coverage(t, D=2.0, d=1.0, r=0.2).inside  # t/r = 2.5
    assert F.coverage(t, D=2.0, d=1.0, r=0.1).messages == ("t/r = 5 outside [0.25, 4]",)
    b = F.fit_by_key("shaft-shoulder/bending/cubic-sqrt-fit")
    assert F.coverage(b, D=2.0, d=1.0, r=0.02).messages == ("t/r = 25 outside [0.1, 20]",)


def test_round_bar_net_and_gross_conversion():
    """Gross/net nominal ratios of a round bar: (d/D)^2 in tension, (d/D)^3 in bending and torsion
    (4F/(pi d^2), 32M/(pi d^3), 16T/(pi d^3); notes section 0)."""
    for load, power in (("tension", 2), ("bending", 3), ("torsion", 3)):
        fit = F.fit_by_key(f"shaft-shoulder/{load}/cubic-sqrt-fit")
        net = fit.kt(D=1.5, d=1.0, r=0.1)
        assert F.kt_as(fit, "gross", D=1.5, d=1.0, r=0.1) == pytest.approx(net / (1 / 1.5) ** power)


# --- Neuber's deep hyperbolic groove ----------------------------------------------------------------------


@pytest.mark.parametrize("nu", [0.0, 0.3, 0.45])
def test_deep_groove_formulas_tend_to_one_for_a_blunt_neck(nu):
    """a/rho -> 0: the neck becomes a plain bar and Kt -> 1 (exact limit)."""
    for f in (lambda q: neuber_deep_groove_tension(q, nu), lambda q: neuber_deep_groove_bending(q, nu),
              neuber_deep_groove_torsion):
        assert f(1e-10) == pytest.approx(1.0, abs=1e-8)


def test_deep_groove_formulas_tend_to_the_crack_limits():
    """a/rho -> infinity: sigma_max = 2 K / sqrt(pi rho) (Creager & Paris 1967) with the stress intensity
    factors of a deep circumferential crack in a round bar, K_I = sigma_nom sqrt(pi a)/2 in tension and
    (3/8) sigma_nom sqrt(pi a) in bending (Tada, Paris & Irwin handbook; from memory): Kt -> sqrt(a/rho)
    and (3/4) sqrt(a/rho)."""
    q = 1e8
    assert neuber_deep_groove_tension(q, 0.3) / math.sqrt(q) == pytest.approx(1.0, rel=1e-3)
    assert neuber_deep_groove_bending(q, 0.3) / math.sqrt(q) == pytest.approx(0.75, rel=1e-3)


@pytest.mark.parametrize("q", [0.5, 1.0, 4.0, 10.0, 50.0])
def test_deep_groove_torsion_formula_matches_its_integral(q):
    """The closed form 3(1+s)^2/(4(1+2s)) against the torque integral it came from, evaluated by quadrature:
    Kts = tan(eta0) sin^3(eta0) / (4 int_0^eta0 sin^3), tan^2(eta0) = a/rho (derivation in fekt.exact)."""
    eta0 = math.atan(math.sqrt(q))
    integral, _ = quad(lambda e: math.sin(e) ** 3, 0.0, eta0)
    assert neuber_deep_groove_torsion(q) == pytest.approx(math.tan(eta0) * math.sin(eta0) ** 3 / (4 * integral),
                                                          rel=1e-10)


def test_deep_groove_values():
    """Values at a/rho = 4 (formulas above; nu = 0.3 where it matters)."""
    assert neuber_deep_groove_tension(4.0, 0.3) == pytest.approx(2.2272, abs=1e-4)
    assert neuber_deep_groove_bending(4.0, 0.3) == pytest.approx(1.8400, abs=1e-4)
    assert neuber_deep_groove_torsion(4.0) == pytest.approx(1.4353, abs=1e-4)
    # nu matters in tension and bending: lower Kt for larger nu
    assert neuber_deep_groove_tension(4.0, 0.0) > neuber_deep_groove_tension(4.0, 0.3) > \
        neuber_deep_groove_tension(4.0, 0.45)


# --- grooves: shallow limit, deep limit, combination -------------------------------------------------------


def test_groove_shallow_limits():
    """Semicircular shallow groove: 0.855 + 2.21 = 3.065 in tension and bending (semi-infinite U-notch fit,
    Pilkey & Pilkey 2008, from memory) and exactly 2 in torsion (antiplane, notes 2.7)."""
    for load, value in (("tension", 3.065), ("bending", 3.065), ("torsion", 2.0)):
        fit = F.fit_by_key(f"shaft-groove/{load}/shallow-limit")
        assert fit.basis == "gross"
        assert fit.kt(D=100.0, d=99.0, r=0.5) == pytest.approx(value, abs=1e-9)
        assert F.coverage(fit, D=100.0, d=99.0, r=0.5).inside
        assert not F.coverage(fit, D=10.0, d=9.0, r=0.5).inside  # 2t/D = 0.1 is not shallow


def test_shallow_deep_combination_rule():
    """Neuber's rule (Neuber 1958): symmetric; below both limits; equal to the other limit when one is huge."""
    c = F.shallow_deep_combination
    assert c(3.0, 2.0) == pytest.approx(c(2.0, 3.0))
    assert c(3.0, 2.0) == pytest.approx(1 + 2 * 1 / math.sqrt(5))
    assert c(3.0, 2.0) < 2.0
    assert c(1e9, 2.0) == pytest.approx(2.0, rel=1e-6)
    assert c(1.0 + 1e-12, 5.0) == pytest.approx(1.0, abs=1e-9)


def test_groove_fit_choice_and_labels():
    cd = {"D": 30.0, "d": 20.0, "r": 2.5}  # 2t/D = 1/3, t/r = 2
    assert F.primary_fit("shaft_groove", "tension", cd, allow_low=True).key == \
        "shaft-groove/tension/shallow-deep-combination"
    deep = {"D": 100.0, "d": 20.0, "r": 2.0}  # 2t/D = 0.8
    assert F.primary_fit("shaft_groove", "torsion", deep).key == "shaft-groove/torsion/deep-hyperbolic-limit"
    for f in F.all_fits():
        if f.family.startswith("shaft_"):
            assert "neuber" not in f.key and "peterson" not in f.key.lower()  # keys describe shape and data
            assert f.from_memory and "from memory" in f.source


def test_torsion_is_a_load_kind():
    assert "torsion" in F.LOADS
    assert [f.key for f in F.fits_for("shaft_shoulder", "torsion")] == ["shaft-shoulder/torsion/cubic-sqrt-fit"]
    assert np.isclose(F.fit_by_key("shaft-groove/torsion/deep-hyperbolic-limit").kt(D=100.0, d=20.0, r=2.5),
                      neuber_deep_groove_torsion(4.0))
