"""Output units and number formatting.

Conversion factors are checked against NIST Special Publication 811 (2008 edition), "Guide for the Use
of the International System of Units (SI)", Appendix B.8 (factors given to 7 significant digits; the
inch is exact). SI prefixes: SI Brochure, 9th edition (BIPM 2019), Table 7. Digit grouping: SI
Brochure, 9th edition, section 5.4.4. The other formatting rules are our own (documented in
fekt/report/units.py); their tests are marked as such.
"""

from __future__ import annotations

import numpy as np
import pytest

from fekt.errors import InputError
from fekt.report.units import (LENGTH_UNITS, NARROW_NBSP, STRESS_UNITS, OutputUnits, case_output_units, converter,
                               engineering, length_factor, parse_output_units, stress_factor, unit_free)

SP811 = 5e-7  # relative: SP 811 prints 7 significant digits


# --- NIST SP 811 (2008), Appendix B.8 -------------------------------------------------------------

def test_psi_to_pascal_sp811():
    # "pound-force per square inch (psi) ... pascal (Pa) 6.894 757 E+03"
    assert stress_factor("in", "lbf", "Pa") == pytest.approx(6.894757e3, rel=SP811)


def test_ksi_to_megapascal_sp811():
    # "kip per square inch (ksi) ... pascal (Pa) 6.894 757 E+06", i.e. 6.894 757 MPa
    assert stress_factor("in", "kip", "MPa") == pytest.approx(6.894757, rel=SP811)


def test_inch_to_millimetre_is_exact_sp811():
    # "inch (in) ... meter (m) 2.54 E-02" (exact, boldface in SP 811)
    assert length_factor("in", "mm") == 25.4
    assert length_factor("mm", "in") == pytest.approx(1 / 25.4, rel=1e-15)


def test_pound_force_and_kip_to_newton_sp811():
    # "pound-force (lbf) ... newton (N) 4.448 222 E+00"; "kip (1 kip = 1000 lbf) ... newton (N) 4.448 222 E+03"
    # (a force of 1 lbf/in^2 shown in Pa divided by the exact 1/0.0254^2 gives the force factor)
    assert stress_factor("m", "lbf", "Pa") == pytest.approx(4.448222, rel=SP811)
    assert stress_factor("m", "kip", "kPa") == pytest.approx(4.448222, rel=SP811)


def test_psi_and_ksi_differ_by_1000():
    # kip = 1000 lbf (SP 811 B.8)
    assert stress_factor("in", "kip", "psi") == pytest.approx(1000.0, rel=1e-12)
    assert stress_factor("in", "lbf", "ksi") == pytest.approx(1e-3, rel=1e-12)


# --- SI prefixes (SI Brochure, 9th ed., Table 7) -------------------------------------------------

@pytest.mark.parametrize("length,force,unit,factor", [
    ("mm", "N", "MPa", 1.0),          # N/mm^2 = 1e0 / 1e-6 Pa = MPa
    ("mm", "kN", "GPa", 1.0),         # kN/mm^2 = 1e3 / 1e-6 Pa = GPa
    ("mm", "kN", "MPa", 1000.0),
    ("m", "N", "Pa", 1.0),
    ("m", "MN", "MPa", 1.0),
    ("cm", "N", "kPa", 10.0),         # N/cm^2 = 1 / 1e-4 Pa = 10 kPa
])
def test_si_stress_factors(length, force, unit, factor):
    assert stress_factor(length, force, unit) == pytest.approx(factor, rel=1e-12)


@pytest.mark.parametrize("src,dst,factor", [("m", "mm", 1000.0), ("cm", "mm", 10.0), ("mm", "m", 1e-3),
                                            ("in", "cm", 2.54), ("m", "in", 1 / 0.0254)])
def test_length_factors(src, dst, factor):
    # SI prefixes (SI Brochure Table 7); 1 in = 0.0254 m exactly (NIST SP 811 B.8)
    assert length_factor(src, dst) == pytest.approx(factor, rel=1e-12)


@pytest.mark.parametrize("length,force,expected", [
    ("mm", "N", OutputUnits("MPa", "mm")), ("mm", "kN", OutputUnits("GPa", "mm")), ("m", "N", OutputUnits("Pa", "m")),
    ("m", "MN", OutputUnits("MPa", "m")), ("in", "lbf", OutputUnits("psi", "in")), ("in", "kip", OutputUnits("ksi", "in")),
    ("cm", "N", OutputUnits("kPa", "cm")),     # N/cm^2 = 10 kPa: no offered unit equals it, kPa is nearest
])
def test_case_output_units_keep_the_numbers(length, force, expected):
    # factor exactly 1 where an offered unit equals the case's force/length^2 (SI Brochure Table 7; SP 811 B.8)
    assert case_output_units(length, force) == expected


# --- whole cases ---------------------------------------------------------------------------------

def test_inch_pound_case_shown_in_mpa_and_mm():
    # a 10 000 psi peak and a 0.25 in radius: 68.947 57 MPa (SP 811: 6.894 757 E+03 Pa per psi) and 6.35 mm
    c = converter("in", "lbf", OutputUnits("MPa", "mm"))
    stresses = c.stress(np.array([10_000.0, -2_500.0, 0.0]))
    assert isinstance(stresses, np.ndarray)
    np.testing.assert_allclose(stresses, [68.94757, -17.2368925, 0.0], rtol=SP811)
    assert c.length(0.25) == pytest.approx(6.35, rel=1e-15)
    assert isinstance(c.length(0.25), float)


