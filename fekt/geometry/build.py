"""Build a validated :class:`PartGeometry` from a :class:`PartSpec`.

Steps: insert notch generators into the outline's vertex chain, turn every chain into boundary
segments (vertex fillets computed analytically from tangent points, arc edges from chord and
radius), build cut-out loops, validate the region with shapely, detect notch features.
Every failure raises :class:`GeometryError` naming the item, the value and the rule.
"""

from __future__ import annotations

import math
from dataclasses import replace

import numpy as np
from shapely.geometry import Polygon
from shapely.validation import explain_validity

from ..case.schema import CutoutSpec, NotchSpec, PartSpec, Vertex, chain_signed_area
from ..errors import GeometryError
from ..families import expand_family
from .features import detect_features
from ..kinds import FeatureKind, LoopKind
from .model import ARC, ELLIPSE, LINE, Loop, PartGeometry, Segment

_EPS = 1e-12


def _unit(v: np.ndarray) -> np.ndarray:
    return v / np.linalg.norm(v)


def _cross(a: np.ndarray, b: np.ndarray) -> float:
    return float(a[0] * b[1] - a[1] * b[0])


def reverse_chain(vertices: list[Vertex]) -> list[Vertex]:
    """Reverse a closed chain, moving each edge's attributes with the edge."""
    n = len(vertices)
    out = []
    for j in range(n):
        v = vertices[n - 1 - j]
        e = vertices[(n - 2 - j) % n]  # the old edge that now starts at this vertex
        # the fillet stays with its vertex, the arc (and the feature it forms) with its edge
        out.append(Vertex(v.x, v.y, v.fillet, e.edge, e.arc_radius, e.bulge, v.label,
                          v.feature if v.fillet else e.feature, v.name if v.fillet else e.name, v.index))
    return out


# --- notch generators -----------------------------------------------------------------------------

def insert_notches(vertices: list[Vertex], notches: tuple[NotchSpec, ...]) -> list[Vertex]:
    """Return the outline chain (counter-clockwise) with every notch cut into its edge."""
    by_edge: dict[str, list[NotchSpec]] = {}
    names = {v.edge for v in vertices if v.edge}
    for n in notches:
        if n.edge not in names:
            raise GeometryError(f"edge '{n.edge}' does not exist", item=f"notch '{n.name}'.edge",
                                hint=f"named edges: {', '.join(sorted(names)) or 'none'}")
        by_edge.setdefault(n.edge, []).append(n)
    out: list[Vertex] = []
    nv = len(vertices)
    body = Polygon([(v.x, v.y) for v in vertices]) if any(by_edge.values()) else None
    for i, v in enumerate(vertices):
        mine = by_edge.get(v.edge or "", []) if v.edge else []
        if not mine:
            out.append(v)
            continue
        if v.arc_radius is not None:
            raise GeometryError("notches can only be cut into straight edges",
                                item=f"notch '{mine[0].name}'", hint=f"edge '{v.edge}' is an arc")
        p0 = np.array([v.x, v.y])
        nxt = vertices[(i + 1) % nv]
        p1 = np.array([nxt.x, nxt.y])
        L = float(np.linalg.norm(p1 - p0))
        d = (p1 - p0) / L
        n_in = np.array([-d[1], d[0]])  # chain is counter-clockwise: material on the left
        # room taken by fillets at the edge's ends (tangent lengths)
        start_trim = _fillet_tangent_length(vertices, i)
        end_trim = _fillet_tangent_length(vertices, (i + 1) % nv)
        out.append(replace(v))
        last_end = start_trim
        for n in sorted(mine, key=lambda s: s.position):
            _check_depth(n, p0 + n.position * d, n_in, body)
            pts = _notch_vertices(n, p0, d, n_in, v.edge)
            half = n.position - pts[0][0], pts[-1][0] - n.position
            lo, hi = n.position - half[0], n.position + half[1]
            if lo < last_end - 1e-9 * L or hi > L - end_trim + 1e-9 * L:
                raise GeometryError(
                    f"notch mouth spans {lo:.6g}..{hi:.6g} along edge '{v.edge}', which has room for "
                    f"{last_end:.6g}..{L - end_trim:.6g} (edge length {L:.6g}, less fillets and other notches)",
                    item=f"notch '{n.name}'.position", hint="move the notch or make it narrower")
            last_end = hi
            out.extend(vert for _, vert in pts)
    return out


