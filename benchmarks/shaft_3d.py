"""Independent cross-check of the shaft model: a stepped round shaft solved as a 3D solid.

The same stepped shaft (diameters D and d, shoulder fillet r) is built as a solid with gmsh (OpenCASCADE
cylinders, fused and filleted), meshed with quadratic tetrahedra graded towards the fillet, and solved with
scikit-fem's quadratic tetrahedra on the curved quadratic mesh under the same Saint-Venant end tractions as
the axisymmetric model: bending (sigma_xx = M y / I), torsion (tau = T r / J) and tension. Kt is the peak
surface stress on the fillet (tangential stress for tension and bending, tangential-hoop shear for torsion,
averaged around the circumference at each position along the fillet arc: the raw maximum over the
quadrature points is biased upwards by the element-to-element scatter of 3D stresses) over the net
nominal stress. Two meshes (every element size halved) give the 3D model's own convergence band
(two-grid GCI, Fs = 3, formal order 2, ratio 2: |fine - coarse|; Roache 1994); the axisymmetric result
(fekt, 32 elements per radius) must lie within it. The quarter y >= 0, z >= 0 is modelled with symmetry
conditions; the linear systems are solved by multigrid-preconditioned CG (pyamg).

Run as a script: prints and writes benchmarks/SHAFT_3D.md. Also imported by benchmarks/shafts.py.
"""

from __future__ import annotations

import math
import os
import sys
import time
from dataclasses import dataclass, replace

import numpy as np
import scipy.sparse as sp
from skfem import (Basis, BilinearForm, ElementTetP0, ElementTetP2, ElementVector, FacetBasis, LinearForm, MeshTet1,
                   MeshTet2, asm)
from skfem.helpers import ddot, sym_grad, trace

HERE = os.path.dirname(os.path.abspath(__file__))
sys.path.insert(0, os.path.join(HERE, "..", "tests"))
sys.path.insert(0, HERE)

from fekt.mesh.session import gmsh_session  # noqa: E402
from fekt.models.plane import lame_3d  # noqa: E402

#: the shaft of the cross-check: D/d = 1.5, r/d = 0.1 (lengths in mm); each part L = D long
D, d, r = 30.0, 20.0, 2.0
L = 30.0
E, NU = 210000.0, 0.3
LOADS = {"moment": 1.0e5, "torque": 1.0e5, "force": 1.0e4}
#: (fillet element size, largest element size) of the coarse and the fine 3D mesh (ratio 2)
LEVELS = ((0.5, 2.5), (0.25, 1.25))


@dataclass(frozen=True)
class Mesh3D:
    mesh: MeshTet2
    volume_error: float
    seconds: float
    h_fillet: float


