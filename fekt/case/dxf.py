"""Outlines from DXF drawings (ezdxf): LINE, ARC, CIRCLE, LWPOLYLINE (with bulges) and full ELLIPSE.

Entities are chained into closed loops within a tolerance; the loop enclosing the largest area is
the outline and every other loop a cut-out. An entity drawn on a layer other than "0" gives its layer
name to that outline edge, which is how loads find the ends (draw each loaded end as a LINE on its own
layer, e.g. "left" and "right"). Coordinates are converted from the drawing's unit ($INSUNITS, or
an override) to the case's length unit.

Errors name the entity type, its handle and layer, and the place: open chains, gaps larger than the
tolerance, branches (three ends at one point), unsupported entities, loops outside the outline.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from pathlib import Path

from ..errors import CaseError
from .schema import CutoutSpec, Vertex, shoelace

#: $INSUNITS codes (DXF reference) -> unit name; 0 = unitless
INSUNITS = {1: "in", 4: "mm", 5: "cm", 6: "m"}
#: length of one unit in mm
MM_PER_UNIT = {"mm": 1.0, "cm": 10.0, "m": 1000.0, "in": 25.4}
SUPPORTED = ("LINE", "ARC", "CIRCLE", "LWPOLYLINE", "ELLIPSE")
#: annotation entities carry no geometry of the part: skipped
IGNORED = ("TEXT", "MTEXT", "DIMENSION", "LEADER", "MLEADER", "HATCH", "POINT", "VIEWPORT", "ATTDEF",
           "ATTRIB")


@dataclass(frozen=True)
class Piece:
    """One curve of the drawing: a line, or a circular arc (counter-clockwise if ``ccw``)."""

    start: tuple[float, float]
    end: tuple[float, float]
    layer: str
    where: str  # "LINE #1A on layer 'left'"
    center: tuple[float, float] | None = None
    radius: float = 0.0
    ccw: bool = True

    def reversed(self) -> "Piece":
        return Piece(self.end, self.start, self.layer, self.where, self.center, self.radius, not self.ccw)


@dataclass(frozen=True)
class DxfOutline:
    outline: tuple[Vertex, ...]
    cutouts: tuple[CutoutSpec, ...]


def _where(e) -> str:
    return f"{e.dxftype()} #{e.dxf.handle} on layer '{e.dxf.layer}'"


def _arc_piece(cx, cy, r, a0, a1, layer, where) -> list[Piece]:
    """Counter-clockwise arc from angle a0 to a1 (degrees), split so no piece exceeds 180 degrees
    (a chain edge is always the minor arc between its ends)."""
    sweep = (a1 - a0) % 360.0 or 360.0
    n = max(1, math.ceil(sweep / 179.0))
    out = []
    for k in range(n):
        t0 = math.radians(a0 + sweep * k / n)
        t1 = math.radians(a0 + sweep * (k + 1) / n)
        out.append(Piece((cx + r * math.cos(t0), cy + r * math.sin(t0)), (cx + r * math.cos(t1), cy + r * math.sin(t1)),
                         layer, where, (cx, cy), r, True))
    return out


def _bulge_pieces(p0, p1, bulge, layer, where) -> list[Piece]:
    """LWPOLYLINE segment: bulge = tan(sweep/4), positive counter-clockwise (DXF reference)."""
    if abs(bulge) < 1e-12:
        return [Piece(p0, p1, layer, where)]
    sweep = 4 * math.atan(bulge)
    chord = math.dist(p0, p1)
    r = chord / (2 * abs(math.sin(sweep / 2)))
    mx, my = (p0[0] + p1[0]) / 2, (p0[1] + p1[1]) / 2
    dx, dy = (p1[0] - p0[0]) / chord, (p1[1] - p0[1]) / chord
    # signed distance from the chord's midpoint to the centre, to the left of travel: a counter-clockwise
    # arc (bulge > 0) turns left, so its centre lies on the left for sweeps below 180 degrees; a clockwise
    # arc (bulge < 0) has its centre on the right
    h = math.copysign(r * math.cos(sweep / 2), bulge)
    cx, cy = mx - dy * h, my + dx * h
    a0 = math.degrees(math.atan2(p0[1] - cy, p0[0] - cx))
    a1 = math.degrees(math.atan2(p1[1] - cy, p1[0] - cx))
    if sweep > 0:
        return _arc_piece(cx, cy, r, a0, a1, layer, where)
    return [p.reversed() for p in reversed(_arc_piece(cx, cy, r, a1, a0, layer, where))]


def _read_doc(source: str):
    import ezdxf

    try:
        return ezdxf.readfile(source)
    except IOError as exc:
        raise CaseError(f"cannot read the DXF file: {exc}", item=source) from None
    except ezdxf.DXFStructureError as exc:
        raise CaseError(f"the DXF file is damaged or not a DXF file: {exc}", item=source) from None


def read_pieces(doc, scale: float, source: str) -> tuple[list[Piece], list[CutoutSpec]]:
    """Curves of the model space, in the case's unit; full circles and ellipses come back as cut-outs
    directly (they are closed loops by themselves). Entities drawn with an upside-down extrusion (a
    mirrored coordinate system, as some programs save clockwise arcs) are turned upright first, and every
    curve read is checked against ezdxf's own flattening of its entity."""
    from ezdxf.upright import upright_all

    path = source
    pieces: list[Piece] = []
    closed: list[CutoutSpec] = []
    upright_all(doc.modelspace())
    for e in doc.modelspace():
        before = len(pieces)
        kind = e.dxftype()
        layer = e.dxf.layer
        where = _where(e)
        if kind in IGNORED:
            continue
        if kind not in SUPPORTED:
            raise CaseError(f"unsupported entity {where}", item=str(path),
                            hint=f"fekt reads {', '.join(SUPPORTED)}; convert splines and blocks to lines and arcs "
                                 "(explode blocks, approximate splines by arcs)")
        if kind == "LINE":
            s, t = e.dxf.start, e.dxf.end
            pieces.append(Piece((s.x * scale, s.y * scale), (t.x * scale, t.y * scale), layer, where))
        elif kind == "ARC":
            c = e.dxf.center
            pieces += _arc_piece(c.x * scale, c.y * scale, e.dxf.radius * scale, e.dxf.start_angle, e.dxf.end_angle,
                                 layer, where)
        elif kind == "CIRCLE":
            c = e.dxf.center
            closed.append(CutoutSpec(layer if layer not in ("0", "") else f"circle {e.dxf.handle}", "circle", (c.x * scale, c.y * scale),
                                     diameter=2 * e.dxf.radius * scale))
        elif kind == "ELLIPSE":
            full = abs((e.dxf.end_param - e.dxf.start_param) % (2 * math.pi)) < 1e-9 or \
                abs(e.dxf.end_param - e.dxf.start_param - 2 * math.pi) < 1e-9
            if not full:
                raise CaseError(f"elliptical arc {where} is not supported (only full ellipses)", item=str(path),
                                hint="draw the arc as circular arcs or a polyline")
            c, m = e.dxf.center, e.dxf.major_axis
            a = math.hypot(m.x, m.y) * scale
            closed.append(CutoutSpec(layer if layer not in ("0", "") else f"ellipse {e.dxf.handle}", "ellipse", (c.x * scale, c.y * scale), a=a,
                                     b=a * e.dxf.ratio, angle=math.degrees(math.atan2(m.y, m.x))))
        else:  # LWPOLYLINE
            pts = [(x * scale, y * scale, b) for x, y, b in e.get_points("xyb")]
            n = len(pts) if e.closed else len(pts) - 1
            for i in range(n):
                x0, y0, b = pts[i]
                x1, y1, _ = pts[(i + 1) % len(pts)]
                if math.dist((x0, y0), (x1, y1)) == 0:
                    continue
                pieces += _bulge_pieces((x0, y0), (x1, y1), b, layer, where)
        if len(pieces) > before:
            check_against_flattening(e, pieces[before:], scale, path)
    return pieces, closed


