"""The case description: frozen dataclasses holding evaluated numbers (no expressions left).

A :class:`Case` is what :func:`fekt.case.loader.load_case` returns and what every later stage
consumes. Lengths are in the case's length unit, forces in its force unit, angles in degrees.
Variants are made with :func:`dataclasses.replace`.
"""

from __future__ import annotations

from dataclasses import dataclass, field
from typing import Any, Protocol

from ..kinds import FeatureKind

# --- units ------------------------------------------------------------------------------------

#: stress unit for (length unit, force unit) pairs; anything else is reported as "force/length^2"
STRESS_UNITS = {
    ("mm", "N"): "MPa",
    ("mm", "kN"): "GPa",
    ("m", "N"): "Pa",
    ("m", "kN"): "kPa",
    ("m", "MN"): "MPa",
    ("in", "lbf"): "psi",
    ("in", "kip"): "ksi",
    ("cm", "N"): "N/cm^2",
}
LENGTH_UNITS = ("mm", "cm", "m", "in")
FORCE_UNITS = ("N", "kN", "MN", "lbf", "kip")


@dataclass(frozen=True)
class Units:
    """The case's length and force units; ``output`` optionally names the units reports show
    (``"ksi,in"``, syntax of :mod:`fekt.case.output_units`; "" = the case's own). ``output`` changes no
    computed number, so it is left out of the case's repr and hence out of its hash."""

    length: str = "mm"
    force: str = "N"
    output: str = field(default="", repr=False)

    @property
    def stress(self) -> str:
        return STRESS_UNITS.get((self.length, self.force), f"{self.force}/{self.length}^2")

    @property
    def moment(self) -> str:
        return f"{self.force}*{self.length}"


# --- geometry input -----------------------------------------------------------------------------

@dataclass(frozen=True)
class Vertex:
    """A corner of a closed chain.

    ``fillet``: corner radius (0 = sharp). ``edge``: name of the edge that starts here and runs to
    the next vertex. ``arc_radius``: if set, that edge is a circular arc of this radius, bulging
    ``"out"`` of the region the chain encloses or ``"in"`` towards it. ``feature``: the kind of notch
    feature this vertex's fillet or (concave) arc edge forms, when the generator that made the vertex
    knows better than the default (a fillet is a fillet, an inward arc edge a concave arc). ``name``:
    the user's name for the feature at this vertex (its fillet, or its arc edge); ``index``: the vertex's
    position in the chain as the case file wrote it (stable names and messages refer to it).
    """

    x: float
    y: float
    fillet: float = 0.0
    edge: str | None = None
    arc_radius: float | None = None
    bulge: str = "out"
    label: str | None = None  # names the item that made this vertex (e.g. a notch), for messages
    feature: FeatureKind | None = None
    name: str | None = None
    index: int | None = None


def shoelace(xs, ys) -> float:
    """Signed area of a closed polygon (positive when its points run counter-clockwise)."""
    n = len(xs)
    return 0.5 * sum(xs[i] * ys[(i + 1) % n] - xs[(i + 1) % n] * ys[i] for i in range(n))


def chain_signed_area(vertices) -> float:
    """Signed area of the polygon through a chain's vertices (arcs and fillets ignored)."""
    return shoelace([v.x for v in vertices], [v.y for v in vertices])


@dataclass(frozen=True)
class NotchSpec:
    """A U- or V-notch cut into a straight outline edge.

    ``position`` is the distance from the edge's start vertex to the notch centre line; ``depth`` is
    measured normal to the edge to the bottom of the root; ``angle`` is the opening angle between
    the flanks in degrees (0 = U-notch with parallel flanks).
    """

    name: str
    edge: str
    position: float
    depth: float
    root_radius: float
    angle: float = 0.0


@dataclass(frozen=True)
class CutoutSpec:
    """A hole cut out of the part.

    ``shape`` is ``circle`` (``diameter``), ``ellipse`` (``a`` along ``angle``, ``b``), ``slot``
    (obround: overall ``length`` along ``angle``, ``width``), ``rounded_rectangle`` (``length`` along
    ``angle``, ``width``, corner ``radius``) or ``chain`` (``vertices``).
    """

    name: str
    shape: str
    center: tuple[float, float] = (0.0, 0.0)
    diameter: float = 0.0
    a: float = 0.0
    b: float = 0.0
    length: float = 0.0
    width: float = 0.0
    radius: float = 0.0
    angle: float = 0.0
    vertices: tuple[Vertex, ...] = ()


@dataclass(frozen=True)
class PartSpec:
    outline: tuple[Vertex, ...]
    cutouts: tuple[CutoutSpec, ...] = ()
    notches: tuple[NotchSpec, ...] = ()
    model: str = "plane_stress"  # or "plane_strain"
    thickness: float = 1.0
    family: str | None = None  # a standard shape (fekt.families): the outline is built from ``dimensions``
    dimensions: tuple[tuple[str, float], ...] = ()


# --- material, load, mesh -----------------------------------------------------------------------

#: material groups a case may name (the groups of the FKM support factor; the values of
#: fekt.assess.material.MaterialGroup)
MATERIAL_GROUPS = ("steel", "stainless steel", "cast steel", "nodular cast iron", "malleable cast iron",
                   "grey cast iron", "wrought aluminium", "cast aluminium")
#: what a stated fatigue strength is: a polished unnotched specimen's, or corrected by the user
FATIGUE_BASES = ("specimen", "corrected")
#: the strength keys of [material] (all optional; only the assessment uses them)
STRENGTH_KEYS = ("yield_strength", "ultimate_strength", "fatigue_strength", "fatigue_basis", "peterson_a",
                 "neuber_rho", "siebel_sg", "group")


