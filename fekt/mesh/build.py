"""Mesh a part with gmsh: curved six-node triangles, graded to every notch feature.

The geometry is built with OpenCASCADE without any boolean operation, so each gmsh curve maps to
exactly one of our boundary segments (arcs are split into pieces of at most 90 degrees; all pieces
map to the same segment). Boundary names are rebuilt from gmsh's line3 elements on each curve,
because scikit-fem loses them for quadratic meshes (docs/pitfalls.md, A1-A2).
"""

from __future__ import annotations

import math
import time
from dataclasses import dataclass, field

import numpy as np
from skfem import MeshTri1, MeshTri2
from skfem.mapping import MappingIsoparametric

from ..case.schema import MeshSpec
from ..errors import InputError, MeshError
from ..geometry.model import ARC, ELLIPSE, LINE, OUTLINE, PartGeometry
from ..kinds import LoopKind
from .session import gmsh_session


class ScaledToleranceMapping(MappingIsoparametric):
    """Isoparametric mapping whose inverse uses a looser Newton tolerance.

    skfem's invF stops at an absolute step of 1e-12 in reference coordinates, summed over points; for
    small elements far from the origin (0.03 wide at x = 160) round-off alone is about that big, and
    FacetBasis then raised "Newton iteration didn't converge". 1e-10 in reference coordinates is far
    below any effect on stresses (our own tolerance; measured failure on gmsh 4.15.2 / skfem 12.0.2).
    """

    def invF(self, x, tind=None, newton_max_iters=50, newton_tol=1e-10):
        n = max(1, x.shape[-1] if x.ndim == 3 else 1)
        # tiny elements far from the origin need a looser absolute step; 1e-6 in reference
        # coordinates still moves a sample point by a millionth of an element
        for tol in (newton_tol, 1e-8, 1e-6):
            try:
                return super().invF(x, tind=tind, newton_max_iters=newton_max_iters, newton_tol=tol * n)
            except Exception as exc:  # skfem raises a plain Exception when Newton does not converge
                last = exc
        raise MeshError(f"cannot map points into the curved elements ({last}); the mesh has elements far "
                        "smaller than the part (check very small radii)")


def iso_mapping(mesh):
    if isinstance(mesh, MeshTri2):
        return ScaledToleranceMapping(mesh, mesh.elem(), mesh.bndelem)
    return mesh._mapping()  # straight triangles: skfem's affine mapping


@dataclass(frozen=True)
class PartMesh:
    """A quadratic mesh with every boundary facet tagged by the segment it lies on.

    ``boundary_facets``: skfem facet indices; ``facet_loop`` / ``facet_segment``: the (loop, segment)
    each lies on. ``boundaries`` maps a boundary name (an outline edge's name, a cut-out's name) to its
    facets: loads, supports and peak exclusion refer to boundaries by name. ``feature_sizes`` maps
    feature name to the element size requested there.
    """

    mesh: MeshTri2 | MeshTri1
    mapping: object
    boundary_facets: np.ndarray
    facet_loop: np.ndarray
    facet_segment: np.ndarray
    feature_sizes: dict[str, float]
    size_max: float
    n_elements: int
    n_nodes: int
    min_quality: float
    area: float
    seconds: float
    warnings: tuple[str, ...] = field(default=())
    boundaries: dict[str, np.ndarray] = field(default_factory=dict)

    def facets(self, name: str) -> np.ndarray:
        """The boundary facets of a named edge or cut-out."""
        return self.boundaries[name]

    def facets_of(self, refs: list[tuple[int, int]]) -> np.ndarray:
        """Boundary facets lying on any of the given (loop, segment) pairs."""
        mask = np.zeros(self.boundary_facets.size, dtype=bool)
        for li, si in refs:
            mask |= (self.facet_loop == li) & (self.facet_segment == si)
        return self.boundary_facets[mask]


def default_size_max(part: PartGeometry) -> float:
    """Largest element size when the case gives none: a sixth of the part's smaller overall dimension
    (our own default, chosen with the benchmark in benchmarks/verification.py)."""
    x0, y0, x1, y1 = part.bounding_box()
    return min(x1 - x0, y1 - y0) / 6.0


def feature_size(radius: float, spec: MeshSpec, size_max: float, smallest: float) -> float:
    """Element size at a feature: its radius / elements_per_radius, never above size_max.
    Sharp corners (radius 0) get the smallest size used anywhere else, or size_max / elements_per_radius."""
    if radius > 0:
        return min(radius / spec.elements_per_radius, size_max)
    return min(smallest, size_max / spec.elements_per_radius)


