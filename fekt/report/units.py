"""Output units: converting stresses and lengths from a case's units, and formatting numbers for reports.

A case states its length unit (mm, cm, m, in) and force unit (N, kN, MN, lbf, kip); its stresses are
force / length^2. Reports may show results in other units, chosen with :class:`OutputUnits`:

* stress: Pa, kPa, MPa, GPa, psi, ksi
* length: mm, cm, m, in

Conversion factors come from pint (a general units library) and are computed once per pair of units;
arrays are then simply multiplied by the factor (see :class:`Converter`).

The command-line syntax parsed by :func:`parse_output_units` is ``STRESS,LENGTH`` -- for example
``MPa,mm`` or ``ksi,in``. The two items may come in either order (no stress unit has the name of a
length unit), spaces around them are ignored, and letter case is not significant (``mpa,MM`` means
``MPa,mm``). One item alone sets that quantity and takes the other one from ``default``.

Number formatting (:func:`engineering` for quantities with a unit, :func:`unit_free` for Kt):

* values are rounded to a fixed number of significant digits, trailing zeros kept
  (``250.0`` with 4 digits says that the fourth digit is known);
* from 0.001 up to (not including) 1 000 000 after rounding, plain decimal notation, no exponent;
* outside that range, engineering notation: a mantissa from 1 to below 1000 times a power of ten whose
  exponent is a multiple of 3, written ``12.35×10⁶`` (no ``e+06``);
* the integer part is split into groups of three digits by a narrow no-break space (U+202F) when it has
  five or more digits (``59 870``, but ``5987``), following the SI Brochure (9th ed., 2019, §5.4.4),
  which separates groups of three by a thin space and leaves four-digit numbers unsplit. Decimals are
  not grouped. Pass ``group=""`` for plain digits (CSV files, copy-paste into spreadsheets);
* negative numbers use the ASCII hyphen-minus, so text can be pasted into other programs;
* NaN and infinities are written ``nan``, ``inf`` and ``-inf``.
"""

from __future__ import annotations

import functools
import math
from dataclasses import dataclass

import numpy as np

from ..errors import InputError

#: units a case may state (the same lists as :mod:`fekt.case.schema`)
CASE_LENGTH_UNITS = ("mm", "cm", "m", "in")
CASE_FORCE_UNITS = ("N", "kN", "MN", "lbf", "kip")

#: units a report may show
STRESS_UNITS = ("Pa", "kPa", "MPa", "GPa", "psi", "ksi")
LENGTH_UNITS = ("mm", "cm", "m", "in")

#: our unit names -> pint expressions (spelled out so no short name is ever read in another sense)
_PINT = {
    "mm": "millimeter", "cm": "centimeter", "m": "meter", "in": "inch",
    "N": "newton", "kN": "kilonewton", "MN": "meganewton", "lbf": "force_pound", "kip": "kip",
    "Pa": "pascal", "kPa": "kilopascal", "MPa": "megapascal", "GPa": "gigapascal", "psi": "psi", "ksi": "ksi",
}

NARROW_NBSP = "\u202f"
_SUPERSCRIPT = str.maketrans("-0123456789", "⁻⁰¹²³⁴⁵⁶⁷⁸⁹")


# --- choosing units ------------------------------------------------------------------------------

def _check(value: str, allowed: tuple[str, ...], item: str) -> None:
    if value not in allowed:
        raise InputError(f"unknown unit {value!r}; allowed: {', '.join(allowed)}", item=item)


@dataclass(frozen=True)
class OutputUnits:
    """The stress and length units a report shows. Raises :class:`InputError` for a unit not offered."""

    stress: str = "MPa"
    length: str = "mm"

    def __post_init__(self):
        _check(self.stress, STRESS_UNITS, "output stress unit")
        _check(self.length, LENGTH_UNITS, "output length unit")

    def __str__(self) -> str:
        return f"{self.stress},{self.length}"


def _canonical(word: str) -> tuple[str, str] | None:
    """('stress'|'length', canonical name) for a unit name in any letter case, else None."""
    low = word.lower()
    for kind, names in (("stress", STRESS_UNITS), ("length", LENGTH_UNITS)):
        for name in names:
            if name.lower() == low:
                return kind, name
    return None


def parse_output_units(text: str, default: OutputUnits | None = None, *, item: str = "--units") -> OutputUnits:
    """``"MPa,mm"`` / ``"ksi,in"`` / ``"psi"`` -> :class:`OutputUnits` (syntax in the module docstring).

    With one item, the other quantity comes from ``default``; without a default both must be given.
    """
    words = [w.strip() for w in str(text).split(",")]
    hint = "write STRESS,LENGTH, e.g. MPa,mm or ksi,in"
    allowed = f"stress: {', '.join(STRESS_UNITS)}; length: {', '.join(LENGTH_UNITS)}"
    if not 1 <= len(words) <= 2 or any(not w for w in words):
        raise InputError(f"expected one or two units separated by a comma, got {text!r}", item=item, hint=hint)
    chosen: dict[str, str] = {}
    for w in words:
        found = _canonical(w)
        if found is None:
            raise InputError(f"unknown unit {w!r}; allowed {allowed}", item=item, hint=hint)
        kind, name = found
        if kind in chosen:
            raise InputError(f"two {kind} units given ({chosen[kind]} and {name})", item=item, hint=hint)
        chosen[kind] = name
    missing = [k for k in ("stress", "length") if k not in chosen]
    if missing and default is None:
        raise InputError(f"no {missing[0]} unit given in {text!r}", item=item, hint=hint)
    for k in missing:
        chosen[k] = getattr(default, k)
    return OutputUnits(stress=chosen["stress"], length=chosen["length"])


