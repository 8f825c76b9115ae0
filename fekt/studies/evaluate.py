"""One case, fully evaluated: the pipeline's result plus its uncertainty bands and chart values.

This is what ``fekt solve`` reports and what sweeps evaluate at every point.
"""

from __future__ import annotations

import dataclasses

from ..case.schema import Case
from ..pipeline import Solved, run
from .convergence import two_grid_uncertainty


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
        from ..charts.crosscheck import chart_report

        result = dataclasses.replace(result, charts=chart_report(case, solved.part, result))
    return dataclasses.replace(solved, result=result)
