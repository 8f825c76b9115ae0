"""Relative stress gradient at each stress peak, from the solved field.

Definition (Siebel & Stieler, VDI-Z 97, 1955; FKM guideline; from memory):

    chi* = -(1/sigma_0) d sigma/dn   at the peak, n the inward normal (1/length),

positive where the stress magnitude falls inward, as at a notch root. sigma is the measure the peaks are
ranked by (:mod:`fekt.post.measures`): for ``tangential`` the normal stress along the peak's tangent,
otherwise the measure of the full stress tensor (at a traction-free surface both equal the surface value).

How it is taken (measured on Kirsch's exact field, tests/test_gradient_fe.py; docs/pitfalls.md, E):

* the stress is sampled at the interior Gauss points (6 per element) of the elements in a thin band along
  the inward normal: depth 0 .. ``depth``, tangential offset within +-``half_width``. Point values at element
  corners and edges (what a probe along the normal line returns) are about ten times less accurate: on the
  Kirsch plate at 16 elements per radius a fit through them missed chi* by 3.5-16 %, the Gauss-point fit
  by 0.4 % (benchmarks/GRADIENT.md);
* a least-squares polynomial in depth (degree :data:`DEGREE`) times a quadratic in the tangential offset
  is fitted; chi* = -c_10 / c_00 (c_00 is the fitted surface stress);
* at a concave curved boundary of radius rho (a notch root, a hole, a fillet) the depth enters as
  zeta = rho (1 - rho/r), r the distance from the centre of curvature (our own choice: elastic fields at a
  circular root are expansions in powers of rho/r, as Kirsch's is exactly; zeta = n + O(n^2), so
  d sigma/d zeta = d sigma/dn at the surface), and the offset as rho times the polar angle. On a straight or
  convex boundary the depth is the distance along the normal.
* window (our own choice): depth 0.5 rho and half-width 0.1 rho, at least 4 and 1.5 local element sizes,
  at most a quarter of the ligament the peak lies in (straight edges: depth a quarter of the ligament,
  half-width a quarter of the depth); a window that reaches points nearer another part of the boundary
  (another notch, the far edge) is shrunk to half their distance;
* ``error_estimate``: |chi* - chi* of a fit one degree higher in depth|.

A singular corner gets no gradient (its elastic field is unbounded there). Pure functions of the solved
field: nothing here changes a peak's stress or Kt.
"""

from __future__ import annotations

import dataclasses
import math
from collections.abc import Mapping, Sequence
from dataclasses import dataclass

import numpy as np
from scipy.spatial import cKDTree
from skfem import Basis

from ..geometry.model import ARC, ELLIPSE, LINE, PartGeometry, Segment
from ..geometry.sections import transverse
from ..kinds import Measure
from ..mesh.build import PartMesh
from ..models.base import Stress
from ..records import PeakGradient, StressPeak
from ..solver.linear import Solution
from .fields import BoundarySamples, combine

#: degree of the fit in depth (the error estimate uses one more); the tangential offset is quadratic
DEGREE = 3
OFFSET_DEGREE = 2
#: window at a curved root, in root radii; minimum in local element sizes; cap in ligament widths
DEPTH_RADII = 0.5
HALF_WIDTH_RADII = 0.1
MIN_DEPTH_ELEMENTS = 4.0
MIN_HALF_WIDTH_ELEMENTS = 1.5
LIGAMENT_FRACTION = 0.25
#: on a straight edge: depth as a fraction of the ligament, half-width as a fraction of the depth
EDGE_DEPTH_LIGAMENT = 0.25
EDGE_HALF_WIDTH_DEPTH = 0.25
#: quadrature order of the sampling rule (6 interior Gauss points per triangle)
GAUSS_ORDER = 4
#: fewest samples per fitted coefficient
SAMPLES_PER_COEFFICIENT = 2.0

CURVED = "rho (1 - rho/r), r from the centre of curvature"
STRAIGHT = "distance along the inward normal"


def _basis_terms(degree: int) -> list[tuple[int, int]]:
    return [(i, j) for i in range(degree + 1) for j in range(OFFSET_DEGREE + 1)]


