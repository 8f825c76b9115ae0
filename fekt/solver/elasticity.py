"""Linear elasticity in the plane with quadratic (P2) triangles on curved meshes (scikit-fem).

Sign conventions: tension positive; stresses are returned as (sxx, syy, sxy) arrays.
Plane stress uses lambda* = E nu / (1 - nu^2); plane strain uses the 3D lambda = E nu / ((1+nu)(1-2nu));
mu = E / (2 (1 + nu)) in both (e.g. Timoshenko & Goodier, Theory of Elasticity, plane problems).
We compute these ourselves: skfem's plane_stress() was wrong before 12.0.2 (shared notes D1).
"""

from __future__ import annotations

import time
from collections.abc import Callable
from dataclasses import dataclass

import numpy as np
import scipy.sparse as sp
from scipy.sparse.linalg import splu
from skfem import (Basis, BilinearForm, ElementTriP1, ElementTriP2, ElementVector, FacetBasis, LinearForm, MeshTri2,
                   asm, condense)
from skfem.helpers import ddot, sym_grad, trace

from ..errors import SolveError
from ..mesh.build import PartMesh

#: quadrature order for the stiffness: the 3-point rule (degree 2) is exact for P2 strains on
#: straight-sided elements (products of linear gradients); on curved elements no finite rule is exact
#: and the 3-point rule is the usual full integration for six-node triangles (Zienkiewicz & Taylor,
#: The Finite Element Method, vol. 1, numerical integration chapter; from memory).
STIFFNESS_INTORDER = 2
#: traction quadrature on a facet: degree 4 integrates a linear traction against quadratic test
#: functions with a quadratic facet map closely; cheap because only the loaded edges are involved.
TRACTION_INTORDER = 4


def lame(E: float, nu: float, model: str) -> tuple[float, float]:
    """Lame parameters (lambda, mu) for the 2D model ("plane_stress" or "plane_strain")."""
    mu = E / (2.0 * (1.0 + nu))
    if model == "plane_stress":
        return E * nu / (1.0 - nu ** 2), mu
    if model == "plane_strain":
        return E * nu / ((1.0 + nu) * (1.0 - 2.0 * nu)), mu
    raise SolveError(f"unknown 2D model '{model}'")


def stress_from_grad(grad: np.ndarray, lam: float, mu: float) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    """(sxx, syy, sxy) from the displacement gradient grad[i, j] = du_i/dx_j (any trailing shape)."""
    exx, eyy = grad[0, 0], grad[1, 1]
    exy = 0.5 * (grad[0, 1] + grad[1, 0])
    tr = exx + eyy
    return lam * tr + 2 * mu * exx, lam * tr + 2 * mu * eyy, 2 * mu * exy


@dataclass(frozen=True)
class TractionLoad:
    """Traction t(x, n) -> (tx, ty) on the given boundary facets (force per unit area times
    thickness is applied by the caller: in 2D the thickness cancels from stresses)."""

    facets: np.ndarray
    traction: Callable[[np.ndarray, np.ndarray], tuple[np.ndarray, np.ndarray]]
    label: str = ""


@dataclass(frozen=True)
class ElasticSolution:
    basis: Basis
    u: np.ndarray
    lam: float
    mu: float
    model: str
    restraints: tuple[tuple[int, int], ...]  # (vertex index, component)
    reactions: np.ndarray  # force at each restrained dof (per unit thickness)
    load_norm: float  # sum of |nodal load| (per unit thickness), the scale for reactions
    ndofs: int
    seconds_assemble: float
    seconds_solve: float
    solver: str


def choose_restraints(mesh) -> tuple[tuple[int, int], ...]:
    """Three point restraints that remove rigid-body motion and nothing else.

    Vertex A (nearest the centroid of the vertices) is fixed in x and y; vertex B (farthest from A)
    is fixed in the direction in which AB has the smaller component, which stops the rotation
    about A. With self-equilibrated loads the reactions are zero (checked after the solve)."""
    p = mesh.p[:, : mesh.nvertices]
    c = p.mean(axis=1)
    a = int(np.argmin(np.sum((p - c[:, None]) ** 2, axis=0)))
    b = int(np.argmax(np.sum((p - p[:, [a]]) ** 2, axis=0)))
    ab = p[:, b] - p[:, a]
    comp = 1 if abs(ab[0]) >= abs(ab[1]) else 0
    return ((a, 0), (a, 1), (b, comp))


