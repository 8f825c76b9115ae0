"""VTU field export: write an analytic field on two quadratic triangles, read it back with meshio.

File structure checked against the VTK XML format description ("VTK File Formats", VTK User's Guide,
11th ed., Kitware 2010, section "XML File Formats": UnstructuredGrid / Piece / PointData / CellData,
DataArray Name and NumberOfComponents; cell type 22 = VTK_QUADRATIC_TRIANGLE, corner nodes then the
mid-side nodes of edges 0-1, 1-2, 2-0). The analytic field is our own choice (a quadratic polynomial,
so a P2 mesh holds it exactly).
"""

from __future__ import annotations

import xml.etree.ElementTree as ET

import meshio
import numpy as np
import pytest

from fekt.report.vtu import read_back, write_vtu

# unit square split along its diagonal into two 6-node triangles, VTK node order
CORNERS = [(0.0, 0.0), (1.0, 0.0), (1.0, 1.0), (0.0, 1.0)]
MIDS = [(0.5, 0.0), (1.0, 0.5), (0.5, 0.5), (0.5, 1.0), (0.0, 0.5)]  # 4..8
POINTS = np.array(CORNERS + MIDS)
CELLS = np.array([[0, 1, 2, 4, 5, 6],    # edges 0-1, 1-2, 2-0
                  [0, 2, 3, 6, 7, 8]])   # edges 0-2, 2-3, 3-0


def _fields():
    x, y = POINTS.T
    displacement = np.column_stack([1e-3 * x ** 2, -2e-4 * x * y])   # 2 components: padded with z = 0
    von_mises = 1.0 + x + 2.0 * y ** 2                                 # max 4 at (1, 1)
    s1 = 250.0 * (1.0 + x * y)
    return {"displacement [mm]": displacement, "von Mises [MPa]": von_mises, "s1": s1}


def test_round_trip_exact(tmp_path):
    path = tmp_path / "field.vtu"
    fields = _fields()
    areas = np.array([0.5, 0.5])
    write_vtu(path, POINTS, CELLS, fields, cell_data={"area [mm^2]": areas, "element": np.array([0.0, 1.0])})

    mesh = meshio.read(path)                      # read with meshio directly ...
    assert [b.type for b in mesh.cells] == ["triangle6"]
    np.testing.assert_array_equal(mesh.cells[0].data, CELLS)
    np.testing.assert_array_equal(mesh.points[:, :2], POINTS)
    np.testing.assert_array_equal(mesh.points[:, 2], 0.0)
    assert set(mesh.point_data) == set(fields)    # names survive, including spaces and brackets
    np.testing.assert_array_equal(mesh.point_data["von Mises [MPa]"], fields["von Mises [MPa]"])
    np.testing.assert_array_equal(mesh.point_data["displacement [mm]"][:, :2], fields["displacement [mm]"])
    np.testing.assert_array_equal(mesh.point_data["displacement [mm]"][:, 2], 0.0)
    np.testing.assert_array_equal(mesh.cell_data["area [mm^2]"][0], areas)

    back = read_back(path)                        # ... and through our helper
    np.testing.assert_array_equal(back.cells6, CELLS)
    np.testing.assert_array_equal(back.point_data["s1"], fields["s1"])
    np.testing.assert_array_equal(back.cell_data["element"], [0.0, 1.0])
    # the peak of the field: 1 + 1 + 2 = 4 at the corner (1, 1)
    i = int(np.argmax(back.point_data["von Mises [MPa]"]))
    assert back.point_data["von Mises [MPa]"][i] == 4.0
    np.testing.assert_array_equal(back.points[i], [1.0, 1.0, 0.0])
    assert back.point_data["s1"].max() == 500.0


def test_mid_side_nodes_in_vtk_order(tmp_path):
    # VTK_QUADRATIC_TRIANGLE: node 3 on edge 0-1, node 4 on edge 1-2, node 5 on edge 2-0
    path = tmp_path / "order.vtu"
    write_vtu(path, POINTS, CELLS, {"one": np.ones(len(POINTS))})
    back = read_back(path)
    for c in back.cells6:
        p = back.points[c]
        np.testing.assert_allclose(p[3], (p[0] + p[1]) / 2)
        np.testing.assert_allclose(p[4], (p[1] + p[2]) / 2)
        np.testing.assert_allclose(p[5], (p[2] + p[0]) / 2)


def test_file_structure_follows_vtk_xml_format(tmp_path):
    path = tmp_path / "s.vtu"
    write_vtu(path, np.column_stack([POINTS, np.zeros(len(POINTS))]), CELLS, _fields(),
              cell_data={"area": [0.5, 0.5]})
    root = ET.parse(path).getroot()
    assert root.tag == "VTKFile" and root.get("type") == "UnstructuredGrid"
    piece = root.find("UnstructuredGrid/Piece")
    assert piece.get("NumberOfPoints") == "9" and piece.get("NumberOfCells") == "2"
    arrays = {a.get("Name"): a for a in piece.findall("PointData/DataArray")}
    assert arrays["displacement [mm]"].get("NumberOfComponents") == "3"   # viewers see a vector
    assert arrays["von Mises [MPa]"].get("NumberOfComponents") in (None, "1")
    assert [a.get("Name") for a in piece.findall("CellData/DataArray")] == ["area"]


@pytest.mark.parametrize("points,cells,data,words", [
    (POINTS[:, :1], CELLS, {}, "points must have shape"),
    (POINTS, CELLS[:, :3], {}, "cells6 must have shape"),
    (POINTS, CELLS + 5, {}, "outside 0..8"),
    (POINTS, CELLS.astype(float), {}, "integer"),
    (POINTS, CELLS, {"s": np.ones(8)}, "point data 's'"),
    (POINTS, CELLS, {"": np.ones(9)}, "non-empty"),
])
def test_bad_shapes_are_refused(tmp_path, points, cells, data, words):
    # common practice (no external source): wrong shapes are refused before anything is written
    path = tmp_path / "bad.vtu"
    with pytest.raises(ValueError, match=words):
        write_vtu(path, points, cells, data)
    assert not path.exists()