def fit_gradient(zeta: np.ndarray, offset: np.ndarray, values: np.ndarray, degree: int = DEGREE
                 ) -> tuple[float, float, float]:
    """(chi*, fitted surface value, residual RMS) of samples ``values`` at depths ``zeta`` (>= 0, with
    d zeta/dn = 1 at the surface) and tangential offsets ``offset``: a least-squares polynomial of
    ``degree`` in depth times a quadratic in the offset; chi* = -(d sigma/d zeta)/sigma at (0, 0)."""
    zs = float(np.max(np.abs(zeta))) or 1.0
    ws = float(np.max(np.abs(offset))) or 1.0
    terms = _basis_terms(degree)
    x, y = zeta / zs, offset / ws
    A = np.stack([x ** i * y ** j for i, j in terms], axis=1)
    c, _, rank, _ = np.linalg.lstsq(A, values, rcond=None)
    if rank < len(terms):
        raise np.linalg.LinAlgError("rank-deficient gradient fit")
    resid = values - A @ c
    c00 = float(c[terms.index((0, 0))])
    c10 = float(c[terms.index((1, 0))]) / zs
    chi = -c10 / c00 if c00 != 0.0 else math.nan
    return chi, c00, float(np.sqrt(np.mean(resid * resid)))


def measure_of(stress: Stress, measure: Measure, tangent: np.ndarray) -> np.ndarray:
    """The peak measure at interior points: the normal stress along ``tangent`` (tangential), or the
    largest/smallest principal stress or the von Mises stress of the full tensor."""
    measure = Measure(measure)
    if measure == Measure.TANGENTIAL:
        tx, ty = tangent
        return stress.xx * tx * tx + 2 * stress.xy * tx * ty + stress.yy * ty * ty
    if measure == Measure.VON_MISES:
        xx, yy, hh = stress.xx, stress.yy, stress.hh
        return np.sqrt(0.5 * ((xx - yy) ** 2 + (yy - hh) ** 2 + (hh - xx) ** 2)
                       + 3.0 * (stress.xy ** 2 + stress.xh ** 2 + stress.yh ** 2))
    T = np.empty(stress.xx.shape + (3, 3))
    T[..., 0, 0], T[..., 1, 1], T[..., 2, 2] = stress.xx, stress.yy, stress.hh
    T[..., 0, 1] = T[..., 1, 0] = stress.xy
    T[..., 0, 2] = T[..., 2, 0] = stress.xh
    T[..., 1, 2] = T[..., 2, 1] = stress.yh
    ev = np.linalg.eigvalsh(T)
    return ev[..., -1] if measure == Measure.MAX_PRINCIPAL else ev[..., 0]


def gauss_stress(sol: Solution, pmesh: PartMesh, elements: np.ndarray,
                 factors: Mapping[str, float] | None = None) -> tuple[np.ndarray, Stress]:
    """Points (2, n) and stress of a load case at the interior Gauss points of ``elements``."""
    comps: dict[str, Stress] = {}
    x = None
    for name, system in sol.systems.items():
        b = Basis(pmesh.mesh, system.basis.elem, mapping=pmesh.mapping, intorder=GAUSS_ORDER, elements=elements)
        xq = np.asarray(b.global_coordinates())
        if x is None:
            x = xq.reshape(2, -1)
        op = sol.model.operator(name)
        for f in sol.fields:
            if f.component.operator == name:
                comps[f.component.name] = op.stress(b.interpolate(f.u), xq, sol.E, sol.nu).flat()
    weights = factors if factors is not None else {k: 1.0 for k in comps}
    return x, combine(comps, weights)


def local_curvature(seg: Segment, point: np.ndarray) -> tuple[float, bool]:
    """(radius of curvature, concave for the material) of a boundary segment at ``point``.

    Loops run with the material on their left, so a clockwise arc or ellipse is concave."""
    if seg.kind == LINE:
        return math.inf, False
    concave = not seg.ccw
    if seg.kind == ARC:
        return float(seg.radius), concave
    if seg.kind == ELLIPSE:
        ca, sa = math.cos(seg.angle), math.sin(seg.angle)
        dx, dy = point[0] - seg.center[0], point[1] - seg.center[1]
        lx, ly = ca * dx + sa * dy, -sa * dx + ca * dy
        eta = math.atan2(ly / seg.b, lx / seg.a)
        a, b = seg.a, seg.b
        return float((a * a * math.sin(eta) ** 2 + b * b * math.cos(eta) ** 2) ** 1.5 / (a * b)), concave
    return math.inf, False


def root_radius(part: PartGeometry, samples: BoundarySamples, index: int) -> float:
    """The radius of curvature of the boundary at sample ``index`` where it is concave for the material (a
    notch root, a hole, a fillet), else inf (a straight or convex boundary)."""
    seg = part.loops[int(samples.loop[index])].segments[int(samples.segment[index])]
    radius, concave = local_curvature(seg, samples.xy[:, index])
    return radius if concave and math.isfinite(radius) and radius > 0 else math.inf