#: a curve read from an entity must lie within this fraction of the entity's size of ezdxf's own
#: flattening of it, and have its length within LENGTH_TOLERANCE (our own tolerances: far above the
#: flattening's sagitta, far below any misread arc)
SHAPE_TOLERANCE = 1e-4
LENGTH_TOLERANCE = 1e-3


def _piece_points(pc: Piece, n: int = 64) -> list[tuple[float, float]]:
    if pc.center is None:
        return [pc.start, pc.end]
    a0 = math.atan2(pc.start[1] - pc.center[1], pc.start[0] - pc.center[0])
    a1 = math.atan2(pc.end[1] - pc.center[1], pc.end[0] - pc.center[0])
    sw = (a1 - a0) % (2 * math.pi) if pc.ccw else -((a0 - a1) % (2 * math.pi))
    return [(pc.center[0] + pc.radius * math.cos(a0 + sw * k / n), pc.center[1] + pc.radius * math.sin(a0 + sw * k / n))
            for k in range(n + 1)]


def check_against_flattening(entity, pieces: list[Piece], scale: float, source: str) -> None:
    """The curves fekt built from an entity must trace the entity as ezdxf flattens it (same points, same
    length); a mismatch stops with a message naming the entity, never a different part."""
    from shapely.geometry import MultiLineString, Point

    curves = [[(x * scale, y * scale) for x, y in c] for c in _flat_curves(entity)]
    curves = [c for c in curves if len(c) >= 2]
    if not curves:
        return
    theirs = MultiLineString(curves)
    theirs_len = theirs.length
    size = max(theirs_len, 1e-300)
    mine = MultiLineString([_piece_points(pc) for pc in pieces])
    worst = max(mine.distance(Point(q)) for c in curves for q in c)
    ours_len = sum(_piece_length(pc) for pc in pieces)
    if worst > SHAPE_TOLERANCE * size or abs(ours_len - theirs_len) > LENGTH_TOLERANCE * theirs_len:
        raise CaseError(f"{_where(entity)} was not read faithfully: the curve fekt built lies up to {worst:.3g} "
                        f"away from the drawing (length {ours_len:.6g} against {theirs_len:.6g})", item=source,
                        hint="please report this with the drawing; as a workaround, explode the entity into "
                             "LINE and ARC entities")


