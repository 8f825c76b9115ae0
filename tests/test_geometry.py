"""Geometry model: exact areas, features, section cuts, and every class of invalid geometry.

Areas and section widths are checked against closed-form plane geometry (no external source needed);
the validation rules are common practice with no published source.
"""

from __future__ import annotations

import math

import numpy as np
import pytest

from conftest import rect_outline
from fekt.case.schema import CutoutSpec, NotchSpec, PartSpec, Vertex
from fekt.errors import GeometryError
from fekt.geometry.build import build_part
from fekt.geometry.sections import net_section, section_at
from fekt.loads.ends import EndsSpec as LoadSpec
from fekt.loads.ends import apply as apply_ends
from fekt.models import REGISTRY as MODELS
from fekt.models.base import section_of


def build_loads(g, spec, thickness):
    return apply_ends(spec, g, MODELS["plane_stress"], thickness)

X = np.array([1.0, 0.0])


def test_area_with_every_cutout_and_notch():
    spec = PartSpec(outline=rect_outline(100, 20), cutouts=(
        CutoutSpec("h", "circle", (50, 10), diameter=8),
        CutoutSpec("e", "ellipse", (20, 10), a=3, b=1.5, angle=30),
        CutoutSpec("s", "slot", (75, 10), length=10, width=4, angle=90),
        CutoutSpec("r", "rounded_rectangle", (88, 10), length=4, width=6, radius=1)),
        notches=(NotchSpec("u", "top", 40, 4, 1), NotchSpec("v", "bottom", 30, 3, 0.5, 60)))
    g = build_part(spec)
    holes = math.pi * 16 + math.pi * 4.5 + (6 * 4 + math.pi * 4) + (24 - (4 - math.pi))
    u = 2 * 3 * 1 + math.pi / 2
    apex = 3 - 0.5 + 0.5 / math.sin(math.radians(30))
    v = apex * apex * math.tan(math.radians(30)) - 0.25 * (1 / math.tan(math.radians(30)) - math.radians(60))
    assert g.area() == pytest.approx(2000 - holes - u - v, rel=1e-12)
    kinds = sorted(f.kind for f in g.features)
    assert kinds == ["cutout", "cutout", "cutout", "hole", "notch", "notch"]


def test_shoulder_fillet_features_and_net_section():
    out = (Vertex(0, 0, edge="bottom"), Vertex(100, 0), Vertex(100, 10, fillet=5), Vertex(200, 10, edge="right"),
           Vertex(200, 50, edge="top"), Vertex(100, 50, fillet=5), Vertex(100, 60), Vertex(0, 60, edge="left"))
    g = build_part(PartSpec(outline=out))
    fillets = [f for f in g.features if f.kind == "fillet"]
    assert len(fillets) == 2 and all(f.radius == 5 for f in fillets)
    sec = net_section(g, fillets[0], X)
    assert sec.width == pytest.approx(40.0, rel=1e-9)  # the smaller width d


def test_u_notch_net_section_is_at_the_root():
    g = build_part(PartSpec(outline=rect_outline(200, 40), notches=(
        NotchSpec("a", "top", 100, 8, 4), NotchSpec("b", "bottom", 100, 8, 4))))
    f = [f for f in g.features if f.kind == "notch"]
    assert net_section(g, f[0], X).width == pytest.approx(40 - 16, rel=1e-9)


def test_hole_net_section_through_centre_and_two_intervals():
    g = build_part(PartSpec(outline=rect_outline(200, 40), cutouts=(CutoutSpec("h", "circle", (90, 15), diameter=10),)))
    sec = section_of(MODELS["plane_stress"], net_section(g, g.features[0], X), X, 2.0)
    assert sec.s == pytest.approx(90.0, abs=1e-6)
    assert sec.width == pytest.approx(30.0, rel=1e-9)
    assert len(sec.intervals) == 2
    # centroid of [0,10] and [20,40]: (10*5 + 20*30)/30
    assert sec.yc == pytest.approx(650 / 30, rel=1e-9)
    assert section_at(g, X, 10.0).width == pytest.approx(40.0)


