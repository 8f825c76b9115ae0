"""Round shafts: a solid of revolution analysed on its meridian section, in tension, torsion and bending.

Coordinates. The mesh is the meridian section drawn above the axis of revolution: x is the axial
coordinate (z of the cylindrical frame) and y >= 0 the radius r; the axis edge lies on y = 0. The hoop
direction h = theta is right-handed about +x. Stresses are stored in the frame of :mod:`fekt.models.base`:
xx = sigma_axial, yy = sigma_rr, hh = sigma_hoop, xy = tau_zr, xh = tau_z-theta, yh = tau_r-theta.

Three operators, each one linear problem with its own factorisation (2 pi or pi cancels on both sides
of every weak form and is left out):

* ``axial`` (circumferential harmonic 0, axial force): u = (u_z, u_r), hoop strain u_r / r,
  a(u, v) = int [2 mu (eps(u) : eps(v) + eps_hh(u) eps_hh(v)) + lambda tr(u) tr(v)] r dr dz with the
  3D Lame parameters, f = int t . v r ds. u_r = 0 on the axis (essential); the axial translation is
  removed by one point restraint.
* ``torsion`` (harmonic 0): u_theta = r phi(r, z), a(phi, psi) = int G r^3 grad phi . grad psi dr dz,
  an end traction t_theta enters as int t_theta psi r^2 ds. tau_r-theta = G r dphi/dr, tau_z-theta =
  G r dphi/dz. Free surface and axis conditions are natural (r^3 vanishes on the axis); the rigid
  rotation (phi constant) is removed by holding phi at one node. (Michell; Timoshenko & Goodier, Theory
  of Elasticity, torsion of circular shafts of variable diameter.)
* ``bending`` (first circumferential harmonic): u_r = U_r cos(theta), u_z = U_z cos(theta),
  u_theta = U_theta sin(theta); strains eps_rr = dU_r/dr, eps_zz = dU_z/dz, eps_hh = (U_r + U_theta)/r,
  gamma_rz = dU_r/dz + dU_z/dr, gamma_r-theta = dU_theta/dr - (U_r + U_theta)/r,
  gamma_z-theta = dU_theta/dz - U_z/r; stiffness int sigma : eps r dr dz (Wilson 1965; Zienkiewicz &
  Taylor, semi-analytical Fourier elements). Unknowns (U_z, S = U_r + U_theta, D = U_r - U_theta), so
  that the axis conditions U_z = 0 and U_r + U_theta = 0 are plain Dirichlet conditions (U_z = S = 0 on
  the axis). The two rigid modes of this harmonic (translation across the axis: S = 0, D = const; rotation
  about the transverse axis: D = 2cz, U_z = -cr) are removed exactly by holding D at two axis vertices
  at different z. Stresses are amplitudes: xx, yy, hh, xy vary as cos(theta) (values at theta = 0, the
  drawn meridian), xh, yh as sin(theta).

Quadrature points never lie on the axis, but stresses at axis points (element corners, facet points of
the axis edge) are needed for plots: there u_r / r, S / r and U_z / r take their limits (the radial
derivative, since the numerator vanishes on the axis), never 0/0.

Sections of a cut are discs or annuli: A = pi sum(r2^2 - r1^2), centroid on the axis, I = pi/4 sum(r2^4 -
r1^4), J = 2 I. Nominal stresses (beam theory): sigma = N / A + M r / I (bending: the value at theta = 0),
tau = T r / J.
"""

from __future__ import annotations

import math
from collections.abc import Sequence
from dataclasses import dataclass

import numpy as np
from skfem import BilinearForm, ElementTriP1, ElementTriP2, ElementVector, LinearForm, MeshTri2, asm

from ..case.schema import PartSpec
from ..errors import GeometryError
from ..families import expand_family
from ..geometry.build import build_part, cutout_loop
from ..geometry.model import LINE, PartGeometry
from ..kinds import LoopKind
from .base import Model, Resultants, SectionProps, Stress
from .plane import lame_3d

#: quadrature order of the r-weighted stiffness forms. With the weight r, the integrands of a P2 field
#: against a P2 test function are polynomials of degree 3 (elasticity, hoop terms u_r v_r / r times r
#: excepted, which are rational) and 5 (torsion, r^3 times two linear gradients) on straight elements;
#: these orders integrate the polynomial parts exactly and reproduce the Saint-Venant fields to round-off
#: (tests/test_shaft_exact.py).
ELASTIC_INTORDER = 4
TORSION_INTORDER = 5
#: a point closer to the axis than this fraction of the points' extent counts as on the axis (the limit
#: of u_r / r is used there); our own tolerance, far below any element size
AXIS_TOLERANCE = 1e-9


