"""The default catalogue: every analysis model, load type and standard shape fekt knows.

The case layer reads files against a :class:`fekt.case.fields.Catalogue` that its caller passes in;
this module builds the one fekt uses, from the three registries further down the data flow.
"""

from __future__ import annotations

from types import MappingProxyType

from .case.fields import Catalogue, ModelInfo
from .families import REGISTRY as FAMILIES
from .loads import REGISTRY as LOADS
from .models import REGISTRY as MODELS

CATALOGUE = Catalogue(
    models=MappingProxyType({m.name: ModelInfo(m.name, m.needs_thickness, m.default_load, m.has_thickness)
                              for m in MODELS.values()}),
    loads=LOADS,
    families=FAMILIES,
)

__all__ = ["CATALOGUE", "FAMILIES", "LOADS", "MODELS"]
