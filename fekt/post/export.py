"""Nodal fields for general-purpose viewers: displacement, stresses, principal stresses, von Mises and
the tangential stress along the boundary, at the nodes of the curved quadratic mesh.

How the values are made (the report layer writes them, :func:`fekt.report.vtu.write_fields`):

* **Displacement** is continuous: its value at a node is the solved nodal value.
* **Stresses** are evaluated element by element at each element's own six nodes (the quadratic
  displacement gives a stress that is linear in each element and jumps between elements). A point field
  holds one value per node, so a node shared by several elements gets the plain mean of their values:
  that is the only averaging done. Principal stresses and von Mises are computed from the averaged
  components at the node.
* **Tangential boundary stress** (signed, tension positive; the stress along the boundary in the
  direction of travel, which is the peak stress fekt ranks when it is tensile): for every boundary
  facet, from the facet's own element at the facet's three nodes, with the curved facet's tangent there.
  A mid-side node lies on one boundary facet and keeps that element's value; a corner node lies on two
  boundary facets and gets their mean. Interior nodes get NaN.

Peaks must be read from fekt's table, not from these fields: fekt reads the boundary stress at facet
Gauss points (fekt.post.fields), and averaged nodal stresses underestimate peaks by 10-30 times more
(docs/pitfalls.md, E). The tangential boundary stress here is close to the table (it uses no averaging
across the boundary except at corner nodes) but it is sampled at nodes, not at the Gauss points the
table uses.

Load cases: the stresses of the load components are summed with ``factors`` (default every component
with factor 1, which is what ``fekt solve`` reports). Only in-plane fields with two displacement
components and stresses of circumferential harmonic 0 are exported.
"""

from __future__ import annotations

from collections.abc import Mapping
from dataclasses import dataclass

import numpy as np
from skfem import Basis, FacetBasis

from ..errors import SolveError
from ..mesh.build import PartMesh
from ..models.base import Stress, in_plane_principal
from ..solver.linear import Solution
from .fields import combine, surface_stresses

#: the six nodes of the reference triangle in scikit-fem's ElementTriP2 order (corners, then the
#: mid-side nodes of edges 0-1, 1-2, 0-2), which is also the VTK quadratic-triangle order
REFERENCE_NODES = np.array([[0.0, 1.0, 0.0, 0.5, 0.5, 0.0],
                            [0.0, 0.0, 1.0, 0.0, 0.5, 0.5]])
#: a boundary facet's two end nodes and its mid-side node, in facet reference coordinates
FACET_NODES = np.array([[0.0, 1.0, 0.5]])


@dataclass(frozen=True)
class NodalFields:
    """Fields at the nodes of the quadratic mesh (case units).

    ``points`` (n, 2); ``cells6`` (m, 6): each element's node indices, corners then the mid-side nodes
    of edges 0-1, 1-2, 2-0; ``displacement`` (n, 2); ``stress``: the nodal mean of the element values,
    each component an array (n,); ``s1``/``s2`` the in-plane principal stresses and ``von_mises`` the
    von Mises stress of those components; ``boundary_stt`` the tangential stress along the boundary at
    boundary nodes, NaN elsewhere; ``elements_per_node`` how many element values each node's stress
    is the mean of; ``coordinates`` the model's names for the two axes."""

    points: np.ndarray
    cells6: np.ndarray
    displacement: np.ndarray
    stress: Stress
    s1: np.ndarray
    s2: np.ndarray
    von_mises: np.ndarray
    boundary_stt: np.ndarray
    elements_per_node: np.ndarray
    coordinates: tuple[str, str]


def von_mises(s: Stress) -> np.ndarray:
    """Von Mises equivalent stress of the full 3x3 tensor (out-of-plane components included)."""
    return np.sqrt(0.5 * ((s.xx - s.yy) ** 2 + (s.yy - s.hh) ** 2 + (s.hh - s.xx) ** 2)
                   + 3.0 * (s.xy ** 2 + s.xh ** 2 + s.yh ** 2))


def _weights(sol: Solution, factors: Mapping[str, float] | None) -> dict[str, float]:
    return dict(factors) if factors is not None else {f.component.name: 1.0 for f in sol.fields}


def element_node_values(sol: Solution, pmesh: PartMesh, factors: Mapping[str, float] | None = None
                        ) -> tuple[np.ndarray, Stress, np.ndarray]:
    """Displacement (2, m, 6), stress (components (m, 6)) and coordinates (2, m, 6) of the load case at
    each element's own six nodes, element by element (not averaged)."""
    weights = _weights(sol, factors)
    quadrature = (REFERENCE_NODES, np.full(6, 1.0 / 12.0))
    comps: dict[str, Stress] = {}
    disp = None
    x = None
    for name, system in sol.systems.items():
        b = Basis(pmesh.mesh, system.basis.elem, quadrature=quadrature, mapping=pmesh.mapping)
        x = np.asarray(b.global_coordinates())
        op = sol.model.operator(name)
        for f in sol.fields:
            if f.component.operator != name:
                continue
            field = b.interpolate(f.u)
            value = np.asarray(field)
            if value.shape[0] != 2 or op.harmonic != 0:
                raise SolveError(f"field export covers in-plane fields only; load component '{f.component.name}' "
                                 f"has {value.shape[0]} displacement components, harmonic {op.harmonic}")
            comps[f.component.name] = op.stress(field, x, sol.E, sol.nu)
            w = float(weights.get(f.component.name, 0.0))
            disp = w * value if disp is None else disp + w * value
    return disp, combine(comps, weights), x


