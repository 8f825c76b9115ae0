"""The small public API (re-exported by ``fekt``): load a case, solve it, study its convergence."""

from __future__ import annotations

import dataclasses

from .case.loader import load_case, parse_case
from .case.schema import Case
from .pipeline import Result
from .studies.convergence import Study, converge, two_grid_uncertainty


def solve(case: Case, *, estimate: bool = True) -> Result:
    """Solve a case: ranked hot spots with Kt. With ``estimate`` (default) each Kt also gets its
    two-grid GCI band from a second mesh with half the elements per notch radius (as ``fekt solve``)."""
    from .pipeline import solve as solve_once

    result = solve_once(case)
    if estimate:
        result = dataclasses.replace(result, uncertainty=two_grid_uncertainty(case, result))
    return result


__all__ = ["load_case", "parse_case", "solve", "converge", "Case", "Result", "Study"]
