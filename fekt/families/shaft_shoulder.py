"""Round shaft stepping from diameter D to diameter d with a shoulder fillet of radius r (meridian section).

The part is drawn as its meridian section above the axis (x along the axis, y = radius), solved with the
axisymmetric model: wide part x in [0, L], narrow part beyond the step, loaded at the end faces "left"
and "right".
"""

from __future__ import annotations

import math

from ..case.schema import Vertex
from ..kinds import FeatureKind
from .base import Family, GridPoint, Outline, need

NAME = "shaft_shoulder"
EDGES = ("axis", "right", "surface_narrow", "step", "surface_wide", "left")
#: reference narrow diameter of grid points (Kt is scale-free)
GRID_DIAMETER = 20.0


def build(dims: dict) -> Outline:
    D, d, r = dims["D"], dims["d"], dims["r"]
    need(d < D, NAME, f"narrow diameter d = {d:.6g} must be smaller than the wide diameter D = {D:.6g}")
    L = dims.get("L", 2 * D)
    return Outline(_meridian(D / 2, d / 2, r, L))


def _meridian(R: float, a: float, r: float, L: float) -> tuple[Vertex, ...]:
    """Step from radius R (x < L) to a (x > L) with a fillet of radius r centred at (L + r, a + r).

    r <= h = R - a: an ordinary corner fillet, tangent to the step face and the narrow surface.
    r > h: the fillet is tangent to the narrow surface and runs into the wide surface, where the circle
    crosses it (as in the handbook charts for large fillets)."""
    h = R - a
    if r <= h:
        return (Vertex(0.0, 0.0, edge="axis"), Vertex(2 * L, 0.0, edge="right"),
                Vertex(2 * L, a, edge="surface_narrow"), Vertex(L, a, fillet=r, edge="step"),
                Vertex(L, R, edge="surface_wide"), Vertex(0.0, R, edge="left"))
    xt = L + r
    x0 = xt - math.sqrt(r * r - (r - h) ** 2)
    return (Vertex(0.0, 0.0, edge="axis"), Vertex(xt + L, 0.0, edge="right"),
            Vertex(xt + L, a, edge="surface_narrow"),
            Vertex(xt, a, arc_radius=r, bulge="in", label="fillet", feature=FeatureKind.FILLET),
            Vertex(x0, R, edge="surface_wide"), Vertex(0.0, R, edge="left"))


#: (D/d, r/d) of the interior chart points; torsion only where its fit's range 0.25 <= t/r <= 4 holds
GRID_BENDING_TENSION = tuple((q, s) for q in (1.2, 1.5, 2.0) for s in (0.05, 0.1, 0.2))
GRID_TORSION = ((1.2, 0.05), (1.2, 0.1), (1.2, 0.2), (1.5, 0.1), (1.5, 0.2), (2.0, 0.2))


def grid() -> tuple[GridPoint, ...]:
    d = GRID_DIAMETER
    pts = []
    for load, pairs in (("tension", GRID_BENDING_TENSION), ("bending", GRID_BENDING_TENSION),
                        ("torsion", GRID_TORSION)):
        for q, s in pairs:
            pts.append(GridPoint(NAME, load, (("D", q * d), ("d", d), ("r", s * d)), f"D/d={q}, r/d={s}"))
    return tuple(pts)


def net_over_gross(dims, load: str) -> float:
    """Nominal-stress ratio gross/net of a round bar: (d/D)^2 in tension (4F/(pi d^2)), (d/D)^3 in
    bending (32M/(pi d^3)) and torsion (16T/(pi d^3)) (handbook practice; from memory)."""
    return (dims["d"] / dims["D"]) ** (2 if load == "tension" else 3)


FAMILY = Family(
    name=NAME,
    description="round shaft stepping from diameter D to d with a shoulder fillet of radius r (axisymmetric); "
                "each part L long (default 2D)",
    required=("D", "d", "r"), optional=("L",), edges=EDGES, build=build,
    chart_dims=lambda d: {"D": d["D"], "d": d["d"], "r": d["r"]},
    net_over_gross=net_over_gross,
    grid=grid,
    models=("axisymmetric",),
)
