"""Published chart fits for Kt of flat notched parts and round shafts, with validity ranges and sources.

Pure data and small pure functions; no finite elements here. Each fit is a frozen
:class:`ChartFit` carrying its nominal-stress basis, the dimensionless ranges it covers,
a relative agreement band, a confidence tag and the citation it was taken from.

Provenance. Almost every coefficient below was recalled from the named handbook or
paper and not re-read ("from memory"); ``ChartFit.from_memory`` says so per fit, and the
``source`` string names the table or chart. Fits reproduce handbook charts built from
photoelasticity, series solutions and FE, so they are bands to compare against, never
targets: nothing here is, or may be, adjusted to agree with a computed result.

Conventions (handbook practice, from memory): Kt = sigma_max / sigma_nom. For a flat bar
of thickness h (``T`` for the shoulder, where h is the step height), net width d:
tension sigma_nom = P/(h d), in-plane bending sigma_nom = 6M/(h d^2). For the strip with a
central hole the gross basis P/(h W) gives Ktg and the net basis P/(h (W - d)) gives
Ktn = Ktg (1 - d/W).

Polynomial form shared by the notch and shoulder fits (Pilkey & Pilkey 2008; Young,
Budynas & Sadegh 2012, Table 17.1; both from memory)::

    Kt = C1 + C2 u + C3 u^2 + C4 u^3,   Ci = ci0 + ci1 sqrt(q) + ci2 q

with u = 2t/H (notch depth t, bar width H) or 2h/D (step height h, wide width D) and
q = t/r or h/r, each with two q ranges.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field
from typing import Callable, Literal, Mapping

import numpy as np
from scipy.interpolate import CubicSpline

from fekt.errors import InputError
from fekt.exact import (inglis_kt, neuber_deep_groove_bending, neuber_deep_groove_tension,
                        neuber_deep_groove_torsion)
from fekt.families import REGISTRY as SHAPES

Family = str  # a key of FAMILIES
Load = Literal["tension", "bending", "torsion"]
Basis = Literal["net", "gross"]
Confidence = Literal["high", "moderate", "low"]

#: chart families: every standard shape of the registry, plus chart-only shapes (no part to build)
FAMILIES: tuple[str, ...] = (*SHAPES, "semi_infinite_u_notch")
LOADS: tuple[str, ...] = ("tension", "bending", "torsion")
BASES: tuple[str, ...] = ("net", "gross")
CONFIDENCES: tuple[str, ...] = ("high", "moderate", "low")

_CONFIDENCE_RANK = {"high": 0, "moderate": 1, "low": 2}


# ---------------------------------------------------------------------------
# Ranges and coverage
# ---------------------------------------------------------------------------


@dataclass(frozen=True)
class ParamRange:
    """Closed or half-open interval on one dimensionless ratio (e.g. ``"d/W"``).

    ``description`` says where the limit comes from; limits that are our own choice
    say so there.
    """

    name: str
    lo: float
    hi: float
    description: str
    lo_inclusive: bool = True
    hi_inclusive: bool = True

    def contains(self, value: float) -> bool:
        """Membership test; inclusive ends allow a 1e-9 relative slack for round-off
        (e.g. 2t/H computed as 0.9000000000000001)."""
        slack_lo = 1e-9 * max(1.0, abs(self.lo))
        slack_hi = 1e-9 * max(1.0, abs(self.hi))
        above = value >= self.lo - slack_lo if self.lo_inclusive else value > self.lo
        below = value <= self.hi + slack_hi if self.hi_inclusive else value < self.hi
        return bool(above and below)

    def interval_text(self) -> str:
        left = "[" if self.lo_inclusive else "("
        right = "]" if self.hi_inclusive else ")"
        return f"{left}{_num(self.lo)}, {_num(self.hi)}{right}"


@dataclass(frozen=True)
class Violation:
    """One ratio outside its range."""

    ratio: str
    value: float
    range: ParamRange

    @property
    def message(self) -> str:
        return f"{self.ratio} = {_num(self.value)} outside {self.range.interval_text()}"

    def __str__(self) -> str:
        return self.message


@dataclass(frozen=True)
class Coverage:
    """Whether a set of dimensions lies inside a fit's published ranges.

    ``verdict`` is ``"inside"`` or ``"outside"``; ``ratios`` lists every ratio the fit
    checks, as (name, value) pairs, in the order of ``ChartFit.ranges``.
    """

    fit_key: str
    verdict: Literal["inside", "outside"]
    violations: tuple[Violation, ...]
    ratios: tuple[tuple[str, float], ...]

    @property
    def inside(self) -> bool:
        return self.verdict == "inside"

    @property
    def messages(self) -> tuple[str, ...]:
        return tuple(v.message for v in self.violations)


def _num(x: float) -> str:
    """Short human number: 0.5 -> '0.5', 0 -> '0', 0.6234567 -> '0.6235'."""
    if math.isinf(x):
        return "inf" if x > 0 else "-inf"
    return f"{x:.4g}"


# ---------------------------------------------------------------------------
# The fit record
# ---------------------------------------------------------------------------


@dataclass(frozen=True)
class ChartFit:
    """One published chart fit.

    ``formula`` maps validated dimensions to Kt on this fit's own ``basis``;
    ``ratio_fn`` maps dimensions to the dimensionless ratios named in ``ranges``;
    ``check_fn`` raises :class:`InputError` for dimensions that describe no valid part.
    Call :meth:`kt` rather than ``formula`` directly.
    """

    key: str
    family: Family
    load: Load
    basis: Basis
    nominal: str
    parameters: tuple[str, ...]
    ranges: tuple[ParamRange, ...]
    band: float
    confidence: Confidence
    source: str
    from_memory: bool
    note: str
    formula: Callable[[Mapping[str, float]], float] = field(repr=False, compare=False)
    ratio_fn: Callable[[Mapping[str, float]], dict[str, float]] = field(repr=False, compare=False)
    check_fn: Callable[[str, Mapping[str, float]], None] = field(repr=False, compare=False)

    def __post_init__(self) -> None:
        for value, allowed, what in (
            (self.family, FAMILIES, "family"),
            (self.load, LOADS, "load"),
            (self.basis, BASES, "basis"),
            (self.confidence, CONFIDENCES, "confidence"),
        ):
            if value not in allowed:
                raise InputError(f"{what} {value!r} not one of {allowed}", item=self.key)
        if not (self.band > 0):
            raise InputError(f"band must be > 0, got {self.band!r}", item=self.key)
        if not self.source.strip():
            raise InputError("source citation is empty", item=self.key)

    def kt(self, **dims: float) -> float:
        """Kt on this fit's ``basis`` for the given dimensions (lengths, any one unit)."""
        clean = self._validated(dims)
        return float(self.formula(clean))

    def ratios(self, **dims: float) -> dict[str, float]:
        """The dimensionless ratios this fit's ranges are stated on."""
        return self.ratio_fn(self._validated(dims))

    def _validated(self, dims: Mapping[str, float]) -> dict[str, float]:
        missing = [p for p in self.parameters if p not in dims]
        extra = [p for p in dims if p not in self.parameters]
        if missing or extra:
            raise InputError(
                f"expects dimensions {', '.join(self.parameters)}; "
                f"missing: {missing or 'none'}, unexpected: {extra or 'none'}",
                item=self.key,
            )
        clean: dict[str, float] = {}
        for name in self.parameters:
            try:
                value = float(dims[name])
            except (TypeError, ValueError):
                raise InputError(f"{dims[name]!r} is not a number", item=f"{self.key}.{name}") from None
            if math.isnan(value):
                raise InputError("is NaN", item=f"{self.key}.{name}")
            clean[name] = value
        self.check_fn(self.key, clean)
        return clean


