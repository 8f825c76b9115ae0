"""Flat bar of width W with a central circular hole of diameter d (load along the bar)."""

from __future__ import annotations

from ..case.schema import CutoutSpec
from .base import GRID_WIDTH, RECTANGLE_EDGES, Family, GridPoint, Outline, need, rectangle, width_ratio

NAME = "strip_hole"


def build(d: dict) -> Outline:
    W, dia = d["W"], d["d"]
    L = d.get("L", 8 * W)
    need(dia < W, NAME, f"hole diameter d = {dia:.6g} must be smaller than the width W = {W:.6g}")
    return Outline(rectangle(L, W), cutouts=(CutoutSpec("hole", "circle", (L / 2, W / 2), diameter=dia),))


def grid() -> tuple[GridPoint, ...]:
    return tuple(GridPoint(NAME, "tension", (("W", GRID_WIDTH), ("d", x * GRID_WIDTH)), f"d/W={x}")
                 for x in (0.1, 0.2, 0.3, 0.4, 0.5, 0.6, 0.7))


FAMILY = Family(
    name=NAME,
    description="flat bar of width W with a central circular hole of diameter d; length L (default 8W)",
    required=("W", "d"), optional=("L",), edges=RECTANGLE_EDGES, build=build,
    chart_dims=lambda d: {"d": d["d"], "W": d["W"]},
    net_over_gross=lambda d, load: width_ratio((d["W"] - d["d"]) / d["W"], load),
    grid=grid,
    holes=("hole",),
)
