"""The outline model: straight, circular-arc and elliptical boundary segments grouped in loops.

A part is one outer loop (counter-clockwise, material on the left of the direction of travel)
and any number of cut-out loops (clockwise, so material is again on the left). Every loop is a
closed chain of :class:`Segment` objects; the end of each segment is the start of the next.
The same model feeds the mesher (one gmsh curve per segment), the boundary-stress sampler
(segment parameters order the samples along a loop) and the section cuts (exact intersections).

Coordinates are in the case's length unit. Angles inside this module are radians.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field

import numpy as np

from ..kinds import CurveKind, FeatureKind, LoopKind

#: the boundary name of the whole outer loop (a remote stress acts on all of it, named edges or not)
OUTLINE = "@outline"

LINE = CurveKind.LINE
ARC = CurveKind.ARC
ELLIPSE = CurveKind.ELLIPSE


@dataclass(frozen=True)
class Segment:
    """One boundary curve.

    * ``line``: from ``start`` to ``end``.
    * ``arc``: circular arc of ``radius`` about ``center`` from ``start`` to ``end``, counter-clockwise
      if ``ccw`` else clockwise; always the arc swept in that sense (may exceed 180 degrees).
    * ``ellipse``: a full closed ellipse (``start == end``) with semi-axes ``a`` (along the direction
      ``angle``) and ``b``, traversed counter-clockwise if ``ccw``.

    ``edge`` is the user's name for the outline edge the segment belongs to (loads refer to it);
    ``origin`` says which input item produced it (for messages and feature names); ``feature`` is the
    kind of notch feature a concave curve forms, set by the generator that made it.
    """

    kind: CurveKind
    start: tuple[float, float]
    end: tuple[float, float]
    center: tuple[float, float] | None = None
    radius: float = 0.0
    ccw: bool = True
    a: float = 0.0
    b: float = 0.0
    angle: float = 0.0
    edge: str | None = None
    origin: str = ""
    feature: FeatureKind | None = None
    name: str | None = None  # the feature name of a concave curve (set by the generator, stable)
    vertex: int | None = None  # the user's vertex this curve starts at or rounds (None: generated)

    # -- geometry helpers -------------------------------------------------------------------
    def sweep(self) -> float:
        """Signed swept angle of an arc (positive counter-clockwise)."""
        if self.kind == ELLIPSE:
            return 2 * math.pi if self.ccw else -2 * math.pi
        if self.kind != ARC:
            return 0.0
        cx, cy = self.center
        a0 = math.atan2(self.start[1] - cy, self.start[0] - cx)
        a1 = math.atan2(self.end[1] - cy, self.end[0] - cx)
        d = (a1 - a0) % (2 * math.pi)
        if self.ccw:
            return d if d > 1e-14 else 2 * math.pi
        return d - 2 * math.pi if d > 1e-14 else -2 * math.pi

    def length(self) -> float:
        if self.kind == LINE:
            return math.dist(self.start, self.end)
        if self.kind == ARC:
            return abs(self.sweep()) * self.radius
        # Ramanujan's second approximation; used only to order samples and size meshes
        a, b = self.a, self.b
        h = ((a - b) / (a + b)) ** 2
        return math.pi * (a + b) * (1 + 3 * h / (10 + math.sqrt(4 - 3 * h)))

    def point(self, t: np.ndarray | float) -> np.ndarray:
        """Points at parameter ``t`` in [0, 1] (shape (2, n))."""
        t = np.atleast_1d(np.asarray(t, dtype=float))
        if self.kind == LINE:
            p0, p1 = np.array(self.start), np.array(self.end)
            return p0[:, None] + (p1 - p0)[:, None] * t[None, :]
        if self.kind == ARC:
            cx, cy = self.center
            a0 = math.atan2(self.start[1] - cy, self.start[0] - cx)
            ang = a0 + self.sweep() * t
            return np.vstack([cx + self.radius * np.cos(ang), cy + self.radius * np.sin(ang)])
        ang = 2 * math.pi * t * (1 if self.ccw else -1)
        return self._ellipse_xy(ang)

    def _ellipse_xy(self, eta: np.ndarray) -> np.ndarray:
        ca, sa = math.cos(self.angle), math.sin(self.angle)
        x = self.a * np.cos(eta)
        y = self.b * np.sin(eta)
        return np.vstack([self.center[0] + ca * x - sa * y, self.center[1] + sa * x + ca * y])

    def parameter(self, xy: np.ndarray) -> np.ndarray:
        """Parameter t in [0, 1] of the points ``xy`` (2, n), which lie on or near the segment."""
        xy = np.asarray(xy, dtype=float)
        if self.kind == LINE:
            p0, p1 = np.array(self.start), np.array(self.end)
            d = p1 - p0
            return np.clip(((xy - p0[:, None]).T @ d) / (d @ d), 0.0, 1.0)
        if self.kind == ARC:
            cx, cy = self.center
            a0 = math.atan2(self.start[1] - cy, self.start[0] - cx)
            ang = np.arctan2(xy[1] - cy, xy[0] - cx)
            sw = self.sweep()
            rel = (ang - a0) % (2 * math.pi) if sw > 0 else (a0 - ang) % (2 * math.pi)
            # points just before the start (numerical noise) wrap to ~2*pi: pull them back
            rel = np.where(rel > abs(sw) + 0.5 * (2 * math.pi - abs(sw)), rel - 2 * math.pi, rel)
            return np.clip(rel / abs(sw), 0.0, 1.0)
        ca, sa = math.cos(self.angle), math.sin(self.angle)
        dx, dy = xy[0] - self.center[0], xy[1] - self.center[1]
        lx, ly = ca * dx + sa * dy, -sa * dx + ca * dy
        eta = np.arctan2(ly / self.b, lx / self.a) % (2 * math.pi)
        if not self.ccw:
            eta = (2 * math.pi - eta) % (2 * math.pi)
        return eta / (2 * math.pi)

    def curvature_radius(self) -> float:
        """Smallest radius of curvature along the segment (inf for a line)."""
        if self.kind == LINE:
            return math.inf
        if self.kind == ARC:
            return self.radius
        return min(self.a, self.b) ** 2 / max(self.a, self.b)

    def reversed(self) -> "Segment":
        from dataclasses import replace

        if self.kind == ELLIPSE:
            return replace(self, ccw=not self.ccw)
        return replace(self, start=self.end, end=self.start, ccw=not self.ccw)

    def sample(self, max_angle: float = math.radians(1.0), max_len: float | None = None) -> np.ndarray:
        """Points along the segment including both ends, (2, n)."""
        if self.kind == LINE:
            n = 1 if max_len is None else max(1, math.ceil(self.length() / max_len))
        elif self.kind == ARC:
            n = max(2, math.ceil(abs(self.sweep()) / max_angle))
        else:
            n = max(16, math.ceil(2 * math.pi / max_angle))
        return self.point(np.linspace(0.0, 1.0, n + 1))


@dataclass(frozen=True)
class Loop:
    """A closed chain of segments."""

    segments: tuple[Segment, ...]
    kind: LoopKind
    name: str

    def polygon_points(self, max_angle: float = math.radians(1.0)) -> np.ndarray:
        """Closed polyline approximation (2, n) without the repeated last point."""
        pts = [s.sample(max_angle)[:, :-1] for s in self.segments]
        return np.hstack(pts)

    def lengths(self) -> np.ndarray:
        return np.array([s.length() for s in self.segments])


@dataclass(frozen=True)
class Feature:
    """A notch feature: a place where stress concentrates.

    ``kind`` is set by the generator that made the curves (see :class:`fekt.kinds.FeatureKind`).
    ``segments`` lists (loop index, segment index) pairs that form the feature; a sharp corner has no
    segment and is located by ``point``. ``radius`` is the smallest radius of curvature (0 for a
    sharp corner). ``singular`` is True for sharp concave corners (unbounded elastic stress).
    """

    name: str
    kind: FeatureKind
    segments: tuple[tuple[int, int], ...]
    radius: float
    point: tuple[float, float]
    singular: bool = False


@dataclass(frozen=True)
class PartGeometry:
    """A validated planar part: loops[0] is the outline, the rest are cut-outs."""

    loops: tuple[Loop, ...]
    features: tuple[Feature, ...] = field(default=())
    warnings: tuple[str, ...] = field(default=())
    plain_outline: Loop | None = None  # the outline before notches were cut into it (gross sections)

    @property
    def outline(self) -> Loop:
        return self.loops[0]

    def area(self) -> float:
        """Exact area from the segments (shoelace + circular segments + ellipses)."""
        total = 0.0
        for loop in self.loops:
            total += loop_signed_area(loop)
        return total

    def segment(self, ref: tuple[int, int]) -> Segment:
        return self.loops[ref[0]].segments[ref[1]]

    def edge_segments(self, name: str) -> list[tuple[int, int]]:
        return [(li, si) for li, loop in enumerate(self.loops)
                for si, s in enumerate(loop.segments) if s.edge == name]

    def named_refs(self, name: str) -> list[tuple[int, int]]:
        """(loop, segment) references of a boundary name: an outline edge's name, a cut-out's name, or
        :data:`OUTLINE` (the whole outer loop)."""
        if name == OUTLINE:
            return [(0, si) for si in range(len(self.loops[0].segments))]
        refs = self.edge_segments(name)
        for li, loop in enumerate(self.loops):
            if loop.kind == LoopKind.CUTOUT and loop.name == name:
                refs += [(li, si) for si in range(len(loop.segments))]
        return refs

    def edge_names(self) -> list[str]:
        names: list[str] = []
        for loop in self.loops:
            for s in loop.segments:
                if s.edge and s.edge not in names:
                    names.append(s.edge)
        return names

    def bounding_box(self) -> tuple[float, float, float, float]:
        pts = self.outline.polygon_points()
        return float(pts[0].min()), float(pts[1].min()), float(pts[0].max()), float(pts[1].max())


def segment_signed_area(s: Segment) -> float:
    """Contribution of one segment to the loop's signed area (Green's theorem, exact)."""
    if s.kind == ELLIPSE:
        return (1 if s.ccw else -1) * math.pi * s.a * s.b
    x0, y0 = s.start
    x1, y1 = s.end
    chord = 0.5 * (x0 * y1 - x1 * y0)
    if s.kind == LINE:
        return chord
    th = s.sweep()
    # area between chord and arc, signed with the sweep direction
    return chord + 0.5 * s.radius ** 2 * (th - math.sin(th))


def loop_signed_area(loop: Loop) -> float:
    return sum(segment_signed_area(s) for s in loop.segments)
