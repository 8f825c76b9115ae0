"""Tests for fekt.charts.fits: published chart fits, their ranges and their sources.

Every expected number names its source. Nearly all fit coefficients were recalled from the
named handbook and not re-read: those checks are marked "from memory". Checks tagged
"derived" were re-computed from the recalled formulas (they test how we copied the formulas, not the
handbook). Nothing here adjusts a fit to agree with anything.
"""

from __future__ import annotations

import dataclasses
import math

import pytest

from fekt.charts import fits as F
from fekt.errors import InputError

HOLE_FITS = {
    "pilkey": F.fit_by_key("strip-hole/tension/cubic-fit-1"),
    "roark": F.fit_by_key("strip-hole/tension/cubic-fit-2"),
    "heywood": F.fit_by_key("strip-hole/tension/cube-law"),
}
HOWLAND = F.fit_by_key("strip-hole/tension/series-table")
OU_T = F.fit_by_key("opposite-u/tension/cubic-sqrt-fit")
OU_B = F.fit_by_key("opposite-u/bending/cubic-sqrt-fit")
SHOULDER = F.fit_by_key("shoulder-fillet/tension/cubic-sqrt-fit")
INGLIS = F.fit_by_key("elliptical-hole/tension/infinite-plate")
SEMI_U = F.fit_by_key("semi-infinite-u/tension/sqrt-fit")


# --- Central hole in a strip, tension ------------------------------------------------


@pytest.mark.parametrize(
    "name, expected",
    [
        # Pilkey & Pilkey (2008) Chart 4.1 fit, from memory; value at x = 0 derived from it.
        ("pilkey", 3.004),
        # Roark's Table 17.1 (Young, Budynas & Sadegh 2012), from memory; derived at x = 0.
        ("roark", 3.000),
        # Heywood (1952), from memory; derived at x = 0.
        ("heywood", 3.000),
    ],
)
def test_hole_fits_at_zero_width_ratio(name, expected):
    assert round(HOLE_FITS[name].kt(d=0.0, W=1.0), 3) == expected


@pytest.mark.parametrize(
    "x, pilkey, roark, heywood",
    [
        # Gross values (Ktg = Ktn / (1 - d/W)) of the three recalled fits, as printed to three
        # decimals in our verification references (derived from the formulas, which are from
        # memory: Pilkey & Pilkey 2008 Chart 4.1; Roark Table 17.1; Heywood 1952).
        (0.1, 3.035, 3.025, 3.032),
        (0.3, 3.368, 3.356, 3.347),
        (0.5, 4.314, 4.317, 4.250),
    ],
)
def test_hole_fits_gross_values_against_printed_table(x, pilkey, roark, heywood):
    W = 20.0
    got = {n: F.kt_as(f, "gross", d=x * W, W=W) for n, f in HOLE_FITS.items()}
    assert round(got["pilkey"], 3) == pilkey
    assert round(got["roark"], 3) == roark
    assert round(got["heywood"], 3) == heywood


@pytest.mark.parametrize("name", ["pilkey", "roark", "heywood"])
def test_hole_fits_tend_to_two_as_hole_fills_strip(name):
    # All three recalled fits tend to 2.00 as d/W -> 1 (derived from the formulas, from memory).
    assert HOLE_FITS[name].kt(d=0.999999, W=1.0) == pytest.approx(2.0, abs=1e-4)


@pytest.mark.parametrize(
    "x, ktg, ktn",
    [
        # Howland (1930) table, from memory: gross row, and net row Ktn = Ktg (1 - d/W)
        # printed to three decimals.
        (0.0, 3.00, 3.000),
        (0.1, 3.03, 2.727),
        (0.2, 3.14, 2.512),
        (0.3, 3.36, 2.352),
        (0.4, 3.74, 2.244),
        (0.5, 4.32, 2.160),
    ],
)
def test_howland_table_reproduced_at_nodes(x, ktg, ktn):
    assert F.howland_ktg(x) == pytest.approx(ktg, abs=1e-12)
    assert HOWLAND.kt(d=x * 10.0, W=10.0) == pytest.approx(ktg, abs=1e-12)
    assert round(F.howland_ktn(x), 3) == ktn
    assert round(F.kt_as(HOWLAND, "net", d=x * 10.0, W=10.0), 3) == ktn