def estimated_elements(part: PartGeometry, sizes: dict[str, float], size_max: float, spec: MeshSpec) -> float:
    """Rough triangle count before meshing: far field area / h_max^2 plus, around each feature of
    length l and size h, the graded band l / (growth h) (integral of 1/h(d)^2 with h = h0 + growth d),
    times a constant fitted on the demo cases and 4 per nested split. Good to a factor of about 2 (our own
    estimate)."""
    n = part.area() / size_max ** 2
    for f in part.features:
        h = sizes[f.name]
        length = sum(part.segment(ref).length() for ref in f.segments) if f.segments else h
        n += length / (spec.growth * h) + (math.pi * (size_max / spec.growth) ** 2 / size_max ** 2 if not f.segments else 0)
    return 6.0 * n * 4 ** spec.refine  # factor measured on the demo cases (estimate / actual 0.7-1.3)


def mesh_part(part: PartGeometry, spec: MeshSpec, *, order: int = 2, uniform: bool = False) -> PartMesh:
    """Mesh the part; see the module docstring.

    ``order=1, uniform=True`` gives the naive baseline of the benchmark: straight three-node
    triangles of one size everywhere (no notch refinement)."""
    t0 = time.perf_counter()
    size_max = spec.size if spec.size else default_size_max(part)
    if size_max <= 0:
        raise MeshError(f"mesh size = {size_max:.6g} must be positive")
    radii = [f.radius for f in part.features if f.radius > 0]
    smallest = min(radii) / spec.elements_per_radius if radii else size_max / spec.elements_per_radius
    sizes = {f.name: feature_size(f.radius, spec, size_max, smallest) for f in part.features}
    estimate = estimated_elements(part, sizes, size_max, spec)
    if estimate > spec.max_elements:
        raise MeshError(f"the mesh would have about {estimate:.3g} elements, more than the limit "
                        f"{spec.max_elements:.3g} (smallest element {min(sizes.values(), default=size_max):.3g}, "
                        f"largest {size_max:.3g}); use fewer elements_per_radius, a larger mesh.size, or raise "
                        "mesh.max_elements if the machine has the memory")

    with gmsh_session() as gmsh:
        try:
            mesh, bfac, bloop, bseg, minq = _build_and_mesh(gmsh, part, spec, sizes, size_max, order, uniform)
        except (MeshError, InputError):
            raise
        except Exception as exc:  # gmsh reports its failures as plain exceptions
            raise MeshError(f"gmsh could not mesh the part: {exc}; check for very small features next to large "
                            "ones, or change the mesh settings") from exc

    if order == 2:
        _check_on_curves(mesh, bfac, bloop, bseg, part)
    expected_area = part.area()
    area = _mesh_area(mesh)
    # straight-sided baseline meshes lose the sagitta of every arc: a looser check for them
    if abs(area - expected_area) > (1e-5 if order == 2 else 2e-2) * abs(expected_area):
        raise MeshError(f"mesh area {area:.9g} differs from the part's area {expected_area:.9g} by "
                        f"{abs(area - expected_area) / abs(expected_area):.2%}")
    warnings = ligament_warnings(part, sizes, size_max)
    if minq < 0.2:  # our own threshold; minSJ > 0 is already enforced
        warnings.append(f"poorly shaped elements (min scaled Jacobian {minq:.2f}); results near them are less accurate")
    return PartMesh(mesh=mesh, mapping=iso_mapping(mesh), boundary_facets=bfac, facet_loop=bloop,
                    facet_segment=bseg, warnings=tuple(warnings), feature_sizes=sizes, size_max=size_max, n_elements=mesh.t.shape[1],
                    n_nodes=mesh.doflocs.shape[1], min_quality=minq, area=area,
                    seconds=time.perf_counter() - t0,
                    boundaries=named_boundaries(part, bfac, bloop, bseg))


def named_boundaries(part: PartGeometry, bfac: np.ndarray, bloop: np.ndarray, bseg: np.ndarray) -> dict[str, np.ndarray]:
    """Facets of every named outline edge and of every cut-out (by the cut-out's name)."""
    names: dict[str, list[tuple[int, int]]] = {OUTLINE: part.named_refs(OUTLINE)}
    for li, loop in enumerate(part.loops):
        for si, seg in enumerate(loop.segments):
            if seg.edge:
                names.setdefault(seg.edge, []).append((li, si))
        if loop.kind == LoopKind.CUTOUT:
            names.setdefault(loop.name, []).extend((li, si) for si in range(len(loop.segments)))
    out = {}
    for name, refs in names.items():
        mask = np.zeros(bfac.size, dtype=bool)
        for li, si in refs:
            mask |= (bloop == li) & (bseg == si)
        out[name] = bfac[mask]
    return out


