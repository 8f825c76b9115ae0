"""Flat bar stepping symmetrically from width D to width d with fillets of radius r."""

from __future__ import annotations

import math

from ..case.schema import Vertex
from ..kinds import FeatureKind
from .base import GRID_WIDTH, Family, GridPoint, Outline, need, width_ratio

NAME = "shoulder_fillet"
EDGES = ("bottom_wide", "step_bottom", "bottom_narrow", "right", "top_narrow", "step_top", "top_wide", "left")


def build(dims: dict) -> Outline:
    D, d, r = dims["D"], dims["d"], dims["r"]
    L = dims.get("L", 3 * D)
    need(d < D, NAME, f"narrow width d = {d:.6g} must be smaller than the wide width D = {D:.6g}")
    return Outline(_shoulder(D, d, r, L))


def _shoulder(D: float, d: float, r: float, L: float) -> tuple[Vertex, ...]:
    """Symmetric step from width D (x < L) to d (x > L) with fillets of radius r at the step.

    r <= h (step height): an ordinary corner fillet, tangent to the step face and the narrow edge.
    r > h: the fillet is tangent to the narrow edge and runs into the wide edge (it meets it where
    the circle crosses it), as in the handbook charts for large fillets."""
    h = (D - d) / 2
    if r <= h:
        return (Vertex(0.0, 0.0, edge="bottom_wide"), Vertex(L, 0.0, edge="step_bottom"),
                Vertex(L, h, fillet=r, edge="bottom_narrow", name="bottom"), Vertex(2 * L, h, edge="right"),
                Vertex(2 * L, h + d, edge="top_narrow"), Vertex(L, h + d, fillet=r, edge="step_top", name="top"),
                Vertex(L, D, edge="top_wide"), Vertex(0.0, D, edge="left"))
    # tangent point on the narrow edge at x = L + r; the arc's centre is at (L + r, h - r)
    run = math.sqrt(r * r - (r - h) ** 2)
    xt = L + r
    x0 = xt - run
    fillet = FeatureKind.FILLET
    return (Vertex(0.0, 0.0, edge="bottom_wide"),
            Vertex(x0, 0.0, arc_radius=r, bulge="in", feature=fillet, name="bottom"),
            Vertex(xt, h, edge="bottom_narrow"), Vertex(xt + L, h, edge="right"),
            Vertex(xt + L, h + d, edge="top_narrow"),
            Vertex(xt, h + d, arc_radius=r, bulge="in", feature=fillet, name="top"),
            Vertex(x0, D, edge="top_wide"), Vertex(0.0, D, edge="left"))


def grid() -> tuple[GridPoint, ...]:
    pts = []
    for u in (0.2, 1 / 3, 0.5):
        for q in (0.5, 1.0, 2.0, 5.0):
            D = GRID_WIDTH / (1 - u)  # d = GRID_WIDTH, h = (D - d) / 2, u = 2h/D
            h = (D - GRID_WIDTH) / 2
            pts.append(GridPoint(NAME, "tension", (("D", D), ("d", GRID_WIDTH), ("r", h / q)), f"2h/D={u:.3g}, h/r={q}"))
    return tuple(pts)


FAMILY = Family(
    name=NAME,
    description="flat bar stepping symmetrically from width D to width d with fillets of radius r; each part L "
                "long (default 3D)",
    required=("D", "d", "r"), optional=("L",), edges=EDGES, build=build,
    chart_dims=lambda d: {"D": d["D"], "d": d["d"], "r": d["r"]},
    net_over_gross=lambda d, load: width_ratio(d["d"] / d["D"], load),
    grid=grid,
)
