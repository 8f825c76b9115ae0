"""Design sweeps over a case's named parameters, goal-seeking a dimension, fits of the results.

Each point rebuilds the case from its file table with the parameters overridden and runs the normal
pipeline (with the two-grid uncertainty unless switched off). A point whose geometry becomes invalid is
recorded with its message and the sweep goes on. Points run serially, in a local process pool (gmsh
is process-global: processes, never threads) or on a Dask cluster; results are identical whichever
runs them, because every point is computed by the same deterministic function.
"""

from __future__ import annotations

import itertools
import os
import time
from collections.abc import Callable, Iterable, Sequence
from dataclasses import dataclass, field

import numpy as np

from ..case.expr import resolve_parameters
from ..case.loader import case_from_dict
from ..errors import FektError, InputError
from ..kinds import FeatureKind
from ..records import ChartCheck, to_jsonable
from ..registry import CATALOGUE

#: columns of the CSV file, in order (after the varied parameters)
COLUMNS = ("index", "status", "feature", "kt_net", "kt_net_band", "kt_gross", "kt_gross_band", "chart_kt",
           "chart_basis", "peak", "seconds", "message")


@dataclass(frozen=True)
class PeakSummary:
    """One stress peak of a sweep point, as kept in the sweep's files (every peak of every point)."""

    rank: int
    feature: str
    kind: str
    peak: float
    kt_net: float | None
    kt_net_band: float | None
    kt_gross: float | None
    kt_gross_band: float | None
    singular: bool


@dataclass(frozen=True)
class PointResult:
    """One point of a sweep: its parameter values, its status, the followed feature's Kt (top-level fields)
    and every peak of the solve (``peaks``)."""

    index: int
    values: dict[str, float]
    status: str  # "ok", "invalid" (the input is wrong at this point), "failed" (the solve failed)
    message: str = ""
    feature: str = ""
    kt_net: float | None = None
    kt_net_band: float | None = None
    kt_gross: float | None = None
    kt_gross_band: float | None = None
    chart_kt: float | None = None
    chart_basis: str = ""
    peak: float | None = None
    seconds: float = 0.0
    peaks: tuple[PeakSummary, ...] = ()
    #: every parameter of the case at this point (varied and not varied, expressions evaluated); empty
    #: when the parameters themselves cannot be evaluated there
    parameters: dict[str, float] = field(default_factory=dict)

    def to_json(self) -> dict:
        return to_jsonable(self)

    @classmethod
    def from_json(cls, d: dict) -> "PointResult":
        fields = dict(d)
        fields["peaks"] = tuple(PeakSummary(**p) for p in fields.get("peaks", ()))
        return cls(**fields)


def point_parameters(table: dict, values: dict[str, float]) -> dict[str, float]:
    """Every parameter of the case file's table with ``values`` overriding the named ones ({} when the
    parameters cannot be evaluated: the point's own message then says why)."""
    raw = table.get("parameters", {})
    if not isinstance(raw, dict):
        return {}
    try:
        return resolve_parameters({**raw, **values})
    except InputError:
        return {}


def followed_peak(peaks, feature: str | None):
    """The peak a study follows: the named feature's largest-magnitude peak, or by default the notch peak
    (any feature but a plain edge, no singular corner) with the largest Kt_net. None when there is none."""
    finite = [h for h in peaks if h.kt_net is not None]
    if feature is not None:
        mine = [h for h in finite if h.feature == feature]
        return max(mine, key=lambda h: abs(h.peak)) if mine else None
    spots = [h for h in finite if not h.singular]
    notch = [h for h in spots if h.feature_kind != FeatureKind.EDGE] or spots
    return max(notch, key=lambda h: h.kt_net) if notch else None


def grid(varies: Sequence[tuple[str, list[float]]]) -> list[dict[str, float]]:
    """Every combination of the varied values (first parameter varies slowest)."""
    names = [n for n, _ in varies]
    if len(set(names)) != len(names):
        raise InputError("a parameter is varied twice", item="vary")
    return [dict(zip(names, combo)) for combo in itertools.product(*(v for _, v in varies))]


