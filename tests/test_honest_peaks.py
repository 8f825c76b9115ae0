"""Every peak honest: compressive peaks, Kt per load component, consistent sections, one feature per notch,
studies that follow the named feature. Sources beside each check."""

from __future__ import annotations

import math

import numpy as np
import pytest

from conftest import strip_case
from fekt.api import parse_case, solve
from fekt.case.schema import CutoutSpec, NotchSpec, PartSpec, Vertex
from fekt.geometry.build import build_part
from fekt.kinds import FeatureKind
from fekt.pipeline import run


def _band(p) -> float:
    return p.band.kt_net if (p.band is not None and p.band.kt_net is not None) else 0.0


def test_notch_on_the_compression_edge_gets_the_same_kt_as_on_the_tension_edge():
    # exact symmetry of linear elasticity: pure bending of a strip is antisymmetric about its mid-line,
    # so a notch on the compression edge carries the same |Kt| as its mirror image on the tension edge,
    # with the opposite sign of stress (common practice, no source needed beyond linearity)
    notches = (NotchSpec("tension notch", "top", 120.0, 4.0, 2.0), NotchSpec("compression notch", "bottom", 200.0, 4.0, 2.0))
    case = strip_case(d=0.0, force=0.0, moment=2.0e5, notches=notches)
    r = solve(case)
    by = {}
    for p in r.peaks:
        if p.feature in ("notch 'tension notch'", "notch 'compression notch'"):
            by.setdefault(p.feature, max((q for q in r.peaks if q.feature == p.feature), key=lambda q: abs(q.peak)))
    t, c = by["notch 'tension notch'"], by["notch 'compression notch'"]
    assert t.peak > 0 > c.peak
    assert t.kt_net > 2 and c.kt_net > 2  # both positive: peak and nominal stress share their sign
    assert abs(t.kt_net - c.kt_net) <= _band(t) + _band(c) + 1e-9
    assert abs(t.peak + c.peak) <= 0.01 * t.peak


def test_combined_load_is_the_sum_of_its_components_at_every_peak():
    # superposition (linear elasticity): the combined stress at a point is the sum of the components'
    # stresses there, and so is its nominal stress (statics); to solver precision
    case = strip_case(d=12.0, force=8000.0, moment=3.0e4)
    r = run(case).result
    assert {c.name for c in r.load.components} == {"force", "moment"}
    for p in r.peaks:
        comps = {c.name: c for c in p.components}
        assert p.peak == pytest.approx(sum(c.stress for c in comps.values()), rel=1e-10, abs=1e-9 * abs(p.peak))
        assert p.sigma_nom_net == pytest.approx(sum(c.sigma_nom_net for c in comps.values()), rel=1e-12)
        if p.kt_net is not None and all(c.kt_net is not None for c in comps.values()):
            weighted = sum(c.kt_net * c.sigma_nom_net for c in comps.values())
            assert p.kt_net * p.sigma_nom_net == pytest.approx(weighted, rel=1e-9)


def test_shoulder_in_tension_gross_over_net_is_d_over_D():
    # net and gross nominal stresses come from the same axial force: P/(t d) and P/(t D) (handbook practice,
    # from memory), so sigma_nom,gross / sigma_nom,net = d / D and Kt_gross / Kt_net = D / d exactly
    r = run(parse_case('[part]\nfamily = "shoulder_fillet"\nthickness = 2\ndimensions = { D = 60, d = 40, r = 6 }\n'
                       '[load]\nforce = 1000\n')).result
    fillets = [p for p in r.peaks if p.feature_kind == FeatureKind.FILLET and p.kt_gross is not None]
    assert fillets
    for p in fillets:
        assert p.sigma_nom_gross / p.sigma_nom_net == pytest.approx(40 / 60, rel=1e-9)
        assert p.kt_gross / p.kt_net == pytest.approx(60 / 40, rel=1e-9)
        assert p.gross_section.width == pytest.approx(60.0, rel=1e-9)