def build_mesh(h_fillet: float, h_max: float) -> Mesh3D:
    """The filleted stepped shaft as quadratic tetrahedra, element size h_fillet at the fillet."""
    t0 = time.perf_counter()
    with gmsh_session() as gmsh:
        gmsh.model.add("shaft3d")
        occ = gmsh.model.occ
        wide = occ.addCylinder(0, 0, 0, L, 0, 0, D / 2)
        narrow = occ.addCylinder(L, 0, 0, L, 0, 0, d / 2)
        out, _ = occ.fuse([(3, wide)], [(3, narrow)])
        occ.synchronize()
        vol = out[0][1]
        eps = 1e-6 * D
        edges = [tag for _, tag in gmsh.model.getEntitiesInBoundingBox(L - eps, -d / 2 - eps, -d / 2 - eps, L + eps,
                                                                        d / 2 + eps, d / 2 + eps, 1)]
        filleted = occ.fillet([vol], edges, [r])
        box = occ.addBox(-1.0, 0.0, 0.0, 2 * L + 2.0, D, D)
        occ.intersect(filleted, [(3, box)])  # the quarter y >= 0, z >= 0 (two symmetry planes)
        occ.synchronize()
        volumes = gmsh.model.getEntities(3)
        expected = occ.getMass(3, volumes[0][1])
        fillet_faces = [tag for _, tag in gmsh.model.getEntities(2) if gmsh.model.getType(2, tag) == "Torus"]
        if not fillet_faces:
            raise RuntimeError("no fillet face found")
        dist = gmsh.model.mesh.field.add("Distance")
        gmsh.model.mesh.field.setNumbers(dist, "SurfacesList", fillet_faces)
        gmsh.model.mesh.field.setNumber(dist, "Sampling", 200)
        thr = gmsh.model.mesh.field.add("Threshold")
        gmsh.model.mesh.field.setNumber(thr, "InField", dist)
        gmsh.model.mesh.field.setNumber(thr, "SizeMin", h_fillet)
        gmsh.model.mesh.field.setNumber(thr, "SizeMax", h_max)
        gmsh.model.mesh.field.setNumber(thr, "DistMin", 0.5 * r)
        gmsh.model.mesh.field.setNumber(thr, "DistMax", 0.5 * r + (h_max - h_fillet) / 0.3)
        gmsh.model.mesh.field.setAsBackgroundMesh(thr)
        opt = gmsh.option.setNumber
        opt("Mesh.MeshSizeExtendFromBoundary", 0)
        opt("Mesh.MeshSizeFromPoints", 0)
        opt("Mesh.MeshSizeFromCurvature", 0)
        opt("Mesh.MeshSizeMax", h_max)
        opt("Mesh.SecondOrderLinear", 0)  # midside nodes on the CAD surfaces
        opt("Mesh.HighOrderOptimize", 0)
        gmsh.model.mesh.generate(3)
        gmsh.model.mesh.setOrder(2)
        tet = gmsh.model.mesh.getElementType("Tetrahedron", 2)
        _, enodes = gmsh.model.mesh.getElementsByType(tet)
        ref = np.asarray(gmsh.model.mesh.getElementProperties(tet)[4]).reshape(10, 3)
        tags, coords, _ = gmsh.model.mesh.getNodes()
    xyz = coords.reshape(-1, 3)
    lookup = np.full(int(tags.max()) + 1, -1, dtype=np.int64)
    lookup[tags.astype(np.int64)] = np.arange(tags.size)
    t10 = lookup[enodes.reshape(-1, 10).astype(np.int64)]
    mesh = quadratic_tets(xyz, t10, ref)
    vol_fe = float(asm(LinearForm(lambda v, w: v), Basis(mesh, ElementTetP0(), intorder=4)).sum())
    return Mesh3D(mesh, abs(vol_fe - expected) / expected, time.perf_counter() - t0, h_fillet)


def quadratic_tets(xyz: np.ndarray, t10: np.ndarray, ref: np.ndarray) -> MeshTet2:
    """A curved MeshTet2 from gmsh's 10-node tetrahedra: the corners give a MeshTet1 and each edge dof is
    placed at gmsh's midside node of that edge (which corner pair a midside node belongs to is read from
    the reference coordinates gmsh reports for its nodes)."""
    corners = np.unique(t10[:, :4])
    cmap = np.full(xyz.shape[0], -1, dtype=np.int64)
    cmap[corners] = np.arange(corners.size)
    m1 = MeshTet1(np.ascontiguousarray(xyz[corners].T), np.ascontiguousarray(cmap[t10[:, :4]].T))
    M = MeshTet2.from_mesh(m1)
    nv = m1.nvertices
    mid: dict[int, int] = {}
    for k in range(4, 10):
        a, b = next((i, j) for i in range(4) for j in range(i + 1, 4)
                    if np.allclose(0.5 * (ref[i] + ref[j]), ref[k]))
        va, vb = cmap[t10[:, a]], cmap[t10[:, b]]
        keys = np.minimum(va, vb) * nv + np.maximum(va, vb)
        mid.update(zip(keys.tolist(), t10[:, k].tolist()))
    edges = np.sort(m1.edges, axis=0)
    keys = edges[0].astype(np.int64) * nv + edges[1]
    doflocs = M.doflocs.copy()
    mids = 0.5 * (m1.p[:, m1.edges[0]] + m1.p[:, m1.edges[1]])
    assert np.allclose(doflocs[:, nv:nv + edges.shape[1]], mids), "unexpected MeshTet2 dof order"
    doflocs[:, nv:nv + edges.shape[1]] = xyz[[mid[int(k)] for k in keys]].T
    return replace(M, doflocs=doflocs)


