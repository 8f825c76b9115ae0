"""Outlines from DXF drawings (built here with ezdxf; no binary fixtures)."""

from __future__ import annotations

import os

import ezdxf
import pytest

from dxf_helpers import part_to_dxf
from fekt.api import solve
from fekt.case.dxf import read_outline
from fekt.api import load_case, parse_case
from fekt.case.schema import PartSpec
from fekt.errors import CaseError, InputError
from fekt.geometry.build import build_part

ROOT = os.path.dirname(os.path.dirname(os.path.abspath(__file__)))


def _case_text(dxf: str, extra: str = "", force: float = 24000.0) -> str:
    return (f'[part]\nthickness = 8\ndxf = "{dxf}"\n{extra}\n[load]\nends = ["left", "right"]\nforce = {force}\n')


def test_demo_link_from_dxf_gives_the_same_kt(tmp_path):
    case = load_case(os.path.join(ROOT, "cases", "demo_link.toml"))
    part_to_dxf(build_part(case.part), tmp_path / "link.dxf")
    (tmp_path / "link.toml").write_text(_case_text("link.dxf"))
    a = solve(case, estimate=False)
    b = solve(load_case(tmp_path / "link.toml"), estimate=False)
    assert [round(h.kt_net, 9) for h in a.peaks] == [round(h.kt_net, 9) for h in b.peaks]


def test_units_from_header_and_override(tmp_path):
    case = load_case(os.path.join(ROOT, "cases", "demo_link.toml"))
    part = build_part(case.part)
    part_to_dxf(part, tmp_path / "inch.dxf", insunits=1, scale=1 / 25.4)  # drawn in inches
    got = read_outline(tmp_path / "inch.dxf", case_unit="mm")
    assert build_part(PartSpec(outline=got.outline, cutouts=got.cutouts)).area() == pytest.approx(part.area(), rel=1e-9)
    part_to_dxf(part, tmp_path / "none.dxf", insunits=0)
    with pytest.raises(CaseError, match="unit"):
        read_outline(tmp_path / "none.dxf", case_unit="mm")
    got = read_outline(tmp_path / "none.dxf", case_unit="mm", drawing_unit="mm")
    assert len(got.cutouts) == 1


def test_polyline_with_bulges_and_ellipse(tmp_path):
    doc = ezdxf.new()
    doc.header["$INSUNITS"] = 4
    msp = doc.modelspace()
    for (a, b), layer in zip([((0, 0), (200, 0)), ((200, 0), (200, 40)), ((200, 40), (0, 40)), ((0, 40), (0, 0))],
                             ["bottom", "right", "top", "left"]):
        msp.add_line(a, b, dxfattribs={"layer": layer})
    # an obround slot as a closed polyline with two half-circle bulges (bulge 1 = 180 degrees)
    msp.add_lwpolyline([(60, 15, 0), (80, 15, 1), (80, 25, 0), (60, 25, 1)], format="xyb", close=True)
    msp.add_ellipse((140, 20), (6, 0, 0), 0.5)
    doc.saveas(tmp_path / "p.dxf")
    got = read_outline(tmp_path / "p.dxf", case_unit="mm")
    part = build_part(PartSpec(outline=got.outline, cutouts=got.cutouts))
    slot = 20 * 10 + 3.141592653589793 * 25
    ellipse = 3.141592653589793 * 6 * 3
    assert part.area() == pytest.approx(8000 - slot - ellipse, rel=1e-9)


def _dxf(tmp_path, build) -> str:
    doc = ezdxf.new()
    doc.header["$INSUNITS"] = 4
    build(doc.modelspace())
    p = tmp_path / "x.dxf"
    doc.saveas(p)
    return str(p)


def _square(msp, gap=0.0):
    msp.add_line((0, 0), (10, 0), dxfattribs={"layer": "bottom"})
    msp.add_line((10, 0), (10, 10), dxfattribs={"layer": "right"})
    msp.add_line((10, 10), (0, 10), dxfattribs={"layer": "top"})
    msp.add_line((0, 10), (0, gap), dxfattribs={"layer": "left"})


@pytest.mark.parametrize("name,build,words", [
    ("open chain", lambda m: _square(m, gap=0.5), "open chain"),
    ("branch", lambda m: (_square(m), m.add_line((0, 0), (5, 5))), "branches"),
    ("unsupported entity", lambda m: (_square(m), m.add_spline([(1, 1), (2, 3), (4, 2)])), "SPLINE"),
    ("elliptical arc", lambda m: (_square(m), m.add_ellipse((5, 5), (2, 0, 0), 0.5, 0, 1.0)), "elliptical arc"),
    ("empty drawing", lambda m: None, "no lines"),
])
def test_dxf_errors(tmp_path, name, build, words):
    path = _dxf(tmp_path, build)
    with pytest.raises(CaseError) as exc:
        read_outline(path, case_unit="mm")
    assert words in str(exc.value)


def test_overlapping_loops_are_rejected(tmp_path):
    def build(m):
        _square(m)
        m.add_circle((9.5, 5), 1.0)

    (tmp_path / "c.toml").write_text(_case_text(_dxf(tmp_path, build), force=1.0))
    case = load_case(tmp_path / "c.toml")
    with pytest.raises(InputError, match="crosses"):
        build_part(case.part)


def test_missing_dxf_file_and_bad_override(tmp_path):
    with pytest.raises(CaseError, match="not found"):
        parse_case(_case_text("nope.dxf"), source=str(tmp_path / "c.toml"))
    (tmp_path / "x.dxf").write_text("")
    with pytest.raises(CaseError, match="dxf_units"):
        parse_case(_case_text("x.dxf", 'dxf_units = "furlong"'), source=str(tmp_path / "c.toml"))
    with pytest.raises(CaseError, match="not a DXF file|cannot read"):
        parse_case(_case_text("x.dxf"), source=str(tmp_path / "c.toml"))
