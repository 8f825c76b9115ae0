"""Typed result records, and the one serialiser that turns any of them into JSON-ready data.

Every stage that reports something returns one of these frozen records: no dictionaries read by
string keys, no field filled in later. They hold numbers and verdicts only; the sentences users read
are written in :mod:`fekt.report`. This module sits at the bottom of the package: every stage may
import it.
"""

from __future__ import annotations

import dataclasses
import math
from dataclasses import dataclass, field
from enum import Enum

import numpy as np

from .kinds import Basis, FeatureKind, PeakReason, Verdict

#: schema versions of the JSON files fekt writes (raise the number when a key changes meaning)
RESULT_SCHEMA = "fekt.result/2"
STUDY_SCHEMA = "fekt.study/2"
SWEEP_SCHEMA = "fekt.sweep/2"
TARGET_SCHEMA = "fekt.target/2"
CHARTS_SCHEMA = "fekt.charts/2"
ASSESSMENT_SCHEMA = "fekt.assessment/1"


@dataclass(frozen=True)
class SectionRecord:
    """A section as reported: axial position, material intervals (transverse coordinate), width, area,
    centroid point, second moment and polar moment."""

    s: float
    width: float
    area: float
    centroid: tuple[float, float]
    inertia: float
    intervals: tuple[tuple[float, float], ...]
    polar: float = 0.0


@dataclass(frozen=True)
class Band:
    """The discretisation uncertainty of one peak's Kt.

    ``kt_net``/``kt_gross``: half-widths on Kt_net and Kt_gross (None where there is no band: a diverging
    sequence, a singular corner). ``values_fine_to_coarse``: Kt_net on each mesh of the estimate.
    ``convergence_band``: the band from the grid study alone; ``scatter_floor`` is True when the local
    stress scatter at the peak was larger and set the band. ``largest_change`` is used for non-monotone
    sequences. ``method`` is ``two-grid`` (fekt solve) or ``study`` (fekt converge)."""

    verdict: Verdict
    method: str
    kt_net: float | None
    kt_gross: float | None
    values_fine_to_coarse: tuple[float, ...]
    dofs_fine_to_coarse: tuple[int, ...] = ()
    observed_order: float | None = None
    order_used: float | None = None
    gci_fs: float | None = None
    extrapolated: float | None = None
    convergence_band: float | None = None
    scatter_floor: bool = False
    largest_change: float | None = None
    formal_order: float = 2.0


@dataclass(frozen=True)
class ChartCheck:
    """A published chart fit beside the FE Kt of a peak (numbers only).

    ``kind`` is ``family`` (the case is a standard shape) or ``nearest`` (the chart of the shape the
    feature resembles, measured from the geometry). ``coverage`` is ``inside`` or ``outside``."""

    kind: str
    family: str
    load: str
    fit: str
    source: str
    confidence: str
    from_memory: bool
    basis: Basis
    nominal: str
    dims: dict[str, float]
    chart_kt: float
    fe_kt: float | None
    difference_pct: float | None
    band_pct: float
    within_band: bool
    coverage: str
    coverage_notes: tuple[str, ...]
    ratios: dict[str, float]
    chart_kt_net: float | None = None
    component: str = ""  # the load component compared ("" when the load has one component)


@dataclass(frozen=True)
class NoChart:
    """Why a peak or a family case gets no chart value: ``reason`` is a code (see
    :mod:`fekt.charts.crosscheck`), ``detail`` the published gap note or the measurement that failed."""

    reason: str
    detail: str = ""
    family: str | None = None
    load: str | None = None
    component: str = ""


@dataclass(frozen=True)
class ComponentKt:
    """One load component's share of a peak: its stress at the peak point (the tangential stress, or the
    shear for a torque), its nominal stress on the net and gross sections, and its Kt on each."""

    name: str
    quantity: str
    stress: float
    sigma_nom_net: float
    kt_net: float | None
    sigma_nom_gross: float | None
    kt_gross: float | None
    load: str = ""  # the case file's load it belongs to


@dataclass(frozen=True)
class PeakGradient:
    """The relative stress gradient at a peak from the solved field (:mod:`fekt.post.gradient`).

    ``chi`` = -(d sigma/dn)/sigma at the peak, n the inward normal (1/length; positive where the stress
    magnitude falls inward); ``surface`` the fitted stress at the peak (the measure of the peaks);
    ``depth`` and ``half_width`` the sampled window (length), ``radius`` the boundary's radius of curvature
    at the peak where it is concave (a notch root, a hole, a fillet; inf on a straight or convex edge), ``coordinate`` how depth entered the fit, ``degree`` the fit's degree in depth,
    ``points`` the stress samples used, ``error_estimate`` |chi - chi of a fit one degree higher| (1/length).
    ``chi`` is None when there is no gradient, and ``reason`` says why (a singular corner, a coarse mesh)."""

    chi: float | None
    surface: float | None = None
    depth: float | None = None
    half_width: float | None = None
    radius: float | None = None
    coordinate: str = ""
    degree: int = 0
    points: int = 0
    error_estimate: float | None = None
    reason: str | None = None