def _check_depth(n: NotchSpec, mouth: np.ndarray, n_in: np.ndarray, body: Polygon | None) -> None:
    """A notch must end inside the material: compare its depth with the material below its mouth."""
    if body is None or not body.is_valid:
        return  # the outline itself is invalid: validate() reports that
    from shapely.geometry import LineString

    far = mouth + n_in * 4 * math.sqrt(body.area + 1.0) * 10
    probe = LineString([tuple(mouth + n_in * 1e-9), tuple(far)])
    inside = probe.intersection(body)
    if inside.is_empty:
        return
    first = inside.geoms[0] if hasattr(inside, "geoms") else inside
    available = first.length
    if n.depth >= available * (1 - 1e-12):
        raise GeometryError(f"depth {n.depth:.6g} reaches through the part: there is only {available:.6g} of "
                            "material below the notch mouth", item=f"notch '{n.name}'.depth",
                            hint="notches deeper than the section cut the part in two")


def _fillet_tangent_length(vertices: list[Vertex], i: int) -> float:
    v = vertices[i]
    if v.fillet <= 0:
        return 0.0
    n = len(vertices)
    a = vertices[i - 1]
    b = vertices[(i + 1) % n]
    d_in = _unit(np.array([v.x - a.x, v.y - a.y]))
    d_out = _unit(np.array([b.x - v.x, b.y - v.y]))
    phi = math.acos(max(-1.0, min(1.0, float(-d_in @ d_out))))
    return v.fillet / math.tan(phi / 2) if phi > 1e-9 else math.inf


def _notch_vertices(n: NotchSpec, p0, d, n_in, edge) -> list[tuple[float, Vertex]]:
    """Vertices of one notch as (position along edge, vertex), in the direction of travel."""
    item = f"notch '{n.name}'"
    for key in ("depth",):
        if getattr(n, key) <= 0:
            raise GeometryError(f"{key} = {getattr(n, key):.6g} must be positive", item=f"{item}.{key}")
    if n.root_radius < 0:
        raise GeometryError(f"root_radius = {n.root_radius:.6g} must be zero or positive",
                            item=f"{item}.root_radius")
    if not 0 <= n.angle < 180:
        raise GeometryError(f"angle = {n.angle:.6g} degrees must be in [0, 180)", item=f"{item}.angle")
    t, r, pos = n.depth, n.root_radius, n.position

    def at(s: float, depth: float, own: bool = True, **kw) -> tuple[float, Vertex]:
        # vertices whose outgoing edge or fillet belongs to the notch carry its name
        q = p0 + s * d + depth * n_in
        return s, Vertex(float(q[0]), float(q[1]), label=f"notch '{n.name}'" if own else None,
                         feature=FeatureKind.NOTCH if own else None, **kw)

    if n.angle == 0:
        if r <= 0:
            raise GeometryError("a U-notch (angle 0) needs a positive root_radius", item=f"{item}.root_radius")
        if t <= r * (1 + 1e-12):
            # shallow circular notch: one arc of radius r, depth t
            w = math.sqrt(max(r * r - (r - t) ** 2, 0.0))
            return [at(pos - w, 0.0, arc_radius=r, bulge="in", edge=None),
                    at(pos + w, 0.0, own=False, edge=edge)]
        return [at(pos - r, 0.0, edge=None),
                at(pos - r, t - r, arc_radius=r, bulge="in"),
                at(pos + r, t - r, edge=None),
                at(pos + r, 0.0, own=False, edge=edge)]
    half = math.radians(n.angle) / 2
    apex_depth = t - r + r / math.sin(half)
    w = apex_depth * math.tan(half)
    flank = apex_depth / math.cos(half)
    if r / math.tan(half) > flank * (1 + 1e-12):
        raise GeometryError(
            f"root_radius = {r:.6g} does not fit a V-notch of depth {t:.6g} and angle {n.angle:.6g} deg: "
            f"the root arc would need flanks of {r / math.tan(half):.6g}, they are {flank:.6g} long",
            item=f"{item}.root_radius", hint="reduce the root radius or increase the depth")
    return [at(pos - w, 0.0, edge=None),
            at(pos, apex_depth, fillet=r),
            at(pos + w, 0.0, own=False, edge=edge)]


