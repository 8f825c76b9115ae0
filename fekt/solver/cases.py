"""Load cases on one factorisation: each case is a set of factors on the case file's loads.

The linear loads are solved once each (:func:`fekt.solver.linear.solve`); a case combines their fields
with its factors. A pin load is not linear (its contact arc depends on the load), so every case that has
one gets its own contact solve, with the case's other loads already acting (:mod:`fekt.solver.contact`);
its field enters the case with factor 1. Each case is then checked: it must do no work on a rigid motion
that no support stops, and the point restraints must carry nothing.
"""

from __future__ import annotations

import dataclasses
from collections.abc import Mapping, Sequence
from dataclasses import dataclass

import numpy as np

from ..loads.base import Applied, Component
from ..mesh.build import PartMesh
from .contact import ContactFacts, solve_pin
from .linear import Solution, check_free_motions, check_reactions, with_fields


@dataclass(frozen=True)
class CaseSolve:
    """One load case ready for post-processing: its name ('' for the single unnamed case), the factors by
    load name as the file gives them, the factors by component or field name, the case's loads (with its
    pins' solved contact components) and the contact facts."""

    name: str
    load_factors: tuple[tuple[str, float], ...]
    factors: Mapping[str, float]
    applied: Applied
    contacts: tuple[ContactFacts, ...] = ()


def solve_cases(sol: Solution, pmesh: PartMesh, applied: Applied,
                cases: Sequence[tuple[str, Mapping[str, float]]]) -> tuple[Solution, list[CaseSolve]]:
    """Every load case (name, load name -> factor): contact solves where needed, then the checks."""
    out: list[CaseSolve] = []
    extra = []
    # a pin's field is named after its load; after the case too when several cases have the pin
    uses = {c.name: sum(1 for _, bl in cases if bl.get(c.load, 0.0) != 0.0) for c in applied.components}
    for name, by_load in cases:
        factors = {c.name: float(by_load.get(c.load, 0.0)) for c in applied.components if c.contact is None}
        comps: list[Component] = [c for c in applied.components if c.contact is None and factors[c.name] != 0.0]
        intros = [i for i in applied.introductions if not i.load or by_load.get(i.load, 0.0) != 0.0]
        facts = []
        for c in applied.components:
            f = float(by_load.get(c.load, 0.0))
            if c.contact is None or f == 0.0:
                continue
            scaled = dataclasses.replace(c, magnitude=f * c.magnitude, contact=dataclasses.replace(
                c.contact, force=(f * c.contact.force[0], f * c.contact.force[1])))
            base = _combined(sol, factors, c.operator)
            field_name = f"{c.name} [{name}]" if uses[c.name] > 1 else c.name
            fld, fact, intro = solve_pin(sol, pmesh, scaled, base, field_name, name)
            extra.append(fld)
            sol = with_fields(sol, [fld])
            factors[field_name] = 1.0
            comps.append(fld.component)
            intros.append(intro)
            facts.append(fact)
        check_free_motions(sol, factors, name)
        check_reactions(sol, factors, name)
        case_applied = dataclasses.replace(applied, components=tuple(comps), introductions=tuple(intros))
        out.append(CaseSolve(name, tuple((k, float(v)) for k, v in by_load.items()), factors, case_applied,
                             tuple(facts)))
    return sol, out


def _combined(sol: Solution, factors: Mapping[str, float], operator: str) -> np.ndarray:
    u = np.zeros(sol.systems[operator].basis.N)
    for f in sol.fields:
        w = factors.get(f.component.name, 0.0)
        if w != 0.0 and f.component.operator == operator:
            u = u + w * f.u
    return u
