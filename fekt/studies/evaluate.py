"""One case, fully evaluated: the pipeline's result with each peak's uncertainty band and chart check.

This is what ``fekt solve`` reports and what sweeps evaluate at every point.
"""

from __future__ import annotations

import dataclasses
import time

from ..case.schema import Case
from ..charts.crosscheck import with_charts
from ..pipeline import Solved, run
from .convergence import two_grid_bands, with_bands


def solve_full(case: Case, *, estimate: bool = True, charts: bool = True) -> Solved:
    """Solve a case and keep every intermediate (mesh, solution, samples) for plots and studies.

    ``estimate``: give each Kt its two-grid GCI band (a second mesh with half the elements per notch
    radius). ``charts``: set the published chart values beside the FE values (family check or nearest
    chart per feature)."""
    solved = run(case)
    result = solved.result
    if estimate:
        result = with_bands(result, *two_grid_bands(case, result))
    if charts:
        t0 = time.perf_counter()
        result = with_charts(case, solved.part, result)
        result = dataclasses.replace(result, timings=dataclasses.replace(result.timings,
                                                                           charts_s=time.perf_counter() - t0))
    return dataclasses.replace(solved, result=result)
