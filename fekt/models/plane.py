"""Plane stress and plane strain: one in-plane elasticity operator on the part's outline.

Material law (Timoshenko & Goodier, Theory of Elasticity, plane problems): both use the 3D form
sigma = 2 mu eps + lambda tr(eps) I on the in-plane strains, with mu = E / (2 (1 + nu)) and the 3D
lambda = E nu / ((1 + nu) (1 - 2 nu)) for plane strain. Plane stress is the same law with (E, nu)
mapped to E' = E (1 + 2 nu) / (1 + nu)^2, nu' = nu / (1 + nu), which gives lambda* = E nu / (1 - nu^2)
and the same mu (the mapping scikit-fem's ``plane_stress`` helper makes since 12.0.2; it was wrong
before, so we write it out here).

Out-of-plane stress: 0 in plane stress, nu (sxx + syy) in plane strain.
Sections: a strip of the plate's thickness t: A = t w, I = t * integral (y - yc)^2 dy.
Nominal stress: sigma = N / A + M (y - yc) / I (beam theory).
"""

from __future__ import annotations

from collections.abc import Callable
from dataclasses import dataclass

import numpy as np
from skfem import BilinearForm, ElementTriP1, ElementTriP2, ElementVector, LinearForm, MeshTri2, asm
from skfem.helpers import ddot, sym_grad, trace

from .base import Model, Resultants, SectionProps, Stress

#: quadrature order for the stiffness: the 3-point rule (degree 2) is exact for P2 strains on
#: straight-sided elements (products of linear gradients); on curved elements no finite rule is exact
#: and the 3-point rule is the usual full integration for six-node triangles (Zienkiewicz & Taylor,
#: The Finite Element Method, vol. 1, numerical integration chapter; from memory).
STIFFNESS_INTORDER = 2


def lame_3d(E: float, nu: float) -> tuple[float, float]:
    """(lambda, mu) of isotropic 3D elasticity."""
    return E * nu / ((1.0 + nu) * (1.0 - 2.0 * nu)), E / (2.0 * (1.0 + nu))


def plane_stress_map(E: float, nu: float) -> tuple[float, float]:
    """(E', nu') whose 3D Lame parameters are the plane-stress ones (see the module docstring)."""
    return E * (1.0 + 2.0 * nu) / (1.0 + nu) ** 2, nu / (1.0 + nu)


def identity_map(E: float, nu: float) -> tuple[float, float]:
    return E, nu


