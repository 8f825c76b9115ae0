"""Frictionless contact of a rigid pin in a hole, solved by an active-set iteration on the factorised
stiffness of the part.

Unknowns: the radial contact forces lambda_i >= 0 at the hole's boundary nodes (corner and midside
nodes), acting on the part along n_i (the unit vector from the hole's centre to the node), and the pin's
displacement w. With u_0 the displacement of the load case's other loads and Z = K^-1 B^T (one solve per
hole node on the factorisation the other loads used), the part's displacement is u = u_0 + Z lambda;
the gap between hole and pin at node i is g_i = c + n_i . (u_i - w) (c: radial clearance). Conditions:
lambda_i >= 0, g_i >= 0, lambda_i g_i = 0 (no pulling, no overlap), and sum lambda_i n_i = F (the pin's
force reaches the part). For a trial contact set A the equalities g_A = 0 and the force balance are a
small dense system in (lambda_A, w); nodes with lambda < 0 leave A, nodes with g < 0 join it, until
nothing changes (a primal-dual active set method; Hintermueller, Ito & Kunisch, SIAM J. Optim. 13
(2002) 865, from memory). Node-to-rigid-surface contact of this kind is exact at the nodes of the mesh;
the arc's ends are known to within one node spacing.
"""

from __future__ import annotations

import dataclasses
import math
from dataclasses import dataclass

import numpy as np
import scipy.sparse as sp

from ..errors import SolveError
from ..loads.base import Component, Introduction
from ..loads.statics import points_free_body
from ..mesh.build import PartMesh
from .linear import ComponentField, Solution, balanced_along
from .restraints import node_pairs

#: iterations of the active-set method before giving up (each adds or drops nodes; our own bound)
MAX_ITERATIONS = 200
#: a gap below -GAP_TOLERANCE x (the largest displacement there) counts as overlap (our own choice)
GAP_TOLERANCE = 1e-10


@dataclass(frozen=True)
class ContactFacts:
    """What the contact iteration found: the contact arc (degrees either side of the force direction,
    from the outermost nodes in contact), the nodes in contact, the iterations, the largest overlap left
    and the pin's displacement."""

    load: str
    case: str
    arc_from: float
    arc_to: float
    nodes: int
    iterations: int
    overlap: float
    pin_displacement: tuple[float, float]


