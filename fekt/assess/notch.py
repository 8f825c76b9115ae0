"""Notch sensitivity q and the fatigue notch factor Kf from Kt and the notch root radius.

Definition (standard; e.g. Peterson 1959): q = (Kf - 1)/(Kt - 1), 0 <= q <= 1, so
Kf = 1 + q (Kt - 1).

Three published methods, each returning a :class:`NotchFactor` record:

* Peterson (R. E. Peterson, "Notch sensitivity", in Sines & Waisman (eds), Metal Fatigue, 1959, from
  memory): q = 1/(1 + a/r);
* Neuber / Kuhn-Hardrath (Neuber 1958; Kuhn & Hardrath, NACA TN 2805, 1952, from memory):
  q = 1/(1 + sqrt(rho'/r));
* Heywood (R. B. Heywood, Designing against Fatigue, 1962, as given in Budynas & Nisbett, Shigley's
  Mechanical Engineering Design, 9th ed., eq. 6-33 and Table 6-15, from memory):
  Kf = Kt / (1 + 2 ((Kt - 1)/Kt) sqrt(a'/r)).

Radii and material lengths are in the case's length unit; correlations published in mm and MPa go
through :class:`~fekt.assess.material.UnitScale`. A sharp or singular corner (r = 0 or flagged
singular) gets a record with ``kf = None`` and the reason: its elastic peak is not a number.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from enum import StrEnum
from typing import TYPE_CHECKING

from ..errors import InputError
from .material import Estimate, EstimateRule, Strengths, UnitScale, require_steel

if TYPE_CHECKING:
    from .gradient import SupportFactor


class Loading(StrEnum):
    """The kind of load that makes the peak (selects the Kuhn-Hardrath polynomial and chart gradient)."""

    AXIAL = "axial"
    BENDING = "bending"
    TORSION = "torsion"


class NotchShape(StrEnum):
    """Notch shape classes of Heywood's constants and of the chart gradient approximations."""

    HOLE = "transverse hole"
    SHOULDER = "shoulder"
    GROOVE = "groove"


class NotchMethod(StrEnum):
    PETERSON = "Peterson"
    NEUBER = "Neuber/Kuhn-Hardrath"
    HEYWOOD = "Heywood"
    FKM_SUPPORT = "FKM support factor"
    SIEBEL_STIELER = "Siebel-Stieler support factor"


class ConstantOrigin(StrEnum):
    GIVEN = "given"
    ESTIMATED = "estimated"


@dataclass(frozen=True)
class MaterialConstant:
    """The material constant a method used: ``name`` (a, rho', a', s_g, ...), ``value`` in the case's
    length unit, where it came from, and the estimate record when it was estimated."""

    name: str
    value: float
    origin: ConstantOrigin
    estimate: Estimate | None = None


@dataclass(frozen=True)
class NotchFactor:
    """Kf of one peak by one method.

    ``kf`` and ``q`` are None when the method gives no number, and ``reason`` says why (a sharp or
    singular corner). ``q`` is also None when Kt = 1 (undefined). ``radius`` is the root radius
    (case length unit), ``gradient`` the relative stress gradient (1/length unit) and
    ``support_factor`` n for the gradient methods (``support``: how n was obtained).
    ``notes``: range flags and clamps."""

    method: NotchMethod
    kt: float
    kf: float | None
    q: float | None
    radius: float | None = None
    constant: MaterialConstant | None = None
    gradient: float | None = None
    support_factor: float | None = None
    notes: tuple[str, ...] = ()
    reason: str | None = None
    support: SupportFactor | None = None


# --- definitions ---------------------------------------------------------------------------------

def kf_from_q(kt: float, q: float) -> float:
    """Kf = 1 + q (Kt - 1) (definition of q)."""
    return 1.0 + q * (kt - 1.0)


def q_from_kf(kt: float, kf: float) -> float | None:
    """q = (Kf - 1)/(Kt - 1); None when Kt = 1."""
    return None if kt == 1.0 else (kf - 1.0) / (kt - 1.0)


def peterson_q(radius: float, a: float) -> float:
    """Peterson: q = 1/(1 + a/r), r and a in the same length unit."""
    return 1.0 / (1.0 + a / radius)


def neuber_q(radius: float, rho: float) -> float:
    """Neuber: q = 1/(1 + sqrt(rho'/r)), r and rho' in the same length unit."""
    return 1.0 / (1.0 + math.sqrt(rho / radius))


