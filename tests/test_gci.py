"""Tests for fekt.studies.gci (grid convergence index).

Every published number is checked to the digits printed in its source; the
source is named beside each check. Sequences are ordered fine -> coarse.
"""

from __future__ import annotations

import dataclasses
import math

import numpy as np
import pytest

from fekt.errors import InputError
from fekt.report.words import estimate_method, format_value
from fekt.studies.gci import (
    FS_THREE_GRID,
    FS_TWO_GRID,
    ConvergenceEstimate,
    classify,
    estimate,
    observed_order,
    representative_size,
    trend,
)

# ---------------------------------------------------------------------------
# Published test vectors
# ---------------------------------------------------------------------------

# NASA Glenn NPARC Alliance tutorial "Examining Spatial (Grid) Convergence"
# (grc.nasa.gov/WWW/wind/valid/tutorial/spatconv.html), retrieved via a reproduction.
NASA_PHI = (0.97050, 0.96854, 0.96178)
NASA_H = (1.0, 2.0, 4.0)


def test_nasa_observed_order():
    # NASA NPARC tutorial: p = 1.786
    p = observed_order(NASA_PHI, NASA_H)
    assert round(p, 3) == 1.786


def test_nasa_extrapolation_and_gci():
    est = estimate(NASA_PHI, NASA_H, policy="celik")
    assert est.classification == "monotone"
    assert est.safety_factor == 1.25
    # NASA NPARC tutorial: f_ext = 0.971300
    assert round(est.extrapolated, 6) == 0.971300
    # NASA NPARC tutorial: GCI12 = 0.1031 %
    assert round(est.gci_fine * 100, 4) == 0.1031
    # NASA NPARC tutorial: GCI23 = 0.3562 %
    assert round(est.gci_23 * 100, 4) == 0.3562
    # NASA NPARC tutorial: GCI23 / (r^p GCI12) ~ 1.00 (asymptotic range)
    assert round(est.asymptotic_ratio, 2) == 1.00
    assert est.uncertainty_abs == pytest.approx(est.gci_fine * abs(NASA_PHI[0]), rel=1e-14)


# Celik et al. (2008), J. Fluids Eng. 130 078001, Table 1, first column
# (from memory; see verification-references section 4.5). r21 = 1.5, r32 = 1.333.
CELIK_PHI = (6.063, 5.972, 5.863)
CELIK_H = (1.0, 1.5, 2.0)


def test_celik_table1_first_column():
    est = estimate(CELIK_PHI, CELIK_H, policy="celik")
    assert est.ratios[0] == pytest.approx(1.5)
    assert est.ratios[1] == pytest.approx(1.3333, abs=1e-4)
    assert est.classification == "monotone"
    # Celik et al. (2008) Table 1 (from memory): p = 1.53
    assert est.observed_order == pytest.approx(1.53, abs=0.01)
    # Celik et al. (2008) Table 1 (from memory): phi_ext = 6.1685
    assert est.extrapolated == pytest.approx(6.1685, abs=1e-3)
    # Celik et al. (2008) Table 1 (from memory): e_a = 1.5 %, e_ext = 1.7 %, GCI = 2.2 %
    assert round(est.e_a * 100, 1) == 1.5
    assert round(est.e_ext * 100, 1) == 1.7
    assert round(est.gci_fine * 100, 1) == 2.2


def test_celik_iteration_differs_from_constant_ratio_formula():
    # The q(p) term matters for unequal ratios (Celik et al. 2008, step 3):
    # ignoring it (q = 0) gives a clearly different order.
    p_naive = math.log((CELIK_PHI[2] - CELIK_PHI[1]) / (CELIK_PHI[1] - CELIK_PHI[0])) / math.log(1.5)
    p = observed_order(CELIK_PHI, CELIK_H)
    assert abs(p - p_naive) > 0.05


# ---------------------------------------------------------------------------
# Synthetic sequences (derived)
# ---------------------------------------------------------------------------


def _poly(h):
    # verification-references section 4.5 [derived]: f = 3 + 0.5 h^2 + 0.2 h^3
    return 3.0 + 0.5 * h**2 + 0.2 * h**3


