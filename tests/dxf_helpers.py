"""Build DXF drawings for tests with ezdxf (no binary fixtures)."""

from __future__ import annotations

import math

import ezdxf

from fekt.geometry.model import ARC, ELLIPSE, LINE, PartGeometry


def part_to_dxf(part: PartGeometry, path, *, insunits: int = 4, scale: float = 1.0, as_polyline: bool = False) -> None:
    """Draw every segment of a built part: lines and arcs on the edge's layer (or "0"), full circles as
    CIRCLE, ellipses as ELLIPSE. ``as_polyline`` draws the outline as one LWPOLYLINE with bulges."""
    doc = ezdxf.new()
    doc.header["$INSUNITS"] = insunits
    msp = doc.modelspace()
    for li, loop in enumerate(part.loops):
        if as_polyline and li == 0 and all(s.edge is None for s in loop.segments):
            pts = []
            for s in loop.segments:
                bulge = 0.0 if s.kind == LINE else math.tan(s.sweep() / 4)
                pts.append((s.start[0] * scale, s.start[1] * scale, bulge))
            msp.add_lwpolyline(pts, format="xyb", close=True)
            continue
        for s in loop.segments:
            layer = s.edge or "0"
            if s.kind == LINE:
                msp.add_line((s.start[0] * scale, s.start[1] * scale), (s.end[0] * scale, s.end[1] * scale),
                             dxfattribs={"layer": layer})
            elif s.kind == ARC and math.isclose(abs(s.sweep()), 2 * math.pi):
                msp.add_circle((s.center[0] * scale, s.center[1] * scale), s.radius * scale, dxfattribs={"layer": layer})
            elif s.kind == ARC:
                a = math.degrees(math.atan2(s.start[1] - s.center[1], s.start[0] - s.center[0]))
                b = math.degrees(math.atan2(s.end[1] - s.center[1], s.end[0] - s.center[0]))
                if not s.ccw:
                    a, b = b, a
                msp.add_arc((s.center[0] * scale, s.center[1] * scale), s.radius * scale, a, b,
                            dxfattribs={"layer": layer})
            elif s.kind == ELLIPSE:
                major = (s.a * math.cos(s.angle) * scale, s.a * math.sin(s.angle) * scale, 0)
                msp.add_ellipse((s.center[0] * scale, s.center[1] * scale), major, s.b / s.a,
                                dxfattribs={"layer": layer})
    doc.saveas(str(path))
