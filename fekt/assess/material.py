"""Material strengths for the strength and fatigue assessment, and published estimates of missing ones.

All strengths are in the case's stress unit and all material lengths in the case's length unit.
Correlations published in MPa and mm are evaluated through a :class:`UnitScale` (MPa per stress unit,
mm per length unit), so a case in inches and psi or ksi gets the same physical numbers.

No material database: the user states the numbers. Where a value is estimated from another, the
estimate comes back with an :class:`Estimate` record that names the rule and its source.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from enum import StrEnum

from ..errors import InputError

# --- units ----------------------------------------------------------------------------------------

#: exact conversion factors (international inch 1959: 25.4 mm; pound-force: 4.4482216152605 N,
#: both exact by definition, NIST SP 811 appendix B, from memory)
MM_PER_LENGTH = {"mm": 1.0, "cm": 10.0, "m": 1000.0, "in": 25.4}
NEWTON_PER_FORCE = {"N": 1.0, "kN": 1e3, "MN": 1e6, "lbf": 4.4482216152605, "kip": 4448.2216152605}


@dataclass(frozen=True)
class UnitScale:
    """How the case's units relate to the mm and MPa in which correlations are published.

    ``mm_per_length``: millimetres per case length unit; ``mpa_per_stress``: MPa per case stress unit
    (force unit per length unit squared)."""

    mm_per_length: float
    mpa_per_stress: float

    def __post_init__(self):
        for name in ("mm_per_length", "mpa_per_stress"):
            v = getattr(self, name)
            if not (isinstance(v, (int, float)) and math.isfinite(v) and v > 0):
                raise InputError(f"{name} = {v!r} must be a positive finite number", item=f"units.{name}")


#: millimetres and MPa (N, mm)
MM_MPA = UnitScale(1.0, 1.0)


def unit_scale(length: str, force: str) -> UnitScale:
    """The :class:`UnitScale` of a case in ``length`` and ``force`` units (e.g. ``"in"``, ``"kip"``)."""
    if length not in MM_PER_LENGTH:
        raise InputError(f"length unit {length!r} is not one of {', '.join(MM_PER_LENGTH)}", item="units.length")
    if force not in NEWTON_PER_FORCE:
        raise InputError(f"force unit {force!r} is not one of {', '.join(NEWTON_PER_FORCE)}", item="units.force")
    mm = MM_PER_LENGTH[length]
    return UnitScale(mm, NEWTON_PER_FORCE[force] / (mm * mm))


# --- material ------------------------------------------------------------------------------------

class MaterialGroup(StrEnum):
    """Material groups of the FKM support factor (FKM guideline, 6th ed. 2012, from memory).

    Also decides where the steel correlations of this package apply (:data:`STEEL_GROUPS`)."""

    STEEL = "steel"                          # wrought steel other than stainless
    STAINLESS_STEEL = "stainless steel"
    CAST_STEEL = "cast steel"
    NODULAR_IRON = "nodular cast iron"
    MALLEABLE_IRON = "malleable cast iron"
    GREY_IRON = "grey cast iron"
    WROUGHT_ALUMINIUM = "wrought aluminium"
    CAST_ALUMINIUM = "cast aluminium"


#: groups to which the published steel correlations (endurance limit from Su, Peterson's a, the
#: Kuhn-Hardrath polynomials, Heywood's constants) are applied. The sources say "steels" without
#: naming kinds; leaving cast steel out (casting defects) is our own choice.
STEEL_GROUPS = frozenset({MaterialGroup.STEEL, MaterialGroup.STAINLESS_STEEL})


class FatigueBasis(StrEnum):
    """What the stated fatigue strength is."""

    SPECIMEN = "polished unnotched specimen"   # to be corrected for surface, size, ... by the user
    CORRECTED = "corrected by the user"        # already includes surface, size, reliability, ...


@dataclass(frozen=True)
class Strengths:
    """Strengths and notch-sensitivity constants of one material; every entry optional.

    Stresses in the case's stress unit, lengths in its length unit:

    * ``yield_strength`` Sy, ``ultimate_strength`` Su (tensile), ``fatigue_strength`` Se: fully
      reversed (R = -1) fatigue or endurance strength, of the kind ``fatigue_basis`` says (by default a
      polished-specimen value, so the fatigue check carries the caution that it is uncorrected);
    * ``peterson_a``: Peterson's material length a; ``neuber_rho``: Neuber's material length rho'
      (the length itself, not its square root); ``siebel_sg``: the Siebel-Stieler material length s_g;
    * ``group``: the material group (FKM support factor; the steel correlations need a steel group).

    Validated on construction: positive and finite, Sy <= Su, Se <= Su.
    """

    yield_strength: float | None = None
    ultimate_strength: float | None = None
    fatigue_strength: float | None = None
    fatigue_basis: FatigueBasis = FatigueBasis.SPECIMEN
    peterson_a: float | None = None
    neuber_rho: float | None = None
    siebel_sg: float | None = None
    group: MaterialGroup | None = None

    def __post_init__(self):
        # enum entries may come as their string values (e.g. from a case file)
        for name, enum in (("group", MaterialGroup), ("fatigue_basis", FatigueBasis)):
            v = getattr(self, name)
            if isinstance(v, str) and not isinstance(v, enum):
                try:
                    object.__setattr__(self, name, enum(v))
                except ValueError:
                    raise InputError(f"{name} = {v!r} is not one of: {', '.join(e.value for e in enum)}",
                                     item=f"material.{name}") from None
        for name in ("yield_strength", "ultimate_strength", "fatigue_strength",
                     "peterson_a", "neuber_rho", "siebel_sg"):
            v = getattr(self, name)
            if v is None:
                continue
            if isinstance(v, bool) or not isinstance(v, (int, float)) or not math.isfinite(v) or v <= 0:
                raise InputError(f"{name} = {v!r} must be a positive finite number", item=f"material.{name}")
        sy, su, se = self.yield_strength, self.ultimate_strength, self.fatigue_strength
        if sy is not None and su is not None and sy > su:
            raise InputError(f"yield_strength = {sy:g} is larger than ultimate_strength = {su:g}; "
                             "the yield strength cannot exceed the ultimate strength",
                             item="material.yield_strength", hint="check the two values and their units")
        if se is not None and su is not None and se > su:
            raise InputError(f"fatigue_strength = {se:g} is larger than ultimate_strength = {su:g}; "
                             "a fatigue strength cannot exceed the ultimate strength",
                             item="material.fatigue_strength", hint="check the two values and their units")
        if self.group is not None and not isinstance(self.group, MaterialGroup):
            raise InputError(f"group = {self.group!r} is not one of: {', '.join(g.value for g in MaterialGroup)}",
                             item="material.group")
        if not isinstance(self.fatigue_basis, FatigueBasis):
            raise InputError(f"fatigue_basis = {self.fatigue_basis!r} is not one of: "
                             f"{', '.join(b.value for b in FatigueBasis)}", item="material.fatigue_basis")


def require(strengths: Strengths, names: tuple[str, ...] | list[str], *, purpose: str) -> None:
    """Raise :class:`InputError` naming every entry of ``names`` that ``strengths`` lacks."""
    missing = [n for n in names if getattr(strengths, n) is None]
    if missing:
        listed = ", ".join(f"material.{n}" for n in missing)
        raise InputError(f"{purpose} needs {listed}, which {'is' if len(missing) == 1 else 'are'} not given",
                         item=listed, hint="state the strengths in the material table of the case")


# --- estimates -----------------------------------------------------------------------------------

class EstimateRule(StrEnum):
    """Published rules by which a missing value is estimated from another."""

    ENDURANCE_FROM_SU = "Se' = 0.5 Su up to Su = 1400 MPa, 700 MPa above (steels)"
    PETERSON_STEEL = "a = 0.0254 (2070 MPa / Su)^1.8 mm (steels)"
    KUHN_HARDRATH_BENDING = "Kuhn-Hardrath sqrt(rho') polynomial in Su, bending/axial (steels)"
    KUHN_HARDRATH_TORSION = "Kuhn-Hardrath sqrt(rho') polynomial in Su, torsion (steels)"
    HEYWOOD_STEEL = "Heywood sqrt(a') = C / Su (steels)"


@dataclass(frozen=True)
class Estimate:
    """One estimated value. ``value`` is in case units (stress or length); ``inputs`` the values it was
    estimated from, in the units the rule is published in (names say which); ``notes``: range flags."""

    quantity: str
    value: float
    rule: EstimateRule
    source: str
    from_memory: bool
    inputs: tuple[tuple[str, float], ...] = ()
    notes: tuple[str, ...] = ()


#: Budynas & Nisbett, Shigley's Mechanical Engineering Design (9th ed.), eq. 6-8 (from memory):
#: rotating-beam endurance limit of steels Se' = 0.5 Sut for Sut <= 1400 MPa (200 kpsi), else 700 MPa
ENDURANCE_RATIO = 0.5
ENDURANCE_CAP_SU_MPA = 1400.0
ENDURANCE_CAP_MPA = 700.0
ENDURANCE_SOURCE = ("Budynas & Nisbett, Shigley's Mechanical Engineering Design, 9th ed., eq. 6-8 "
                    "(from memory)")


def require_steel(group: MaterialGroup | None, *, rule: EstimateRule) -> None:
    """The steel correlations refuse any material not in :data:`STEEL_GROUPS` (and an unstated group)."""
    if group not in STEEL_GROUPS:
        raise InputError(f"group = {group.value if group else None!r}: the rule '{rule.value}' is published "
                         "for steels only", item="material.group",
                         hint="state the material constant yourself, or set group to a steel")


def estimate_fatigue_strength(ultimate_strength: float, group: MaterialGroup | None, *,
                              units: UnitScale) -> Estimate:
    """Rotating-beam (polished specimen) endurance limit of a steel from its ultimate strength.

    Se' = 0.5 Su for Su <= 1400 MPa and 700 MPa above (:data:`ENDURANCE_SOURCE`). The result is a
    specimen value: surface, size, load-type and reliability corrections are the user's."""
    require_steel(group, rule=EstimateRule.ENDURANCE_FROM_SU)
    su_mpa = ultimate_strength * units.mpa_per_stress
    notes = ()
    if su_mpa > ENDURANCE_CAP_SU_MPA:
        se_mpa = ENDURANCE_CAP_MPA
        notes = (f"Su = {su_mpa:.0f} MPa above {ENDURANCE_CAP_SU_MPA:.0f} MPa: "
                 f"capped at {ENDURANCE_CAP_MPA:.0f} MPa",)
    else:
        se_mpa = ENDURANCE_RATIO * su_mpa
    return Estimate("fatigue_strength", se_mpa / units.mpa_per_stress, EstimateRule.ENDURANCE_FROM_SU,
                    ENDURANCE_SOURCE, True, (("ultimate_strength_MPa", su_mpa),),
                    notes + ("specimen value: not corrected for surface, size, load type or reliability",))


def resolve_fatigue_strength(strengths: Strengths, *, units: UnitScale) -> tuple[float, Estimate | None]:
    """The stated fatigue strength, or else the steel estimate from the ultimate strength (with its record).

    Raises :class:`InputError` naming ``fatigue_strength`` when neither applies."""
    if strengths.fatigue_strength is not None:
        return strengths.fatigue_strength, None
    if strengths.ultimate_strength is not None and strengths.group in STEEL_GROUPS:
        est = estimate_fatigue_strength(strengths.ultimate_strength, strengths.group, units=units)
        return est.value, est
    raise InputError("the fatigue check needs material.fatigue_strength, which is not given (it can be "
                     "estimated only for a steel group with material.ultimate_strength)",
                     item="material.fatigue_strength",
                     hint="state the fatigue strength of the material (corrected for surface and size)")