# --- chains to segments ----------------------------------------------------------------------------

def chain_segments(vertices: list[Vertex], *, item: str, origin: str) -> list[Segment]:
    """Segments of a counter-clockwise closed chain with fillets and arc edges."""
    n = len(vertices)
    if n < 3 and not any(v.arc_radius for v in vertices):
        raise GeometryError(f"a closed chain needs at least 3 vertices, got {n}", item=item)
    if n < 2:
        raise GeometryError(f"a closed chain needs at least 2 vertices, got {n}", item=item)
    P = np.array([[v.x, v.y] for v in vertices], dtype=float)
    for i in range(n):
        if np.linalg.norm(P[(i + 1) % n] - P[i]) <= _EPS * (1 + np.abs(P).max()):
            raise GeometryError(f"vertices {i} and {(i + 1) % n} coincide at ({P[i][0]:.6g}, {P[i][1]:.6g})",
                                item=item, hint="remove the repeated vertex (the chain closes itself)")
    # fillets: tangent points and arcs
    fil: dict[int, tuple[np.ndarray, np.ndarray, Segment]] = {}
    for i, v in enumerate(vertices):
        if v.fillet < 0:
            raise GeometryError(f"fillet = {v.fillet:.6g} must be zero or positive", item=f"{item}[{i}].fillet")
        if v.fillet == 0:
            continue
        prev, here = vertices[i - 1], v
        if prev.arc_radius is not None or here.arc_radius is not None:
            raise GeometryError("a fillet needs two straight edges at its vertex",
                                item=f"{item}[{i}].fillet", hint="round the arc edge's ends by other means")
        d_in = _unit(P[i] - P[i - 1])
        d_out = _unit(P[(i + 1) % n] - P[i])
        cr = _cross(d_in, d_out)
        if abs(cr) < 1e-9 and d_in @ d_out > 0:
            raise GeometryError("the edges at this vertex are collinear, so there is no corner to round",
                                item=f"{item}[{i}].fillet", hint="remove the fillet or the vertex")
        phi = math.acos(max(-1.0, min(1.0, float(-d_in @ d_out))))
        if phi < 1e-9:
            raise GeometryError("the edges at this vertex fold back on each other", item=f"{item}[{i}]")
        L = v.fillet / math.tan(phi / 2)
        t1 = P[i] - L * d_in
        t2 = P[i] + L * d_out
        c = P[i] + (v.fillet / math.sin(phi / 2)) * _unit(d_out - d_in)
        arc = Segment(ARC, tuple(t1), tuple(t2), tuple(c), v.fillet, cr > 0,
                      origin=v.label or f"{origin} vertex {i} fillet", feature=v.feature or FeatureKind.FILLET,
                      name=_fillet_name(v, origin, i), vertex=v.index)
        fil[i] = (t1, t2, arc)
    segs: list[Segment] = []
    for i, v in enumerate(vertices):
        j = (i + 1) % n
        if i in fil:
            segs.append(fil[i][2])
        a = fil[i][1] if i in fil else P[i]
        b = fil[j][0] if j in fil else P[j]
        edge_len = float(np.linalg.norm(P[j] - P[i]))
        used = float(np.linalg.norm(a - P[i]) + np.linalg.norm(P[j] - b))
        if i in fil or j in fil:
            if used > edge_len * (1 + 1e-9):
                radii = ", ".join(f"vertex {k}: {vertices[k].fillet:.6g}" for k in (i, j) if k in fil)
                raise GeometryError(
                    f"fillets do not fit on the edge from vertex {i} to vertex {j}: they need {used:.6g} "
                    f"of its length {edge_len:.6g} ({radii})", item=f"{item}[{i}]",
                    hint="reduce the fillet radii")
            if np.linalg.norm(b - a) <= 1e-9 * edge_len:
                continue  # the two fillets meet exactly: no straight piece left
        label = v.label or (f"{origin} edge {i}" + (f" '{v.edge}'" if v.edge else ""))
        if v.arc_radius is None:
            segs.append(Segment(LINE, tuple(a), tuple(b), edge=v.edge, origin=label, vertex=v.index))
            continue
        R = v.arc_radius
        chord = float(np.linalg.norm(b - a))
        if R <= 0:
            raise GeometryError(f"arc radius = {R:.6g} must be positive", item=f"{item}[{i}].arc.radius")
        if R < chord / 2 * (1 - 1e-12):
            raise GeometryError(f"arc radius = {R:.6g} is smaller than half the chord ({chord / 2:.6g})",
                                item=f"{item}[{i}].arc.radius", hint="a circular arc needs radius >= chord/2")
        if v.bulge not in ("in", "out"):
            raise GeometryError(f"bulge = '{v.bulge}' must be 'in' or 'out'", item=f"{item}[{i}].arc.bulge")
        dd = _unit(b - a)
        n_left = np.array([-dd[1], dd[0]])
        h = math.sqrt(max(R * R - chord * chord / 4, 0.0))
        mid = 0.5 * (a + b)
        # 'out' bulges to the right of travel on a counter-clockwise chain: centre on the left, CCW arc
        centre = mid + h * n_left if v.bulge == "out" else mid - h * n_left
        segs.append(Segment(ARC, tuple(a), tuple(b), tuple(centre), R, v.bulge == "out",
                            edge=v.edge, origin=label, feature=v.feature or FeatureKind.CONCAVE_ARC,
                            name=_arc_name(v, vertices[j], origin, i), vertex=v.index))
    return segs


