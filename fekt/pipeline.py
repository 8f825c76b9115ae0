"""One case through every stage: geometry -> mesh -> solve -> hot spots, net sections, Kt.

No numerics of its own: it wires the stages, times them and records provenance.
"""

from __future__ import annotations

import dataclasses
import hashlib
import math
import time
from dataclasses import dataclass

import numpy as np

from .case.schema import Case
from .errors import SolveError
from .geometry.build import build_part
from .geometry.model import PartGeometry
from .mesh.build import PartMesh, mesh_part
from .post.fields import BoundarySamples, boundary_samples
from .post.assess import HotSpot, assess
from .solver.elasticity import ElasticSolution, check_reactions, solve_elasticity
from .solver.loads import LoadState, build_loads, traction_loads

CAUTION = ("Linear-elastic, 2D idealisation of the part as described; peak stresses assume small strains "
           "and no yielding. Check the numbers against the applicable design codes and licensed "
           "engineering practice before sizing a part with them.")


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


def run(case: Case, *, equilibrium: str = "fail") -> Solved:
    """Solve one case and return the full state (``.result`` is what the CLI prints).

    ``equilibrium``: "fail" raises when a feature's net section misses statics by more than 0.5 %;
    "warn" records it as a warning (coarse levels of a convergence study); "off" skips the check."""
    t0 = time.perf_counter()
    part = build_part(case.part)
    loads = build_loads(part, case.load, case.part.thickness)
    t1 = time.perf_counter()
    pmesh = mesh_part(part, case.mesh)
    t2 = time.perf_counter()
    sol = solve_elasticity(pmesh, case.material.E, case.material.nu, case.part.model,
                           traction_loads(loads, pmesh.facets_of))
    check_reactions(sol)
    t3 = time.perf_counter()
    samples = boundary_samples(sol, pmesh, part)
    try:
        assessed = assess(samples, part, pmesh, sol, loads, case.part.thickness, equilibrium=equilibrium)
    except SolveError as exc:
        if not pmesh.warnings:
            raise
        # the mesh stage usually saw the cause (a thin ligament): say so with the failure
        raise SolveError(f"{exc}; the mesh stage warned: " + "; ".join(pmesh.warnings)) from exc
    t4 = time.perf_counter()
    warnings = list(part.warnings) + list(pmesh.warnings) + list(assessed.warnings)
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
        hot_spots=assessed.hot_spots, most_compressive=assessed.most_compressive, warnings=tuple(warnings),
        notes=loads.notes, caution=CAUTION,
        provenance={"versions": _versions(), "case_sha256_16": case_hash(case),
                    "max_reaction_over_load": float(np.max(np.abs(sol.reactions)) / max(sol.load_norm, 1e-300))},
    )
    return Solved(case, part, pmesh, sol, loads, samples, result)


def solve(case: Case) -> Result:
    """The pipeline's result alone (``fekt.solve`` adds uncertainty bands and chart values)."""
    return run(case).result
