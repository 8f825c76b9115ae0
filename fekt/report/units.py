"""Output units: converting stresses and lengths from a case's units, and formatting numbers for reports.

A case states its length unit (mm, cm, m, in) and force unit (N, kN, MN, lbf, kip); its stresses are
force / length^2. Reports may show results in other units, chosen with :class:`OutputUnits`:

* stress: Pa, kPa, MPa, GPa, psi, ksi
* length: mm, cm, m, in

Conversion factors come from pint (a general units library) and are computed once per pair of units;
arrays are then simply multiplied by the factor (see :class:`Converter`).

The syntax parsed by :func:`parse_output_units` (``--units`` and the case file's ``[units] output``) is
``STRESS,LENGTH`` -- for example ``MPa,mm`` or ``ksi,in``. The two items may come in either order (no
stress unit has the name of a length unit), spaces around them are ignored, and letter case is not
significant (``mpa,MM`` means ``MPa,mm``). One item alone sets that quantity and takes the other one from
``default``. It lives in :mod:`fekt.case.output_units` (the case loader checks the key with it) and is
re-exported here.

Whole results: :func:`convert_result` gives a :class:`fekt.records.Result` with every stress, length,
area, second moment, force and moment in the output units (forces in :func:`force_unit`), so every
printer (text, JSON, HTML) shows them; :func:`convert_study` and :func:`convert_points` do the same for
refinement studies and sweep points, :func:`convert_assessment` for the strength and fatigue assessment (gradients in
1/length). Kt values never change. Every field of every record is listed with
its dimension in ``_RECORD_FIELDS``; a field missing from the list stops the conversion with a message
rather than being shown in the case's units.

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

import dataclasses
import functools
import math
from dataclasses import dataclass

import numpy as np

from ..case.output_units import (LENGTH_UNITS, STRESS_UNITS, OutputUnits, check_unit,  # noqa: F401
                                  parse_output_units)

#: units a case may state (the same lists as :mod:`fekt.case.schema`)
CASE_LENGTH_UNITS = ("mm", "cm", "m", "in")
CASE_FORCE_UNITS = ("N", "kN", "MN", "lbf", "kip")

#: our unit names -> pint expressions (spelled out so no short name is ever read in another sense)
_PINT = {
    "mm": "millimeter", "cm": "centimeter", "m": "meter", "in": "inch",
    "N": "newton", "kN": "kilonewton", "MN": "meganewton", "lbf": "force_pound", "kip": "kip",
    "Pa": "pascal", "kPa": "kilopascal", "MPa": "megapascal", "GPa": "gigapascal", "psi": "psi", "ksi": "ksi",
}

NARROW_NBSP = "\u202f"
_SUPERSCRIPT = str.maketrans("-0123456789", "⁻⁰¹²³⁴⁵⁶⁷⁸⁹")


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
    check_unit(case_length, CASE_LENGTH_UNITS, "case length unit")
    check_unit(out_length, LENGTH_UNITS, "output length unit")
    return _factor(_PINT[case_length], _PINT[out_length])


def stress_factor(case_length: str, case_force: str, out_stress: str) -> float:
    """Multiplier from the case's stress unit (force / length^2) to an output stress unit."""
    check_unit(case_length, CASE_LENGTH_UNITS, "case length unit")
    check_unit(case_force, CASE_FORCE_UNITS, "case force unit")
    check_unit(out_stress, STRESS_UNITS, "output stress unit")
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


# --- whole result records ------------------------------------------------------------------------
#
# Every field of every record a result holds is listed below with its dimension, so that a field added
# to a record later stops the conversion with a message instead of slipping through in the case's
# units (a plausible wrong number). Dimensions: S stress, L length, L2 area, L4 second moment,
# F force, M moment, "-" unchanged (ratios such as Kt, counts, text, times), R a nested record
# (converted by its own entry), Q a load component's magnitude (dimension named by its quantity).

