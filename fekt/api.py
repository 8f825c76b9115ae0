"""The small public API (re-exported by ``fekt``): load a case, solve it, study its convergence."""

from __future__ import annotations

import dataclasses

from .case.loader import load_case, parse_case
from .case.schema import Case
from .pipeline import Result, Solved, run
from .studies.convergence import Study, converge, two_grid_uncertainty


def solve_full(case: Case, *, estimate: bool = True, charts: bool = True) -> Solved:
    """Solve a case and keep every intermediate (mesh, solution, samples) for plots and studies.

    ``estimate``: give each Kt its two-grid GCI band (a second mesh with half the elements per notch
    radius). ``charts``: set the published chart values beside the FE values (family check or nearest
    chart per feature)."""
    solved = run(case)
    result = solved.result
    if estimate:
        result = dataclasses.replace(result, uncertainty=two_grid_uncertainty(case, result))
    if charts:
        from .charts.crosscheck import chart_report

        result = dataclasses.replace(result, charts=chart_report(case, solved.part, result))
    return dataclasses.replace(solved, result=result)


def solve(case: Case, *, estimate: bool = True, charts: bool = True) -> Result:
    """Solve a case: ranked hot spots with Kt, uncertainty bands and chart values (as ``fekt solve``)."""
    return solve_full(case, estimate=estimate, charts=charts).result


__all__ = ["load_case", "parse_case", "solve", "solve_full", "converge", "Case", "Result", "Study"]
