"""Plate of width W with a central elliptical hole: semi-axis a across the load, b along it."""

from __future__ import annotations

import math

from ..case.schema import CutoutSpec
from .base import RECTANGLE_EDGES, Family, GridPoint, Outline, need, rectangle, width_ratio

NAME = "elliptical_hole"
#: default plate width in semi-axes a: wide enough that the infinite-plate value is the reference
DEFAULT_WIDTH_OVER_A = 20.0


def _width(d: dict) -> float:
    return d.get("W", DEFAULT_WIDTH_OVER_A * d["a"])


def build(d: dict) -> Outline:
    a, b = d["a"], d["b"]
    W = _width(d)
    L = d.get("L", 8 * W)
    need(2 * a < W, NAME, f"the hole (2a = {2 * a:.6g}) must be narrower than the plate W = {W:.6g}")
    # a is across the load (y), b along it (x): CutoutSpec.a lies along `angle`
    return Outline(rectangle(L, W), cutouts=(CutoutSpec("hole", "ellipse", (L / 2, W / 2), a=a, b=b, angle=90.0),))


def grid() -> tuple[GridPoint, ...]:
    a = 2.0
    return tuple(GridPoint(NAME, "tension", (("a", a), ("b", a / ab), ("W", 80.0)), f"a/b={ab}, 2a/W=0.05")
                 for ab in (1.0, 2.0, 3.0))


FAMILY = Family(
    name=NAME,
    description="plate of width W (default 20a) with a central elliptical hole, semi-axis a across the load and "
                "b along it; length L (default 8W)",
    required=("a", "b"), optional=("W", "L"), edges=RECTANGLE_EDGES, build=build,
    chart_dims=lambda d: {"a": d["a"], "b": d["b"], "W": _width(d)},
    # W = inf is an infinite plate: net and gross coincide
    net_over_gross=lambda d, load: 1.0 if math.isinf(_width(d)) else width_ratio((_width(d) - 2 * d["a"]) / _width(d), load),
    grid=grid,
    holes=("hole",),
)