def _p2(mesh):
    return ElementTriP2() if isinstance(mesh, MeshTri2) else ElementTriP1()


def _axis_tol(x: np.ndarray) -> float:
    x = np.asarray(x)
    return AXIS_TOLERANCE * float(np.max(np.abs(x))) if x.size else 0.0


def _values(field) -> np.ndarray:
    """Values of a solved field: a scikit-fem DiscreteField is itself the array of values; other fields
    (fekt.post.fields.PointField) carry them in ``value``."""
    return np.asarray(field) if isinstance(field, np.ndarray) else np.asarray(field.value)


def over_r(f: np.ndarray, dfdr: np.ndarray, r: np.ndarray, tol: float) -> np.ndarray:
    """f / r, with the limit df/dr at points on the axis (r <= tol), where f vanishes."""
    on_axis = r <= tol
    return np.where(on_axis, dfdr, f / np.where(on_axis, 1.0, r))


def axis_vertices(mesh) -> np.ndarray:
    """Indices of the mesh vertices on the axis (y = 0 within the tolerance)."""
    p = mesh.p[:, : mesh.nvertices]
    tol = AXIS_TOLERANCE * float(np.max(np.abs(p)))
    return np.where(np.abs(p[1]) <= tol)[0]


def axis_facets(mesh) -> np.ndarray:
    """Boundary facets lying on the axis (both corners on y = 0)."""
    bf = mesh.boundary_facets()
    on = np.zeros(mesh.nvertices, dtype=bool)
    on[axis_vertices(mesh)] = True
    return bf[on[mesh.facets[0, bf]] & on[mesh.facets[1, bf]]]


def _need_axis(vertices: np.ndarray) -> np.ndarray:
    if vertices.size == 0:
        raise GeometryError("the mesh has no vertex on the axis (y = 0)",
                            hint="a shaft's meridian section must have its axis edge on y = 0")
    return vertices


def _axial_ends(mesh) -> tuple[int, int]:
    """The axis vertices with the smallest and the largest axial coordinate."""
    av = _need_axis(axis_vertices(mesh))
    x = mesh.p[0, av]
    return int(av[np.argmin(x)]), int(av[np.argmax(x)])


# --- operators -------------------------------------------------------------------------------------------


@dataclass(frozen=True)
class AxialOperator:
    """Axisymmetric elasticity, harmonic 0 (axial load). Field u = (u_z, u_r); tractions (t_x, t_y)."""

    name: str = "axial"
    harmonic: int = 0
    intorder: int = ELASTIC_INTORDER
    traction_components: tuple[str, ...] = ("x", "y")

    def element(self, mesh):
        return ElementVector(_p2(mesh))

    def stiffness(self, basis, E: float, nu: float):
        lam, mu = lame_3d(E, nu)

        @BilinearForm
        def form(u, v, w):
            r = w.x[1]
            gu, gv = u.grad, v.grad
            ezu, eru, ehu = gu[0, 0], gu[1, 1], u[1] / r
            ezv, erv, ehv = gv[0, 0], gv[1, 1], v[1] / r
            gzu, gzv = gu[0, 1] + gu[1, 0], gv[0, 1] + gv[1, 0]
            tru, trv = ezu + eru + ehu, ezv + erv + ehv
            return (lam * tru * trv + 2.0 * mu * (ezu * ezv + eru * erv + ehu * ehv) + mu * gzu * gzv) * r

        return asm(form, basis)

    def load_vector(self, facet_basis, traction) -> np.ndarray:
        @LinearForm
        def form(v, w):
            tx, ty = traction(w.x, w.n)
            return (tx * v[0] + ty * v[1]) * w.x[1]

        return asm(form, facet_basis)

    def fixed_dofs(self, basis) -> np.ndarray:
        """u_r = 0 on the axis (every dof of the axis facets, midside ones included)."""
        return basis.get_dofs(facets=axis_facets(basis.mesh)).all("u^2")

    def rigid_restraints(self, basis) -> np.ndarray:
        """u_z at one axis vertex: removes the axial translation, the only rigid mode left."""
        a, _ = _axial_ends(basis.mesh)
        return np.array([basis.nodal_dofs[0, a]])

    def stress(self, field, x, E: float, nu: float) -> Stress:
        lam, mu = lame_3d(E, nu)
        x = np.asarray(x)
        value, grad = _values(field), np.asarray(field.grad)
        ez, er = grad[0, 0], grad[1, 1]
        eh = over_r(value[1], er, x[1], _axis_tol(x))
        tr = ez + er + eh
        zero = np.zeros_like(ez)
        return Stress(lam * tr + 2 * mu * ez, lam * tr + 2 * mu * er, lam * tr + 2 * mu * eh,
                      mu * (grad[0, 1] + grad[1, 0]), zero, zero, harmonic=0)


