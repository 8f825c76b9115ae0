"""Stress sampling: on the boundary at facet Gauss points, and at arbitrary interior points.

Boundary peaks are read at facet Gauss points on the curved mesh: nodal averaging and global
projection underestimate peaks 10-30x more (measured on the exact Kirsch problem; docs/pitfalls.md).
Stresses come from the analysis model (:mod:`fekt.models`); every load component is sampled on its
own, and a load case is their weighted sum.
"""

from __future__ import annotations

from collections.abc import Mapping
from dataclasses import dataclass

import numpy as np
from scipy.spatial import cKDTree
from skfem import ElementTriP2, FacetBasis

from ..errors import SolveError
from ..geometry.model import PartGeometry
from ..mesh.build import PartMesh
from ..models.base import Stress, add_stresses, in_plane_principal
from ..solver.linear import Solution

#: facet quadrature order for boundary stress (>= 5: docs/pitfalls.md, peak-stress recovery)
BOUNDARY_INTORDER = 5


@dataclass(frozen=True)
class BoundarySamples:
    """Stress at facet Gauss points along every boundary loop, sorted by loop then arc length.

    ``s`` is the arc-length coordinate along the loop (direction of travel, material on the left);
    ``normal`` the outward unit normal; ``components`` the stress of each load component and ``stress``
    that of the load case the samples were combined for; ``stt`` the tangential stress, ``snn`` the
    normal stress, ``s1``/``s2`` the in-plane principal stresses of the load case. The load-case fields
    are None when its components are of different circumferential harmonics (a shaft in bending and
    tension): such components combine at an angle around the axis (:mod:`fekt.post.measures`).
    """

    xy: np.ndarray
    loop: np.ndarray
    segment: np.ndarray
    s: np.ndarray
    normal: np.ndarray
    components: Mapping[str, Stress]
    stress: Stress | None
    stt: np.ndarray | None
    snn: np.ndarray | None
    s1: np.ndarray | None
    s2: np.ndarray | None