def test_howland_interpolation_is_monotone_within_table_rounding():
    # Property of Howland's (1930) table (from memory): Ktg increases with d/W. The not-a-knot
    # spline dips 3.5e-5 below 3.00 near d/W = 0.004 (finding, derived); that is far inside the
    # table's 2-decimal rounding (0.005), so monotonicity is checked to 1e-4 only.
    xs = [i / 1000 for i in range(501)]
    vals = [F.howland_ktg(x) for x in xs]
    assert all(b >= a - 1e-4 for a, b in zip(vals, vals[1:]))
    assert min(vals) > 3.00 - 1e-4


def test_howland_not_extrapolated():
    with pytest.raises(InputError, match="d/W = 0.6"):
        HOWLAND.kt(d=6.0, W=10.0)


@pytest.mark.parametrize("x", [0.1, 0.2, 0.3, 0.4, 0.5])
def test_hole_fits_within_their_band_of_howland(x):
    # Howland (1930) table and the three fits, all from memory; each fit's band (0.03).
    ref = F.howland_ktg(x)
    for name, f in HOLE_FITS.items():
        g = F.kt_as(f, "gross", d=x, W=1.0)
        assert abs(g - ref) / ref <= f.band, name


@pytest.mark.parametrize("x", [0.1, 0.3, 0.5])
def test_hole_fits_against_howland_at_compared_points(x):
    # Our verification references (all from memory): Pilkey and Roark within 0.3% of Howland,
    # Heywood up to 1.6% low, at the compared points d/W = 0.1, 0.3, 0.5. "1.6%" is rounded
    # (it is 1.62% at 0.5), so half a unit of its last digit is allowed.
    ref = F.howland_ktg(x)
    for name in ("pilkey", "roark"):
        g = F.kt_as(HOLE_FITS[name], "gross", d=x, W=1.0)
        assert abs(g - ref) / ref < 0.003, name
    g = F.kt_as(HOLE_FITS["heywood"], "gross", d=x, W=1.0)
    assert (ref - g) / ref < 0.0165
    assert (g - ref) / ref < 0.001


def test_roark_hole_fit_at_d_over_w_0p4_finding():
    # Finding (derived from the recalled Roark Table 17.1 fit and Howland's table, both from
    # memory): at d/W = 0.4, between the compared points, Roark is 0.37% below Howland, a
    # little outside the "0.3%" quoted for 0.1/0.3/0.5. Inside the 3% band; reported, not tuned.
    ref = F.howland_ktg(0.4)
    g = F.kt_as(HOLE_FITS["roark"], "gross", d=0.4, W=1.0)
    assert round((g - ref) / ref * 100, 2) == -0.37


def test_kt_as_round_trip_and_identity():
    # Section conventions (handbook practice, from memory): Ktn = Ktg (1 - d/W).
    f = HOLE_FITS["pilkey"]
    ktn = f.kt(d=3.0, W=10.0)
    assert F.kt_as(f, "net", d=3.0, W=10.0) == ktn
    assert F.kt_as(f, "gross", d=3.0, W=10.0) == pytest.approx(ktn / 0.7)


def test_kt_as_bending_uses_width_squared():
    # 6M/(h d^2) net versus 6M/(h H^2) gross (handbook practice, from memory).
    dims = dict(H=10.0, t=2.0, r=1.0)
    ktn = OU_B.kt(**dims)
    assert F.kt_as(OU_B, "gross", **dims) == pytest.approx(ktn / 0.6**2)


