"""Fatigue safety factors of a stress cycle by the mean-stress criteria in common use.

A cycle between sigma_max and sigma_min has the mean sigma_m = (max + min)/2 and the amplitude
(alternating stress) sigma_a = (max - min)/2. The stresses are what the caller passes: local (at the
peak, e.g. Kf times nominal, :func:`notched_cycle`) or nominal; the fatigue strength Se must be of the
matching kind (a notched-part strength with nominal stresses).

Safety factors n are along a load line of constant stress ratio R (:data:`LOAD_LINE`): the overload
scales sigma_a and sigma_m by the same n, and n solves the criterion for (n sigma_a, n sigma_m)
(Budynas & Nisbett, Shigley's Mechanical Engineering Design, 9th ed., section 6-12 on fluctuating
stresses; section number from memory):

* modified Goodman:  sigma_a/Se + sigma_m/Su = 1/n
* Gerber:            n sigma_a/Se + (n sigma_m/Su)^2 = 1
* ASME elliptic:     (n sigma_a/Se)^2 + (n sigma_m/Sy)^2 = 1
* Soderberg:         sigma_a/Se + sigma_m/Sy = 1/n
* first-cycle yield (Langer line): sigma_a + |sigma_m| = Sy/n, i.e. n = Sy / max(|sigma_max|, |sigma_min|).

Compressive mean stress (:data:`COMPRESSIVE_MEAN_RULE`): for sigma_m < 0 every fatigue criterion
becomes n = Se/sigma_a; the beneficial effect of compression is ignored.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from enum import StrEnum

from ..errors import InputError
from .material import STEEL_GROUPS, Estimate, FatigueBasis, Strengths, UnitScale, resolve_fatigue_strength

LOAD_LINE = ("proportional overload: mean and alternating stress grow by the same factor "
             "(constant stress ratio R)")
COMPRESSIVE_MEAN_RULE = ("compressive mean stress: fatigue factor n = Se/sigma_a (mean stress ignored); "
                         "Budynas & Nisbett, Shigley's MED, 9th ed., section 6-12 (from memory)")
#: printed when the fatigue strength is a polished-specimen value (stated so, or estimated from Su)
SPECIMEN_CAUTION = ("the fatigue strength is a polished-specimen value, not corrected for surface finish, "
                    "size, load type, temperature or reliability: the fatigue safety factors are too high")
CRITERIA_SOURCE = "Budynas & Nisbett, Shigley's MED, 9th ed., section 6-12 (from memory)"


class StressBasis(StrEnum):
    LOCAL = "local"
    NOMINAL = "nominal"


class Criterion(StrEnum):
    GOODMAN = "modified Goodman"
    GERBER = "Gerber"
    ASME_ELLIPTIC = "ASME elliptic"
    SODERBERG = "Soderberg"


#: the criteria checked by default (the governing one is the smallest factor among them). Soderberg is
#: available on request: it always lies inside the modified Goodman line (Sy <= Su) and would govern.
DEFAULT_CRITERIA = (Criterion.GOODMAN, Criterion.GERBER, Criterion.ASME_ELLIPTIC)

#: strengths each criterion needs besides the fatigue strength
_NEEDS = {Criterion.GOODMAN: "ultimate_strength", Criterion.GERBER: "ultimate_strength",
          Criterion.ASME_ELLIPTIC: "yield_strength", Criterion.SODERBERG: "yield_strength"}


@dataclass(frozen=True)
class Cycle:
    """A stress cycle: extremes, mean and amplitude (>= 0), and whether it is local or nominal."""

    maximum: float
    minimum: float
    mean: float
    amplitude: float
    basis: StressBasis

    @property
    def ratio(self) -> float | None:
        """Stress ratio R = sigma_min / sigma_max (None when sigma_max = 0)."""
        return None if self.maximum == 0 else self.minimum / self.maximum


def _finite(name: str, v: float) -> float:
    if isinstance(v, bool) or not isinstance(v, (int, float)) or not math.isfinite(v):
        raise InputError(f"{name} = {v!r} must be a finite number", item=name)
    return float(v)


def cycle_from_extremes(maximum: float, minimum: float, *, basis: StressBasis = StressBasis.LOCAL) -> Cycle:
    """The cycle between ``maximum`` and ``minimum`` (signed stresses; maximum >= minimum)."""
    hi, lo = _finite("maximum stress", maximum), _finite("minimum stress", minimum)
    if hi < lo:
        raise InputError(f"maximum stress {hi:g} is below minimum stress {lo:g}", item="cycle",
                         hint="the maximum of a cycle is its algebraically largest stress")
    return Cycle(hi, lo, 0.5 * (hi + lo), 0.5 * (hi - lo), StressBasis(basis))


def cycle_from_mean_amplitude(mean: float, amplitude: float, *,
                              basis: StressBasis = StressBasis.LOCAL) -> Cycle:
    """The cycle of a stated mean and amplitude (amplitude >= 0)."""
    m, a = _finite("mean stress", mean), _finite("stress amplitude", amplitude)
    if a < 0:
        raise InputError(f"stress amplitude {a:g} must be >= 0", item="stress amplitude")
    return Cycle(m + a, m - a, m, a, StressBasis(basis))


def notched_cycle(nominal: Cycle, kf: float) -> Cycle:
    """Local cycle at a notch: Kf times the nominal mean and amplitude (Kf applied to both components,
    as in Budynas & Nisbett, Shigley's MED, 9th ed., section 6-12, from memory; no local-yield correction)."""
    k = _finite("Kf", kf)
    if k < 1:
        raise InputError(f"Kf = {k:g} must be >= 1", item="Kf")
    return Cycle(k * nominal.maximum, k * nominal.minimum, k * nominal.mean, k * nominal.amplitude,
                 StressBasis.LOCAL)


# --- criteria (pure functions; None = no finite limit: no alternating and no tensile mean stress) ---

def _compressive(amplitude: float, se: float) -> float | None:
    return se / amplitude if amplitude > 0 else None


def goodman_factor(amplitude: float, mean: float, se: float, su: float) -> float | None:
    """Modified Goodman: n = 1 / (sigma_a/Se + sigma_m/Su) for sigma_m >= 0."""
    if mean < 0:
        return _compressive(amplitude, se)
    d = amplitude / se + mean / su
    return 1.0 / d if d > 0 else None


def gerber_factor(amplitude: float, mean: float, se: float, su: float) -> float | None:
    """Gerber: root of (sigma_m/Su)^2 n^2 + (sigma_a/Se) n - 1 = 0, for sigma_m >= 0.

    Evaluated as n = 2 / (B + sqrt(B^2 + 4A)), A = (sigma_m/Su)^2, B = sigma_a/Se: equal to the
    textbook form n = (1/2)(Su/sigma_m)^2 (sigma_a/Se)[-1 + sqrt(1 + (2 sigma_m Se/(Su sigma_a))^2)]
    and free of its cancellation at small sigma_m."""
    if mean < 0:
        return _compressive(amplitude, se)
    a, b = (mean / su) ** 2, amplitude / se
    d = b + math.sqrt(b * b + 4.0 * a)
    return 2.0 / d if d > 0 else None


def asme_elliptic_factor(amplitude: float, mean: float, se: float, sy: float) -> float | None:
    """ASME elliptic: n = 1 / sqrt((sigma_a/Se)^2 + (sigma_m/Sy)^2) for sigma_m >= 0."""
    if mean < 0:
        return _compressive(amplitude, se)
    d = math.hypot(amplitude / se, mean / sy)
    return 1.0 / d if d > 0 else None


def soderberg_factor(amplitude: float, mean: float, se: float, sy: float) -> float | None:
    """Soderberg: n = 1 / (sigma_a/Se + sigma_m/Sy) for sigma_m >= 0."""
    if mean < 0:
        return _compressive(amplitude, se)
    d = amplitude / se + mean / sy
    return 1.0 / d if d > 0 else None


def langer_factor(amplitude: float, mean: float, sy: float) -> float | None:
    """First-cycle yield (Langer line): n = Sy / (sigma_a + |sigma_m|) = Sy / max|sigma|."""
    d = amplitude + abs(mean)
    return sy / d if d > 0 else None


# --- records --------------------------------------------------------------------------------------

@dataclass(frozen=True)
class CriterionResult:
    """One criterion's fatigue safety factor (None with ``reason`` when there is no finite limit).
    ``strengths``: the (name, value) pairs used; ``compressive_mean``: the compressive-mean rule applied."""

    criterion: Criterion
    factor: float | None
    strengths: tuple[tuple[str, float], ...]
    compressive_mean: bool
    reason: str | None = None


@dataclass(frozen=True)
class FirstCycleYield:
    """First-cycle yield check by the Langer line: ``factor`` = Sy / ``max_abs_stress``."""

    factor: float | None
    yield_strength: float
    max_abs_stress: float
    rule: str = "Langer line: sigma_a + |sigma_m| = Sy"
    reason: str | None = None


@dataclass(frozen=True)
class FatigueCheck:
    """Fatigue safety factors of one cycle. ``governing``: the criterion with the smallest factor
    (None when no criterion gives a finite factor); ``fatigue_estimate``: set when Se was estimated;
    ``fatigue_basis``: what Se is (an estimate is always a specimen value); ``notes``: cautions."""

    cycle: Cycle
    fatigue_strength: float
    fatigue_estimate: Estimate | None
    fatigue_basis: FatigueBasis
    results: tuple[CriterionResult, ...]
    governing: Criterion | None
    governing_factor: float | None
    first_cycle_yield: FirstCycleYield | None
    load_line: str = LOAD_LINE
    notes: tuple[str, ...] = ()


_FUNCS = {Criterion.GOODMAN: goodman_factor, Criterion.GERBER: gerber_factor,
          Criterion.ASME_ELLIPTIC: asme_elliptic_factor, Criterion.SODERBERG: soderberg_factor}
_NO_LIMIT = "no alternating and no tensile mean stress: no finite fatigue limit"


def fatigue_check(cycle: Cycle, strengths: Strengths, *, units: UnitScale,
                  criteria: tuple[Criterion, ...] = DEFAULT_CRITERIA,
                  first_cycle_yield: bool = True) -> FatigueCheck:
    """Safety factors of ``cycle`` by each of ``criteria`` and the first-cycle yield check.

    The fatigue strength is the stated one or, for a steel, estimated from Su (the record says so).
    Refuses with one :class:`InputError` naming every strength the requested checks need and lack."""
    criteria = tuple(Criterion(c) for c in criteria)
    if not criteria:
        raise InputError("no fatigue criterion requested", item="criteria")
    needed = {_NEEDS[c] for c in criteria}
    if first_cycle_yield:
        needed.add("yield_strength")
    missing = [n for n in ("fatigue_strength", "ultimate_strength", "yield_strength")
               if (n in needed and getattr(strengths, n) is None)]
    if strengths.fatigue_strength is None and not (strengths.ultimate_strength is not None
                                                   and strengths.group in STEEL_GROUPS):
        missing.insert(0, "fatigue_strength")
    if missing:
        listed = ", ".join(f"material.{n}" for n in missing)
        raise InputError(f"the fatigue check ({', '.join(c.value for c in criteria)}"
                         f"{', first-cycle yield' if first_cycle_yield else ''}) needs {listed}, "
                         f"which {'is' if len(missing) == 1 else 'are'} not given", item=listed,
                         hint="state them in the material table (a steel's fatigue strength can be estimated "
                              "from its ultimate strength when the group is a steel)")
    se, estimate = resolve_fatigue_strength(strengths, units=units)
    sa, sm = cycle.amplitude, cycle.mean
    results = []
    for c in criteria:
        other = _NEEDS[c]
        ov = getattr(strengths, other)
        n = _FUNCS[c](sa, sm, se, ov)
        results.append(CriterionResult(c, n, (("fatigue_strength", se), (other, ov)), sm < 0,
                                       None if n is not None else _NO_LIMIT))
    finite = [r for r in results if r.factor is not None]
    gov = min(finite, key=lambda r: r.factor) if finite else None
    fcy = None
    if first_cycle_yield:
        sy = strengths.yield_strength
        ny = langer_factor(sa, sm, sy)
        fcy = FirstCycleYield(ny, sy, sa + abs(sm), reason=None if ny is not None else "no stress")
    basis = FatigueBasis.SPECIMEN if estimate is not None else strengths.fatigue_basis
    notes = (SPECIMEN_CAUTION,) if basis is FatigueBasis.SPECIMEN else ()
    return FatigueCheck(cycle, se, estimate, basis, tuple(results), gov.criterion if gov else None,
                        gov.factor if gov else None, fcy, notes=notes)
