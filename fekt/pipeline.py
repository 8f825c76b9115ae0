"""One case through every stage: geometry -> loads -> mesh -> solve -> stress peaks, net sections, Kt.

No numerics of its own: it wires the stages, times them and records provenance.
"""

from __future__ import annotations

import dataclasses
import hashlib
import time
from dataclasses import dataclass

from .case.schema import Case, MeshSpec
from .errors import GeometryError, SolveError
from .geometry.build import build_part
from .geometry.model import PartGeometry
from .kinds import EquilibriumMode, Measure
from .loads.base import Applied
from .mesh.build import PartMesh, mesh_part
from .models import REGISTRY as MODELS
from .post.evaluate import evaluate_peaks
from .post.fields import BoundarySamples, boundary_samples
from .post.gradient import with_gradients
from .records import (ComponentFacts, EndFacts, LoadFacts, MeshFacts, Provenance, Result, Timings,
                      UnitsRecord)
from .solver.linear import Solution, check_reactions, reaction_ratio, solve

CAUTION = ("Linear-elastic, 2D idealisation of the part as described; peak stresses assume small strains "
           "and no yielding. Check the numbers against the applicable design codes and licensed "
           "engineering practice before sizing a part with them.")


@dataclass(frozen=True)
class Solved:
    """The full in-memory state of one solve (for studies, plots and tests)."""

    case: Case
    part: PartGeometry
    pmesh: PartMesh
    solution: Solution
    applied: Applied
    samples: BoundarySamples
    result: Result


def _versions() -> dict:
    import gmsh
    import numpy
    import scipy
    import skfem

    from .version import __version__

    return {"fekt": __version__, "gmsh": gmsh.__version__, "scikit-fem": skfem.__version__,
            "numpy": numpy.__version__, "scipy": scipy.__version__}


def case_hash(case: Case) -> str:
    return hashlib.sha256(repr(dataclasses.replace(case, source="")).encode()).hexdigest()[:16]


def model_of(case: Case):
    model = MODELS.get(case.part.model)
    if model is None:
        raise GeometryError(f"model = '{case.part.model}' must be one of {', '.join(MODELS)}", item="part.model")
    return model


def apply_loads(case: Case, part: PartGeometry) -> Applied:
    """The case's load on the built part (one load per case in this version)."""
    model = model_of(case)
    if len(case.loads) != 1:
        raise GeometryError(f"the case has {len(case.loads)} loads; give exactly one [load]", item="load")
    return case.loads[0].apply(part, model, case.part.thickness)


def run(case: Case, *, equilibrium: EquilibriumMode = EquilibriumMode.FAIL) -> Solved:
    """Solve one case and return the full state (``.result`` is what the CLI prints; no bands, no chart).

    ``equilibrium``: FAIL raises when a feature's net section misses statics by more than 0.5 % on a mesh
    at least as fine as the default (on a mesh the user chose coarser it is a warning with the number);
    WARN records it as a warning (coarse levels of a convergence study); OFF skips the check."""
    equilibrium = EquilibriumMode(equilibrium)
    if equilibrium == EquilibriumMode.FAIL and case.mesh.elements_per_radius * 2 ** case.mesh.refine < \
            MeshSpec().elements_per_radius:
        equilibrium = EquilibriumMode.WARN
    t0 = time.perf_counter()
    model = model_of(case)
    model.validate(case.part)
    part = build_part(case.part)
    applied = apply_loads(case, part)
    t1 = time.perf_counter()
    pmesh = mesh_part(part, case.mesh)
    t2 = time.perf_counter()
    sol = solve(pmesh, model, case.material.E, case.material.nu, applied.components)
    check_reactions(sol)
    t3 = time.perf_counter()
    samples = boundary_samples(sol, pmesh, part)
    try:
        found = evaluate_peaks(samples, part, pmesh, sol, applied, case.part.thickness, equilibrium=equilibrium,
                               measure=Measure(case.measure))
    except SolveError as exc:
        if not pmesh.warnings:
            raise
        # the mesh stage usually saw the cause (a thin ligament): say so with the failure
        raise SolveError(f"{exc}; the mesh stage warned: " + "; ".join(pmesh.warnings)) from exc
    found = dataclasses.replace(found, peaks=with_gradients(found.peaks, samples, sol, pmesh, part, applied.axis,
                                                            measure=Measure(case.measure)))
    t4 = time.perf_counter()
    warnings = list(part.warnings) + list(pmesh.warnings) + list(found.warnings)
    units = case.units
    result = Result(
        case_name=case.name, source=case.source, demo=case.demo,
        units=UnitsRecord(units.length, units.force, units.stress, units.moment),
        model=case.part.model, model_label=model.label, thickness=case.part.thickness,
        material={"E": case.material.E, "nu": case.material.nu},
        load=LoadFacts(
            axis=applied.axis, force=sum(c.magnitude for c in applied.components if c.quantity == "force"),
            ends=tuple(EndFacts(en.name, en.section.width, en.moment, en.section.centroid) for en in applied.ends),
            components=tuple(ComponentFacts(c.name, c.load, c.quantity, c.magnitude) for c in applied.components)),
        mesh=MeshFacts(elements=pmesh.n_elements, nodes=pmesh.n_nodes, dofs=sol.ndofs, element=model.element_label,
                       min_scaled_jacobian=pmesh.min_quality, size_max=pmesh.size_max,
                       feature_sizes=dict(pmesh.feature_sizes), elements_per_radius=case.mesh.elements_per_radius,
                       refine=case.mesh.refine, area=pmesh.area, solver=sol.solver),
        timings=Timings(geometry_s=t1 - t0, mesh_s=t2 - t1, assemble_s=sol.seconds_assemble,
                        solve_s=sol.seconds_solve, post_s=t4 - t3, total_s=t4 - t0),
        peaks=found.peaks, most_compressive=found.most_compressive, warnings=tuple(warnings),
        notes=applied.notes, caution=CAUTION, measure=str(case.measure),
        provenance=Provenance(versions=_versions(), case_sha256_16=case_hash(case),
                              max_reaction_over_load=reaction_ratio(sol)),
    )
    return Solved(case, part, pmesh, sol, applied, samples, result)
