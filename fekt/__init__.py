"""fekt: elastic stress concentration factors (Kt) of flat notched parts by finite elements.

Public API::

    import fekt
    case = fekt.load_case("cases/demo_link.toml")
    result = fekt.solve(case)        # hot spots, net sections, Kt, mesh and timing facts
    result.to_dict()                 # the same content as ``fekt solve --json``
"""

__version__ = "0.1.0"
__all__ = ["load_case", "parse_case", "solve", "run", "__version__"]


def __getattr__(name):
    # heavy imports (gmsh, scikit-fem) only when the API is used
    if name in ("load_case", "parse_case"):
        from .case import loader

        return getattr(loader, name)
    if name in ("solve", "run"):
        from . import pipeline

        return getattr(pipeline, name)
    raise AttributeError(name)
