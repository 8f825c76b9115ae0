"""Refinement ladders, stress-peak tracking across meshes, and the uncertainty attached to every Kt.

A study runs one *level runner* (mesh settings -> values at the stress peaks) on a ladder of
systematically refined meshes, tracks each stress peak of the finest mesh back through the coarser ones
(same feature, nearest location), and estimates each peak's discretisation uncertainty with the
Grid Convergence Index (:mod:`fekt.studies.gci`; Roache 1994, Celik et al. 2008).

Ladders (level 0 is the case's own mesh, so a study starts from what ``fekt solve`` reports):
* default: elements per notch radius multiplied by the ratio r per level (the grading rule and the
  largest element size stay the same, so refinement is concentrated where the peak is formed);
* ``nested``: gmsh splits every element of the case's mesh k times (ratio 2 exactly; new boundary
  nodes snap to the curves, docs/pitfalls.md F2); the far field is refined too, so it costs 4x per level.

Representative size: the element size at the notch features relative to level 0, h_k = r^-k; the
ratio between levels is exactly r for both ladders (the peak is a local quantity, so the local size
is the one that matters; Celik et al. 2008 step 1 uses a global average, which for locally refined
meshes would misstate the ratio).
"""

from __future__ import annotations

import dataclasses
import math
import time
from collections.abc import Callable, Sequence
from dataclasses import dataclass

from ..case.schema import Case, MeshSpec
from ..errors import InputError
from ..kinds import EquilibriumMode, FeatureKind, Verdict
from ..pipeline import run
from ..records import STUDY_SCHEMA, Band, EstimateFacts, Result, to_jsonable
from .executors import process_pool
from .gci import FS_NON_MONOTONE, ConvergenceEstimate, estimate

#: formal order of the peak stress for quadratic elements (docs/references.md, grid convergence)
FORMAL_ORDER = 2.0
#: a non-singular peak whose values change by less than this fraction between meshes, but not
#: monotonically, is scatter at the level of element-to-element differences rather than divergence
#: (our own threshold: sharp corners grow by tens of percent per level; no published source)
SCATTER_LIMIT = 0.01


@dataclass(frozen=True)
class Sample:
    """One stress peak's value on one mesh; ``key`` is its owning feature."""

    key: str
    x: float
    y: float
    value: float
    singular: bool = False
    rank: int = 0  # rank of the peak in its own result (0: not from a result, e.g. a synthetic test)
    kind: FeatureKind | None = None  # EDGE when the peak belongs to no notch feature
    gross_over_net: float | None = None  # Kt_gross / Kt_net (same peak, other nominal stress)
    scatter: float = 0.0  # local roughness of the peak in Kt units (a floor for the band)


@dataclass(frozen=True)
class Level:
    spec: MeshSpec
    elements: int
    dofs: int
    h: float
    seconds: float
    samples: tuple[Sample, ...]


@dataclass(frozen=True)
class SpotStudy:
    """One tracked stress peak: values fine -> coarse, the verdict and the band (numbers only; the
    report says what they mean).

    ``convergence_band`` is the band from the grid study alone; ``scatter_floor`` says the local stress
    scatter was larger and set ``band``; ``largest_change`` is the largest change between meshes for
    sequences that are banded by it (non-monotone, plain edges)."""

    rank: int
    key: str
    x: float
    y: float
    singular: bool
    values: tuple[float, ...]  # fine -> coarse
    sizes: tuple[float, ...]
    dofs: tuple[int, ...]
    verdict: Verdict
    estimate: ConvergenceEstimate | None
    band: float | None  # absolute uncertainty of the fine value (None when there is none)
    extrapolated: float | None
    gross_over_net: float | None = None
    convergence_band: float | None = None
    scatter_floor: bool = False
    largest_change: float | None = None


