"""Tests for the TOML case-file loader (fekt.case.loader).

The checks exercised here (syntax errors with line numbers, unknown keys with a "did you mean"
suggestion, missing values, wrong types, unit lists, exclusive options, value signs) are common
practice for validating hand-written input files; they follow from the file format described in
docs/case-format.md and do not come from any external source.
"""

from __future__ import annotations

import copy
import re
from pathlib import Path

import pytest

from fekt.api import load_case, parse_case
from fekt.api import case_from_dict
from fekt.case.schema import Material, MeshSpec
from fekt.errors import CaseError
from fekt.geometry.build import build_part

DOCS = Path(__file__).resolve().parents[1] / "docs" / "case-format.md"

FULL_EXAMPLE = """
[case]
name = "strip with central hole"
description = "a strip"
demo = false

[units]
length = "mm"
force = "N"

[parameters]
W = 40
d = "0.3*W"
L = "6*W"

[part]
model = "plane_stress"
thickness = 5
outline = [
  { x = 0,   y = 0,   edge = "bottom" },
  { x = "L", y = 0,   edge = "right" },
  { x = "L", y = "W", edge = "top", fillet = 2 },
  { x = 0,   y = "W", edge = "left", arc = { radius = 30, bulge = "out" } },
]

[[part.cutouts]]
name = "hole"
shape = "circle"
center = ["L/2", "W/2"]
diameter = "d"

[[part.notches]]
name = "top notch"
edge = "top"
position = "L/2"
depth = 4
root_radius = 1
angle = 0

[material]
E = 210000
nu = 0.3

[load]
ends = ["left", "right"]
force = 10000
moment = 0

[mesh]
elements_per_radius = 16
size = 5
growth = 0.25
"""


def base() -> dict:
    """A valid case as tomllib would return it; each test changes one thing."""
    return {
        "units": {"length": "mm", "force": "N"},
        "parameters": {"W": 40, "L": "6*W"},
        "part": {
            "thickness": 5,
            "outline": [
                {"x": 0, "y": 0, "edge": "bottom"},
                {"x": "L", "y": 0, "edge": "right"},
                {"x": "L", "y": "W", "edge": "top", "fillet": 2},
                {"x": 0, "y": "W", "edge": "left", "arc": {"radius": 30, "bulge": "out"}},
            ],
            "cutouts": [{"name": "hole", "shape": "circle", "center": ["L/2", "W/2"], "diameter": 12}],
            "notches": [{"name": "n1", "edge": "top", "position": "L/2", "depth": 4, "root_radius": 1}],
        },
        "material": {"E": 210000, "nu": 0.3},
        "load": {"ends": ["left", "right"], "force": 1000},
        "mesh": {"size": 5},
    }


DELETE = object()


def changed(path: tuple, value: object) -> dict:
    """base() with the entry at ``path`` set to ``value`` (or removed, for DELETE)."""
    data = base()
    parent = data
    for key in path[:-1]:
        parent = parent[key]
    if value is DELETE:
        del parent[path[-1]]
    else:
        parent[path[-1]] = copy.deepcopy(value)
    return data


def error_of(data: dict) -> CaseError:
    with pytest.raises(CaseError) as info:
        case_from_dict(data, "test.toml")
    assert type(info.value) is CaseError
    return info.value


# --- valid files -----------------------------------------------------------------------------------

def test_full_example_parses():
    case = parse_case(FULL_EXAMPLE, source="cases/example.toml")
    assert case.name == "strip with central hole"
    assert case.description == "a strip"
    assert case.demo is False
    assert case.source == "cases/example.toml"
    assert case.units.length == "mm" and case.units.force == "N" and case.units.stress == "MPa"
    assert case.parameters == (("W", 40.0), ("d", 12.0), ("L", 240.0))
    part = case.part
    assert part.model == "plane_stress" and part.thickness == 5.0
    assert [(v.x, v.y, v.edge) for v in part.outline] == [
        (0.0, 0.0, "bottom"), (240.0, 0.0, "right"), (240.0, 40.0, "top"), (0.0, 40.0, "left")]
    assert part.outline[2].fillet == 2.0
    assert part.outline[3].arc_radius == 30.0 and part.outline[3].bulge == "out"
    assert part.outline[0].arc_radius is None
    (hole,) = part.cutouts
    assert (hole.name, hole.shape, hole.center, hole.diameter) == ("hole", "circle", (120.0, 20.0), 12.0)
    (notch,) = part.notches
    assert (notch.name, notch.edge, notch.position, notch.depth, notch.root_radius, notch.angle) == (
        "top notch", "top", 120.0, 4.0, 1.0, 0.0)
    assert (case.material.E, case.material.nu) == (210000.0, 0.3)
    assert case.loads[0].ends == ("left", "right")
    assert (case.loads[0].force, case.loads[0].moment, case.loads[0].stress) == (10000.0, 0.0, None)
    assert (case.mesh.elements_per_radius, case.mesh.size, case.mesh.growth) == (16.0, 5.0, 0.25)


