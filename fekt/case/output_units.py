"""The units a report may show, and the ``STRESS,LENGTH`` syntax that chooses them.

Read by the case loader (the optional ``[units] output`` key) and by the command line (``--units``), so
both give the same messages; conversions and number formatting are in :mod:`fekt.report.units`.

Syntax: ``STRESS,LENGTH`` -- for example ``MPa,mm`` or ``ksi,in``. The two items may come in either
order (no stress unit has the name of a length unit), spaces around them are ignored, and letter case
is not significant (``mpa,MM`` means ``MPa,mm``). One item alone sets that quantity and takes the other
one from ``default``.
"""

from __future__ import annotations

from dataclasses import dataclass

from ..errors import InputError

#: units a report may show
STRESS_UNITS = ("Pa", "kPa", "MPa", "GPa", "psi", "ksi")
LENGTH_UNITS = ("mm", "cm", "m", "in")


def check_unit(value: str, allowed: tuple[str, ...], item: str) -> None:
    if value not in allowed:
        raise InputError(f"unknown unit {value!r}; allowed: {', '.join(allowed)}", item=item)


@dataclass(frozen=True)
class OutputUnits:
    """The stress and length units a report shows. Raises :class:`InputError` for a unit not offered."""

    stress: str = "MPa"
    length: str = "mm"

    def __post_init__(self):
        check_unit(self.stress, STRESS_UNITS, "output stress unit")
        check_unit(self.length, LENGTH_UNITS, "output length unit")

    def __str__(self) -> str:
        return f"{self.stress},{self.length}"


def _canonical(word: str) -> tuple[str, str] | None:
    """('stress'|'length', canonical name) for a unit name in any letter case, else None."""
    low = word.lower()
    for kind, names in (("stress", STRESS_UNITS), ("length", LENGTH_UNITS)):
        for name in names:
            if name.lower() == low:
                return kind, name
    return None


def parse_output_units(text: str, default: OutputUnits | None = None, *, item: str = "--units") -> OutputUnits:
    """``"MPa,mm"`` / ``"ksi,in"`` / ``"psi"`` -> :class:`OutputUnits` (syntax in the module docstring).

    With one item, the other quantity comes from ``default``; without a default both must be given.
    """
    words = [w.strip() for w in str(text).split(",")]
    hint = "write STRESS,LENGTH, e.g. MPa,mm or ksi,in"
    allowed = f"stress: {', '.join(STRESS_UNITS)}; length: {', '.join(LENGTH_UNITS)}"
    if not 1 <= len(words) <= 2 or any(not w for w in words):
        raise InputError(f"expected one or two units separated by a comma, got {text!r}", item=item, hint=hint)
    chosen: dict[str, str] = {}
    for w in words:
        found = _canonical(w)
        if found is None:
            raise InputError(f"unknown unit {w!r}; allowed {allowed}", item=item, hint=hint)
        kind, name = found
        if kind in chosen:
            raise InputError(f"two {kind} units given ({chosen[kind]} and {name})", item=item, hint=hint)
        chosen[kind] = name
    missing = [k for k in ("stress", "length") if k not in chosen]
    if missing and default is None:
        raise InputError(f"no {missing[0]} unit given in {text!r}", item=item, hint=hint)
    for k in missing:
        chosen[k] = getattr(default, k)
    return OutputUnits(stress=chosen["stress"], length=chosen["length"])