@dataclass(frozen=True)
class InPlane:
    """In-plane elasticity (two displacement components) with a material map."""

    material_map: Callable[[float, float], tuple[float, float]]
    out_of_plane: Callable[[np.ndarray, np.ndarray, float], np.ndarray]
    name: str = "in-plane"
    harmonic: int = 0
    intorder: int = STIFFNESS_INTORDER
    traction_components: tuple[str, ...] = ("x", "y")

    def lame(self, E: float, nu: float) -> tuple[float, float]:
        return lame_3d(*self.material_map(E, nu))

    def element(self, mesh):
        # P2 on the curved quadratic mesh; P1 only for the straight-sided baseline of the benchmark
        return ElementVector(ElementTriP2() if isinstance(mesh, MeshTri2) else ElementTriP1())

    def stiffness(self, basis, E: float, nu: float):
        lam, mu = self.lame(E, nu)

        @BilinearForm
        def form(u, v, w):
            eu, ev = sym_grad(u), sym_grad(v)
            return 2.0 * mu * ddot(eu, ev) + lam * trace(eu) * trace(ev)

        return asm(form, basis)

    def load_vector(self, facet_basis, traction) -> np.ndarray:
        @LinearForm
        def form(v, w):
            tx, ty = traction(w.x, w.n)
            return tx * v[0] + ty * v[1]

        return asm(form, facet_basis)

    def fixed_dofs(self, basis) -> np.ndarray:
        return np.zeros(0, dtype=np.int64)

    def rigid_restraints(self, basis) -> np.ndarray:
        """Three point restraints that remove rigid-body motion and nothing else.

        Vertex A (nearest the centroid of the vertices) is fixed in x and y; vertex B (farthest from A)
        is fixed in the direction in which AB has the smaller component, which stops the rotation about
        A. With self-equilibrated loads their reactions are zero (checked after the solve)."""
        mesh = basis.mesh
        p = mesh.p[:, : mesh.nvertices]
        c = p.mean(axis=1)
        a = int(np.argmin(np.sum((p - c[:, None]) ** 2, axis=0)))
        b = int(np.argmax(np.sum((p - p[:, [a]]) ** 2, axis=0)))
        ab = p[:, b] - p[:, a]
        comp = 1 if abs(ab[0]) >= abs(ab[1]) else 0
        return np.array([basis.nodal_dofs[k, v] for v, k in ((a, 0), (a, 1), (b, comp))])

    def rigid_modes(self, basis) -> tuple[np.ndarray, tuple[str, ...], np.ndarray]:
        """The three rigid motions as displacement vectors (N, 3): translation along x, along y, rotation
        about the centroid of the nodes; their names; that centroid (supports are checked against them)."""
        R = np.zeros((basis.N, 3))
        xdofs = np.concatenate([basis.nodal_dofs[0], basis.facet_dofs[0]]) if basis.facet_dofs.size else \
            basis.nodal_dofs[0]
        ydofs = np.concatenate([basis.nodal_dofs[1], basis.facet_dofs[1]]) if basis.facet_dofs.size else \
            basis.nodal_dofs[1]
        c = basis.doflocs[:, xdofs].mean(axis=1)
        R[xdofs, 0] = 1.0
        R[ydofs, 1] = 1.0
        R[xdofs, 2] = -(basis.doflocs[1, xdofs] - c[1])
        R[ydofs, 2] = basis.doflocs[0, ydofs] - c[0]
        return R, ("translation along x", "translation along y", "rotation"), c

    def stress(self, field, x, E: float, nu: float) -> Stress:
        lam, mu = self.lame(E, nu)
        grad = np.asarray(field.grad)
        exx, eyy = grad[0, 0], grad[1, 1]
        exy = 0.5 * (grad[0, 1] + grad[1, 0])
        tr = exx + eyy
        sxx, syy = lam * tr + 2 * mu * exx, lam * tr + 2 * mu * eyy
        zero = np.zeros_like(sxx)
        return Stress(sxx, syy, self.out_of_plane(sxx, syy, nu), 2 * mu * exy, zero, zero)


def strip_section(intervals: np.ndarray, thickness: float) -> SectionProps:
    """Area, centroid and second moment of a strip cut of the given thickness (exact for intervals)."""
    iv = np.asarray(intervals, dtype=float).reshape(-1, 2)
    width = float((iv[:, 1] - iv[:, 0]).sum())
    if width <= 0:
        return SectionProps(0.0, 0.0, 0.0)
    yc = float(((iv[:, 1] ** 2 - iv[:, 0] ** 2) / 2).sum() / width)
    inertia = float(thickness * ((iv[:, 1] - yc) ** 3 - (iv[:, 0] - yc) ** 3).sum() / 3)
    return SectionProps(width * thickness, yc, inertia)


def beam_nominal(res: Resultants, props: SectionProps, y: float) -> float:
    """Beam-theory nominal stress N / A + M (y - yc) / I at transverse coordinate y."""
    return res.N / props.area + (res.M * (y - props.yc) / props.inertia if props.inertia > 0 else 0.0)


def strip_resultants(stress: Stress, axis: np.ndarray, y: np.ndarray, w: np.ndarray, yc: float,
                     thickness: float) -> Resultants:
    """N and M (about yc) of the axial stress integrated over a strip cut (weights w in y)."""
    saa = stress.xx * axis[0] ** 2 + 2 * stress.xy * axis[0] * axis[1] + stress.yy * axis[1] ** 2
    return Resultants(N=float(thickness * np.sum(w * saa)), M=float(thickness * np.sum(w * saa * (y - yc))))


def _plane(name: str, label: str, material_map, out_of_plane, needs_thickness: bool) -> Model:
    op = InPlane(material_map, out_of_plane)
    return Model(name=name, label=label, operators={op.name: op}, default_operator=op.name,
                 needs_thickness=needs_thickness, section=strip_section, nominal=beam_nominal,
                 cut_resultants=strip_resultants)


PLANE_STRESS = _plane("plane_stress", "plane stress", plane_stress_map,
                      lambda sxx, syy, nu: np.zeros_like(sxx), needs_thickness=True)
PLANE_STRAIN = _plane("plane_strain", "plane strain", identity_map,
                      lambda sxx, syy, nu: nu * (sxx + syy), needs_thickness=False)