def _fillet_name(v: Vertex, origin: str, i: int) -> str:
    """A fillet's feature name: the user's name, its notch, or its vertex as written (never coordinates)."""
    if v.name:
        return f"fillet '{v.name}'"
    if v.label:
        return v.label
    if v.index is not None:
        return f"fillet at vertex {v.index}" + ("" if origin == "outline" else f" of {origin}")
    return f"{origin} fillet {i}"


def _arc_name(v: Vertex, nxt: Vertex, origin: str, i: int) -> str:
    """An arc edge's feature name, the same whichever way the chain was written."""
    word = "fillet" if v.feature == FeatureKind.FILLET else "arc"
    if v.name:
        return f"{word} '{v.name}'"
    if v.label:
        return v.label
    if v.edge:
        return f"{word} '{v.edge}'"
    if v.index is not None and nxt.index is not None:
        lo, hi = sorted((v.index, nxt.index))
        return f"arc between vertices {lo} and {hi}" + ("" if origin == "outline" else f" of {origin}")
    return f"{origin} arc {i}"


def _numbered(vertices) -> tuple[Vertex, ...]:
    """Vertices carry their position in the chain as written (the loader sets it; parts built in Python
    get it here), so that unnamed features are named by vertex number."""
    return tuple(v if v.index is not None else replace(v, index=i) for i, v in enumerate(vertices))


def _ccw_chain(vertices: tuple[Vertex, ...]) -> list[Vertex]:
    """The chain counter-clockwise, starting at its lowest-leftmost vertex: the same part written in either
    direction, or from another starting vertex, becomes the same chain (and so the same mesh)."""
    verts = list(vertices)
    if len(verts) >= 3 and chain_signed_area(verts) < 0:
        verts = reverse_chain(verts)
    if len(verts) >= 2:
        # compared after rounding to 1e-9 of the part's size, so drawing noise cannot pick another start
        size = max(max(abs(v.x), abs(v.y)) for v in verts) or 1.0
        k = min(range(len(verts)), key=lambda i: (round(verts[i].x / size, 9), round(verts[i].y / size, 9)))
        verts = verts[k:] + verts[:k]
    return verts