def test_millimetre_kilonewton_case_shown_in_mpa():
    # the case's stresses are kN/mm^2 = GPa (SI Brochure Table 7): 0.3 GPa = 300 MPa
    c = converter("mm", "kN", OutputUnits("MPa", "mm"))
    assert c.stress_factor == pytest.approx(1000.0, rel=1e-12)
    np.testing.assert_allclose(c.stress(np.array([[0.3, 0.1], [1.2, -0.05]])), [[300.0, 100.0], [1200.0, -50.0]],
                               rtol=1e-12)
    assert c.length_factor == 1.0


def test_round_trip_ksi_inch_to_mpa_mm_and_back():
    # kip/in case -> MPa, mm; then read as an N/mm case (N/mm^2 = MPa) -> ksi, in: the numbers come back
    x = np.array([1.0, 59.87, 123.456, -7.5e-3])
    there = converter("in", "kip", OutputUnits("MPa", "mm"))
    back = converter("mm", "N", OutputUnits("ksi", "in"))
    np.testing.assert_allclose(back.stress(there.stress(x)), x, rtol=1e-13)
    np.testing.assert_allclose(back.length(there.length(x)), x, rtol=1e-13)


def test_every_case_unit_pair_converts_to_every_output_unit():
    # smoke: all 4 x 5 case units x 6 stress units are understood by the units library, factors positive
    for length in ("mm", "cm", "m", "in"):
        for force in ("N", "kN", "MN", "lbf", "kip"):
            for unit in STRESS_UNITS:
                assert stress_factor(length, force, unit) > 0
        for out in LENGTH_UNITS:
            assert length_factor(length, out) > 0


# --- choosing units (our own syntax; no external source) -----------------------------------------

@pytest.mark.parametrize("text,stress,length", [
    ("MPa,mm", "MPa", "mm"), ("ksi,in", "ksi", "in"), ("in,ksi", "ksi", "in"), (" mpa , MM ", "MPa", "mm"),
    ("GPa,m", "GPa", "m"), ("psi,cm", "psi", "cm"),
])
def test_parse_output_units(text, stress, length):
    assert parse_output_units(text) == OutputUnits(stress, length)


def test_parse_one_unit_takes_the_other_from_the_default():
    assert parse_output_units("ksi", OutputUnits("MPa", "in")) == OutputUnits("ksi", "in")
    assert parse_output_units("m", OutputUnits("MPa", "mm")) == OutputUnits("MPa", "m")


@pytest.mark.parametrize("text,words", [
    ("bar,mm", ["'bar'", "MPa", "ksi", "in"]),
    ("MPa,MPa", ["two stress units"]),
    ("MPa,mm,in", ["one or two units"]),
    ("", ["one or two units"]),
    ("mm", ["no stress unit"]),
])
def test_parse_errors_name_the_problem(text, words):
    with pytest.raises(InputError) as err:
        parse_output_units(text)
    assert err.value.item == "--units"
    for w in words:
        assert w in str(err.value)


def test_output_units_validate_and_list_the_allowed_ones():
    with pytest.raises(InputError, match=r"'N/mm\^2'.*Pa, kPa, MPa, GPa, psi, ksi"):
        OutputUnits("N/mm^2", "mm")
    with pytest.raises(InputError, match=r"'ft'.*mm, cm, m, in"):
        OutputUnits("MPa", "ft")
    with pytest.raises(InputError, match=r"case force unit.*'lb'.*lbf, kip"):
        stress_factor("in", "lb", "psi")


def test_output_units_are_frozen():
    u = OutputUnits()
    with pytest.raises(AttributeError):
        u.stress = "ksi"
    assert str(OutputUnits("ksi", "in")) == "ksi,in"


# --- formatting ----------------------------------------------------------------------------------

S = NARROW_NBSP


@pytest.mark.parametrize("x,text", [
    # digit groups of three separated by a thin (narrow no-break) space, four-digit numbers not split:
    # SI Brochure, 9th ed., 5.4.4
    (59873.2, f"59{S}870"),
    (5987.3, "5987"),
    (100000.0, f"100{S}000"),
    (-123456.0, f"-123{S}500"),
])
def test_engineering_digit_groups_si_brochure(x, text):
    assert engineering(x) == text


@pytest.mark.parametrize("x,digits,text", [
    # our own rules (fekt/report/units.py): 4 significant digits kept with trailing zeros, no exponent
    # from 0.001 to below 1e6, engineering notation (exponent a multiple of 3) outside
    (2.5, 4, "2.500"),
    (0.0, 4, "0.000"),
    (999.96, 4, "1000"),
    (0.00123456, 4, "0.001235"),
    (0.001, 4, "0.001000"),
    (68.94757, 4, "68.95"),
    (999_999.6, 4, "1.000×10⁶"),
    (1.234e7, 4, "12.34×10⁶"),
    (123_456_789.0, 4, "123.5×10⁶"),
    (-1.234e-5, 4, "-12.34×10⁻⁶"),
    (0.000999, 4, "999.0×10⁻⁶"),
    (59873.2, 2, f"60{S}000"),
    (float("nan"), 4, "nan"),
    (float("-inf"), 4, "-inf"),
])
def test_engineering_rules(x, digits, text):
    assert engineering(x, digits) == text


def test_engineering_never_uses_e_notation():
    for x in np.geomspace(1e-12, 1e12, 97):
        for s in (engineering(x), engineering(-x)):
            assert "e" not in s and "E" not in s


def test_engineering_plain_grouping_for_files():
    assert engineering(59873.2, group="") == "59870"
    assert engineering(59873.2, group=",") == "59,870"


@pytest.mark.parametrize("x,digits,text", [(2.5169, 3, "2.52"), (3.0, 3, "3.00"), (1.0004, 4, "1.000"),
                                           (12.345, 3, "12.3")])
def test_unit_free_kt(x, digits, text):
    # our own rule: significant digits, trailing zeros kept
    assert unit_free(x, digits) == text
