"""Flat bar of width H with one U-notch (depth t, root radius r) in its top edge at mid-length."""

from __future__ import annotations

from ..case.schema import NotchSpec
from .base import RECTANGLE_EDGES, Family, Outline, need, rectangle, width_ratio

NAME = "single_u_notch"


def build(d: dict) -> Outline:
    H, t, r = d["H"], d["t"], d["r"]
    L = d.get("L", 8 * H)
    need(t < H, NAME, f"1 notch(es) of depth t = {t:.6g} leave no material in H = {H:.6g}")
    return Outline(rectangle(L, H), notches=(NotchSpec("top notch", "top", L / 2, t, r),))


FAMILY = Family(
    name=NAME,
    description="flat bar of width H with one U-notch (depth t, root radius r) in the top edge at mid-length; "
                "length L (default 8H)",
    required=("H", "t", "r"), optional=("L",), edges=RECTANGLE_EDGES, build=build,
    chart_dims=lambda d: {"H": d["H"], "t": d["t"], "r": d["r"]},
    net_over_gross=lambda d, load: width_ratio((d["H"] - d["t"]) / d["H"], load),
    grid=lambda: (),  # no transcribed chart (see fekt.charts.fits gaps)
)
