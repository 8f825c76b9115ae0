"""Standard shapes from handbook dimensions, expanded into an ordinary outline.

Each family produces a plain :class:`PartSpec` (vertices, notches, cut-outs), so standard shapes go
through exactly the same geometry, mesh and solve path as any free outline. Load axis x; loaded ends
"left" (x = 0) and "right". Default lengths keep the loaded ends several widths from the notch
(Saint-Venant; references 1.4 suggest at least 2-3 W, we use 4 W each side).
"""

from __future__ import annotations

import math
from dataclasses import replace

from ..case.schema import FAMILIES, CutoutSpec, NotchSpec, PartSpec, Vertex
from ..errors import GeometryError


def _rect(L: float, W: float) -> tuple[Vertex, ...]:
    return (Vertex(0.0, 0.0, edge="bottom"), Vertex(L, 0.0, edge="right"), Vertex(L, W, edge="top"),
            Vertex(0.0, W, edge="left"))


def _need(cond: bool, family: str, message: str) -> None:
    if not cond:
        raise GeometryError(message, item=f"part.dimensions ({family})")


def expand_family(spec: PartSpec) -> PartSpec:
    """The outline of a family part; a spec without a family is returned unchanged."""
    if spec.family is None:
        return spec
    if spec.family not in FAMILIES:
        raise GeometryError(f"unknown family '{spec.family}'", item="part.family",
                            hint=f"one of {', '.join(FAMILIES)}")
    d = dict(spec.dimensions)
    f = spec.family
    for k in FAMILIES[f].required:
        _need(k in d and d[k] > 0, f, f"{k} must be given and positive")
    if f == "strip_hole":
        W, dia = d["W"], d["d"]
        L = d.get("L", 8 * W)
        _need(dia < W, f, f"hole diameter d = {dia:.6g} must be smaller than the width W = {W:.6g}")
        return replace(spec, outline=_rect(L, W), cutouts=(CutoutSpec("hole", "circle", (L / 2, W / 2), diameter=dia),))
    if f in ("opposite_u_notches", "single_u_notch"):
        H, t, r = d["H"], d["t"], d["r"]
        L = d.get("L", 8 * H)
        n = 2 if f == "opposite_u_notches" else 1
        _need(n * t < H, f, f"{n} notch(es) of depth t = {t:.6g} leave no material in H = {H:.6g}")
        notches = [NotchSpec("top notch", "top", L / 2, t, r)]
        if n == 2:
            notches.append(NotchSpec("bottom notch", "bottom", L / 2, t, r))
        return replace(spec, outline=_rect(L, H), notches=tuple(notches))
    if f == "shoulder_fillet":
        D, dn, r = d["D"], d["d"], d["r"]
        L = d.get("L", 3 * D)
        _need(dn < D, f, f"narrow width d = {dn:.6g} must be smaller than the wide width D = {D:.6g}")
        return replace(spec, outline=_shoulder(D, dn, r, L))
    if f == "elliptical_hole":
        a, b = d["a"], d["b"]
        W = d.get("W", 20 * a)
        L = d.get("L", 8 * W)
        _need(2 * a < W, f, f"the hole (2a = {2 * a:.6g}) must be narrower than the plate W = {W:.6g}")
        # a is across the load (y), b along it (x): CutoutSpec.a lies along `angle`
        return replace(spec, outline=_rect(L, W),
                       cutouts=(CutoutSpec("hole", "ellipse", (L / 2, W / 2), a=a, b=b, angle=90.0),))
    raise GeometryError(f"family '{f}' has no builder", item="part.family")  # pragma: no cover


def _shoulder(D: float, d: float, r: float, L: float) -> tuple[Vertex, ...]:
    """Symmetric step from width D (x < L) to d (x > L) with fillets of radius r at the step.

    r <= h (step height): an ordinary corner fillet, tangent to the step face and the narrow edge.
    r > h: the fillet is tangent to the narrow edge and runs into the wide edge (it meets it where
    the circle crosses it), as in the handbook charts for large fillets."""
    h = (D - d) / 2
    if r <= h:
        return (Vertex(0.0, 0.0, edge="bottom_wide"), Vertex(L, 0.0, edge="step_bottom"),
                Vertex(L, h, fillet=r, edge="bottom_narrow"), Vertex(2 * L, h, edge="right"),
                Vertex(2 * L, h + d, edge="top_narrow"), Vertex(L, h + d, fillet=r, edge="step_top"),
                Vertex(L, D, edge="top_wide"), Vertex(0.0, D, edge="left"))
    # tangent point on the narrow edge at x = L + r; the arc's centre is at (L + r, h - r)
    run = math.sqrt(r * r - (r - h) ** 2)
    xt = L + r
    x0 = xt - run
    return (Vertex(0.0, 0.0, edge="bottom_wide"), Vertex(x0, 0.0, arc_radius=r, bulge="in", label="fillet bottom"),
            Vertex(xt, h, edge="bottom_narrow"), Vertex(xt + L, h, edge="right"),
            Vertex(xt + L, h + d, edge="top_narrow"), Vertex(xt, h + d, arc_radius=r, bulge="in", label="fillet top"),
            Vertex(x0, D, edge="top_wide"), Vertex(0.0, D, edge="left"))
