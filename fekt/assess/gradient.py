"""Relative stress gradient at a peak and the support-factor estimates of Kf.

Relative stress gradient (Siebel & Stieler, VDI-Z 97, 1955, from memory; FKM guideline):

    chi* = G = (1/sigma_peak) |d sigma / d n|   at the peak, n the inward normal, unit 1/length.

* :func:`relative_gradient` takes it from samples of the stress along the inward normal (the FE
  field) by a least-squares polynomial fit; :func:`chart_gradient` gives the chart approximation from
  the root radius (FKM guideline, from memory, low-moderate confidence).
* :func:`fkm_support_factor`: the FKM support factor n_sigma(G, Rm, material group), Kf = Kt / n_sigma.
* :func:`siebel_stieler_support_factor`: n = 1 + sqrt(s_g chi*), Kf = Kt / n.

Exact values for checks (derived; docs/references.md, notch sensitivity): Kirsch hole in tension 7/(3a); unnotched
bar in bending or torsion 2/d.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

from ..errors import InputError
from .material import MaterialGroup, Strengths, UnitScale, require
from .notch import Loading, NotchFactor, NotchMethod, NotchShape, no_kf, q_from_kf

# --- (a) gradient from a sampled field -------------------------------------------------------------

#: default fit: a quadratic in depth over [0, h] with h = 0.05 r and 11 equally spaced samples (our own
#: choice). Truncation error of a degree-p least-squares fit over [0, h] (dense uniform samples, derived
#: from the shifted Legendre polynomials): slope error = k_p c_(p+1) h^p with k_1 = 1, k_2 = -3/5,
#: k_3 = 2/7, c_(p+1) the next Taylor coefficient. At a Kirsch hole (sigma/S = 3 - 7x + 16.5x^2 - 32x^3,
#: x = depth/a) the quadratic fit underestimates chi* by about 2.7 (h/a)^2: 0.7 % at h = 0.05 a.
DEFAULT_DEGREE = 2
DEFAULT_WINDOW = 0.05
DEFAULT_SAMPLES = 11


@dataclass(frozen=True)
class GradientFit:
    """A relative stress gradient from sampled stresses.

    ``chi``: -(d sigma/dn)/sigma at depth 0 (positive when the stress magnitude falls inward, as at a
    notch root; negative means the surface point is not a local peak along the normal). ``peak``:
    fitted stress at depth 0; ``slope``: fitted d sigma/dn there; ``window``: largest depth used;
    ``residual_rms``: RMS of the fit residuals; ``error_estimate``: |chi - chi of a fit one degree
    higher| (an estimate of the truncation error; None with too few samples for that fit)."""

    chi: float
    peak: float
    slope: float
    degree: int
    window: float
    samples: int
    residual_rms: float
    error_estimate: float | None


def sample_depths(radius: float, *, window: float = DEFAULT_WINDOW, count: int = DEFAULT_SAMPLES) -> np.ndarray:
    """Equally spaced depths 0 .. window*radius along the inward normal (the default fit's samples)."""
    if not (math.isfinite(radius) and radius > 0):
        raise InputError(f"root radius = {radius!r} must be positive to place gradient samples", item="radius")
    return np.linspace(0.0, window * radius, count)


def _fit_slope(t: np.ndarray, s: np.ndarray, degree: int, h: float):
    c = np.polynomial.polynomial.polyfit(t / h, s, degree)   # scaled abscissa: well conditioned
    resid = s - np.polynomial.polynomial.polyval(t / h, c)
    return c[0], c[1] / h, float(np.sqrt(np.mean(resid * resid)))


def relative_gradient(depths, stresses, *, degree: int = DEFAULT_DEGREE) -> GradientFit:
    """chi* at depth 0 from stresses sampled at ``depths`` (>= 0, along the inward normal).

    Least-squares polynomial of ``degree`` in depth; needs at least degree + 2 samples. The value at
    depth 0 and the slope both come from the fit (see :data:`DEFAULT_DEGREE` for its error)."""
    t = np.asarray(depths, dtype=float)
    s = np.asarray(stresses, dtype=float)
    if t.ndim != 1 or t.shape != s.shape:
        raise InputError(f"depths {t.shape} and stresses {s.shape} must be 1-D arrays of equal length",
                         item="gradient samples")
    if not (np.all(np.isfinite(t)) and np.all(np.isfinite(s))):
        raise InputError("depths and stresses must be finite", item="gradient samples")
    if degree < 1:
        raise InputError(f"degree = {degree} must be at least 1", item="gradient degree")
    if np.any(t < 0):
        raise InputError(f"depth {t.min():g} < 0: depths are measured inward from the surface",
                         item="gradient samples")
    if len(np.unique(t)) < degree + 2:
        raise InputError(f"{len(np.unique(t))} distinct depths: a degree-{degree} fit needs at least {degree + 2}",
                         item="gradient samples")
    h = float(t.max())
    peak, slope, rms = _fit_slope(t, s, degree, h)
    if peak == 0.0 or not math.isfinite(peak):
        raise InputError("the fitted stress at the surface is zero: no relative gradient", item="gradient samples")
    chi = -slope / peak
    err = None
    if len(np.unique(t)) >= degree + 3:
        p2, sl2, _ = _fit_slope(t, s, degree + 1, h)
        err = abs(chi - (-sl2 / p2))
    return GradientFit(float(chi), float(peak), float(slope), degree, h, int(t.size), rms, err)


# --- (b) chart approximation from the root radius ------------------------------------------------

@dataclass(frozen=True)
class ChartGradient:
    """Chart approximation of G (1/length unit). ``phi``: the groove/shoulder depth term (0 when not
    applied); ``formula``: what was evaluated; ``from_memory``/``confidence`` of the source."""

    value: float
    shape: NotchShape
    loading: Loading
    phi: float
    formula: str
    source: str
    from_memory: bool
    confidence: str
    notes: tuple[str, ...] = ()


#: FKM guideline, "Analytical Strength Assessment of Components", 6th ed. 2012 (VDMA), relative stress
#: gradient of notched bars (from memory, low-moderate confidence): tension/bending G = A/r (1 + phi)
#: with A = 2 (groove), 2.3 (shoulder); torsion G = B/r with B = 1 (groove), 1.15 (shoulder); plus 2/d
#: for the net section in bending and torsion; phi = 1/(4 sqrt(t/r) + 2) for t/d <= 0.25, else 0.
#: The transverse-hole entry 2.3/r is unverified, only suggested by Kirsch's exact value
#: 7/(3a) = 2.33/a.
CHART_GRADIENT_SOURCE = "FKM guideline, 6th ed. 2012, relative stress gradient of notched bars (from memory)"
CHART_A_NORMAL = {NotchShape.GROOVE: 2.0, NotchShape.SHOULDER: 2.3, NotchShape.HOLE: 2.3}
CHART_B_TORSION = {NotchShape.GROOVE: 1.0, NotchShape.SHOULDER: 1.15}
PHI_DEPTH_LIMIT = 0.25


def chart_phi(depth: float, radius: float, net_size: float) -> float:
    """phi = 1/(4 sqrt(t/r) + 2) if t/d <= 0.25, else 0 (t notch depth, d net size)."""
    return 1.0 / (4.0 * math.sqrt(depth / radius) + 2.0) if depth / net_size <= PHI_DEPTH_LIMIT else 0.0


def chart_gradient(shape: NotchShape, radius: float, loading: Loading, *, net_size: float | None = None,
                   depth: float | None = None) -> ChartGradient:
    """Chart approximation of G from the root radius (:data:`CHART_GRADIENT_SOURCE`).

    ``net_size``: net diameter or net width d (needed in bending and torsion for the 2/d term, and for
    phi); ``depth``: notch depth t (for phi; without it phi = 0, which gives the lower G and so the
    smaller support factor: conservative). All lengths in the case's length unit."""
    shape, loading = NotchShape(shape), Loading(loading)
    if not (isinstance(radius, (int, float)) and math.isfinite(radius) and radius > 0):
        raise InputError(f"root radius = {radius!r} must be positive for a chart gradient", item="radius")
    for name, v in (("net_size", net_size), ("depth", depth)):
        if v is not None and not (math.isfinite(v) and v > 0):
            raise InputError(f"{name} = {v!r} must be a positive finite number", item=name)
    notes = []
    net_term = loading in (Loading.BENDING, Loading.TORSION)
    if net_term and net_size is None:
        raise InputError(f"the chart gradient in {loading.value} needs the net size d (2/d term)", item="net_size")
    if shape is NotchShape.HOLE:
        notes.append("transverse-hole entry 2.3/r unverified in the guideline")
    if loading is Loading.TORSION:
        if shape not in CHART_B_TORSION:
            raise InputError(f"no chart gradient for {shape.value} in torsion", item="shape")
        phi = 0.0
        value = CHART_B_TORSION[shape] / radius
        formula = f"{CHART_B_TORSION[shape]:g}/r"
    else:
        phi = 0.0
        if shape is not NotchShape.HOLE:
            if depth is not None and net_size is not None:
                phi = chart_phi(depth, radius, net_size)
            else:
                notes.append("phi not evaluated (notch depth or net size not given): lower G, conservative")
        value = CHART_A_NORMAL[shape] / radius * (1.0 + phi)
        formula = f"{CHART_A_NORMAL[shape]:g}/r (1 + phi)"
    if net_term:
        value += 2.0 / net_size
        formula += " + 2/d"
    return ChartGradient(value, shape, loading, phi, formula, CHART_GRADIENT_SOURCE, True, "low-moderate",
                         tuple(notes))


# --- (c) support factors -------------------------------------------------------------------------

#: FKM material-group constants aG, bG [MPa] (FKM guideline, 6th ed. 2012, from memory)
FKM_GROUP_CONSTANTS: dict[MaterialGroup, tuple[float, float]] = {
    MaterialGroup.STAINLESS_STEEL: (0.40, 2400.0),
    MaterialGroup.STEEL: (0.50, 2700.0),
    MaterialGroup.CAST_STEEL: (0.25, 2000.0),
    MaterialGroup.NODULAR_IRON: (0.05, 3200.0),
    MaterialGroup.MALLEABLE_IRON: (-0.05, 3200.0),
    MaterialGroup.GREY_IRON: (-0.05, 3200.0),
    MaterialGroup.WROUGHT_ALUMINIUM: (0.05, 850.0),
    MaterialGroup.CAST_ALUMINIUM: (-0.05, 3200.0),
}
FKM_SOURCE = "FKM guideline, Analytical Strength Assessment of Components, 6th ed. 2012 (from memory)"
#: the formula's stated domain of G (per mm); above it we evaluate at the limit (n grows with G, so this
#: is conservative) and flag
FKM_G_MAX_PER_MM = 100.0


@dataclass(frozen=True)
class SupportFactor:
    """A support factor n and how it was obtained: ``gradient`` in 1/case length; for FKM also
    ``gradient_per_mm`` and ``rm_mpa`` as evaluated, the material group and its constants."""

    value: float
    method: NotchMethod
    branch: str
    gradient: float
    gradient_per_mm: float | None = None
    rm_mpa: float | None = None
    group: MaterialGroup | None = None
    a_g: float | None = None
    b_g: float | None = None
    notes: tuple[str, ...] = ()


def fkm_support_factor(gradient: float, ultimate_strength: float, group: MaterialGroup, *,
                       units: UnitScale) -> SupportFactor:
    """FKM support factor n_sigma (:data:`FKM_SOURCE`), G in 1/case length, Rm in the case's stress unit::

        n = 1 + G*mm * 10^-(aG - 0.5 + Rm/bG)        G <= 0.1 /mm
        n = 1 + sqrt(G*mm) * 10^-(aG + Rm/bG)         0.1 < G <= 1 /mm
        n = 1 + (G*mm)^(1/4) * 10^-(aG + Rm/bG)       1 < G <= 100 /mm

    The branches are continuous at 0.1 and 1 /mm."""
    if not (isinstance(gradient, (int, float)) and math.isfinite(gradient) and gradient >= 0):
        raise InputError(f"relative stress gradient = {gradient!r} must be finite and >= 0 (a negative value "
                         "means the point is not a peak along the normal)", item="gradient")
    if group not in FKM_GROUP_CONSTANTS:
        raise InputError(f"material group {group!r} has no FKM constants; use one of "
                         f"{', '.join(g.value for g in FKM_GROUP_CONSTANTS)}", item="material.group")
    a_g, b_g = FKM_GROUP_CONSTANTS[group]
    g = gradient / units.mm_per_length          # 1/length -> 1/mm
    rm = ultimate_strength * units.mpa_per_stress
    notes = ()
    if g > FKM_G_MAX_PER_MM:
        notes = (f"G = {g:.4g} /mm above {FKM_G_MAX_PER_MM:g} /mm: evaluated at {FKM_G_MAX_PER_MM:g} /mm",)
        g_used = FKM_G_MAX_PER_MM
    else:
        g_used = g
    if g_used <= 0.1:
        n, branch = 1.0 + g_used * 10.0 ** -(a_g - 0.5 + rm / b_g), "G <= 0.1 /mm"
    elif g_used <= 1.0:
        n, branch = 1.0 + math.sqrt(g_used) * 10.0 ** -(a_g + rm / b_g), "0.1 < G <= 1 /mm"
    else:
        n, branch = 1.0 + g_used ** 0.25 * 10.0 ** -(a_g + rm / b_g), "1 < G <= 100 /mm"
    return SupportFactor(n, NotchMethod.FKM_SUPPORT, branch, gradient, g, rm, group, a_g, b_g, notes)


def siebel_stieler_support_factor(gradient: float, s_g: float) -> SupportFactor:
    """Siebel-Stieler support factor n = 1 + sqrt(s_g chi*) (Siebel & Stieler, VDI-Z 97, 1955, from
    memory, moderate), s_g and 1/chi* in the same length unit."""
    if not (math.isfinite(gradient) and gradient >= 0):
        raise InputError(f"relative stress gradient = {gradient!r} must be finite and >= 0", item="gradient")
    return SupportFactor(1.0 + math.sqrt(s_g * gradient), NotchMethod.SIEBEL_STIELER, "n = 1 + sqrt(s_g chi*)",
                         gradient)


def _support_kf(method: NotchMethod, kt: float, gradient: float, n: SupportFactor) -> NotchFactor:
    kf = kt / n.value
    notes = n.notes
    if kf < 1.0:
        kf = 1.0
        notes += (f"Kt/n = {kt / n.value:.4g} < 1: Kf = 1 used (a notch does not raise the fatigue strength; "
                  "our own bound)",)
    return NotchFactor(method, kt, kf, q_from_kf(kt, kf), gradient=gradient, support_factor=n.value,
                       notes=notes, support=n)


def fkm_notch_factor(kt: float, gradient: float, strengths: Strengths, *, units: UnitScale,
                     singular: bool = False) -> NotchFactor:
    """Kf = Kt / n_sigma (FKM), G the relative stress gradient at the peak (1/case length)."""
    refused = no_kf(NotchMethod.FKM_SUPPORT, kt, None, radius_required=False, singular=singular)
    if refused:
        return refused
    require(strengths, ("ultimate_strength", "group"), purpose="The FKM support factor")
    n = fkm_support_factor(gradient, strengths.ultimate_strength, strengths.group, units=units)
    return _support_kf(NotchMethod.FKM_SUPPORT, kt, gradient, n)


def siebel_stieler_notch_factor(kt: float, gradient: float, strengths: Strengths, *,
                                singular: bool = False) -> NotchFactor:
    """Kf = Kt / (1 + sqrt(s_g chi*)) with s_g = ``strengths.siebel_sg`` (given; no estimate)."""
    refused = no_kf(NotchMethod.SIEBEL_STIELER, kt, None, radius_required=False, singular=singular)
    if refused:
        return refused
    require(strengths, ("siebel_sg",), purpose="The Siebel-Stieler support factor")
    n = siebel_stieler_support_factor(gradient, strengths.siebel_sg)
    return _support_kf(NotchMethod.SIEBEL_STIELER, kt, gradient, n)