def _build_and_mesh(gmsh, part: PartGeometry, spec: MeshSpec, sizes: dict[str, float], size_max: float,
                    order: int, uniform: bool):
    """Build the OCC geometry, size fields and the mesh inside an open gmsh session."""
    gmsh.model.add("part")
    occ = gmsh.model.occ
    curve_ref: dict[int, tuple[int, int]] = {}
    bx0, by0, bx1, by1 = part.bounding_box()
    snap = 1e-9 * max(bx1 - bx0, by1 - by0)
    loop_tags = []
    seg_curves: dict[tuple[int, int], list[int]] = {}
    for li, loop in enumerate(part.loops):
        point_tags: list[tuple[float, float, int]] = []

        def pt(xy) -> int:
            # segment ends computed along different routes (a fillet's tangent point, a vertex)
            # may differ by round-off: one gmsh point per location, or the loop would not close
            x, y = float(xy[0]), float(xy[1])
            for px, py, tag in point_tags:
                if abs(px - x) <= snap and abs(py - y) <= snap:
                    return tag
            tag = occ.addPoint(x, y, 0.0)
            point_tags.append((x, y, tag))
            return tag

        curves = []
        centres = []
        # OCC wants every wire counter-clockwise (a clockwise hole wire adds its area instead of
        # removing it; checked on gmsh 4.15.2), so cut-outs are drawn in reverse
        seq = list(enumerate(loop.segments))
        if loop.kind == LoopKind.CUTOUT:
            seq = [(si, seg.reversed()) for si, seg in reversed(seq)]
        for si, seg in seq:
            tags = []
            if seg.kind == LINE:
                tags.append(occ.addLine(pt(seg.start), pt(seg.end)))
            elif seg.kind == ARC:
                n = max(1, math.ceil(abs(seg.sweep()) / (math.pi / 2) - 1e-9))
                ts = np.linspace(0.0, 1.0, n + 1)
                xy = seg.point(ts)
                xy[:, 0] = seg.start
                xy[:, -1] = seg.end
                c = occ.addPoint(seg.center[0], seg.center[1], 0.0)
                centres.append(c)
                for k in range(n):
                    tags.append(occ.addCircleArc(pt(xy[:, k]), c, pt(xy[:, k + 1])))
            elif seg.kind == ELLIPSE:
                a, b, ang = seg.a, seg.b, seg.angle
                if b > a:  # OCC needs the major radius first
                    a, b, ang = b, a, ang + math.pi / 2
                # build axis-aligned, then rotate: the xAxis argument of addEllipse did not
                # orient the ellipse here (gmsh 4.15.2; midside nodes landed on the unrotated curve)
                tag = occ.addEllipse(seg.center[0], seg.center[1], 0.0, a, b)
                if ang % (2 * math.pi):
                    occ.rotate([(1, tag)], seg.center[0], seg.center[1], 0.0, 0.0, 0.0, 1.0, ang)
                tags.append(tag)
            for t in tags:
                curve_ref[t] = (li, si)
            seg_curves[(li, si)] = tags
            curves.extend(tags)
        if centres:
            occ.remove([(0, c) for c in centres])
        loop_tags.append(occ.addCurveLoop(curves))
    surf = occ.addPlaneSurface(loop_tags)
    occ.synchronize()
    gmsh.model.addPhysicalGroup(2, [surf], name="domain")
    expected_area = part.area()
    occ_area = occ.getMass(2, surf)
    if abs(occ_area - expected_area) > 1e-6 * abs(expected_area):
        raise MeshError(f"gmsh built a surface of area {occ_area:.9g}, the part has {expected_area:.9g}; "
                        "the outline was not transferred faithfully")

    # size fields: one Distance + Threshold per feature, combined with Min
    fields = []
    graded_features = () if uniform else part.features
    growth = spec.growth
    for f in graded_features:
        h = sizes[f.name]
        dist = gmsh.model.mesh.field.add("Distance")
        if f.segments:
            ctags = [t for ref in f.segments for t in seg_curves[ref]]
            length = sum(part.segment(ref).length() for ref in f.segments)
            gmsh.model.mesh.field.setNumbers(dist, "CurvesList", ctags)
            # default Sampling (20 per curve) under-resolves long fine curves (docs/pitfalls.md, C2)
            gmsh.model.mesh.field.setNumber(dist, "Sampling", int(min(max(20, 2 * length / h), 20000)))
        else:
            ptag = _find_point(gmsh, f.point)
            gmsh.model.mesh.field.setNumbers(dist, "PointsList", [ptag])
        thr = gmsh.model.mesh.field.add("Threshold")
        gmsh.model.mesh.field.setNumber(thr, "InField", dist)
        gmsh.model.mesh.field.setNumber(thr, "SizeMin", h)
        gmsh.model.mesh.field.setNumber(thr, "SizeMax", size_max)
        dmin = 0.25 * f.radius if f.radius > 0 else 0.0
        gmsh.model.mesh.field.setNumber(thr, "DistMin", dmin)
        gmsh.model.mesh.field.setNumber(thr, "DistMax", dmin + max(size_max - h, 0.0) / growth)
        fields.append(thr)
    if fields:
        mn = gmsh.model.mesh.field.add("Min")
        gmsh.model.mesh.field.setNumbers(mn, "FieldsList", fields)
        gmsh.model.mesh.field.setAsBackgroundMesh(mn)
    opt = gmsh.option.setNumber
    # let the field govern (docs/pitfalls.md, C3); curvature keeps convex arcs round (16 per full turn)
    opt("Mesh.MeshSizeExtendFromBoundary", 0)
    opt("Mesh.MeshSizeFromPoints", 0)
    opt("Mesh.MeshSizeFromCurvature", 16)
    opt("Mesh.MeshSizeMax", size_max)
    opt("Mesh.MeshSizeMin", 0.0)
    opt("Mesh.Algorithm", 6)  # "Frontal-Delaunay" (gmsh manual, Mesh.Algorithm)
    opt("Mesh.SecondOrderLinear", 0)  # midside nodes on the CAD curves (docs/pitfalls.md, C4)
    opt("Mesh.HighOrderOptimize", 0)
    gmsh.model.mesh.generate(2)
    for _ in range(spec.refine):
        gmsh.model.mesh.refine()  # nested split; new boundary nodes snap to the curves (docs/pitfalls.md, F2)
    if order == 2:
        gmsh.model.mesh.setOrder(2)
    return _extract(gmsh, curve_ref, order)


