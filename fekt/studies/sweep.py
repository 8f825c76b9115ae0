"""Design sweeps over a case's named parameters, goal-seeking a dimension, fits of the results.

Each point rebuilds the case from its file table with the parameters overridden and runs the normal
pipeline (with the two-grid uncertainty unless switched off). A point whose geometry becomes invalid is
recorded with its message and the sweep goes on. Points run serially, in a local process pool (gmsh
is process-global: processes, never threads) or on a Dask cluster; results are identical whichever
runs them, because every point is computed by the same deterministic function.
"""

from __future__ import annotations

import itertools
import json
import math
import os
import time
from collections.abc import Callable, Iterable, Mapping, Sequence
from dataclasses import asdict, dataclass

import numpy as np

from ..case.loader import case_from_dict
from ..errors import FektError, InputError

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

    def to_json(self) -> dict:
        return asdict(self)


def parse_vary(spec: str) -> tuple[str, list[float]]:
    """'NAME=START:STOP:COUNT' (evenly spaced, both ends included) or 'NAME=v1,v2,...'."""
    if "=" not in spec:
        raise InputError(f"'{spec}' is not NAME=START:STOP:COUNT or NAME=v1,v2,...", item="--vary")
    name, rhs = (t.strip() for t in spec.split("=", 1))
    try:
        if ":" in rhs:
            parts = rhs.split(":")
            if len(parts) != 3:
                raise ValueError
            a, b, n = float(parts[0]), float(parts[1]), int(parts[2])
            if n < 1:
                raise ValueError
            values = list(np.linspace(a, b, n)) if n > 1 else [a]
        else:
            values = [float(v) for v in rhs.split(",") if v.strip()]
    except ValueError:
        raise InputError(f"'{spec}': the values must be START:STOP:COUNT (COUNT a whole number >= 1) or a "
                         "comma-separated list of numbers", item="--vary") from None
    if not name.isidentifier() or not values:
        raise InputError(f"'{spec}': need a parameter name and at least one value", item="--vary")
    return name, [float(v) for v in values]


def grid(varies: Sequence[tuple[str, list[float]]]) -> list[dict[str, float]]:
    """Every combination of the varied values (first parameter varies slowest)."""
    names = [n for n, _ in varies]
    if len(set(names)) != len(names):
        raise InputError("a parameter is varied twice", item="--vary")
    return [dict(zip(names, combo)) for combo in itertools.product(*(v for _, v in varies))]


def run_point(table: dict, source: str, index: int, values: dict[str, float], estimate: bool = True) -> PointResult:
    """Solve one sweep point; never raises for problems of the point itself (they are recorded)."""
    from .evaluate import solve_full

    t0 = time.perf_counter()
    try:
        case = case_from_dict(table, source, overrides=values)
        r = solve_full(case, estimate=estimate).result
    except InputError as exc:
        return PointResult(index, values, "invalid", str(exc), seconds=time.perf_counter() - t0)
    except FektError as exc:
        return PointResult(index, values, "failed", str(exc), seconds=time.perf_counter() - t0)
    spots = [h for h in r.hot_spots if h.kt_net is not None and not h.singular]
    notch = [h for h in spots if h.feature_kind != "edge"] or spots
    if not notch:
        return PointResult(index, values, "failed", "no hot spot with a finite Kt", seconds=time.perf_counter() - t0)
    top = max(notch, key=lambda h: h.kt_net)
    band_n = band_g = None
    if r.uncertainty:
        u = r.uncertainty["hot_spots"].get(str(top.rank), {})
        band_n, band_g = u.get("kt_net_band"), u.get("kt_gross_band")
    chart, basis = None, ""
    if r.charts and r.charts.get("family_check", {}).get("chart_kt") is not None:
        chart = r.charts["family_check"]["chart_kt"]
        basis = r.charts["family_check"]["basis"]
    return PointResult(index, values, "ok", "", top.feature, top.kt_net, band_n, top.kt_gross, band_g, chart, basis,
                       top.peak, time.perf_counter() - t0)


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


# --- files: written as points finish, read back to resume --------------------------------------------