@dataclass(frozen=True)
class Material:
    """Isotropic linear elastic. Defaults are steel-like in MPa; in 2D Kt does not depend on them
    (Michell's theorem, see the docs).

    Strengths for the assessment (all optional; stresses in the case's stress unit, lengths in its length
    unit): ``yield_strength``, ``ultimate_strength``, ``fatigue_strength`` (fully reversed; of the kind
    ``fatigue_basis`` names: ``specimen`` for a polished unnotched specimen, ``corrected`` when the user
    has applied surface, size and other factors), the notch-sensitivity lengths ``peterson_a``,
    ``neuber_rho`` (rho' itself) and ``siebel_sg``, and the material ``group`` (:data:`MATERIAL_GROUPS`)."""

    E: float = 210000.0
    nu: float = 0.3
    yield_strength: float | None = None
    ultimate_strength: float | None = None
    fatigue_strength: float | None = None
    fatigue_basis: str = "specimen"
    peterson_a: float | None = None
    neuber_rho: float | None = None
    siebel_sg: float | None = None
    group: str | None = None

    @property
    def strengths_given(self) -> tuple[str, ...]:
        """The strength keys the case states (``fatigue_basis`` only when a fatigue strength is given)."""
        return tuple(k for k in STRENGTH_KEYS if k != "fatigue_basis" and getattr(self, k) is not None)


@dataclass(frozen=True)
class CycleSpec:
    """A fatigue cycle stated as factors on the case's load: the load times ``max_factor`` and times
    ``min_factor`` are the two ends of the cycle (max_factor >= min_factor). ``form`` records how the file
    gave it: ``extremes`` (max_factor, min_factor) or ``mean`` (mean_factor, alternating_factor)."""

    max_factor: float
    min_factor: float
    form: str = "extremes"
    #: the cycle between two named load cases instead (``form = "cases"``; the factors are then 1 and 1)
    max_case: str | None = None
    min_case: str | None = None

    @property
    def mean_factor(self) -> float:
        return 0.5 * (self.max_factor + self.min_factor)

    @property
    def alternating_factor(self) -> float:
        return 0.5 * (self.max_factor - self.min_factor)


#: which fatigue notch factor sets the local cycle: the largest of the methods that give one, one method,
#: or Kt itself (q = 1)
NOTCH_FACTOR_CHOICES = ("largest", "peterson", "neuber", "heywood", "fkm", "siebel_stieler", "kt")
#: the mean-stress criteria a case may ask for
CRITERIA_CHOICES = ("goodman", "gerber", "asme_elliptic", "soderberg")


@dataclass(frozen=True)
class AssessmentSpec:
    """Options of the strength and fatigue assessment (``[assessment]``)."""

    notch_factor: str = "largest"
    criteria: tuple[str, ...] = ("goodman", "gerber", "asme_elliptic")


class LoadSpec(Protocol):
    """A load as read from the case file: a frozen record of one load type (see :mod:`fekt.loads`).

    Every load type defines its own record; all of them name their type and the load, and apply
    themselves to the built part (``apply(part, model, thickness)``, see :mod:`fekt.loads.base`)."""

    kind: str
    name: str

    def apply(self, part, model, thickness): ...


@dataclass(frozen=True)
class LoadCaseSpec:
    """A named load case: every load of the case file it includes, with its factor (the others at 0)."""

    name: str
    factors: tuple[tuple[str, float], ...]


@dataclass(frozen=True)
class NominalSpec:
    """What the case states about nominal stresses: the load axis net sections are cut normal to
    (unit vector; None: from the loads), and a nominal stress the user must match (Kt = peak / stress
    for the named feature, or for every peak), instead of net-section statics."""

    axis: tuple[float, float] | None = None
    stress: float | None = None
    feature: str | None = None


@dataclass(frozen=True)
class MeshSpec:
    """Mesh controls. ``elements_per_radius``: element size at a notch feature is its radius divided
    by this; ``size``: the largest element size (default: derived from the part); ``growth``: how fast
    the size may grow with distance from a feature (size increase per unit distance)."""

    elements_per_radius: float = 16.0
    size: float | None = None
    growth: float = 0.25
    refine: int = 0  # uniform splits in gmsh after generation (nested refinement for studies)
    max_elements: int = 400_000  # refuse meshes estimated larger than this (memory and time guard)


@dataclass(frozen=True)
class Case:
    name: str
    part: PartSpec
    loads: tuple[LoadSpec, ...]
    material: Material = field(default_factory=Material)
    mesh: MeshSpec = field(default_factory=MeshSpec)
    units: Units = field(default_factory=Units)
    description: str = ""
    parameters: tuple[tuple[str, float], ...] = ()
    source: str = ""  # path of the case file, if any
    demo: bool = False
    supports: tuple[Any, ...] = ()  # support records (fekt.loads.supports)
    load_cases: tuple[LoadCaseSpec, ...] = ()  # none: one case with every load at factor 1
    nominal: NominalSpec = field(default_factory=NominalSpec)
    #: the boundary stress peaks are found by (fekt.kinds.Measure), or "auto": tangential, or principal
    #: when a load has a torque (whose tangential stress is zero); see fekt.pipeline.peak_measure
    measure: str = "auto"
    cycle: CycleSpec | None = None  # a fatigue cycle as factors on the load (only the assessment uses it)
    assessment: AssessmentSpec = field(default_factory=AssessmentSpec)