@dataclass(frozen=True)
class StressPeak:
    """One reported stress peak: where it is, what owns it, its net section, nominal stresses and Kt.

    ``peak`` is the signed boundary stress the peaks are ranked by (its magnitude; the measure is
    ``Result.measure``); Kt = peak / nominal stress keeps the sign convention of the nominal stress there
    (positive where both have the same sign). ``components`` gives each load component's Kt at the same
    point. ``gross_section`` is None where no gross section applies (``gross_rule`` says why).
    ``scatter`` is the roughness of the boundary stress there (stress units, a floor for the band);
    ``band`` and ``chart`` are None when the estimate or the chart check was not asked for (or has
    nothing to say: see ``chart``'s :class:`NoChart`). ``gradient``: the relative stress gradient at the
    peak from the FE field (None when it was not computed)."""

    rank: int
    x: float
    y: float
    feature: str
    feature_kind: FeatureKind
    singular: bool
    reason: PeakReason
    peak: float
    radius: float
    element_size: float
    net_section: SectionRecord
    N: float
    M: float
    sigma_nom_net: float
    kt_net: float | None
    gross_section: SectionRecord | None
    gross_rule: str
    sigma_nom_gross: float | None
    kt_gross: float | None
    equilibrium_error: float
    scatter: float
    components: tuple[ComponentKt, ...] = ()
    band: Band | None = None
    chart: ChartCheck | NoChart | None = None
    component_charts: tuple[ChartCheck | NoChart, ...] = ()
    #: torque on the net section (shafts; 0 for plates)
    T: float = 0.0
    #: angle around the shaft's axis where the peak occurs (degrees from the drawn meridian), when the
    #: load case's stress varies around the axis (bending with other loads); None otherwise
    theta: float | None = None
    #: non-empty for a load-introduction peak (where a load or support enters the part): says which; such
    #: peaks are listed apart from notch peaks and never taken as "the" Kt unless asked for by name
    introduction: str = ""
    #: how the nominal stress was found when not by net-section statics (stated in the case, a remote
    #: stress), or why there is none (supports on both sides of the section); empty: statics
    nominal_source: str = ""
    gradient: PeakGradient | None = None

    @property
    def compressive(self) -> bool:
        return self.peak < 0


@dataclass(frozen=True)
class MeshFacts:
    elements: int
    nodes: int
    dofs: int
    element: str
    min_scaled_jacobian: float
    size_max: float
    feature_sizes: dict[str, float]
    elements_per_radius: float
    refine: int
    area: float
    solver: str


@dataclass(frozen=True)
class Timings:
    """Seconds spent per stage of the fine-mesh pipeline (``total_s`` their sum); ``estimate_s`` the
    coarse mesh of the two-grid band and ``wall_s`` the whole solve as the user waited for it, where known."""

    geometry_s: float
    mesh_s: float
    assemble_s: float
    solve_s: float
    post_s: float
    total_s: float
    estimate_s: float | None = None
    charts_s: float | None = None
    wall_s: float | None = None


@dataclass(frozen=True)
class Provenance:
    versions: dict[str, str]
    case_sha256_16: str
    max_reaction_over_load: float


@dataclass(frozen=True)
class UnitsRecord:
    length: str
    force: str
    stress: str
    moment: str


@dataclass(frozen=True)
class ComponentFacts:
    """One load component as applied: its name, the load it belongs to, what it is and how big."""

    name: str
    load: str
    quantity: str
    magnitude: float


@dataclass(frozen=True)
class EndFacts:
    name: str
    width: float
    moment: float
    centroid: tuple[float, float]


@dataclass(frozen=True)
class LoadFacts:
    """The applied loads: load axis, total axial force, loaded ends and every component."""

    axis: tuple[float, float]
    force: float
    ends: tuple[EndFacts, ...]
    components: tuple[ComponentFacts, ...]


@dataclass(frozen=True)
class Compressive:
    sigma: float
    x: float
    y: float


@dataclass(frozen=True)
class EstimateFacts:
    """How the bands of a solve were estimated (the two-grid estimate's coarse mesh)."""

    method: str
    ratio: float
    coarse_dofs: int
    coarse_seconds: float


@dataclass(frozen=True)
class FamilyCheck:
    """A standard-shape case checked against its chart: which peak was compared, or why none was."""

    family: str
    load: str | None
    peak_rank: int | None
    no_chart: NoChart | None = None


