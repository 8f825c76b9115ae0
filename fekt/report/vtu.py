"""Field export for general-purpose viewers: a quadratic-triangle mesh with named fields, as a VTU file.

Written through meshio. The mesh is made of 6-node triangles ("triangle6", VTK type 22) whose node
order is VTK's: the three corners counter-clockwise, then the mid-side nodes of edges 0-1, 1-2 and
2-0. Points are given in 2D or 3D and stored in 3D (z = 0 added). Point and cell data are scalars
(one value per point or cell) or vectors (2 or 3 components; 2-component vectors get z = 0 so that
viewers treat them as vectors, e.g. to warp by displacement). Values are stored as 64-bit floats.
Field names are kept as given; put the unit in the name (``"von Mises [MPa]"``) if a viewer should show it.
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Mapping

import numpy as np

CELL_TYPE = "triangle6"


@dataclass(frozen=True)
class VtuContent:
    """What :func:`read_back` found in a file: points (n, 3), cells (m, 6) and the named arrays."""

    points: np.ndarray
    cells6: np.ndarray
    point_data: Mapping[str, np.ndarray]
    cell_data: Mapping[str, np.ndarray]


def _points3(points) -> np.ndarray:
    p = np.asarray(points, dtype=float)
    if p.ndim != 2 or p.shape[1] not in (2, 3):
        raise ValueError(f"points must have shape (n, 2) or (n, 3), got {p.shape}")
    if p.shape[1] == 2:
        p = np.column_stack([p, np.zeros(len(p))])
    return p


def _cells(cells6, n_points: int) -> np.ndarray:
    c = np.asarray(cells6)
    if c.ndim != 2 or c.shape[1] != 6 or len(c) == 0:
        raise ValueError(f"cells6 must have shape (m, 6) with m >= 1, got {c.shape}")
    if not np.issubdtype(c.dtype, np.integer):
        raise ValueError(f"cells6 must hold integer point indices, got dtype {c.dtype}")
    if c.min() < 0 or c.max() >= n_points:
        raise ValueError(f"cells6 refers to points outside 0..{n_points - 1}")
    return c.astype(np.int64)


def _field(name: str, values, n: int, what: str) -> np.ndarray:
    if not isinstance(name, str) or not name.strip():
        raise ValueError(f"{what} names must be non-empty strings, got {name!r}")
    a = np.asarray(values, dtype=float)
    if a.ndim == 2 and a.shape[1] == 2:
        a = np.column_stack([a, np.zeros(len(a))])
    if a.shape[0:1] != (n,) or a.ndim > 2 or (a.ndim == 2 and a.shape[1] != 3):
        raise ValueError(f"{what} {name!r}: expected shape ({n},), ({n}, 2) or ({n}, 3), got {np.shape(values)}")
    return a


def write_vtu(path, points, cells6, point_data: Mapping[str, object], cell_data: Mapping[str, object] | None = None) -> None:
    """Write the mesh and its fields to ``path`` (a .vtu file; compressed binary, readable by VTK-based viewers)."""
    import meshio

    p = _points3(points)
    c = _cells(cells6, len(p))
    pd = {name: _field(name, v, len(p), "point data") for name, v in point_data.items()}
    cd = {name: [_field(name, v, len(c), "cell data")] for name, v in (cell_data or {}).items()}
    mesh = meshio.Mesh(p, [(CELL_TYPE, c)], point_data=pd, cell_data=cd)
    meshio.write(str(path), mesh, file_format="vtu")


def read_back(path) -> VtuContent:
    """Read a file written by :func:`write_vtu` (any VTU with one block of triangle6 cells)."""
    import meshio

    mesh = meshio.read(str(path), file_format="vtu")
    blocks = [i for i, b in enumerate(mesh.cells) if b.type == CELL_TYPE]
    if len(blocks) != 1 or len(mesh.cells) != 1:
        raise ValueError(f"{path}: expected one block of {CELL_TYPE} cells, found "
                         f"{[b.type for b in mesh.cells]}")
    return VtuContent(points=np.asarray(mesh.points), cells6=np.asarray(mesh.cells[0].data),
                      point_data={k: np.asarray(v) for k, v in mesh.point_data.items()},
                      cell_data={k: np.asarray(v[0]) for k, v in mesh.cell_data.items()})


# --- fekt's nodal fields -------------------------------------------------------------------------

def field_arrays(nodal, stress_unit: str, length_unit: str, stress_factor: float = 1.0,
                 length_factor: float = 1.0) -> tuple[object, dict[str, object]]:
    """(points, named point data) of :class:`fekt.post.export.NodalFields`, each name carrying its unit;
    the factors take the case's units to the output units (1 for none)."""
    a, b = nodal.coordinates
    out_of_plane = "z" if (a, b) == ("x", "y") else "h"
    s = nodal.stress

    def st(v):
        return np.asarray(v, dtype=float) * stress_factor

    data = {
        f"displacement [{length_unit}]": np.asarray(nodal.displacement, dtype=float) * length_factor,
        f"sigma_{a}{a} [{stress_unit}]": st(s.xx),
        f"sigma_{b}{b} [{stress_unit}]": st(s.yy),
        f"sigma_{a}{b} [{stress_unit}]": st(s.xy),
        f"sigma_{out_of_plane}{out_of_plane} [{stress_unit}]": st(s.hh),
        f"max principal stress [{stress_unit}]": st(nodal.s1),
        f"min principal stress [{stress_unit}]": st(nodal.s2),
        f"von Mises stress [{stress_unit}]": st(nodal.von_mises),
        f"boundary tangential stress [{stress_unit}]": st(nodal.boundary_stt),
        "elements averaged at node [-]": np.asarray(nodal.elements_per_node, dtype=float),
    }
    return np.asarray(nodal.points, dtype=float) * length_factor, data


def write_fields(path, nodal, stress_unit: str, length_unit: str, stress_factor: float = 1.0,
                 length_factor: float = 1.0) -> None:
    """Write fekt's nodal fields (:mod:`fekt.post.export`) as a VTU file (names in :func:`field_arrays`)."""
    points, data = field_arrays(nodal, stress_unit, length_unit, stress_factor, length_factor)
    write_vtu(path, points, nodal.cells6, data)