def test_synthetic_cubic_contaminated_sequence():
    h = np.array([0.1, 0.15, 0.225])
    est = estimate(_poly(h), h)
    # verification-references 4.5 [derived]: p = 2.09, f_ext = 3.00014, GCI = 0.21 %
    assert round(est.observed_order, 2) == 2.09
    assert round(est.extrapolated, 5) == 3.00014
    assert round(est.gci_fine * 100, 2) == 0.21
    # Oberkampf & Roy (2010) rule: |2.09 - 2|/2 <= 0.1 -> Fs = 1.25
    assert est.safety_factor == FS_THREE_GRID
    # verification-references 4.5 [derived]: the GCI covers the true error (0.17 %)
    true_error = abs(est.fine_value - 3.0)
    assert round(true_error / est.fine_value * 100, 2) == 0.17
    assert est.uncertainty_abs > true_error


@pytest.mark.parametrize("h", [(1.0, 2.0, 4.0), (1.0, 1.5, 2.0), (0.02, 0.03, 0.05)])
def test_exact_second_order_recovers_p_and_limit(h):
    # Exact error model phi = phi_ext + C h^2 (section 4.1 [standard]): p = 2 and
    # Richardson's extrapolation returns phi_ext, for constant and unequal ratios.
    h = np.asarray(h)
    phi = 2.5 + 0.25 * h**2
    est = estimate(phi, h, policy="celik")
    assert est.observed_order == pytest.approx(2.0, abs=1e-9)
    assert est.extrapolated == pytest.approx(2.5, abs=1e-12)
    # Asymptotic-range check (Roache 1994): exactly phi1/phi2 for this error
    # model, because GCI_23 is relative to phi2 and GCI_12 to phi1 (derived).
    assert est.asymptotic_ratio == pytest.approx(phi[0] / phi[1], rel=1e-9)


def test_exact_second_order_constant_ratio_p_to_round_off():
    # Exactly representable values: e32/e21 = 4 exactly, p = ln 4 / ln 2 (section 4.1).
    p = observed_order([2.75, 3.5, 6.5], [1.0, 2.0, 4.0])
    assert p == pytest.approx(2.0, abs=1e-12)
    est = estimate([2.75, 3.5, 6.5], [1.0, 2.0, 4.0])
    assert est.extrapolated == pytest.approx(2.5, abs=1e-12)


def test_exact_first_order_with_unequal_ratios():
    # phi = 1 - 0.3 h, h = 1, 1.3, 2.1: p = 1 through the q(p) iteration
    # (Celik et al. 2008, step 3).
    h = np.array([1.0, 1.3, 2.1])
    p = observed_order(1.0 - 0.3 * h, h)
    assert p == pytest.approx(1.0, abs=1e-9)


@pytest.mark.parametrize("h", [(1.0, 1.05, 3.0), (1.0, 1.01, 5.0)])
def test_strongly_unequal_ratios_fall_back_to_bracketing(h):
    # Celik's fixed-point iteration diverges here; the same equation is solved
    # by a bracketing root finder instead (derived: exact p = 1.5 model).
    h = np.asarray(h)
    phi = 4.0 - 0.2 * h**1.5
    assert observed_order(phi, h) == pytest.approx(1.5, abs=1e-10)
    est = estimate(phi, h, formal_order=1.5)
    assert est.extrapolated == pytest.approx(4.0, abs=1e-12)


def test_oscillatory_not_extrapolated():
    est = estimate([3.01, 2.99, 3.02], [1.0, 2.0, 4.0])
    # Celik et al. (2008), step 3: e32/e21 < 0 is oscillatory convergence.
    assert est.classification == "oscillatory"
    assert est.extrapolated is None
    assert est.observed_order is None
    assert est.e_ext is None
    # Our own conservative band (no published source): 3 x max |difference| = 3 x 0.03.
    assert est.uncertainty_abs == pytest.approx(0.09)
    assert est.safety_factor == 3.0
    assert "oscillatory" in estimate_method(est)


