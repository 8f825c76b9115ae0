"""Bolt and pin loads, load cases and the inputs that must be refused.

Sources: the cosine distribution of a pin's bearing pressure is common engineering practice (no single
published source): its resultant must equal the force exactly (integral of p0 cos^2 phi R t over -90..90
degrees = p0 R t pi / 2 with p0 = 2 F / (pi R t)). Load cases: linear elasticity superposes exactly. A
rigid pin in frictionless contact: Signorini conditions (no pulling, no overlap), whose resultant is
the pin's force; its contact arc shrinks as the clearance grows (Hertz-type behaviour, e.g. Persson,
Doctoral thesis on pin-loaded holes, 1964; from memory, qualitative only).
"""

from __future__ import annotations

import math
import tomllib

import numpy as np
import pytest

from fekt.api import case_from_dict, solve_full
from fekt.cli.main import main
from fekt.geometry.build import build_part
from fekt.loads.statics import total_force
from fekt.pipeline import apply_loads

LUG = """
[parameters]
P = 6000
c = {clearance}
[part]
thickness = 5
outline = {outline}
cutouts = [ {{ name = "eye", shape = "circle", center = [{cx}, 20], diameter = 16 }} ]
[[loads]]
name = "pull"
type = "{kind}"
hole = "eye"
force = [{fx}, {fy}]
{extra}
[[supports]]
type = "fixed"
on = "root"
[mesh]
elements_per_radius = {n}
"""


#: a lug 40 wide, its rounded head to the right; and the same lug mirrored about x = 0 (drawn
#: counter-clockwise from the root, the edge names on the same edges)
OUTLINE = ('[ { x = 0, y = 0, edge = "low" }, { x = 80, y = 0, edge = "head", arc = { radius = 20, bulge = "out" } }, '
           '{ x = 80, y = 40, edge = "high" }, { x = 0, y = 40, edge = "root" } ]')
MIRRORED = ('[ { x = 0, y = 0, edge = "root" }, { x = 0, y = 40, edge = "high" }, '
            '{ x = -80, y = 40, edge = "head", arc = { radius = 20, bulge = "out" } }, { x = -80, y = 0, edge = "low" } ]')


def _text(kind="bearing", fx='"P"', fy=0, clearance=0.0, n=8, extra="", mirrored=False):
    if kind == "pin":
        extra = extra or 'pin_diameter = "16 - 2 * c"'
    return LUG.format(kind=kind, fx=fx, fy=fy, clearance=clearance, n=n, extra=extra,
                      outline=MIRRORED if mirrored else OUTLINE, cx=-80 if mirrored else 80)


def _lug(kind="bearing", fx='"P"', fy=0, clearance=0.0, n=8, extra="", estimate=False, mirrored=False):
    text = _text(kind, fx, fy, clearance, n, extra, mirrored)
    return solve_full(case_from_dict(tomllib.loads(text), "lug.toml"), estimate=estimate, charts=False)


def _hole_peak(result):
    hs = [h for h in result.peaks if h.feature == "cut-out 'eye'" and not h.introduction and h.peak > 0]
    return max(hs, key=lambda h: h.peak)


def test_cosine_bearing_resultant_is_the_force():
    text = _text(fx=4000, fy=-3000)
    case = case_from_dict(tomllib.loads(text), "lug.toml")
    part = build_part(case.part)
    applied = apply_loads(case, part)
    comp = applied.components[0]
    from fekt.loads.bearing import arc_breaks, cosine_traction
    from fekt.loads.keys import circle_of
    from fekt.loads.statics import SegmentTraction

    c, R, refs = circle_of(part, "eye", "eye")
    fn, _ = cosine_traction(c, R, (4000.0, -3000.0), 5.0)
    d = np.array([0.8, -0.6])
    pieces = [SegmentTraction(part.segment(r), fn, 5.0, arc_breaks(part.segment(r), c, d)) for r in refs]
    F, Mz = total_force(pieces, about=c)
    assert F == pytest.approx([4000.0, -3000.0], rel=1e-12, abs=1e-9)
    assert abs(Mz) < 1e-9 * 5000 * R  # radial pressure: no moment about the centre
    assert comp.quantity == "force" and comp.magnitude == pytest.approx(5000.0)


def test_bearing_peaks_split_into_notch_and_load_introduction():
    r = _lug().result
    intro = [h for h in r.peaks if h.introduction]
    arc = [h for h in intro if "bearing arc" in h.introduction]
    clamp = [h for h in intro if "support" in h.introduction]
    assert arc and clamp and len(arc) + len(clamp) == len(intro)
    assert all(h.x > 80.0 for h in arc)  # on the loaded half, facing the force (+x)
    assert all(h.x < 2.0 for h in clamp)  # at the clamped root
    top = _hole_peak(r)
    # the lug's peak sits where the net section meets the hole, beside the bearing arc
    assert abs(top.x - 80.0) < 3.0 and top.kt_net > 1