def run_point(table: dict, source: str, index: int, values: dict[str, float], estimate: bool = True,
              feature: str | None = None) -> PointResult:
    """Solve one sweep point; never raises for problems of the point itself (they are recorded).

    ``feature``: the feature whose Kt the point reports (default: the notch peak with the largest Kt)."""
    from .evaluate import solve_full

    t0 = time.perf_counter()
    params = point_parameters(table, values)
    try:
        case = case_from_dict(table, source, overrides=values, catalogue=CATALOGUE)
        r = solve_full(case, estimate=estimate).result
    except InputError as exc:
        return PointResult(index, values, "invalid", str(exc), seconds=time.perf_counter() - t0, parameters=params)
    except FektError as exc:
        return PointResult(index, values, "failed", str(exc), seconds=time.perf_counter() - t0, parameters=params)
    summaries = tuple(PeakSummary(h.rank, h.feature, str(h.feature_kind), h.peak, h.kt_net,
                                  h.band.kt_net if h.band else None, h.kt_gross,
                                  h.band.kt_gross if h.band else None, h.singular) for h in r.peaks)
    top = followed_peak(r.peaks, feature)
    if top is None:
        what = f"feature '{feature}' has no stress peak with a finite Kt here" if feature else \
            "no stress peak with a finite Kt"
        known = sorted({h.feature for h in r.peaks})
        return PointResult(index, values, "failed", what + (f" (features: {', '.join(known)})" if feature else ""),
                           seconds=time.perf_counter() - t0, peaks=summaries, parameters=params)
    band_n, band_g = (top.band.kt_net, top.band.kt_gross) if top.band else (None, None)
    chart, basis = None, ""
    if r.family_check is not None and r.family_check.peak_rank is not None:
        check = r.peak(r.family_check.peak_rank).chart
        if isinstance(check, ChartCheck):
            chart, basis = check.chart_kt, str(check.basis)
    return PointResult(index, values, "ok", "", top.feature, top.kt_net, band_n, top.kt_gross, band_g, chart, basis,
                       top.peak, time.perf_counter() - t0, summaries, dict(case.parameters))


# --- executors --------------------------------------------------------------------------------------

def _serial(tasks, submit_args):
    for t in tasks:
        yield run_point(*submit_args(t))


def _pool(tasks, submit_args, workers: int):
    from .executors import imap_unordered, process_pool

    with process_pool(workers) as pool:
        yield from imap_unordered(pool, run_point, (submit_args(t) for t in tasks))


def _dask(tasks, submit_args, scheduler):
    from dask.distributed import Client, as_completed

    client = scheduler if hasattr(scheduler, "submit") else Client(scheduler)
    try:
        futs = [client.submit(run_point, *submit_args(t), pure=False) for t in tasks]
        for f in as_completed(futs):
            yield f.result()
    finally:
        if client is not scheduler:
            client.close()


def run_points(table: dict, source: str, points: Sequence[dict[str, float]], *, estimate: bool = True,
               executor: str = "pool", workers: int | None = None, scheduler=None,
               skip: Iterable[int] = (), on_result: Callable[[PointResult], None] | None = None,
               feature: str | None = None) -> list[PointResult]:
    """Run the sweep; ``skip`` holds indices already finished (resume). Results come back in index order."""
    skip = set(skip)
    tasks = [(i, p) for i, p in enumerate(points) if i not in skip]

    def args(t):
        i, p = t
        return table, source, i, p, estimate, feature

    if executor == "serial" or not tasks:
        stream = _serial(tasks, args)
    elif executor == "pool":
        stream = _pool(tasks, args, workers or os.cpu_count() or 1)
    elif executor == "dask":
        stream = _dask(tasks, args, scheduler)
    else:
        raise InputError(f"unknown executor '{executor}'", item="executor", hint="serial, pool or dask")
    out = []
    for r in stream:
        out.append(r)
        if on_result:
            on_result(r)
    return sorted(out, key=lambda r: r.index)


# --- fits --------------------------------------------------------------------------------------------

#: the two-parameter form cubic in u with coefficients linear in sqrt(q) and q
CUBIC_SQRT = "cubic-sqrt"

@dataclass(frozen=True)
class Fit:
    form: str
    formula: str
    coefficients: dict[str, float]
    max_residual: float
    rms_residual: float
    ranges: dict[str, tuple[float, float]]
    points: int
    curve: tuple[tuple[float, ...], tuple[float, ...]] | None = None  # the fitted Kt over the range (1 parameter)
    residual_dof: int = 0  # points less coefficients
    typical_band: float | None = None  # the median band of the fitted points (how well the FE knows them)


#: points of the fitted curve that plots draw
CURVE_POINTS = 200


