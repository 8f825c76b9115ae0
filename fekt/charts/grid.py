"""Parameter grids for comparing FE with chart fits (used by benchmarks/charts.py and the tests).

Each point is a family case at interior chart parameters; dimensions are chosen from the
dimensionless ratios with a fixed reference width of 40 (Kt is scale-free).
"""

from __future__ import annotations

from dataclasses import dataclass

from ..case.schema import Case, LoadSpec, PartSpec

WIDTH = 40.0


@dataclass(frozen=True)
class GridPoint:
    family: str
    load: str
    dims: tuple[tuple[str, float], ...]
    label: str


def _point(family: str, load: str, label: str, **dims: float) -> GridPoint:
    return GridPoint(family, load, tuple(dims.items()), label)


def default_grid() -> list[GridPoint]:
    pts: list[GridPoint] = []
    for x in (0.1, 0.2, 0.3, 0.4, 0.5, 0.6, 0.7):
        pts.append(_point("strip_hole", "tension", f"d/W={x}", W=WIDTH, d=x * WIDTH))
    for load in ("tension", "bending"):
        for u in (0.2, 0.4, 0.6):
            for q in (0.5, 1.0, 2.0, 5.0):
                t = u * WIDTH / 2
                pts.append(_point("opposite_u_notches", load, f"2t/H={u}, t/r={q}", H=WIDTH, t=t, r=t / q))
    for u in (0.2, 1 / 3, 0.5):
        for q in (0.5, 1.0, 2.0, 5.0):
            D = WIDTH / (1 - u)  # d = WIDTH, h = (D - d) / 2, u = 2h/D
            h = (D - WIDTH) / 2
            pts.append(_point("shoulder_fillet", "tension", f"2h/D={u:.3g}, h/r={q}", D=D, d=WIDTH, r=h / q))
    for ab in (1.0, 2.0, 3.0):
        a = 2.0
        pts.append(_point("elliptical_hole", "tension", f"a/b={ab}, 2a/W=0.05", a=a, b=a / ab, W=80.0))
    return pts


def case_for(p: GridPoint, elements_per_radius: float | None = None) -> Case:
    from dataclasses import replace

    from ..case.schema import MeshSpec

    load = LoadSpec(("left", "right"), force=1000.0) if p.load == "tension" else \
        LoadSpec(("left", "right"), moment=1.0e5)
    mesh = MeshSpec() if elements_per_radius is None else replace(MeshSpec(), elements_per_radius=elements_per_radius)
    return Case(name=f"{p.family} {p.load} {p.label}", part=PartSpec(outline=(), family=p.family, dimensions=p.dims,
                                                                      thickness=1.0),
                load=load, mesh=mesh)