_RECORD_FIELDS: dict[str, dict[str, str]] = {
    "Result": {"case_name": "-", "source": "-", "demo": "-", "units": "-", "model": "-", "model_label": "-",
               "thickness": "L", "material": "R", "load": "R", "mesh": "R", "timings": "R", "peaks": "R",
               "most_compressive": "R", "warnings": "-", "notes": "-", "caution": "-", "provenance": "R",
               "measure": "-", "estimate": "R", "family_check": "R", "coordinates": "-", "nominal_rule": "-",
               "load_cases": "R", "contacts": "R", "schema": "-"},
    "LoadCaseRecord": {"name": "-", "factors": "-", "peaks": "R", "most_compressive": "R", "contacts": "R"},
    "ContactRecord": {"load": "-", "case": "-", "arc_from": "-", "arc_to": "-", "nodes": "-", "iterations": "-",
                      "overlap": "L", "pin_displacement": "L"},
    "LoadFacts": {"axis": "-", "force": "F", "ends": "R", "components": "R"},
    "EndFacts": {"name": "-", "width": "L", "moment": "M", "centroid": "L"},
    "ComponentFacts": {"name": "-", "load": "-", "quantity": "-", "magnitude": "Q"},
    "MeshFacts": {"elements": "-", "nodes": "-", "dofs": "-", "element": "-", "min_scaled_jacobian": "-",
                  "size_max": "L", "feature_sizes": "L", "elements_per_radius": "-", "refine": "-", "area": "L2",
                  "solver": "-"},
    "StressPeak": {"rank": "-", "x": "L", "y": "L", "feature": "-", "feature_kind": "-", "singular": "-",
                   "reason": "-", "peak": "S", "radius": "L", "element_size": "L", "net_section": "R", "N": "F",
                   "M": "M", "sigma_nom_net": "S", "kt_net": "-", "gross_section": "R", "gross_rule": "-",
                   "sigma_nom_gross": "S", "kt_gross": "-", "equilibrium_error": "-", "scatter": "S",
                   "components": "R", "band": "R", "chart": "R", "component_charts": "R", "T": "M",
                   "theta": "-", "introduction": "-", "nominal_source": "-", "gradient": "R"},
    "PeakGradient": {"chi": "1/L", "surface": "S", "depth": "L", "half_width": "L", "radius": "L", "coordinate": "-",
                     "degree": "-", "points": "-", "error_estimate": "1/L", "reason": "-"},
    "ComponentKt": {"name": "-", "quantity": "-", "stress": "S", "sigma_nom_net": "S", "kt_net": "-",
                    "sigma_nom_gross": "S", "kt_gross": "-", "load": "-"},
    "SectionRecord": {"s": "L", "width": "L", "area": "L2", "centroid": "L", "inertia": "L4", "intervals": "L",
                      "polar": "L4"},
    "Compressive": {"sigma": "S", "x": "L", "y": "L"},
    # chart dimensions (d, W, D, r, H, t, a, b) are lengths; everything else of a chart check is a ratio
    "ChartCheck": {"kind": "-", "family": "-", "load": "-", "fit": "-", "source": "-", "confidence": "-",
                   "from_memory": "-", "basis": "-", "nominal": "-", "dims": "L", "chart_kt": "-", "fe_kt": "-",
                   "difference_pct": "-", "band_pct": "-", "within_band": "-", "coverage": "-",
                   "coverage_notes": "-", "ratios": "-", "chart_kt_net": "-", "component": "-"},
    "NoChart": {"reason": "-", "detail": "-", "family": "-", "load": "-", "component": "-"},
    # records that hold no stress or length at all (listed so that a new field is noticed)
    "Band": {"verdict": "-", "method": "-", "kt_net": "-", "kt_gross": "-", "values_fine_to_coarse": "-",
             "dofs_fine_to_coarse": "-", "observed_order": "-", "order_used": "-", "gci_fs": "-",
             "extrapolated": "-", "convergence_band": "-", "scatter_floor": "-", "largest_change": "-",
             "formal_order": "-"},
    "Timings": {"geometry_s": "-", "mesh_s": "-", "assemble_s": "-", "solve_s": "-", "post_s": "-", "total_s": "-",
                "estimate_s": "-", "charts_s": "-", "wall_s": "-"},
    "Provenance": {"versions": "-", "case_sha256_16": "-", "max_reaction_over_load": "-"},
    "UnitsRecord": {"length": "-", "force": "-", "stress": "-", "moment": "-"},
    "EstimateFacts": {"method": "-", "ratio": "-", "coarse_dofs": "-", "coarse_seconds": "-"},
    "FamilyCheck": {"family": "-", "load": "-", "peak_rank": "-", "no_chart": "R"},
    # a refinement study (fekt.studies.convergence): only the peak locations have a unit
    "Study": {"case_name": "-", "demo": "-", "ratio": "-", "nested": "-", "formal_order": "-", "policy": "-",
              "levels": "R", "spots": "R", "seconds": "-", "caution": "-", "schema": "-"},
    "SpotStudy": {"rank": "-", "key": "-", "x": "L", "y": "L", "singular": "-", "values": "-", "sizes": "-",
                  "dofs": "-", "verdict": "-", "estimate": "-", "band": "-", "extrapolated": "-",
                  "gross_over_net": "-", "convergence_band": "-", "scatter_floor": "-", "largest_change": "-"},
    "LevelFacts": {"level": "-", "elements_per_radius": "-", "refine": "-", "elements": "-", "dofs": "-",
                   "relative_size": "-", "seconds": "-"},
    # sweeps and goal-seeking (fekt.studies.sweep): parameter values stay as the case file gives them
    # (a parameter may be a length, a ratio or a stress; fekt cannot tell)
    "PointResult": {"index": "-", "values": "-", "parameters": "-", "status": "-", "message": "-", "feature": "-",
                    "kt_net": "-", "kt_net_band": "-", "kt_gross": "-", "kt_gross_band": "-", "chart_kt": "-",
                    "chart_basis": "-", "peak": "S", "seconds": "-", "peaks": "R"},
    "PeakSummary": {"rank": "-", "feature": "-", "kind": "-", "peak": "S", "kt_net": "-", "kt_net_band": "-",
                    "kt_gross": "-", "kt_gross_band": "-", "singular": "-"},
    "TargetResult": {"name": "-", "target": "-", "basis": "-", "feature": "-", "reached": "-", "value": "-",
                     "keeps_below": "-", "kt": "-", "kt_band": "-", "value_band": "-", "evaluations": "-",
                     "history": "R", "stop_reason": "-", "peak": "S"},
    "SearchPoint": {"value": "-", "status": "-", "kt": "-", "band": "-", "message": "-", "peak": "S"},
    # the strength and fatigue assessment (fekt.assess.assessment); Kf, q, support factors and safety factors
    # are ratios; an estimate's value has the dimension its record names (D)
    "Assessment": {"case_name": "-", "source": "-", "demo": "-", "units": "-", "strengths": "R", "estimates": "R",
                   "cycle": "-", "notch_factor": "-", "criteria": "-", "peaks": "R", "static_peak_governing": "R",
                   "static_net_governing": "R", "fatigue_governing": "R", "notes": "-", "cautions": "-", "schema": "-"},
    "StrengthFacts": {"yield_strength": "S", "ultimate_strength": "S", "fatigue_strength": "S", "fatigue_basis": "-",
                      "peterson_a": "L", "neuber_rho": "L", "siebel_sg": "L", "group": "-"},
    "EstimateRecord": {"quantity": "-", "value": "D", "dimension": "-", "rule": "-", "source": "-", "from_memory": "-",
                       "inputs": "-", "notes": "-"},
    "PeakAssessment": {"rank": "-", "feature": "-", "feature_kind": "-", "singular": "-", "x": "L", "y": "L",
                       "radius": "L", "kt": "-", "peak": "S", "sigma_nom_net": "S", "loading": "-", "shape": "-",
                       "relative_gradient": "R", "notch_factors": "R", "kf_spread": "R", "static_peak": "R",
                       "static_net": "R", "fatigue": "R", "reason": "-"},
    "KfSpread": {"low_method": "-", "low": "-", "high_method": "-", "high": "-", "spread_pct": "-"},
    "GradientCheck": {"fe": "1/L", "fe_error": "1/L", "chart": "1/L", "chart_formula": "-", "chart_source": "-",
                      "difference_pct": "-", "notes": "-", "reason": "-"},
    "NotchFactorRecord": {"method": "-", "kf": "-", "q": "-", "formula": "-", "constant": "-", "constant_value": "L",
                          "constant_origin": "-", "support_factor": "-", "relative_gradient": "1/L", "notes": "-",
                          "reason": "-"},
    "StaticRecord": {"kind": "-", "stress": "S", "yield_strength": "S", "factor": "-", "note": "-", "reason": "-"},
    "FatigueRecord": {"notch_method": "-", "kf": "-", "local_ratio": "-", "nominal_max": "S", "nominal_min": "S",
                      "elastic_max": "S", "elastic_min": "S", "local_max": "S", "local_min": "S", "local_mean": "S",
                      "local_amplitude": "S", "fatigue_strength": "S", "criteria": "R", "governing": "-",
                      "governing_factor": "-", "first_cycle_yield": "-", "notes": "-"},
    "CriterionRecord": {"criterion": "-", "factor": "-", "compressive_mean": "-", "reason": "-"},
    "Governing": {"rank": "-", "feature": "-", "check": "-", "factor": "-"},
}
#: the dimension of an estimated value, by the dimension its record names
_ESTIMATE = {"stress": "S", "length": "L"}

