"""Assemble and solve: one stiffness and one factorisation per operator, one solve per load component.

Every load component (an end force, an end moment, a bolt load, ...) is its own right-hand side on its
operator's factorised stiffness, so Kt per component and any combination of components (a load case)
come from a single factorisation. Supports hold degrees of freedom (:mod:`fekt.solver.restraints`);
every rigid motion they leave free is held by point restraints, and each load case must then be
self-equilibrated along it: the point restraints carry no reaction, which :func:`check_reactions`
verifies per load case after the solve, and :func:`check_free_motions` names the motion otherwise.
"""

from __future__ import annotations

import dataclasses
import time
from collections.abc import Mapping, Sequence
from dataclasses import dataclass, field
from typing import Any

import numpy as np
import scipy.sparse as sp
from scipy.sparse.linalg import splu
from skfem import Basis, FacetBasis

from ..errors import GeometryError, SolveError
from ..loads.base import AppliedSupport, Component
from ..mesh.build import PartMesh
from ..models.base import Model
from .restraints import (Reduction, constraint_rows, describe_motion, point_restraints, support_constraints)
from .restraints import free_motions as free_motions_of

#: traction quadrature on a facet: degree 4 integrates a linear traction against quadratic test
#: functions with a quadratic facet map closely; cheap because only the loaded edges are involved.
TRACTION_INTORDER = 4
#: restraint reactions must vanish for self-equilibrated loads (round-off level; our own tolerance)
REACTION_TOLERANCE = 1e-8
SOLVER_NAME = "SuperLU (MMD_AT_PLUS_A, symmetric mode)"


@dataclass(frozen=True)
class OperatorSystem:
    """One operator's basis, its restraints and its factorised reduced stiffness.

    ``restrained``: every dof held at zero (model conditions, supports, point restraints); ``rigid``: the
    point restraints among them, whose reactions must vanish for every load case; ``free_motions``: the
    rigid motions no support stops (columns: displacement vectors), with ``motion_words`` naming them."""

    name: str
    basis: Basis
    restrained: np.ndarray
    rigid: np.ndarray | None = None
    reduction: Reduction | None = None
    factor: Any = None
    stiffness: Any = None
    free_motions: np.ndarray | None = None
    motion_words: tuple[str, ...] = ()


@dataclass(frozen=True)
class ComponentField:
    """The solved displacement of one load component; ``reactions`` at the point restraints, ``load_norm``
    (sum of |nodal load|) for the self-equilibrium check, ``work`` the work of its load on each free
    rigid motion (zero for a load that needs no support along it)."""

    component: Component
    u: np.ndarray
    reactions: np.ndarray
    load_norm: float
    work: np.ndarray = field(default_factory=lambda: np.zeros(0))
    #: the load is self-equilibrated along every free rigid motion (it needs no point restraint)
    balanced: bool = True


@dataclass(frozen=True)
class Solution:
    model: Model
    E: float
    nu: float
    systems: Mapping[str, OperatorSystem]
    fields: tuple[ComponentField, ...]
    ndofs: int
    seconds_assemble: float
    seconds_solve: float
    solver: str

    def field(self, name: str) -> ComponentField:
        for f in self.fields:
            if f.component.name == name:
                return f
        raise KeyError(name)

    def basis(self, operator: str) -> Basis:
        return self.systems[operator].basis


def factorise(A: sp.spmatrix):
    """Sparse LU with a symmetric fill-reducing ordering.

    SuperLU with MMD on A^T+A and SymmetricMode was 2-3x faster than scipy's default COLAMD ordering on
    2D P2 stiffness matrices here (measured on gmsh 4.15.2 / scikit-fem 12.0.2 meshes of the demo cases)."""
    try:
        return splu(A.tocsc(), permc_spec="MMD_AT_PLUS_A", options=dict(SymmetricMode=True))
    except RuntimeError as exc:  # "Factor is exactly singular"
        raise SolveError(f"the stiffness matrix is singular ({exc}); a restraint is missing or part of "
                         "the mesh is disconnected") from exc
    except MemoryError as exc:
        raise SolveError("the direct solver ran out of memory; use a coarser mesh "
                         "(smaller elements_per_radius or larger size)") from exc