def coverage(fit: ChartFit, **dims: float) -> Coverage:
    """Check ``dims`` against every range of ``fit``; name each ratio that falls outside."""
    ratios = fit.ratios(**dims)
    violations = tuple(
        Violation(r.name, ratios[r.name], r) for r in fit.ranges if not r.contains(ratios[r.name])
    )
    return Coverage(
        fit_key=fit.key,
        verdict="outside" if violations else "inside",
        violations=violations,
        ratios=tuple((r.name, ratios[r.name]) for r in fit.ranges),
    )


# ---------------------------------------------------------------------------
# Dimension checks (geometry must exist) and ratio maps, per family
# ---------------------------------------------------------------------------


def _need(cond: bool, key: str, name: str, msg: str) -> None:
    if not cond:
        raise InputError(msg, item=f"{key}.{name}")


def _finite_positive(key: str, dims: Mapping[str, float], *names: str) -> None:
    for n in names:
        _need(math.isfinite(dims[n]) and dims[n] > 0, key, n, f"must be finite and > 0, got {dims[n]!r}")


def _check_strip_hole(key: str, d: Mapping[str, float]) -> None:
    _finite_positive(key, d, "W")
    _need(math.isfinite(d["d"]) and 0 <= d["d"] < d["W"], key, "d", f"must satisfy 0 <= d < W, got d={d['d']!r}, W={d['W']!r}")


def _check_opposite_u(key: str, d: Mapping[str, float]) -> None:
    _finite_positive(key, d, "H", "t", "r")
    _need(2 * d["t"] < d["H"], key, "t", f"two notches of depth t={d['t']!r} leave no ligament in H={d['H']!r} (need 2t < H)")


def _check_shoulder(key: str, d: Mapping[str, float]) -> None:
    _finite_positive(key, d, "D", "d", "r")
    _need(d["d"] < d["D"], key, "d", f"narrow width d={d['d']!r} must be < wide width D={d['D']!r}")


def _check_ellipse(key: str, d: Mapping[str, float]) -> None:
    _finite_positive(key, d, "a", "b")
    _need(d["W"] > 0, key, "W", f"must be > 0 (math.inf for an infinite plate), got {d['W']!r}")
    _need(2 * d["a"] < d["W"], key, "W", f"hole length 2a={2 * d['a']!r} must be < W={d['W']!r}")


def _check_semi_u(key: str, d: Mapping[str, float]) -> None:
    _finite_positive(key, d, "t", "r")


def _ratios_strip_hole(d: Mapping[str, float]) -> dict[str, float]:
    return {"d/W": d["d"] / d["W"]}


def _ratios_opposite_u(d: Mapping[str, float]) -> dict[str, float]:
    return {"t/r": d["t"] / d["r"], "2t/H": 2 * d["t"] / d["H"]}


def _ratios_shoulder(d: Mapping[str, float]) -> dict[str, float]:
    h = (d["D"] - d["d"]) / 2
    return {"h/r": h / d["r"], "2h/D": 2 * h / d["D"]}


def _ratios_ellipse(d: Mapping[str, float]) -> dict[str, float]:
    return {"a/b": d["a"] / d["b"], "2a/W": 2 * d["a"] / d["W"]}


def _ratios_semi_u(d: Mapping[str, float]) -> dict[str, float]:
    return {"t/r": d["t"] / d["r"]}


# ---------------------------------------------------------------------------
# Central circular hole in a strip, tension
# ---------------------------------------------------------------------------

# Howland (1930), Phil. Trans. R. Soc. Lond. A 229, 49-86: gross Ktg at d/W = 0 .. 0.5
# (from memory; bibliographic details moderate).
HOWLAND_D_OVER_W: tuple[float, ...] = (0.0, 0.1, 0.2, 0.3, 0.4, 0.5)
HOWLAND_KTG: tuple[float, ...] = (3.00, 3.03, 3.14, 3.36, 3.74, 4.32)