def _local_coordinates(xy: np.ndarray, p0: np.ndarray, inward: np.ndarray, tangent: np.ndarray,
                       radius: float, curved: bool) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    """(depth, zeta, offset) of points: polar about the centre of curvature at a concave curved root,
    Cartesian along the normal otherwise."""
    if curved:
        c = p0 - radius * inward
        d = xy - c[:, None]
        r = np.hypot(d[0], d[1])
        u0 = inward
        phi = np.arctan2(d.T @ tangent, d.T @ u0)
        return r - radius, radius * (1.0 - radius / np.maximum(r, 1e-300)), radius * phi
    d = xy - p0[:, None]
    depth = d.T @ inward
    return depth, depth, d.T @ tangent


def _ligament(peak: StressPeak, axis: np.ndarray) -> float:
    """Width of the material interval of the peak's net section nearest to the peak."""
    intervals = peak.net_section.intervals
    if not intervals:
        return math.inf
    y = float(np.array([peak.x, peak.y]) @ transverse(axis))
    lo, hi = min(intervals, key=lambda iv: 0.0 if iv[0] <= y <= iv[1] else min(abs(y - iv[0]), abs(y - iv[1])))
    return float(hi - lo)


@dataclass(frozen=True)
class Window:
    """The stress samples a gradient is fitted to: points ``xy`` (2, n), their depth coordinate ``zeta`` and
    tangential offset, the peak measure ``values`` there; the window's ``depth`` and ``half_width``, the local
    ``radius`` of curvature and whether the polar (``curved``) coordinates were used."""

    xy: np.ndarray
    zeta: np.ndarray
    offset: np.ndarray
    values: np.ndarray
    depth: float
    half_width: float
    radius: float
    curved: bool


def sample_window(sol: Solution, pmesh: PartMesh, part: PartGeometry, samples: BoundarySamples, index: int, *,
                  element_size: float, ligament: float, measure: Measure = Measure.TANGENTIAL,
                  factors: Mapping[str, float] | None = None, boundary: cKDTree | None = None) -> Window | str:
    """The stress samples near boundary sample ``index`` (see the module docstring), or the reason why there
    are too few. ``boundary``: a KD-tree of the boundary sample points (built when not given)."""
    p0 = samples.xy[:, index]
    outward = samples.normal[:, index]
    inward = -outward
    tangent = np.array([-outward[1], outward[0]])
    radius = root_radius(part, samples, index)
    curved = math.isfinite(radius)
    mesh = pmesh.mesh
    nodes = mesh.doflocs[:, mesh.dofs.element_dofs]  # (2, 6, nel)
    centre = nodes[:, :3].mean(axis=1)
    size = 2.0 * np.max(np.hypot(nodes[0] - centre[0], nodes[1] - centre[1]), axis=0)
    # the local element size: the element at the peak (a plain edge's nominal size is the largest element)
    h = min(float(element_size), float(size[np.argmin(np.hypot(centre[0] - p0[0], centre[1] - p0[1]))]))
    if curved:
        depth = max(DEPTH_RADII * radius, MIN_DEPTH_ELEMENTS * h)
        half = max(HALF_WIDTH_RADII * radius, MIN_HALF_WIDTH_ELEMENTS * h)
        if math.isfinite(ligament):
            depth = min(depth, LIGAMENT_FRACTION * ligament)
    else:
        if not math.isfinite(ligament):
            return "no section through the peak to size the sampling window"
        depth = EDGE_DEPTH_LIGAMENT * ligament
        half = max(EDGE_HALF_WIDTH_DEPTH * depth, MIN_HALF_WIDTH_ELEMENTS * h)
    half = min(half, depth)
    nd, _, ns = _local_coordinates(nodes.reshape(2, -1), p0, inward, tangent, radius, curved)
    nd = nd.reshape(nodes.shape[1:])
    ns = ns.reshape(nodes.shape[1:])
    tree = boundary if boundary is not None else cKDTree(samples.xy.T)
    needed = SAMPLES_PER_COEFFICIENT * len(_basis_terms(DEGREE + 1))
    for _ in range(6):
        near = ((nd.min(axis=0) <= depth + size) & (nd.max(axis=0) >= -size)
                & (np.abs(ns).min(axis=0) <= half + size))
        elements = np.flatnonzero(near)
        if elements.size:
            xy, stress = gauss_stress(sol, pmesh, elements, factors)
            d, zeta, s = _local_coordinates(xy, p0, inward, tangent, radius, curved)
            keep = (d >= -1e-9 * max(depth, 1.0)) & (d <= depth) & (np.abs(s) <= half)
            # points nearer another part of the boundary than the peak's own surface: the window reaches
            # another notch or edge; shrink it to half their distance
            _, j = tree.query(xy[:, keep].T)
            foreign = np.hypot(samples.xy[0, j] - p0[0], samples.xy[1, j] - p0[1]) > 2.0 * half + h
            if foreign.any():
                pts = xy[:, keep][:, foreign]
                reach = float(np.min(np.hypot(pts[0] - p0[0], pts[1] - p0[1])))
                depth = min(depth, 0.5 * reach)
                half = min(half, depth)
                continue
            if keep.sum() >= needed:
                values = measure_of(stress.take(keep), measure, tangent)
                return Window(xy[:, keep], zeta[keep], s[keep], values, float(depth), float(half), float(radius),
                              curved)
        if half >= depth:
            break
        half = min(2.0 * half, depth)
    return (f"too few stress samples within {depth:.3g} of the peak (elements about {h:.3g} there): the mesh is "
            "too coarse there for a gradient")