def cutout_loop(c: CutoutSpec, k: int) -> Loop:
    """The loop of one cut-out, clockwise (material on the left)."""
    item = f"cutouts[{k}] '{c.name}'"
    origin = f"cut-out '{c.name}'"
    cx, cy = c.center
    th = math.radians(c.angle)
    ca, sa = math.cos(th), math.sin(th)

    def pos(name: str, value: float) -> None:
        if not value > 0:
            raise GeometryError(f"{name} = {value:.6g} must be positive", item=f"{item}.{name}")

    if c.shape == "circle":
        pos("diameter", c.diameter)
        r = c.diameter / 2
        p = (cx + r, cy)
        segs = [Segment(ARC, p, p, (cx, cy), r, True, origin=origin)]
    elif c.shape == "ellipse":
        pos("a", c.a)
        pos("b", c.b)
        p = (cx + c.a * ca, cy + c.a * sa)
        segs = [Segment(ELLIPSE, p, p, (cx, cy), 0.0, True, c.a, c.b, th, origin=origin)]
    elif c.shape in ("slot", "rounded_rectangle"):
        pos("length", c.length)
        pos("width", c.width)
        if c.shape == "slot":
            if c.length < c.width:
                raise GeometryError(f"length = {c.length:.6g} must be at least width = {c.width:.6g}",
                                    item=f"{item}.length", hint="a slot's length includes its round ends")
            rad = c.width / 2
        else:
            pos("radius", c.radius)
            rad = c.radius
            if 2 * rad > min(c.length, c.width) * (1 + 1e-12):
                raise GeometryError(
                    f"radius = {rad:.6g} is more than half the smaller side ({min(c.length, c.width) / 2:.6g})",
                    item=f"{item}.radius")
        hl, hw = c.length / 2, c.width / 2
        loc = [(-hl, -hw), (hl, -hw), (hl, hw), (-hl, hw)]
        verts = [Vertex(cx + ca * x - sa * y, cy + sa * x + ca * y, fillet=rad) for x, y in loc]
        segs = chain_segments(verts, item=item, origin=origin)
    elif c.shape == "chain":
        if len(c.vertices) < 3:
            raise GeometryError(f"a chain cut-out needs at least 3 vertices, got {len(c.vertices)}",
                                item=f"{item}.vertices")
        segs = chain_segments(_ccw_chain(_numbered(c.vertices)), item=f"{item}.vertices", origin=origin)
    else:
        raise GeometryError(f"unknown shape '{c.shape}'", item=f"{item}.shape",
                            hint="one of circle, ellipse, slot, rounded_rectangle, chain")
    segs = [s.reversed() for s in reversed(segs)]
    return Loop(tuple(segs), LoopKind.CUTOUT, c.name)


# --- validation -------------------------------------------------------------------------------------

def _shape(loop: Loop) -> Polygon:
    pts = loop.polygon_points(math.radians(0.5))
    return Polygon(pts.T)


def validate(loops: list[Loop]) -> None:
    """Check the region is a simple outline with cut-outs strictly inside and apart."""
    outer = _shape(loops[0])
    if not outer.is_valid:
        raise GeometryError(f"the outline is not a simple closed curve: {explain_validity(outer)}",
                            item="part.outline",
                            hint="check vertex order, notch depths and arc bulges; edges must not cross")
    scale = math.sqrt(outer.area)
    holes = []
    for loop in loops[1:]:
        item = f"cut-out '{loop.name}'"
        poly = _shape(loop)
        if not poly.is_valid:
            raise GeometryError(f"the cut-out is not a simple closed curve: {explain_validity(poly)}",
                                item=item)
        if not outer.contains(poly):
            where = "lies outside the outline" if not outer.intersects(poly) else "crosses the outline"
            raise GeometryError(where, item=item,
                                hint="cut-outs must lie strictly inside the part")
        gap = outer.exterior.distance(poly.exterior)
        if gap <= 1e-6 * scale:
            raise GeometryError(f"touches the outline (gap {gap:.3g})", item=item)
        for other_name, other in holes:
            if poly.intersects(other) or poly.distance(other) <= 1e-6 * scale:
                raise GeometryError(f"touches or overlaps cut-out '{other_name}'", item=item)
        holes.append((loop.name, poly))


