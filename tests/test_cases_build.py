"""Every case file in cases/ loads, builds and has loadable ends.

These are consistency checks of the shipped case files against the loader, the geometry builder
and the end-load setup; they use no external reference data.
"""

from __future__ import annotations

from pathlib import Path

import pytest

from fekt.api import load_case
from fekt.geometry.build import build_part
from fekt.pipeline import apply_loads

CASES = sorted((Path(__file__).resolve().parents[1] / "cases").glob("*.toml"))
DEMOS = {"demo_link", "demo_strap", "demo_bracket"}
EXPECTED = DEMOS | {"strip_hole", "opposite_u_notches", "shoulder_fillet", "sharp_corner"}


def test_the_expected_case_files_exist():
    assert EXPECTED <= {path.stem for path in CASES}


@pytest.mark.parametrize("path", CASES, ids=[p.stem for p in CASES])
def test_case_loads_and_builds(path):
    case = load_case(path)
    geometry = build_part(case.part)
    loads = apply_loads(case, geometry)
    assert case.source == str(path)
    assert case.loads[0].ends == ("left", "right")
    assert case.part.model == ("axisymmetric" if "shaft" in path.stem else "plane_stress")
    assert (case.units.length, case.units.force) == ("mm", "N")
    assert sum(c.magnitude for c in loads.components if c.quantity == "force") != 0.0
    # Symmetric or aligned ends: no balancing moment had to be added.
    assert loads.notes == ()
    if path.stem in EXPECTED:
        # Only the sharp-corner case is meant to be singular.
        assert bool(geometry.warnings) == (path.stem == "sharp_corner")
    if path.stem == "sharp_corner":
        assert sum(f.kind == "sharp_corner" for f in geometry.features) == 2


@pytest.mark.parametrize("path", CASES, ids=[p.stem for p in CASES])
def test_demo_cases_are_labelled(path):
    case = load_case(path)
    is_demo = path.stem.startswith("demo_")
    assert case.demo is is_demo
    assert ("demo data: invented part" in case.description) is is_demo


def test_features_of_the_demo_parts():
    kinds = {p.stem: sorted(f.kind for f in build_part(load_case(p).part).features) for p in CASES}
    assert kinds["demo_link"] == ["fillet"] * 4 + ["hole"]
    assert kinds["demo_strap"] == ["cutout", "notch", "notch"]
    assert kinds["demo_bracket"] == ["cutout", "fillet", "fillet"]
    assert kinds["strip_hole"] == ["hole"]
    assert kinds["opposite_u_notches"] == ["notch", "notch"]
    assert kinds["shoulder_fillet"] == ["fillet", "fillet"]


def test_strap_notches_face_each_other():
    # The strap's notch positions are measured from opposite ends of the bar (each edge's start
    # vertex): they must still land on one cross-section.
    features = build_part(load_case(next(p for p in CASES if p.stem == "demo_strap")).part).features
    xs = [f.point[0] for f in features if f.kind == "notch"]
    assert xs[0] == pytest.approx(xs[1])