def ladder(spec: MeshSpec, levels: int, ratio: float = 2.0, *, nested: bool = False) -> list[MeshSpec]:
    """Mesh settings from level 0 (the case's mesh) to the finest."""
    if levels < 2:
        raise InputError(f"levels = {levels} must be at least 2", item="levels")
    if levels > 8:
        raise InputError(f"levels = {levels} is more than 8; each level costs 2-4x the previous", item="levels")
    if nested:
        if abs(ratio - 2.0) > 1e-12:
            raise InputError(f"ratio = {ratio:.6g}: nested splitting always halves the elements", item="ratio",
                             hint="leave the ratio at 2 with nested refinement")
        return [dataclasses.replace(spec, refine=spec.refine + k) for k in range(levels)]
    if not ratio > 1.1:
        raise InputError(f"ratio = {ratio:.6g} must be above 1.1", item="ratio",
                         hint="Celik et al. (2008) recommend refinement ratios above 1.3")
    return [dataclasses.replace(spec, elements_per_radius=spec.elements_per_radius * ratio ** k)
            for k in range(levels)]


def level_sizes(specs: Sequence[MeshSpec]) -> list[float]:
    """Relative element size at the features for each level (see the module docstring)."""
    e0 = specs[0].elements_per_radius * 2 ** specs[0].refine
    return [e0 / (s.elements_per_radius * 2 ** s.refine) for s in specs]


def case_samples(result: Result, peaks=None) -> tuple[Sample, ...]:
    """Kt_net at each stress peak of a pipeline result, or of ``peaks`` (one load case's; peaks without a
    Kt are skipped)."""
    out = []
    for h in (result.peaks if peaks is None else peaks):
        if h.kt_net is None:
            continue
        ratio = h.kt_gross / h.kt_net if h.kt_gross is not None else None
        scatter = h.scatter / abs(h.sigma_nom_net) if h.sigma_nom_net else 0.0
        out.append(Sample(h.feature, h.x, h.y, h.kt_net, h.singular, h.rank, h.feature_kind, ratio, scatter))
    return tuple(out)


def _case_level(case: Case, spec: MeshSpec, h: float, equilibrium: EquilibriumMode) -> tuple[Level, Result]:
    t0 = time.perf_counter()
    r = run(dataclasses.replace(case, mesh=spec), equilibrium=equilibrium).result
    lvl = Level(spec, r.mesh.elements, r.mesh.dofs, h, time.perf_counter() - t0, case_samples(r))
    return lvl, r


def run_case_levels(case: Case, specs: Sequence[MeshSpec], *, jobs: int = 1,
                    progress: Callable[[int, Level], None] | None = None) -> tuple[list[Level], list[Result]]:
    """Run the pipeline on each mesh (coarse -> fine). ``jobs > 1`` uses processes (gmsh is
    process-global, so never threads)."""
    levels: list[Level | None] = [None] * len(specs)
    results: list[Result | None] = [None] * len(specs)
    hs = level_sizes(specs)
    # coarse levels only warn about equilibrium; the finest one must pass the check
    eq = [EquilibriumMode.WARN] * (len(specs) - 1) + [EquilibriumMode.FAIL]
    if jobs <= 1:
        for i, s in enumerate(specs):
            levels[i], results[i] = _case_level(case, s, hs[i], eq[i])
            if progress:
                progress(i, levels[i])
    else:
        with process_pool(jobs) as pool:
            futs = [pool.submit(_case_level, case, s, hs[i], eq[i]) for i, s in enumerate(specs)]
            for i, f in enumerate(futs):
                levels[i], results[i] = f.result()
                if progress:
                    progress(i, levels[i])
    return list(levels), list(results)


def _match(target: Sample, candidates: Sequence[Sample], scale: float) -> Sample | None:
    same = [c for c in candidates if c.key == target.key]
    if not same:
        return None
    best = min(same, key=lambda c: math.hypot(c.x - target.x, c.y - target.y))
    # a peak that moved by more than a quarter of the part's size is a different peak
    if math.hypot(best.x - target.x, best.y - target.y) > 0.25 * scale:
        return None
    return best


def track(levels: Sequence[Level], scale: float) -> list[tuple[Sample, list[Sample | None]]]:
    """For each stress peak of the finest level, its matches on every level (fine -> coarse)."""
    finest = levels[-1]
    out = []
    for s in finest.samples:
        chain: list[Sample | None] = [s]
        for lvl in reversed(levels[:-1]):
            chain.append(_match(s, lvl.samples, scale))
        out.append((s, chain))
    return out


