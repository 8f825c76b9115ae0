"""Standard shapes (families) from handbook dimensions: one module per shape, one registry.

To add a shape: write one module with a :class:`~fekt.families.base.Family` record named ``FAMILY``
and add it to :data:`REGISTRY` below (see DEVELOPERS.md, "Add a standard shape").
"""

from __future__ import annotations

from dataclasses import replace
from types import MappingProxyType

from ..case.schema import PartSpec
from ..errors import GeometryError
from . import (elliptical_hole, opposite_u_notches, shaft_groove, shaft_shoulder, shoulder_fillet, single_u_notch,
               strip_hole)
from .base import ENDS, Family, GridPoint, Outline, need

REGISTRY: MappingProxyType[str, Family] = MappingProxyType({f.name: f for f in (
    strip_hole.FAMILY,
    opposite_u_notches.FAMILY,
    single_u_notch.FAMILY,
    shoulder_fillet.FAMILY,
    elliptical_hole.FAMILY,
    shaft_shoulder.FAMILY,
    shaft_groove.FAMILY,
)})


def expand_family(spec: PartSpec) -> PartSpec:
    """The outline of a family part; a spec without a family is returned unchanged."""
    if spec.family is None:
        return spec
    family = REGISTRY.get(spec.family)
    if family is None:
        raise GeometryError(f"unknown family '{spec.family}'", item="part.family",
                            hint=f"one of {', '.join(REGISTRY)}")
    d = dict(spec.dimensions)
    for k in family.required:
        need(k in d and d[k] > 0, family.name, f"{k} must be given and positive")
    built = family.build(d)
    return replace(spec, outline=built.vertices, cutouts=built.cutouts, notches=built.notches)


def all_grid_points() -> list[GridPoint]:
    """Every family's interior chart points, in registry order."""
    return [p for f in REGISTRY.values() for p in f.grid()]


__all__ = ["ENDS", "REGISTRY", "Family", "GridPoint", "Outline", "all_grid_points", "expand_family"]