def howland_ktg(x: float) -> float:
    """Gross Kt of a central hole in a strip at x = d/W, from Howland's (1930) table.

    Table from memory. Between nodes: a cubic spline with not-a-knot ends
    (``scipy.interpolate.CubicSpline`` default) through the six tabulated points. Chosen
    over the degree-5 interpolating polynomial because it is piecewise and local; both
    pass exactly through the nodes and differ by about 0.001 between them, well inside
    the 2-decimal rounding of the table. The spline dips 3.5e-5 below 3.00 near
    x = 0.004, again far inside that rounding. No extrapolation: x outside [0, 0.5] raises.
    """
    if not (HOWLAND_D_OVER_W[0] <= x <= HOWLAND_D_OVER_W[-1]):
        raise InputError(
            f"d/W = {_num(x)} outside the tabulated range [0, 0.5]; the table is not extrapolated",
            item="strip-hole/tension/series-table",
        )
    spline = CubicSpline(np.asarray(HOWLAND_D_OVER_W), np.asarray(HOWLAND_KTG))
    return float(spline(x))


def howland_ktn(x: float) -> float:
    """Net Kt from Howland's table: Ktn = Ktg (1 - d/W) (section conventions, from memory)."""
    return howland_ktg(x) * (1.0 - x)


def hole_pilkey_ktn(x: float) -> float:
    """Net Kt, Pilkey & Pilkey (2008), Peterson's SCF 3rd ed., Chart 4.1 fit (from memory).

    Ktn = 2 + 0.284(1-x) - 0.600(1-x)^2 + 1.32(1-x)^3, x = d/W, 0 <= x < 1.
    """
    s = 1.0 - x
    return 2.0 + 0.284 * s - 0.600 * s**2 + 1.32 * s**3


def hole_roark_ktn(x: float) -> float:
    """Net Kt, Young, Budynas & Sadegh (2012), Roark's Table 17.1, central hole (from memory).

    Ktn = 3.00 - 3.13x + 3.66x^2 - 1.53x^3, x = d/W.
    """
    return 3.00 - 3.13 * x + 3.66 * x**2 - 1.53 * x**3


def hole_heywood_ktn(x: float) -> float:
    """Net Kt, Heywood (1952), *Designing by Photoelasticity* (from memory).

    Ktn = 2 + (1-x)^3, x = d/W.
    """
    return 2.0 + (1.0 - x) ** 3


def _x_hole(d: Mapping[str, float]) -> float:
    return d["d"] / d["W"]


# ---------------------------------------------------------------------------
# Cubic-in-u fits with two q ranges (opposite U-notches, flat shoulder)
# ---------------------------------------------------------------------------

Coeffs = tuple[tuple[float, float, float], ...]  # four rows (C1..C4) of (c0, c_sqrt, c_lin)


@dataclass(frozen=True)
class CoefficientSet:
    """Coefficients of ``Kt = C1 + C2 u + C3 u^2 + C4 u^3`` valid for q in [q_lo, q_hi]
    (``q_hi`` inclusive only when ``hi_inclusive``)."""

    q_lo: float
    q_hi: float
    hi_inclusive: bool
    c: Coeffs

    def covers(self, q: float) -> bool:
        return self.q_lo <= q and (q <= self.q_hi if self.hi_inclusive else q < self.q_hi)


def cubic_in_u(c: Coeffs, q: float, u: float) -> float:
    """Evaluate Kt = sum_k Ck u^(k-1) with Ck = ck0 + ck1 sqrt(q) + ck2 q."""
    sq = math.sqrt(q)
    cs = [c0 + c1 * sq + c2 * q for (c0, c1, c2) in c]
    return cs[0] + cs[1] * u + cs[2] * u**2 + cs[3] * u**3


def pick_set(sets: tuple[CoefficientSet, ...], q: float) -> CoefficientSet:
    """The coefficient set whose q range holds ``q``; outside all ranges, the nearest end set.

    Using the nearest set outside the ranges keeps ``kt`` defined so that callers can
    still show a value next to an "outside" coverage verdict.
    """
    for s in sets:
        if s.covers(q):
            return s
    return sets[0] if q < sets[0].q_lo else sets[-1]


# Pilkey & Pilkey (2008), Peterson's SCF 3rd ed., flat bar with opposite U-notches in
# tension (Chart 2.4 as recalled); from memory, moderate. u = 2t/H, q = t/r, net basis.
OPPOSITE_U_TENSION_PILKEY: tuple[CoefficientSet, ...] = (
    CoefficientSet(0.1, 2.0, False, (
        (0.955, 2.169, -0.081),
        (-1.557, -4.046, 1.032),
        (4.013, 0.424, -0.748),
        (-2.461, 1.538, -0.236),
    )),
    CoefficientSet(2.0, 50.0, True, (
        (1.037, 1.991, 0.002),
        (-1.886, -2.181, -0.048),
        (0.649, 1.086, 0.142),
        (1.218, -0.922, -0.086),
    )),
)

# Pilkey & Pilkey (2008), Peterson's SCF 3rd ed., flat bar with opposite U-notches in
# in-plane bending; from memory, LOW confidence (u -> 1 gives 1.05-1.08, not ~1).
OPPOSITE_U_BENDING_PILKEY: tuple[CoefficientSet, ...] = (
    CoefficientSet(0.1, 2.0, False, (
        (1.024, 2.092, -0.051),
        (-0.630, -7.194, 1.288),
        (2.117, 8.574, -2.160),
        (-1.420, -3.494, 0.932),
    )),
    CoefficientSet(2.0, 50.0, True, (
        (1.113, 1.957, 0.0),
        (-2.579, -4.017, -0.013),
        (4.100, 3.922, 0.083),
        (-1.528, -1.893, -0.066),
    )),
)

