"""The loads and supports of a case combined into one record for the solver and the post-processing.

The load axis (net sections are cut normal to it) is the case's stated axis (``[nominal] axis``) or else
the axis of the first load in the file: the outward normal of the second end of an end-load pair, the
normal of a single loaded end, the direction of a bolt or pin force, the principal direction of a remote
stress, the direction of a pressure's resultant (docs/conventions.md).
"""

from __future__ import annotations

import math
from collections.abc import Sequence

from ..errors import CaseError
from .base import Applied, AppliedSupport


def combine(loads: Sequence[Applied], supports: Sequence[AppliedSupport] = (),
            axis: tuple[float, float] | None = None) -> Applied:
    """One :class:`Applied` holding every component, loaded boundary, note and support of the case."""
    if not loads:
        raise CaseError("the case has no load", item="loads")
    names = [c.name for a in loads for c in a.components]
    dup = sorted({n for n in names if names.count(n) > 1})
    if dup:
        raise CaseError(f"two loads are named '{dup[0]}'", item="loads", hint="give each load its own name = ...")
    held = {b for s in supports for b in s.boundaries}
    for a in loads:
        clash = sorted(held & set(a.loaded) | held & {t.boundary for c in a.components for t in c.tractions})
        if clash:
            raise CaseError(f"'{clash[0]}' is both loaded (load '{a.name}') and supported", item="supports",
                            hint="a support holds a boundary that carries no load; support another edge or hole")
    if axis is None:
        axis = loads[0].axis
        why = f"the axis of the first load, '{loads[0].name}'"
    else:
        n = math.hypot(*axis)
        axis = (axis[0] / n, axis[1] / n)
        why = "the axis stated in [nominal]"
    notes = [n for a in loads for n in a.notes] + [n for s in supports for n in s.notes]
    if len(loads) > 1 or supports:
        notes.append(f"net sections are cut normal to the load axis ({axis[0]:.4g}, {axis[1]:.4g}) "
                     f"({math.degrees(math.atan2(axis[1], axis[0])):.4g} deg): {why}")
    refs = {a.reference for a in loads}
    return Applied(
        name="case", kind="case", components=tuple(c for a in loads for c in a.components), axis=axis,
        ends=tuple(e for a in loads for e in a.ends),
        loaded=frozenset().union(*(a.loaded for a in loads), held),
        notes=tuple(notes),
        introductions=tuple(i for a in loads for i in a.introductions) + tuple(
            i for s in supports for i in s.introductions),
        supports=tuple(supports),
        reference=loads[0].reference if len(refs) == 1 else None)