@dataclass(frozen=True)
class TorsionOperator:
    """Torsion of a shaft of varying diameter: u_theta = r phi(r, z); traction (t_h,)."""

    name: str = "torsion"
    harmonic: int = 0
    intorder: int = TORSION_INTORDER
    traction_components: tuple[str, ...] = ("h",)

    def element(self, mesh):
        return _p2(mesh)

    def stiffness(self, basis, E: float, nu: float):
        G = E / (2.0 * (1.0 + nu))

        @BilinearForm
        def form(u, v, w):
            r = w.x[1]
            return G * r ** 3 * (u.grad[0] * v.grad[0] + u.grad[1] * v.grad[1])

        return asm(form, basis)

    def load_vector(self, facet_basis, traction) -> np.ndarray:
        @LinearForm
        def form(v, w):
            (th,) = traction(w.x, w.n)
            return th * v * w.x[1] ** 2

        return asm(form, facet_basis)

    def fixed_dofs(self, basis) -> np.ndarray:
        return np.zeros(0, dtype=np.int64)

    def rigid_restraints(self, basis) -> np.ndarray:
        """phi at one axis vertex: removes the rigid rotation about the axis."""
        a, _ = _axial_ends(basis.mesh)
        return np.array([basis.nodal_dofs[0, a]])

    def stress(self, field, x, E: float, nu: float) -> Stress:
        G = E / (2.0 * (1.0 + nu))
        x = np.asarray(x)
        grad = np.asarray(field.grad)
        r = x[1]
        zero = np.zeros_like(grad[0])
        return Stress(zero, zero, zero, zero, G * r * grad[0], G * r * grad[1], harmonic=0)


@dataclass(frozen=True)
class BendingOperator:
    """First circumferential harmonic. Field (U_z, S, D); tractions (t_x, t_y, t_h) as cos/cos/sin amplitudes."""

    name: str = "bending"
    harmonic: int = 1
    intorder: int = ELASTIC_INTORDER
    traction_components: tuple[str, ...] = ("x", "y", "h")

    def element(self, mesh):
        return ElementVector(_p2(mesh), 3)

    def stiffness(self, basis, E: float, nu: float):
        lam, mu = lame_3d(E, nu)

        @BilinearForm
        def form(u, v, w):
            r = w.x[1]
            a, b = _harmonic1_strains(u, u.grad, r), _harmonic1_strains(v, v.grad, r)
            tra, trb = a[0] + a[1] + a[2], b[0] + b[1] + b[2]
            normal = a[0] * b[0] + a[1] * b[1] + a[2] * b[2]
            shear = a[3] * b[3] + a[4] * b[4] + a[5] * b[5]
            return (lam * tra * trb + 2.0 * mu * normal + mu * shear) * r

        return asm(form, basis)

    def load_vector(self, facet_basis, traction) -> np.ndarray:
        @LinearForm
        def form(v, w):
            tx, ty, th = traction(w.x, w.n)
            vz, vs, vd = v[0], v[1], v[2]
            return (tx * vz + ty * 0.5 * (vs + vd) + th * 0.5 * (vs - vd)) * w.x[1]

        return asm(form, facet_basis)

    def fixed_dofs(self, basis) -> np.ndarray:
        """Axis conditions U_z = 0 and S = U_r + U_theta = 0 (every dof of the axis facets)."""
        dofs = basis.get_dofs(facets=axis_facets(basis.mesh))
        return np.concatenate([dofs.all("u^1"), dofs.all("u^2")])

    def rigid_restraints(self, basis) -> np.ndarray:
        """D at the two axis vertices farthest apart along the axis: with S = 0 on the axis the two rigid
        modes of harmonic 1 have D = 2 (t + c z) there, so two values at different z fix t and c."""
        a, b = _axial_ends(basis.mesh)
        if a == b:
            raise GeometryError("the axis edge has a single vertex; a shaft needs an axis edge of finite length")
        return np.array([basis.nodal_dofs[2, a], basis.nodal_dofs[2, b]])

    def stress(self, field, x, E: float, nu: float) -> Stress:
        lam, mu = lame_3d(E, nu)
        x = np.asarray(x)
        e = _harmonic1_strains(_values(field), np.asarray(field.grad), x[1], _axis_tol(x))
        tr = e[0] + e[1] + e[2]
        # e = (eps_zz, eps_rr, eps_hh, gamma_zr, gamma_z-theta, gamma_r-theta)
        return Stress(lam * tr + 2 * mu * e[0], lam * tr + 2 * mu * e[1], lam * tr + 2 * mu * e[2],
                      mu * e[3], mu * e[4], mu * e[5], harmonic=1)


