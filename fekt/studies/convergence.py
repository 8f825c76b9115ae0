"""Refinement ladders, hot-spot tracking across meshes, and the uncertainty attached to every Kt.

A study runs one *level runner* (mesh settings -> values at the hot spots) on a ladder of
systematically refined meshes, tracks each hot spot of the finest mesh back through the coarser ones
(same feature, nearest location), and estimates each hot spot's discretisation uncertainty with the
Grid Convergence Index (:mod:`fekt.studies.gci`; Roache 1994, Celik et al. 2008).

Ladders (level 0 is the case's own mesh, so a study starts from what ``fekt solve`` reports):
* default: elements per notch radius multiplied by the ratio r per level (the grading rule and the
  largest element size stay the same, so refinement is concentrated where the peak is formed);
* ``nested``: gmsh splits every element of the case's mesh k times (ratio 2 exactly; new boundary
  nodes snap to the curves, shared notes F2); the far field is refined too, so it costs 4x per level.

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
from concurrent.futures import ProcessPoolExecutor
from dataclasses import dataclass

from ..case.schema import Case, MeshSpec
from ..errors import InputError
from ..pipeline import Result, run
from .gci import ConvergenceEstimate, estimate, format_value

#: formal order of the peak stress for quadratic elements (references 4.6)
FORMAL_ORDER = 2.0
#: a non-singular hot spot whose values change by less than this fraction between meshes, but not
#: monotonically, is scatter at the level of element-to-element differences rather than divergence
#: (our own threshold: sharp corners grow by tens of percent per level; no published source)
SCATTER_LIMIT = 0.01
#: safety factor on the largest change for non-monotone sequences (as for two-grid studies, Roache 1994)
FS_NON_MONOTONE = 3.0


@dataclass(frozen=True)
class Sample:
    """One hot spot's value on one mesh; ``key`` is its owning feature."""

    key: str
    x: float
    y: float
    value: float
    singular: bool = False
    rank: int = 0  # rank of the hot spot in its own result
    kind: str = ""  # feature kind ("edge" when the hot spot belongs to no notch feature)
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
    """One tracked hot spot: values fine -> coarse and the uncertainty estimate."""

    rank: int
    key: str
    x: float
    y: float
    singular: bool
    values: tuple[float, ...]  # fine -> coarse
    sizes: tuple[float, ...]
    dofs: tuple[int, ...]
    verdict: str  # monotone / oscillatory / diverging / singular / converged / two-grid / untracked
    estimate: ConvergenceEstimate | None
    band: float | None  # absolute uncertainty of the fine value (None when there is none)
    extrapolated: float | None
    message: str
    gross_over_net: float | None = None


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


def case_samples(result: Result) -> tuple[Sample, ...]:
    """Kt_net at each hot spot of a pipeline result (hot spots without a Kt are skipped)."""
    out = []
    for h in result.hot_spots:
        if h.kt_net is None:
            continue
        ratio = h.kt_gross / h.kt_net if h.kt_gross is not None else None
        scatter = h.scatter / abs(h.sigma_nom_net) if h.sigma_nom_net else 0.0
        out.append(Sample(h.feature, h.x, h.y, h.kt_net, h.singular, h.rank, h.feature_kind, ratio, scatter))
    return tuple(out)


def _case_level(case: Case, spec: MeshSpec, h: float, equilibrium: str) -> tuple[Level, Result]:
    t0 = time.perf_counter()
    r = run(dataclasses.replace(case, mesh=spec), equilibrium=equilibrium).result
    lvl = Level(spec, r.mesh["elements"], r.mesh["dofs"], h, time.perf_counter() - t0, case_samples(r))
    return lvl, r


def run_case_levels(case: Case, specs: Sequence[MeshSpec], *, jobs: int = 1,
                    progress: Callable[[int, Level], None] | None = None) -> tuple[list[Level], list[Result]]:
    """Run the pipeline on each mesh (coarse -> fine). ``jobs > 1`` uses processes (gmsh is
    process-global, so never threads)."""
    levels: list[Level | None] = [None] * len(specs)
    results: list[Result | None] = [None] * len(specs)
    hs = level_sizes(specs)
    # coarse levels only warn about equilibrium; the finest one must pass the check
    eq = ["warn"] * (len(specs) - 1) + ["fail"]
    if jobs <= 1:
        for i, s in enumerate(specs):
            levels[i], results[i] = _case_level(case, s, hs[i], eq[i])
            if progress:
                progress(i, levels[i])
    else:
        with ProcessPoolExecutor(max_workers=jobs) as pool:
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
    # a peak that moved by more than a quarter of the part's size is a different hot spot
    if math.hypot(best.x - target.x, best.y - target.y) > 0.25 * scale:
        return None
    return best