def test_documented_example_parses_and_builds():
    # Keeps the format documentation honest: its complete example must stay a working case.
    block = re.search(r"```toml\n(.*?)```", DOCS.read_text(encoding="utf-8"), re.S)
    assert block is not None
    case = parse_case(block.group(1), source=str(DOCS))
    geometry = build_part(case.part)
    assert geometry.warnings == ()
    assert {f.kind for f in geometry.features} >= {"fillet", "notch", "hole"}


def test_load_case_names_the_case_after_the_file(tmp_path):
    path = tmp_path / "my_bar.toml"
    path.write_text(FULL_EXAMPLE.replace('name = "strip with central hole"\n', ""), encoding="utf-8")
    case = load_case(path)
    assert case.name == "my_bar"
    assert case.source == str(path)


def test_optional_sections_take_defaults():
    data = base()
    for key in ("units", "parameters", "material", "mesh"):
        data.pop(key)
    data["part"] = {
        "model": "plane_strain",
        "outline": [{"x": 0, "y": 0}, {"x": 100, "y": 0, "edge": "right"}, {"x": 100, "y": 20},
                    {"x": 0, "y": 20, "edge": "left"}],
    }
    case = case_from_dict(data, "<string>")
    assert case.name == "case"
    assert (case.units.length, case.units.force) == ("mm", "N")
    assert case.part.thickness == 1.0
    assert case.part.cutouts == () and case.part.notches == ()
    assert case.material == Material()
    assert case.mesh == MeshSpec()
    assert case.parameters == ()


def test_documented_defaults_match_the_schema():
    text = DOCS.read_text(encoding="utf-8")
    mesh, material = MeshSpec(), Material()
    assert f"| `elements_per_radius` | {mesh.elements_per_radius:g} |" in text
    assert f"| `growth` | {mesh.growth:g} |" in text
    assert f"| `E` | {material.E:g} |" in text
    assert f"| `nu` | {material.nu:g} |" in text


def test_expressions_evaluate_with_parameters_in_any_order():
    data = base()
    data["parameters"] = {"half": "W/2", "W": "2*r*sqrt(4)", "r": 10, "ang": "atan(1)", "L": "6*W"}
    data["part"]["cutouts"][0]["center"] = ["L/2 + r*cos(60)", "half"]
    data["part"]["cutouts"][0]["diameter"] = "min(r, W) / 2"
    data["load"] = {"ends": ["left", "right"], "stress": "100 * tan(ang)", "moment": "-2**3"}
    case = case_from_dict(data, "t")
    assert dict(case.parameters) == {"half": 20.0, "W": 40.0, "r": 10.0, "ang": pytest.approx(45.0), "L": 240.0}
    assert [name for name, _ in case.parameters] == ["half", "W", "r", "ang", "L"]  # file order kept
    assert case.part.cutouts[0].center == (125.0, 20.0)
    assert case.part.cutouts[0].diameter == 5.0
    assert case.loads[0].stress == pytest.approx(100.0)
    assert case.loads[0].force == 0.0 and case.loads[0].moment == -8.0