@dataclass(frozen=True)
class ContactRecord:
    """A pin's contact in one load case: the arc in contact (degrees either side of the force direction,
    from the outermost nodes in contact), the nodes in contact, the active-set iterations, the largest
    overlap left (length) and the pin's displacement."""

    load: str
    case: str
    arc_from: float
    arc_to: float
    nodes: int
    iterations: int
    overlap: float
    pin_displacement: tuple[float, float]


@dataclass(frozen=True)
class LoadCaseRecord:
    """One load case of a case file: its factors (load name -> factor), its ranked stress peaks, its most
    compressive boundary stress and the contact of its pins."""

    name: str
    factors: tuple[tuple[str, float], ...]
    peaks: tuple[StressPeak, ...]
    most_compressive: Compressive
    contacts: tuple[ContactRecord, ...] = ()


@dataclass(frozen=True)
class Result:
    """Everything ``fekt solve`` reports; :func:`to_jsonable` gives the JSON content."""

    case_name: str
    source: str
    demo: bool
    units: UnitsRecord
    model: str
    model_label: str
    thickness: float | None  # None for a model without one (a shaft)
    material: dict[str, float]
    load: LoadFacts
    mesh: MeshFacts
    timings: Timings
    peaks: tuple[StressPeak, ...]
    most_compressive: Compressive
    warnings: tuple[str, ...]
    notes: tuple[str, ...]
    caution: str
    provenance: Provenance
    measure: str = "tangential"
    estimate: EstimateFacts | None = None
    family_check: FamilyCheck | None = None
    #: the names of the mesh-plane coordinates ((x, y) for plates, (z, r) for shafts)
    coordinates: tuple[str, str] = ("x", "y")
    #: how the nominal stress of the load case is formed (the model's words, for reports)
    nominal_rule: str = ""
    #: the load cases when the case file names them (``peaks`` are then those of the first); else empty
    load_cases: tuple[LoadCaseRecord, ...] = ()
    #: the pins' contact (the first load case's, or the only one's)
    contacts: tuple[ContactRecord, ...] = ()
    schema: str = field(default=RESULT_SCHEMA)

    def to_dict(self) -> dict:
        return to_jsonable(self)

    def peak(self, rank: int) -> StressPeak:
        for p in self.peaks:
            if p.rank == rank:
                return p
        raise KeyError(rank)


# --- the strength and fatigue assessment (fekt.assess.assessment) --------------------------------------

@dataclass(frozen=True)
class EstimateRecord:
    """A material value estimated from another by a published rule. ``value`` is in the case's units of
    ``dimension`` (``stress`` or ``length``); ``inputs`` says what it was estimated from, in the units the
    rule is published in."""

    quantity: str
    value: float
    dimension: str
    rule: str
    source: str
    from_memory: bool
    inputs: str = ""
    notes: tuple[str, ...] = ()


@dataclass(frozen=True)
class StrengthFacts:
    """The strengths and material constants the case states (None where not given)."""

    yield_strength: float | None
    ultimate_strength: float | None
    fatigue_strength: float | None
    fatigue_basis: str
    peterson_a: float | None
    neuber_rho: float | None
    siebel_sg: float | None
    group: str | None


@dataclass(frozen=True)
class GradientCheck:
    """The FE relative stress gradient at a peak beside the chart approximation from its root radius.
    ``difference_pct`` = 100 (chart / FE - 1); ``reason`` says why one of them is missing."""

    fe: float | None
    fe_error: float | None
    chart: float | None
    chart_formula: str = ""
    chart_source: str = ""
    difference_pct: float | None = None
    notes: tuple[str, ...] = ()
    reason: str | None = None


@dataclass(frozen=True)
class NotchFactorRecord:
    """Kf of one peak by one method: ``formula`` names what was evaluated; ``constant``/``constant_value``
    the material length used (``constant_origin`` ``given`` or ``estimated``); ``support_factor`` n and
    ``gradient`` for the support-factor methods. ``kf`` is None with ``reason`` when the method gives none."""

    method: str
    kf: float | None
    q: float | None
    formula: str
    constant: str = ""
    constant_value: float | None = None
    constant_origin: str = ""
    support_factor: float | None = None
    relative_gradient: float | None = None
    notes: tuple[str, ...] = ()
    reason: str | None = None


@dataclass(frozen=True)
class StaticRecord:
    """A stress against the yield strength: ``factor`` = Sy / |stress| (None with ``reason``)."""

    kind: str
    stress: float
    yield_strength: float
    factor: float | None
    note: str | None = None
    reason: str | None = None


@dataclass(frozen=True)
class CriterionRecord:
    """One mean-stress criterion's fatigue safety factor on the local cycle."""

    criterion: str
    factor: float | None
    compressive_mean: bool = False
    reason: str | None = None