def _check_segment_lengths(loops: list[Loop]) -> None:
    """Curves shorter than round-off (a fillet on nearly collinear edges, an arc between coincident
    points) cannot be meshed; say which item made them."""
    pts = loops[0].polygon_points()
    scale = float(max(np.ptp(pts[0]), np.ptp(pts[1]), 1e-300))
    for loop in loops:
        for seg in loop.segments:
            if seg.length() <= 1e-9 * scale:
                raise GeometryError(f"a {seg.kind} of length {seg.length():.3g} is too short to mesh "
                                    f"(part size {scale:.3g})", item=seg.origin or loop.name,
                                    hint="remove the tiny fillet or the nearly coincident vertices")


def build_part(spec: PartSpec) -> PartGeometry:
    """Turn a part description into a validated geometry with its notch features."""
    spec = expand_family(spec)
    if spec.thickness <= 0:
        raise GeometryError(f"thickness = {spec.thickness:.6g} must be positive", item="part.thickness")
    verts = list(spec.outline)
    if len(verts) < 3:
        raise GeometryError(f"the outline needs at least 3 vertices, got {len(verts)}", item="part.outline")
    P = np.array([[v.x, v.y] for v in verts])
    if np.linalg.matrix_rank(P[1:] - P[0], tol=1e-12 * (1 + np.abs(P).max())) < 2:
        raise GeometryError("the outline encloses no area (all vertices lie on one line)", item="part.outline")
    verts = _ccw_chain(_numbered(verts))
    plain = None
    if spec.notches:
        plain = Loop(tuple(chain_segments(verts, item="part.outline", origin="outline")), LoopKind.OUTLINE, "outline")
    verts = insert_notches(verts, spec.notches)
    outline = Loop(tuple(chain_segments(verts, item="part.outline", origin="outline")), LoopKind.OUTLINE, "outline")
    names = [c.name for c in spec.cutouts]
    for n in set(names):
        if names.count(n) > 1:
            raise GeometryError(f"the name '{n}' is used by {names.count(n)} cut-outs", item="cutouts",
                                hint="give each cut-out its own name")
    loops = [outline] + [cutout_loop(c, k) for k, c in enumerate(spec.cutouts)]
    _check_segment_lengths(loops)
    validate(loops)
    features, warnings = detect_features(loops, notch_names={n.name for n in spec.notches})
    warnings += proportion_warnings(loops, features)
    return PartGeometry(tuple(loops), tuple(features), tuple(warnings), plain)


#: proportions beyond which meshes get large or badly graded (our own limits)
MAX_ASPECT = 50.0
MAX_SCALE_RATIO = 1e4


def proportion_warnings(loops, features) -> list[str]:
    pts = loops[0].polygon_points()
    w = float(pts[0].max() - pts[0].min())
    h = float(pts[1].max() - pts[1].min())
    out = []
    if max(w, h) > MAX_ASPECT * min(w, h):
        out.append(f"the part is {max(w, h) / min(w, h):.0f} times longer than wide: expect a large mesh; "
                   "model only the length that matters (a few widths either side of the notches)")
    radii = [f.radius for f in features if f.radius > 0]
    if radii and max(w, h) > MAX_SCALE_RATIO * min(radii):
        out.append(f"the smallest notch radius ({min(radii):.3g}) is {max(w, h) / min(radii):.0f} times smaller than "
                   "the part: expect a large mesh and long solve")
    return out


__all__ = ["build_part", "chain_segments", "cutout_loop", "insert_notches", "validate"]