@pytest.mark.parametrize("cutout, expected", [
    ({"shape": "ellipse", "center": [100, 20], "a": 8, "b": 4, "angle": 30}, {"a": 8.0, "b": 4.0, "angle": 30.0}),
    ({"shape": "slot", "center": [100, 20], "length": 20, "width": 6}, {"length": 20.0, "width": 6.0, "angle": 0.0}),
    ({"shape": "rounded_rectangle", "center": [100, 20], "length": 20, "width": 10, "radius": 2, "angle": 90},
     {"length": 20.0, "width": 10.0, "radius": 2.0, "angle": 90.0}),
])
def test_cutout_shapes(cutout, expected):
    case = case_from_dict(changed(("part", "cutouts", 0), cutout), "t")
    (spec,) = case.part.cutouts
    assert spec.name == "cut-out 1"  # default name, counting from 1
    assert {key: getattr(spec, key) for key in expected} == expected
    build_part(case.part)


def test_chain_cutout_vertices():
    chain = {"name": "tri", "shape": "chain", "vertices": [
        {"x": 100, "y": 10, "fillet": 1}, {"x": 120, "y": 10, "arc": {"radius": 30}}, {"x": 110, "y": 25}]}
    case = case_from_dict(changed(("part", "cutouts", 0), chain), "t")
    vertices = case.part.cutouts[0].vertices
    assert [(v.x, v.y, v.fillet) for v in vertices] == [(100.0, 10.0, 1.0), (120.0, 10.0, 0.0), (110.0, 25.0, 0.0)]
    assert vertices[1].arc_radius == 30.0 and vertices[1].bulge == "out"
    assert vertices[0].arc_radius is None
    build_part(case.part)


# --- outline orientation and notch positions ---------------------------------------------------------

def _bar(outline: list[dict], notch_edge: str, position: float) -> dict:
    return {
        "part": {"thickness": 1, "outline": outline,
                 "notches": [{"name": "n", "edge": notch_edge, "position": position, "depth": 5,
                              "root_radius": 2}]},
        "load": {"ends": ["left", "right"], "force": 1},
    }


def test_notch_position_follows_the_written_order_on_a_clockwise_outline():
    # The same 200 x 40 bar with a notch centred at x = 60 in the bottom edge, written both ways.
    ccw = [{"x": 0, "y": 0, "edge": "bottom"}, {"x": 200, "y": 0, "edge": "right"},
           {"x": 200, "y": 40, "edge": "top"}, {"x": 0, "y": 40, "edge": "left"}]
    cw = [{"x": 0, "y": 0, "edge": "left"}, {"x": 0, "y": 40, "edge": "top"},
          {"x": 200, "y": 40, "edge": "right"}, {"x": 200, "y": 0, "edge": "bottom"}]
    # Counter-clockwise, "bottom" starts at (0, 0); clockwise it starts at (200, 0).
    case_ccw = case_from_dict(_bar(ccw, "bottom", 60), "ccw")
    case_cw = case_from_dict(_bar(cw, "bottom", 140), "cw")
    assert case_ccw.part.notches[0].position == 60.0
    # build_part measures from the start after turning the outline counter-clockwise: 200 - 140.
    assert case_cw.part.notches[0].position == 60.0
    for case in (case_ccw, case_cw):
        (notch,) = [f for f in build_part(case.part).features if f.kind == "notch"]
        assert notch.point[0] == pytest.approx(60.0)
        assert notch.point[1] == pytest.approx(5.0, abs=1e-9)


def test_counter_clockwise_notch_position_is_unchanged_on_a_slanted_edge():
    outline = [{"x": 0, "y": 0, "edge": "bottom"}, {"x": 90, "y": 0, "edge": "right"},
               {"x": 90, "y": 50, "edge": "slope"}, {"x": 0, "y": 10, "edge": "left"}]
    case = case_from_dict(_bar(outline, "slope", 30), "t")
    assert case.part.notches[0].position == 30.0


def test_clockwise_notch_position_uses_the_length_of_its_own_edge():
    # Slanted edge from (0, 10) to (90, 50) written first in a clockwise outline: length sqrt(90^2 + 40^2).
    outline = [{"x": 0, "y": 10, "edge": "slope"}, {"x": 90, "y": 50, "edge": "right"},
               {"x": 90, "y": 0, "edge": "bottom"}, {"x": 0, "y": 0, "edge": "left"}]
    case = case_from_dict(_bar(outline, "slope", 30), "t")
    assert case.part.notches[0].position == pytest.approx((90**2 + 40**2) ** 0.5 - 30)


