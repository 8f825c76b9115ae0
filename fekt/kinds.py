"""The kinds fekt distinguishes, as enums set where a thing is created (never parsed from a label).

``StrEnum`` members compare equal to their string values, so JSON output stays plain text.
This module sits at the bottom of the package (like :mod:`fekt.errors`): every stage may import it.
"""

from __future__ import annotations

from enum import StrEnum


class CurveKind(StrEnum):
    """Shape of one boundary curve."""

    LINE = "line"
    ARC = "arc"
    ELLIPSE = "ellipse"


class LoopKind(StrEnum):
    OUTLINE = "outline"
    CUTOUT = "cutout"


class FeatureKind(StrEnum):
    """What made a place of stress concentration. ``EDGE`` is a peak that belongs to no notch feature."""

    HOLE = "hole"
    CUTOUT = "cutout"
    NOTCH = "notch"
    FILLET = "fillet"
    CONCAVE_ARC = "concave_arc"
    SHARP_CORNER = "sharp_corner"
    EDGE = "edge"


class PeakReason(StrEnum):
    """Why a boundary point was reported as a stress peak."""

    LOCAL = "local maximum"
    FEATURE = "feature maximum"
    OVERALL = "overall maximum"
    CORNER = "corner"


class Measure(StrEnum):
    """The boundary stress that peaks are found and ranked by (signed; see fekt.post.measures)."""

    TANGENTIAL = "tangential"
    MAX_PRINCIPAL = "max_principal"
    MIN_PRINCIPAL = "min_principal"
    PRINCIPAL = "principal"
    VON_MISES = "von_mises"


class EquilibriumMode(StrEnum):
    """What a failed net-section equilibrium check does."""

    FAIL = "fail"
    WARN = "warn"
    OFF = "off"


class Basis(StrEnum):
    """Which section a nominal stress (and so a Kt) refers to."""

    NET = "net"
    GROSS = "gross"


class Verdict(StrEnum):
    """How a Kt behaves under mesh refinement."""

    MONOTONE = "monotone"
    OSCILLATORY = "oscillatory"
    DIVERGING = "diverging"
    CONVERGED = "converged"
    SCATTER = "scatter"
    SINGULAR = "singular"
    NOT_REFINED = "not refined"
    UNTRACKED = "untracked"
    TWO_GRID = "two-grid"


__all__ = ["Basis", "CurveKind", "EquilibriumMode", "FeatureKind", "LoopKind", "Measure", "PeakReason", "Verdict"]