def test_sharp_reentrant_corner_is_singular_with_warning():
    out = (Vertex(0, 0, edge="bottom"), Vertex(100, 0), Vertex(100, 10), Vertex(200, 10, edge="right"),
           Vertex(200, 50, edge="top"), Vertex(100, 50), Vertex(100, 60), Vertex(0, 60, edge="left"))
    g = build_part(PartSpec(outline=out))
    corners = [f for f in g.features if f.kind == "sharp_corner"]
    assert len(corners) == 2 and all(f.singular for f in corners)
    assert len(g.warnings) == 2 and "no finite value" in g.warnings[0] and "radius" in g.warnings[0]


def test_clockwise_outline_is_accepted():
    g = build_part(PartSpec(outline=tuple(reversed(rect_outline(10, 5)))))
    assert g.area() == pytest.approx(50.0)


BAD = {
    "self-intersecting outline": (PartSpec(outline=(Vertex(0, 0), Vertex(10, 10), Vertex(10, 0), Vertex(0, 10))),
                                  "not a simple closed curve"),
    "cut-out outside": (PartSpec(outline=rect_outline(10, 10), cutouts=(CutoutSpec("h", "circle", (20, 5), diameter=2),)),
                        "outside"),
    "cut-out crossing the outline": (PartSpec(outline=rect_outline(10, 10),
                                              cutouts=(CutoutSpec("h", "circle", (9.5, 5), diameter=2),)), "crosses"),
    "cut-outs overlapping": (PartSpec(outline=rect_outline(20, 10), cutouts=(
        CutoutSpec("a", "circle", (8, 5), diameter=4), CutoutSpec("b", "circle", (10, 5), diameter=4))), "overlaps"),
    "fillet too big": (PartSpec(outline=(Vertex(0, 0), Vertex(10, 0, fillet=8), Vertex(10, 10, fillet=8), Vertex(0, 10))),
                       "do not fit"),
    "zero diameter": (PartSpec(outline=rect_outline(10, 10), cutouts=(CutoutSpec("h", "circle", (5, 5), diameter=0),)),
                      "must be positive"),
    "notch deeper than the section": (PartSpec(outline=rect_outline(100, 10), notches=(NotchSpec("n", "top", 50, 12, 1),)),
                                      "reaches through"),
    "notch on a missing edge": (PartSpec(outline=rect_outline(100, 10), notches=(NotchSpec("n", "side", 50, 2, 1),)),
                                "does not exist"),
    "notch wider than its edge": (PartSpec(outline=rect_outline(100, 10), notches=(NotchSpec("n", "top", 1, 2, 3),)),
                                  "room"),
    "arc radius below half chord": (PartSpec(outline=(Vertex(0, 0, arc_radius=2), Vertex(10, 0), Vertex(10, 10), Vertex(0, 10))),
                                    "half the chord"),
    "negative thickness": (PartSpec(outline=rect_outline(10, 10), thickness=-1), "must be positive"),
    "degenerate outline": (PartSpec(outline=(Vertex(0, 0), Vertex(1, 1), Vertex(2, 2))), "no area"),
}


@pytest.mark.parametrize("name", sorted(BAD))
def test_invalid_geometry_raises_clear_error(name):
    spec, words = BAD[name]
    with pytest.raises(GeometryError) as exc:
        build_part(spec)
    assert words in str(exc.value)


@pytest.mark.parametrize("ends,words", [(("left", "nope"), "no outline edge"), (("left", "top"), "not parallel"),
                                         (("left", "left"), "different")])
def test_invalid_loads(ends, words):
    g = build_part(PartSpec(outline=rect_outline(10, 5)))
    with pytest.raises(GeometryError) as exc:
        build_loads(g, LoadSpec(ends, force=1.0), 1.0)
    assert words in str(exc.value)


def test_load_without_resultant():
    g = build_part(PartSpec(outline=rect_outline(10, 5)))
    with pytest.raises(GeometryError, match="no resultant"):
        build_loads(g, LoadSpec(("left", "right")), 1.0)


def test_offset_end_centroids_are_balanced_visibly():
    # one-sided step: the ends' centroids differ by 5, so the second end carries F * 5 extra
    out = (Vertex(0, 0, edge="bottom"), Vertex(100, 0, edge="right"), Vertex(100, 10), Vertex(50, 10, fillet=2),
           Vertex(50, 20), Vertex(0, 20, edge="left"))
    g = build_part(PartSpec(outline=out))
    st = build_loads(g, LoadSpec(("left", "right"), force=100.0), 1.0)
    assert st.ends[1].moment == pytest.approx(100.0 * (10.0 - 5.0))
    assert st.notes and "offset" in st.notes[0]