# --- solve -------------------------------------------------------------------------------------------------


def tractions(load: str, value: float):
    """Saint-Venant end traction t(x, n) of a uniform bar (n the outward normal, +-x on the end faces):
    bending sigma_xx = M y / I (tension at +y), torsion tau = T r / J about +x, tension sigma = F / A."""
    def radius_props(x):
        R = np.where(x[0] < L, D / 2, d / 2)  # the end face's own radius
        return math.pi * R ** 2, math.pi * R ** 4 / 4

    def fn(x, n):
        A, I = radius_props(x)
        zero = 0.0 * x[0]
        if load == "moment":
            return n[0] * value * x[1] / I, zero, zero
        if load == "torque":
            k = n[0] * value / (2 * I)
            return zero, -k * x[2], k * x[1]
        return n[0] * value / A, zero, zero

    return fn


def conditions(basis, load: str) -> np.ndarray:
    """Symmetry conditions of the quarter y >= 0, z >= 0 and one point restraint for the rigid motion
    they leave (two for bending). The plane z = 0 is a plane of symmetry for tension and bending (u_z = 0) and of
    antisymmetry for torsion (u_x = u_y = 0); the plane y = 0 is one of symmetry for tension (u_y = 0)
    and of antisymmetry for bending and torsion (u_x = u_z = 0). Left free: the axial translation
    (tension), the translation along y and the rotation about z (bending), the rotation about x (torsion)."""
    mesh = basis.mesh
    bf = mesh.boundary_facets()
    tol = 1e-9 * D
    on_y0 = bf[np.all(np.abs(mesh.p[1, mesh.facets[:, bf]]) <= tol, axis=0)]
    on_z0 = bf[np.all(np.abs(mesh.p[2, mesh.facets[:, bf]]) <= tol, axis=0)]
    dz, dy = basis.get_dofs(facets=on_z0), basis.get_dofs(facets=on_y0)
    comps = {"force": (("u^3",), ("u^2",)), "moment": (("u^3",), ("u^1", "u^3")),
             "torque": (("u^1", "u^2"), ("u^1", "u^3"))}[load]
    fixed = [dz.all(c) for c in comps[0]] + [dy.all(c) for c in comps[1]]
    p = mesh.p[:, : mesh.nvertices]
    far = int(np.argmax(p[1] + p[2] + 0.01 * p[0]))  # a vertex off both planes
    on_plane = np.where(np.abs(p[2]) <= tol)[0]
    pick = int(on_plane[np.argmax(p[1, on_plane])])  # on z = 0 with the largest y
    axis_end = int(np.argmin(p[1] + p[2] + 0.01 * p[0]))  # a vertex near the axis at x = 0
    points = {"force": [basis.nodal_dofs[0, far]],
              "moment": [basis.nodal_dofs[1, axis_end], basis.nodal_dofs[0, far]],  # y-translation, z-rotation
              "torque": [basis.nodal_dofs[2, pick]]}[load]
    return np.unique(np.concatenate(fixed + [np.array(points)]))


