"""What a standard shape is: its handbook dimensions, the outline it builds, its chart parameters.

A standard shape (a *family*) is described by the dimensions a handbook chart uses. Each family is one
module of this package with one :class:`Family` record; :data:`fekt.families.REGISTRY` lists them.
A family builds an ordinary outline (vertices, notches, cut-outs), so standard shapes take exactly the
same geometry, mesh and solve path as any free outline.
"""

from __future__ import annotations

from collections.abc import Callable, Mapping
from dataclasses import dataclass

from ..case.schema import CutoutSpec, NotchSpec, Vertex
from ..errors import GeometryError

#: the loaded ends of every family part (load axis x, from "left" to "right")
ENDS = ("left", "right")


@dataclass(frozen=True)
class Outline:
    """What a family builds: an outline chain with its notches and cut-outs."""

    vertices: tuple[Vertex, ...]
    cutouts: tuple[CutoutSpec, ...] = ()
    notches: tuple[NotchSpec, ...] = ()


@dataclass(frozen=True)
class GridPoint:
    """An interior point of a family's chart, for FE-versus-chart tests and benchmarks."""

    family: str
    load: str
    dims: tuple[tuple[str, float], ...]
    label: str


@dataclass(frozen=True)
class Family:
    """One standard shape.

    ``required``/``optional``: dimension names (the handbook's own letters); ``edges``: the outline edge
    names the shape creates (loads and notches refer to them; the loaded ends are :data:`ENDS`);
    ``build(dims)`` returns the outline, raising :class:`GeometryError` for dimensions that describe no
    part; ``chart_dims(dims)`` gives the dimensions a chart fit of this family takes;
    ``net_over_gross(dims, load)`` the ratio of the gross to the net nominal stress (``None`` where the
    shape has no gross section); ``grid()`` interior chart points for tests and benchmarks.
    """

    name: str
    description: str
    required: tuple[str, ...]
    optional: tuple[str, ...]
    edges: tuple[str, ...]
    build: Callable[[Mapping[str, float]], Outline]
    chart_dims: Callable[[Mapping[str, float]], dict[str, float]]
    net_over_gross: Callable[[Mapping[str, float], str], float | None]
    grid: Callable[[], tuple[GridPoint, ...]]
    models: tuple[str, ...] = ("plane_stress", "plane_strain")
    ends: tuple[str, str] = ENDS
    holes: tuple[str, ...] = ()  # names of the cut-outs the shape creates (loads and supports refer to them)


def need(cond: bool, family: str, message: str) -> None:
    """A dimension rule of a family: raise a GeometryError naming the family when it is broken."""
    if not cond:
        raise GeometryError(message, item=f"part.dimensions ({family})")


def rectangle(L: float, W: float) -> tuple[Vertex, ...]:
    """The plain bar [0, L] x [0, W] with edges bottom, right, top, left."""
    return (Vertex(0.0, 0.0, edge="bottom"), Vertex(L, 0.0, edge="right"), Vertex(L, W, edge="top"),
            Vertex(0.0, W, edge="left"))


RECTANGLE_EDGES = ("bottom", "right", "top", "left")

#: reference width of grid points (Kt is scale-free; any width gives the same ratios)
GRID_WIDTH = 40.0


def width_ratio(net_over_gross_width: float, load: str) -> float:
    """Nominal-stress ratio gross/net of a flat bar: the width ratio to the power 1 in tension (P/(h w))
    and 2 in in-plane bending (6M/(h w^2)) (handbook practice; from memory)."""
    return net_over_gross_width ** (1 if load == "tension" else 2)