@dataclass(frozen=True)
class FatigueRecord:
    """The fatigue check of one peak.

    The cycle: the net nominal stress and the elastic peak stress at its two ends (stated factors on the
    load, or load cases); the local cycle = ``local_ratio`` x the elastic peak stresses, with
    ``local_ratio`` = Kf/Kt (= Kf x the nominal stress), Kf by ``notch_method``. Safety factors by each
    criterion, the governing one, and first-cycle yield (Langer line) of the local cycle."""

    notch_method: str
    kf: float | None
    local_ratio: float
    nominal_max: float
    nominal_min: float
    elastic_max: float
    elastic_min: float
    local_max: float
    local_min: float
    local_mean: float
    local_amplitude: float
    fatigue_strength: float
    criteria: tuple[CriterionRecord, ...]
    governing: str | None
    governing_factor: float | None
    first_cycle_yield: float | None
    notes: tuple[str, ...] = ()


@dataclass(frozen=True)
class KfSpread:
    """The lowest and highest Kf of a peak among the methods that give one; ``spread_pct`` = 100 (high/low - 1)."""

    low_method: str
    low: float
    high_method: str
    high: float
    spread_pct: float


@dataclass(frozen=True)
class PeakAssessment:
    """Everything the assessment says about one stress peak (rank, place and Kt as in the result).
    ``radius``: the root radius the notch-factor methods used (the boundary's radius of curvature at the
    peak, else the feature's smallest radius)."""

    rank: int
    feature: str
    feature_kind: FeatureKind
    singular: bool
    x: float
    y: float
    radius: float
    kt: float | None
    peak: float
    sigma_nom_net: float
    loading: str
    shape: str | None
    relative_gradient: GradientCheck
    notch_factors: tuple[NotchFactorRecord, ...]
    kf_spread: KfSpread | None
    static_peak: StaticRecord
    static_net: StaticRecord
    fatigue: FatigueRecord | None
    reason: str | None = None


@dataclass(frozen=True)
class Governing:
    """The peak with the smallest safety factor of one kind of check, and the check (criterion) itself."""

    rank: int
    feature: str
    check: str
    factor: float


@dataclass(frozen=True)
class Assessment:
    """The strength and fatigue assessment of a solved case (``fekt assess``); :func:`to_jsonable` gives
    the JSON content. ``cycle`` describes where the fatigue cycle came from (None: static checks only)."""

    case_name: str
    source: str
    demo: bool
    units: UnitsRecord
    strengths: StrengthFacts
    estimates: tuple[EstimateRecord, ...]
    cycle: str | None
    notch_factor: str
    criteria: tuple[str, ...]
    peaks: tuple[PeakAssessment, ...]
    static_peak_governing: Governing | None
    static_net_governing: Governing | None
    fatigue_governing: Governing | None
    notes: tuple[str, ...]
    cautions: tuple[str, ...]
    schema: str = field(default=ASSESSMENT_SCHEMA)

    def to_dict(self) -> dict:
        return to_jsonable(self)

    def peak(self, rank: int) -> PeakAssessment:
        for p in self.peaks:
            if p.rank == rank:
                return p
        raise KeyError(rank)


def to_jsonable(x):
    """Plain JSON data from records, enums, numpy values and containers (non-finite numbers become null;
    dataclasses become objects with their field names, in order)."""
    if dataclasses.is_dataclass(x) and not isinstance(x, type):
        return {f.name: to_jsonable(getattr(x, f.name)) for f in dataclasses.fields(x)}
    if isinstance(x, Enum):
        return x.value
    if isinstance(x, dict):
        return {str(k): to_jsonable(v) for k, v in x.items()}
    if isinstance(x, (list, tuple)):
        return [to_jsonable(v) for v in x]
    if isinstance(x, np.ndarray):
        return [to_jsonable(v) for v in x.tolist()]
    if isinstance(x, (bool, np.bool_)):
        return bool(x)
    if isinstance(x, (np.floating, float)):
        v = float(x)
        return v if math.isfinite(v) else None
    if isinstance(x, np.integer):
        return int(x)
    return x


__all__ = [
    "Assessment", "CriterionRecord", "EstimateRecord", "FatigueRecord", "Governing", "GradientCheck", "KfSpread",
    "NotchFactorRecord", "PeakAssessment", "PeakGradient", "StaticRecord", "StrengthFacts", "ASSESSMENT_SCHEMA",
    "Band", "ChartCheck", "ComponentFacts", "ComponentKt", "Compressive", "EndFacts", "EstimateFacts", "FamilyCheck",
    "LoadFacts", "MeshFacts", "NoChart", "Provenance", "Result", "SectionRecord", "StressPeak", "Timings",
    "UnitsRecord", "to_jsonable", "RESULT_SCHEMA", "STUDY_SCHEMA", "SWEEP_SCHEMA", "TARGET_SCHEMA", "CHARTS_SCHEMA",
]
