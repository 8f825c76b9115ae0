"""Load types, one module each, and their registry.

To add a load type: write one module with ``KIND``, ``KEYS``, ``parse`` and ``apply`` (see
:mod:`fekt.loads.base`) and add it to :data:`REGISTRY` (DEVELOPERS.md, "Add a load type").
"""

from __future__ import annotations

from types import MappingProxyType

from . import ends, shaft_ends
from .base import Applied, Component, LoadedEnd, Traction

REGISTRY = MappingProxyType({m.KIND: m for m in (
    ends,
    shaft_ends,
)})

__all__ = ["REGISTRY", "Applied", "Component", "LoadedEnd", "Traction"]