def test_mirror_image_peaks_of_an_inclined_slot_get_the_same_kt():
    # a plate pulled along its axis with a slot turned 30 degrees is symmetric under a half turn about
    # the slot centre: the two slot peaks are images of each other and must get the same Kt (our own
    # demo-like part). The net section sits at the slot centre (middle of the plateau of equal widths).
    text = """
[part]
thickness = 5
outline = [ { x = 0, y = 0, edge = "bottom" }, { x = 600, y = 0, edge = "right" },
            { x = 600, y = 120, edge = "top" }, { x = 0, y = 120, edge = "left" } ]
[[part.cutouts]]
name = "slot"
shape = "slot"
center = [300, 60]
length = 40
width = 12
angle = 30
[load]
ends = ["left", "right"]
stress = 80
"""
    r = solve(parse_case(text))
    slot = sorted((p for p in r.peaks if p.feature == "cut-out 'slot'" and p.peak > 0), key=lambda p: -p.peak)[:2]
    a, b = slot
    assert a.net_section.s == pytest.approx(300.0, abs=1e-6)
    assert abs(a.kt_net - b.kt_net) <= _band(a) + _band(b) + 1e-9
    assert a.M == pytest.approx(0.0, abs=1e-6 * abs(a.N) * 120)  # no spurious moment from an off-centre cut


def test_hole_off_the_neutral_axis_in_bending_has_a_positive_kt_on_its_tensile_peak():
    # docs/conventions.md: the nominal stress of a peak is taken at the peak's height, moved to the
    # nearest material of the net section (the hole's edge, never inside the hole); beam theory
    # sigma = M (y - yc) / I on the net section (Euler-Bernoulli)
    M, t = 4.0e5, 8.0
    case = strip_case(W=40.0, L=400.0, d=0.0, force=0.0, moment=M, thickness=t,
                      extra_cutouts=(CutoutSpec("rivet", "circle", (160.0, 30.0), diameter=6.0),))
    r = run(case).result
    tensile = [p for p in r.peaks if p.feature == "cut-out 'rivet'" and p.peak > 0]
    assert tensile
    for p in tensile:
        assert p.kt_net > 1.0
        (lo1, hi1), (lo2, hi2) = p.net_section.intervals
        assert (lo1, hi1, lo2, hi2) == pytest.approx((0.0, 27.0, 33.0, 40.0), abs=1e-9)
        widths = np.array([hi1 - lo1, hi2 - lo2])
        yc = float((widths * np.array([(lo1 + hi1) / 2, (lo2 + hi2) / 2])).sum() / widths.sum())
        inertia = t * sum(((b - yc) ** 3 - (a - yc) ** 3) / 3 for a, b in ((lo1, hi1), (lo2, hi2)))
        y = min(max(p.y, lo1), hi1) if p.y < 30 else min(max(p.y, lo2), hi2)
        if lo1 < p.y < hi1 or lo2 < p.y < hi2:
            y = p.y
        assert p.sigma_nom_net == pytest.approx(M * (y - yc) / inertia, rel=1e-9)


