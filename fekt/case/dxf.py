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
    h = r * math.cos(sweep / 2)  # signed distance from chord midpoint to centre, to the left of travel
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
    directly (they are closed loops by themselves)."""
    path = source  # noqa: F841 (messages name the file)
    pieces: list[Piece] = []
    closed: list[CutoutSpec] = []
    for e in doc.modelspace():
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
    return pieces, closed


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


def loop_vertices(loop: list[Piece]) -> tuple[Vertex, ...]:
    """A chain of vertices (with arc edges and layer names as edge names) for one loop."""
    ccw = _loop_area(loop) > 0
    out = []
    for pc in loop:
        edge = pc.layer if pc.layer not in ("0", "") else None
        if pc.center is None:
            out.append(Vertex(pc.start[0], pc.start[1], edge=edge))
        else:
            out.append(Vertex(pc.start[0], pc.start[1], edge=edge, arc_radius=pc.radius,
                              bulge="out" if pc.ccw == ccw else "in"))
    return tuple(out)


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
        cutouts.append(CutoutSpec(f"loop {k}", "chain", vertices=tuple(
            Vertex(v.x, v.y, v.fillet, None, v.arc_radius, v.bulge) for v in loop_vertices(lp))))
    return DxfOutline(outline, tuple(cutouts))