# --- Opposite U-notches ---------------------------------------------------------------


def test_opposite_u_tension_shallow_limit_at_t_over_r_1():
    # Pilkey & Pilkey (2008) opposite U-notch tension fit, from memory: C1 at t/r = 1 = 3.043
    # (derived from the coefficients).
    assert round(F.opposite_u_tension_pilkey_kt(1.0, 0.0), 3) == 3.043
    lo_set = F.OPPOSITE_U_TENSION_PILKEY[0]
    assert round(F.cubic_in_u(lo_set.c, 1.0, 0.0), 3) == 3.043


@pytest.mark.parametrize(
    "u, stated_pct",
    [
        # Pilkey & Pilkey (2008) fit, from memory: the two t/r ranges meet at t/r = 2 within
        # 0.15% (u <= 0.2), 0.7% (u = 0.4), 2.4% (u = 0.6) (derived). The stated percentages are
        # rounded, so we allow up to half a unit in their last printed digit.
        (0.0, 0.15),
        (0.1, 0.15),
        (0.2, 0.15),
        (0.4, 0.7),
        (0.6, 2.4),
    ],
)
def test_opposite_u_tension_ranges_meet_at_t_over_r_2(u, stated_pct):
    lo_set, hi_set = F.OPPOSITE_U_TENSION_PILKEY
    a = F.cubic_in_u(lo_set.c, 2.0, u)
    b = F.cubic_in_u(hi_set.c, 2.0, u)
    pct = abs(a - b) / b * 100
    digits = 2 if stated_pct < 0.5 else 1
    assert pct < stated_pct + 0.5 * 10**-digits


def test_opposite_u_tension_jump_at_2_peaks_between_tabulated_u():
    # Finding (derived from the recalled coefficients): between u = 0 and 0.2 the jump at
    # t/r = 2 peaks near u ~ 0.145 at ~0.18%, a little above the rounded "0.15%". Recorded
    # here so that a change in the coefficients is noticed; not a target.
    lo_set, hi_set = F.OPPOSITE_U_TENSION_PILKEY
    worst = max(
        abs(F.cubic_in_u(lo_set.c, 2.0, u) - F.cubic_in_u(hi_set.c, 2.0, u))
        / F.cubic_in_u(hi_set.c, 2.0, u)
        for u in [i / 1000 for i in range(201)]
    )
    assert 0.0015 < worst < 0.0019


@pytest.mark.parametrize("t_over_r", [0.4, 0.5, 1.0, 1.5, 1.99, 2.0, 3.0, 4.0, 5.0])
def test_opposite_u_tension_full_depth_limit_near_one(t_over_r):
    # Pilkey & Pilkey (2008) fit, from memory: u -> 1 gives 0.99-1.01 for t/r <= 5 (derived).
    assert 0.99 <= F.opposite_u_tension_pilkey_kt(t_over_r, 1.0) <= 1.01


def test_opposite_u_tension_full_depth_limit_low_t_over_r_and_large_t_over_r():
    # Findings (derived from the recalled coefficients, from memory): the "0.99-1.01 for
    # t/r <= 5" statement holds only from t/r ~ 0.38 up; at t/r = 0.1 the fit gives 0.974.
    # At t/r = 20 it gives 1.10, as our verification references state. Reported, not tuned.
    assert round(F.opposite_u_tension_pilkey_kt(0.1, 1.0), 3) == 0.974
    assert round(F.opposite_u_tension_pilkey_kt(20.0, 1.0), 2) == 1.10


def test_opposite_u_shallow_limit_below_semi_infinite_at_t_over_r_20():
    # Pilkey & Pilkey (2008) charts, from memory: opposite-U C1 = 9.98 vs semi-infinite
    # 0.855 + 2.21 sqrt(20) = 10.74 at t/r = 20 (derived), a ~7% difference.
    assert round(F.opposite_u_tension_pilkey_kt(20.0, 0.0), 2) == 9.98
    assert round(F.semi_infinite_u_kt(20.0), 2) == 10.74


