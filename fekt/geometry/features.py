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
            k = 0
            segs = loop.segments
            while k < len(segs):
                s = segs[k]
                if not _concave(s):
                    k += 1
                    continue
                group = [k]
                while k + 1 < len(segs) and _concave(segs[k + 1]) and segs[k + 1].origin == s.origin:
                    k += 1
                    group.append(k)
                k += 1
                mid_seg = segs[group[len(group) // 2]]
                mid = mid_seg.point(0.5)[:, 0]
                kind = s.feature or FeatureKind.CONCAVE_ARC
                if kind == FeatureKind.NOTCH:
                    name = s.origin
                elif kind == FeatureKind.FILLET:
                    name = f"fillet at ({_fmt(mid[0])}, {_fmt(mid[1])})"
                else:
                    name = f"concave arc at ({_fmt(mid[0])}, {_fmt(mid[1])})"
                features.append(Feature(name=name, kind=kind, segments=tuple((li, g) for g in group),
                                        radius=min(segs[g].curvature_radius() for g in group),
                                        point=(float(mid[0]), float(mid[1]))))
        for k, ang, p in corner_turns(loop):
            if ang < -CORNER_TOLERANCE_DEG:
                name = f"sharp corner at ({_fmt(p[0])}, {_fmt(p[1])})"
                features.append(Feature(name=name, kind=FeatureKind.SHARP_CORNER, segments=(), radius=0.0,
                                        point=p, singular=True))
                where = "outline" if loop.kind == LoopKind.OUTLINE else f"cut-out '{loop.name}'"
                warnings.append(
                    f"{name} ({where}) is a re-entrant corner with no radius: its elastic peak stress has no "
                    f"finite value and grows without limit as the mesh is refined, so any Kt shown for it "
                    f"depends on the mesh, not on the part; give it a fillet radius (the drawing's radius or the smallest the process makes)")
    return features, warnings


def _fmt(v: float) -> str:
    return f"{v:.4g}"