def track(levels: Sequence[Level], scale: float) -> list[tuple[Sample, list[Sample | None]]]:
    """For each hot spot of the finest level, its matches on every level (fine -> coarse)."""
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
    """Uncertainty of each finest-level hot spot from the ladder (fine value, band, verdict).

    ``local_ladder``: the ladder refined only at notch features, so hot spots on plain edges were not
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
            out.append(SpotStudy(verdict="untracked", estimate=None, band=None, extrapolated=None,
                                 message="this hot spot has no counterpart on the coarser mesh; no estimate",
                                 **common))
            continue
        if local_ladder and s.kind == "edge":
            change = max(abs(a - b) for a, b in zip(vals[:-1], vals[1:]))
            band = max(FS_NON_MONOTONE * change, s.scatter)
            out.append(SpotStudy(verdict="not refined", estimate=None, band=band, extrapolated=None,
                                 message=(f"Kt_net = {vals[0]:.5g} +- {band:.2g} (plain edge: this ladder refines only "
                                          f"at notch features, so no order is estimated; band = the larger of "
                                          f"{FS_NON_MONOTONE:g} x the largest change and the local stress scatter; "
                                          "use --nested to refine here)"),
                                 **common))
            continue
        est = estimate(vals, sizes, formal_order=formal_order, policy=policy)
        verdict = est.classification
        band = est.uncertainty_abs if math.isfinite(est.uncertainty_abs) else None
        extrap = est.extrapolated
        if s.singular:
            verdict, band, extrap = "singular", None, None
            msg = (f"singular: the peak at the sharp corner ({s.x:.4g}, {s.y:.4g}) keeps rising with refinement "
                   f"({', '.join(f'{v:.4g}' for v in reversed(vals))} from coarse to fine); it has no finite "
                   "value: give the corner a radius")
        elif verdict in ("diverging", "oscillatory"):
            used = vals[:3]
            change = max(abs(a - b) for a, b in zip(used[:-1], used[1:]))
            extrap = None
            if verdict == "diverging" and change > SCATTER_LIMIT * abs(vals[0]):
                band = None
                msg = ("diverging: the value moves more on finer meshes "
                       f"({', '.join(f'{v:.5g}' for v in reversed(vals))} from coarse to fine); not extrapolated, "
                       "no band")
            else:
                verdict = "scatter" if verdict == "diverging" else verdict
                band = FS_NON_MONOTONE * change
                msg = (f"Kt_net = {vals[0]:.5g} +- {band:.2g} ({verdict}: changes between meshes are not monotone; "
                       f"not extrapolated; band = {FS_NON_MONOTONE:g} x the largest change, {change:.2g})")
        else:
            msg = format_value("Kt_net", vals[0], est)
        if band is not None and s.scatter > band:
            msg = (f"Kt_net = {vals[0]:.5g} +- {s.scatter:.2g} (band set by the local stress scatter at the peak; "
                   f"the convergence band alone was {band:.2g}: {msg})")
            band = s.scatter
        out.append(SpotStudy(verdict=verdict, estimate=est, band=band, extrapolated=extrap, message=msg, **common))
    return out


def part_scale(result: Result) -> float:
    """A length for matching tolerances: the larger loaded end width."""
    return max(e["width"] for e in result.load["ends"])


# --- the estimate attached to every `fekt solve` ------------------------------------------------

#: the second mesh of the two-grid estimate is coarser by this ratio (elements per radius halved,
#: largest element doubled)
TWO_GRID_RATIO = 2.0


def two_grid_uncertainty(case: Case, fine: Result) -> dict:
    """Two-grid GCI (Roache 1994: Fs = 3 with the formal order p = 2) for every hot spot of ``fine``.

    The second mesh has half the case's elements per notch radius (about a third of the cost).
    Returns a JSON-able dict for :attr:`Result.uncertainty`."""
    coarse_spec = dataclasses.replace(case.mesh, elements_per_radius=case.mesh.elements_per_radius / TWO_GRID_RATIO)
    coarse_lvl, _ = _case_level(case, coarse_spec, TWO_GRID_RATIO, "warn")
    fine_lvl = Level(case.mesh, fine.mesh["elements"], fine.mesh["dofs"], 1.0, 0.0, case_samples(fine))
    spots = study_spots([coarse_lvl, fine_lvl], part_scale(fine))
    return uncertainty_dict(spots, method=("two-grid GCI (Roache 1994): second mesh with half the elements per "
                                           "notch radius, Fs = 3, formal order p = 2; band on the fine-mesh Kt"),
                            extra={"coarse_dofs": int(coarse_lvl.dofs), "coarse_seconds": coarse_lvl.seconds})


def uncertainty_dict(spots: Sequence[SpotStudy], *, method: str, extra: dict | None = None) -> dict:
    """Per hot spot (keyed by the finest mesh's rank) the band on Kt_net and Kt_gross."""
    per = {}
    for s in spots:
        g = s.gross_over_net
        per[str(s.rank)] = {
            "feature": s.key, "verdict": s.verdict, "kt_net": s.values[0] if s.values else None,
            "kt_net_band": s.band, "kt_gross_band": (s.band * g if (s.band is not None and g) else None),
            "kt_net_extrapolated": s.extrapolated, "values_fine_to_coarse": list(s.values),
            "observed_order": s.estimate.observed_order if s.estimate else None,
            "message": s.message,
        }
    out = {"method": method, "hot_spots": per}
    if extra:
        out.update(extra)
    return out


@dataclass(frozen=True)
class Study:
    """A whole refinement study of one case (``fekt converge``)."""

    case_name: str
    demo: bool
    ratio: float
    nested: bool
    levels: tuple[Level, ...]  # level 0 (the case's mesh) first
    spots: tuple[SpotStudy, ...]
    finest: Result
    seconds: float

    def to_dict(self) -> dict:
        return {
            "case_name": self.case_name, "demo": self.demo, "ratio": self.ratio, "nested": self.nested,
            "seconds": self.seconds,
            "method": ("Grid Convergence Index: observed order by Celik et al. (2008), Richardson "
                       "extrapolation, Fs = 1.25 when the observed order is within 10 % of 2, else Fs = 3 "
                       "(Roache 1994; Oberkampf & Roy 2010)"),
            "levels": [{"level": i, "elements_per_radius": lv.spec.elements_per_radius, "refine": lv.spec.refine,
                        "elements": int(lv.elements), "dofs": int(lv.dofs), "relative_size": lv.h,
                        "seconds": lv.seconds} for i, lv in enumerate(self.levels)],
            "hot_spots": [{
                "rank": s.rank, "feature": s.key, "x": s.x, "y": s.y, "singular": s.singular,
                "verdict": s.verdict, "kt_net_fine": s.values[0], "kt_net_band": s.band,
                "kt_net_extrapolated": s.extrapolated,
                "observed_order": s.estimate.observed_order if s.estimate else None,
                "safety_factor": s.estimate.safety_factor if s.estimate else None,
                "values_fine_to_coarse": list(s.values), "dofs_fine_to_coarse": [int(d) for d in s.dofs],
                "message": s.message} for s in self.spots],
            "caution": self.finest.caution,
        }


def converge(case: Case, *, levels: int = 3, ratio: float = 2.0, nested: bool = False, jobs: int = 1,
             progress: Callable[[int, Level], None] | None = None) -> Study:
    """Run a refinement study; level 0 is the case's own mesh."""
    t0 = time.perf_counter()
    specs = ladder(case.mesh, levels, ratio, nested=nested)
    lv, results = run_case_levels(case, specs, jobs=jobs, progress=progress)
    spots = study_spots(lv, part_scale(results[-1]), local_ladder=not nested)
    return Study(case.name, case.demo, ratio if not nested else 2.0, nested, tuple(lv), tuple(spots),
                 results[-1], time.perf_counter() - t0)