#: the force unit that goes with a pair of output units when stress x length^2 is exactly that force
_FORCE_OF = {("Pa", "m"): "N", ("kPa", "m"): "kN", ("MPa", "m"): "MN", ("MPa", "mm"): "N", ("GPa", "mm"): "kN",
             ("psi", "in"): "lbf", ("ksi", "in"): "kip"}
#: the dimension of a load component's magnitude, by its quantity
_QUANTITY = {"force": "F", "moment": "M", "torque": "M", "stress": "S", "pressure": "S", "shear": "S",
             "end load": "F"}


def force_unit(output: OutputUnits) -> str:
    """The force unit shown with ``output``: the one equal to stress x length^2 where there is one
    (MPa and mm -> N, ksi and in -> kip), otherwise the newton for SI stress units and the pound-force
    for psi and ksi (moments are then in that force times the output length)."""
    return _FORCE_OF.get((output.stress, output.length), "lbf" if output.stress in ("psi", "ksi") else "N")


@dataclass(frozen=True)
class RecordUnits:
    """Factors from the units a record's numbers are in to ``output`` (one per dimension)."""

    output: OutputUnits
    force: str
    factors: dict[str, float]

    @property
    def moment(self) -> str:
        return f"{self.force}*{self.output.length}"

    def scale(self, value, dim: str):
        """A value of dimension ``dim`` in the output units: numbers, None, and tuples or dicts of them."""
        if dim == "-" or value is None:
            return value
        if isinstance(value, dict):
            return {k: self.scale(v, dim) for k, v in value.items()}
        if isinstance(value, (tuple, list)):
            return tuple(self.scale(v, dim) for v in value)
        if isinstance(value, bool) or not isinstance(value, (int, float, np.floating, np.integer)):
            raise TypeError(f"cannot convert {type(value).__name__} {value!r} as a {dim} quantity")
        return float(value) * self.factors[dim]


