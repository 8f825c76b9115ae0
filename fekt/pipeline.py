"""One case through every stage: geometry -> mesh -> solve -> hot spots, net sections, Kt.

No numerics of its own: it wires the stages, times them and records provenance.
"""

from __future__ import annotations

import dataclasses
import hashlib
import math
import time
from dataclasses import dataclass, field

import numpy as np

from .case.schema import Case
from .geometry.build import build_part
from .geometry.model import PartGeometry
from .geometry.sections import Section, net_section, part_polygon, section_at, transverse
from .mesh.build import PartMesh, mesh_part
from .post.fields import BoundarySamples, boundary_samples
from .post.hotspots import find_hot_spots
from .post.kt import check_equilibrium, gross_section, kt, nominal_stress, require_equilibrium
from .solver.elasticity import ElasticSolution, solve_elasticity
from .solver.loads import LoadState, build_loads, traction_loads

EDGE_MARGIN = 0.05

CAUTION = ("Linear-elastic, 2D idealisation of the part as described; peak stresses assume small strains "
           "and no yielding. Check the numbers against the applicable design codes and licensed "
           "engineering practice before sizing a part with them.")


@dataclass(frozen=True)
class SectionInfo:
    s: float
    width: float
    area: float
    centroid: tuple[float, float]
    inertia: float
    intervals: tuple[tuple[float, float], ...]

    @classmethod
    def of(cls, sec: Section) -> "SectionInfo":
        return cls(sec.s, sec.width, sec.area, sec.centroid, sec.inertia, sec.intervals)


@dataclass(frozen=True)
class HotSpot:
    rank: int
    x: float
    y: float
    feature: str
    feature_kind: str
    singular: bool
    found_as: str
    peak: float  # maximum principal stress at the boundary point
    radius: float  # radius of curvature of the feature (0 for sharp corners, inf for straight edges)
    element_size: float  # element size requested at the feature
    net_section: SectionInfo
    N: float
    M: float
    sigma_nom_net: float
    kt_net: float | None
    gross_end: str
    sigma_nom_gross: float
    kt_gross: float | None
    equilibrium_error: float  # largest relative error of N, M on the net section


@dataclass(frozen=True)
class Result:
    """Everything ``fekt solve`` reports; ``to_dict`` gives the JSON content."""

    case_name: str
    source: str
    demo: bool
    units: dict
    model: str
    thickness: float
    material: dict
    load: dict
    mesh: dict
    timings: dict
    hot_spots: tuple[HotSpot, ...]
    most_compressive: dict
    warnings: tuple[str, ...]
    notes: tuple[str, ...]
    caution: str
    provenance: dict
    uncertainty: dict | None = None
    charts: dict | None = None

    def to_dict(self) -> dict:
        return _jsonable(dataclasses.asdict(self))


@dataclass(frozen=True)
class Solved:
    """The full in-memory state of one solve (for studies, plots and tests)."""

    case: Case
    part: PartGeometry
    pmesh: PartMesh
    solution: ElasticSolution
    loads: LoadState
    samples: BoundarySamples
    result: Result
    extras: dict = field(default_factory=dict)


def _jsonable(x):
    if isinstance(x, dict):
        return {str(k): _jsonable(v) for k, v in x.items()}
    if isinstance(x, (list, tuple)):
        return [_jsonable(v) for v in x]
    if isinstance(x, (np.floating, float)):
        v = float(x)
        return v if math.isfinite(v) else None
    if isinstance(x, np.integer):
        return int(x)
    return x


def _versions() -> dict:
    import gmsh
    import scipy
    import skfem

    from . import __version__

    return {"fekt": __version__, "gmsh": gmsh.__version__, "scikit-fem": skfem.__version__,
            "numpy": np.__version__, "scipy": scipy.__version__}


def case_hash(case: Case) -> str:
    return hashlib.sha256(repr(dataclasses.replace(case, source="")).encode()).hexdigest()[:16]