def _node_mean(nodes: np.ndarray, values: np.ndarray, n: int) -> np.ndarray:
    counts = np.bincount(nodes.ravel(), minlength=n)
    return np.bincount(nodes.ravel(), weights=values.ravel(), minlength=n) / np.maximum(counts, 1)


def boundary_tangential(sol: Solution, pmesh: PartMesh, factors: Mapping[str, float] | None = None
                        ) -> tuple[np.ndarray, np.ndarray]:
    """(node indices (k, 3), tangential stress (k, 3)) at the two end nodes and the mid-side node of
    every boundary facet, each from the facet's own element and the curved facet's tangent."""
    mesh = pmesh.mesh
    weights = _weights(sol, factors)
    quadrature = (FACET_NODES, np.array([0.25, 0.25, 0.5]))
    comps: dict[str, Stress] = {}
    x = n = None
    for name, system in sol.systems.items():
        fb = FacetBasis(mesh, system.basis.elem, facets=pmesh.boundary_facets, quadrature=quadrature,
                        mapping=pmesh.mapping)
        x = np.asarray(fb.global_coordinates())  # (2, k, 3)
        n = np.asarray(fb.normals)
        op = sol.model.operator(name)
        for f in sol.fields:
            if f.component.operator == name:
                comps[f.component.name] = op.stress(fb.interpolate(f.u), x, sol.E, sol.nu)
    stress = combine(comps, weights)
    stt, _ = surface_stresses(stress, n)
    # which node each facet point is: the facet's two vertices (in either order) and its mid-side node
    facets = pmesh.boundary_facets
    ends = mesh.facets[:, facets]  # (2, k) vertex indices
    p = mesh.doflocs
    nodes = np.empty((facets.size, 3), dtype=np.int64)
    scale = float(np.ptp(p, axis=1).max())
    for q in (0, 1):
        d0 = np.hypot(*(x[:, :, q] - p[:, ends[0]]))
        d1 = np.hypot(*(x[:, :, q] - p[:, ends[1]]))
        nodes[:, q] = np.where(d0 <= d1, ends[0], ends[1])
        if np.max(np.minimum(d0, d1)) > 1e-9 * scale:
            raise SolveError("field export: a boundary facet's end does not lie on a mesh node")
    nodes[:, 2] = mesh.nvertices + facets
    if np.max(np.hypot(*(x[:, :, 2] - p[:, nodes[:, 2]]))) > 1e-9 * scale:
        raise SolveError("field export: a boundary facet's middle does not lie on its mid-side node")
    return nodes, np.asarray(stt).reshape(facets.size, 3)


def nodal_fields(sol: Solution, pmesh: PartMesh, factors: Mapping[str, float] | None = None) -> NodalFields:
    """The fields of a solved load case at the mesh nodes (see the module docstring)."""
    mesh = pmesh.mesh
    cells = np.asarray(mesh.dofs.element_dofs).T.astype(np.int64)  # (m, 6) indices into doflocs
    npts = mesh.doflocs.shape[1]
    disp, stress, x = element_node_values(sol, pmesh, factors)
    scale = float(np.ptp(mesh.doflocs, axis=1).max())
    if np.max(np.abs(x - mesh.doflocs[:, cells])) > 1e-9 * scale:
        raise SolveError("field export: element nodes and mesh nodes disagree (node order)")
    counts = np.bincount(cells.ravel(), minlength=npts)
    displacement = np.stack([_node_mean(cells, disp[i], npts) for i in range(2)], axis=1)
    nodal = Stress(*(_node_mean(cells, np.asarray(c), npts) for c in stress.components()), harmonic=stress.harmonic)
    s1, s2 = in_plane_principal(nodal.xx, nodal.yy, nodal.xy)
    bnodes, bstt = boundary_tangential(sol, pmesh, factors)
    stt = np.full(npts, np.nan)
    sums = np.bincount(bnodes.ravel(), weights=bstt.ravel(), minlength=npts)
    hits = np.bincount(bnodes.ravel(), minlength=npts)
    on = hits > 0
    stt[on] = sums[on] / hits[on]
    return NodalFields(points=mesh.doflocs.T.copy(), cells6=cells, displacement=displacement, stress=nodal, s1=s1,
                       s2=s2, von_mises=von_mises(nodal), boundary_stt=stt, elements_per_node=counts,
                       coordinates=tuple(sol.model.coordinates))
