"""Flat bar of width H with two opposite U-notches (depth t, root radius r) at mid-length."""

from __future__ import annotations

from ..case.schema import NotchSpec
from .base import GRID_WIDTH, RECTANGLE_EDGES, Family, GridPoint, Outline, need, rectangle, width_ratio

NAME = "opposite_u_notches"


def build(d: dict) -> Outline:
    H, t, r = d["H"], d["t"], d["r"]
    L = d.get("L", 8 * H)
    need(2 * t < H, NAME, f"2 notch(es) of depth t = {t:.6g} leave no material in H = {H:.6g}")
    return Outline(rectangle(L, H), notches=(NotchSpec("top notch", "top", L / 2, t, r),
                                             NotchSpec("bottom notch", "bottom", L / 2, t, r)))


def grid() -> tuple[GridPoint, ...]:
    pts = []
    for load in ("tension", "bending"):
        for u in (0.2, 0.4, 0.6):
            for q in (0.5, 1.0, 2.0, 5.0):
                t = u * GRID_WIDTH / 2
                pts.append(GridPoint(NAME, load, (("H", GRID_WIDTH), ("t", t), ("r", t / q)), f"2t/H={u}, t/r={q}"))
    return tuple(pts)


FAMILY = Family(
    name=NAME,
    description="flat bar of width H with two opposite U-notches of depth t and root radius r at mid-length; "
                "length L (default 8H)",
    required=("H", "t", "r"), optional=("L",), edges=RECTANGLE_EDGES, build=build,
    chart_dims=lambda d: {"H": d["H"], "t": d["t"], "r": d["r"]},
    net_over_gross=lambda d, load: width_ratio((d["H"] - 2 * d["t"]) / d["H"], load),
    grid=grid,
)
