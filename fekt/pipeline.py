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
from .loads import combine
from .loads.base import Applied
from .mesh.build import PartMesh, mesh_part
from .models import REGISTRY as MODELS
from .post.evaluate import evaluate_peaks
from .post.fields import BoundarySamples, boundary_samples
from .post.gradient import with_gradients
from .records import (ComponentFacts, ContactRecord, EndFacts, LoadCaseRecord, LoadFacts, MeshFacts, Provenance,
                      Result, Timings, UnitsRecord)
from .solver.cases import solve_cases
from .solver.linear import Solution, reaction_ratio, solve

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
    """The case's loads and supports on the built part, combined (:func:`fekt.loads.combine`)."""
    model = model_of(case)
    loads = []
    for spec in case.loads:
        a = spec.apply(part, model, case.part.thickness)
        if len(case.loads) > 1:  # components named after their load, so that two loads cannot clash
            a = dataclasses.replace(a, components=tuple(
                c if c.name == a.name else dataclasses.replace(c, name=f"{a.name}/{c.name}") for c in a.components))
        loads.append(a)
    supports = [sp.apply(part, model) for sp in case.supports]
    return combine(loads, supports, case.nominal.axis)


def case_list(case: Case) -> list[tuple[str, dict[str, float]]]:
    """The load cases as (name, load name -> factor); one unnamed case of every load at 1 when the file
    names none."""
    if not case.load_cases:
        return [("", {ld.name: 1.0 for ld in case.loads})]
    return [(lc.name, dict(lc.factors)) for lc in case.load_cases]


def peak_measure(case: Case, applied: Applied) -> Measure:
    """The measure the case's peaks are found by: the case's own, or for "auto" the tangential stress
    (what Kt charts use), or the signed principal stress when a load component is a torque (its
    tangential stress is zero)."""
    if case.measure != "auto":
        return Measure(case.measure)
    if any(c.quantity == "torque" and c.magnitude != 0 for c in applied.components):
        return Measure.PRINCIPAL
    return Measure.TANGENTIAL


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
    sol = solve(pmesh, model, case.material.E, case.material.nu, applied.components, applied.supports)
    tc = time.perf_counter()
    sol, cases = solve_cases(sol, pmesh, applied, case_list(case))
    t3 = time.perf_counter()
    contact_s = t3 - tc
    samples = boundary_samples(sol, pmesh, part)
    measure = peak_measure(case, applied)
    stated = (case.nominal.stress, case.nominal.feature) if case.nominal.stress is not None else None
    found = []
    for cs in cases:
        try:
            found.append(evaluate_peaks(samples, part, pmesh, sol, cs.applied, case.part.thickness,
                                        equilibrium=equilibrium, measure=measure, factors=cs.factors,
                                        stated=stated))
            found[-1] = dataclasses.replace(found[-1], peaks=with_gradients(
                found[-1].peaks, samples, sol, pmesh, part, cs.applied.axis, measure=measure, factors=cs.factors))
        except SolveError as exc:
            if not pmesh.warnings:
                raise
            # the mesh stage usually saw the cause (a thin ligament): say so with the failure
            raise SolveError(f"{exc}; the mesh stage warned: " + "; ".join(pmesh.warnings)) from exc
    t4 = time.perf_counter()
    warnings = list(part.warnings) + list(pmesh.warnings)
    for fs in found:
        warnings += [w for w in fs.warnings if w not in warnings]
    records = tuple(LoadCaseRecord(cs.name, cs.load_factors, fs.peaks, fs.most_compressive,
                                   tuple(ContactRecord(**dataclasses.asdict(c)) for c in cs.contacts))
                    for cs, fs in zip(cases, found))
    units = case.units
    result = Result(
        case_name=case.name, source=case.source, demo=case.demo,
        units=UnitsRecord(units.length, units.force, units.stress, units.moment),
        model=case.part.model, model_label=model.label,
        thickness=case.part.thickness if model.has_thickness else None,
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
                        solve_s=sol.seconds_solve + contact_s, post_s=t4 - t3, total_s=t4 - t0),
        peaks=found[0].peaks, most_compressive=found[0].most_compressive, warnings=tuple(warnings),
        notes=applied.notes, caution=CAUTION, measure=str(measure), coordinates=model.coordinates,
        nominal_rule=model.nominal_label,
        provenance=Provenance(versions=_versions(), case_sha256_16=case_hash(case),
                              max_reaction_over_load=max(reaction_ratio(sol, cs.factors) for cs in cases)),
        load_cases=records if case.load_cases else (), contacts=records[0].contacts,
    )
    return Solved(case, part, pmesh, sol, cases[0].applied, samples, result)