def peak_gradient(sol: Solution, pmesh: PartMesh, part: PartGeometry, samples: BoundarySamples, index: int, *,
                  element_size: float, ligament: float, singular: bool, measure: Measure = Measure.TANGENTIAL,
                  factors: Mapping[str, float] | None = None, boundary: cKDTree | None = None) -> PeakGradient:
    """The relative stress gradient at boundary sample ``index`` (see the module docstring)."""
    if singular:
        return PeakGradient(None, reason="singular corner: the elastic stress is unbounded there, so it has no "
                                         "gradient (and no Kf)")
    radius = root_radius(part, samples, index)
    try:
        w = sample_window(sol, pmesh, part, samples, index, element_size=element_size, ligament=ligament,
                          measure=measure, factors=factors, boundary=boundary)
    except ValueError as exc:  # e.g. components of different circumferential harmonics (a shaft)
        return PeakGradient(None, radius=radius, reason=f"no gradient: {exc}")
    if isinstance(w, str):
        return PeakGradient(None, radius=radius, reason=w)
    try:
        chi, surface, _ = fit_gradient(w.zeta, w.offset, w.values, DEGREE)
        chi2, _, _ = fit_gradient(w.zeta, w.offset, w.values, DEGREE + 1)
    except np.linalg.LinAlgError:
        return PeakGradient(None, depth=w.depth, half_width=w.half_width, radius=w.radius,
                            reason="the stress samples near the peak do not determine a gradient")
    if not math.isfinite(chi) or surface == 0.0:
        return PeakGradient(None, surface=surface, depth=w.depth, half_width=w.half_width, radius=w.radius,
                            reason="the fitted stress at the peak is zero: no relative gradient")
    return PeakGradient(chi=float(chi), surface=float(surface), depth=w.depth, half_width=w.half_width,
                        radius=w.radius, coordinate=CURVED if w.curved else STRAIGHT, degree=DEGREE,
                        points=int(w.values.size),
                        error_estimate=float(abs(chi2 - chi)) if math.isfinite(chi2) else None)


def nearest_sample(samples: BoundarySamples, x: float, y: float) -> int:
    """The boundary sample at (x, y) (a peak's point is one of the samples)."""
    return int(np.argmin(np.hypot(samples.xy[0] - x, samples.xy[1] - y)))


def with_gradients(peaks: Sequence[StressPeak], samples: BoundarySamples, sol: Solution, pmesh: PartMesh,
                   part: PartGeometry, axis, *, measure: Measure = Measure.TANGENTIAL,
                   factors: Mapping[str, float] | None = None) -> tuple[StressPeak, ...]:
    """The peaks with their relative stress gradient set (:attr:`StressPeak.gradient`)."""
    ax = np.asarray(axis, dtype=float)
    tree = cKDTree(samples.xy.T)
    out = []
    for p in peaks:
        i = nearest_sample(samples, p.x, p.y)
        g = peak_gradient(sol, pmesh, part, samples, i, element_size=p.element_size, ligament=_ligament(p, ax),
                          singular=p.singular, measure=measure, factors=factors, boundary=tree)
        out.append(dataclasses.replace(p, gradient=g))
    return tuple(out)


__all__ = ["Window", "fit_gradient", "gauss_stress", "local_curvature", "measure_of", "nearest_sample",
           "peak_gradient", "root_radius", "sample_window", "with_gradients", "DEGREE", "CURVED", "STRAIGHT"]