class SweepFiles:
    """``points.jsonl`` (one JSON object per finished point, appended and flushed as it finishes) and
    ``sweep.csv`` (rewritten atomically from it); the JSONL is what ``--resume`` reads."""

    def __init__(self, folder: str, names: Sequence[str]):
        self.folder = folder
        self.names = list(names)
        self.jsonl = os.path.join(folder, "points.jsonl")
        self.csv = os.path.join(folder, "sweep.csv")

    def finished(self, points: Sequence[dict[str, float]]) -> dict[int, PointResult]:
        """Points already in the folder whose parameter values match this sweep's."""
        done: dict[int, PointResult] = {}
        if not os.path.exists(self.jsonl):
            return done
        with open(self.jsonl, encoding="utf-8") as fh:
            for line in fh:
                line = line.strip()
                if not line:
                    continue
                try:
                    d = json.loads(line)
                except json.JSONDecodeError:
                    continue  # a line cut short by an interrupt: that point is computed again
                i = d.get("index")
                if isinstance(i, int) and 0 <= i < len(points) and _same(d.get("values", {}), points[i]):
                    done[i] = PointResult(**d)
        return done

    def append(self, r: PointResult) -> None:
        with open(self.jsonl, "a", encoding="utf-8") as fh:
            fh.write(json.dumps(r.to_json(), allow_nan=False) + "\n")
            fh.flush()
            os.fsync(fh.fileno())

    def write_csv(self, results: Sequence[PointResult]) -> None:
        import csv
        import io

        from ..report.files import write_text

        buf = io.StringIO()
        w = csv.writer(buf)
        w.writerow(["index", *self.names, *COLUMNS[1:]])
        for r in sorted(results, key=lambda r: r.index):
            d = r.to_json()
            w.writerow([r.index, *(repr(r.values[n]) for n in self.names),
                        *("" if d[c] is None else d[c] for c in COLUMNS[1:])])
        write_text(self.csv, buf.getvalue())


def _same(a: Mapping[str, float], b: Mapping[str, float]) -> bool:
    return set(a) == set(b) and all(math.isclose(a[k], b[k], rel_tol=1e-12, abs_tol=1e-15) for k in b)


# --- fits --------------------------------------------------------------------------------------------

@dataclass(frozen=True)
class Fit:
    form: str
    formula: str
    coefficients: dict[str, float]
    max_residual: float
    rms_residual: float
    ranges: dict[str, tuple[float, float]]
    points: int


def fit_results(results: Sequence[PointResult], names: Sequence[str], form: str, basis: str = "net") -> Fit:
    """Least-squares fit of Kt over the ok points.

    ``poly:N`` polynomial of degree N in one varied parameter x; ``power``: Kt = A x^b; ``handbook``
    (two parameters u, q): Kt = C1 + C2 u + C3 u^2 + C4 u^3, Ci = ci0 + ci1 sqrt(q) + ci2 q (the form of
    the published flat-bar fits, Pilkey & Pilkey 2008, from memory)."""
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
        coeffs = {f"c{deg - k}": float(v) for k, v in enumerate(c)}
        formula = " + ".join(f"c{k}*{names[0]}^{k}" for k in range(deg + 1))
    elif form == "power":
        _need_params(names, 1, form)
        x = X[names[0]]
        _need_points(len(y), 2, form)
        if (x <= 0).any() or (y <= 0).any():
            raise InputError("the power form needs positive parameter values and Kt", item="--fit")
        b, lnA = np.polyfit(np.log(x), np.log(y), 1)
        pred = np.exp(lnA) * x ** b
        coeffs = {"A": float(np.exp(lnA)), "b": float(b)}
        formula = f"A*{names[0]}^b"
    elif form == "handbook":
        _need_params(names, 2, form)
        u, q = X[names[0]], X[names[1]]
        _need_points(len(y), 12, form)
        if (q < 0).any():
            raise InputError("the handbook form needs q >= 0", item="--fit")
        cols, labels = [], []
        for i in range(4):
            for j, g in enumerate((np.ones_like(q), np.sqrt(q), q)):
                cols.append(g * u ** i)
                labels.append(f"c{i + 1}{j}")
        A = np.vstack(cols).T
        c, *_ = np.linalg.lstsq(A, y, rcond=None)
        pred = A @ c
        coeffs = dict(zip(labels, map(float, c)))
        formula = (f"sum_i (ci0 + ci1*sqrt({names[1]}) + ci2*{names[1]}) * {names[0]}^(i-1), i = 1..4")
    else:
        raise InputError(f"unknown fit form '{form}'", item="--fit", hint="poly:N, power or handbook")
    res = y - pred
    return Fit(form, formula, coeffs, float(np.max(np.abs(res))), float(np.sqrt(np.mean(res ** 2))), ranges, len(y))


def _need_params(names, n, form):
    if len(names) != n:
        raise InputError(f"the '{form}' form needs exactly {n} varied parameter(s), the sweep has {len(names)}",
                         item="--fit")


def _need_points(have, need, form):
    if have < need:
        raise InputError(f"the '{form}' form needs at least {need} successful points, the sweep has {have}",
                         item="--fit")


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
                             item="--kt", hint="widen --bounds or choose a reachable Kt")
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
    return TargetResult(name, kt_target, float(x_star), kt, band, xband, len(history) + 1, tuple(history), basis)
