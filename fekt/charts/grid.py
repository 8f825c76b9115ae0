"""Family cases at interior chart points (used by benchmarks/charts.py and the chart tests).

The points themselves belong to the families (:func:`fekt.families.all_grid_points`); this module turns
one into a case loaded in the family's chart convention.
"""

from __future__ import annotations

from dataclasses import replace

from ..case.schema import Case, MeshSpec, PartSpec
from ..families import REGISTRY as SHAPES
from ..families import GridPoint, all_grid_points
from ..loads.ends import EndsSpec
from ..loads.shaft_ends import ShaftEndsSpec

#: models whose family cases the default grid (the plate charts) runs through the full pipeline; shaft
#: families are run by benchmarks/shafts.py, whose post-processing computes Kt per load component
PLANE_MODELS = ("plane_stress", "plane_strain")


def default_grid() -> list[GridPoint]:
    """Interior chart points of the plate families (see :data:`PLANE_MODELS`)."""
    return [p for p in all_grid_points() if SHAPES[p.family].models[0] in PLANE_MODELS]


def shaft_grid() -> list[GridPoint]:
    """Interior chart points of the shaft families."""
    return [p for p in all_grid_points() if SHAPES[p.family].models[0] not in PLANE_MODELS]


def case_for(p: GridPoint, elements_per_radius: float | None = None) -> Case:
    model = SHAPES[p.family].models[0]
    if model in PLANE_MODELS:
        load = EndsSpec(("left", "right"), force=1000.0) if p.load == "tension" else \
            EndsSpec(("left", "right"), moment=1.0e5)
    else:
        magnitude = {"tension": {"force": 1000.0}, "bending": {"moment": 1.0e5}, "torsion": {"torque": 1.0e5}}
        load = ShaftEndsSpec(("left", "right"), **magnitude[p.load])
    mesh = MeshSpec() if elements_per_radius is None else replace(MeshSpec(), elements_per_radius=elements_per_radius)
    return Case(name=f"{p.family} {p.load} {p.label}", part=PartSpec(outline=(), family=p.family, dimensions=p.dims,
                                                                      thickness=1.0, model=model),
                loads=(load,), mesh=mesh)