# Young, Budynas & Sadegh (2012), Roark's Table 17.1, filleted square shoulder in a
# rectangular section, axial tension; from memory, attribution moderate. u = 2h/D,
# q = h/r, h = (D - d)/2, net basis on d. The C4 constant of the upper range is 3.450:
# the recalled 2.450 broke Kt(u = 1) = 1 and continuity at h/r = 2; 3.450 restores both
# (correction rests on that consistency argument, not on a re-read of the table).
SHOULDER_TENSION_ROARK: tuple[CoefficientSet, ...] = (
    CoefficientSet(0.1, 2.0, True, (
        (1.007, 1.000, -0.031),
        (-0.114, -0.585, 0.314),
        (0.241, -0.992, -0.271),
        (-0.134, 0.577, -0.012),
    )),
    CoefficientSet(2.0, 20.0, True, (
        (1.042, 0.982, -0.036),
        (-0.074, -0.156, -0.010),
        (-3.418, 1.220, -0.005),
        (3.450, -2.046, 0.051),
    )),
)


def opposite_u_tension_pilkey_kt(t_over_r: float, u: float) -> float:
    """Net Kt, opposite U-notches, tension (Pilkey & Pilkey 2008, from memory)."""
    return cubic_in_u(pick_set(OPPOSITE_U_TENSION_PILKEY, t_over_r).c, t_over_r, u)


def opposite_u_bending_pilkey_kt(t_over_r: float, u: float) -> float:
    """Net Kt, opposite U-notches, in-plane bending (Pilkey & Pilkey 2008, from memory; LOW)."""
    return cubic_in_u(pick_set(OPPOSITE_U_BENDING_PILKEY, t_over_r).c, t_over_r, u)


def shoulder_tension_roark_kt(h_over_r: float, u: float) -> float:
    """Net Kt, flat shoulder fillet, tension (Roark's Table 17.1, 2012, from memory)."""
    return cubic_in_u(pick_set(SHOULDER_TENSION_ROARK, h_over_r).c, h_over_r, u)


# ---------------------------------------------------------------------------
# Elliptical hole and semi-infinite U-notch
# ---------------------------------------------------------------------------


def semi_infinite_u_kt(t_over_r: float) -> float:
    """Kt = 0.855 + 2.21 sqrt(t/r), U-notch in the edge of a semi-infinite plate, tension
    (Pilkey & Pilkey 2008, semi-infinite U-notch chart; from memory), 1 <= t/r <= 361."""
    return 0.855 + 2.21 * math.sqrt(t_over_r)


# ---------------------------------------------------------------------------
# Round shafts: shoulder fillet (cubic fits) and circumferential U-groove (limits and their combination)
# ---------------------------------------------------------------------------

# Round bar with a shoulder fillet, t = (D - d)/2, u = 2t/D, q = t/r, net basis on d. Sets as recalled
# from Peterson's Stress Concentration Factors 3rd ed. (stepped round bar charts); Roark's Table 17.1
# has closely similar sets (verification notes 2.6; from memory, moderate). Sanity check that does not
# rely on the same memory: within 1-3 % (tension, torsion) and 2-7 % (bending) of Norton's power-law
# fits, recalled independently (notes 2.6, 2.8).
SHAFT_SHOULDER_TENSION: tuple[CoefficientSet, ...] = (
    CoefficientSet(0.1, 2.0, False, (
        (0.926, 1.157, -0.099),
        (0.012, -3.036, 0.961),
        (-0.302, 3.977, -1.744),
        (0.365, -2.098, 0.878),
    )),
    CoefficientSet(2.0, 20.0, True, (
        (1.200, 0.860, -0.022),
        (-1.805, -0.346, -0.038),
        (2.198, -0.486, 0.165),
        (-0.593, -0.028, -0.106),
    )),
)
SHAFT_SHOULDER_BENDING: tuple[CoefficientSet, ...] = (
    CoefficientSet(0.1, 2.0, False, (
        (0.947, 1.206, -0.131),
        (0.022, -3.405, 0.915),
        (0.869, 1.777, -0.555),
        (-0.810, 0.422, -0.260),
    )),
    CoefficientSet(2.0, 20.0, True, (
        (1.232, 0.832, -0.008),
        (-3.813, 0.968, -0.260),
        (7.423, -4.868, 0.869),
        (-3.839, 3.070, -0.600),
    )),
)
SHAFT_SHOULDER_TORSION: tuple[CoefficientSet, ...] = (
    CoefficientSet(0.25, 4.0, True, (
        (0.905, 0.783, -0.075),
        (-0.437, -1.969, 0.553),
        (1.557, 1.073, -0.578),
        (-1.061, 0.171, 0.086),
    )),
)
SHAFT_SHOULDER_SETS = {"tension": SHAFT_SHOULDER_TENSION, "bending": SHAFT_SHOULDER_BENDING,
                       "torsion": SHAFT_SHOULDER_TORSION}


def shaft_shoulder_kt(load: str, t_over_r: float, u: float) -> float:
    """Net Kt of a round bar with a shoulder fillet (notes 2.6, from memory): load 'tension', 'bending' or
    'torsion' (Kts on 16T/(pi d^3)); q = t/r, u = 2t/D."""
    return cubic_in_u(pick_set(SHAFT_SHOULDER_SETS[load], t_over_r).c, t_over_r, u)


#: Poisson's ratio of the deep-groove limits (Neuber's tension and bending values depend on it; the
#: handbook charts are drawn for 0.3)
GROOVE_NU = 0.3


def groove_deep_kt(load: str, d: float, r: float, nu: float = GROOVE_NU) -> float:
    """Neuber's deep hyperbolic groove (fekt.exact) with neck radius a = d/2 and root radius rho = r, net
    basis: the deep limit of a U-groove."""
    q = d / 2 / r
    if load == "tension":
        return neuber_deep_groove_tension(q, nu)
    if load == "bending":
        return neuber_deep_groove_bending(q, nu)
    return neuber_deep_groove_torsion(q)


def groove_shallow_kt(load: str, t: float, r: float) -> float:
    """Shallow limit of a groove of depth t and root radius r (notes 2.7): the U-notch in the edge of a
    half-plane, 0.855 + 2.21 sqrt(t/r), in tension and bending (locally a plane-strain edge notch, whose
    stresses do not depend on the plane assumption; Pilkey & Pilkey 2008, from memory); the antiplane
    elliptical notch 1 + sqrt(t/r) in torsion (exactly 2 for a semicircular groove)."""
    return 1.0 + math.sqrt(t / r) if load == "torsion" else semi_infinite_u_kt(t / r)