def linear_solve(A: sp.csr_matrix, b: np.ndarray, near_null: np.ndarray) -> np.ndarray:
    """Conjugate gradients preconditioned by smoothed-aggregation algebraic multigrid (pyamg, with the
    rigid-body modes as near-null space), to a relative residual of 1e-10. A direct solver was far too
    slow on these 3D meshes (our measurement: SuperLU, 180k dofs, > 9 min and 6 GB; 50k dofs of the
    quarter, > 15 min) and diagonally preconditioned CG took about 80 s per solve at 50k dofs."""
    import pyamg  # benchmark-only dependency: pip install pyamg (the 'bench' extra)

    ml = pyamg.smoothed_aggregation_solver(A, B=near_null, max_coarse=500)
    res: list[float] = []
    x = ml.solve(b, tol=1e-10, accel="cg", maxiter=2000, residuals=res)
    if not res or res[-1] > 1e-9 * np.linalg.norm(b):
        raise RuntimeError(f"AMG-CG did not converge (residual {res[-1] if res else float('nan'):.3g})")
    return x


def rigid_modes(basis, free: np.ndarray) -> np.ndarray:
    """The six rigid-body motions at the free dofs (near-null space for the multigrid)."""
    x = basis.doflocs
    comp = np.tile(np.arange(3), basis.N // 3)  # ElementVector interleaves u^1, u^2, u^3 per node
    modes = np.zeros((basis.N, 6))
    for c in range(3):
        modes[comp == c, c] = 1.0
    X, Y, Z = x
    # rotations about x, y, z: (0, -z, y), (z, 0, -x), (-y, x, 0)
    modes[:, 3] = np.where(comp == 1, -Z, np.where(comp == 2, Y, 0.0))
    modes[:, 4] = np.where(comp == 0, Z, np.where(comp == 2, -X, 0.0))
    modes[:, 5] = np.where(comp == 0, -Y, np.where(comp == 1, X, 0.0))
    return modes[free]


#: width of the bins along the fillet arc (degrees of the arc about its centre) in which the surface stress
#: is averaged around the circumference (our own choice: a few samples per element along the arc)
BIN_DEGREES = 1.5
#: bending: only samples within this angle of the most stressed meridian are averaged (their tangential
#: stress divided by cos(theta) estimates the amplitude; our own choice)
BENDING_SECTOR_DEGREES = 20.0


def surface_peaks(sig: np.ndarray, x: np.ndarray, n: np.ndarray, load: str) -> tuple[float, float, float]:
    """(largest principal stress over the fillet samples, peak of the circumferentially averaged surface
    stress, largest deviation of the samples of the peak bin from their average). The exact 3D field is axisymmetric in tension and torsion and varies as cos(theta) in bending,
    so the surface stress at one position along the fillet arc is averaged over the circumference (bending:
    the tangential stress / cos(theta) near theta = 0), which removes the element-to-element scatter that
    biases the raw maximum upwards; the peak is the largest bin average along the arc."""
    S = np.moveaxis(sig.reshape(3, 3, -1), -1, 0)  # (m, 3, 3)
    raw = float(np.linalg.eigvalsh(S)[:, -1].max())
    X, N = x.reshape(3, -1), n.reshape(3, -1)
    rr = np.hypot(X[1], X[2])
    hoop = np.vstack([np.zeros_like(rr), -X[2] / rr, X[1] / rr])
    tang = np.cross(N.T, hoop.T).T  # the meridian tangent (sign irrelevant below)
    stt = np.einsum("im,mij,jm->m", tang, S, tang)
    sth = np.einsum("im,mij,jm->m", tang, S, hoop)
    theta = np.arctan2(X[2], X[1])  # 0 on the +y meridian
    psi = np.degrees(np.arctan2(rr - (d / 2 + r), X[0] - (L + r)))  # position along the fillet arc
    if load == "torque":
        value, keep = np.abs(sth), np.ones_like(rr, dtype=bool)
    elif load == "moment":
        keep = np.degrees(theta) < BENDING_SECTOR_DEGREES
        value = stt / np.cos(theta)
    else:
        value, keep = stt, np.ones_like(rr, dtype=bool)
    bins = np.floor(psi[keep] / BIN_DEGREES).astype(int)
    sums = np.bincount(bins - bins.min(), weights=value[keep])
    counts = np.bincount(bins - bins.min())
    ok = counts >= 5
    means = np.where(ok, sums / np.maximum(counts, 1), -np.inf)
    top = int(np.argmax(means))
    in_top = (bins - bins.min()) == top
    scatter = float(np.max(np.abs(value[keep][in_top] - means[top])))
    return raw, float(means[top]), scatter


def solve_3d(m: Mesh3D) -> dict[str, float]:
    """Kt (largest principal stress on the fillet over the net nominal stress) per load."""
    mesh = m.mesh
    e = ElementVector(ElementTetP2())
    basis = Basis(mesh, e, intorder=4)
    lam, mu = lame_3d(E, NU)

    @BilinearForm
    def stiffness(u, v, w):
        eu, ev = sym_grad(u), sym_grad(v)
        return 2 * mu * ddot(eu, ev) + lam * trace(eu) * trace(ev)

    K = asm(stiffness, basis).tocsr()
    bf = mesh.boundary_facets()
    fx = mesh.p[0, mesh.facets[:, bf]]
    ends = bf[np.all(fx <= 1e-9 * L, axis=0) | np.all(fx >= (2 * L) * (1 - 1e-9), axis=0)]
    Rr = np.sqrt(mesh.p[1] ** 2 + mesh.p[2] ** 2)
    fr = Rr[mesh.facets[:, bf]]
    fillet = bf[np.all((fx >= L - 1e-9) & (fx <= L + r + 1e-9) & (fr >= d / 2 - 1e-9) & (fr <= d / 2 + r + 1e-9), axis=0)
                & ~np.all(np.abs(fx - L) <= 1e-9, axis=0)]
    fb_end = FacetBasis(mesh, e, facets=ends, intorder=4)
    F = []
    for load, value in LOADS.items():
        t = tractions(load, value)

        @LinearForm
        def rhs(v, w, t=t):
            tx, ty, tz = t(w.x, w.n)
            return tx * v[0] + ty * v[1] + tz * v[2]

        F.append(asm(rhs, fb_end))
    # (the quarter carries a quarter of every load; Kt is a ratio and does not change)
    fb = FacetBasis(mesh, e, facets=fillet, intorder=5)
    out = {"dofs": float(basis.N), "tets": float(mesh.t.shape[1]), "solve_s": 0.0}
    a = d / 2
    nominal = {"moment": LOADS["moment"] * a / (math.pi * a ** 4 / 4),
               "torque": LOADS["torque"] * a / (math.pi * a ** 4 / 2), "force": LOADS["force"] / (math.pi * a ** 2)}
    for k, load in enumerate(LOADS):
        Dr = conditions(basis, load)
        I = np.setdiff1d(np.arange(K.shape[0]), Dr)
        t0 = time.perf_counter()
        u = np.zeros(K.shape[0])
        u[I] = linear_solve(K[I][:, I].tocsr(), F[k][I], rigid_modes(basis, I))
        out["solve_s"] += time.perf_counter() - t0
        out[f"{load}_residual"] = float(np.linalg.norm(K[I] @ u - F[k][I]) / np.linalg.norm(F[k][I]))
        g = np.asarray(fb.interpolate(u).grad)  # (3, 3, nf, nq)
        eps = 0.5 * (g + g.transpose(1, 0, 2, 3))
        tr = eps[0, 0] + eps[1, 1] + eps[2, 2]
        sig = 2 * mu * eps + lam * tr * np.eye(3)[:, :, None, None]
        raw, peak, scatter = surface_peaks(sig, np.asarray(fb.global_coordinates()), np.asarray(fb.normals), load)
        out[load] = peak / nominal[load]
        out[f"{load}_raw_max"] = raw / nominal[load]
        out[f"{load}_scatter"] = scatter / nominal[load]
    return out