def fit_results(results: Sequence[PointResult], names: Sequence[str], form: str, basis: str = "net") -> Fit:
    """Least-squares fit of Kt over the ok points.

    ``poly:N`` polynomial of degree N in one varied parameter x; ``power``: Kt = A x^b; ``cubic-sqrt``
    (two parameters u, q): Kt = C1 + C2 u + C3 u^2 + C4 u^3, Ci = ci0 + ci1 sqrt(q) + ci2 q (the form of
    several published flat-bar chart fits)."""
    ok = [r for r in results if r.status == "ok"]
    key = "kt_net" if basis == "net" else "kt_gross"
    y = np.array([getattr(r, key) for r in ok], dtype=float)
    X = {n: np.array([r.values[n] for r in ok], dtype=float) for n in names}
    ranges = {n: (float(X[n].min()), float(X[n].max())) for n in names} if ok else {}
    if form.startswith("poly"):
        deg = _degree(form)
        _need_params(names, 1, form)
        x = X[names[0]]
        _need_points(len(y), deg + 1, form)
        c = np.polyfit(x, y, deg)
        pred = np.polyval(c, x)
        model = lambda xs, c=c: np.polyval(c, xs)  # noqa: E731
        coeffs = {f"c{k}": float(c[deg - k]) for k in range(deg + 1)}  # c0 first, as the formula reads
        formula = " + ".join(f"c{k}*{names[0]}^{k}" for k in range(deg + 1))
    elif form == "power":
        _need_params(names, 1, form)
        x = X[names[0]]
        _need_points(len(y), 2, form)
        if (x <= 0).any() or (y <= 0).any():
            raise InputError("the power form needs positive parameter values and Kt", item="fit")
        b, lnA = np.polyfit(np.log(x), np.log(y), 1)
        pred = np.exp(lnA) * x ** b
        model = lambda xs, a=np.exp(lnA), b=b: a * xs ** b  # noqa: E731
        coeffs = {"A": float(np.exp(lnA)), "b": float(b)}
        formula = f"A*{names[0]}^b"
    elif form == CUBIC_SQRT:
        _need_params(names, 2, form)
        u, q = X[names[0]], X[names[1]]
        _need_points(len(y), 12, form)
        if (q < 0).any():
            raise InputError(f"the {CUBIC_SQRT} form needs {names[1]} >= 0", item="fit")
        cols, labels = [], []
        for i in range(4):
            for j, g in enumerate((np.ones_like(q), np.sqrt(q), q)):
                cols.append(g * u ** i)
                labels.append(f"c{i + 1}{j}")
        A = np.vstack(cols).T
        c, *_ = np.linalg.lstsq(A, y, rcond=None)
        pred = A @ c
        model = None
        coeffs = dict(zip(labels, map(float, c)))
        formula = (f"sum_i (ci0 + ci1*sqrt({names[1]}) + ci2*{names[1]}) * {names[0]}^(i-1), i = 1..4")
    else:
        raise InputError(f"unknown fit form '{form}'", item="fit", hint=f"poly:N, power or {CUBIC_SQRT}")
    res = y - pred
    curve = None
    if model is not None and len(names) == 1:
        xs = np.linspace(*ranges[names[0]], CURVE_POINTS)
        curve = (tuple(map(float, xs)), tuple(map(float, model(xs))))
    bands = [getattr(r, f"{key}_band") for r in ok]
    bands = [b for b in bands if b is not None]
    return Fit(form, formula, coeffs, float(np.max(np.abs(res))), float(np.sqrt(np.mean(res ** 2))), ranges, len(y),
               curve, len(y) - len(coeffs), float(np.median(bands)) if bands else None)


def _degree(form: str) -> int:
    text = form.split(":", 1)[1] if ":" in form else "2"
    if not text.strip().isdigit() or not 0 <= int(text) <= 8:
        raise InputError(f"'{form}': the degree of poly:N must be a whole number from 0 to 8", item="fit",
                         hint="e.g. poly:2")
    return int(text)


def _need_params(names, n, form):
    if len(names) != n:
        raise InputError(f"the '{form}' form needs exactly {n} varied parameter(s), the sweep has {len(names)}",
                         item="fit")


def _need_points(have, need, form):
    if have < need:
        raise InputError(f"the '{form}' form needs at least {need} successful points, the sweep has {have}",
                         item="fit")


# --- goal-seeking ---------------------------------------------------------------------------------------

#: evaluations of the search before the scan inside the bounds (bounds included; our own choice)
SCAN_POINTS = 7
#: the search stops after this many solves at the most (our own limit)
MAX_SOLVES = 30


@dataclass(frozen=True)
class SearchPoint:
    """One solve of a goal-seek: the parameter value, what happened and the Kt found."""

    value: float
    status: str
    kt: float | None
    band: float | None
    message: str = ""
    peak: float | None = None  # the followed peak's stress (the case's stress unit)