def record_units(length: str, force: str, stress: str, output: OutputUnits) -> RecordUnits:
    """Factors from numbers given with these length, force and stress labels to ``output``.

    The stress factor comes from the stress label when it is a unit reports offer (so a result already
    converted to, say, ksi with mm converts again correctly), otherwise from force / length^2."""
    out_force = force_unit(output)
    check_unit(length, CASE_LENGTH_UNITS, "length unit of the result")
    check_unit(force, CASE_FORCE_UNITS, "force unit of the result")
    fl = length_factor(length, output.length)
    ff = _factor(_PINT[force], _PINT[out_force])
    fs = (_factor(_PINT[stress], _PINT[output.stress]) if stress in STRESS_UNITS
          else stress_factor(length, force, output.stress))
    return RecordUnits(output, out_force, {"S": fs, "L": fl, "L2": fl * fl, "L4": fl ** 4, "F": ff, "M": ff * fl,
                                           "1/L": 1.0 / fl})


def _convert(record, ru: RecordUnits):
    """A copy of a frozen record (or a tuple of them) with every field in the output units."""
    if isinstance(record, tuple):
        return tuple(_convert(r, ru) for r in record)
    if record is None:
        return None
    name = type(record).__name__
    table = _RECORD_FIELDS.get(name)
    if table is None:
        raise TypeError(f"no unit table for a {name} record (add it to fekt.report.units._RECORD_FIELDS)")
    changes = {}
    for f in dataclasses.fields(record):
        dim = table.get(f.name)
        if dim is None:
            raise TypeError(f"{name}.{f.name}: its dimension is not known to the unit conversion (add it to "
                            "fekt.report.units._RECORD_FIELDS); refusing to show it in the case's units")
        value = getattr(record, f.name)
        if dim == "R":
            changes[f.name] = _convert(value, ru) if f.name != "material" else _material(value, ru)
        elif dim == "Q":
            q = _QUANTITY.get(record.quantity)
            if q is None:
                raise TypeError(f"load component '{record.name}': cannot convert a {record.quantity!r} magnitude")
            changes[f.name] = ru.scale(value, q)
        elif dim == "D":
            d = _ESTIMATE.get(record.dimension)
            if d is None:
                raise TypeError(f"estimate '{record.quantity}': cannot convert a {record.dimension!r} value")
            changes[f.name] = ru.scale(value, d)
        elif dim != "-":
            changes[f.name] = ru.scale(value, dim)
    return dataclasses.replace(record, **changes) if changes else record