def test_diverging_singular_corner():
    # A stress at a re-entrant corner grows without bound: phi = C h^-0.4 (derived).
    h = np.array([0.1, 0.2, 0.4])
    phi = 1.7 * h**-0.4
    assert classify(phi) == "diverging"
    est = estimate(phi, h)
    assert est.classification == "diverging"
    assert est.extrapolated is None
    assert math.isinf(est.uncertainty_abs)
    assert math.isinf(est.gci_fine)
    assert est.safety_factor is None


def test_diverging_threshold_uses_unequal_ratios():
    # With unequal ratios the p = 0 threshold is e32/e21 = ln r32 / ln r21 (derived
    # from phi_i = phi_ext + C h_i^p), not 1. phi = 1 + h^p with small |p|:
    h = np.array([1.0, 1.5, 2.0])
    assert classify(1.0 + h**0.05, h) == "monotone"  # converging, p > 0
    assert classify(1.0 + h**-0.05, h) == "diverging"  # p < 0
    # Here |e32| < |e21| would wrongly flag the converging sequence as diverging
    # if the constant-ratio test were used.
    phi = 1.0 + h**0.05
    assert abs(phi[2] - phi[1]) < abs(phi[1] - phi[0])


def test_converged_to_solver_precision():
    # Differences below the 1e-9 relative noise floor (our own choice).
    phi = [2.0, 2.0 + 1e-12, 2.0 - 1e-12]
    assert classify(phi) == "converged"
    est = estimate(phi, [1.0, 2.0, 4.0])
    assert est.classification == "converged"
    assert est.extrapolated is None
    assert est.uncertainty_abs < 1e-10


def test_one_difference_at_noise_floor_is_not_extrapolated():
    # Celik et al. (2008) (from memory): a difference very close to zero makes the
    # procedure unusable; we treat it as oscillatory.
    assert classify([2.0, 2.0, 2.1]) == "oscillatory"


def test_classify_order_and_trend():
    phi = [1.01, 1.04, 1.16, 1.10]  # fine -> coarse: monotone, then a sign change
    assert classify(phi) == "monotone"
    assert trend(phi) == ("monotone", "oscillatory")


def test_two_grids_use_fs3_and_formal_order():
    # Roache (1994, 1998): two grids -> Fs = 3, p = formal order.
    est = estimate([2.6, 2.5], [1.0, 2.0], formal_order=2.0)
    assert est.classification == "two-grid"
    assert est.safety_factor == FS_TWO_GRID
    assert est.order_used == 2.0
    assert est.observed_order is None
    # GCI_fine = Fs |eps| / (r^p - 1) = 3 * (0.1/2.6) / 3 (Roache 1994)
    assert est.gci_fine == pytest.approx(0.1 / 2.6)
    assert est.uncertainty_abs == pytest.approx(0.1)
    assert estimate_method(est) == "GCI, 2 grids, Fs=3, formal p=2"


# ---------------------------------------------------------------------------
# Oberkampf & Roy (2010) policy selection (from memory)
# ---------------------------------------------------------------------------


def test_policy_close_to_formal_uses_fs_125():
    h = np.array([1.0, 2.0, 4.0])
    phi = 1.0 + 0.01 * h**2.15  # |2.15 - 2|/2 = 0.075 <= 0.1
    est = estimate(phi, h, formal_order=2.0)
    assert est.safety_factor == 1.25
    assert est.order_used == pytest.approx(2.15, abs=1e-9)
    assert est.order_used == est.observed_order


