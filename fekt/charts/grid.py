"""Family cases at interior chart points (used by benchmarks/charts.py and the chart tests).

The points themselves belong to the families (:func:`fekt.families.all_grid_points`); this module turns
one into a case loaded in the family's chart convention.
"""

from __future__ import annotations

from dataclasses import replace

from ..case.schema import Case, MeshSpec, PartSpec
from ..families import GridPoint, all_grid_points
from ..loads.ends import EndsSpec


def default_grid() -> list[GridPoint]:
    return all_grid_points()


def case_for(p: GridPoint, elements_per_radius: float | None = None) -> Case:
    load = EndsSpec(("left", "right"), force=1000.0) if p.load == "tension" else \
        EndsSpec(("left", "right"), moment=1.0e5)
    mesh = MeshSpec() if elements_per_radius is None else replace(MeshSpec(), elements_per_radius=elements_per_radius)
    return Case(name=f"{p.family} {p.load} {p.label}", part=PartSpec(outline=(), family=p.family, dimensions=p.dims,
                                                                      thickness=1.0),
                loads=(load,), mesh=mesh)