def _flat_curves(entity) -> list[list[tuple[float, float]]]:
    """ezdxf's own points along a LINE, ARC or LWPOLYLINE (exploded into its lines and arcs, one point list
    each), in drawing units: arcs flattened on the circle itself (ARC.flattening), so the check carries no
    approximation of its own."""
    kind = entity.dxftype()
    if kind == "LINE":
        return [[(entity.dxf.start.x, entity.dxf.start.y), (entity.dxf.end.x, entity.dxf.end.y)]]
    if kind == "ARC":
        sagitta = 1e-6 * max(entity.dxf.radius, 1e-300)
        return [[(v.x, v.y) for v in entity.flattening(sagitta)]]
    if kind == "LWPOLYLINE":
        return [c for sub in entity.virtual_entities() for c in _flat_curves(sub)]
    return []


def _piece_length(pc: Piece) -> float:
    if pc.center is None:
        return math.dist(pc.start, pc.end)
    pts = _piece_points(pc, 256)
    return sum(math.dist(a, b) for a, b in zip(pts[:-1], pts[1:]))


def chain_loops(pieces: list[Piece], tol: float, source: str) -> list[list[Piece]]:
    """Closed loops of pieces joined end to start within ``tol``."""
    remaining = list(pieces)
    loops = []

    def ends_near(p, q):
        return math.dist(p, q) <= tol

    # branches: more than two piece ends at one point
    all_ends = [(pc.start, pc) for pc in pieces] + [(pc.end, pc) for pc in pieces]
    for pt, pc in all_ends:
        n = sum(1 for q, _ in all_ends if ends_near(pt, q))
        if n > 2:
            raise CaseError(f"{n} curve ends meet at ({pt[0]:.6g}, {pt[1]:.6g}) (one of them is {pc.where}); "
                            "the outline branches there", item=source,
                            hint="each corner of a closed outline joins exactly two curves; remove doubled lines")
    while remaining:
        loop = [remaining.pop(0)]
        while not ends_near(loop[-1].end, loop[0].start):
            tip = loop[-1].end
            nxt = None
            for i, pc in enumerate(remaining):
                if ends_near(pc.start, tip):
                    nxt = remaining.pop(i)
                    break
                if ends_near(pc.end, tip):
                    nxt = remaining.pop(i).reversed()
                    break
            if nxt is None:
                cands = [(min(math.dist(tip, pc.start), math.dist(tip, pc.end)), pc) for pc in remaining]
                cands.append((math.dist(tip, loop[0].start), loop[0]))
                gap, near = min(cands, key=lambda c: c[0])
                raise CaseError(f"open chain: the end of {loop[-1].where} at ({tip[0]:.6g}, {tip[1]:.6g}) joins "
                                f"nothing; the nearest curve end ({near.where}) is {gap:.3g} away, more than the "
                                f"tolerance {tol:.3g}", item=source,
                                hint="close the gap in the drawing or raise part.dxf_tolerance if it is drawing noise")
            loop.append(nxt)
        loops.append(loop)
    return loops


