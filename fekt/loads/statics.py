"""Statics of boundary tractions: the force and moment a traction puts on the part, in total or on one
side of a cut, integrated on the exact outline (not the mesh).

A traction is given on outline segments (:class:`fekt.geometry.model.Segment`) as ``fn(x, n)`` with x
points (2, n) and n the outward unit normals there (material on the left of the direction of travel).
The integral is Gauss-Legendre on pieces of each segment split at the traction's kinks (``breaks``) and
where the segment crosses the cut, so that a traction that is smooth on each piece is integrated to
round-off (docs/conventions.md, "Section resultants").

Sign conventions: a cut at axial position s (axis a, transverse e = a turned +90 degrees) with the
section centroid C. From the loads on the side behind the cut (x . a < s): N = -F . a, V = -F . e,
M = Mz(C); from the loads in front: N = F . a, V = F . e, M = -Mz(C), where F is their force and Mz(C)
their moment about C (counter-clockwise positive). M > 0 puts the +e side of the section in tension.
"""

from __future__ import annotations

import math
from collections.abc import Callable, Sequence
from dataclasses import dataclass

import numpy as np

from ..geometry.model import ARC, LINE, Segment
from ..models.base import Resultants, Section

#: Gauss-Legendre points per piece and the largest angle of an arc piece (our own choice: smooth
#: tractions on pieces of at most 15 degrees are integrated to round-off with 12 points)
GAUSS_POINTS = 12
MAX_PIECE_ANGLE = math.radians(15.0)
#: pieces of a straight segment (a linear traction needs one; more keep kinks that were not declared small)
LINE_PIECES = 8
#: samples per segment when looking for the parameters where it crosses a cut
CROSSING_SAMPLES = 256


@dataclass(frozen=True)
class SegmentTraction:
    """A traction ``fn(x, n)`` on one outline segment of thickness ``thickness`` (1 for models without
    one); ``breaks``: parameters in (0, 1) where ``fn`` has a kink (e.g. the ends of a bearing arc)."""

    segment: Segment
    fn: Callable[[np.ndarray, np.ndarray], tuple]
    thickness: float = 1.0
    breaks: tuple[float, ...] = ()


def _derivative(seg: Segment, t: np.ndarray) -> np.ndarray:
    """dx/dt at parameters t (2, n)."""
    if seg.kind == LINE:
        d = np.subtract(seg.end, seg.start)
        return np.repeat(d[:, None], t.size, axis=1)
    if seg.kind == ARC:
        cx, cy = seg.center
        a0 = math.atan2(seg.start[1] - cy, seg.start[0] - cx)
        sw = seg.sweep()
        ang = a0 + sw * t
        return np.vstack([-seg.radius * sw * np.sin(ang), seg.radius * sw * np.cos(ang)])
    h = 1e-6
    return (seg.point(np.clip(t + h, 0, 1)) - seg.point(np.clip(t - h, 0, 1))) / (
        np.clip(t + h, 0, 1) - np.clip(t - h, 0, 1))


def _pieces(seg: Segment, breaks: Sequence[float]) -> np.ndarray:
    if seg.kind == LINE:
        n = LINE_PIECES
    elif seg.kind == ARC:
        n = max(1, math.ceil(abs(seg.sweep()) / MAX_PIECE_ANGLE))
    else:
        n = 24
    return np.unique(np.concatenate([np.linspace(0.0, 1.0, n + 1), np.clip(np.asarray(breaks, float), 0, 1)]))


def _crossings(seg: Segment, axis: np.ndarray, s: float) -> list[float]:
    """Parameters where the segment crosses the cut line x . axis = s (to round-off, by bisection)."""
    t = np.linspace(0.0, 1.0, CROSSING_SAMPLES + 1)
    f = axis @ seg.point(t) - s
    out = []
    for i in np.where(np.sign(f[:-1]) * np.sign(f[1:]) < 0)[0]:
        lo, hi, flo = t[i], t[i + 1], f[i]
        for _ in range(60):
            mid = 0.5 * (lo + hi)
            fm = float(axis @ seg.point(mid)[:, 0] - s)
            if np.sign(fm) == np.sign(flo):
                lo, flo = mid, fm
            else:
                hi = mid
        out.append(0.5 * (lo + hi))
    return out


