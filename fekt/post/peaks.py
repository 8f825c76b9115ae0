"""Stress peaks: local maxima of the boundary maximum principal stress, each with its owning feature.

Rules (our own, documented in docs/conventions.md):
* samples on loaded end edges are excluded (their stress is the applied traction, not a notch effect);
* a local maximum counts when its prominence is at least PROMINENCE of the largest boundary stress
  magnitude, which filters the element-to-element jitter of discontinuous P2 stresses;
* the overall maximum of the free boundary is always a peak (even on a plain strip);
* every notch feature gets at least one peak (its maximum) even when it is not a local peak;
* a sharp re-entrant corner gets the largest sample within a few element sizes of it.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np
from scipy.signal import find_peaks

from ..geometry.model import Feature, PartGeometry
from ..kinds import FeatureKind, LoopKind, PeakReason
from .fields import BoundarySamples

#: a local maximum counts when its prominence is at least this fraction of the largest boundary stress
#: magnitude (filters the element-to-element jitter of discontinuous P2 stresses; our own threshold)
PROMINENCE = 0.02


@dataclass(frozen=True)
class Candidate:
    """A boundary sample picked as a stress peak, before its section and Kt are worked out."""

    index: int  # into the boundary samples
    feature: Feature | None
    edge: str | None
    why: PeakReason


def _runs(mask: np.ndarray) -> list[np.ndarray]:
    """Index runs where mask is True (non-cyclic)."""
    idx = np.where(mask)[0]
    if idx.size == 0:
        return []
    cuts = np.where(np.diff(idx) > 1)[0] + 1
    return np.split(idx, cuts)


def local_maxima(values: np.ndarray, cyclic: bool, prominence: float) -> np.ndarray:
    """Indices of local maxima with at least the given prominence."""
    n = values.size
    if n < 3:
        return np.array([int(np.argmax(values))]) if n else np.array([], dtype=int)
    if cyclic:
        tiled = np.concatenate([values, values, values])
        pk, _ = find_peaks(tiled, prominence=prominence)
        pk = pk[(pk >= n) & (pk < 2 * n)] - n
        return np.unique(pk)
    padded = np.concatenate([[-np.inf], values, [-np.inf]])
    pk, _ = find_peaks(padded, prominence=prominence)
    return pk - 1


def feature_of_segment(part: PartGeometry) -> dict[tuple[int, int], Feature]:
    out = {}
    for f in part.features:
        for ref in f.segments:
            out[ref] = f
    return out


def boundary_refs(part: PartGeometry, names) -> set[tuple[int, int]]:
    """(loop, segment) pairs of the named boundaries (outline edges by edge name, cut-outs by name)."""
    refs: set[tuple[int, int]] = set()
    for li, loop in enumerate(part.loops):
        for si, seg in enumerate(loop.segments):
            if seg.edge in names or (loop.kind == LoopKind.CUTOUT and loop.name in names):
                refs.add((li, si))
    return refs


def free_mask(b: BoundarySamples, loaded: set[tuple[int, int]]) -> np.ndarray:
    """Samples that do not lie on a loaded boundary."""
    return np.array([(int(li), int(si)) not in loaded for li, si in zip(b.loop, b.segment)], dtype=bool)


def find_peaks_on_boundary(b: BoundarySamples, part: PartGeometry, loaded: set[tuple[int, int]],
                           corner_radius: dict[str, float]) -> list[Candidate]:
    """Peaks of s1 on the free boundary; see the module docstring for the rules.

    ``loaded``: (loop, segment) pairs that carry load; ``corner_radius``: search radius around each sharp
    corner (a few local element sizes)."""
    free = free_mask(b, loaded)
    if not free.any():
        return []
    scale = float(np.max(np.abs(np.concatenate([b.s1[free], b.s2[free]]))))
    prom = PROMINENCE * scale
    owner = feature_of_segment(part)
    cands: dict[int, str] = {}
    for li in range(len(part.loops)):
        in_loop = b.loop == li
        idx = np.where(in_loop)[0]
        fmask = free[idx]
        if fmask.all():
            for k in local_maxima(b.s1[idx], True, prom):
                cands.setdefault(int(idx[k]), PeakReason.LOCAL)
        else:
            # start the cyclic sequence at a loaded sample so free runs do not wrap around
            start = int(np.argmin(fmask))
            order = np.roll(np.arange(idx.size), -start)
            for run in _runs(fmask[order]):
                ids = idx[order[run]]
                for k in local_maxima(b.s1[ids], False, prom):
                    cands.setdefault(int(ids[k]), PeakReason.LOCAL)
    overall = int(np.where(free)[0][np.argmax(b.s1[free])])
    cands[overall] = PeakReason.OVERALL
    for f in part.features:
        if f.segments:
            m = np.zeros(b.s1.size, dtype=bool)
            for li, si in f.segments:
                m |= (b.loop == li) & (b.segment == si)
            m &= free
            if m.any() and not any(m[i] for i in cands):
                cands[int(np.where(m)[0][np.argmax(b.s1[m])])] = PeakReason.FEATURE
    peaks: list[Candidate] = []
    corners = [f for f in part.features if f.kind == FeatureKind.SHARP_CORNER]
    taken_corner: set[str] = set()
    for f in corners:
        d = np.hypot(b.xy[0] - f.point[0], b.xy[1] - f.point[1])
        m = (d <= corner_radius.get(f.name, 0.0)) & free
        if m.any():
            i = int(np.where(m)[0][np.argmax(b.s1[m])])
            peaks.append(Candidate(i, f, None, PeakReason.CORNER))
            taken_corner.add(f.name)
            # drop other candidates in the corner's neighbourhood: they belong to the corner
            for j in [j for j in cands if m[j]]:
                del cands[j]
    for i, why in cands.items():
        ref = (int(b.loop[i]), int(b.segment[i]))
        f = owner.get(ref)
        edge = part.segment(ref).edge
        peaks.append(Candidate(i, f, edge, why))
    # one peak per (feature, location): merge candidates closer than MERGE_FRACTION of the feature's
    # radius (or of the part's size for peaks with no radius)
    peaks.sort(key=lambda p: -b.s1[p.index])
    kept: list[Candidate] = []
    for p in peaks:
        dup = False
        for q in kept:
            if (p.feature is q.feature) and np.hypot(*(b.xy[:, p.index] - b.xy[:, q.index])) <= _merge_distance(p, part):
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


def local_scatter(b: BoundarySamples, index: int) -> float:
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
    y = b.s1[m]
    c = np.polyfit(x, y, 2)
    return float(np.max(np.abs(y - np.polyval(c, x))))