def test_mirrored_lug_gives_the_same_kt():
    # the same lug drawn mirrored and pulled the other way must give the same numbers (a reversed load or a
    # mirrored drawing must not change Kt)
    for kind in ("bearing", "pin"):
        a = _hole_peak(_lug(kind, clearance=0.05).result)
        b = _hole_peak(_lug(kind, fx='"-P"', clearance=0.05, mirrored=True).result)
        assert b.kt_net == pytest.approx(a.kt_net, rel=2e-3), kind
        assert b.peak == pytest.approx(a.peak, rel=2e-3), kind
        assert (-b.x, b.y) == pytest.approx((a.x, a.y), abs=0.3) or (-b.x, 40 - b.y) == pytest.approx((a.x, a.y), abs=0.3)


def test_pin_contact_balances_the_force_and_converges():
    coarse = _lug("pin", clearance=0.05, n=8)
    fine = _lug("pin", clearance=0.05, n=16)
    for s in (coarse, fine):
        (c,) = s.result.contacts
        assert c.overlap <= 1e-9 and c.nodes >= 3
        # the contact forces add up to the pin's force: statics of the solved component on a cut behind
        # the hole (the whole hole in front)
        comp = next(cp for cp in s.applied.components if cp.contact is not None)
        from fekt.models.base import Section

        sec = Section(40.0, ((0.0, 40.0),), 40.0, 200.0, 20.0, 0.0, 0.0, (40.0, 20.0), (1.0, 0.0))
        assert comp.statics(sec, +1).N == pytest.approx(6000.0, rel=1e-9)
        assert abs(comp.statics(sec, +1).V) < 1e-6 * 6000
    ca, cb = coarse.result.contacts[0], fine.result.contacts[0]
    spacing = 360.0 / (2 * math.pi * 8 / (8 / 8)) / 2  # degrees between boundary nodes on the coarse mesh
    assert abs(ca.arc_to - cb.arc_to) < 2 * spacing
    assert _hole_peak(fine.result).kt_net == pytest.approx(_hole_peak(coarse.result).kt_net, rel=0.03)


def test_clearance_shrinks_the_contact_arc_and_raises_the_peak():
    tight = _lug("pin", clearance=0.0)
    loose = _lug("pin", clearance=0.1)
    assert loose.result.contacts[0].arc_to < tight.result.contacts[0].arc_to
    assert _hole_peak(loose.result).peak > _hole_peak(tight.result).peak


CASES = """
[parameters]
W = 40
[part]
thickness = 5
outline = [ { x = 0, y = 0, edge = "bottom" }, { x = 320, y = 0, edge = "right" }, { x = 320, y = "W", edge = "top" },
            { x = 0, y = "W", edge = "left" } ]
cutouts = [ { name = "hole", shape = "circle", center = [160, 20], diameter = 12 } ]
[[loads]]
name = "pull"
ends = ["left", "right"]
force = 10000
[[loads]]
name = "bend"
ends = ["left", "right"]
moment = 50000
[[load_cases]]
name = "pull only"
factors = { pull = 1 }
[[load_cases]]
name = "bend only"
factors = { bend = 1 }
[[load_cases]]
name = "max"
factors = { pull = 1.5, bend = -0.5 }
[mesh]
elements_per_radius = 8
"""


def test_load_cases_superpose_on_one_factorisation():
    s = solve_full(case_from_dict(tomllib.loads(CASES), "cases.toml"), estimate=False, charts=False)
    r = s.result
    assert [c.name for c in r.load_cases] == ["pull only", "bend only", "max"]
    assert len(s.solution.systems) == 1 and len(s.solution.fields) == 2  # two right-hand sides, one matrix
    pull, bend, mx = r.load_cases
    # the peak of the combination at the same point is the combination of the peaks (exact superposition)
    top = max(mx.peaks, key=lambda h: abs(h.peak))
    at = {(round(h.x, 9), round(h.y, 9)): h for h in pull.peaks}
    comps = {c.name: c for c in top.components}
    assert top.peak == pytest.approx(1.5 * comps["pull/force"].stress - 0.5 * comps["bend/moment"].stress, rel=1e-12)
    assert r.peaks == pull.peaks  # the first case's peaks are the result's peaks
    assert at  # the pull case has its own peaks