def _harmonic1_strains(value, grad, r, tol: float | None = None):
    """Strain amplitudes (eps_zz, eps_rr, eps_hh, gamma_zr, gamma_z-theta, gamma_r-theta) of harmonic 1
    from the field (U_z, S, D) and its gradient; ``tol`` given: use the axis limits at r <= tol."""
    uz, s, d = value[0], value[1], value[2]
    duz, ds, dd = grad[0], grad[1], grad[2]  # each (d/dz, d/dr)
    if tol is None:  # quadrature points: never on the axis
        s_r, uz_r = s / r, uz / r
    else:
        s_r, uz_r = over_r(s, ds[1], r, tol), over_r(uz, duz[1], r, tol)
    ezz = duz[0]
    err = 0.5 * (ds[1] + dd[1])
    ehh = s_r
    gzr = 0.5 * (ds[0] + dd[0]) + duz[1]
    gzh = 0.5 * (ds[0] - dd[0]) - uz_r
    grh = 0.5 * (ds[1] - dd[1]) - s_r
    return ezz, err, ehh, gzr, gzh, grh


# --- sections, nominal stresses, resultants --------------------------------------------------------------


def _radii(intervals: np.ndarray) -> np.ndarray:
    """Radial intervals (r1, r2), 0 <= r1 < r2, of a cut given in the transverse coordinate (which is -r
    when the load axis points along -x)."""
    iv = np.abs(np.asarray(intervals, dtype=float).reshape(-1, 2))
    return np.sort(iv, axis=1)


def disc_section(intervals: np.ndarray, thickness: float) -> SectionProps:
    """Disc or annuli of the radial intervals: A = pi sum(r2^2 - r1^2), yc = 0 (on the axis),
    I = pi/4 sum(r2^4 - r1^4), J = 2 I. ``thickness`` is not used (a solid of revolution has none)."""
    iv = _radii(intervals)
    area = float(math.pi * np.sum(iv[:, 1] ** 2 - iv[:, 0] ** 2))
    inertia = float(math.pi / 4 * np.sum(iv[:, 1] ** 4 - iv[:, 0] ** 4))
    return SectionProps(area, 0.0, inertia, 2.0 * inertia)


def shaft_nominal(res: Resultants, props: SectionProps, y: float) -> float:
    """Normal nominal stress N / A + M r / I at radius r = |y| (bending: its value at theta = 0);
    4F/(pi d^2) and 32M/(pi d^3) on the surface of a solid section of diameter d."""
    r = abs(y)
    return res.N / props.area + (res.M * r / props.inertia if props.inertia > 0 else 0.0)


def shaft_shear_nominal(res: Resultants, props: SectionProps, y: float) -> float:
    """Nominal torsion shear stress T r / J at radius r = |y|; 16T/(pi d^3) on the surface of a solid
    section of diameter d."""
    return res.T * abs(y) / props.polar if props.polar > 0 else 0.0