def test_opposite_u_tension_kt_from_dimensions():
    # Same fit through the dimensional interface: H = 10, t = 1, r = 1 -> t/r = 1, u = 0.2.
    assert OU_T.kt(H=10.0, t=1.0, r=1.0) == pytest.approx(F.opposite_u_tension_pilkey_kt(1.0, 0.2))


def test_opposite_u_bending_full_depth_symptom_documented():
    # Pilkey & Pilkey (2008) bending fit, from memory, LOW confidence: u -> 1 gives 1.05-1.08
    # instead of ~1 (derived). This characterises the recalled coefficients; not a target.
    vals = [F.opposite_u_bending_pilkey_kt(q, 1.0) for q in (0.5, 1.0, 1.5, 2.0, 3.0, 5.0, 20.0)]
    assert all(1.04 <= v <= 1.08 for v in vals)
    assert OU_B.confidence == "low"


# --- Flat shoulder fillet, tension ----------------------------------------------------


@pytest.mark.parametrize("h_over_r", [0.1, 0.5, 1.0, 2.0, 5.0, 10.0, 20.0])
def test_shoulder_full_step_gives_one_in_both_ranges(h_over_r):
    # Roark's Table 17.1 (2012) shoulder fit, from memory, with C4 constant 3.450: sqrt and
    # linear coefficients sum to zero in both ranges, so Kt(u = 1) = 1.000 (derived).
    for s in F.SHOULDER_TENSION_ROARK:
        assert F.cubic_in_u(s.c, h_over_r, 1.0) == pytest.approx(1.0, abs=5e-4)


def test_shoulder_continuous_at_h_over_r_2():
    # Roark's Table 17.1 fit, from memory: with 3.450 the two ranges agree at h/r = 2 (derived).
    lo_set, hi_set = F.SHOULDER_TENSION_ROARK
    for u in (0.0, 0.2, 0.4, 0.6, 0.8):
        a = F.cubic_in_u(lo_set.c, 2.0, u)
        b = F.cubic_in_u(hi_set.c, 2.0, u)
        assert abs(a - b) / b < 0.001


def test_shoulder_at_D_over_d_2_r_over_d_0p1():
    # Roark's Table 17.1 fit, from memory: 2.53 at D/d = 2, r/d = 0.1 (derived). A power-law
    # fit gives 2.30 there: sources differ by ~10%, which is why the band is 0.10.
    assert round(SHOULDER.kt(D=2.0, d=1.0, r=0.1), 2) == 2.53
    assert SHOULDER.band >= 0.10


def test_shoulder_c4_constant_is_corrected_value():
    # Roark's Table 17.1, from memory; the upper-range C4 constant is 3.450 (not 2.450),
    # restored by the Kt(u = 1) = 1 consistency argument.
    assert F.SHOULDER_TENSION_ROARK[1].c[3][0] == 3.450


# --- Elliptical hole and semi-infinite U-notch ------------------------------------------


def test_inglis_aspect_two_gives_five():
    # Inglis (1913) / Kolosov: Kt = 1 + 2a/b, from memory and re-derived.
    assert F.inglis_kt(2.0, 1.0) == 5.0
    assert INGLIS.kt(a=2.0, b=1.0, W=math.inf) == 5.0
    assert INGLIS.kt(a=1.0, b=1.0, W=100.0) == 3.0  # circle: Kirsch's 3


def test_inglis_width_check_is_own_heuristic():
    (rng,) = INGLIS.ranges
    assert rng.name == "2a/W" and rng.hi == 0.1
    assert "own heuristic" in rng.description
    assert F.coverage(INGLIS, a=1.0, b=1.0, W=math.inf).inside
    cov = F.coverage(INGLIS, a=1.0, b=0.5, W=10.0)
    assert cov.verdict == "outside"
    assert cov.messages == ("2a/W = 0.2 outside [0, 0.1]",)


