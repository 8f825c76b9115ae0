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
from dataclasses import asdict, dataclass, field

import numpy as np

from ..case.expr import resolve_parameters
from ..case.loader import case_from_dict
from ..errors import FektError, InputError
from ..kinds import FeatureKind
from ..registry import CATALOGUE

#: columns of the CSV file, in order
COLUMNS = ("index", "status", "feature", "kt_net", "kt_net_band", "kt_gross", "kt_gross_band", "chart_kt",
           "chart_basis", "peak", "seconds", "message")


@dataclass(frozen=True)
class PointResult:
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
    #: every parameter of the case at this point (varied and not varied, expressions evaluated); empty
    #: when the parameters themselves cannot be evaluated there
    parameters: dict[str, float] = field(default_factory=dict)

    def to_json(self) -> dict:
        return asdict(self)


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


def grid(varies: Sequence[tuple[str, list[float]]]) -> list[dict[str, float]]:
    """Every combination of the varied values (first parameter varies slowest)."""
    names = [n for n, _ in varies]
    if len(set(names)) != len(names):
        raise InputError("a parameter is varied twice", item="vary")
    return [dict(zip(names, combo)) for combo in itertools.product(*(v for _, v in varies))]


def run_point(table: dict, source: str, index: int, values: dict[str, float], estimate: bool = True) -> PointResult:
    """Solve one sweep point; never raises for problems of the point itself (they are recorded)."""
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
    spots = [h for h in r.peaks if h.kt_net is not None and not h.singular]
    notch = [h for h in spots if h.feature_kind != FeatureKind.EDGE] or spots
    if not notch:
        return PointResult(index, values, "failed", "no stress peak with a finite Kt", seconds=time.perf_counter() - t0,
                           parameters=params)
    top = max(notch, key=lambda h: h.kt_net)
    band_n, band_g = (top.band.kt_net, top.band.kt_gross) if top.band else (None, None)
    chart, basis = None, ""
    if r.family_check is not None and r.family_check.peak_rank is not None:
        check = r.peak(r.family_check.peak_rank).chart
        chart, basis = check.chart_kt, str(check.basis)
    return PointResult(index, values, "ok", "", top.feature, top.kt_net, band_n, top.kt_gross, band_g, chart, basis,
                       top.peak, time.perf_counter() - t0, dict(case.parameters))


# --- executors --------------------------------------------------------------------------------------

def _serial(tasks, submit_args):
    for t in tasks:
        yield run_point(*submit_args(t))


def _pool(tasks, submit_args, workers: int):
    from concurrent.futures import ProcessPoolExecutor, as_completed

    with ProcessPoolExecutor(max_workers=workers) as pool:
        futs = [pool.submit(run_point, *submit_args(t)) for t in tasks]
        try:
            for f in as_completed(futs):
                yield f.result()
        except BaseException:
            for f in futs:
                f.cancel()
            raise


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
               skip: Iterable[int] = (), on_result: Callable[[PointResult], None] | None = None) -> list[PointResult]:
    """Run the sweep; ``skip`` holds indices already finished (resume). Results come back in index order."""
    skip = set(skip)
    tasks = [(i, p) for i, p in enumerate(points) if i not in skip]

    def args(t):
        i, p = t
        return table, source, i, p, estimate

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
        deg = int(form.split(":", 1)[1]) if ":" in form else 2
        _need_params(names, 1, form)
        x = X[names[0]]
        _need_points(len(y), deg + 1, form)
        c = np.polyfit(x, y, deg)
        pred = np.polyval(c, x)
        model = lambda xs, c=c: np.polyval(c, xs)  # noqa: E731
        coeffs = {f"c{deg - k}": float(v) for k, v in enumerate(c)}
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
    return Fit(form, formula, coeffs, float(np.max(np.abs(res))), float(np.sqrt(np.mean(res ** 2))), ranges, len(y),
               curve)


