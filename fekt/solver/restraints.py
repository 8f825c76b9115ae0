"""Restraints of a plane part: supports turned into held degrees of freedom, and the rigid-body check.

A fixed boundary holds both displacement components of every node on it (corner and midside nodes of
the quadratic elements: docs/pitfalls.md, P2 Dirichlet dofs); a symmetry plane holds the component along
its normal. A normal along x or y holds one dof; any other direction is handled by a change of
variables (the node keeps one unknown along the plane).

Rigid-body check: the plane rigid motions (translations along x and y, rotation about the centroid) are
written as displacement vectors; every motion that no support stops is a free motion. A load case that
does work on a free motion has nothing to hold it (an error naming the motion); one that does not is
held by point restraints that carry no force, verified after the solve.
"""

from __future__ import annotations

from collections.abc import Sequence
from dataclasses import dataclass

import numpy as np
import scipy.sparse as sp

from ..errors import GeometryError
from ..loads.base import AppliedSupport

#: singular values of (constraints x rigid modes) below this fraction of the largest count as zero
RANK_TOLERANCE = 1e-9
#: a normal within this of an axis direction holds one dof directly (our own choice)
AXIS_ALIGNED = 1e-12


def node_pairs(basis, facets: np.ndarray) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    """The (x dof, y dof) of every node (corner and midside) on the facets, paired by location, and the
    node coordinates (2, n)."""
    dofs = basis.get_dofs(facets=facets)
    dx, dy = np.asarray(dofs.all("u^1")), np.asarray(dofs.all("u^2"))
    lx, ly = basis.doflocs[:, dx], basis.doflocs[:, dy]
    ox, oy = np.lexsort((lx[1], lx[0])), np.lexsort((ly[1], ly[0]))
    dx, dy = dx[ox], dy[oy]
    if not np.allclose(basis.doflocs[:, dx], basis.doflocs[:, dy], rtol=0, atol=1e-12 * (1 + np.abs(lx).max())):
        raise RuntimeError("internal: x and y dofs of the boundary nodes do not pair up")
    return dx, dy, basis.doflocs[:, dx]


@dataclass(frozen=True)
class Constraints:
    """Held dofs (``fixed``) and sliding nodes (``slide_x``, ``slide_y`` dofs with the plane's unit
    ``normal`` (2, n): n . u = 0 there)."""

    fixed: np.ndarray
    slide_x: np.ndarray
    slide_y: np.ndarray
    normal: np.ndarray


def support_constraints(basis, pmesh, supports: Sequence[AppliedSupport]) -> Constraints:
    fixed: list[np.ndarray] = []
    slides: dict[tuple[int, int], list[np.ndarray]] = {}
    for s in supports:
        facets = np.concatenate([pmesh.facets(b) for b in s.boundaries])
        dx, dy, _ = node_pairs(basis, facets)
        if s.hold == "fixed":
            fixed += [dx, dy]
            continue
        n = np.asarray(s.normal, dtype=float)
        for a, b in zip(dx, dy):
            slides.setdefault((int(a), int(b)), []).append(n)
    held = set(np.concatenate(fixed).tolist()) if fixed else set()
    sx, sy, nn, extra = [], [], [], []
    for (a, b), normals in slides.items():
        if a in held or b in held:
            continue  # a fixed node needs no sliding condition
        n = normals[0]
        if any(abs(abs(float(m @ n)) - 1.0) > 1e-9 for m in normals[1:]):
            extra += [a, b]  # on two symmetry planes (a quarter model's corner): held in both directions
        elif abs(n[1]) <= AXIS_ALIGNED:
            extra.append(a)
        elif abs(n[0]) <= AXIS_ALIGNED:
            extra.append(b)
        else:
            sx.append(a)
            sy.append(b)
            nn.append(n)
    allfixed = np.unique(np.concatenate(fixed + [np.asarray(extra, dtype=np.int64)])).astype(np.int64) \
        if (fixed or extra) else np.zeros(0, dtype=np.int64)
    return Constraints(allfixed, np.asarray(sx, dtype=np.int64), np.asarray(sy, dtype=np.int64),
                       np.asarray(nn, dtype=float).reshape(-1, 2).T)


def constraint_rows(N: int, con: Constraints) -> sp.csr_matrix:
    """One row per held dof and per sliding node (n . u)."""
    m1, m2 = con.fixed.size, con.slide_x.size
    rows = np.concatenate([np.arange(m1), m1 + np.arange(m2), m1 + np.arange(m2)])
    cols = np.concatenate([con.fixed, con.slide_x, con.slide_y])
    vals = np.concatenate([np.ones(m1), con.normal[0] if m2 else np.zeros(0), con.normal[1] if m2 else np.zeros(0)])
    return sp.csr_matrix((vals, (rows, cols)), shape=(m1 + m2, N))