def test_semi_infinite_u_formula_and_range():
    # Pilkey & Pilkey (2008) semi-infinite U-notch chart, from memory: 0.855 + 2.21 sqrt(t/r),
    # 1 <= t/r <= 361.
    assert SEMI_U.kt(t=4.0, r=1.0) == pytest.approx(0.855 + 2.21 * 2.0)
    assert F.coverage(SEMI_U, t=361.0, r=1.0).inside
    assert F.coverage(SEMI_U, t=1.0, r=1.0).inside
    cov = F.coverage(SEMI_U, t=0.5, r=1.0)
    assert cov.messages == ("t/r = 0.5 outside [1, 361]",)


# --- Coverage -------------------------------------------------------------------------


def test_coverage_strip_hole_inside_and_outside():
    inside = F.coverage(HOWLAND, d=2.0, W=10.0)
    assert inside.verdict == "inside" and inside.violations == ()
    assert inside.ratios == (("d/W", 0.2),)
    out = F.coverage(HOWLAND, d=6.2, W=10.0)
    assert out.verdict == "outside"
    (v,) = out.violations
    assert v.ratio == "d/W" and v.value == pytest.approx(0.62)
    assert str(v) == "d/W = 0.62 outside [0, 0.5]"


def test_coverage_half_open_range_text():
    assert F.coverage(HOLE_FITS["pilkey"], d=9.0, W=10.0).inside
    (rng,) = HOLE_FITS["pilkey"].ranges
    assert rng.interval_text() == "[0, 1)"


def test_coverage_names_every_violated_ratio():
    cov = F.coverage(OU_T, H=10.0, t=4.6, r=0.05)  # t/r = 92, 2t/H = 0.92
    assert cov.verdict == "outside"
    assert [v.ratio for v in cov.violations] == ["t/r", "2t/H"]
    assert cov.messages == ("t/r = 92 outside [0.1, 50]", "2t/H = 0.92 outside [0, 0.9]")


def test_coverage_tolerates_round_off_at_inclusive_end():
    # 2t/H computed as 0.9000000000000001 must still count as 0.9.
    assert F.coverage(OU_T, H=1.0, t=0.45000000000000001, r=0.1).inside
    assert F.coverage(OU_T, H=3.0, t=1.35, r=0.5).inside


def test_coverage_shoulder():
    assert F.coverage(SHOULDER, D=2.0, d=1.0, r=0.1).inside  # h/r = 5
    cov = F.coverage(SHOULDER, D=2.0, d=1.0, r=0.01)  # h/r = 50
    assert cov.messages == ("h/r = 50 outside [0.1, 20]",)


# --- Registry, primary choice, gaps -----------------------------------------------------


def test_every_fit_has_source_confidence_and_band():
    fits = F.all_fits()
    keys = [f.key for f in fits]
    assert len(keys) == len(set(keys))
    for f in fits:
        assert f.source.strip()
        assert f.confidence in F.CONFIDENCES
        assert f.family in F.FAMILIES and f.load in F.LOADS and f.basis in F.BASES
        assert f.nominal.strip()
        assert f.band > 0
        assert f.ranges and f.parameters
        if f.from_memory:
            assert "from memory" in f.source, f.key


def test_bands_follow_confidence():
    for f in F.all_fits():
        if f.confidence == "low":
            assert f.band > 0.10
    assert HOWLAND.band == 0.01
    assert all(f.band == 0.03 for f in HOLE_FITS.values())


def test_fits_are_frozen():
    with pytest.raises(dataclasses.FrozenInstanceError):
        HOWLAND.band = 0.5  # type: ignore[misc]


