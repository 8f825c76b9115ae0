"""fekt: elastic stress concentration factors (Kt) of flat notched parts by finite elements.

Public API::

    import fekt
    case = fekt.load_case("cases/demo_link.toml")
    result = fekt.solve(case)        # stress peaks, net sections, Kt with uncertainty bands
    result.to_dict()                 # the same content as ``fekt solve --json``
    study = fekt.converge(case, levels=3)   # refinement study (``fekt converge``)
    verdict = fekt.assess_case(case)         # strength and fatigue checks per peak (``fekt assess``)
"""

from .version import __version__
__all__ = ["load_case", "parse_case", "solve", "converge", "assess_case", "__version__"]


def __getattr__(name):
    # heavy imports (gmsh, scikit-fem) only when the API is used
    if name in ("load_case", "parse_case", "solve", "converge", "assess_case"):
        from . import api

        return getattr(api, name)
    raise AttributeError(name)