def shallow_deep_combination(kts: float, ktd: float) -> float:
    """Neuber's rule (Neuber 1958): Kt - 1 = (Kts - 1)(Ktd - 1) / sqrt((Kts - 1)^2 + (Ktd - 1)^2)."""
    a, b = kts - 1.0, ktd - 1.0
    return 1.0 + a * b / math.hypot(a, b)


def groove_combined_kt(load: str, D: float, d: float, r: float) -> float:
    """Net Kt of a U-groove from Neuber's rule with the shallow and deep limits above."""
    return shallow_deep_combination(groove_shallow_kt(load, (D - d) / 2, r), groove_deep_kt(load, d, r))


_SHAFT_NOMINAL = {"tension": "4P/(pi d^2)", "bending": "32M/(pi d^3)", "torsion": "16T/(pi d^3) (shear: Kts)"}
_SHAFT_NOMINAL_GROSS = {"tension": "4P/(pi D^2)", "bending": "32M/(pi D^3)",
                        "torsion": "16T/(pi D^3) (shear: Kts)"}


def _check_shaft(key: str, d: Mapping[str, float]) -> None:
    _finite_positive(key, d, "D", "d", "r")
    _need(d["d"] < d["D"], key, "d", f"net diameter d={d['d']!r} must be < D={d['D']!r}")


def _ratios_shaft(d: Mapping[str, float]) -> dict[str, float]:
    t = (d["D"] - d["d"]) / 2
    return {"t/r": t / d["r"], "2t/D": 2 * t / d["D"]}


# ---------------------------------------------------------------------------
# Basis conversion
# ---------------------------------------------------------------------------


def kt_as(fit: ChartFit, basis: Basis, **dims: float) -> float:
    """Kt of ``fit`` expressed on ``basis`` ("net" or "gross").

    Kt_net = Kt_gross * sigma_nom,gross / sigma_nom,net; the family knows that ratio for its shape and
    load (flat bars: the width ratio to the power 1 in tension, 2 in bending).
    """
    if basis not in BASES:
        raise InputError(f"unknown basis {basis!r}; expected one of {BASES}", item="basis")
    value = fit.kt(**dims)
    if basis == fit.basis:
        return value
    family = SHAPES.get(fit.family)
    if family is None:
        raise InputError(f"family {fit.family!r} has no finite width, so net and gross coincide or are undefined",
                         item="basis")
    ratio = family.net_over_gross(dims, fit.load)
    return value * ratio if basis == "net" else value / ratio


# ---------------------------------------------------------------------------
# Registry
# ---------------------------------------------------------------------------

_HOLE_X_NOTE = (
    "confidence high for d/W <= 0.5, moderate beyond (the coverage table of docs/references.md "
    "quotes the fits to d/W ~ 0.9)"
)


def _net_hole_fit(name: str, fn: Callable[[float], float], rng: ParamRange, source: str, note: str) -> ChartFit:
    """One of the net-section fits for the strip with a central hole (they share everything else)."""
    return ChartFit(
        key=f"strip-hole/tension/{name}",
        family="strip_hole", load="tension", basis="net",
        nominal="P/(h (W-d))",
        parameters=("d", "W"),
        ranges=(rng,),
        band=0.03,
        confidence="high",
        source=source,
        from_memory=True,
        note=note,
        formula=lambda d: fn(_x_hole(d)),
        ratio_fn=_ratios_strip_hole,
        check_fn=_check_strip_hole,
    )