def _loop_area(loop: list[Piece]) -> float:
    """Signed area of a loop, its arcs sampled at 16 points (enough to tell orientation and size)."""
    pts = []
    for pc in loop:
        if pc.center is None:
            pts.append(pc.start)
        else:
            a0 = math.atan2(pc.start[1] - pc.center[1], pc.start[0] - pc.center[0])
            a1 = math.atan2(pc.end[1] - pc.center[1], pc.end[0] - pc.center[0])
            sw = (a1 - a0) % (2 * math.pi) if pc.ccw else -((a0 - a1) % (2 * math.pi))
            for k in range(16):
                a = a0 + sw * k / 16
                pts.append((pc.center[0] + pc.radius * math.cos(a), pc.center[1] + pc.radius * math.sin(a)))
    return shoelace([p[0] for p in pts], [p[1] for p in pts])


def canonical_loop(loop: list[Piece]) -> list[Piece]:
    """The loop counter-clockwise, starting at its lowest-leftmost point: the same part drawn in either
    direction, or with its entities in another order, gives the same chain (and the same vertex numbers)."""
    if _loop_area(loop) < 0:
        loop = [pc.reversed() for pc in reversed(loop)]
    size = max(max(abs(c) for pc in loop for c in pc.start), 1e-300)
    k = min(range(len(loop)), key=lambda i: (round(loop[i].start[0] / size, 9), round(loop[i].start[1] / size, 9)))
    return loop[k:] + loop[:k]


def loop_vertices(loop: list[Piece]) -> tuple[Vertex, ...]:
    """A chain of vertices (with arc edges and layer names as edge names) for one loop, counter-clockwise
    from its lowest-leftmost point (vertex numbers name unnamed features)."""
    loop = canonical_loop(loop)
    ccw = _loop_area(loop) > 0
    out = []
    for k, pc in enumerate(loop):
        edge = pc.layer if pc.layer not in ("0", "") else None
        if pc.center is None:
            out.append(Vertex(pc.start[0], pc.start[1], edge=edge, index=k))
        else:
            out.append(Vertex(pc.start[0], pc.start[1], edge=edge, arc_radius=pc.radius,
                              bulge="out" if pc.ccw == ccw else "in", index=k))
    return tuple(out)


def drawing_texts(doc, scale: float) -> list[tuple[str, tuple[float, float]]]:
    """(text, insertion point) of every TEXT and MTEXT entity: a text inside a hole names the hole."""
    out = []
    for e in doc.modelspace().query("TEXT MTEXT"):
        try:
            text = e.plain_text() if e.dxftype() == "MTEXT" else e.dxf.text
            p = e.dxf.insert
        except Exception:  # a damaged text entity names nothing
            continue
        text = " ".join(str(text).split())
        if text:
            out.append((text, (p.x * scale, p.y * scale)))
    return out


