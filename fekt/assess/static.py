"""Static check of a stress against the yield strength: the elastic peak and the net-section stress.

Safety factor n = Sy / |sigma|. ``sigma`` is the stress to compare with uniaxial yield: at a free edge
of a plate the peak is uniaxial (the tangential stress); for a shear peak pass the von Mises equivalent
sqrt(3) |tau|.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from enum import StrEnum

from ..errors import InputError
from .material import Strengths, require

#: printed beside every static peak check (common practice, no single source)
STATIC_PEAK_NOTE = ("For a ductile material local yielding redistributes a static elastic peak, so the "
                    "peak check is conservative; the net-section check then governs (common practice).")


class StaticKind(StrEnum):
    PEAK = "peak stress"
    NET_SECTION = "net-section stress"


@dataclass(frozen=True)
class StaticCheck:
    """``factor`` = ``yield_strength`` / |``stress``| (None with ``reason`` when the stress is 0)."""

    kind: StaticKind
    stress: float
    yield_strength: float
    factor: float | None
    note: str | None = None
    reason: str | None = None


def yield_factor(stress: float, yield_strength: float) -> float | None:
    """Sy / |sigma|; None when sigma = 0."""
    return yield_strength / abs(stress) if stress != 0 else None


def _check(kind: StaticKind, stress: float, strengths: Strengths, note: str | None) -> StaticCheck:
    if isinstance(stress, bool) or not isinstance(stress, (int, float)) or not math.isfinite(stress):
        raise InputError(f"{kind.value} = {stress!r} must be a finite number", item=kind.value)
    require(strengths, ("yield_strength",), purpose=f"The static check of the {kind.value}")
    sy = strengths.yield_strength
    n = yield_factor(stress, sy)
    return StaticCheck(kind, float(stress), sy, n, note, None if n is not None else "zero stress")


def static_peak_check(peak_stress: float, strengths: Strengths, *, singular: bool = False) -> StaticCheck:
    """Yield safety factor of an elastic peak stress, with :data:`STATIC_PEAK_NOTE`.

    A singular corner gets no factor (its elastic peak depends on the mesh, not on the part)."""
    check = _check(StaticKind.PEAK, peak_stress, strengths, STATIC_PEAK_NOTE)
    if singular:
        return StaticCheck(check.kind, check.stress, check.yield_strength, None, STATIC_PEAK_NOTE,
                           "singular corner: the elastic peak grows without bound under mesh refinement")
    return check


def net_section_check(net_stress: float, strengths: Strengths) -> StaticCheck:
    """Yield safety factor of the largest nominal stress on the net section."""
    return _check(StaticKind.NET_SECTION, net_stress, strengths, None)