def _build_fits() -> tuple[ChartFit, ...]:
    hole_range_fit = ParamRange(
        "d/W", 0.0, 1.0,
        "fit stated for 0 <= d/W < 1; " + _HOLE_X_NOTE,
        hi_inclusive=False,
    )
    ou_tr = ParamRange("t/r", 0.1, 50.0, "two coefficient ranges 0.1-2 and 2-50 (Pilkey & Pilkey 2008, from memory)")
    return (
        ChartFit(
            key="strip-hole/tension/series-table",
            family="strip_hole", load="tension", basis="gross",
            nominal="P/(h W)",
            parameters=("d", "W"),
            ranges=(ParamRange("d/W", 0.0, 0.5, "Howland's series regarded as reliable up to d/W ~ 0.5 (from memory)"),),
            band=0.01,
            confidence="high",
            source=(
                "R. C. J. Howland (1930), Phil. Trans. R. Soc. Lond. A 229, 49-86, table of gross Kt "
                "at d/W = 0..0.5 (from memory); cubic-spline interpolation between nodes"
            ),
            from_memory=True,
            note=(
                "docs/references.md rates the recalled table moderate-high: it agrees within 0.3% with "
                "two independently recalled fits. Series solution for an infinitely long strip; "
                "model loaded ends 2-3 W from the hole. Not extrapolated beyond d/W = 0.5."
            ),
            formula=lambda d: howland_ktg(_x_hole(d)),
            ratio_fn=_ratios_strip_hole,
            check_fn=_check_strip_hole,
        ),
        _net_hole_fit(
            "cubic-fit-1", hole_pilkey_ktn, hole_range_fit,
            "W. D. Pilkey & D. F. Pilkey (2008), Peterson's Stress Concentration Factors 3rd ed., "
            "Chart 4.1 fit Ktn = 2 + 0.284(1-x) - 0.600(1-x)^2 + 1.32(1-x)^3 (from memory)",
            "within 0.3% of Howland for d/W <= 0.5; " + _HOLE_X_NOTE,
        ),
        _net_hole_fit(
            "cubic-fit-2", hole_roark_ktn, hole_range_fit,
            "W. C. Young, R. G. Budynas & A. M. Sadegh (2012), Roark's Formulas for Stress and "
            "Strain 8th ed., Table 17.1, central hole in tension: "
            "Ktn = 3.00 - 3.13x + 3.66x^2 - 1.53x^3 (from memory)",
            "within 0.3% of Howland for d/W <= 0.5; " + _HOLE_X_NOTE,
        ),
        _net_hole_fit(
            "cube-law", hole_heywood_ktn,
            ParamRange("d/W", 0.0, 1.0, "stated for all d/W; " + _HOLE_X_NOTE, hi_inclusive=False),
            "R. B. Heywood (1952), Designing by Photoelasticity: Ktn = 2 + (1-x)^3 (from memory)",
            "up to 1.6% below Howland for d/W <= 0.5",
        ),
        ChartFit(
            key="opposite-u/tension/cubic-sqrt-fit",
            family="opposite_u_notches", load="tension", basis="net",
            nominal="P/(h d), d = H - 2t",
            parameters=("H", "t", "r"),
            ranges=(
                ou_tr,
                ParamRange("2t/H", 0.0, 0.9, "upper limit as listed in the coverage table of docs/references.md (published origin not recorded)"),
            ),
            band=0.05,
            confidence="moderate",
            source=(
                "W. D. Pilkey & D. F. Pilkey (2008), Peterson's Stress Concentration Factors 3rd ed., "
                "flat bar with opposite U-notches in tension (Chart 2.4 as recalled); "
                "cubic in u = 2t/H, two t/r ranges (from memory)"
            ),
            from_memory=True,
            note=(
                "weak for large t/r with small 2t/H: its shallow limit falls ~7% below the "
                "semi-infinite U-notch fit at t/r = 20 (low confidence in that corner)"
            ),
            formula=lambda d: opposite_u_tension_pilkey_kt(d["t"] / d["r"], 2 * d["t"] / d["H"]),
            ratio_fn=_ratios_opposite_u,
            check_fn=_check_opposite_u,
        ),
        ChartFit(
            key="opposite-u/bending/cubic-sqrt-fit",
            family="opposite_u_notches", load="bending", basis="net",
            nominal="6M/(h d^2), d = H - 2t",
            parameters=("H", "t", "r"),
            ranges=(ou_tr,),
            band=0.15,
            confidence="low",
            source=(
                "W. D. Pilkey & D. F. Pilkey (2008), Peterson's Stress Concentration Factors 3rd ed., "
                "flat bar with opposite U-notches in in-plane bending; cubic in u = 2t/H, "
                "two t/r ranges (from memory, low confidence)"
            ),
            from_memory=True,
            note=(
                "unconfirmed: u -> 1 gives 1.05-1.08 instead of ~1 and deep notches look high "
                "against deep-notch theory; do not use until transcribed; band is our own choice"
            ),
            formula=lambda d: opposite_u_bending_pilkey_kt(d["t"] / d["r"], 2 * d["t"] / d["H"]),
            ratio_fn=_ratios_opposite_u,
            check_fn=_check_opposite_u,
        ),
        ChartFit(
            key="shoulder-fillet/tension/cubic-sqrt-fit",
            family="shoulder_fillet", load="tension", basis="net",
            nominal="P/(T d), T = plate thickness",
            parameters=("D", "d", "r"),
            ranges=(ParamRange("h/r", 0.1, 20.0, "two coefficient ranges 0.1-2 and 2-20 (Roark's Table 17.1, from memory)"),),
            band=0.10,
            confidence="moderate",
            source=(
                "W. C. Young, R. G. Budynas & A. M. Sadegh (2012), Roark's Formulas for Stress and "
                "Strain 8th ed., Table 17.1, filleted square shoulder, rectangular section, axial "
                "tension; cubic in u = 2h/D, h = (D-d)/2, C4 constant 3.450 in the upper range "
                "(from memory; attribution moderate)"
            ),
            from_memory=True,
            note=(
                "sources differ by ~10% (2.53 here vs 2.30 from a power-law fit at D/d = 2, "
                "r/d = 0.1); sharp fillets are suspect; the handbook's minimum shoulder-length "
                "condition was not recalled and is not checked"
            ),
            formula=lambda d: shoulder_tension_roark_kt(
                (d["D"] - d["d"]) / 2 / d["r"], (d["D"] - d["d"]) / d["D"]
            ),
            ratio_fn=_ratios_shoulder,
            check_fn=_check_shoulder,
        ),
        ChartFit(
            key="elliptical-hole/tension/infinite-plate",
            family="elliptical_hole", load="tension", basis="gross",
            nominal="S, remote uniform stress perpendicular to the a semi-axis (gross = net in an infinite plate)",
            parameters=("a", "b", "W"),
            ranges=(
                ParamRange(
                    "2a/W", 0.0, 0.1,
                    "our own heuristic, not from a reference: the value is for an infinite "
                    "plate and finite width raises Kt",
                ),
            ),
            band=0.02,
            confidence="high",
            source=(
                "C. E. Inglis (1913), Trans. Inst. Naval Architects 55, 219-241 (volume to check); "
                "G. V. Kolosov: Kt = 1 + 2a/b, infinite plate (from memory; re-derived)"
            ),
            from_memory=True,
            note=(
                "exact for an infinite plate; finite width raises Kt. The 2a/W limit and the 2% "
                "band are our own choices, not published numbers. Pass W = math.inf for an "
                "infinite plate."
            ),
            formula=lambda d: inglis_kt(d["a"], d["b"]),
            ratio_fn=_ratios_ellipse,
            check_fn=_check_ellipse,
        ),
        ChartFit(
            key="semi-infinite-u/tension/sqrt-fit",
            family="semi_infinite_u_notch", load="tension", basis="gross",
            nominal="S, remote uniform stress in the semi-infinite plate",
            parameters=("t", "r"),
            ranges=(ParamRange("t/r", 1.0, 361.0, "chart range (Pilkey & Pilkey 2008, from memory)"),),
            band=0.05,
            confidence="moderate",
            source=(
                "W. D. Pilkey & D. F. Pilkey (2008), Peterson's Stress Concentration Factors 3rd ed., "
                "U-notch in a semi-infinite plate: Kt = 0.855 + 2.21 sqrt(t/r) (from memory)"
            ),
            from_memory=True,
            note=(
                "shallow limit of edge U-notches in finite bars; about 7% above the opposite "
                "U-notch fit's shallow limit at t/r = 20. Confidence tag is ours: no published rating was recorded."
            ),
            formula=lambda d: semi_infinite_u_kt(d["t"] / d["r"]),
            ratio_fn=_ratios_semi_u,
            check_fn=_check_semi_u,
        ),
        *_shaft_fits(),
    )


