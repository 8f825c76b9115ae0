"""Field export (fekt.post.export, fekt.report.vtu.write_fields, ``fekt solve --vtu``): written, read
back with meshio, compared with the arrays fekt computed and with fekt's own peak.

Sources: the Kirsch solution (1898) for a circular hole in a plate under uniaxial tension S -- the hoop
stress on the hole is S (1 - 2 cos 2 theta), so 3 S at the top and bottom and -S at the sides -- as in
tests/test_exact_solutions.py; VTK's quadratic triangle node order (VTK User's Guide, 11th ed., XML file
formats, cell type 22); NIST SP 811 (2008) B.8 for psi and inch. That averaged nodal stresses lie below
the peak read at facet Gauss points is fekt's own measurement (docs/pitfalls.md, E).
"""

from __future__ import annotations

import dataclasses
import json
import os

import meshio
import numpy as np
import pytest

from fekt.api import load_case
from fekt.cli.main import main
from fekt.pipeline import run
from fekt.post.export import nodal_fields, von_mises
from fekt.report.vtu import field_arrays, write_fields

STRIP = os.path.join(os.path.dirname(os.path.dirname(os.path.abspath(__file__))), "cases", "strip_hole.toml")


@pytest.fixture(scope="module")
def strip():
    case = load_case(STRIP)
    case = dataclasses.replace(case, mesh=dataclasses.replace(case.mesh, elements_per_radius=6))
    solved = run(case)
    return STRIP, solved, nodal_fields(solved.solution, solved.pmesh)


def test_vtu_round_trip_exact(strip, tmp_path):
    _, solved, nf = strip
    path = tmp_path / "field.vtu"
    write_fields(path, nf, "MPa", "mm")
    mesh = meshio.read(path)
    assert [b.type for b in mesh.cells] == ["triangle6"]
    np.testing.assert_array_equal(mesh.cells[0].data, nf.cells6)
    np.testing.assert_array_equal(mesh.points[:, :2], nf.points)
    _, arrays = field_arrays(nf, "MPa", "mm")
    assert set(mesh.point_data) == set(arrays)
    for name, values in arrays.items():
        got = mesh.point_data[name]
        got = got[:, :2] if got.ndim == 2 else got
        np.testing.assert_array_equal(got, values if values.ndim == 1 else values[:, :2], err_msg=name)
    # the mid-side nodes of every cell lie half-way along its (curved) edges: VTK's node order
    p = mesh.points[mesh.cells[0].data]
    chord = np.linalg.norm(p[:, 3] - (p[:, 0] + p[:, 1]) / 2, axis=1)
    assert np.max(chord) < 0.05 * np.max(np.linalg.norm(p[:, 1] - p[:, 0], axis=1))


def test_nodal_values(strip):
    _, solved, nf = strip
    mesh = solved.pmesh.mesh
    basis = solved.solution.basis("in-plane")
    u = solved.solution.fields[0].u
    v = np.arange(mesh.nvertices)
    tol = dict(rtol=1e-12, atol=1e-14 * np.abs(u).max())   # the solved values, to round-off
    np.testing.assert_allclose(nf.displacement[v], u[basis.nodal_dofs[:, v]].T, **tol)
    f = np.arange(mesh.facets.shape[1])
    np.testing.assert_allclose(nf.displacement[mesh.nvertices + f], u[basis.facet_dofs[:, f]].T, **tol)
    # boundary stress at boundary nodes only: one per boundary facet end and one per mid-side node
    on = ~np.isnan(nf.boundary_stt)
    assert on.sum() == 2 * solved.pmesh.boundary_facets.size                # closed loops: as many corners as facets
    assert np.all(nf.elements_per_node >= 1)
    np.testing.assert_allclose(nf.von_mises, von_mises(nf.stress))
    assert np.all(nf.s1 >= nf.s2)


def test_cli_vtu_peak_beside_fekts_peak(tmp_path, capsys):
    # the file's largest boundary tangential stress against fekt's table (facet Gauss points): close,
    # but not equal -- nodes are not Gauss points, and corner nodes take the mean of two facets
    out = tmp_path / "res"
    assert main(["solve", STRIP, "--elements-per-radius", "6", "--no-estimate", "--out", str(out), "--vtu",
                 "--json"]) == 0
    result = json.loads(capsys.readouterr().out)
    mesh = meshio.read(out / "field.vtu")
    stt = mesh.point_data["boundary tangential stress [MPa]"]
    i = int(np.nanargmax(stt))
    top = result["peaks"][0]
    diff = stt[i] / top["peak"] - 1
    assert abs(diff) < 0.01
    assert np.hypot(mesh.points[i, 0] - top["x"], mesh.points[i, 1] - top["y"]) < 1.0   # the same place (mm)
    averaged = float(np.max(mesh.point_data["max principal stress [MPa]"]))
    assert averaged < top["peak"]                                             # averaging loses peak (pitfalls E)
    with capsys.disabled():
        print(f"\n  field.vtu read back: max boundary tangential stress {stt[i]:.2f} MPa at ({mesh.points[i, 0]:.3f}, "
              f"{mesh.points[i, 1]:.3f}); fekt's peak {top['peak']:.2f} MPa at ({top['x']:.3f}, {top['y']:.3f}): "
              f"{100 * diff:+.2f} %; averaged nodal max principal {averaged:.2f} MPa "
              f"({100 * (averaged / top['peak'] - 1):+.2f} %)")


def test_cli_vtu_in_other_units(tmp_path, capsys):
    out = tmp_path / "res"
    assert main(["solve", STRIP, "--elements-per-radius", "6", "--no-estimate", "--out", str(out), "--vtu",
                 "--units", "ksi,in", "--json"]) == 0
    result = json.loads(capsys.readouterr().out)
    mesh = meshio.read(out / "field.vtu")
    assert "boundary tangential stress [ksi]" in mesh.point_data and "displacement [in]" in mesh.point_data
    stt = mesh.point_data["boundary tangential stress [ksi]"]
    i = int(np.nanargmax(stt))
    assert stt[i] == pytest.approx(result["peaks"][0]["peak"], rel=0.01)
    # 1 ksi = 6.894 757 MPa, 1 in = 25.4 mm (NIST SP 811 B.8): the part is 320 mm = 12.598 in long
    assert mesh.points[:, 0].max() == pytest.approx(320 / 25.4, rel=1e-12)


def test_kirsch_boundary_stress_at_nodes(kirsch_default):
    # Kirsch (1898): 3 S at the top of the hole; the node values (own elements, no averaging across the
    # boundary except at corner nodes) are within 0.5 %, the averaged nodal principal stress lower
    part, pm, sol, _ = kirsch_default
    nf = nodal_fields(sol, pm)
    r = np.hypot(nf.points[:, 0], nf.points[:, 1])
    hole = np.abs(r - 1.0) < 1e-9
    assert nf.boundary_stt[hole].max() == pytest.approx(3.0, rel=5e-3)
    assert nf.boundary_stt[hole].min() == pytest.approx(-1.0, abs=2e-2)
    assert nf.s1[hole].max() < nf.boundary_stt[hole].max()