def study_spots(levels: Sequence[Level], scale: float, *, formal_order: float = FORMAL_ORDER,
                policy: str = "oberkampf-roy", local_ladder: bool = True) -> list[SpotStudy]:
    """Uncertainty of each finest-level peak from the ladder (fine value, band, verdict).

    ``local_ladder``: the ladder refined only at notch features, so peaks on plain edges were not
    refined systematically; they get no order or extrapolation, only a conservative scatter band."""
    out = []
    for i, (s, chain) in enumerate(track(levels, scale), start=1):
        rank = s.rank or i
        n_ok = 0
        for c in chain:
            if c is None:
                break
            n_ok += 1
        vals = tuple(c.value for c in chain[:n_ok])
        sizes = tuple(lvl.h for lvl in list(reversed(levels))[:n_ok])
        dofs = tuple(lvl.dofs for lvl in list(reversed(levels))[:n_ok])
        common = dict(rank=rank, key=s.key, x=s.x, y=s.y, singular=s.singular, values=vals, sizes=sizes,
                      dofs=dofs, gross_over_net=s.gross_over_net)
        if n_ok < 2:
            out.append(SpotStudy(verdict=Verdict.UNTRACKED, estimate=None, band=None, extrapolated=None, **common))
            continue
        if local_ladder and s.kind == FeatureKind.EDGE:
            change = max(abs(a - b) for a, b in zip(vals[:-1], vals[1:]))
            band = max(FS_NON_MONOTONE * change, s.scatter)
            out.append(SpotStudy(verdict=Verdict.NOT_REFINED, estimate=None, band=band, extrapolated=None,
                                 largest_change=change, **common))
            continue
        est = estimate(vals, sizes, formal_order=formal_order, policy=policy)
        verdict = Verdict(est.classification)
        band = est.uncertainty_abs if math.isfinite(est.uncertainty_abs) else None
        extrap = est.extrapolated
        change = None
        if s.singular:
            verdict, band, extrap = Verdict.SINGULAR, None, None
        elif verdict in (Verdict.DIVERGING, Verdict.OSCILLATORY):
            used = vals[:3]
            change = max(abs(a - b) for a, b in zip(used[:-1], used[1:]))
            extrap = None
            if verdict == Verdict.DIVERGING and change > SCATTER_LIMIT * abs(vals[0]):
                band = None
            else:
                verdict = Verdict.SCATTER if verdict == Verdict.DIVERGING else verdict
                band = FS_NON_MONOTONE * change
        convergence_band = band
        floor = band is not None and s.scatter > band
        if floor:
            band = s.scatter
        out.append(SpotStudy(verdict=verdict, estimate=est, band=band, extrapolated=extrap,
                             convergence_band=convergence_band, scatter_floor=floor, largest_change=change,
                             **common))
    return out


def band_record(s: SpotStudy, method: str) -> Band:
    """The band of one tracked peak as it goes into the peak's record."""
    g = s.gross_over_net
    est = s.estimate
    return Band(verdict=s.verdict, method=method, kt_net=s.band,
                kt_gross=(s.band * g if (s.band is not None and g) else None),
                values_fine_to_coarse=tuple(s.values), dofs_fine_to_coarse=tuple(int(d) for d in s.dofs),
                observed_order=est.observed_order if est else None, order_used=est.order_used if est else None,
                gci_fs=est.safety_factor if est else None, extrapolated=s.extrapolated,
                convergence_band=s.convergence_band, scatter_floor=s.scatter_floor, largest_change=s.largest_change,
                formal_order=est.formal_order if est else FORMAL_ORDER)


def part_scale(result: Result) -> float:
    """A length for matching tolerances: the larger loaded end width (the square root of the part's area
    when no end is loaded)."""
    if result.load.ends:
        return max(e.width for e in result.load.ends)
    return float(result.mesh.area) ** 0.5


# --- the estimate attached to every `fekt solve` ------------------------------------------------

#: the second mesh of the two-grid estimate is coarser by this ratio (elements per radius halved,
#: largest element doubled)
TWO_GRID_RATIO = 2.0
TWO_GRID = "two-grid"
STUDY = "study"