def shaft_resultants(stress: Stress, axis: np.ndarray, y: np.ndarray, w: np.ndarray, yc: float,
                     thickness: float) -> Resultants:
    """Resultants of ONE component's stress over a cut at radii r = |y| with weights w in y.

    Harmonic 0: N = 2 pi int sigma_xx r dr, T = 2 pi int tau_xh r^2 dr. Harmonic 1 (amplitudes):
    M = pi int sigma_xx r^2 dr (the cos^2 average of sigma_xx r cos(theta) over the circle)."""
    a = np.asarray(axis, dtype=float)
    r = np.abs(np.asarray(y, dtype=float))
    w = np.asarray(w, dtype=float)
    saa = stress.xx * a[0] ** 2 + 2 * stress.xy * a[0] * a[1] + stress.yy * a[1] ** 2
    if stress.harmonic == 1:
        return Resultants(M=float(math.pi * np.sum(w * saa * r ** 2)))
    if stress.harmonic != 0:
        raise ValueError(f"no section resultants for circumferential harmonic {stress.harmonic}")
    return Resultants(N=float(2 * math.pi * np.sum(w * saa * r)), T=float(2 * math.pi * np.sum(w * stress.xh * r ** 2)))


# --- the part's own rules --------------------------------------------------------------------------------


def _tol(part: PartGeometry) -> float:
    x0, y0, x1, y1 = part.bounding_box()
    return 1e-9 * max(x1 - x0, y1 - y0, abs(x0), abs(x1), abs(y1))


def _fmt(p) -> str:
    return f"({p[0]:.6g}, {p[1]:.6g})"


def check_shaft_part(spec: PartSpec) -> None:
    """The rules a shaft's part description must follow (each broken rule has its own message).

    Called with the case's part before anything else is built (``Model.check_part``):

    * no cut-out reaches the axis (a cavity on the axis would need axis conditions on its boundary;
      checked first, because the general geometry check would only say that it touches the outline);
    * no point of any loop below the axis (y < 0): the outline would cross the axis;
    * the outline has a straight edge on y = 0 (the axis edge), in one piece, every piece named so that
      loads can leave it out of the peak search.
    """
    spec = expand_family(spec)
    tol = 1e-9 * max([abs(v.x) + abs(v.y) for v in spec.outline] + [1.0])
    for k, c in enumerate(spec.cutouts):
        pts = cutout_loop(c, k).polygon_points()
        j = int(np.argmin(pts[1]))
        if pts[1, j] <= tol:
            raise GeometryError(f"cut-out '{c.name}' touches the axis at {_fmt(pts[:, j])}",
                                item=f"part.cutouts[{k}]",
                                hint="a cut-out is a ring-shaped cavity around the axis and must stay clear of "
                                     "it; draw a cavity on the axis as part of the outline")
    check_meridian(build_part(spec))


def check_meridian(part: PartGeometry) -> None:
    """The rules of :func:`check_shaft_part` on a built part."""
    tol = _tol(part)
    for loop in part.loops:
        pts = loop.polygon_points()
        k = int(np.argmin(pts[1]))
        if pts[1, k] < -tol:
            what = "the outline" if loop.kind == LoopKind.OUTLINE else f"cut-out '{loop.name}'"
            raise GeometryError(
                f"{what} crosses the axis: it reaches y = {pts[1, k]:.6g} at {_fmt(pts[:, k])}",
                item="part.outline" if loop.kind == LoopKind.OUTLINE else "part.cutouts",
                hint="a shaft is drawn as its meridian section above the axis: x along the axis, y = radius >= 0")
    for loop in part.loops[1:]:
        pts = loop.polygon_points()
        if float(np.min(pts[1])) <= tol:
            k = int(np.argmin(pts[1]))
            raise GeometryError(f"cut-out '{loop.name}' touches the axis at {_fmt(pts[:, k])}",
                                item="part.cutouts",
                                hint="a cut-out is a ring-shaped cavity around the axis and must stay clear of it")
    segs = part.outline.segments
    on_axis = [i for i, s in enumerate(segs) if abs(s.start[1]) <= tol and abs(s.end[1]) <= tol]
    for i in on_axis:
        if segs[i].kind != LINE:
            raise GeometryError(f"the outline edge from {_fmt(segs[i].start)} to {_fmt(segs[i].end)} ends on the "
                                f"axis at both ends but is a {segs[i].kind}, not a straight line",
                                item="part.outline",
                                hint="the axis edge must be a straight line on y = 0")
    if not on_axis:
        near = [s for s in segs if s.kind == LINE and min(abs(s.start[1]), abs(s.end[1])) <= tol
                and max(abs(s.start[1]), abs(s.end[1])) < 1e-3 * (part.bounding_box()[3] or 1.0)]
        touch = [s.start for s in segs if abs(s.start[1]) <= tol]
        if near:
            s = near[0]
            msg = (f"the edge from {_fmt(s.start)} to {_fmt(s.end)} is not on the axis: it must run along y = 0 "
                   "exactly")
        elif touch:
            msg = f"the outline touches the axis only at the point {_fmt(touch[0])}"
        else:
            msg = (f"no outline edge lies on the axis: the outline stays above y = "
                   f"{float(np.min(part.outline.polygon_points()[1])):.6g}")
        raise GeometryError(msg, item="part.outline",
                            hint="a shaft's meridian section needs a straight edge on the axis (y = 0) from one "
                                 "end to the other; hollow shafts are not supported yet")
    runs = sum(1 for i in on_axis if (i - 1) % len(segs) not in on_axis)
    if runs > 1:
        raise GeometryError(f"the outline meets the axis in {runs} separate stretches (a cavity on the axis)",
                            item="part.outline", hint="the axis edge must be one straight stretch of y = 0")
    unnamed = [segs[i] for i in on_axis if not segs[i].edge]
    if unnamed:
        s = unnamed[0]
        raise GeometryError(f"the axis edge from {_fmt(s.start)} to {_fmt(s.end)} has no name",
                            item="part.outline",
                            hint='name it in the vertex that starts it, e.g. edge = "axis": loads leave the axis '
                                 "out of the stress-peak search by its name")