def _material(material: dict, ru: RecordUnits) -> dict:
    known = {"E": "S", "G": "S", "nu": "-"}
    unknown = [k for k in material if k not in known]
    if unknown:
        raise TypeError(f"material constant(s) {', '.join(unknown)}: dimension not known to the unit conversion")
    return {k: ru.scale(v, known[k]) for k, v in material.items()}


def units_note(result_units, ru: RecordUnits) -> str:
    """The note a converted result carries: which units its numbers are in, and what stays in the case's."""
    return (f"Numbers are shown in {ru.output.stress} and {ru.output.length} (forces in {ru.force}, moments in "
            f"{ru.moment}); the case file gives lengths in {result_units.length} and forces in "
            f"{result_units.force}. Feature names, warnings and notes quote coordinates and lengths in the "
            "case file's units; Kt values are ratios and do not change.")


def convert_result(result, output: OutputUnits):
    """``result`` (a :class:`fekt.records.Result`) with every stress, length, area, second moment, force
    and moment in ``output`` (forces in :func:`force_unit`); Kt values, ratios, counts and times unchanged.
    Its ``units`` record names the new units, and a note says what the case file's units were (warnings
    and feature names are text written in the case's units). Converting twice equals converting once."""
    u = result.units
    ru = record_units(u.length, u.force, u.stress, output)
    same = (u.length, u.force, u.stress) == (output.length, ru.force, output.stress)
    converted = _convert(result, ru)
    if same:
        return converted
    notes = tuple(n for n in result.notes if not n.startswith("Numbers are shown in "))
    return dataclasses.replace(converted, units=type(u)(output.length, ru.force, output.stress, ru.moment),
                               notes=notes + (units_note(u, ru),))


def convert_assessment(assessment, output: OutputUnits):
    """An assessment (:class:`fekt.records.Assessment`) with every stress, length and gradient (1/length) in
    ``output``; Kt, Kf, q, support and safety factors unchanged. Its ``units`` record names the new units."""
    u = assessment.units
    ru = record_units(u.length, u.force, u.stress, output)
    converted = _convert(assessment, ru)
    if (u.length, u.force, u.stress) == (output.length, ru.force, output.stress):
        return converted
    return dataclasses.replace(converted, units=type(u)(output.length, ru.force, output.stress, ru.moment),
                               notes=converted.notes + (units_note(u, ru),))


def convert_study(study, length: str, force: str, stress: str, output: OutputUnits):
    """A refinement study (:class:`fekt.studies.convergence.Study`) with its peak locations in ``output``
    (its other numbers are Kt values, counts, relative sizes and times). ``length``, ``force``, ``stress``:
    the case's unit labels."""
    return _convert(study, record_units(length, force, stress, output))


def convert_points(points, length: str, force: str, stress: str, output: OutputUnits):
    """Sweep points or a goal-seeking answer (:mod:`fekt.studies.sweep`) with peak stresses in ``output``;
    parameter values stay as the case file gives them."""
    ru = record_units(length, force, stress, output)
    return _convert(tuple(points), ru) if isinstance(points, (list, tuple)) else _convert(points, ru)


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
