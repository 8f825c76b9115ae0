"""Stress peaks: local extremes of a signed boundary stress, tensile and compressive, with their owners.

The stress a peak is measured by (the *measure*) is the tangential normal stress on the traction-free
boundary by default (:mod:`fekt.post.measures`). Rules (our own, documented in docs/conventions.md):
* samples on loaded boundaries are excluded (their stress is the applied traction, not a notch effect);
* a tensile peak is a local maximum of a positive measure, a compressive peak a local minimum of a
  negative one; either counts when its prominence is at least PROMINENCE of the largest boundary stress
  magnitude, which filters the element-to-element jitter of discontinuous P2 stresses;
* the largest magnitude on the free boundary is always a peak (even on a plain strip);
* every notch feature gets its largest magnitude as a peak even when it is not a local extreme;
* a sharp re-entrant corner gets the largest magnitude within a few element sizes of it.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from ..geometry.model import Feature, PartGeometry
from ..kinds import FeatureKind, PeakReason
from .fields import BoundarySamples

#: a local extreme counts when its prominence is at least this fraction of the largest boundary stress
#: magnitude (filters the element-to-element jitter of discontinuous P2 stresses; our own threshold)
PROMINENCE = 0.02


@dataclass(frozen=True)
class Candidate:
    """A boundary sample picked as a stress peak, before its section and Kt are worked out."""

    index: int  # into the boundary samples
    feature: Feature | None
    edge: str | None
    why: PeakReason
    vertex: int | None = None  # the user's vertex of the curve it lies on (names edge peaks)


def _runs(mask: np.ndarray) -> list[np.ndarray]:
    """Index runs where mask is True (non-cyclic)."""
    idx = np.where(mask)[0]
    if idx.size == 0:
        return []
    cuts = np.where(np.diff(idx) > 1)[0] + 1
    return np.split(idx, cuts)


def _range_min(values: np.ndarray):
    """A sparse table answering min(values[i:j+1]) in constant time."""
    table = [values]
    k = 1
    while 2 * k <= values.size:
        prev = table[-1]
        table.append(np.minimum(prev[:-k], prev[k:]))
        k *= 2

    def query(i: np.ndarray, j: np.ndarray) -> np.ndarray:
        length = j - i + 1
        level = np.floor(np.log2(np.maximum(length, 1))).astype(int)
        out = np.empty(i.size)
        for lv in np.unique(level):
            m = level == lv
            t = table[lv]
            out[m] = np.minimum(t[i[m]], t[j[m] - (1 << lv) + 1])
        return out

    return query


def _nearest_higher(values: np.ndarray, reverse: bool) -> np.ndarray:
    """Index of the nearest strictly higher sample before each sample (after, with ``reverse``); -1 or
    n where there is none (a monotonic stack, linear time)."""
    n = values.size
    out = np.full(n, n if reverse else -1)
    stack: list[int] = []
    order = range(n - 1, -1, -1) if reverse else range(n)
    for i in order:
        while stack and values[stack[-1]] <= values[i]:
            stack.pop()
        if stack:
            out[i] = stack[-1]
        stack.append(i)
    return out


def _peaks_with_prominence(values: np.ndarray, prominence: float) -> np.ndarray:
    """Local maxima (a plateau counts once, at its middle) whose prominence reaches ``prominence``.

    Prominence: the height above the higher of the two lowest points between the peak and the nearest
    strictly higher sample on each side (or the end of the signal), the usual topographic definition
    (as scipy.signal.peak_prominences uses; written here so that no signal-processing package is loaded)."""
    n = values.size
    if n < 3:
        return np.array([], dtype=int)
    # plateaus: runs of equal values; a run is a peak when both neighbours are lower
    change = np.flatnonzero(np.diff(values) != 0)
    starts = np.concatenate([[0], change + 1])
    ends = np.concatenate([change, [n - 1]])
    left_lower = np.zeros(starts.size, dtype=bool)
    right_lower = np.zeros(starts.size, dtype=bool)
    left_lower[1:] = values[starts[1:] - 1] < values[starts[1:]]
    right_lower[:-1] = values[ends[:-1] + 1] < values[ends[:-1]]
    keep = left_lower & right_lower
    peaks = (starts[keep] + (ends[keep] - starts[keep]) // 2).astype(int)
    if peaks.size == 0:
        return peaks
    lo = _nearest_higher(values, reverse=False)[peaks]
    hi = _nearest_higher(values, reverse=True)[peaks]
    rmin = _range_min(values)
    left_base = rmin(np.maximum(lo, 0), peaks)
    right_base = rmin(peaks, np.minimum(hi, n - 1))
    prom = values[peaks] - np.maximum(left_base, right_base)
    return peaks[prom >= prominence]


def local_maxima(values: np.ndarray, cyclic: bool, prominence: float) -> np.ndarray:
    """Indices of local maxima with at least the given prominence."""
    n = values.size
    if n < 3:
        return np.array([int(np.argmax(values))]) if n else np.array([], dtype=int)
    if cyclic:
        tiled = np.concatenate([values, values, values])
        pk = _peaks_with_prominence(tiled, prominence)
        pk = pk[(pk >= n) & (pk < 2 * n)] - n
        return np.unique(pk)
    padded = np.concatenate([[-np.inf], values, [-np.inf]])
    return _peaks_with_prominence(padded, prominence) - 1


def local_extremes(values: np.ndarray, cyclic: bool, prominence: float) -> np.ndarray:
    """Tensile maxima (positive local maxima) and compressive minima (negative local minima)."""
    up = local_maxima(values, cyclic, prominence)
    down = local_maxima(-values, cyclic, prominence)
    return np.concatenate([up[values[up] > 0], down[values[down] < 0]]).astype(int)


def feature_of_segment(part: PartGeometry) -> dict[tuple[int, int], Feature]:
    out = {}
    for f in part.features:
        for ref in f.segments:
            out[ref] = f
    return out


def boundary_refs(part: PartGeometry, names) -> set[tuple[int, int]]:
    """(loop, segment) pairs of the named boundaries (outline edges by edge name, cut-outs by name)."""
    refs: set[tuple[int, int]] = set()
    for name in names:
        refs.update(part.named_refs(name))
    return refs


def free_mask(b: BoundarySamples, loaded: set[tuple[int, int]]) -> np.ndarray:
    """Samples that do not lie on a loaded boundary."""
    return np.array([(int(li), int(si)) not in loaded for li, si in zip(b.loop, b.segment)], dtype=bool)


def find_peaks_on_boundary(b: BoundarySamples, part: PartGeometry, loaded: set[tuple[int, int]],
                           corner_radius: dict[str, float], measure: np.ndarray) -> list[Candidate]:
    """Tensile and compressive peaks of the signed ``measure`` (one value per boundary sample) on the free
    boundary; see the module docstring for the rules.

    ``loaded``: (loop, segment) pairs that carry load; ``corner_radius``: search radius around each sharp
    corner (a few local element sizes)."""
    free = free_mask(b, loaded)
    if not free.any():
        return []
    m = measure
    mag = np.abs(m)
    scale = float(np.max(mag[free]))
    prom = PROMINENCE * scale
    owner = feature_of_segment(part)
    cands: dict[int, str] = {}
    for li in range(len(part.loops)):
        in_loop = b.loop == li
        idx = np.where(in_loop)[0]
        fmask = free[idx]
        if fmask.all():
            for k in local_extremes(m[idx], True, prom):
                cands.setdefault(int(idx[k]), PeakReason.LOCAL)
        else:
            # start the cyclic sequence at a loaded sample so free runs do not wrap around
            start = int(np.argmin(fmask))
            order = np.roll(np.arange(idx.size), -start)
            for run in _runs(fmask[order]):
                ids = idx[order[run]]
                for k in local_extremes(m[ids], False, prom):
                    cands.setdefault(int(ids[k]), PeakReason.LOCAL)
    # the largest tension and the largest compression on the free boundary (the latter when it is more
    # than jitter), even on a plain strip where neither is a local extreme
    idx_free = np.where(free)[0]
    for i in (idx_free[np.argmax(m[idx_free])], idx_free[np.argmin(m[idx_free])]):
        if abs(m[i]) >= prom or mag[i] == scale:
            cands[int(i)] = PeakReason.OVERALL
    for f in part.features:
        if f.segments:
            on = np.zeros(m.size, dtype=bool)
            for li, si in f.segments:
                on |= (b.loop == li) & (b.segment == si)
            on &= free
            if on.any() and not any(on[i] for i in cands):
                cands[int(np.where(on)[0][np.argmax(mag[on])])] = PeakReason.FEATURE
    peaks: list[Candidate] = []
    corners = [f for f in part.features if f.kind == FeatureKind.SHARP_CORNER]
    taken_corner: set[str] = set()
    for f in corners:
        d = np.hypot(b.xy[0] - f.point[0], b.xy[1] - f.point[1])
        near = (d <= corner_radius.get(f.name, 0.0)) & free
        if near.any():
            i = int(np.where(near)[0][np.argmax(mag[near])])
            peaks.append(Candidate(i, f, None, PeakReason.CORNER))
            taken_corner.add(f.name)
            # drop other candidates in the corner's neighbourhood: they belong to the corner
            for j in [j for j in cands if near[j]]:
                del cands[j]
    for i, why in cands.items():
        ref = (int(b.loop[i]), int(b.segment[i]))
        f = owner.get(ref)
        seg = part.segment(ref)
        peaks.append(Candidate(i, f, seg.edge, why, seg.vertex))
    # one peak per (feature, location): merge candidates closer than MERGE_FRACTION of the feature's
    # radius (or of the part's size for peaks with no radius)
    peaks.sort(key=lambda p: -mag[p.index])
    kept: list[Candidate] = []
    for p in peaks:
        dup = False
        for q in kept:
            if (p.feature is q.feature) and np.sign(m[p.index]) == np.sign(m[q.index]) and \
                    np.hypot(*(b.xy[:, p.index] - b.xy[:, q.index])) <= _merge_distance(p, part):
                dup = True
                break
        if not dup:
            kept.append(p)
    return kept


#: two candidates of one feature closer than this fraction of its radius are one peak; with no radius,
#: closer than MERGE_PART_FRACTION of the part's size (our own thresholds)
MERGE_FRACTION = 0.05
MERGE_PART_FRACTION = 1e-3


def _merge_distance(p: Candidate, part: PartGeometry) -> float:
    if p.feature is None or p.feature.radius <= 0:
        x0, y0, x1, y1 = part.bounding_box()
        return MERGE_PART_FRACTION * max(x1 - x0, y1 - y0)
    return MERGE_FRACTION * p.feature.radius


#: half-width of the window for the local scatter, in boundary samples (about two facets of the
#: 3-point facet rule on each side; our own choice)
SCATTER_WINDOW = 7


def local_scatter(b: BoundarySamples, index: int, measure: np.ndarray | None = None) -> float:
    """Largest deviation of the boundary samples near a peak from a local quadratic fit in arc length.

    P2 stresses jump between elements; this measures that roughness at the peak on the mesh itself and
    serves as a floor for uncertainty bands (a two-grid difference can be small by accident). Our own
    measure, no published source; at 16 elements per radius it bounded the error (against a 64 elements
    per radius solution) of 7 of the 8 notch peaks of the demo link and strip cases; the eighth was
    covered by the two-grid band."""
    lo, hi = max(index - SCATTER_WINDOW, 0), min(index + SCATTER_WINDOW + 1, b.s.size)
    m = np.arange(lo, hi)
    m = m[b.loop[m] == b.loop[index]]
    if m.size < 5:
        return 0.0
    x = b.s[m] - b.s[index]
    y = (b.s1 if measure is None else measure)[m]
    c = np.polyfit(x, y, 2)
    return float(np.max(np.abs(y - np.polyval(c, x))))