def axis_edge_names(part: PartGeometry) -> tuple[str, ...]:
    """Names of the outline edges on the axis (after :func:`check_shaft_part`)."""
    tol = _tol(part)
    names: list[str] = []
    for s in part.outline.segments:
        if abs(s.start[1]) <= tol and abs(s.end[1]) <= tol and s.edge and s.edge not in names:
            names.append(s.edge)
    return tuple(names)


# --- combined peak on the surface ------------------------------------------------------------------------


@dataclass(frozen=True)
class SurfaceStress:
    """Stress of one load component on the free surface at boundary points, in the surface frame:
    ``stt`` the meridian tangential stress, ``shh`` the hoop stress, ``sth`` the tangential-hoop shear
    (the normal components vanish on a free surface). Harmonic 1: stt and shh are cos(theta) amplitudes
    and sth a sin(theta) amplitude."""

    stt: np.ndarray
    shh: np.ndarray
    sth: np.ndarray
    harmonic: int = 0


def surface_stress(stress: Stress, normal: np.ndarray) -> SurfaceStress:
    """The surface-frame stresses of a component from its stress at boundary points with outward normals
    (2, n) in the meridian plane; the tangent is t = (-n_y, n_x) (direction of travel)."""
    tx, ty = -normal[1], normal[0]
    stt = stress.xx * tx * tx + 2 * stress.xy * tx * ty + stress.yy * ty * ty
    sth = stress.xh * tx + stress.yh * ty
    return SurfaceStress(np.asarray(stt), np.asarray(stress.hh), np.asarray(sth), stress.harmonic)


def surface_state(parts: Sequence[tuple[float, SurfaceStress]], theta) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    """(stt, shh, sth) of the factored components at angle theta (broadcast against the points):
    harmonic 0 terms are constant, harmonic 1 normal terms scale with cos(theta), shear with sin(theta)."""
    theta = np.asarray(theta, dtype=float)
    stt = shh = sth = 0.0
    for f, s in parts:
        if s.harmonic == 0:
            c = sn = 1.0
        elif s.harmonic == 1:
            c, sn = np.cos(theta), np.sin(theta)
        else:
            raise ValueError(f"circumferential harmonic {s.harmonic} is not supported")
        stt = stt + f * c * s.stt
        shh = shh + f * c * s.shh
        sth = sth + f * sn * s.sth
    return stt, shh, sth


def surface_principal(stt, shh, sth) -> tuple[np.ndarray, np.ndarray]:
    """Largest in-surface principal stress and the von Mises equivalent of a plane surface stress state
    (the third principal stress, normal to the free surface, is zero)."""
    c = 0.5 * (stt + shh)
    s1 = c + np.hypot(0.5 * (stt - shh), sth)
    vm = np.sqrt(np.maximum(stt * stt + shh * shh - stt * shh + 3.0 * sth * sth, 0.0))
    return s1, vm