def linear_solve(A: sp.spmatrix, b: np.ndarray) -> tuple[np.ndarray, str]:
    """Solve A x = b (one or several right-hand sides as columns) with :func:`factorise`."""
    x = factorise(A).solve(b)
    if not np.all(np.isfinite(x)):
        raise SolveError("the solve produced non-finite displacements (singular or ill-conditioned system)")
    return x, SOLVER_NAME


def _system(pmesh: PartMesh, model: Model, op, E: float, nu: float, supports: Sequence[AppliedSupport]
            ) -> OperatorSystem:
    """Basis, restraints and factorised reduced stiffness of one operator."""
    mesh = pmesh.mesh
    basis = Basis(mesh, op.element(mesh), intorder=op.intorder, mapping=pmesh.mapping)
    model_fixed = np.asarray(op.fixed_dofs(basis), dtype=np.int64)
    candidates = np.asarray(op.rigid_restraints(basis), dtype=np.int64)
    free_motions, words, con = None, (), None
    if supports and not hasattr(op, "rigid_modes"):
        raise GeometryError(f"supports are not available for the {model.name} model", item="supports")
    if hasattr(op, "rigid_modes"):
        R, _, centroid = op.rigid_modes(basis)
        con = support_constraints(basis, pmesh, supports)
        C = constraint_rows(basis.N, con)
        v = free_motions_of(C, R)
        free_motions = R @ v
        words = tuple(describe_motion(v[:, j], centroid) for j in range(v.shape[1]))
        rigid = point_restraints(C, R, candidates) if v.shape[1] else np.zeros(0, dtype=np.int64)
        held = np.union1d(np.union1d(model_fixed, con.fixed), rigid).astype(np.int64)
    else:
        rigid = candidates
        held = np.union1d(model_fixed, rigid).astype(np.int64)
    reduction = Reduction(basis.N, held, con)
    K = op.stiffness(basis, E, nu)
    return OperatorSystem(op.name, basis, held, rigid, reduction, factorise(reduction.matrix(K)), K,
                          free_motions, words)


def load_vector(pmesh: PartMesh, op, basis: Basis, comp: Component) -> np.ndarray:
    """The nodal load vector of a component's tractions."""
    f = np.zeros(basis.N)
    for t in comp.tractions:
        fb = FacetBasis(pmesh.mesh, basis.elem, facets=pmesh.facets(t.boundary), intorder=TRACTION_INTORDER,
                        mapping=pmesh.mapping)
        f += op.load_vector(fb, t.fn)
    return f


def solve(pmesh: PartMesh, model: Model, E: float, nu: float, components: Sequence[Component],
          supports: Sequence[AppliedSupport] = ()) -> Solution:
    """Assemble each operator that a component uses, factorise it once and solve every component (contact
    components are solved per load case later: :mod:`fekt.solver.contact`)."""
    t0 = time.perf_counter()
    systems: dict[str, OperatorSystem] = {}
    loads: dict[str, list[tuple[Component, np.ndarray]]] = {}
    for comp in components:
        op = model.operator(comp.operator)
        if op.name not in systems:
            systems[op.name] = _system(pmesh, model, op, E, nu, supports)
        if comp.contact is None:
            loads.setdefault(op.name, []).append((comp, load_vector(pmesh, op, systems[op.name].basis, comp)))
    t1 = time.perf_counter()
    fields: list[ComponentField] = []
    for name, items in loads.items():
        sysm = systems[name]
        F = np.column_stack([f for _, f in items])
        X = sysm.factor.solve(sysm.reduction.vector(F))
        if not np.all(np.isfinite(X)):
            raise SolveError("the solve produced non-finite displacements (singular or ill-conditioned system)")
        X = X.reshape(sysm.reduction.size, -1)
        for k, (comp, f) in enumerate(items):
            u = sysm.reduction.expand(X[:, k])
            work = f @ sysm.free_motions if sysm.free_motions is not None else np.zeros(0)
            norm = float(np.abs(f).sum())
            fields.append(ComponentField(comp, u, (sysm.stiffness @ u - f)[sysm.rigid], norm, work,
                                         balanced_along(sysm, work, norm)))
    t2 = time.perf_counter()
    order = {c.name: i for i, c in enumerate(components)}
    fields.sort(key=lambda fl: order[fl.component.name])
    return Solution(model=model, E=E, nu=nu, systems=systems, fields=tuple(fields),
                    ndofs=int(sum(s.basis.N for s in systems.values())), seconds_assemble=t1 - t0,
                    seconds_solve=t2 - t1, solver=SOLVER_NAME)