def solve_pin(sol: Solution, pmesh: PartMesh, comp: Component, base_u: np.ndarray, name: str, case: str
              ) -> tuple[ComponentField, ContactFacts, Introduction]:
    """The contact field of the pin load ``comp`` in a load case whose other loads give ``base_u``: a
    component field named ``name`` (its statics from the nodal contact forces) and the contact facts."""
    pc = comp.contact
    sysm = sol.systems[comp.operator]
    basis, red = sysm.basis, sysm.reduction
    dx, dy, xy = node_pairs(basis, pmesh.facets(pc.hole))
    c = np.asarray(pc.center, dtype=float)
    rel = xy - c[:, None]
    n = rel / np.hypot(rel[0], rel[1])
    m = dx.size
    B = sp.csr_matrix((np.concatenate([n[0], n[1]]), (np.concatenate([np.arange(m)] * 2), np.concatenate([dx, dy]))),
                      shape=(m, basis.N))
    Br = ((B @ red.T) if red.T is not None else B[:, red.free]).tocsr()
    # the plane model's stiffness and loads are per unit thickness: so are the nodal contact forces
    F = np.asarray(pc.force, dtype=float) / pc.thickness
    fdir = F / np.hypot(*F)
    g0 = pc.clearance + B @ base_u
    facing = n.T @ fdir
    columns: dict[int, int] = {}  # node -> column of Z computed so far (Z = K^-1 B^T, lazily)
    Z = np.zeros((red.size, 0))

    def z_of(nodes: np.ndarray) -> np.ndarray:
        nonlocal Z
        new = [int(i) for i in nodes if int(i) not in columns]
        if new:
            rhs = np.ascontiguousarray(Br[new].T.toarray())
            Z = np.hstack([Z, sysm.factor.solve(rhs).reshape(red.size, len(new))])
            for k, i in enumerate(new):
                columns[i] = Z.shape[1] - len(new) + k
        return Z[:, [columns[int(i)] for i in nodes]]

    # a rigid pin pushed along F touches the half of the hole that faces F
    active = facing > math.cos(math.radians(30.0))
    if active.sum() < 2:
        active[np.argsort(-facing)[:2]] = True
    lam = np.zeros(m)
    w = np.zeros(2)
    scale = None
    for it in range(1, MAX_ITERATIONS + 1):
        A = np.where(active)[0]
        k = A.size
        ZA = z_of(A)
        BZ = np.asarray(Br[A] @ ZA)
        if scale is None:
            scale = max(float(np.max(np.abs(BZ))) * np.hypot(*F), float(np.max(np.abs(g0))), 1e-300)
        M = np.zeros((k + 2, k + 2))
        M[:k, :k] = BZ
        M[:k, k:] = -n[:, A].T
        M[k:, :k] = n[:, A]
        rhs = np.concatenate([-g0[A], F])
        try:
            x = np.linalg.solve(M, rhs)
        except np.linalg.LinAlgError:
            x = np.linalg.lstsq(M, rhs, rcond=None)[0]
        lam = np.zeros(m)
        lam[A] = x[:k]
        w = x[k:]
        gap = g0 + Br @ (ZA @ x[:k]) - n.T @ w
        tol = GAP_TOLERANCE * scale
        new = (active & (lam >= 0)) | (~active & (gap < -tol) & (facing > 0))
        if np.array_equal(new, active):
            break
        if not new.any():
            new[np.argmax(facing)] = True
        active = new
    else:
        raise SolveError(f"the contact of pin '{comp.name}' did not settle in {MAX_ITERATIONS} iterations",
                         hint="try a finer mesh on the hole, or the cosine distribution (type = \"bearing\")")
    A = np.where(lam > 0)[0]
    forces = n * lam * pc.thickness  # on the part (the whole thickness)
    u = red.expand(z_of(A) @ lam[A]) if A.size else np.zeros(basis.N)
    fvec = B.T @ lam
    reactions = (sysm.stiffness @ u - fvec)[sysm.rigid]
    work = fvec @ sysm.free_motions if sysm.free_motions is not None else np.zeros(0)
    on = lam > 0
    ang = np.degrees(np.arctan2(fdir[0] * n[1] - fdir[1] * n[0], n.T @ fdir))
    lo, hi = (float(ang[on].min()), float(ang[on].max())) if on.any() else (0.0, 0.0)
    facts = ContactFacts(comp.name, case, lo, hi, int(on.sum()), it, float(max(0.0, -gap.min())),
                         (float(w[0]), float(w[1])))
    solved = dataclasses.replace(
        comp, name=name,
        statics=lambda sec, side=-1, p=xy, f=forces: points_free_body(p, f, sec, sec.axis, side))
    intro = Introduction(pc.hole, f"contact arc of pin '{comp.load}'", _arc(c, pc.radius, fdir, lo, hi), comp.load)
    norm = float(np.abs(fvec).sum())
    return ComponentField(solved, u, reactions, norm, work, balanced_along(sysm, work, norm)), facts, intro


def _arc(center: np.ndarray, radius: float, fdir: np.ndarray, lo: float, hi: float):
    def near(xy):
        rel = xy - center[:, None]
        r = np.hypot(rel[0], rel[1])
        ang = np.degrees(np.arctan2(fdir[0] * rel[1] - fdir[1] * rel[0], rel.T @ fdir))
        return (np.abs(r - radius) < 1e-3 * radius) & (ang >= lo) & (ang <= hi)

    return near
