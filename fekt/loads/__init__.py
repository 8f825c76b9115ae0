"""Load types and supports, one module each, and their registries.

To add a load type: write one module with ``KIND``, ``KEYS``, ``parse`` and ``apply`` (see
:mod:`fekt.loads.base`) and add it to :data:`REGISTRY` (DEVELOPERS.md, "Add a load type"). Supports are
registered in :data:`SUPPORTS` (type name -> module with ``KEYS``, ``parse(table, ctx, item, kind)``).
"""

from __future__ import annotations

from types import MappingProxyType

from . import bearing, end, ends, pin, pressure, remote, shaft_ends, shear, supports
from .base import Applied, AppliedSupport, Component, Introduction, LoadedEnd, Traction
from .combine import combine

REGISTRY = MappingProxyType({m.KIND: m for m in (
    ends,
    shaft_ends,
    end,
    bearing,
    pin,
    pressure,
    shear,
    remote,
)})

SUPPORTS = MappingProxyType({kind: supports for kind in supports.KINDS})

__all__ = ["REGISTRY", "SUPPORTS", "Applied", "AppliedSupport", "Component", "Introduction", "LoadedEnd",
           "Traction", "combine"]