def heywood_kf(kt: float, radius: float, a_prime: float) -> float:
    """Heywood: Kf = Kt / (1 + 2 ((Kt - 1)/Kt) sqrt(a'/r)), r and a' in the same length unit."""
    return kt / (1.0 + 2.0 * (kt - 1.0) / kt * math.sqrt(a_prime / radius))


# --- published steel correlations ---------------------------------------------------------------

#: Peterson's a for steels: a = 0.0254 (2070/Su)^1.8 mm, Su in MPa, stated for Su >= 550 MPa
#: (N. E. Dowling, Mechanical Behavior of Materials, notch-sensitivity section, from memory; the
#: equivalent US form is 0.001 (300/Su[ksi])^1.8 in). Below 550 MPa we evaluate at 550 MPa and flag:
#: a falls as Su rises, so this gives the smaller a and the larger q (conservative, our own choice).
PETERSON_A_MM = 0.0254
PETERSON_SU_REF_MPA = 2070.0
PETERSON_EXPONENT = 1.8
PETERSON_SU_MIN_MPA = 550.0
PETERSON_SOURCE = ("Peterson 1959; steel fit a = 0.0254 (2070/Su)^1.8 mm as in Dowling, Mechanical "
                   "Behavior of Materials (from memory)")

#: Kuhn-Hardrath sqrt(rho') [sqrt(mm)] = c0 + c1 S + c2 S^2 + c3 S^3, S = Su in MPa, stated for
#: 340 <= Su <= 1700 MPa (Budynas & Nisbett, Shigley's MED, 9th ed., eq. 6-35a,b; coefficients
#: retrieved from course notes that reproduce them; equation numbers from memory)
KUHN_HARDRATH_SI = {
    "bending": (1.24, -2.25e-3, 1.60e-6, -4.11e-10),
    "torsion": (0.958, -1.83e-3, 1.43e-6, -4.11e-10),
}
KUHN_HARDRATH_SU_RANGE_MPA = (340.0, 1700.0)
KUHN_HARDRATH_SOURCE = ("Kuhn & Hardrath, NACA TN 2805 (1952); polynomial of Budynas & Nisbett, "
                        "Shigley's MED, 9th ed., eq. 6-35 (equation number from memory)")

#: Heywood's sqrt(a') = C / Su with C in sqrt(in)*kpsi: 5 (transverse hole), 4 (shoulder), 3 (groove)
#: (Heywood 1962 via Shigley's MED, 9th ed., Table 6-15, from memory). Converted exactly:
#: C_SI = C_US * sqrt(25.4) * 6.894757 sqrt(mm)*MPa (= 174, 139, 104 rounded).
HEYWOOD_C_US = {"transverse hole": 5.0, "shoulder": 4.0, "groove": 3.0}
MPA_PER_KSI = 6.894757293168361  # 4448.2216152605 N / 645.16 mm^2
HEYWOOD_SOURCE = ("Heywood, Designing against Fatigue (1962), as in Budynas & Nisbett, Shigley's MED, "
                  "9th ed., eq. 6-33 and Table 6-15 (from memory)")


def peterson_constant_steel(ultimate_strength: float, *, units: UnitScale) -> Estimate:
    """Peterson's a of a steel from Su (:data:`PETERSON_SOURCE`), in the case's length unit."""
    su = ultimate_strength * units.mpa_per_stress
    notes = ()
    su_used = su
    if su < PETERSON_SU_MIN_MPA:
        su_used = PETERSON_SU_MIN_MPA
        notes = (f"Su = {su:.0f} MPa below the fit's range (>= {PETERSON_SU_MIN_MPA:.0f} MPa): a evaluated "
                 f"at {PETERSON_SU_MIN_MPA:.0f} MPa (smaller a, larger q: conservative)",)
    a_mm = PETERSON_A_MM * (PETERSON_SU_REF_MPA / su_used) ** PETERSON_EXPONENT
    return Estimate("peterson_a", a_mm / units.mm_per_length, EstimateRule.PETERSON_STEEL, PETERSON_SOURCE,
                    True, (("ultimate_strength_MPa", su), ("a_mm", a_mm)), notes)