# --- errors ---------------------------------------------------------------------------------------------

def test_toml_syntax_error_names_source_line_and_column():
    text = '[case]\nname = "x"\nthickness 5\n'
    with pytest.raises(CaseError) as info:
        parse_case(text, source="bad.toml")
    message = str(info.value)
    assert "bad.toml" in message
    assert "line 3" in message and "column" in message


def test_toml_syntax_error_from_a_file_names_the_file(tmp_path):
    path = tmp_path / "broken.toml"
    path.write_text('[part]\nthickness = 5\noutline = [\n  { x = 0, y = 0 ,\n]\n', encoding="utf-8")
    with pytest.raises(CaseError) as info:
        load_case(path)
    assert str(path) in str(info.value)
    assert "line 4" in str(info.value) or "line 5" in str(info.value)


def test_missing_file_is_a_case_error(tmp_path):
    with pytest.raises(CaseError) as info:
        load_case(tmp_path / "nope.toml")
    assert "nope.toml" in str(info.value)


@pytest.mark.parametrize("path, value, item, suggestion", [
    (("matrial",), {"E": 1}, "matrial", "'material'"),
    (("part", "thicknes"), 5, "part.thicknes", "'thickness'"),
    (("part", "outline", 2, "fillett"), 1, "part.outline[2].fillett", "'fillet'"),
    (("part", "outline", 3, "arc", "radias"), 30, "part.outline[3].arc.radias", "'radius'"),
    (("part", "notches", 0, "root_raduis"), 1, "part.notches[0].root_raduis", "'root_radius'"),
    (("part", "cutouts", 0, "diametre"), 1, "part.cutouts[0].diametre", "'diameter'"),
    (("material", "e"), 1, "material.e", "'E'"),
    (("load", "forces"), 1, "load.forces", "'force'"),
    (("mesh", "sise"), 1, "mesh.sise", "'size'"),
    (("units", "lenght"), "mm", "units.lenght", "'length'"),
    (("case",), {"descripton": "x"}, "case.descripton", "'description'"),
])
def test_unknown_key_suggests_the_nearest(path, value, item, suggestion):
    error = error_of(changed(path, value))
    message = str(error)
    assert error.item == item
    assert item in message
    assert "did you mean" in message and suggestion in message


def test_key_of_another_cutout_shape_is_named_as_such():
    error = error_of(changed(("part", "cutouts", 0, "a"), 5))
    assert error.item == "part.cutouts[0].a"
    assert "does not apply to shape 'circle'" in str(error)


