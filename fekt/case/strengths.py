"""The assessment's inputs in a case file: strengths in ``[material]``, ``[cycle]`` and ``[assessment]``.

All optional: a case without them solves as before, and only ``fekt assess`` asks for them (naming the
missing keys). Values are checked here, when the file is read: strengths and material lengths positive
and finite, yield and fatigue strength not above the ultimate strength, names from their lists, a cycle
given one way with its maximum not below its minimum.
"""

from __future__ import annotations

from collections.abc import Mapping

from fekt.case import fields as F
from fekt.case.schema import (CRITERIA_CHOICES, FATIGUE_BASES, MATERIAL_GROUPS, NOTCH_FACTOR_CHOICES, AssessmentSpec,
                              CycleSpec)
from fekt.errors import CaseError

#: stresses and lengths among the strength keys (both must be > 0)
STRESS_KEYS = ("yield_strength", "ultimate_strength", "fatigue_strength")
LENGTH_KEYS = ("peterson_a", "neuber_rho", "siebel_sg")
CYCLE_KEYS = ("max_factor", "min_factor", "mean_factor", "alternating_factor", "max_case", "min_case")
ASSESSMENT_KEYS = ("notch_factor", "criteria")


def strengths(table: Mapping[str, object], params: Mapping[str, float]) -> dict[str, object]:
    """The strength entries of a ``[material]`` table (only those given), checked."""
    out: dict[str, object] = {}
    for key in STRESS_KEYS + LENGTH_KEYS:
        if key in table:
            out[key] = F.positive(table[key], params, f"material.{key}")
    if "group" in table:
        out["group"] = F.choice(table["group"], MATERIAL_GROUPS, "material.group")
    if "fatigue_basis" in table:
        if "fatigue_strength" not in table:
            raise CaseError("fatigue_basis says what fatigue_strength is, but no fatigue_strength is given",
                            item="material.fatigue_basis", hint="give material.fatigue_strength or remove the key")
        out["fatigue_basis"] = F.choice(table["fatigue_basis"], FATIGUE_BASES, "material.fatigue_basis")
    sy, su, se = (out.get(k) for k in STRESS_KEYS)
    if sy is not None and su is not None and sy > su:
        raise CaseError(f"yield_strength {sy:.6g} is larger than ultimate_strength {su:.6g}",
                        item="material.yield_strength", hint="check the two values and their units")
    if se is not None and su is not None and se > su:
        raise CaseError(f"fatigue_strength {se:.6g} is larger than ultimate_strength {su:.6g}",
                        item="material.fatigue_strength", hint="check the two values and their units")
    return out


def cycle(raw: object, params: Mapping[str, float]) -> CycleSpec:
    """``[cycle]``: ``max_factor`` and ``min_factor``, or ``mean_factor`` and ``alternating_factor``, on the
    case's load."""
    table = F.table(raw, "cycle")
    F.check_keys(table, CYCLE_KEYS, "cycle")
    extremes = [k for k in ("max_factor", "min_factor") if k in table]
    mean = [k for k in ("mean_factor", "alternating_factor") if k in table]
    cases = [k for k in ("max_case", "min_case") if k in table]
    if cases:
        if extremes or mean:
            raise CaseError("give the cycle either as two load cases (max_case, min_case) or as factors, not both",
                            item=f"cycle.{cases[0]}")
        for key in ("max_case", "min_case"):
            F.required(table, key, "cycle")
        hi, lo = (F.name(table[k], f"cycle.{k}") for k in ("max_case", "min_case"))
        return CycleSpec(1.0, 1.0, "cases", max_case=hi, min_case=lo)
    if extremes and mean:
        raise CaseError(f"give the cycle either as max_factor and min_factor or as mean_factor and "
                        f"alternating_factor, not both ({', '.join(extremes + mean)} given)", item=f"cycle.{mean[0]}")
    if mean:
        for key in ("mean_factor", "alternating_factor"):
            F.required(table, key, "cycle")
        m = F.number(table["mean_factor"], params, "cycle.mean_factor")
        a = F.number(table["alternating_factor"], params, "cycle.alternating_factor")
        if a < 0:
            raise CaseError(f"alternating_factor {a:.6g} must be zero or positive (it is half the range)",
                            item="cycle.alternating_factor")
        hi, lo, form = m + a, m - a, "mean"
    else:
        if not extremes:
            raise CaseError("a cycle needs max_factor and min_factor (or mean_factor and alternating_factor)",
                            item="cycle.max_factor")
        for key in ("max_factor", "min_factor"):
            F.required(table, key, "cycle")
        hi = F.number(table["max_factor"], params, "cycle.max_factor")
        lo = F.number(table["min_factor"], params, "cycle.min_factor")
        if hi < lo:
            raise CaseError(f"max_factor {hi:.6g} is below min_factor {lo:.6g}", item="cycle.max_factor",
                            hint="max_factor is the algebraically larger factor on the load")
        form = "extremes"
    if hi == 0 and lo == 0:
        raise CaseError("both ends of the cycle are zero: no load", item="cycle")
    return CycleSpec(max_factor=hi, min_factor=lo, form=form)


def assessment(raw: object) -> AssessmentSpec:
    """``[assessment]``: which notch factor sets the local cycle, and the mean-stress criteria."""
    table = F.table(raw, "assessment")
    F.check_keys(table, ASSESSMENT_KEYS, "assessment")
    default = AssessmentSpec()
    notch = (F.choice(table["notch_factor"], NOTCH_FACTOR_CHOICES, "assessment.notch_factor")
             if "notch_factor" in table else default.notch_factor)
    criteria = default.criteria
    if "criteria" in table:
        entries = F.array(table["criteria"], "assessment.criteria")
        if not entries:
            raise CaseError("give at least one criterion", item="assessment.criteria",
                            hint=f"choose from {', '.join(CRITERIA_CHOICES)}")
        criteria = tuple(F.choice(e, CRITERIA_CHOICES, F.path("assessment.criteria", i)) for i, e in enumerate(entries))
        for i, c in enumerate(criteria):
            if c in criteria[:i]:
                raise CaseError(f"criterion '{c}' is listed twice", item=f"assessment.criteria[{i}]")
    return AssessmentSpec(notch_factor=notch, criteria=criteria)


__all__ = ["ASSESSMENT_KEYS", "CYCLE_KEYS", "assessment", "cycle", "strengths"]