def _shaft_fits() -> tuple[ChartFit, ...]:
    """Round-shaft fits: shoulder fillet per load; groove deep limit, shallow limit and their combination."""
    fits = []
    shoulder_ranges = {
        "tension": ParamRange("t/r", 0.1, 20.0, "two coefficient ranges 0.1-2 and 2-20 (notes 2.6, from memory)"),
        "bending": ParamRange("t/r", 0.1, 20.0, "two coefficient ranges 0.1-2 and 2-20 (notes 2.6, from memory)"),
        "torsion": ParamRange("t/r", 0.25, 4.0, "single coefficient range (notes 2.6, from memory)"),
    }
    shoulder_band = {"tension": 0.05, "bending": 0.07, "torsion": 0.05}
    for load in LOADS:
        fits.append(ChartFit(
            key=f"shaft-shoulder/{load}/cubic-sqrt-fit",
            family="shaft_shoulder", load=load, basis="net", nominal=_SHAFT_NOMINAL[load],
            parameters=("D", "d", "r"),
            ranges=(shoulder_ranges[load],),
            band=shoulder_band[load],
            confidence="moderate",
            source=("W. D. Pilkey & D. F. Pilkey (2008), Peterson's Stress Concentration Factors 3rd ed., stepped "
                    f"round bar with a shoulder fillet in {load}; cubic in u = 2t/D, t = (D-d)/2, coefficients in "
                    "sqrt(t/r) and t/r (from memory; Roark's Table 17.1 has closely similar sets)"),
            from_memory=True,
            note=("within 1-3 % (tension, torsion) and 2-7 % (bending) of independently recalled power-law fits "
                  "(R. L. Norton, Machine Design, Appendix C, from memory) at D/d = 1.1-2; the band is our own "
                  "reading of that agreement. Classical stepped-shaft charts are suspect for sharp fillets "
                  "(S. M. Tipton, J. R. Sorem & R. D. Rolovic, J. Mech. Design 118 (1996) 321-327, from memory)."),
            formula=lambda d, load=load: shaft_shoulder_kt(load, (d["D"] - d["d"]) / 2 / d["r"],
                                                           (d["D"] - d["d"]) / d["D"]),
            ratio_fn=_ratios_shaft,
            check_fn=_check_shaft,
        ))
    nu_note = f"Poisson's ratio {GROOVE_NU} (tension and bending depend on it; torsion does not)"
    for load in LOADS:
        fits.append(ChartFit(
            key=f"shaft-groove/{load}/deep-hyperbolic-limit",
            family="shaft_groove", load=load, basis="net", nominal=_SHAFT_NOMINAL[load],
            parameters=("D", "d", "r"),
            ranges=(ParamRange("2t/D", 0.7, 1.0, "deep grooves only: the coverage table of the verification notes "
                               "says to use Neuber's deep-notch values for U-notches with 2t/D >~ 0.7 (origin of "
                               "the limit not recorded)", hi_inclusive=False),),
            band=0.10,
            confidence="moderate",
            source=("H. Neuber (1958), Kerbspannungslehre 2nd ed. (Theory of Notch Stresses), deep hyperbolic "
                    "external groove in a round bar, neck radius a = d/2, root radius r: tension and bending "
                    "formulas from memory, torsion re-derived (fekt.exact; FE-confirmed within 0.1 % in "
                    "tests/test_shaft_neuber.py)"),
            from_memory=True,
            note=("exact for hyperbolic flanks in an infinitely deep groove; for a U-groove (parallel flanks) it "
                  f"is the deep limit only, so the band is our own choice. {nu_note}."),
            formula=lambda d, load=load: groove_deep_kt(load, d["d"], d["r"]),
            ratio_fn=_ratios_shaft,
            check_fn=_check_shaft,
        ))
    for load in LOADS:
        torsion = load == "torsion"
        fits.append(ChartFit(
            key=f"shaft-groove/{load}/shallow-limit",
            family="shaft_groove", load=load, basis="gross", nominal=_SHAFT_NOMINAL_GROSS[load],
            parameters=("D", "d", "r"),
            ranges=((ParamRange("t/r", 0.5, 2.0, "our own choice: exact for a semicircular groove (t/r = 1), "
                                "approximate for other U-grooves") if torsion else
                     ParamRange("t/r", 1.0, 361.0, "chart range of the semi-infinite U-notch (Pilkey & Pilkey "
                                "2008, from memory)")),
                    ParamRange("2t/D", 0.0, 0.02, "our own choice of 'shallow': the limit holds as 2t/D -> 0")),
            band=0.05,
            confidence="moderate",
            source=("antiplane elliptical notch Kts = 1 + sqrt(t/r), exactly 2 for a semicircular groove (derived "
                    "from antiplane ellipse theory; notes 2.7, from memory)" if torsion else
                    "U-notch in the edge of a semi-infinite plate, Kt = 0.855 + 2.21 sqrt(t/r) (W. D. Pilkey & "
                    "D. F. Pilkey (2008), Peterson's Stress Concentration Factors 3rd ed., from memory); a shallow "
                    "groove is locally a plane-strain edge notch (notes 2.7)"),
            from_memory=True,
            note=("the limit as the groove becomes shallow (2t/D -> 0), on the gross (unnotched) surface stress; "
                  "the 2t/D limit and the band are our own choices"),
            formula=lambda d, load=load: groove_shallow_kt(load, (d["D"] - d["d"]) / 2, d["r"]),
            ratio_fn=_ratios_shaft,
            check_fn=_check_shaft,
        ))
    for load in LOADS:
        fits.append(ChartFit(
            key=f"shaft-groove/{load}/shallow-deep-combination",
            family="shaft_groove", load=load, basis="net", nominal=_SHAFT_NOMINAL[load],
            parameters=("D", "d", "r"),
            ranges=(ParamRange("t/r", 1.0, 50.0, "lower limit: the shallow U-notch value is stated for t/r >= 1; "
                               "upper limit our own choice"),
                    ParamRange("2t/D", 0.02, 0.9, "our own choice: between the shallow and the deep limit")),
            band=0.15,
            confidence="low",
            source=("H. Neuber (1958), Theory of Notch Stresses: (Kt - 1) = (Kts - 1)(Ktd - 1) / sqrt((Kts - 1)^2 "
                    "+ (Ktd - 1)^2) with the shallow limit Kts and the deep limit Ktd of this family (rule from "
                    "memory)"),
            from_memory=True,
            note=("an interpolation rule, reported to be up to about 7 % non-conservative (body-force study, notes "
                  f"2.7); its limits are themselves approximations for U-grooves; band our own choice. {nu_note}."),
            formula=lambda d, load=load: groove_combined_kt(load, d["D"], d["d"], d["r"]),
            ratio_fn=_ratios_shaft,
            check_fn=_check_shaft,
        ))
    return tuple(fits)