#: a ligament narrower than this many local elements is resolved too coarsely to trust (our own rule)
LIGAMENT_ELEMENTS = 4


def ligament_warnings(part: PartGeometry, sizes: dict[str, float], size_max: float) -> list[str]:
    """Warn where a cut-out comes closer to the outline or another cut-out than a few elements."""
    from shapely.geometry import LineString

    def ring(loop):
        pts = loop.polygon_points(math.radians(1.0))
        return LineString(np.hstack([pts, pts[:, :1]]).T)

    rings = [ring(lp) for lp in part.loops]
    size_of = {f.name: sizes.get(f.name, size_max) for f in part.features}
    out = []
    for i in range(1, len(part.loops)):
        hi = size_of.get(f"cut-out '{part.loops[i].name}'", size_max)
        for j in range(i):
            gap = rings[i].distance(rings[j])
            h = hi if j == 0 else min(hi, size_of.get(f"cut-out '{part.loops[j].name}'", size_max))
            if gap < LIGAMENT_ELEMENTS * h:
                other = "the outline" if j == 0 else f"cut-out '{part.loops[j].name}'"
                out.append(f"the ligament between cut-out '{part.loops[i].name}' and {other} is {gap:.3g} wide, "
                           f"only {gap / h:.1f} elements across; refine it (smaller mesh.size or more "
                           "elements_per_radius) before trusting stresses there")
    return out


def _find_point(gmsh, xy) -> int:
    eps = 1e-6 * (1 + abs(xy[0]) + abs(xy[1]))
    ents = gmsh.model.getEntitiesInBoundingBox(xy[0] - eps, xy[1] - eps, -1, xy[0] + eps, xy[1] + eps, 1, dim=0)
    if not ents:
        raise MeshError(f"no geometry point at the sharp corner ({xy[0]:.6g}, {xy[1]:.6g})")
    return ents[0][1]