def quadrature(load: SegmentTraction, cut: tuple[np.ndarray, float] | None = None
               ) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    """Points x (2, n), traction vectors t (2, n) and weights w (n) (length x thickness) of a traction;
    ``cut = (axis, s)`` adds the crossings of that cut as piece ends, so that each piece lies on one side."""
    seg = load.segment
    ends = _pieces(seg, load.breaks)
    if cut is not None:
        ends = np.unique(np.concatenate([ends, _crossings(seg, cut[0], cut[1])]))
    g, gw = np.polynomial.legendre.leggauss(GAUSS_POINTS)
    a, b = ends[:-1], ends[1:]
    t = (0.5 * (a + b)[:, None] + 0.5 * (b - a)[:, None] * g[None, :]).ravel()
    w = (0.5 * (b - a)[:, None] * gw[None, :]).ravel()
    x = seg.point(t)
    d = _derivative(seg, t)
    speed = np.hypot(d[0], d[1])
    n = np.vstack([d[1], -d[0]]) / np.where(speed > 0, speed, 1.0)  # right of travel: outward
    tx, ty = load.fn(x, n)
    tv = np.vstack([np.broadcast_to(tx, t.shape), np.broadcast_to(ty, t.shape)]).astype(float)
    return x, tv, w * speed * load.thickness


def total_force(loads: Sequence[SegmentTraction], about: Sequence[float] = (0.0, 0.0)) -> tuple[np.ndarray, float]:
    """The resultant force (2,) of the tractions and their moment about ``about`` (counter-clockwise +)."""
    F = np.zeros(2)
    Mz = 0.0
    c = np.asarray(about, dtype=float)
    for ld in loads:
        x, tv, w = quadrature(ld)
        F += tv @ w
        r = x - c[:, None]
        Mz += float(np.sum(w * (r[0] * tv[1] - r[1] * tv[0])))
    return F, Mz


def free_body(loads: Sequence[SegmentTraction], section: Section, axis: np.ndarray, side: int) -> Resultants:
    """Section resultants on the cut ``section`` from the tractions on one side of it (see the module
    docstring for the signs); ``side`` -1: behind the cut (x . axis < s), +1: in front."""
    axis = np.asarray(axis, dtype=float)
    e = np.array([-axis[1], axis[0]])
    c = np.asarray(section.centroid, dtype=float)
    F = np.zeros(2)
    Mz = 0.0
    for ld in loads:
        x, tv, w = quadrature(ld, (axis, section.s))
        keep = (axis @ x - section.s) * side > 0
        if not keep.any():
            continue
        xk, tk, wk = x[:, keep], tv[:, keep], w[keep]
        F += tk @ wk
        r = xk - c[:, None]
        Mz += float(np.sum(wk * (r[0] * tk[1] - r[1] * tk[0])))
    if side < 0:
        return Resultants(N=float(-F @ axis), V=float(-F @ e), M=Mz)
    return Resultants(N=float(F @ axis), V=float(F @ e), M=-Mz)


def points_free_body(points: np.ndarray, forces: np.ndarray, section: Section, axis: np.ndarray,
                     side: int) -> Resultants:
    """Section resultants from forces (2, n) applied at points (2, n) (the nodal forces of a contact
    solution) on one side of the cut (see the module docstring for the signs)."""
    axis = np.asarray(axis, dtype=float)
    e = np.array([-axis[1], axis[0]])
    keep = (axis @ points - section.s) * side > 0
    F = forces[:, keep].sum(axis=1)
    r = points[:, keep] - np.asarray(section.centroid, dtype=float)[:, None]
    Mz = float(np.sum(r[0] * forces[1, keep] - r[1] * forces[0, keep]))
    if side < 0:
        return Resultants(N=float(-F @ axis), V=float(-F @ e), M=Mz)
    return Resultants(N=float(F @ axis), V=float(F @ e), M=-Mz)
