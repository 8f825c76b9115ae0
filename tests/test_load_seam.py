"""A new load type is one new module plus one registration line (the seam of fekt.loads).

The module below is written only for this test: a uniform remote stress S on two opposite straight
edges. Registered beside the built-in types, it is read from a case file by its ``type`` and solved by
the ordinary pipeline. A strip of width W with a central hole of d/W = 0.1 then has the Howland (1930)
gross Kt 3.03 (table from memory, trusted to 1 %), like the same strip loaded by the built-in end load.
"""

from __future__ import annotations

import importlib.util
import sys
from dataclasses import replace
from types import MappingProxyType

import pytest

from fekt.case.loader import parse_case
from fekt.pipeline import run
from fekt.registry import CATALOGUE

NEW_MODULE = '''
"""Uniform remote stress S on two opposite straight edges (test-only load type)."""
from dataclasses import dataclass

import numpy as np

from fekt.case import fields as F
from fekt.loads import ends
from fekt.loads.base import Applied, Component, Traction
from fekt.models.base import Resultants

KIND = "remote_test"
KEYS = ("type", "ends", "stress")


@dataclass(frozen=True)
class Spec:
    ends: tuple
    stress: float
    name: str = "remote"

    @property
    def kind(self):
        return KIND

    def apply(self, part, model, thickness):
        base = ends.apply(ends.EndsSpec(self.ends, force=1.0), part, model, thickness)  # sections and axis
        s = self.stress
        trac = lambda x, n: (s * n[0], s * n[1])
        area = base.ends[0].section.area
        comp = Component("stress", self.name, "force", s * area, model.default_operator,
                         (Traction(self.ends[0], trac), Traction(self.ends[1], trac)),
                         lambda section, side=-1: Resultants(N=s * area))
        return Applied(self.name, KIND, (comp,), base.axis, base.ends, base.loaded)


def parse(table, ctx, item):
    return Spec(ends=tuple(F.array(table["ends"], item + ".ends")),
                stress=F.number(F.required(table, "stress", item), ctx.params, item + ".stress"))
'''

CASE = """
[part]
family = "strip_hole"
thickness = 1
dimensions = {{ W = 40, d = 4 }}
[load]
{load}
"""


@pytest.fixture()
def catalogue_with_new_type(tmp_path):
    path = tmp_path / "remote_test.py"
    path.write_text(NEW_MODULE)
    spec = importlib.util.spec_from_file_location("remote_test", path)
    module = importlib.util.module_from_spec(spec)
    sys.modules["remote_test"] = module
    spec.loader.exec_module(module)
    # the one registration line:
    loads = MappingProxyType({**CATALOGUE.loads, module.KIND: module})
    yield replace(CATALOGUE, loads=loads)
    del sys.modules["remote_test"]


def test_new_load_type_is_one_module_and_one_line(catalogue_with_new_type):
    case = parse_case(CASE.format(load='type = "remote_test"\nends = ["left", "right"]\nstress = 10'),
                      catalogue_with_new_type)
    assert case.loads[0].kind == "remote_test"
    hole = run(case).result.peaks[0]
    assert hole.feature == "cut-out 'hole'"
    assert hole.kt_gross == pytest.approx(3.03, rel=0.01)  # Howland (1930), d/W = 0.1, from memory
    # the same strip under the built-in end load gives the same Kt
    ref = run(parse_case(CASE.format(load="force = 400"), CATALOGUE)).result.peaks[0]
    assert hole.kt_gross == pytest.approx(ref.kt_gross, rel=1e-9)


def test_unknown_load_type_is_named(catalogue_with_new_type):
    from fekt.errors import CaseError

    with pytest.raises(CaseError, match="load.type"):
        parse_case(CASE.format(load='type = "remote_tset"\nends = ["left", "right"]\nstress = 10'),
                   catalogue_with_new_type)