@dataclass(frozen=True)
class TargetResult:
    """The bound of a dimension that keeps Kt at or below a target.

    ``value`` is the bound (interpolated between the last two solves that straddle the target);
    ``keeps_below`` says on which side Kt stays at or below the target: ``"above"`` (values >= the bound)
    or ``"below"``; ``kt`` and ``kt_band`` are from a solve with its band at the bound; ``value_band`` is
    that band divided by the local slope. ``reached`` is False when no straddling pair was found (then
    ``value`` is None and ``history`` says what was seen). ``history`` holds every solve in order."""

    name: str
    target: float
    basis: str
    feature: str
    reached: bool
    value: float | None
    keeps_below: str | None
    kt: float | None
    kt_band: float | None
    value_band: float | None
    evaluations: int
    history: tuple[SearchPoint, ...]
    stop_reason: str
    peak: float | None = None  # the peak stress at the bound (the case's stress unit)


def goal_seek(table: dict, source: str, name: str, kt_target: float, bounds: tuple[float, float],
              *, basis: str = "net", feature: str | None = None,
              progress: Callable[[SearchPoint], None] | None = None) -> TargetResult:
    """The bound of parameter ``name`` in ``bounds`` at which Kt (of ``feature``, by default the leading
    notch peak) crosses ``kt_target``, with the side on which Kt stays at or below it.

    A scan of SCAN_POINTS values across the bounds finds a pair of valid points that straddle the
    target (points whose geometry is invalid are recorded and passed over, as a sweep does); the
    Illinois variant of regula falsi (Dowell & Jarratt 1971) then narrows the pair and stops as soon as
    the two Kt values differ by less than the band of Kt (the two-grid estimate at the scan's point nearest
    the target): closer solves only follow mesh noise. A last solve with its band at the bound gives Kt
    there."""
    lo, hi = sorted(bounds)
    history: list[SearchPoint] = []
    key = "kt_net" if basis == "net" else "kt_gross"
    followed = feature or ""

    def solve_at(x: float, with_band: bool = False) -> SearchPoint:
        nonlocal followed
        r = run_point(table, source, len(history), {name: x}, estimate=with_band, feature=feature)
        if r.status == "ok":
            followed = followed or r.feature
            band = r.kt_net_band if basis == "net" else r.kt_gross_band
            sp = SearchPoint(float(x), "ok", getattr(r, key), band, peak=r.peak)
        else:
            sp = SearchPoint(float(x), r.status, None, None, r.message)
        history.append(sp)
        if progress:
            progress(sp)
        return sp

    scan = [solve_at(float(x)) for x in np.linspace(lo, hi, SCAN_POINTS)]
    valid = [p for p in scan if p.status == "ok" and p.kt is not None]
    pair = next(((a, b) for a, b in zip(valid[:-1], valid[1:]) if (a.kt - kt_target) * (b.kt - kt_target) <= 0),
                None)
    if pair is None:
        return TargetResult(name, kt_target, basis, followed, False, None, None, None, None, None, len(history),
                            tuple(history), "no two valid points straddle the target")
    a, b = pair
    near = min(pair, key=lambda p: abs(p.kt - kt_target))
    noise = solve_at(near.value, with_band=True).band or 0.0
    stop = "the two Kt values straddling the target agree within the band"
    fa, fb = a.kt - kt_target, b.kt - kt_target
    while abs(a.kt - b.kt) > noise:
        if len(history) >= MAX_SOLVES:
            stop = f"stopped after {MAX_SOLVES} solves"
            break
        x = (a.value * fb - b.value * fa) / (fb - fa) if fb != fa else 0.5 * (a.value + b.value)
        if not (min(a.value, b.value) < x < max(a.value, b.value)):
            x = 0.5 * (a.value + b.value)
        c = solve_at(x)
        if c.status != "ok" or c.kt is None:
            stop = f"a point inside the bracket is invalid ({c.message}); the bracket is kept"
            break
        fc = c.kt - kt_target
        if fc * fb < 0:
            a, fa = b, fb  # the new point and the old b straddle the target
        else:
            fa = 0.5 * fa  # Illinois: the end kept twice counts half
        b, fb = c, fc
        if abs(fc) <= 0.25 * noise:
            stop = "the last solve is within a quarter of the band of the target"
            break
    x_star = a.value + (kt_target - a.kt) * (b.value - a.value) / (b.kt - a.kt) if b.kt != a.kt else a.value
    final = solve_at(x_star, with_band=True)
    slope = (b.kt - a.kt) / (b.value - a.value) if b.value != a.value else None
    value_band = abs(final.band / slope) if (final.band is not None and slope) else None
    keeps = None
    if slope:
        keeps = "below" if slope > 0 else "above"  # Kt rises with the value: smaller values keep it lower
    return TargetResult(name, kt_target, basis, followed, True, float(x_star), keeps, final.kt, final.band,
                        value_band, len(history), tuple(history), stop, final.peak)
