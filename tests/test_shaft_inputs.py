"""Every invalid shaft input ends in its own clear message and exit code 2 (never a traceback), and the
shaft case-file keys are read as documented in docs/case-format.md. (Common practice, no external source.)"""

from __future__ import annotations

import os

import pytest

from fekt.api import load_case
from fekt.case.loader import parse_case
from fekt.cli.main import main
from fekt.loads.shaft_ends import ShaftEndsSpec
from fekt.registry import CATALOGUE

ROOT = os.path.dirname(os.path.dirname(os.path.abspath(__file__)))

GOOD = """
[part]
model = "axisymmetric"
outline = [
  { x = 0, y = 0, edge = "axis" },
  { x = 120, y = 0, edge = "right" },
  { x = 120, y = 10, edge = "narrow" },
  { x = 60, y = 10, edge = "step", fillet = 2 },
  { x = 60, y = 15, edge = "wide" },
  { x = 0, y = 15, edge = "left" },
]
[load]
ends = ["left", "right"]
moment = 1e5
torque = 2e5
"""


def mutate(old: str, new: str, text: str = GOOD) -> str:
    assert old in text, old
    return text.replace(old, new, 1)


FAMILY = """
[part]
family = "{family}"
dimensions = {{ {dims} }}
[load]
{load}
"""

#: (class of mistake, case text, words the message must contain)
BAD = [
    ("thickness on a shaft", mutate('model = "axisymmetric"', 'model = "axisymmetric"\nthickness = 5'),
     "takes no thickness"),
    ("torque on a plate", mutate('model = "axisymmetric"', 'thickness = 5').replace("moment = 1e5\n", ""),
     "'torque' is not a load of model 'plane_stress'"),
    ("shaft load type on a plate", mutate('model = "axisymmetric"', 'thickness = 5').replace(
        "[load]", '[load]\ntype = "shaft_ends"'), "load type 'shaft_ends' does not apply to model 'plane_stress'"),
    ("plate load type on a shaft", mutate("[load]", '[load]\ntype = "ends"'),
     "load type 'ends' does not apply to model 'axisymmetric'"),
    ("plate-only key on a shaft", mutate("torque = 2e5", "stress = 100"), "'stress' is not a load of model"),
    ("outline crossing the axis", mutate('{ x = 120, y = 0, edge = "right" }', '{ x = 120, y = -2, edge = "right" }'),
     "crosses the axis"),
    ("no axis edge", mutate('{ x = 0, y = 0, edge = "axis" },\n  { x = 120, y = 0, edge = "right" }',
                            '{ x = 0, y = 1, edge = "axis" },\n  { x = 120, y = 1, edge = "right" }'),
     "no outline edge lies on the axis"),
    ("axis edge almost on the axis", mutate('{ x = 120, y = 0, edge = "right" }', '{ x = 120, y = 0.001, edge = "right" }'),
     "must run along y = 0 exactly"),
    ("outline touching the axis at a point",
     mutate('{ x = 0, y = 0, edge = "axis" },\n  { x = 120, y = 0, edge = "right" }',
            '{ x = 0, y = 0, edge = "axis" },\n  { x = 120, y = 3, edge = "right" }'),
     "touches the axis only at the point"),
    ("curved axis edge", mutate('{ x = 0, y = 0, edge = "axis" }', '{ x = 0, y = 0, edge = "axis", arc = { radius = 500, bulge = "in" } }'),
     "not a straight line"),
    ("unnamed axis edge", mutate('{ x = 0, y = 0, edge = "axis" }', '{ x = 0, y = 0 }'), "has no name"),
    ("cut-out touching the axis", GOOD + '[[part.cutouts]]\nname = "bore"\nshape = "circle"\ncenter = [30, 2]\ndiameter = 4\n',
     "cut-out 'bore' touches the axis"),
    ("axis in two stretches",
     mutate('{ x = 0, y = 0, edge = "axis" },\n  { x = 120, y = 0, edge = "right" }',
            '{ x = 0, y = 0, edge = "axis" },\n  { x = 30, y = 0, edge = "cavity1" },\n  { x = 35, y = 2, edge = "cavity2" },'
            '\n  { x = 40, y = 0, edge = "axis2" },\n  { x = 120, y = 0, edge = "right" }'),
     "2 separate stretches"),
    ("end not perpendicular to the axis", mutate('{ x = 120, y = 10, edge = "narrow" }', '{ x = 125, y = 10, edge = "narrow" }'),
     "not perpendicular to the axis"),
    ("zero shaft load", mutate("moment = 1e5\ntorque = 2e5", "torque = 0"), "the load is zero"),
    ("missing shaft load", mutate("moment = 1e5\ntorque = 2e5", ""), "give force, moment or torque"),
    ("shaft family with a plate model",
     FAMILY.format(family="shaft_shoulder", dims="D = 30, d = 20, r = 2", load="torque = 1").replace(
         "[part]", '[part]\nmodel = "plane_stress"\nthickness = 1'),
     "family 'shaft_shoulder' is not solved with model 'plane_stress'"),
    ("groove with both d and t", FAMILY.format(family="shaft_groove", dims="D = 30, d = 20, t = 5, r = 2",
                                               load="torque = 1"), "exactly one"),
    ("groove deeper than the radius", FAMILY.format(family="shaft_groove", dims="D = 30, t = 16, r = 2",
                                                    load="torque = 1"), "less than the radius"),
    ("shoulder with d >= D", FAMILY.format(family="shaft_shoulder", dims="D = 20, d = 30, r = 2",
                                           load="torque = 1"), "must be smaller than the wide diameter"),
]


@pytest.mark.parametrize("name,text,words", BAD, ids=[b[0] for b in BAD])
def test_bad_shaft_input(name, text, words, tmp_path, capsys):
    p = tmp_path / "bad.toml"
    p.write_text(text)
    assert main(["solve", str(p), "--no-estimate"]) == 2
    err = capsys.readouterr().err
    assert err.startswith("fekt: error: ") and "Traceback" not in err
    assert words in err, err


def test_each_mistake_has_its_own_message():
    assert len({w for _, _, w in BAD}) == len(BAD)


def test_good_shaft_case_reads_as_documented():
    case = parse_case(GOOD, CATALOGUE)
    assert case.part.model == "axisymmetric"
    load = case.loads[0]
    assert isinstance(load, ShaftEndsSpec) and load.kind == "shaft_ends"  # the model's default load type
    assert (load.ends, load.force, load.moment, load.torque) == (("left", "right"), 0.0, 1e5, 2e5)


def test_shaft_family_defaults_to_the_axisymmetric_model():
    case = parse_case(FAMILY.format(family="shaft_groove", dims="D = 30, d = 24, r = 1.5", load="force = 1e4"),
                      CATALOGUE)
    assert case.part.model == "axisymmetric" and case.loads[0].ends == ("left", "right")


def test_demo_shaft_case_loads():
    case = load_case(os.path.join(ROOT, "cases", "demo_shaft.toml"))
    assert case.demo and case.part.model == "axisymmetric"
    load = case.loads[0]
    assert load.force != 0 and load.moment != 0 and load.torque != 0