def linear_solve(A: sp.spmatrix, b: np.ndarray) -> tuple[np.ndarray, str]:
    """Direct sparse solve with a symmetric fill-reducing ordering.

    SuperLU with MMD on A^T+A and SymmetricMode was 2-3x faster than scipy's default COLAMD
    ordering on 2D P2 stiffness matrices here (shared notes H; issue measurements)."""
    try:
        lu = splu(A.tocsc(), permc_spec="MMD_AT_PLUS_A", options=dict(SymmetricMode=True))
    except RuntimeError as exc:  # "Factor is exactly singular"
        raise SolveError(f"the stiffness matrix is singular ({exc}); a restraint is missing or part of "
                         "the mesh is disconnected") from exc
    except MemoryError as exc:
        raise SolveError("the direct solver ran out of memory; use a coarser mesh "
                         "(smaller elements_per_radius or larger size)") from exc
    x = lu.solve(b)
    if not np.all(np.isfinite(x)):
        raise SolveError("the solve produced non-finite displacements (singular or ill-conditioned system)")
    return x, "SuperLU (MMD_AT_PLUS_A, symmetric mode)"


def solve_elasticity(pmesh: PartMesh, E: float, nu: float, model: str,
                     loads: list[TractionLoad]) -> ElasticSolution:
    """Assemble and solve; loads must be self-equilibrated (reactions are checked)."""
    t0 = time.perf_counter()
    mesh = pmesh.mesh
    # P2 on the curved quadratic mesh; P1 only for the naive baseline of the benchmark
    e = ElementVector(ElementTriP2() if isinstance(mesh, MeshTri2) else ElementTriP1())
    basis = Basis(mesh, e, intorder=STIFFNESS_INTORDER, mapping=pmesh.mapping)
    lam, mu = lame(E, nu, model)

    @BilinearForm
    def stiffness(u, v, w):
        eu, ev = sym_grad(u), sym_grad(v)
        return 2.0 * mu * ddot(eu, ev) + lam * trace(eu) * trace(ev)

    K = asm(stiffness, basis)
    f = np.zeros(basis.N)
    for load in loads:
        fb = FacetBasis(mesh, e, facets=load.facets, intorder=TRACTION_INTORDER, mapping=pmesh.mapping)

        @LinearForm
        def traction(v, w, _load=load):
            tx, ty = _load.traction(w.x, w.n)
            return tx * v[0] + ty * v[1]

        f += asm(traction, fb)
    restraints = choose_restraints(mesh)
    D = np.array([basis.nodal_dofs[c, v] for v, c in restraints])
    t1 = time.perf_counter()
    A, b, _, I = condense(K, f, D=D)
    x, solver = linear_solve(A, b)
    u = np.zeros(basis.N)
    u[I] = x
    reactions = (K @ u - f)[D]
    t2 = time.perf_counter()
    return ElasticSolution(basis=basis, u=u, lam=lam, mu=mu, model=model, restraints=restraints,
                           reactions=reactions, load_norm=float(np.abs(f).sum()), ndofs=basis.N,
                           seconds_assemble=t1 - t0, seconds_solve=t2 - t1, solver=solver)


#: restraint reactions must vanish for self-equilibrated loads (round-off level; our own tolerance)
REACTION_TOLERANCE = 1e-8


def check_reactions(sol: ElasticSolution) -> None:
    """Fail when the point restraints carry load: the loads were not self-equilibrated."""
    r = float(np.max(np.abs(sol.reactions))) / max(sol.load_norm, 1e-300)
    if r > REACTION_TOLERANCE:
        raise SolveError(f"the point restraints carry {r:.3g} of the applied load; the loads are not "
                         "self-equilibrated, so the restraints distort the stress field")
