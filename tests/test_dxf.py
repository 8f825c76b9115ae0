"""Outlines from DXF drawings (built here with ezdxf; no binary fixtures)."""

from __future__ import annotations

import math
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


# --- the same part drawn in either direction (every entity kind fekt reads) --------------------------

QUARTER = math.tan(math.radians(90) / 4)  # bulge of a 90-degree counter-clockwise arc (DXF reference)


def _reverse_polyline(pts):
    """The same polyline drawn the other way: each segment's bulge moves with it and changes sign."""
    rev = list(reversed(pts))
    return [(x, y, -rev[i + 1][2] if i + 1 < len(rev) else 0.0) for i, (x, y, _) in enumerate(rev)]


def _rounded_plate(msp, *, clockwise: bool, style: str) -> None:
    """A 100 x 40 plate with R10 right-hand corners and a hole of diameter 10 (our own test drawing), drawn
    in one direction with one entity kind. Styles: "polyline" (open LWPOLYLINEs with bulges, negative when
    drawn clockwise), "entities" (LINE and ARC entities in drawing order), "mirrored-arcs" (ARCs saved with
    the extrusion (0, 0, -1) that some programs use for clockwise arcs). The loaded ends are LINEs on the
    layers "left" and "right"."""
    ends = [((0, 40), (0, 0), "left"), ((100, 10), (100, 30), "right")]
    if style == "polyline":
        pieces = [[(0, 0, 0.0), (90, 0, QUARTER), (100, 10, 0.0)], [(100, 30, QUARTER), (90, 40, 0.0), (0, 40, 0.0)]]
        for pts in (reversed(pieces) if clockwise else pieces):
            msp.add_lwpolyline(_reverse_polyline(pts) if clockwise else pts, format="xyb")
    else:
        items = [("line", (0, 0), (90, 0)), ("arc", (90, 10), -90, 0), ("arc", (90, 30), 0, 90),
                 ("line", (90, 40), (0, 40))]
        for it in (reversed(items) if clockwise else items):
            if it[0] == "line":
                msp.add_line(*((it[2], it[1]) if clockwise else (it[1], it[2])))
            elif style == "mirrored-arcs":
                # the same arc in a mirrored coordinate system: x -> -x, angles a -> 180 - a, ends swapped
                (cx, cy), a0, a1 = it[1], it[2], it[3]
                msp.add_arc((-cx, cy), 10, 180 - a1, 180 - a0, dxfattribs={"extrusion": (0, 0, -1)})
            else:
                msp.add_arc(it[1], 10, it[2], it[3])
    for a, b, layer in ends:
        msp.add_line(*((b, a) if clockwise else (a, b)), dxfattribs={"layer": layer})
    msp.add_circle((40, 20), 5, dxfattribs={"layer": "hole"})


@pytest.mark.parametrize("style", ["polyline", "entities", "mirrored-arcs"])
def test_drawn_either_way_gives_the_same_part_and_kt(style, tmp_path):
    # common practice, no source: the part does not depend on the direction it was drawn in. Before the
    # fix, a clockwise polyline put each rounded corner's arc centre on the wrong side of its chord.
    from fekt.api import load_case
    from fekt.geometry.build import build_part
    from fekt.pipeline import run

    results = []
    for clockwise in (False, True):
        doc = ezdxf.new()
        doc.header["$INSUNITS"] = 4
        _rounded_plate(doc.modelspace(), clockwise=clockwise, style=style)
        path = tmp_path / f"plate_{clockwise}.dxf"
        doc.saveas(str(path))
        case_path = tmp_path / f"case_{clockwise}.toml"
        case_path.write_text(f'[part]\ndxf = "{path.name}"\nthickness = 5\n[load]\nends = ["left", "right"]\n'
                             'force = 1000\n[mesh]\nelements_per_radius = 6\n')
        case = load_case(case_path)
        part = build_part(case.part)
        segs = [(s.kind, tuple(round(c, 9) + 0.0 for c in s.start), tuple(round(c, 9) + 0.0 for c in s.end))
                for s in part.outline.segments]
        results.append((part.area(), sum(s.length() for s in part.outline.segments), segs,
                        [(p.feature, p.kt_net) for p in run(case).result.peaks]))
    (a0, l0, s0, k0), (a1, l1, s1, k1) = results
    # area: the rectangle less two corner pieces (1 - pi/4) r^2 and the hole (exact)
    assert a0 == pytest.approx(100 * 40 - 2 * (1 - math.pi / 4) * 100 - math.pi * 25, rel=1e-12)
    assert a1 == pytest.approx(a0, rel=1e-12) and l1 == pytest.approx(l0, rel=1e-12)
    assert s0 == s1  # the same curves, in the same order
    assert [f for f, _ in k0] == [f for f, _ in k1]
    for (_, x), (_, y) in zip(k0, k1):
        assert x == pytest.approx(y, rel=1e-9)
