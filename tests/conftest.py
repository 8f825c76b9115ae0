"""Shared builders for test cases (plain dataclasses; no case files needed)."""

from __future__ import annotations

import numpy as np
import pytest

from fekt.kinds import FeatureKind
from fekt.case.schema import Case, CutoutSpec, Material, MeshSpec, PartSpec, Vertex
from fekt.geometry.build import build_part
from fekt.loads.base import Component, Traction
from fekt.loads.ends import EndsSpec as LoadSpec
from fekt.mesh.build import mesh_part
from fekt.models import REGISTRY as MODELS
from fekt.models.base import Resultants
from fekt.post.fields import boundary_samples
from fekt.solver.linear import solve


def traction_component(boundaries, fn, name="test traction") -> Component:
    """A load component of given tractions on named boundaries (statics not needed by the caller)."""
    return Component(name, name, "stress", 1.0, "in-plane", tuple(Traction(b, fn) for b in boundaries),
                     lambda section: Resultants())


def rect_outline(L: float, W: float, x0: float = 0.0, y0: float = 0.0) -> tuple[Vertex, ...]:
    return (Vertex(x0, y0, edge="bottom"), Vertex(x0 + L, y0, edge="right"),
            Vertex(x0 + L, y0 + W, edge="top"), Vertex(x0, y0 + W, edge="left"))


def strip_case(W=40.0, L=320.0, d=12.0, *, x0=0.0, y0=0.0, force=1000.0, moment=0.0, model="plane_stress",
               nu=0.3, E=210000.0, mesh=None, thickness=5.0, notches=(), extra_cutouts=()) -> Case:
    cut = (CutoutSpec("hole", "circle", (x0 + L / 2, y0 + W / 2), diameter=d),) if d else ()
    return Case(name="strip", part=PartSpec(outline=rect_outline(L, W, x0, y0), cutouts=cut + tuple(extra_cutouts),
                                            notches=tuple(notches), model=model, thickness=thickness),
                loads=(LoadSpec(("left", "right"), force=force, moment=moment),),
                material=Material(E=E, nu=nu), mesh=mesh or MeshSpec())


def kirsch_solution(elements_per_radius=None, refine=0, half_width=10.0, E=1.0, nu=0.3, model="plane_stress"):
    """Square plate [-L, L]^2 with a unit-radius hole; the exact Kirsch traction (S = 1) on all four edges."""
    from fekt.exact import kirsch_traction

    L = half_width
    spec = PartSpec(outline=rect_outline(2 * L, 2 * L, -L, -L),
                    cutouts=(CutoutSpec("h", "circle", (0.0, 0.0), diameter=2.0),), model=model)
    part = build_part(spec)
    ms = MeshSpec(refine=refine) if elements_per_radius is None else MeshSpec(
        elements_per_radius=elements_per_radius, refine=refine)
    pm = mesh_part(part, ms)
    sol = solve(pm, MODELS[model], E, nu, [traction_component(("bottom", "right", "top", "left"), kirsch_traction())])
    b = boundary_samples(sol, pm, part)
    return part, pm, sol, b


def kirsch_level(epr: float, h: float):
    """One level of a refinement study of the Kirsch case: its peak as a tracked stress-peak sample."""
    from fekt.post.peaks import local_scatter
    from fekt.studies.convergence import Level, Sample

    _, pm, sol, b = kirsch_solution(elements_per_radius=epr)
    m = np.where(b.loop == 1)[0]
    i = int(m[np.argmax(b.s1[m])])
    s = Sample("hole", float(b.xy[0, i]), float(abs(b.xy[1, i])), float(b.s1[i]), kind=FeatureKind.HOLE,
               scatter=local_scatter(b, i))
    return Level(MeshSpec(elements_per_radius=epr), pm.n_elements, sol.ndofs, h, 0.0, (s,))


@pytest.fixture(scope="session")
def kirsch_default():
    return kirsch_solution()


def asymmetric_strip(sign: float = 1.0, force: float = 1000.0, moment: float = 0.0, extra: str = "",
                     elements_per_radius: float = 8) -> str:
    """Case text: a strip 320 x 40 with one edge U-notch (depth 6, r = 2) and an off-centre hole (d = 8);
    ``sign`` = -1 draws it mirrored (y -> -y, so the outline runs clockwise). ``extra``: more TOML."""
    pts = [(0, 0, "bottom"), (320, 0, "right"), (320, 40, "top"), (0, 40, "left")]
    outline = ", ".join(f'{{ x = {x}, y = {sign * y}, edge = "{e}" }}' for x, y, e in pts)
    return f"""
[part]
thickness = 5
outline = [ {outline} ]
[[part.cutouts]]
name = "hole"
shape = "circle"
center = [140, {sign * 24}]
diameter = 8
[[part.notches]]
name = "notch"
edge = "top"
position = 140
depth = 6
root_radius = 2
[load]
ends = ["left", "right"]
force = {force}
moment = {moment}
[mesh]
elements_per_radius = {elements_per_radius}
{extra}
"""