def two_grid_bands(case: Case, fine: Result) -> tuple[EstimateFacts, dict[int, Band], dict[str, dict[int, Band]]]:
    """Two-grid GCI (Roache 1994: Fs = 3 with the formal order p = 2) for every peak of ``fine``.

    The second mesh has half the case's elements per notch radius (about a third of the cost).
    Returns how the estimate was made, each peak's band keyed by the peak's rank, and the same for the
    peaks of each named load case (keyed by the case's name)."""
    coarse_spec = dataclasses.replace(case.mesh, elements_per_radius=case.mesh.elements_per_radius / TWO_GRID_RATIO)
    coarse_lvl, coarse = _case_level(case, coarse_spec, TWO_GRID_RATIO, EquilibriumMode.WARN)
    scale = part_scale(fine)

    def bands_of(coarse_peaks, fine_peaks) -> dict[int, Band]:
        c = dataclasses.replace(coarse_lvl, samples=case_samples(coarse, coarse_peaks))
        f = Level(case.mesh, fine.mesh.elements, fine.mesh.dofs, 1.0, 0.0, case_samples(fine, fine_peaks))
        return {s.rank: band_record(s, TWO_GRID) for s in study_spots([c, f], scale)}

    facts = EstimateFacts(method=TWO_GRID, ratio=TWO_GRID_RATIO, coarse_dofs=int(coarse_lvl.dofs),
                          coarse_seconds=coarse_lvl.seconds)
    per_case = {fc.name: bands_of(cc.peaks, fc.peaks) for cc, fc in zip(coarse.load_cases, fine.load_cases)}
    return facts, bands_of(coarse.peaks, fine.peaks), per_case


def with_bands(result: Result, facts: EstimateFacts, bands: dict[int, Band],
               per_case: dict[str, dict[int, Band]] | None = None) -> Result:
    """The result with each peak's band set (peaks with no counterpart keep None), in every load case."""
    peaks = tuple(dataclasses.replace(p, band=bands.get(p.rank)) for p in result.peaks)
    cases = tuple(dataclasses.replace(c, peaks=tuple(dataclasses.replace(p, band=(per_case or {}).get(c.name, {})
                                                                         .get(p.rank)) for p in c.peaks))
                  for c in result.load_cases)
    timings = dataclasses.replace(result.timings, estimate_s=facts.coarse_seconds)
    return dataclasses.replace(result, peaks=peaks, estimate=facts, timings=timings, load_cases=cases)


@dataclass(frozen=True)
class LevelFacts:
    """One mesh of a study as reported."""

    level: int
    elements_per_radius: float
    refine: int
    elements: int
    dofs: int
    relative_size: float
    seconds: float


@dataclass(frozen=True)
class Study:
    """A whole refinement study of one case (``fekt converge``); numbers and verdicts only."""

    case_name: str
    demo: bool
    ratio: float
    nested: bool
    formal_order: float
    policy: str
    levels: tuple[LevelFacts, ...]  # level 0 (the case's mesh) first
    spots: tuple[SpotStudy, ...]
    seconds: float
    caution: str
    schema: str = STUDY_SCHEMA

    def to_dict(self) -> dict:
        return to_jsonable(self)


def converge(case: Case, *, levels: int = 3, ratio: float = 2.0, nested: bool = False, jobs: int = 1,
             progress: Callable[[int, Level], None] | None = None, feature: str | None = None) -> Study:
    """Run a refinement study; level 0 is the case's own mesh. ``feature``: study only that feature's peaks."""
    t0 = time.perf_counter()
    specs = ladder(case.mesh, levels, ratio, nested=nested)
    lv, results = run_case_levels(case, specs, jobs=jobs, progress=progress)
    spots = study_spots(lv, part_scale(results[-1]), local_ladder=not nested)
    if feature is not None:
        known = sorted({s.key for s in spots})
        spots = [s for s in spots if s.key == feature]
        if not spots:
            raise InputError(f"the part has no stress peak on a feature named '{feature}'", item="feature",
                             hint=f"features with peaks: {', '.join(known)}")
    facts = tuple(LevelFacts(i, l.spec.elements_per_radius, l.spec.refine, int(l.elements), int(l.dofs), l.h,
                             l.seconds) for i, l in enumerate(lv))
    return Study(case.name, case.demo, ratio if not nested else 2.0, nested, FORMAL_ORDER, "oberkampf-roy", facts,
                 tuple(spots), time.perf_counter() - t0, results[-1].caution)