def free_motions(C: sp.csr_matrix, R: np.ndarray) -> np.ndarray:
    """The rigid motions (combinations of the columns of R, as columns (3, k)) that the constraint rows C
    do not stop."""
    if C.shape[0] == 0:
        return np.eye(R.shape[1])
    M = np.asarray(C @ R)
    scale = np.linalg.norm(R, axis=0)
    M = M / np.where(scale > 0, scale, 1.0)
    _, sv, vt = np.linalg.svd(M, full_matrices=True)
    sv = np.concatenate([sv, np.zeros(R.shape[1] - sv.size)])
    free = sv <= RANK_TOLERANCE * max(float(sv.max()), 1e-300)
    return (vt[free].T / np.where(scale > 0, scale, 1.0)[:, None]) if free.any() else np.zeros((R.shape[1], 0))


def describe_motion(v: np.ndarray, centroid: np.ndarray) -> str:
    """A free rigid motion (translation x, translation y, rotation about the centroid) in words."""
    a, b, w = (float(t) for t in v)
    if abs(w) <= 1e-9 * max(abs(a), abs(b), 1e-300) * 1.0:
        ang = np.degrees(np.arctan2(b, a)) % 180.0
        return f"sliding along the direction {ang:.4g} deg"
    # u = (a - w (y - cy), b + w (x - cx)) vanishes at the centre of rotation
    cx, cy = centroid[0] - b / w, centroid[1] + a / w
    return f"turning about the point ({cx:.6g}, {cy:.6g})"


def point_restraints(C: sp.csr_matrix, R: np.ndarray, candidates: np.ndarray) -> np.ndarray:
    """From the model's candidate point restraints, the fewest that stop every motion C leaves free."""
    chosen: list[int] = []
    rank = 0 if C.shape[0] == 0 else int(np.linalg.matrix_rank(np.asarray(C @ R), tol=None))
    target = R.shape[1]
    for d in candidates:
        if rank >= target:
            break
        rows = sp.vstack([C, sp.csr_matrix((np.ones(len(chosen) + 1), (np.arange(len(chosen) + 1),
                                                                       np.array(chosen + [int(d)]))),
                                           shape=(len(chosen) + 1, C.shape[1]))]) if C.shape[0] else \
            sp.csr_matrix((np.ones(len(chosen) + 1), (np.arange(len(chosen) + 1), np.array(chosen + [int(d)]))),
                          shape=(len(chosen) + 1, R.shape[0]))
        r = int(np.linalg.matrix_rank(np.asarray(rows @ R)))
        if r > rank:
            chosen.append(int(d))
            rank = r
    if rank < target:
        raise GeometryError("the supports and point restraints do not stop every rigid motion of the part")
    return np.asarray(chosen, dtype=np.int64)


class Reduction:
    """Full <-> reduced unknowns: held dofs removed; a sliding node keeps one unknown along its plane."""

    def __init__(self, N: int, held: np.ndarray, con: Constraints | None = None):
        self.N = N
        slide = con is not None and con.slide_x.size > 0
        drop = np.union1d(held, np.concatenate([con.slide_x, con.slide_y]) if slide else np.zeros(0, np.int64))
        self.free = np.setdiff1d(np.arange(N), drop.astype(np.int64))
        self.T = None
        if slide:
            k0 = self.free.size
            m = con.slide_x.size
            t = np.vstack([-con.normal[1], con.normal[0]])  # along the plane
            rows = np.concatenate([self.free, con.slide_x, con.slide_y])
            cols = np.concatenate([np.arange(k0), k0 + np.arange(m), k0 + np.arange(m)])
            vals = np.concatenate([np.ones(k0), t[0], t[1]])
            self.T = sp.csr_matrix((vals, (rows, cols)), shape=(N, k0 + m))

    @property
    def size(self) -> int:
        return self.free.size if self.T is None else self.T.shape[1]

    def matrix(self, K: sp.spmatrix) -> sp.spmatrix:
        if self.T is None:
            K = K.tocsr()
            return K[self.free][:, self.free]
        return (self.T.T @ K @ self.T).tocsr()

    def vector(self, f: np.ndarray) -> np.ndarray:
        return f[self.free] if self.T is None else self.T.T @ f

    def expand(self, x: np.ndarray) -> np.ndarray:
        if self.T is None:
            u = np.zeros((self.N,) + x.shape[1:])
            u[self.free] = x
            return u
        return self.T @ x