@dataclass(frozen=True)
class ChartGap:
    """A family/load with no usable chart fit, and what can be checked instead."""

    family: Family
    load: Load
    reason: str
    shallow_limit_key: str | None = None


_GAPS: tuple[ChartGap, ...] = (
    ChartGap(
        "single_u_notch", "tension",
        "no chart: coefficients not transcribed (Roark's Table 17.1 and Pilkey & Pilkey each "
        "have a fit). Only check: as the notch becomes shallow (2t/H -> 0) Kt tends to the "
        "semi-infinite U-notch fit (from memory). Results depend on how the ends are loaded "
        "(pinned ends rotate and add bending from the eccentric net section).",
        shallow_limit_key="semi-infinite-u/tension/sqrt-fit",
    ),
    ChartGap(
        "single_u_notch", "bending",
        "no chart: coefficients not transcribed.",
    ),
    ChartGap(
        "shoulder_fillet", "bending",
        "no chart: flat shoulder fillet in bending not transcribed.",
    ),
)


def all_fits() -> list[ChartFit]:
    """Every chart fit, in registry order."""
    return list(_build_fits())


def chart_gaps() -> list[ChartGap]:
    """Family/load pairs known to have no usable fit."""
    return list(_GAPS)


def _check_family_load(family: str, load: str) -> None:
    if family not in FAMILIES:
        raise InputError(f"unknown family {family!r}; expected one of {FAMILIES}", item="family")
    if load not in LOADS:
        raise InputError(f"unknown load {load!r}; expected one of {LOADS}", item="load")


def fits_for(family: str, load: str) -> list[ChartFit]:
    """Fits for one family and load, in registry order (empty when there is no chart)."""
    _check_family_load(family, load)
    return [f for f in _build_fits() if f.family == family and f.load == load]


def gap_for(family: str, load: str) -> ChartGap | None:
    """The "no chart" note for a family and load, if there is one."""
    _check_family_load(family, load)
    return next((g for g in _GAPS if g.family == family and g.load == load), None)


def fit_by_key(key: str) -> ChartFit:
    """Look a fit up by its key."""
    for f in _build_fits():
        if f.key == key:
            return f
    raise InputError(f"no chart fit with key {key!r}", item="fit")


def primary_fit(
    family: str,
    load: str,
    dims: Mapping[str, float] | None = None,
    *,
    allow_low: bool = False,
) -> ChartFit | None:
    """The most trustworthy fit for a family and load, or None.

    Ranked by confidence (high first), then by narrower band, then registry order.
    With ``dims``, the best fit whose coverage is "inside" wins (so the strip hole uses
    Howland for d/W <= 0.5 and the Pilkey fit beyond); if none covers the dimensions the
    best-ranked fit is returned and its coverage will say "outside".
    Low-confidence fits are skipped unless ``allow_low`` (the opposite U-notch bending fit
    is not to be used until transcribed), so the result may be None.
    """
    candidates = [f for f in fits_for(family, load) if allow_low or f.confidence != "low"]
    if not candidates:
        return None
    ranked = sorted(
        enumerate(candidates),
        key=lambda iv: (_CONFIDENCE_RANK[iv[1].confidence], iv[1].band, iv[0]),
    )
    ordered = [f for _, f in ranked]
    if dims is not None:
        for f in ordered:
            if coverage(f, **dims).inside:
                return f
    return ordered[0]


__all__ = [
    "BASES",
    "CONFIDENCES",
    "FAMILIES",
    "LOADS",
    "HOWLAND_D_OVER_W",
    "HOWLAND_KTG",
    "OPPOSITE_U_BENDING_PILKEY",
    "OPPOSITE_U_TENSION_PILKEY",
    "SHOULDER_TENSION_ROARK",
    "ChartFit",
    "ChartGap",
    "CoefficientSet",
    "Coverage",
    "ParamRange",
    "Violation",
    "all_fits",
    "chart_gaps",
    "coverage",
    "cubic_in_u",
    "fit_by_key",
    "fits_for",
    "gap_for",
    "hole_heywood_ktn",
    "hole_pilkey_ktn",
    "hole_roark_ktn",
    "howland_ktg",
    "howland_ktn",
    "inglis_kt",
    "kt_as",
    "opposite_u_bending_pilkey_kt",
    "opposite_u_tension_pilkey_kt",
    "pick_set",
    "primary_fit",
    "semi_infinite_u_kt",
    "shaft_shoulder_kt",
    "groove_deep_kt",
    "groove_shallow_kt",
    "groove_combined_kt",
    "shallow_deep_combination",
    "shoulder_tension_roark_kt",
]
