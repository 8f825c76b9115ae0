"""The small public API (re-exported by ``fekt``): load a case, solve it, study it, assess it."""

from __future__ import annotations

from collections.abc import Mapping
from pathlib import Path

from .case import loader
from .case.loader import read_case_table
from .case.schema import Case
from .pipeline import Solved
from .records import Assessment, Result
from .registry import CATALOGUE
from .studies.convergence import Study, converge
from .studies.evaluate import solve_full


def load_case(path: str | Path) -> Case:
    """Read and check a case file (every mistake is reported before any work starts)."""
    return loader.load_case(path, CATALOGUE)


def parse_case(text: str, source: str = "<string>") -> Case:
    """Read and check case-file text; ``source`` names it in messages."""
    return loader.parse_case(text, CATALOGUE, source)


def case_from_dict(data: dict, source: str, overrides: Mapping[str, float] | None = None) -> Case:
    """Check an already parsed case table; ``overrides`` replaces named parameters."""
    return loader.case_from_dict(data, source, overrides, catalogue=CATALOGUE)


def solve(case: Case, *, estimate: bool = True, charts: bool = True) -> Result:
    """Solve a case: ranked stress peaks with Kt, uncertainty bands and chart values (as ``fekt solve``)."""
    return solve_full(case, estimate=estimate, charts=charts).result


def assess_case(case: Case, result: Result | None = None, *, cycles=None, estimate: bool = True,
                charts: bool = True) -> Assessment:
    """The strength and fatigue assessment of a case (as ``fekt assess``): static checks, Kf by several
    methods, and fatigue safety factors of the case's ``[cycle]``, or of ``cycles`` (a
    :class:`fekt.assess.assessment.CycleInput` of per-peak maximum and minimum stresses, e.g. from load
    cases). ``result``: the case's solved result (solved now when not given). Missing strengths raise
    :class:`fekt.errors.InputError` naming them, before any solve."""
    from .assess.assessment import assess_solved, check_case

    check_case(case, cycle=(cycles is not None) or case.cycle is not None)
    if result is None:
        result = solve(case, estimate=estimate, charts=charts)
    return assess_solved(case, result, cycles=cycles)


__all__ = ["load_case", "parse_case", "case_from_dict", "read_case_table", "solve", "solve_full", "converge",
           "assess_case", "Assessment", "Case", "Result", "Solved", "Study"]
