"""Exact cuts through a part normal to the load axis (geometry only: the analysis model turns a cut
into section properties, see :func:`fekt.models.base.section_of`).

A cut is the straight line {x : x . axis = s}. Its intersections with every boundary segment are
computed in closed form (line, circle, ellipse), so cut widths carry no discretisation error.
Transverse coordinates are y' = x . e, with e = axis rotated +90 degrees.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np
from scipy.optimize import minimize_scalar
from shapely.geometry import Point, Polygon

from .model import ARC, LINE, Feature, PartGeometry, Segment


@dataclass(frozen=True)
class Cut:
    """The material of the part on the line x . axis = ``s``: intervals of the transverse coordinate y'
    and their total ``width``."""

    s: float
    intervals: tuple[tuple[float, float], ...]
    width: float


def transverse(axis: np.ndarray) -> np.ndarray:
    return np.array([-axis[1], axis[0]])


def _hits(seg: Segment, axis: np.ndarray, s: float) -> list[float]:
    """Parameters along the cut line (as y') where it meets the segment."""
    e = transverse(axis)
    if seg.kind == LINE:
        p0, p1 = np.array(seg.start), np.array(seg.end)
        a0, a1 = p0 @ axis - s, p1 @ axis - s
        if a0 == a1:
            return []  # parallel to the cut: its ends are hit by the neighbouring segments
        t = a0 / (a0 - a1)
        if -1e-12 <= t <= 1 + 1e-12:
            return [float((p0 + t * (p1 - p0)) @ e)]
        return []
    c = np.array(seg.center)
    if seg.kind == ARC:
        dist = s - c @ axis
        if abs(dist) > seg.radius:
            return []
        half = math.sqrt(max(seg.radius ** 2 - dist ** 2, 0.0))
        out = []
        for sign in (-1.0, 1.0):
            p = c + dist * axis + sign * half * e
            t = seg.parameter(p[:, None])[0]
            if np.linalg.norm(seg.point(t)[:, 0] - p) <= 1e-9 * max(seg.radius, 1e-300):
                out.append(float(p @ e))
        return out
    # ellipse: local frame u along a, v along b; point c + u*ua + v*va with (u/a)^2 + (v/b)^2 = 1
    ua = np.array([math.cos(seg.angle), math.sin(seg.angle)])
    va = np.array([-ua[1], ua[0]])
    # points on the cut: c + dist*axis + w*e ; write in local frame
    dist = s - c @ axis
    base = dist * axis
    bu, bv = base @ ua, base @ va
    eu, ev = e @ ua, e @ va
    A = (eu / seg.a) ** 2 + (ev / seg.b) ** 2
    B = 2 * (bu * eu / seg.a ** 2 + bv * ev / seg.b ** 2)
    C = (bu / seg.a) ** 2 + (bv / seg.b) ** 2 - 1
    disc = B * B - 4 * A * C
    if disc < 0:
        return []
    r = math.sqrt(disc)
    ce = c @ e
    return [float(ce + (-B - r) / (2 * A)), float(ce + (-B + r) / (2 * A))]


def section_at(part: PartGeometry, axis: np.ndarray, s: float, polygon: Polygon | None = None) -> Cut:
    """The cut of the part at axial position ``s``."""
    e = transverse(axis)
    ys: list[float] = []
    for loop in part.loops:
        for seg in loop.segments:
            ys.extend(_hits(seg, axis, s))
    ys = sorted(ys)
    poly = polygon if polygon is not None else part_polygon(part)
    scale = math.sqrt(poly.area)
    merged: list[float] = []
    for y in ys:  # merge duplicate hits at segment joints and tangent touches
        if merged and abs(y - merged[-1]) <= 1e-10 * scale:
            continue
        merged.append(y)
    intervals = []
    for y0, y1 in zip(merged[:-1], merged[1:]):
        mid = 0.5 * (y0 + y1)
        pt = s * axis + mid * e
        if poly.contains(Point(pt[0], pt[1])):
            if intervals and abs(intervals[-1][1] - y0) <= 1e-10 * scale:
                intervals[-1] = (intervals[-1][0], y1)
            else:
                intervals.append((y0, y1))
    return cut_from_intervals(s, intervals)


def cut_from_intervals(s: float, intervals) -> Cut:
    iv = np.array(intervals, dtype=float).reshape(-1, 2)
    width = float((iv[:, 1] - iv[:, 0]).sum())
    if width <= 0:
        return Cut(s, (), 0.0)
    return Cut(s, tuple(map(tuple, iv.tolist())), width)


def part_polygon(part: PartGeometry) -> Polygon:
    shell = part.outline.polygon_points(math.radians(0.25)).T
    holes = [loop.polygon_points(math.radians(0.25)).T for loop in part.loops[1:]]
    return Polygon(shell, holes)


def feature_extent(part: PartGeometry, feature: Feature, axis: np.ndarray) -> tuple[float, float]:
    """Axial extent (min, max of x . axis) of a feature."""
    if not feature.segments:
        s = float(np.array(feature.point) @ axis)
        return s, s
    pts = np.hstack([part.segment(ref).sample(math.radians(0.5)) for ref in feature.segments])
    a = axis @ pts
    return float(a.min()), float(a.max())


def net_section(part: PartGeometry, feature: Feature, axis: np.ndarray, polygon: Polygon | None = None) -> Cut:
    """The shortest cut normal to the load axis through the feature.

    For a hole this is the cut through its centre, for a shoulder fillet the smaller width, for a
    U-notch the root (the rule is the same for every shape: minimise the material width).
    """
    poly = polygon if polygon is not None else part_polygon(part)
    lo, hi = feature_extent(part, feature, axis)
    if hi - lo <= 1e-12 * math.sqrt(poly.area):
        return section_at(part, axis, lo, poly)
    # stay strictly inside the extent: a cut exactly through an extreme point only grazes the feature
    pad = 1e-9 * (hi - lo)
    cands = np.linspace(lo + pad, hi - pad, 41)
    cands = np.append(cands, np.clip(np.array(feature.point) @ axis, lo + pad, hi - pad))
    widths = np.array([section_at(part, axis, float(c), poly).width for c in cands])
    k = int(np.argmin(widths[:-1]))
    best_s, best_w = float(cands[k]), float(widths[k])
    if widths[-1] < best_w:
        best_s, best_w = float(cands[-1]), float(widths[-1])
    a, b = cands[max(k - 1, 0)], cands[min(k + 1, 40)]
    if b > a:
        res = minimize_scalar(lambda c: section_at(part, axis, float(c), poly).width,
                              bounds=(float(a), float(b)), method="bounded",
                              options={"xatol": 1e-10 * (hi - lo)})
        if res.fun < best_w:
            best_s, best_w = float(res.x), float(res.fun)
    best_s = _plateau_middle(lambda c: section_at(part, axis, c, poly).width, best_s, best_w,
                             lo + pad, hi - pad, math.sqrt(poly.area))
    return section_at(part, axis, best_s, poly)


#: widths within this fraction of the smallest are the same width (a plateau: our own tolerance, far
#: above the round-off of exact intersections and far below any real difference)
PLATEAU_TOLERANCE = 1e-9


def _plateau_middle(width, s0: float, w0: float, lo: float, hi: float, scale: float) -> float:
    """The middle of the run of positions around ``s0`` where the width stays at its minimum ``w0``.

    Where the smallest width is reached over a range (the straight part of an inclined slot, a notch with
    a flat root), the net section is placed at the middle of that range, so that a feature's own symmetry
    is kept (mirror-image peaks get the same section)."""
    tol = PLATEAU_TOLERANCE * max(w0, scale)

    def flat(c: float) -> bool:
        return width(c) <= w0 + tol

    step = 1e-6 * (hi - lo)
    if not flat(max(s0 - step, lo)) and not flat(min(s0 + step, hi)):
        return s0  # a single smallest width (a hole, a notch root): nothing to centre
    ends = []
    for limit in (lo, hi):
        if flat(limit):
            ends.append(limit)
            continue
        inside, outside = s0, limit
        for _ in range(60):  # bisection to round-off
            mid = 0.5 * (inside + outside)
            if flat(mid):
                inside = mid
            else:
                outside = mid
            if abs(outside - inside) <= 1e-12 * max(abs(hi - lo), 1e-300):
                break
        ends.append(inside)
    if ends[1] - ends[0] <= 1e-9 * max(hi - lo, 1e-300):
        return s0
    return 0.5 * (ends[0] + ends[1])


def gross_cut(part: PartGeometry, feature: Feature, axis: np.ndarray, s: float) -> tuple[Cut | None, str]:
    """The gross section of a feature at axial position ``s`` and the rule that gave it (docs/conventions.md):

    * a hole or cut-out: the cut with the cut-out filled in;
    * a notch: the cut of the outline without its notches;
    * a fillet or concave arc at a width step: the wider of the cuts just beyond the feature's ends;
    * otherwise (sharp corners): none."""
    from dataclasses import replace

    from ..kinds import FeatureKind

    if feature.kind in (FeatureKind.HOLE, FeatureKind.CUTOUT):
        li = feature.segments[0][0]
        filled = replace(part, loops=tuple(lp for k, lp in enumerate(part.loops) if k != li))
        return section_at(filled, axis, s), "cut-out filled in"
    if feature.kind == FeatureKind.NOTCH and part.plain_outline is not None:
        plain = replace(part, loops=(part.plain_outline,) + part.loops[1:])
        return section_at(plain, axis, s), "outline without notches"
    if feature.kind in (FeatureKind.FILLET, FeatureKind.CONCAVE_ARC):
        lo, hi = feature_extent(part, feature, axis)
        poly = part_polygon(part)
        pad = 1e-3 * max(hi - lo, 1e-9 * math.sqrt(poly.area))
        cuts = [section_at(part, axis, lo - pad, poly), section_at(part, axis, hi + pad, poly)]
        wide = max(cuts, key=lambda c: c.width)
        net = section_at(part, axis, s, poly)
        if wide.width <= net.width * (1 + PLATEAU_TOLERANCE):
            return None, "not applicable: no width step at this feature"
        return replace(wide, s=s), "wider side of the step"
    return None, "not applicable"