def run(case: Case, *, check_equilibrium_sections: bool = True) -> Solved:
    """Solve one case and return the full state (``.result`` is what the CLI prints)."""
    t0 = time.perf_counter()
    part = build_part(case.part)
    loads = build_loads(part, case.load, case.part.thickness)
    t1 = time.perf_counter()
    pmesh = mesh_part(part, case.mesh)
    t2 = time.perf_counter()
    sol = solve_elasticity(pmesh, case.material.E, case.material.nu, case.part.model,
                           traction_loads(loads, pmesh.facets_of))
    _check_reactions(sol)
    t3 = time.perf_counter()
    samples = boundary_samples(sol, pmesh, part)
    loaded = {e.segment for e in loads.ends}
    corner_r = {name: 3.0 * h for name, h in pmesh.feature_sizes.items()}
    peaks = find_hot_spots(samples, part, loaded, corner_r)
    axis = np.array(loads.axis)
    e = transverse(axis)
    poly = part_polygon(part)
    gross_name, gross = gross_section(loads)
    sections: dict[str, Section] = {}
    eq_errors: dict[str, float] = {}
    extra_warnings: list[str] = []
    spots = []
    for p in peaks:
        xy = samples.xy[:, p.index]
        if p.feature is not None:
            key = p.feature.name
            if key not in sections:
                sections[key] = net_section(part, p.feature, axis, case.part.thickness, poly)
        else:
            key = f"cut at ({xy[0]:.6g}, {xy[1]:.6g})"
            sections[key] = section_at(part, axis, float(xy @ axis), case.part.thickness, poly)
        sec = sections[key]
        if key not in eq_errors:
            chk = check_equilibrium(sol, sec, loads) if check_equilibrium_sections else None
            if chk is not None and p.feature is not None and not p.feature.singular:
                require_equilibrium(chk, key)  # feature sections are refined: failure means a real fault
            elif chk is not None and not chk.ok:
                extra_warnings.append(
                    f"the cut through the hot spot at ({xy[0]:.4g}, {xy[1]:.4g}) crosses coarse elements: FE "
                    f"section forces differ from statics by {max(chk.error_N, chk.error_M):.2%}; its Kt is rough")
            eq_errors[key] = max(chk.error_N, chk.error_M) if chk else float("nan")
        y_hot = float(xy @ e)
        nom = nominal_stress(sec, loads, y_hot)
        gsec = dataclasses.replace(gross, s=float(xy @ axis))
        gnom = nominal_stress(gsec, loads, y_hot)
        peak = float(samples.s1[p.index])
        f = p.feature
        name = f.name if f else (f"edge '{p.edge}'" if p.edge else f"boundary at ({xy[0]:.4g}, {xy[1]:.4g})")
        spots.append(dict(
            x=float(xy[0]), y=float(xy[1]), feature=name, feature_kind=f.kind if f else "edge",
            singular=bool(f.singular) if f else False, found_as=p.why, peak=peak,
            radius=f.radius if f else math.inf,
            element_size=pmesh.feature_sizes.get(f.name, pmesh.size_max) if f else pmesh.size_max,
            net_section=SectionInfo.of(sec), N=nom.N, M=nom.M, sigma_nom_net=nom.sigma,
            kt_net=kt(peak, nom), gross_end=gross_name, sigma_nom_gross=gnom.sigma, kt_gross=kt(peak, gnom),
            equilibrium_error=eq_errors[key]))
    # an edge maximum that is not a feature's and lies within EDGE_MARGIN of its own nominal stress is a
    # Saint-Venant ripple, not a hot spot (our own threshold); the overall maximum always stays
    spots = [d for d in spots if d["feature_kind"] != "edge" or d["found_as"] == "overall maximum"
             or d["kt_net"] is None or d["kt_net"] >= 1 + EDGE_MARGIN]
    spots.sort(key=lambda d: -d["peak"])
    hot = tuple(HotSpot(rank=i + 1, **d) for i, d in enumerate(spots))
    free = np.array([(int(li), int(si)) not in loaded for li, si in zip(samples.loop, samples.segment)])
    ic = int(np.where(free)[0][np.argmin(samples.s2[free])])
    comp = {"sigma": float(samples.s2[ic]), "x": float(samples.xy[0, ic]), "y": float(samples.xy[1, ic])}
    t4 = time.perf_counter()
    warnings = list(part.warnings)
    warnings += _mesh_warnings(pmesh) + extra_warnings
    result = Result(
        case_name=case.name, source=case.source, demo=case.demo,
        units={"length": case.units.length, "force": case.units.force, "stress": case.units.stress,
               "moment": case.units.moment},
        model=case.part.model, thickness=case.part.thickness,
        material={"E": case.material.E, "nu": case.material.nu},
        load={"axis": list(loads.axis), "force": loads.force,
              "ends": [{"name": en.name, "width": en.section.width, "moment": en.moment,
                        "centroid": list(en.section.centroid)} for en in loads.ends]},
        mesh={"elements": pmesh.n_elements, "nodes": pmesh.n_nodes, "dofs": sol.ndofs,
              "element": "6-node curved triangle (P2)", "min_scaled_jacobian": pmesh.min_quality,
              "size_max": pmesh.size_max, "feature_sizes": dict(pmesh.feature_sizes),
              "elements_per_radius": case.mesh.elements_per_radius, "refine": case.mesh.refine,
              "area": pmesh.area, "solver": sol.solver},
        timings={"geometry_s": t1 - t0, "mesh_s": t2 - t1, "assemble_s": sol.seconds_assemble,
                 "solve_s": sol.seconds_solve, "post_s": t4 - t3, "total_s": t4 - t0},
        hot_spots=hot, most_compressive=comp, warnings=tuple(warnings), notes=loads.notes,
        caution=CAUTION,
        provenance={"versions": _versions(), "case_sha256_16": case_hash(case),
                    "max_reaction_over_load": float(np.max(np.abs(sol.reactions)) / max(sol.load_norm, 1e-300))},
    )
    return Solved(case, part, pmesh, sol, loads, samples, result)


def solve(case: Case) -> Result:
    """Public entry: solve a case and return its :class:`Result`."""
    return run(case).result


#: restraint reactions must vanish for self-equilibrated loads (round-off level; our own tolerance)
REACTION_TOLERANCE = 1e-8


def _check_reactions(sol: ElasticSolution) -> None:
    from .errors import SolveError

    r = float(np.max(np.abs(sol.reactions))) / max(sol.load_norm, 1e-300)
    if r > REACTION_TOLERANCE:
        raise SolveError(f"the point restraints carry {r:.3g} of the applied load; the loads are not "
                         "self-equilibrated, so the restraints distort the stress field")


def _mesh_warnings(pmesh: PartMesh) -> list[str]:
    out = []
    if pmesh.min_quality < 0.2:
        out.append(f"poorly shaped elements (min scaled Jacobian {pmesh.min_quality:.2f})")
    return out
