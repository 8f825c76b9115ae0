"""The small public API (re-exported by ``fekt``): load a case, solve it, study it."""

from __future__ import annotations

from .case.loader import load_case, parse_case
from .case.schema import Case
from .pipeline import Result
from .studies.convergence import Study, converge
from .studies.evaluate import solve_full


def solve(case: Case, *, estimate: bool = True, charts: bool = True) -> Result:
    """Solve a case: ranked hot spots with Kt, uncertainty bands and chart values (as ``fekt solve``)."""
    return solve_full(case, estimate=estimate, charts=charts).result


__all__ = ["load_case", "parse_case", "solve", "solve_full", "converge", "Case", "Result", "Study"]