def neuber_constant_steel(ultimate_strength: float, loading: Loading, *, units: UnitScale) -> Estimate:
    """Neuber's rho' of a steel from Su by the Kuhn-Hardrath polynomial (:data:`KUHN_HARDRATH_SI`).

    Outside 340-1700 MPa the polynomial is evaluated at the nearest end and flagged. sqrt(rho') falls
    monotonically with Su over the whole range, so below it the clamp is conservative; above it
    sqrt(rho') <= 0.02 sqrt(mm) (bending). Where the polynomial is not positive (torsion above about
    1600 MPa) rho' = 0 is used, i.e. q = 1, Kf = Kt (conservative), and flagged."""
    torsion = Loading(loading) is Loading.TORSION
    rule = EstimateRule.KUHN_HARDRATH_TORSION if torsion else EstimateRule.KUHN_HARDRATH_BENDING
    c0, c1, c2, c3 = KUHN_HARDRATH_SI["torsion" if torsion else "bending"]
    su = ultimate_strength * units.mpa_per_stress
    lo, hi = KUHN_HARDRATH_SU_RANGE_MPA
    s = min(max(su, lo), hi)
    notes = []
    if s != su:
        notes.append(f"Su = {su:.0f} MPa outside the polynomial's range {lo:.0f}-{hi:.0f} MPa: "
                     f"evaluated at {s:.0f} MPa")
    root = c0 + c1 * s + c2 * s * s + c3 * s ** 3
    if root <= 0.0:
        notes.append(f"polynomial gives sqrt(rho') = {root:.4f} sqrt(mm) <= 0 at {s:.0f} MPa: rho' = 0 used "
                     "(q = 1, Kf = Kt)")
        root = 0.0
    rho_mm = root * root
    return Estimate("neuber_rho", rho_mm / units.mm_per_length, rule, KUHN_HARDRATH_SOURCE, False,
                    (("ultimate_strength_MPa", su), ("sqrt_rho_sqrt_mm", root)), tuple(notes))


def heywood_constant_steel(ultimate_strength: float, shape: NotchShape, *, units: UnitScale) -> Estimate:
    """Heywood's a' of a steel from Su and the notch shape (:data:`HEYWOOD_SOURCE`), in case length unit.

    Our source states no strength range for these constants."""
    su_ksi = ultimate_strength * units.mpa_per_stress / MPA_PER_KSI
    root_in = HEYWOOD_C_US[NotchShape(shape).value] / su_ksi   # sqrt(in)
    a_in = root_in * root_in
    a_mm = a_in * 25.4
    return Estimate("heywood_a", a_mm / units.mm_per_length, EstimateRule.HEYWOOD_STEEL, HEYWOOD_SOURCE, True,
                    (("ultimate_strength_ksi", su_ksi), ("sqrt_a_sqrt_in", root_in)),
                    ("no strength range stated in our source",))


# --- methods per peak ----------------------------------------------------------------------------

def _check_kt(kt: float) -> None:
    if isinstance(kt, bool) or not isinstance(kt, (int, float)) or not math.isfinite(kt) or kt <= 0:
        raise InputError(f"Kt = {kt!r} must be a positive finite number", item="kt")


def no_kf(method: NotchMethod, kt: float, radius: float | None, *, radius_required: bool,
          singular: bool) -> NotchFactor | None:
    """The record for a peak that gets no Kf by ``method``, or None when the method applies.

    No Kf at a singular corner, at a root radius of 0 (or None, for the radius-based methods), and where
    Kt < 1 (no stress raiser: q is not defined; our own rule)."""
    _check_kt(kt)
    if singular:
        reason = ("singular corner: the elastic peak grows without bound under mesh refinement, "
                  "so Kt and Kf are undefined")
    elif radius_required and radius is None:
        reason = "no root radius known for this peak: the radius-based methods do not apply"
    elif radius_required and radius <= 0:
        reason = f"sharp notch (root radius {radius!r}): Kt and Kf are undefined for a zero radius"
    elif radius is not None and (not math.isfinite(radius) or radius < 0):
        raise InputError(f"root radius = {radius!r} must be a finite number >= 0", item="radius")
    elif kt < 1.0:
        reason = f"Kt = {kt:.4g} < 1: no stress raiser, the notch-factor methods do not apply"
    else:
        return None
    return NotchFactor(method, kt, None, None, radius=radius, reason=reason)


def _constant(given: float | None, name: str, estimate) -> MaterialConstant:
    if given is not None:
        return MaterialConstant(name, given, ConstantOrigin.GIVEN)
    est = estimate()
    return MaterialConstant(name, est.value, ConstantOrigin.ESTIMATED, est)