def test_fits_for_and_all_fits_consistent():
    total = sum(len(F.fits_for(fam, load)) for fam in F.FAMILIES for load in F.LOADS)
    assert total == len(F.all_fits())
    assert [f.key for f in F.fits_for("strip_hole", "tension")] == [
        "strip-hole/tension/series-table",
        "strip-hole/tension/cubic-fit-1",
        "strip-hole/tension/cubic-fit-2",
        "strip-hole/tension/cube-law",
    ]
    with pytest.raises(InputError, match="unknown family"):
        F.fits_for("round_bar", "tension")
    with pytest.raises(InputError, match="unknown load"):
        F.fits_for("strip_hole", "shear")
    assert F.fits_for("strip_hole", "torsion") == []  # a load kind of shafts: no plate chart


def test_primary_fit_choice():
    assert F.primary_fit("strip_hole", "tension").key == "strip-hole/tension/series-table"
    assert F.primary_fit("strip_hole", "tension", {"d": 3.0, "W": 10.0}).key == "strip-hole/tension/series-table"
    assert F.primary_fit("strip_hole", "tension", {"d": 7.0, "W": 10.0}).key == "strip-hole/tension/cubic-fit-1"
    assert F.primary_fit("opposite_u_notches", "tension").key == "opposite-u/tension/cubic-sqrt-fit"
    assert F.primary_fit("shoulder_fillet", "tension").key == "shoulder-fillet/tension/cubic-sqrt-fit"
    # Low-confidence bending fit: not primary unless asked for explicitly.
    assert F.primary_fit("opposite_u_notches", "bending") is None
    assert F.primary_fit("opposite_u_notches", "bending", allow_low=True).key == "opposite-u/bending/cubic-sqrt-fit"


def test_single_u_notch_has_no_chart_but_a_shallow_limit():
    # Single edge U-notch: coefficients not transcribed; only the shallow limit via the
    # semi-infinite U-notch fit (Pilkey & Pilkey 2008, from memory).
    assert F.fits_for("single_u_notch", "tension") == []
    assert F.primary_fit("single_u_notch", "tension") is None
    gap = F.gap_for("single_u_notch", "tension")
    assert gap is not None and "no chart" in gap.reason
    assert gap.shallow_limit_key == SEMI_U.key
    assert F.fit_by_key(gap.shallow_limit_key).family == "semi_infinite_u_notch"
    assert F.gap_for("strip_hole", "tension") is None
    assert {(g.family, g.load) for g in F.chart_gaps()} >= {("single_u_notch", "tension"), ("shoulder_fillet", "bending")}


# --- Input validation ------------------------------------------------------------------


@pytest.mark.parametrize(
    "fit, dims, item",
    [
        (HOWLAND, {"d": 1.0}, "strip-hole/tension/series-table"),
        (HOWLAND, {"d": 1.0, "W": 10.0, "r": 1.0}, "strip-hole/tension/series-table"),
        (HOLE_FITS["pilkey"], {"d": 10.0, "W": 10.0}, "strip-hole/tension/cubic-fit-1.d"),
        (OU_T, {"H": 10.0, "t": 5.0, "r": 1.0}, "opposite-u/tension/cubic-sqrt-fit.t"),
        (OU_T, {"H": 10.0, "t": 1.0, "r": 0.0}, "opposite-u/tension/cubic-sqrt-fit.r"),
        (SHOULDER, {"D": 1.0, "d": 2.0, "r": 0.1}, "shoulder-fillet/tension/cubic-sqrt-fit.d"),
        (INGLIS, {"a": 6.0, "b": 1.0, "W": 10.0}, "elliptical-hole/tension/infinite-plate.W"),
        (SEMI_U, {"t": float("nan"), "r": 1.0}, "semi-infinite-u/tension/sqrt-fit.t"),
    ],
)
def test_invalid_dimensions_raise_input_error(fit, dims, item):
    with pytest.raises(InputError) as err:
        fit.kt(**dims)
    assert err.value.item == item
