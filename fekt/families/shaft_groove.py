"""Round shaft of diameter D with a circumferential U-groove (depth t or root diameter d, root radius r).

Meridian section above the axis (x along the axis, y = radius), solved with the axisymmetric model. The
groove is an ordinary U-notch in the surface edge at mid-length (parallel flanks 2r apart and a
semicircular root; a circular arc of radius r when t <= r), so it takes the ordinary outline path.
"""

from __future__ import annotations

from ..case.schema import NotchSpec, Vertex
from .base import Family, GridPoint, Outline, need
from .shaft_shoulder import GRID_DIAMETER, net_over_gross

NAME = "shaft_groove"
EDGES = ("axis", "right", "surface", "left")


def depth(dims) -> float:
    """Groove depth t from either t or the root diameter d (exactly one of them)."""
    has_d, has_t = "d" in dims, "t" in dims
    need(has_d != has_t, NAME, "give either the root diameter d or the depth t of the groove (exactly one)")
    return float(dims["t"]) if has_t else (dims["D"] - dims["d"]) / 2


def build(dims: dict) -> Outline:
    D, r = dims["D"], dims["r"]
    t = depth(dims)
    need(0 < t < D / 2, NAME, f"groove depth t = {t:.6g} must be positive and less than the radius D/2 = {D / 2:.6g}"
         + (f" (root diameter d = {dims['d']:.6g}, shaft diameter D = {D:.6g})" if "d" in dims else ""))
    L = dims.get("L", 4 * D)
    need(2 * r < L, NAME, f"groove width 2r = {2 * r:.6g} does not fit in the length L = {L:.6g}")
    R = D / 2
    outline = (Vertex(0.0, 0.0, edge="axis"), Vertex(L, 0.0, edge="right"), Vertex(L, R, edge="surface"),
               Vertex(0.0, R, edge="left"))
    return Outline(outline, notches=(NotchSpec("groove", "surface", L / 2, t, r),))


def chart_dims(dims) -> dict[str, float]:
    t = depth(dims)
    return {"D": dims["D"], "d": dims["D"] - 2 * t, "r": dims["r"]}


#: (D/d, t/r) of the interior chart points (all three loads; t/r >= 1 where the shallow limit is stated)
GRID_POINTS = tuple((q, s) for q in (1.1, 1.5) for s in (1.0, 2.0, 4.0))


def grid() -> tuple[GridPoint, ...]:
    d = GRID_DIAMETER
    pts = []
    for load in ("tension", "bending", "torsion"):
        for q, s in GRID_POINTS:
            t = (q - 1) * d / 2
            pts.append(GridPoint(NAME, load, (("D", q * d), ("d", d), ("r", t / s)), f"D/d={q}, t/r={s}"))
    return tuple(pts)


FAMILY = Family(
    name=NAME,
    description="round shaft of diameter D with a circumferential U-groove at mid-length: root diameter d or "
                "depth t, root radius r (axisymmetric); length L (default 4D)",
    required=("D", "r"), optional=("d", "t", "L"), edges=EDGES, build=build,
    chart_dims=lambda d: chart_dims(d),
    net_over_gross=lambda d, load: net_over_gross(chart_dims(d), load),
    grid=grid,
    models=("axisymmetric",),
)