def _need_su(strengths: Strengths, constant: str | None, method: NotchMethod, rule: EstimateRule) -> None:
    """Refuse an estimate without Su or for a material outside the steel groups; ``constant`` is the
    material constant the user could state instead (None: the method has no such entry)."""
    if strengths.ultimate_strength is None:
        if constant is None:
            raise InputError(f"{method.value} needs material.ultimate_strength, which is not given",
                             item="material.ultimate_strength", hint="state the ultimate strength")
        raise InputError(f"{method.value} needs material.{constant} or, for a steel, material.ultimate_strength "
                         "to estimate it; neither is given", item=f"material.{constant}",
                         hint="state the material constant, or the ultimate strength and a steel group")
    require_steel(strengths.group, rule=rule)


def peterson(kt: float, radius: float | None, strengths: Strengths, *, loading: Loading, units: UnitScale,
             singular: bool = False) -> NotchFactor:
    """Kf by Peterson's q = 1/(1 + a/r), with a given (``strengths.peterson_a``) or estimated for a steel.

    The steel fit is for normal stress (axial, bending); in torsion a is smaller (a factor of about 0.6
    is quoted, from memory, unsourced here), so in torsion a must be given: using the normal-stress a
    would understate q."""
    refused = no_kf(NotchMethod.PETERSON, kt, radius, radius_required=True, singular=singular)
    if refused:
        return refused
    if strengths.peterson_a is None:
        if Loading(loading) is Loading.TORSION:
            raise InputError("Peterson's steel fit for a is for normal stress; in torsion state "
                             "material.peterson_a",
                             item="material.peterson_a", hint="give Peterson's a for shear stress")
        _need_su(strengths, "peterson_a", NotchMethod.PETERSON, EstimateRule.PETERSON_STEEL)
    c = _constant(strengths.peterson_a, "a",
                  lambda: peterson_constant_steel(strengths.ultimate_strength, units=units))
    q = peterson_q(radius, c.value)
    return NotchFactor(NotchMethod.PETERSON, kt, kf_from_q(kt, q), q, radius, c,
                       notes=c.estimate.notes if c.estimate else ())


def neuber(kt: float, radius: float | None, strengths: Strengths, *, loading: Loading, units: UnitScale,
           singular: bool = False) -> NotchFactor:
    """Kf by Neuber's q = 1/(1 + sqrt(rho'/r)), rho' given (``strengths.neuber_rho``) or estimated for a
    steel by the Kuhn-Hardrath polynomial of ``loading`` (axial and bending share one)."""
    refused = no_kf(NotchMethod.NEUBER, kt, radius, radius_required=True, singular=singular)
    if refused:
        return refused
    if strengths.neuber_rho is None:
        rule = (EstimateRule.KUHN_HARDRATH_TORSION if Loading(loading) is Loading.TORSION
                else EstimateRule.KUHN_HARDRATH_BENDING)
        _need_su(strengths, "neuber_rho", NotchMethod.NEUBER, rule)
    c = _constant(strengths.neuber_rho, "rho'",
                  lambda: neuber_constant_steel(strengths.ultimate_strength, loading, units=units))
    q = neuber_q(radius, c.value)
    return NotchFactor(NotchMethod.NEUBER, kt, kf_from_q(kt, q), q, radius, c,
                       notes=c.estimate.notes if c.estimate else ())


def heywood(kt: float, radius: float | None, strengths: Strengths, *, shape: NotchShape, loading: Loading,
            units: UnitScale, singular: bool = False) -> NotchFactor:
    """Kf by Heywood's formula with a' estimated for a steel from Su and the notch shape.

    Our source gives the constants for normal stress only (from memory): refused in torsion."""
    refused = no_kf(NotchMethod.HEYWOOD, kt, radius, radius_required=True, singular=singular)
    if refused:
        return refused
    if Loading(loading) is Loading.TORSION:
        raise InputError("Heywood's constants are published for normal stress (axial, bending), not torsion",
                         item="loading", hint="use the Neuber/Kuhn-Hardrath torsion polynomial instead")
    _need_su(strengths, None, NotchMethod.HEYWOOD, EstimateRule.HEYWOOD_STEEL)
    est = heywood_constant_steel(strengths.ultimate_strength, shape, units=units)
    c = MaterialConstant("a'", est.value, ConstantOrigin.ESTIMATED, est)
    kf = heywood_kf(kt, radius, c.value)
    return NotchFactor(NotchMethod.HEYWOOD, kt, kf, q_from_kf(kt, kf), radius, c, notes=est.notes)