def _need_params(names, n, form):
    if len(names) != n:
        raise InputError(f"the '{form}' form needs exactly {n} varied parameter(s), the sweep has {len(names)}",
                         item="fit")


def _need_points(have, need, form):
    if have < need:
        raise InputError(f"the '{form}' form needs at least {need} successful points, the sweep has {have}",
                         item="fit")


# --- goal-seeking -------------------------------------------------------------------------------------

@dataclass(frozen=True)
class TargetResult:
    name: str
    target: float
    value: float
    kt_net: float
    kt_net_band: float | None
    value_band: float | None  # uncertainty of the answer from the Kt band and the local slope
    evaluations: int
    history: tuple[tuple[float, float], ...]
    basis: str
    peak: float | None = None  # the peak stress at the answer (the case's stress unit)


def goal_seek(table: dict, source: str, name: str, kt_target: float, bounds: tuple[float, float],
              *, basis: str = "net", xtol: float = 1e-4, progress: Callable[[float, float], None] | None = None
              ) -> TargetResult:
    """The parameter value giving the target Kt: bracket on the bounds (scanning inside them when both
    ends lie on the same side), then Brent's method (scipy.optimize.brentq; Brent 1973)."""
    from scipy.optimize import brentq

    lo, hi = sorted(bounds)
    span = hi - lo
    history: list[tuple[float, float]] = []
    cache: dict[float, float] = {}

    def kt_at(x: float) -> float:
        x = float(x)
        if x in cache:  # brentq evaluates the bracket ends again
            return cache[x]
        r = run_point(table, source, len(history), {name: x}, estimate=False)
        if r.status != "ok":
            raise InputError(f"at {name} = {x:.6g} the case cannot be solved: {r.message}", item=name,
                             hint="narrow the bounds to values that give a valid part")
        v = r.kt_net if basis == "net" else r.kt_gross
        history.append((x, v))
        if progress:
            progress(x, v)
        cache[x] = v - kt_target
        return cache[x]

    f_lo, f_hi = kt_at(lo), kt_at(hi)
    if f_lo * f_hi > 0:
        xs = np.linspace(lo, hi, 7)[1:-1]
        bracket = None
        prev_x, prev_f = lo, f_lo
        for x in xs:
            f = kt_at(float(x))
            if prev_f * f <= 0:
                bracket = (prev_x, float(x))
                break
            prev_x, prev_f = float(x), f
        if bracket is None:
            got = ", ".join(f"{v:.4g}" for _, v in history)
            raise InputError(f"Kt = {kt_target:g} is not reached for {name} in [{lo:g}, {hi:g}] (Kt found: {got})",
                             item="kt", hint="widen --bounds or choose a reachable Kt")
        lo, hi = bracket
    x_star = brentq(kt_at, lo, hi, xtol=xtol * max(abs(lo), abs(hi), 1e-12), rtol=1e-10)
    final = run_point(table, source, len(history), {name: x_star}, estimate=True)
    if final.status != "ok":
        raise InputError(f"at the answer {name} = {x_star:.6g} the case cannot be solved: {final.message}", item=name)
    kt = final.kt_net if basis == "net" else final.kt_gross
    band = final.kt_net_band if basis == "net" else final.kt_gross_band
    # slope from the nearest evaluations at least 5 % of the search range away on each side: closer
    # ones differ by mesh-to-mesh scatter more than by the trend
    left = [p for p in history if p[0] <= x_star - 0.05 * span]
    right = [p for p in history if p[0] >= x_star + 0.05 * span]
    slope = None
    if left and right:
        a = max(left, key=lambda p: p[0])
        b = min(right, key=lambda p: p[0])
        slope = (b[1] - a[1]) / (b[0] - a[0])
    xband = abs(band / slope) if (band is not None and slope) else None
    return TargetResult(name, kt_target, float(x_star), kt, band, xband, len(history) + 1, tuple(history), basis,
                        final.peak)