def _named_by_text(cutouts: list[CutoutSpec], texts) -> list[CutoutSpec]:
    """Cut-outs renamed after the drawing's text placed inside them (first text wins; names stay unique)."""
    from dataclasses import replace

    from shapely.geometry import Point, Polygon

    used = {c.name for c in cutouts}
    out = []
    for c in cutouts:
        if c.shape == "circle":
            inside = lambda q, c=c: math.dist(q, c.center) < c.diameter / 2  # noqa: E731
        elif c.shape == "ellipse":
            ca, sa = math.cos(math.radians(c.angle)), math.sin(math.radians(c.angle))
            inside = lambda q, c=c, ca=ca, sa=sa: (((q[0] - c.center[0]) * ca + (q[1] - c.center[1]) * sa) / c.a) ** 2 \
                + ((-(q[0] - c.center[0]) * sa + (q[1] - c.center[1]) * ca) / c.b) ** 2 < 1  # noqa: E731
        else:
            poly = Polygon([(v.x, v.y) for v in c.vertices])
            inside = lambda q, poly=poly: poly.is_valid and poly.contains(Point(q))  # noqa: E731
        name = next((t for t, q in texts if inside(q) and t not in used), None)
        if name is not None:
            used.discard(c.name)
            used.add(name)
            c = replace(c, name=name)
        out.append(c)
    return out


def read_outline(path: str | Path, *, case_unit: str, drawing_unit: str | None = None,
                 tolerance: float | None = None) -> DxfOutline:
    """The outline and cut-outs of a DXF drawing, in the case's length unit."""
    source = str(path)
    doc = _read_doc(source)
    unit = drawing_unit
    if unit is None:
        code = doc.header.get("$INSUNITS", 0)
        unit = INSUNITS.get(code)
        if unit is None:
            raise CaseError(f"the drawing does not state a usable unit ($INSUNITS = {code})", item=source,
                            hint="set part.dxf_units = \"mm\" (or cm, m, in) in the case file")
    if unit not in MM_PER_UNIT or case_unit not in MM_PER_UNIT:
        raise CaseError(f"cannot convert the drawing unit '{unit}' to the case unit '{case_unit}'", item=source,
                        hint=f"units known for drawings: {', '.join(MM_PER_UNIT)}")
    scale = MM_PER_UNIT[unit] / MM_PER_UNIT[case_unit]
    pieces, closed = read_pieces(doc, scale, source)
    if not pieces and not closed:
        raise CaseError("the drawing has no lines, arcs, circles, polylines or ellipses", item=source)
    xs = [c for pc in pieces for c in (pc.start[0], pc.end[0])] or [0.0]
    ys = [c for pc in pieces for c in (pc.start[1], pc.end[1])] or [0.0]
    size = max(max(xs) - min(xs), max(ys) - min(ys), 1e-300)
    tol = tolerance if tolerance is not None else 1e-6 * size
    loops = chain_loops(pieces, tol, source)
    if not loops:
        raise CaseError("the drawing has no closed outline made of lines, arcs or polylines (only circles or "
                        "ellipses, which fekt reads as holes)", item=source)
    loops.sort(key=lambda lp: -abs(_loop_area(lp)))
    outline = loop_vertices(loops[0])
    cutouts = list(closed)
    for k, lp in enumerate(loops[1:], start=1):
        layers = {pc.layer for pc in lp} - {"0", ""}
        name = layers.pop() if len(layers) == 1 else f"loop {k}"
        cutouts.append(CutoutSpec(name, "chain", vertices=tuple(
            Vertex(v.x, v.y, v.fillet, None, v.arc_radius, v.bulge, index=v.index) for v in loop_vertices(lp))))
    return DxfOutline(outline, tuple(_unique_names(_named_by_text(cutouts, drawing_texts(doc, scale)))))


def _unique_names(cutouts: list[CutoutSpec]) -> list[CutoutSpec]:
    """Several holes on one layer: number them in drawing order ("bolt", "bolt 2", ...)."""
    from dataclasses import replace

    seen: dict[str, int] = {}
    out = []
    for c in cutouts:
        n = seen.get(c.name, 0) + 1
        seen[c.name] = n
        out.append(c if n == 1 else replace(c, name=f"{c.name} {n}"))
    return out