def test_a_notch_drawn_as_several_arcs_is_one_feature():
    # our own rule (docs/conventions.md): concave curves joined without a corner form one feature. A deep
    # notch root approximated by three tangent arcs of growing radius gives one feature, not three.
    r0, r1 = 2.0, 6.0
    # root arc of radius r0 centred at (100, 10 + r0) from angle 180+60 to 360-60, flanked by arcs of r1
    # tangent to it (built here as arc edges of an outline)
    c0 = np.array([100.0, 12.0])
    p1 = c0 + r0 * np.array([math.cos(math.radians(240)), math.sin(math.radians(240))])
    p2 = c0 + r0 * np.array([math.cos(math.radians(300)), math.sin(math.radians(300))])
    # outer arcs: same tangent at p1/p2, radius r1, centre along the normal
    n1 = (c0 - p1) / r0
    q1 = p1 + n1 * r1 + r1 * np.array([math.cos(math.radians(200)), math.sin(math.radians(200))])
    n2 = (c0 - p2) / r0
    q2 = p2 + n2 * r1 + r1 * np.array([math.cos(math.radians(-20)), math.sin(math.radians(-20))])
    outline = (Vertex(0, 40, edge="left"), Vertex(0, 0, edge="bottom"), Vertex(200, 0, edge="right"),
               Vertex(200, 40, edge="top_right"), Vertex(float(q2[0]), 40.0),
               Vertex(float(q2[0]), float(q2[1]), arc_radius=r1, bulge="in"),
               Vertex(float(p2[0]), float(p2[1]), arc_radius=r0, bulge="in"),
               Vertex(float(p1[0]), float(p1[1]), arc_radius=r1, bulge="in"),
               Vertex(float(q1[0]), float(q1[1])), Vertex(float(q1[0]), 40.0, edge="top_left"))
    # the chain above runs clockwise on the top side; build_part orders it counter-clockwise
    part = build_part(PartSpec(outline=outline, thickness=1.0))
    concave = [f for f in part.features if f.kind == FeatureKind.CONCAVE_ARC]
    assert len(concave) == 1 and len(concave[0].segments) == 3
    assert concave[0].name.startswith("concave curve from vertex")


def test_feature_names_do_not_move_when_dimensions_change():
    # stable names (our own rule): unnamed fillets are named by the vertex they round, never by coordinates
    names = set()
    for rf in (4.0, 9.0):
        outline = (Vertex(0, 0, edge="bottom"), Vertex(200, 0, edge="right"), Vertex(200, 30), Vertex(100, 30, fillet=rf),
                   Vertex(100, 60), Vertex(0, 60, edge="left"))
        part = build_part(PartSpec(outline=outline, thickness=1.0))
        names.add(tuple(sorted(f.name for f in part.features)))
    assert names == {("fillet at vertex 3",)}


def test_sweep_follows_the_named_fillet_not_the_stronger_hole(tmp_path, capsys):
    # our own demo-like part: a bracket whose bolt hole has a higher Kt than the step fillet being designed
    from fekt.cli.main import main

    text = """
[case]
name = "demo data: invented bracket"
demo = true
[parameters]
rf = 6
[part]
thickness = 6
outline = [ { x = 0, y = 0, edge = "bottom" }, { x = 250, y = 0, edge = "right" }, { x = 250, y = 50 },
            { x = 100, y = 50, fillet = "rf", name = "step" }, { x = 100, y = 90 }, { x = 0, y = 90, edge = "left" } ]
[[part.cutouts]]
name = "bolt"
shape = "circle"
center = [50, 45]
diameter = 11
[load]
ends = ["left", "right"]
force = 15000
[mesh]
elements_per_radius = 8
"""
    case = tmp_path / "bracket.toml"
    case.write_text(text)
    out = tmp_path / "sweep"
    assert main(["sweep", str(case), "--vary", "rf=4,8", "--executor", "serial", "--no-estimate",
                 "--feature", "fillet 'step'", "--out", str(out)]) == 0
    report = capsys.readouterr().out
    assert "Kt of the feature 'fillet 'step''" in report
    import json

    data = json.loads((out / "sweep.json").read_text())
    assert data["feature"] == "fillet 'step'"
    assert all(p["feature"] == "fillet 'step'" for p in data["points"])
    assert all(any(q["feature"] == "cut-out 'bolt'" for q in p["peaks"]) for p in data["points"])  # all kept
    # without --feature the sweep says which feature it reports
    assert main(["sweep", str(case), "--vary", "rf=4,8", "--executor", "serial", "--no-estimate",
                 "--out", str(tmp_path / "default")]) == 0
    assert "leading notch peak" in capsys.readouterr().out