@dataclass(frozen=True)
class CombinedPeak:
    """Per boundary point: the largest principal stress ``s1`` of the surface state maximised over theta
    and the angle ``theta_s1`` (radians in [0, 2 pi)) where it occurs; likewise the von Mises equivalent
    ``von_mises`` and ``theta_von_mises``. theta = 0 is the drawn meridian (the side a positive moment puts
    in tension)."""

    s1: np.ndarray
    theta_s1: np.ndarray
    von_mises: np.ndarray
    theta_von_mises: np.ndarray


#: coarse angular grid of the maximisation (the state is a trigonometric polynomial of degree <= 2 in
#: theta, so its maxima are at least ~45 degrees wide: 5 degrees brackets the right one); then
#: golden-section steps on the bracket, each shrinking it by 0.618 (our own choices)
COARSE_ANGLES = 72
GOLDEN_STEPS = 40


def combined_surface_peak(parts: Sequence[tuple[float, SurfaceStress]]) -> CombinedPeak:
    """Maximise the surface s1 and von Mises stress over theta for several components with factors.

    ``parts``: (factor, SurfaceStress) pairs of harmonics 0 and 1 at the same boundary points. With only
    harmonic-0 parts the state does not depend on theta and theta = 0 is returned."""
    if not parts:
        raise ValueError("no components to combine")
    n = np.asarray(parts[0][1].stt).shape
    if all(s.harmonic == 0 for _, s in parts):
        s1, vm = surface_principal(*surface_state(parts, 0.0))
        zero = np.zeros(n)
        return CombinedPeak(np.broadcast_to(s1, n).copy(), zero, np.broadcast_to(vm, n).copy(), zero.copy())
    flat = [(f, SurfaceStress(*(np.asarray(a).reshape(-1, 1) for a in (s.stt, s.shh, s.sth)), s.harmonic))
            for f, s in parts]
    out = []
    for pick in (0, 1):
        def value(theta, pick=pick):
            return surface_principal(*surface_state(flat, theta))[pick]

        grid = np.linspace(0.0, 2 * math.pi, COARSE_ANGLES, endpoint=False)[None, :]
        k = np.argmax(value(grid), axis=1)
        step = 2 * math.pi / COARSE_ANGLES
        lo = (grid[0, k] - step)[:, None]
        hi = (grid[0, k] + step)[:, None]
        g = (math.sqrt(5.0) - 1.0) / 2.0
        c, d = hi - g * (hi - lo), lo + g * (hi - lo)
        fc, fd = value(c), value(d)
        for _ in range(GOLDEN_STEPS):
            left = fc >= fd  # the maximum lies in [lo, d]: keep it, else [c, hi]
            hi = np.where(left, d, hi)
            lo = np.where(left, lo, c)
            c_new = np.where(left, hi - g * (hi - lo), d)
            d_new = np.where(left, c, lo + g * (hi - lo))
            fc, fd = np.where(left, value(c_new), fd), np.where(left, fc, value(d_new))
            c, d = c_new, d_new
        theta = 0.5 * (lo + hi)
        best = value(theta)
        coarse_best = value(grid[0, k][:, None])
        theta = np.where(coarse_best > best, grid[0, k][:, None], theta)  # never worse than the grid
        out.append((np.maximum(best, coarse_best)[:, 0].reshape(n), np.mod(theta[:, 0], 2 * math.pi).reshape(n)))
    return CombinedPeak(out[0][0], out[0][1], out[1][0], out[1][1])


# --- the model record ------------------------------------------------------------------------------------

AXIAL = AxialOperator()
TORSION = TorsionOperator()
BENDING = BendingOperator()

AXISYMMETRIC = Model(
    name="axisymmetric",
    label="axisymmetric (round shaft: axial load, bending as first harmonic, torsion)",
    operators={op.name: op for op in (AXIAL, BENDING, TORSION)},
    default_operator=AXIAL.name,
    needs_thickness=False,
    section=disc_section,
    nominal=shaft_nominal,
    cut_resultants=shaft_resultants,
    coordinates=("z", "r"),
    default_load="shaft_ends",
    element_label="6-node curved triangle (P2), axisymmetric and first-harmonic Fourier",
    has_thickness=False,
    shear_nominal=shaft_shear_nominal,
    check_part=check_shaft_part,
)
