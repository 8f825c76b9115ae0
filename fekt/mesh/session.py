"""The one place where gmsh is opened and closed.

gmsh is a process-global singleton: never use it from two threads; parallel work uses processes.
"""

from __future__ import annotations

import contextlib
from collections.abc import Iterator

import gmsh


@contextlib.contextmanager
def gmsh_session(verbose: bool = False) -> Iterator[object]:
    """Open gmsh headless and quiet, yield the module, always finalize.

    ``readConfigFiles=False`` keeps user config out of results; ``interruptible=False`` avoids the
    "signal only works in main thread" failure when called off the main thread
    (docs/pitfalls.md, C5).
    """
    if gmsh.isInitialized():
        raise RuntimeError("gmsh is already open in this process; fekt opens it in one place only")
    gmsh.initialize(readConfigFiles=False, interruptible=False)
    try:
        gmsh.option.setNumber("General.Terminal", 1 if verbose else 0)
        gmsh.option.setNumber("General.Verbosity", 2 if not verbose else 5)
        gmsh.logger.start()
        yield gmsh
    finally:
        try:
            gmsh.logger.stop()
        finally:
            gmsh.finalize()