@pytest.mark.parametrize("path, value, item, fragment", [
    # missing required values
    (("part",), DELETE, "part", "missing"),
    (("load",), DELETE, "load", "missing"),
    (("part", "outline"), DELETE, "part.outline", "missing"),
    (("part", "outline", 1, "x"), DELETE, "part.outline[1].x", "missing"),
    (("part", "thickness"), DELETE, "part.thickness", "missing"),
    (("part", "notches", 0, "depth"), DELETE, "part.notches[0].depth", "missing"),
    (("part", "cutouts", 0, "diameter"), DELETE, "part.cutouts[0].diameter", "missing"),
    (("part", "cutouts", 0, "shape"), DELETE, "part.cutouts[0].shape", "missing"),
    (("part", "outline", 3, "arc", "radius"), DELETE, "part.outline[3].arc.radius", "missing"),
    (("load", "ends"), DELETE, "load.ends", "missing"),
    (("load", "force"), DELETE, "load", "missing load"),
    # wrong types
    (("part", "thickness"), [5], "part.thickness", "expected a number"),
    (("part", "outline", 2, "fillet"), True, "part.outline[2].fillet", "boolean"),
    (("part", "outline", 0, "edge"), 3, "part.outline[0].edge", "expected a string"),
    (("part", "outline"), {"x": 0}, "part.outline", "expected an array"),
    (("part", "outline", 1), [1, 2], "part.outline[1]", "expected a table"),
    (("part", "cutouts", 0, "center"), [1, 2, 3], "part.cutouts[0].center", "2 coordinates"),
    (("part", "cutouts", 0, "center"), 5, "part.cutouts[0].center", "expected an array"),
    (("case",), {"demo": "yes"}, "case.demo", "true or false"),
    (("case",), {"name": 7}, "case.name", "expected a string"),
    (("material",), "steel", "material", "expected a table"),
    (("load", "ends"), "left", "load.ends", "expected an array"),
    # lists of allowed words
    (("units", "length"), "mm2", "units.length", "not one of"),
    (("units", "force"), "lb", "units.force", "not one of"),
    (("part", "model"), "plane", "part.model", "not one of"),
    (("part", "cutouts", 0, "shape"), "square", "part.cutouts[0].shape", "not one of"),
    (("part", "outline", 3, "arc", "bulge"), "outward", "part.outline[3].arc.bulge", "not one of"),
    # load
    (("load", "stress"), 100, "load.stress", "either force or stress"),
    (("load", "ends"), ["left", "left"], "load.ends", "both ends"),
    (("load", "ends"), ["left"], "load.ends", "expected 2"),
    (("load", "ends"), ["left", "rigth"], "load.ends[1]", "no edge named 'rigth'"),
    (("load", "force"), 0, "load", "zero"),
    # material
    (("material", "E"), 0, "material.E", "positive"),
    (("material", "E"), -5, "material.E", "positive"),
    (("material", "nu"), 0.5, "material.nu", "between -1 and 0.5"),
    (("material", "nu"), -1, "material.nu", "between -1 and 0.5"),
    # mesh
    (("mesh", "elements_per_radius"), 0, "mesh.elements_per_radius", "positive"),
    (("mesh", "size"), -1, "mesh.size", "positive"),
    (("mesh", "growth"), 0, "mesh.growth", "positive"),
    # values that can only be positive (or not negative)
    (("part", "thickness"), 0, "part.thickness", "positive"),
    (("part", "outline", 2, "fillet"), -1, "part.outline[2].fillet", "zero or positive"),
    (("part", "outline", 3, "arc", "radius"), 0, "part.outline[3].arc.radius", "positive"),
    (("part", "cutouts", 0, "diameter"), "-W", "part.cutouts[0].diameter", "positive"),
    (("part", "notches", 0, "depth"), 0, "part.notches[0].depth", "positive"),
    (("part", "notches", 0, "root_radius"), -0.5, "part.notches[0].root_radius", "zero or positive"),
    (("part", "notches", 0, "position"), 0, "part.notches[0].position", "positive"),
    # names and references
    (("part", "notches", 0, "edge"), "tpo", "part.notches[0].edge", "no edge named 'tpo'"),
    (("part", "notches", 0, "position"), "L + 1", "part.notches[0].position", "not inside edge"),
    (("part", "outline", 1, "edge"), "bottom", "part.outline[1].edge", "already used"),
    (("part", "cutouts", 1), {"name": "hole", "shape": "circle", "center": [50, 20], "diameter": 4},
     "part.cutouts[1].name", "already used"),
    (("part", "cutouts", 0, "name"), "  ", "part.cutouts[0].name", "empty"),
    # expressions
    (("part", "cutouts", 0, "diameter"), "d/2", "part.cutouts[0].diameter", "unknown name 'd'"),
    (("parameters",), {"a": "b + 1", "b": "2*a"}, "parameters.", "circular"),
    (("parameters",), [1, 2], "parameters", "expected a table"),
])
def test_errors_name_the_item(path, value, item, fragment):
    if path == ("part", "cutouts", 1):
        data = base()
        data["part"]["cutouts"].append(copy.deepcopy(value))
    else:
        data = changed(path, value)
    error = error_of(data)
    message = str(error)
    assert item in message
    assert fragment in message


def test_unknown_load_end_suggests_an_edge():
    error = error_of(changed(("load", "ends"), ["left", "rigth"]))
    assert "did you mean 'right'?" in str(error)


def test_geometry_is_left_to_build_part():
    # A fillet far too big for its corner is well-formed input: the loader accepts it and
    # build_part reports it.
    case = case_from_dict(changed(("part", "outline", 2, "fillet"), 500), "t")
    assert case.part.outline[2].fillet == 500.0
