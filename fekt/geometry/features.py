"""Notch-feature detection on a part's loops.

Every loop has the material on its left. A boundary curve that turns right (clockwise) is concave
for the material and concentrates stress; so does a corner where the boundary turns right with no
radius, and there the elastic stress is unbounded (Williams 1952, re-entrant corner singularity).

Features found:
* every cut-out boundary (one feature per cut-out),
* every concave arc of the outline (vertex fillets at re-entrant corners, notch roots, scallops),
  grouped by the input item that produced it,
* every sharp re-entrant corner (singular: warned about).
"""

from __future__ import annotations

import math

import numpy as np

from ..kinds import FeatureKind, LoopKind
from .model import ARC, ELLIPSE, LINE, Feature, Loop, Segment

#: corners that turn by less than this are treated as smooth (tangent-continuous within drawing noise)
CORNER_TOLERANCE_DEG = 1.0


def tangent(seg: Segment, t: float) -> np.ndarray:
    """Unit tangent in the direction of travel at parameter t."""
    if seg.kind == LINE:
        d = np.subtract(seg.end, seg.start)
        return d / np.linalg.norm(d)
    p = seg.point(t)[:, 0]
    if seg.kind == ARC:
        r = p - np.array(seg.center)
        v = np.array([-r[1], r[0]]) if seg.ccw else np.array([r[1], -r[0]])
        return v / np.linalg.norm(v)
    h = 1e-6
    dp = seg.point(min(t + h, 1.0))[:, 0] - seg.point(max(t - h, 0.0))[:, 0]
    return dp / np.linalg.norm(dp)


def corner_turns(loop: Loop) -> list[tuple[int, float, tuple[float, float]]]:
    """(index of the segment after the corner, signed turn in degrees, corner point) per junction.

    Positive turns are to the left (convex for the material), negative to the right (re-entrant).
    """
    out = []
    segs = loop.segments
    for k, s in enumerate(segs):
        nxt = segs[(k + 1) % len(segs)]
        if len(segs) == 1:
            break
        a = tangent(s, 1.0)
        b = tangent(nxt, 0.0)
        ang = math.degrees(math.atan2(a[0] * b[1] - a[1] * b[0], float(a @ b)))
        out.append(((k + 1) % len(segs), ang, (float(s.end[0]), float(s.end[1]))))
    return out


def _concave(seg: Segment) -> bool:
    return seg.kind in (ARC, ELLIPSE) and not seg.ccw


def detect_features(loops: list[Loop] | tuple[Loop, ...], notch_names: set[str] | frozenset = frozenset()
                    ) -> tuple[list[Feature], list[str]]:
    """Features and warnings (sharp re-entrant corners) of the loops."""
    features: list[Feature] = []
    warnings: list[str] = []
    for li, loop in enumerate(loops):
        if loop.kind == LoopKind.CUTOUT:
            radii = [s.curvature_radius() for s in loop.segments]
            finite = [r for r in radii if math.isfinite(r)]
            pts = loop.polygon_points()
            single_circle = len(loop.segments) == 1 and loop.segments[0].kind == ARC
            features.append(Feature(
                name=f"cut-out '{loop.name}'",
                kind=FeatureKind.HOLE if single_circle else FeatureKind.CUTOUT,
                segments=tuple((li, k) for k in range(len(loop.segments))),
                radius=min(finite) if finite else 0.0,
                point=(float(pts[0].mean()), float(pts[1].mean())),
            ))
        else:
            features += concave_features(li, loop)
        for k, ang, p in corner_turns(loop):
            if ang < -CORNER_TOLERANCE_DEG:
                name = _corner_name(loop, k)
                features.append(Feature(name=name, kind=FeatureKind.SHARP_CORNER, segments=(), radius=0.0,
                                        point=p, singular=True))
                where = "outline" if loop.kind == LoopKind.OUTLINE else f"cut-out '{loop.name}'"
                warnings.append(
                    f"{name} ({where}) is a re-entrant corner with no radius: its elastic peak stress has no "
                    f"finite value and grows without limit as the mesh is refined, so any Kt shown for it "
                    f"depends on the mesh, not on the part; give it a fillet radius (the drawing's radius or the smallest the process makes)")
    return features, warnings


def _smooth(a: Segment, b: Segment) -> bool:
    """True when curve b continues curve a without a corner."""
    ta, tb = tangent(a, 1.0), tangent(b, 0.0)
    return abs(math.degrees(math.atan2(ta[0] * tb[1] - ta[1] * tb[0], float(ta @ tb)))) <= CORNER_TOLERANCE_DEG


def concave_features(li: int, loop: Loop) -> list[Feature]:
    """One feature per chain of concave curves joined without a corner (a notch, fillet or scallop drawn
    as several arcs is one feature), named by the generator's names (never coordinates)."""
    segs = loop.segments
    n = len(segs)
    concave = [_concave(s) for s in segs]
    if not any(concave):
        return []
    # start after a non-concave curve (or a corner) so that no chain is cut where the loop closes
    start = 0
    for k in range(n):
        if not concave[k] or not _smooth(segs[k - 1], segs[k]) or not concave[k - 1]:
            start = k
            break
    groups: list[list[int]] = []
    for step in range(n):
        k = (start + step) % n
        if not concave[k]:
            continue
        if groups and groups[-1][-1] == (k - 1) % n and _smooth(segs[(k - 1) % n], segs[k]):
            groups[-1].append(k)
        else:
            groups.append([k])
    out = []
    for group in groups:
        members = [segs[g] for g in group]
        kinds = {m.feature or FeatureKind.CONCAVE_ARC for m in members}
        kind = FeatureKind.NOTCH if FeatureKind.NOTCH in kinds else (
            FeatureKind.FILLET if kinds == {FeatureKind.FILLET} else FeatureKind.CONCAVE_ARC)
        mid = members[len(members) // 2].point(0.5)[:, 0]
        out.append(Feature(name=_group_name(loop, group), kind=kind, segments=tuple((li, g) for g in group),
                           radius=min(m.curvature_radius() for m in members),
                           point=(float(mid[0]), float(mid[1]))))
    return out


def _group_name(loop: Loop, group: list[int]) -> str:
    segs = loop.segments
    names = list(dict.fromkeys(segs[g].name or segs[g].origin for g in group))
    if len(names) == 1:
        return names[0]
    ends = [segs[g].vertex for g in group] + [segs[(group[-1] + 1) % len(segs)].vertex]
    known = [v for v in ends if v is not None]
    where = "" if loop.kind == LoopKind.OUTLINE else f" of cut-out '{loop.name}'"
    if known:
        return f"concave curve from vertex {min(known)} to {max(known)}{where}"
    return f"{names[0]} to {names[-1]}"


def _corner_name(loop: Loop, k: int) -> str:
    """A sharp corner's name: the user's vertex where it lies, or the item that made it."""
    seg = loop.segments[k]
    where = "" if loop.kind == LoopKind.OUTLINE else f" of cut-out '{loop.name}'"
    if seg.vertex is not None:
        return f"sharp corner at vertex {seg.vertex}{where}"
    return f"sharp corner of {seg.origin}"
