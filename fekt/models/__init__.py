"""Analysis models, one module each, and their registry.

To add a model: write one module that builds a :class:`~fekt.models.base.Model` and add it to
:data:`REGISTRY` (see DEVELOPERS.md, "Add an analysis model").
"""

from __future__ import annotations

from types import MappingProxyType

from . import axisymmetric, plane
from .base import Model, Resultants, SectionProps, Stress

REGISTRY: MappingProxyType[str, Model] = MappingProxyType({m.name: m for m in (
    plane.PLANE_STRESS,
    plane.PLANE_STRAIN,
    axisymmetric.AXISYMMETRIC,
)})

__all__ = ["REGISTRY", "Model", "Resultants", "SectionProps", "Stress"]