#: work on a free rigid motion below this fraction of (load x largest motion) counts as none (round-off)
WORK_TOLERANCE = 1e-9


def balanced_along(sysm: OperatorSystem, work: np.ndarray, load_norm: float) -> bool:
    """Whether a load with this work on the free motions needs no point restraint."""
    if sysm.free_motions is None or work.size == 0:
        return True
    size = np.max(np.abs(sysm.free_motions), axis=0)
    return bool(np.all(np.abs(work) <= WORK_TOLERANCE * max(load_norm, 1e-300) * size))


def with_fields(sol: Solution, extra: Sequence[ComponentField]) -> Solution:
    """The solution with more component fields (the contact fields of load cases)."""
    return dataclasses.replace(sol, fields=sol.fields + tuple(extra))


def reaction_ratio(sol: Solution, factors: Mapping[str, float] | None = None) -> float:
    """Largest point-restraint reaction relative to the applied load: of each component alone, or of the
    load case ``factors`` (component name -> factor)."""
    if factors is None:
        return max((float(np.max(np.abs(f.reactions))) / max(f.load_norm, 1e-300) if f.reactions.size else 0.0)
                   for f in sol.fields) if sol.fields else 0.0
    worst = 0.0
    for op in {f.component.operator for f in sol.fields}:
        mine = [(factors[f.component.name], f) for f in sol.fields
                if f.component.operator == op and factors.get(f.component.name, 0.0) != 0.0]
        if not mine or mine[0][1].reactions.size == 0:
            continue
        r = sum(w * f.reactions for w, f in mine)
        norm = sum(abs(w) * f.load_norm for w, f in mine)
        worst = max(worst, float(np.max(np.abs(r))) / max(norm, 1e-300))
    return worst


def check_reactions(sol: Solution, factors: Mapping[str, float] | None = None, case: str = "") -> None:
    """Fail when the point restraints carry load: the loads of the case are not self-equilibrated along
    a motion no support stops."""
    r = reaction_ratio(sol, factors)
    if r > REACTION_TOLERANCE:
        where = f"in load case '{case}' " if case else ""
        raise SolveError(f"the point restraints carry {r:.3g} of the applied load {where}; the loads are not "
                         "self-equilibrated, so the restraints distort the stress field")


def check_free_motions(sol: Solution, factors: Mapping[str, float], case: str = "") -> None:
    """A load case must do no work on a rigid motion that no support stops (else nothing holds the part:
    an error naming the motion and what would stop it)."""
    for name, sysm in sol.systems.items():
        if sysm.free_motions is None or sysm.free_motions.shape[1] == 0:
            continue
        mine = [(factors[f.component.name], f) for f in sol.fields
                if f.component.operator == name and factors.get(f.component.name, 0.0) != 0.0]
        if not mine:
            continue
        work = sum(w * f.work for w, f in mine)
        size = np.max(np.abs(sysm.free_motions), axis=0)
        norm = sum(abs(w) * f.load_norm for w, f in mine) * size
        for j in np.where(np.abs(work) > WORK_TOLERANCE * np.maximum(norm, 1e-300))[0]:
            where = f"in load case '{case}'" if case else ""
            held = "the supports leave the part free to move" if len(sysm.motion_words) < 3 else \
                "no support holds the part, and its loads are not in equilibrium"
            raise GeometryError(f"{held} {where}: {sysm.motion_words[j]} is not stopped, and the loads push it "
                                "that way", item="supports",
                                hint="add a support that stops this motion (a fixed edge or hole, or a symmetry "
                                     "plane across it), or balance the loads")
