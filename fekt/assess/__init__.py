"""Strength and fatigue assessment of stress peaks: pure functions of numbers (no FE, no meshes, no I/O).

* :mod:`.material`: strengths (:class:`Strengths`), unit scales, published estimates of missing values;
* :mod:`.notch`: notch sensitivity q and Kf by Peterson, Neuber/Kuhn-Hardrath and Heywood;
* :mod:`.gradient`: relative stress gradient (fit of a sampled field, chart approximation), the FKM and
  Siebel-Stieler support factors, Kf = Kt / n;
* :mod:`.fatigue`: mean and alternating stress of a cycle, fatigue safety factors (modified Goodman,
  Gerber, ASME elliptic, Soderberg) and first-cycle yield (Langer);
* :mod:`.static`: peak and net-section stress against yield;
* :mod:`.assessment`: every peak of a solved result through them (static checks, Kf side by side, the
  local cycle and its safety factors, the governing peak); import it explicitly
  (``from fekt.assess.assessment import assess``).

Notch-factor methods are empirical: check against the applicable design code and test data.
"""

from .fatigue import (
    COMPRESSIVE_MEAN_RULE, DEFAULT_CRITERIA, LOAD_LINE, SPECIMEN_CAUTION, Criterion, CriterionResult, Cycle,
    FatigueCheck, FirstCycleYield, StressBasis, asme_elliptic_factor, cycle_from_extremes,
    cycle_from_mean_amplitude, fatigue_check, gerber_factor, goodman_factor, langer_factor, notched_cycle,
    soderberg_factor,
)
from .gradient import (
    ChartGradient, GradientFit, SupportFactor, chart_gradient, fkm_notch_factor, fkm_support_factor,
    relative_gradient, sample_depths, siebel_stieler_notch_factor, siebel_stieler_support_factor,
)
from .material import (
    MM_MPA, Estimate, EstimateRule, FatigueBasis, MaterialGroup, Strengths, UnitScale,
    estimate_fatigue_strength, require, resolve_fatigue_strength, unit_scale,
)
from .notch import (
    ConstantOrigin, Loading, MaterialConstant, NotchFactor, NotchMethod, NotchShape, heywood,
    heywood_constant_steel, heywood_kf, kf_from_q, neuber, neuber_constant_steel, neuber_q, peterson,
    peterson_constant_steel, peterson_q,
)
from .static import STATIC_PEAK_NOTE, StaticCheck, StaticKind, net_section_check, static_peak_check

#: printed with every assessment table
CAUTION = ("Notch-factor methods and mean-stress criteria are empirical: check the numbers against the "
           "applicable design code and test data.")

__all__ = [
    "CAUTION", "COMPRESSIVE_MEAN_RULE", "DEFAULT_CRITERIA", "LOAD_LINE", "MM_MPA", "SPECIMEN_CAUTION",
    "STATIC_PEAK_NOTE",
    "ChartGradient", "ConstantOrigin", "Criterion", "CriterionResult", "Cycle", "Estimate", "EstimateRule",
    "FatigueBasis", "FatigueCheck", "FirstCycleYield", "GradientFit", "Loading", "MaterialConstant",
    "MaterialGroup", "NotchFactor", "NotchMethod", "NotchShape", "StaticCheck", "StaticKind", "Strengths",
    "StressBasis", "SupportFactor", "UnitScale",
    "asme_elliptic_factor", "chart_gradient", "cycle_from_extremes", "cycle_from_mean_amplitude",
    "estimate_fatigue_strength", "fatigue_check", "fkm_notch_factor", "fkm_support_factor", "gerber_factor",
    "goodman_factor", "heywood", "heywood_constant_steel", "heywood_kf", "kf_from_q", "langer_factor",
    "net_section_check", "neuber", "neuber_constant_steel", "neuber_q", "notched_cycle", "peterson",
    "peterson_constant_steel", "peterson_q", "relative_gradient", "require", "resolve_fatigue_strength",
    "sample_depths", "siebel_stieler_notch_factor", "siebel_stieler_support_factor", "soderberg_factor",
    "static_peak_check", "unit_scale",
]