@pytest.mark.parametrize(
    "p_true, p_expected",
    [
        (2.6, 2.0),  # above formal: clipped to p_f
        (1.2, 1.2),  # below, within [0.5, p_f]: observed p kept
        (0.3, 0.5),  # very low: clipped to 0.5
    ],
)
def test_policy_far_from_formal_uses_fs3_and_clipped_order(p_true, p_expected):
    # Oberkampf & Roy (2010): Fs = 3 with p = min(max(0.5, p_obs), p_f).
    h = np.array([1.0, 2.0, 4.0])
    phi = 1.0 + 0.01 * h**p_true
    est = estimate(phi, h, formal_order=2.0)
    assert est.observed_order == pytest.approx(p_true, abs=1e-9)
    assert est.safety_factor == 3.0
    assert est.order_used == pytest.approx(p_expected, abs=1e-9)
    # The same sequence under the Celik policy keeps Fs = 1.25 and the observed p.
    celik = estimate(phi, h, formal_order=2.0, policy="celik")
    assert celik.safety_factor == 1.25
    assert celik.order_used == pytest.approx(p_true, abs=1e-9)


def test_policy_oberkampf_roy_is_default():
    est = estimate(NASA_PHI, NASA_H)  # p_obs = 1.786, |1.786-2|/2 = 0.107 > 0.1
    assert est.policy == "oberkampf-roy"
    assert est.safety_factor == 3.0


# ---------------------------------------------------------------------------
# Representative size, API and formatting
# ---------------------------------------------------------------------------


def test_representative_size():
    # Celik et al. (2008), step 1: h = sqrt(total area / N)
    assert representative_size(8.0, 2) == pytest.approx(2.0)
    assert representative_size(np.full(100, 0.04), 100) == pytest.approx(0.2)


def test_uses_finest_three_of_more_grids():
    h = np.array([1.0, 2.0, 4.0, 8.0])
    phi = 2.5 + 0.25 * h**2
    phi[3] = 99.0  # the coarsest value is ignored
    est = estimate(phi, h)
    assert est.n_used == 3
    assert est.extrapolated == pytest.approx(2.5, abs=1e-12)
    assert "finest 3 of 4 grids" in estimate_method(est)


def test_result_is_frozen():
    est = estimate(NASA_PHI, NASA_H)
    assert isinstance(est, ConvergenceEstimate)
    with pytest.raises(dataclasses.FrozenInstanceError):
        est.gci_fine = 0.0  # type: ignore[misc]


@pytest.mark.parametrize(
    "phi, h",
    [
        ([1.0], [1.0]),  # too few grids
        ([1.0, 1.1, 1.2], [4.0, 2.0, 1.0]),  # coarse -> fine: rejected
        ([1.0, 1.1, 1.2], [1.0, 2.0]),  # length mismatch
        ([1.0, float("nan"), 1.2], [1.0, 2.0, 4.0]),
    ],
)
def test_bad_input_raises(phi, h):
    with pytest.raises(InputError):
        estimate(phi, h)


def test_bad_policy_raises():
    with pytest.raises(InputError):
        estimate(NASA_PHI, NASA_H, policy="guess")


def test_format_value_digits():
    est = estimate(NASA_PHI, NASA_H, policy="celik")
    # U = 0.0010004 -> two significant digits, 4 decimals
    assert format_value("f", NASA_PHI[0], est) == (
        "f = 0.9705 +- 0.0010 (GCI, fine mesh, 3 grids, Fs=1.25, p=1.79)"
    )
    two = estimate([2.6, 2.5], [1.0, 2.0])
    # U = 0.1 -> at least 3 decimals
    assert format_value("Kt_net", 2.6, two) == (
        "Kt_net = 2.600 +- 0.100 (GCI, fine mesh, 2 grids, Fs=3, formal p=2)"
    )


def test_format_value_rounding_carry():
    # U = 0.000996 rounds to 0.0010 (two significant digits), not 0.00100.
    est = dataclasses.replace(estimate(NASA_PHI, NASA_H), uncertainty_abs=0.000996)
    assert "+- 0.0010 " in format_value("f", 0.9705, est)


def test_format_value_non_monotone():
    osc = estimate([3.01, 2.99, 3.02], [1.0, 2.0, 4.0])
    assert format_value("Kt", 3.01, osc).startswith("Kt = 3.010 +- 0.090 (oscillatory")
    h = np.array([0.1, 0.2, 0.4])
    div = estimate(1.7 * h**-0.4, h)
    assert "diverging" in format_value("Kt", div.fine_value, div)
