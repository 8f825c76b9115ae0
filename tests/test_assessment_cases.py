"""A fatigue cycle between two load cases must give the same assessment as the same cycle stated as factors
on one load (linear elasticity: every stress scales with its load and superposes exactly), and a cycle
between cases of two loads must combine them at the same point. Source: superposition of linear elastic
solutions (any elasticity text, e.g. Timoshenko & Goodier 1970, section 1); the assessment formulas are
tested against their sources in tests/test_assessment.py."""

from __future__ import annotations

import tomllib

import pytest

from fekt.api import assess_case, case_from_dict, solve
from fekt.errors import InputError

PART = """
[part]
thickness = 5
outline = [ { x = 0, y = 0, edge = "bottom" }, { x = 240, y = 0, edge = "right" }, { x = 240, y = 40, edge = "top" },
            { x = 0, y = 40, edge = "left" } ]
cutouts = [ { name = "hole", shape = "circle", center = [120, 20], diameter = 10 } ]
[material]
E = 210000
nu = 0.3
yield_strength = 460
ultimate_strength = 620
fatigue_strength = 200
fatigue_basis = "corrected"
group = "steel"
[mesh]
elements_per_radius = 6
"""

FACTORS = PART + """
[load]
ends = ["left", "right"]
force = 20000
[cycle]
max_factor = 1.0
min_factor = 0.1
"""

CASES = PART + """
[[loads]]
name = "pull"
ends = ["left", "right"]
force = 20000
[[loads]]
name = "bend"
ends = ["left", "right"]
moment = 60000
[[load_cases]]
name = "high"
factors = { pull = 1.0, bend = 1.0 }
[[load_cases]]
name = "low"
factors = { pull = 0.1, bend = -0.5 }
[cycle]
max_case = "high"
min_case = "low"
"""


def _case(text):
    return case_from_dict(tomllib.loads(text), "case.toml")


def _fatigue(a):
    return {p.rank: p.fatigue for p in a.peaks if p.fatigue is not None}


def test_cycle_between_cases_equals_the_same_cycle_as_factors():
    ref = assess_case(_case(FACTORS), estimate=False, charts=False)
    text = FACTORS.replace("[cycle]\nmax_factor = 1.0\nmin_factor = 0.1\n", "") \
        .replace('[load]\nends = ["left", "right"]\nforce = 20000\n',
                 '[[loads]]\nname = "pull"\nends = ["left", "right"]\nforce = 20000\n'
                 '[[load_cases]]\nname = "full"\nfactors = { pull = 1 }\n'
                 '[[load_cases]]\nname = "tenth"\nfactors = { pull = 0.1 }\n'
                 '[cycle]\nmax_case = "full"\nmin_case = "tenth"\n')
    got = assess_case(_case(text), estimate=False, charts=False)
    a, b = _fatigue(ref), _fatigue(got)
    assert a and a.keys() == b.keys()
    for k in a:
        assert (b[k].elastic_max, b[k].elastic_min) == pytest.approx((a[k].elastic_max, a[k].elastic_min), rel=1e-12)
        assert (b[k].nominal_max, b[k].nominal_min) == pytest.approx((a[k].nominal_max, a[k].nominal_min), rel=1e-12)
        assert b[k].governing_factor == pytest.approx(a[k].governing_factor, rel=1e-12)
    assert "between load case 'full' and load case 'tenth'" in got.cycle


def test_cycle_between_cases_of_two_loads_combines_them_at_the_point():
    case = _case(CASES)
    r = solve(case, estimate=False, charts=False)
    a = assess_case(case, r)
    high = {c.name: c for c in r.load_cases}["high"]
    low = {c.name: c for c in r.load_cases}["low"]
    for p in high.peaks:
        f = _fatigue(a).get(p.rank)
        if f is None:
            continue
        comp = {c.name: c for c in p.components}
        expect_low = 0.1 * comp["pull/force"].stress - 0.5 * comp["bend/moment"].stress
        assert sorted((f.elastic_max, f.elastic_min)) == pytest.approx(sorted((p.peak, expect_low)), rel=1e-12)
        # the low case's own peak at the same point (when it has one there) is the same number
        same = [q for q in low.peaks if abs(q.x - p.x) < 1e-9 and abs(q.y - p.y) < 1e-9]
        for q in same:
            assert q.peak == pytest.approx(expect_low, rel=1e-9)


def test_cycle_names_must_be_load_cases():
    with pytest.raises(InputError, match="no load case named 'lwo'"):
        _case(CASES.replace('min_case = "low"', 'min_case = "lwo"'))