def test_three_load_cases_are_reported_in_the_text(tmp_path, capsys):
    p = tmp_path / "cases.toml"
    p.write_text(CASES)
    assert main(["solve", str(p), "--no-estimate"]) == 0
    out = capsys.readouterr().out
    for name in ("pull only", "bend only", "max"):
        assert f"Load case '{name}'" in out


BASE = """
[part]
thickness = 5
outline = [ { x = 0, y = 0, edge = "bottom" }, { x = 200, y = 0, edge = "right" }, { x = 200, y = 40, edge = "top" },
            { x = 0, y = 40, edge = "left" } ]
cutouts = [ { name = "hole", shape = "circle", center = [100, 20], diameter = 12 },
            { name = "slot", shape = "slot", center = [150, 20], length = 20, width = 8, angle = 0 } ]
"""


@pytest.mark.parametrize("name, text, words", [
    ("pressure on an edge that does not exist",
     BASE + '[load]\ntype = "pressure"\non = "tpo"\npressure = 5\n[[supports]]\ntype = "fixed"\non = "left"\n',
     "no edge or cut-out named 'tpo'"),
    ("bearing on an edge, not a hole",
     BASE + '[load]\ntype = "bearing"\nhole = "top"\nforce = [100, 0]\n', "'top' is an outline edge, not a cut-out"),
    ("bearing on a hole that is not round",
     BASE + '[load]\ntype = "bearing"\nhole = "slot"\nforce = [100, 0]\n[[supports]]\ntype = "fixed"\non = "left"\n',
     "not a circle"),
    ("support on a loaded end",
     BASE + '[[loads]]\nname = "tip"\ntype = "end"\nedge = "right"\nforce = [0, 10]\n[[supports]]\ntype = "fixed"\n'
            'on = ["right"]\n', "is both loaded (load 'tip') and supported"),
    ("[load] and [[loads]] together",
     BASE + '[load]\nends = ["left", "right"]\nforce = 1\n[[loads]]\nname = "b"\nends = ["left", "right"]\nforce = 1\n',
     "either [load] or [[loads]]"),
    ("several loads without names",
     BASE + '[[loads]]\nends = ["left", "right"]\nforce = 1\n[[loads]]\nends = ["left", "right"]\nmoment = 1\n',
     "each needs a name"),
    ("load case of an unknown load",
     BASE + '[load]\nends = ["left", "right"]\nforce = 1\n[[load_cases]]\nname = "a"\nfactors = { lod = 1 }\n',
     "no load named 'lod'"),
    ("load case with every factor zero",
     BASE + '[load]\nends = ["left", "right"]\nforce = 1\n[[load_cases]]\nname = "a"\nfactors = { load = 0 }\n',
     "every factor of the load case is zero"),
    ("a stated nominal stress with several load cases",
     BASE + '[load]\nends = ["left", "right"]\nforce = 1\n[[load_cases]]\nname = "a"\nfactors = { load = 1 }\n'
            '[[load_cases]]\nname = "b"\nfactors = { load = 2 }\n[nominal]\nstress = 10\n', "belongs to one load case"),
    ("pin larger than its hole",
     BASE + '[load]\ntype = "pin"\nhole = "hole"\nforce = [100, 0]\npin_diameter = 13\n[[supports]]\ntype = "fixed"\n'
            'on = "left"\n', "larger than the hole"),
    ("symmetry plane on a curved boundary",
     BASE + '[load]\nends = ["left", "right"]\nforce = 1\n[[supports]]\ntype = "symmetry"\non = "hole"\n',
     "is a cut-out, not an outline edge"),
    ("unknown support type",
     BASE + '[load]\nends = ["left", "right"]\nforce = 1\n[[supports]]\ntype = "glued"\non = "left"\n', "glued"),
    ("a zero remote stress", BASE + '[load]\ntype = "remote"\nsigma_x = 0\n', "remote stress is zero"),
    ("loads that push a part nothing holds",
     BASE + '[load]\ntype = "bearing"\nhole = "hole"\nforce = [100, 0]\n', "no support holds the part"),
    ("supports leaving a sliding motion free",
     BASE + '[load]\ntype = "bearing"\nhole = "hole"\nforce = [100, 0]\n[[supports]]\ntype = "symmetry"\non = "bottom"\n',
     "free to move"),
])
def test_load_input_mistakes_exit_2(name, text, words, tmp_path, capsys):
    p = tmp_path / "case.toml"
    p.write_text(text)
    assert main(["solve", str(p), "--no-estimate"]) == 2, name
    err = capsys.readouterr().err
    assert words in err, err
    assert "Traceback" not in err