# --- conversion factors --------------------------------------------------------------------------

@functools.lru_cache(maxsize=1)
def _registry():
    """One pint registry (building one takes a few tenths of a second). Memoised; never modified."""
    import pint

    return pint.UnitRegistry()


@functools.lru_cache(maxsize=256)
def _factor(source: str, target: str) -> float:
    """Multiplier taking a number in pint unit expression ``source`` to ``target``. Memoised pure function."""
    ureg = _registry()
    return float(ureg.Quantity(1.0, source).to(target).magnitude)


def length_factor(case_length: str, out_length: str) -> float:
    """Multiplier from the case's length unit to an output length unit."""
    _check(case_length, CASE_LENGTH_UNITS, "case length unit")
    _check(out_length, LENGTH_UNITS, "output length unit")
    return _factor(_PINT[case_length], _PINT[out_length])


def stress_factor(case_length: str, case_force: str, out_stress: str) -> float:
    """Multiplier from the case's stress unit (force / length^2) to an output stress unit."""
    _check(case_length, CASE_LENGTH_UNITS, "case length unit")
    _check(case_force, CASE_FORCE_UNITS, "case force unit")
    _check(out_stress, STRESS_UNITS, "output stress unit")
    return _factor(f"{_PINT[case_force]} / {_PINT[case_length]} ** 2", _PINT[out_stress])


def case_output_units(case_length: str, case_force: str) -> OutputUnits:
    """The output units that show a case's numbers unchanged, or as nearly so as the offered units allow:
    the case's length unit, and the stress unit whose factor is nearest to 1 (N/mm^2 -> MPa,
    kip/in^2 -> ksi, N/cm^2 -> kPa), taken from the case's own system (SI units for an SI case, psi or
    ksi for an inch-pound case, any for a mixed one). A natural default for :func:`parse_output_units`."""
    si = case_length != "in" and case_force in ("N", "kN", "MN")
    us = case_length == "in" and case_force in ("lbf", "kip")
    candidates = [u for u in STRESS_UNITS if (u in ("psi", "ksi")) == us] if (si or us) else list(STRESS_UNITS)
    best = min(candidates, key=lambda u: abs(math.log10(stress_factor(case_length, case_force, u))))
    return OutputUnits(stress=best, length=case_length)


@dataclass(frozen=True)
class Converter:
    """Fixed factors from one case's units to one choice of output units; multiply numbers or arrays."""

    output: OutputUnits
    stress_factor: float
    length_factor: float

    def stress(self, values):
        """Stresses in the case's unit -> output stress unit (float for a scalar, ndarray otherwise)."""
        return _scale(values, self.stress_factor)

    def length(self, values):
        """Lengths (or coordinates, displacements) in the case's unit -> output length unit."""
        return _scale(values, self.length_factor)


def _scale(values, factor: float):
    arr = np.asarray(values, dtype=float) * factor
    return float(arr) if arr.ndim == 0 else arr


def converter(case_length: str, case_force: str, output: OutputUnits) -> Converter:
    """The :class:`Converter` from a case's (length, force) units to ``output``."""
    return Converter(output, stress_factor(case_length, case_force, output.stress),
                     length_factor(case_length, output.length))


# --- formatting ----------------------------------------------------------------------------------

def _group(int_digits: str, sep: str) -> str:
    if not sep or len(int_digits) < 5:
        return int_digits
    head = len(int_digits) % 3 or 3
    parts = [int_digits[:head]] + [int_digits[i:i + 3] for i in range(head, len(int_digits), 3)]
    return sep.join(parts)


def _fixed(mantissa_digits: str, exponent: int, sign: str, group: str) -> str:
    """Digits d1d2...dn meaning d1.d2...dn x 10^exponent, written without an exponent."""
    n = len(mantissa_digits)
    point = exponent + 1  # digits before the decimal point
    if point <= 0:
        int_part, frac = "0", "0" * (-point) + mantissa_digits
    elif point >= n:
        int_part, frac = mantissa_digits + "0" * (point - n), ""
    else:
        int_part, frac = mantissa_digits[:point], mantissa_digits[point:]
    text = _group(int_part, group) + ("." + frac if frac else "")
    return sign + text


def _split(x: float, digits: int) -> tuple[str, str, int]:
    """Sign, significant digits (exactly ``digits`` of them) and decimal exponent of x rounded."""
    mant, exp = f"{abs(x):.{digits - 1}e}".split("e")
    return ("-" if x < 0 else ""), mant.replace(".", ""), int(exp)


def engineering(x: float, digits: int = 4, *, group: str = NARROW_NBSP) -> str:
    """A number for a report (rules in the module docstring): ``59873.2 -> '59 870'``, ``1.234e7 -> '12.34×10⁶'``."""
    if digits < 1:
        raise ValueError(f"digits must be at least 1, got {digits}")
    x = float(x)
    if not math.isfinite(x):
        return "nan" if math.isnan(x) else ("inf" if x > 0 else "-inf")
    if x == 0.0:
        return _fixed("0" * digits, 0, "", group)
    sign, mant, exp = _split(x, digits)
    if -3 <= exp <= 5:
        return _fixed(mant, exp, sign, group)
    e3 = 3 * (exp // 3)
    return _fixed(mant, exp - e3, sign, group) + "×10" + str(e3).translate(_SUPERSCRIPT)


def unit_free(x: float, digits: int = 3) -> str:
    """A dimensionless ratio such as Kt to ``digits`` significant digits: ``2.5169 -> '2.52'``, ``3 -> '3.00'``.

    Same rules as :func:`engineering` (which it uses for values outside 0.001 .. 1e6)."""
    return engineering(x, digits)