def _extract(gmsh, curve_ref: dict[int, tuple[int, int]], order: int = 2):
    """Read the quadratic mesh from the live gmsh model (docs/pitfalls.md, A2) and tag boundary facets."""
    tri_type = gmsh.model.mesh.getElementType("Triangle", order)
    line_type = gmsh.model.mesh.getElementType("Line", order)
    npe = 6 if order == 2 else 3
    etags, enodes = gmsh.model.mesh.getElementsByType(tri_type)
    if len(etags) == 0:
        raise MeshError("gmsh produced no triangles (is the outline self-intersecting?)")
    node_tags, coords, _ = gmsh.model.mesh.getNodes()
    xy = coords.reshape(-1, 3)[:, :2]
    tri = enodes.reshape(-1, npe).astype(np.int64)
    qual = gmsh.model.mesh.getElementQualities(etags, "minSJ")
    minq = float(np.min(qual))
    if minq <= 0:
        raise MeshError(f"the mesh has inverted or degenerate elements (min scaled Jacobian {minq:.3g})")
    # compact: keep only nodes used by triangles (drops free helper points, docs/pitfalls.md A2)
    lookup = np.full(int(node_tags.max()) + 1, -1, dtype=np.int64)
    lookup[node_tags.astype(np.int64)] = np.arange(node_tags.size)
    tri_idx = lookup[tri]
    used = np.unique(tri_idx)
    compact = np.full(node_tags.size, -1, dtype=np.int64)
    compact[used] = np.arange(used.size)
    t6 = compact[tri_idx].T  # (6, nel): corners then midsides 01, 12, 20 (same order as skfem)
    p = xy[used].T
    mesh = (MeshTri2 if order == 2 else MeshTri1)(np.ascontiguousarray(p), np.ascontiguousarray(t6))
    # skfem renumbers corners as np.unique(t[:3]) -> arange (docs/pitfalls.md, A1)
    corner_ids = np.unique(t6[:3])
    facets = np.sort(mesh.facets, axis=0)
    nv = np.int64(mesh.nvertices)
    key_of_facet = facets[0].astype(np.int64) * nv + facets[1]
    by_key = np.argsort(key_of_facet)
    sorted_keys = key_of_facet[by_key]
    fac_list, loop_list, seg_list = [], [], []
    for ctag, (li, si) in curve_ref.items():
        _, lnodes = gmsh.model.mesh.getElementsByType(line_type, ctag)
        if len(lnodes) == 0:
            raise MeshError(f"boundary curve {ctag} (loop {li}, segment {si}) has no elements")
        ln = compact[lookup[lnodes.reshape(-1, order + 1)[:, :2].astype(np.int64)]]
        if (ln < 0).any():
            raise MeshError(f"boundary curve {ctag} has nodes that are not corners of any triangle")
        v = np.searchsorted(corner_ids, ln)
        if (corner_ids[np.minimum(v, corner_ids.size - 1)] != ln).any():
            raise MeshError(f"boundary curve {ctag} has nodes that are not triangle corners")
        v = np.sort(v, axis=1)
        keys = v[:, 0] * nv + v[:, 1]
        pos = np.searchsorted(sorted_keys, keys)
        pos = np.minimum(pos, sorted_keys.size - 1)
        if (sorted_keys[pos] != keys).any():
            raise MeshError(f"boundary curve {ctag} has edges that are not mesh facets")
        fac_list.append(by_key[pos])
        loop_list.append(np.full(keys.size, li))
        seg_list.append(np.full(keys.size, si))
    bfac = np.concatenate(fac_list)
    tagged = np.zeros(mesh.facets.shape[1], dtype=bool)
    tagged[bfac] = True
    missing = np.setdiff1d(mesh.boundary_facets(), bfac)
    if missing.size:
        raise MeshError(f"{missing.size} boundary facets are not on any boundary curve")
    return mesh, bfac, np.concatenate(loop_list), np.concatenate(seg_list), minq


def _check_on_curves(mesh, bfac, bloop, bseg, part: PartGeometry) -> None:
    """Every boundary node must lie on the segment it was tagged with (catches a curve that gmsh built
    differently from our model, e.g. a mis-oriented ellipse)."""
    x0, y0, x1, y1 = part.bounding_box()
    tol = 1e-7 * max(x1 - x0, y1 - y0)
    for li, loop in enumerate(part.loops):
        for si, seg in enumerate(loop.segments):
            f = bfac[(bloop == li) & (bseg == si)]
            pts = np.hstack([mesh.doflocs[:, mesh.nvertices + f], mesh.p[:, mesh.facets[0, f]]])
            back = seg.point(seg.parameter(pts))
            err = float(np.max(np.linalg.norm(back - pts, axis=0))) if pts.size else 0.0
            if err > tol:
                raise MeshError(f"mesh nodes lie {err:.3g} off {loop.name} segment {si} ({seg.kind}); "
                                "gmsh's curve differs from the geometry model")


def _mesh_area(mesh: MeshTri2) -> float:
    from skfem import Basis, ElementTriP0, Functional

    basis = Basis(mesh, ElementTriP0(), intorder=4, mapping=iso_mapping(mesh))

    @Functional
    def one(w):
        return 1.0 + 0 * w.x[0]

    detj = basis.dx  # weights times |det J| at quadrature points
    if (detj <= 0).any():
        raise MeshError("the mesh has elements with non-positive Jacobian (inverted curved elements)")
    return float(one.assemble(basis))