def surface_stresses(stress: Stress, normal: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
    """(tangential, normal) in-plane normal stress at boundary points with outward normals (2, n)."""
    tx, ty = -normal[1], normal[0]  # tangent in the direction of travel (material on the left)
    stt = stress.xx * tx * tx + 2 * stress.xy * tx * ty + stress.yy * ty * ty
    snn = stress.xx * normal[0] ** 2 + 2 * stress.xy * normal[0] * normal[1] + stress.yy * normal[1] ** 2
    return stt, snn


def boundary_samples(sol: Solution, pmesh: PartMesh, part: PartGeometry,
                     factors: Mapping[str, float] | None = None) -> BoundarySamples:
    """Sample every load component on the boundary; the load case is ``factors`` (component name ->
    factor; default every component with factor 1)."""
    mesh = pmesh.mesh
    comps: dict[str, Stress] = {}
    x = n = None
    for name, system in sol.systems.items():
        fb = FacetBasis(mesh, system.basis.elem, facets=pmesh.boundary_facets, intorder=BOUNDARY_INTORDER,
                        mapping=pmesh.mapping)
        if x is None:
            x = np.asarray(fb.global_coordinates())  # (2, nf, nq)
            n = np.asarray(fb.normals)  # outward unit normals
        op = sol.model.operator(name)
        for f in sol.fields:
            if f.component.operator == name:
                comps[f.component.name] = op.stress(fb.interpolate(f.u), x, sol.E, sol.nu).flat()
    nq = x.shape[2]
    # fb orders facets as given; map each to its (loop, segment)
    loop = np.repeat(pmesh.facet_loop, nq)
    seg = np.repeat(pmesh.facet_segment, nq)
    X = x.reshape(2, -1)
    N = n.reshape(2, -1)
    s = np.empty(X.shape[1])
    for li, lp in enumerate(part.loops):
        offs = np.concatenate([[0.0], np.cumsum(lp.lengths())])
        for si, sg in enumerate(lp.segments):
            m = (loop == li) & (seg == si)
            if m.any():
                s[m] = offs[si] + sg.parameter(X[:, m]) * sg.length()
    order = np.lexsort((s, loop))
    comps = {k: v.take(order) for k, v in comps.items()}
    weights = factors if factors is not None else {k: 1.0 for k in comps}
    normal = N[:, order]
    stress = stt = snn = s1 = s2 = None
    if len({c.harmonic for k, c in comps.items() if weights.get(k, 0.0) != 0.0}) <= 1:
        stress = combine(comps, weights)
        stt, snn = surface_stresses(stress, normal)
        s1, s2 = in_plane_principal(stress.xx, stress.yy, stress.xy)
    return BoundarySamples(xy=X[:, order], loop=loop[order], segment=seg[order], s=s[order], normal=normal,
                           components=comps, stress=stress, stt=stt, snn=snn, s1=s1, s2=s2)


def combine(components: Mapping[str, Stress], factors: Mapping[str, float]) -> Stress:
    """The stress of a load case: the components' stresses times their factors."""
    parts = [(float(factors[k]), components[k]) for k in components if factors.get(k, 0.0) != 0.0]
    if not parts:
        first = next(iter(components.values()))
        return first.scaled(0.0)
    if len(parts) == 1 and parts[0][0] == 1.0:
        return parts[0][1]
    return add_stresses(parts)


def corner_stress(sol: Solution, pmesh: PartMesh, factors: Mapping[str, float] | None = None) -> Stress:
    """Stress of a load case at the three corners of every element, element by element (not averaged;
    arrays of shape (elements, 3)), for drawing the field."""
    from skfem import Basis

    corners = np.array([[0.0, 1.0, 0.0], [0.0, 0.0, 1.0]])
    comps = {}
    for name, system in sol.systems.items():
        b = Basis(pmesh.mesh, system.basis.elem, quadrature=(corners, np.ones(3) / 6), mapping=pmesh.mapping)
        x = np.asarray(b.global_coordinates())
        op = sol.model.operator(name)
        for f in sol.fields:
            if f.component.operator == name:
                comps[f.component.name] = op.stress(b.interpolate(f.u), x, sol.E, sol.nu)
    weights = factors if factors is not None else {k: 1.0 for k in comps}
    return combine(comps, weights)


# --- interior probes -----------------------------------------------------------------------------

_P2 = ElementTriP2()


def _p2_shape(xi: np.ndarray, eta: np.ndarray):
    """The six quadratic shape functions and their reference derivatives (scikit-fem's ElementTriP2,
    the isoparametric map of the curved six-node triangles; used to locate points)."""
    X = np.stack([xi.ravel(), eta.ravel()])
    vals = [_P2.lbasis(X, i) for i in range(6)]
    N = np.stack([v.reshape(xi.shape) for v, _ in vals])
    dxi = np.stack([g[0].reshape(xi.shape) for _, g in vals])
    deta = np.stack([g[1].reshape(xi.shape) for _, g in vals])
    return N, dxi, deta


def locate(mesh, points: np.ndarray, k: int = 10) -> tuple[np.ndarray, np.ndarray]:
    """Element index and reference coordinates (2, n) of each point on the curved P2 mesh.

    Newton iteration on the isoparametric map over the k elements with the nearest centroids; a point
    belongs to the first candidate whose reference coordinates lie in the triangle. (scikit-fem has no
    point location on quadratic meshes: docs/pitfalls.md.)"""
    edofs = mesh.dofs.element_dofs  # (6, nel) indices into doflocs
    nodes = mesh.doflocs[:, edofs]  # (2, 6, nel)
    tree = cKDTree(nodes.mean(axis=1).T)
    npts = points.shape[1]
    cells = np.full(npts, -1)
    ref = np.zeros((2, npts))
    for kk in (k, 4 * k):
        todo = np.where(cells < 0)[0]
        if todo.size == 0:
            break
        _, cand = tree.query(points[:, todo].T, k=min(kk, nodes.shape[2]))
        cand = np.atleast_2d(cand)
        P = np.repeat(points[:, todo][:, :, None], cand.shape[1], axis=2)  # (2, m, kk)
        Xe = nodes[:, :, cand]  # (2, 6, m, kk)
        xi = np.full(cand.shape, 1 / 3)
        eta = np.full(cand.shape, 1 / 3)
        for _ in range(30):
            N, dxi, deta = _p2_shape(xi, eta)
            F = np.einsum("ijmk,jmk->imk", Xe, N)
            J00 = np.einsum("jmk,jmk->mk", Xe[0], dxi)
            J01 = np.einsum("jmk,jmk->mk", Xe[0], deta)
            J10 = np.einsum("jmk,jmk->mk", Xe[1], dxi)
            J11 = np.einsum("jmk,jmk->mk", Xe[1], deta)
            det = J00 * J11 - J01 * J10
            r = P - F
            dx = (J11 * r[0] - J01 * r[1]) / det
            de = (-J10 * r[0] + J00 * r[1]) / det
            xi = np.clip(xi + dx, -2, 3)
            eta = np.clip(eta + de, -2, 3)
            if np.max(np.abs(dx) + np.abs(de)) < 1e-13:
                break
        tol = 1e-9
        inside = (xi >= -tol) & (eta >= -tol) & (xi + eta <= 1 + tol) & (np.abs(r).sum(axis=0) < 1e-8 *
                                                                          (1 + np.abs(P).sum(axis=0)))
        hit = inside.any(axis=1)
        first = inside.argmax(axis=1)
        rows = np.where(hit)[0]
        cells[todo[rows]] = cand[rows, first[rows]]
        ref[0, todo[rows]] = xi[rows, first[rows]]
        ref[1, todo[rows]] = eta[rows, first[rows]]
    if (cells < 0).any():
        bad = points[:, cells < 0][:, 0]
        raise SolveError(f"point ({bad[0]:.6g}, {bad[1]:.6g}) is not inside the mesh")
    return cells, ref


@dataclass(frozen=True)
class PointField:
    """A solved field evaluated at points: ``value`` (components, n) and ``grad`` (components, 2, n), the
    shape scikit-fem's DiscreteField has, so a model's ``stress`` accepts either."""

    value: np.ndarray
    grad: np.ndarray


def point_field(sol: Solution, operator: str, u: np.ndarray, cells: np.ndarray, ref: np.ndarray) -> PointField:
    basis = sol.basis(operator)
    X = ref[:, :, None]
    value = grad = None
    for k in range(basis.Nbfun):
        phi = basis.elem.gbasis(basis.mapping, X, k, tind=cells)[0]
        coef = u[basis.element_dofs[k, cells]]
        v = np.asarray(phi)[..., 0] * coef  # a DiscreteField is its own value
        g = np.asarray(phi.grad)[..., 0] * coef
        value = v if value is None else value + v
        grad = g if grad is None else grad + g
    return PointField(value, grad)


def probe_components(sol: Solution, points: np.ndarray) -> dict[str, Stress]:
    """Stress of every load component at interior points (2, n); the points are located once."""
    mesh = next(iter(sol.systems.values())).basis.mesh
    cells, ref = locate(mesh, points)
    comps = {}
    for f in sol.fields:
        op = sol.model.operator(f.component.operator)
        comps[f.component.name] = op.stress(point_field(sol, op.name, f.u, cells, ref), points, sol.E, sol.nu)
    return comps


def probe_stress(sol: Solution, points: np.ndarray, factors: Mapping[str, float] | None = None) -> Stress:
    """Stress of a load case (default: every component with factor 1) at interior points (2, n)."""
    comps = probe_components(sol, points)
    return combine(comps, factors if factors is not None else {k: 1.0 for k in comps})


def probe_displacement(sol: Solution, points: np.ndarray, component: str | None = None) -> np.ndarray:
    """Displacement (2, n) of one load component (default: the first) at interior points."""
    f = sol.field(component) if component else sol.fields[0]
    cells, ref = locate(sol.basis(f.component.operator).mesh, points)
    return point_field(sol, f.component.operator, f.u, cells, ref).value
