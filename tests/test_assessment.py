"""The strength and fatigue assessment of solved peaks (fekt.assess.assessment, fekt assess).

The formulas themselves are checked in test_assess_formulas.py against their sources; here: the case-file
keys, the wiring per peak (hand calculations written out on a peak record built by hand), the refusals,
singular corners, plausible-wrong-number checks on solved parts, and the outputs (text, JSON, units, HTML,
command line). Sources beside each number; "hand calculation" values are worked out in the comment.
"""

from __future__ import annotations

import json
from pathlib import Path

import pytest
from conftest import asymmetric_strip

from fekt.api import assess_case, parse_case, solve
from fekt.assess import MM_MPA, MaterialGroup, Strengths
from fekt.assess.assessment import (CycleInput, PeakCycle, assess, assess_peak, cycles_from_factors,
                                    strengths_of)
from fekt.cli.main import main
from fekt.errors import CaseError, InputError
from fekt.kinds import FeatureKind, PeakReason
from fekt.models import REGISTRY as MODELS
from fekt.records import (ASSESSMENT_SCHEMA, ComponentKt, Compressive, LoadFacts, MeshFacts, PeakGradient,
                          Provenance, Result, SectionRecord, StressPeak, Timings, UnitsRecord)
from fekt.report.assessment import format_assessment
from fekt.report.units import convert_assessment, parse_output_units

PLANE = MODELS["plane_stress"]
DEMO = Path(__file__).resolve().parents[1] / "cases" / "demo_fatigue_hanger.toml"
STRENGTHS = """
yield_strength = 450
ultimate_strength = 600
fatigue_strength = 250
fatigue_basis = "corrected"
group = "steel"
"""


# --- a peak record built by hand ------------------------------------------------------------------

def notch_peak(rank=1, *, peak=250.0, kt=2.5, radius=1.0, chi=2.2, singular=False, kind=FeatureKind.NOTCH,
               N=1000.0, M=0.0) -> StressPeak:
    """A notch root on the top fibre of a 10 x 1 net section, N = 1000: nominal 100, Kt 2.5."""
    sec = SectionRecord(s=0.0, width=10.0, area=10.0, centroid=(0.0, 5.0), inertia=1000.0 / 12.0,
                        intervals=((0.0, 10.0),))
    nom = peak / kt if kt else 100.0
    return StressPeak(rank=rank, x=0.0, y=10.0, feature="notch 'n'", feature_kind=kind, singular=singular,
                      reason=PeakReason.FEATURE, peak=peak, radius=radius, element_size=radius / 16,
                      net_section=sec, N=N, M=M, sigma_nom_net=nom, kt_net=kt, gross_section=None,
                      gross_rule="-", sigma_nom_gross=None, kt_gross=None, equilibrium_error=0.0, scatter=0.0,
                      components=(ComponentKt("force", "force", peak, nom, kt, None, None),),
                      gradient=PeakGradient(chi, surface=peak) if chi is not None else PeakGradient(None, reason="x"))


def result_of(*peaks: StressPeak) -> Result:
    """A result record around hand-made peaks (load axis x; the other facts are placeholders)."""
    return Result(case_name="hand", source="", demo=False, units=UnitsRecord("mm", "N", "MPa", "N*mm"),
                  model="plane_stress", model_label="plane stress", thickness=1.0,
                  material={"E": 210000.0, "nu": 0.3},
                  load=LoadFacts(axis=(1.0, 0.0), force=1000.0, ends=(), components=()),
                  mesh=MeshFacts(0, 0, 0, "", 1.0, 1.0, {}, 16.0, 0, 0.0, ""),
                  timings=Timings(0, 0, 0, 0, 0, 0), peaks=tuple(peaks),
                  most_compressive=Compressive(0.0, 0.0, 0.0), warnings=(), notes=(), caution="linear elastic",
                  provenance=Provenance({}, "", 0.0))


M600 = Strengths(yield_strength=450.0, ultimate_strength=600.0, fatigue_strength=250.0,
                 fatigue_basis="corrected by the user", group=MaterialGroup.STEEL)


def test_notch_factors_and_safety_factors_hand_calculation():
    # Steel, Su = 600 MPa, notch root r = 1 mm, Kt = 2.5, FE chi* = 2.2 /mm (hand calculations):
    # Peterson (Dowling's steel fit, from memory): a = 0.0254 (2070/600)^1.8 = 0.235998 mm,
    #   q = 1/(1 + 0.235998) = 0.809063, Kf = 1 + 0.809063 * 1.5 = 2.213594
    # Neuber/Kuhn-Hardrath (Shigley eq. 6-35, SI): sqrt(rho') = 1.24 - 1.35 + 0.576 - 0.088776 = 0.377224,
    #   q = 1/(1 + 0.377224) = 0.726098, Kf = 2.089147
    # Heywood, groove (Shigley Table 6-15, from memory): Su = 87.0226 ksi, sqrt(a') = 3/87.0226 = 0.0344738
    #   sqrt(in), a' = 0.0301864 mm, sqrt(a'/r) = 0.173742, Kf = 2.5/(1 + 2 (0.6)(0.173742)) = 2.068696
    # FKM (steel aG = 0.5, bG = 2700 MPa, from memory): n = 1 + 2.2^0.25 10^-(0.5 + 600/2700)
    #   = 1 + 1.217883 * 0.189574 = 1.230878, Kf = 2.5/1.230878 = 2.031070
    # the largest, Peterson, sets the local cycle: ratio 2.213594/2.5 = 0.885438; cycle 0 .. 250 MPa elastic
    #   -> local max 221.3594, mean = amplitude = 110.6797 MPa
    # Se = 250, Su = 600, Sy = 450 (Shigley section 6-12 criteria, from memory):
    #   Goodman  n = 1/(110.6797/250 + 110.6797/600) = 1/(0.442719 + 0.184466) = 1.594426
    #   Gerber   A = (110.6797/600)^2 = 0.0340278, B = 0.442719: n = 2/(B + sqrt(B^2 + 4A)) = 1.962690
    #   elliptic n = 1/sqrt(0.442719^2 + (110.6797/450)^2) = 1.974520
    #   Langer   n = 450/221.3594 = 2.032893
    # static: 450/250 = 1.8 at the peak; net section N/A = 100: 4.5
    p = notch_peak()
    cyc = PeakCycle(250.0, 0.0, 100.0, 0.0)
    a = assess_peak(p, M600, MM_MPA, model=PLANE, axis=(1.0, 0.0), cycle=cyc)
    kf = {f.method: f for f in a.notch_factors}
    assert kf["Peterson"].kf == pytest.approx(2.213594, rel=1e-6)
    assert kf["Peterson"].q == pytest.approx(0.809063, rel=1e-5)
    assert kf["Peterson"].constant_value == pytest.approx(0.235998, rel=1e-5)
    assert kf["Peterson"].constant_origin == "estimated"
    assert kf["Neuber/Kuhn-Hardrath"].kf == pytest.approx(2.089147, rel=1e-6)
    assert kf["Heywood"].kf == pytest.approx(2.068696, rel=1e-6)
    assert kf["FKM support factor"].kf == pytest.approx(2.031070, rel=1e-6)
    assert kf["FKM support factor"].support_factor == pytest.approx(1.230878, rel=1e-6)
    assert kf["Siebel-Stieler support factor"].kf is None and "siebel_sg" in kf["Siebel-Stieler support factor"].reason
    # q by definition (Kf - 1)/(Kt - 1) for every method that gives a Kf
    for f in a.notch_factors:
        if f.kf is not None:
            assert f.q == pytest.approx((f.kf - 1) / 1.5, rel=1e-12)
    assert a.kf_spread.high_method == "Peterson" and a.kf_spread.low_method == "FKM support factor"
    assert a.kf_spread.spread_pct == pytest.approx(100 * (2.213594 / 2.031070 - 1), rel=1e-5)
    f = a.fatigue
    assert f.notch_method.startswith("Peterson") and f.local_ratio == pytest.approx(0.885438, rel=1e-5)
    assert (f.local_mean, f.local_amplitude) == (pytest.approx(110.6797, rel=1e-6), pytest.approx(110.6797, rel=1e-6))
    by = {c.criterion: c.factor for c in f.criteria}
    assert by["modified Goodman"] == pytest.approx(1.594426, rel=1e-5)
    assert by["Gerber"] == pytest.approx(1.962690, rel=1e-5)
    assert by["ASME elliptic"] == pytest.approx(1.974520, rel=1e-5)
    assert f.governing == "modified Goodman" and f.governing_factor == by["modified Goodman"]
    assert f.first_cycle_yield == pytest.approx(2.032893, rel=1e-5)
    assert a.static_peak.factor == pytest.approx(1.8) and a.static_net.factor == pytest.approx(4.5)
    assert a.static_net.stress == pytest.approx(100.0)
    # the chart gradient of a groove in tension is 2/r = 2 (FKM, from memory; phi not evaluated): 100 (2/2.2 - 1)
    assert a.relative_gradient.chart == pytest.approx(2.0) and a.relative_gradient.fe == 2.2
    assert a.relative_gradient.difference_pct == pytest.approx(100 * (2.0 / 2.2 - 1))


def test_chosen_method_and_kt():
    p = notch_peak()
    cyc = PeakCycle(250.0, 0.0, 100.0, 0.0)
    neu = assess_peak(p, M600, MM_MPA, model=PLANE, axis=(1, 0), cycle=cyc, notch_factor="neuber").fatigue
    assert neu.kf == pytest.approx(2.089147, rel=1e-6) and neu.notch_method == "Neuber/Kuhn-Hardrath"
    kt = assess_peak(p, M600, MM_MPA, model=PLANE, axis=(1, 0), cycle=cyc, notch_factor="kt").fatigue
    # Kf = Kt: the local cycle is the elastic one, 0 .. 250: Goodman 1/(125/250 + 125/600) = 1.411765
    assert kt.local_ratio == 1.0 and kt.local_amplitude == 125.0
    assert {c.criterion: c.factor for c in kt.criteria}["modified Goodman"] == pytest.approx(1.411765, rel=1e-6)


def test_net_section_stress_with_bending():
    # net section 10 x 1 (A = 10, I = 1000/12 = 83.333), N = 1000, M = 500 about the centroid (y_c = 5):
    # extreme fibres N/A +- M c/I = 100 +- 500 * 5 / 83.333 = 100 +- 30 -> 130 governs (hand calculation)
    a = assess_peak(notch_peak(M=500.0), M600, MM_MPA, model=PLANE, axis=(1, 0), cycle=None)
    assert a.static_net.stress == pytest.approx(130.0) and a.static_net.factor == pytest.approx(450 / 130)
    assert a.fatigue is None and a.reason == "no cycle given for this peak"


def test_singular_corner_is_never_assessed():
    p = notch_peak(radius=0.0, chi=None, singular=True, kind=FeatureKind.SHARP_CORNER, peak=900.0, kt=9.0)
    good = notch_peak(rank=2)
    res = result_of(p, good)
    cycles = cycles_from_factors(res.peaks, 1.0, 0.0)
    a = assess(res, M600, MM_MPA, model=PLANE, cycles=cycles)
    s = a.peak(1)
    assert all(f.kf is None and "singular" in f.reason for f in s.notch_factors)
    assert s.fatigue is None and "singular" in s.reason
    assert s.static_peak.factor is None and "singular" in s.static_peak.reason
    assert s.kf_spread is None and s.relative_gradient.chart is None
    # the governing peaks are never the singular one, though its elastic "peak" is the largest
    assert a.fatigue_governing.rank == 2 and a.static_peak_governing.rank == 2


def test_peaks_without_a_notch_factor_use_the_elastic_stress():
    # a compressive point of a hole (Kt < 0 on the net nominal stress): no Kf by any method, the local cycle
    # is the elastic peak stress (q = 1) and the compressive-mean rule applies (n = Se/sigma_a)
    p = notch_peak(peak=-100.0, kt=-1.0, kind=FeatureKind.HOLE)
    a = assess_peak(p, M600, MM_MPA, model=PLANE, axis=(1, 0), cycle=PeakCycle(0.0, -100.0, 0.0, 100.0))
    assert all(f.kf is None and "Kt = -1" in f.reason for f in a.notch_factors)
    assert a.fatigue.local_ratio == 1.0 and a.fatigue.local_amplitude == 50.0
    # Se / sigma_a = 250/50 = 5 for every criterion (compressive mean ignored)
    assert all(c.factor == pytest.approx(5.0) and c.compressive_mean for c in a.fatigue.criteria)


def test_refusals_name_the_missing_strengths():
    res = result_of(notch_peak())
    cyc = cycles_from_factors(res.peaks, 1.0, 0.0)
    with pytest.raises(InputError) as e:
        assess(res, Strengths(), MM_MPA, model=PLANE, cycles=None)
    assert "material.yield_strength" in str(e.value) and "static" in str(e.value)
    with pytest.raises(InputError) as e:
        assess(res, Strengths(yield_strength=300.0), MM_MPA, model=PLANE, cycles=cyc)
    for key in ("material.fatigue_strength", "material.ultimate_strength", "material.peterson_a"):
        assert key in str(e.value)
    # an aluminium: no steel estimate of Se, of a or of rho'
    al = Strengths(yield_strength=250.0, ultimate_strength=300.0, group=MaterialGroup.WROUGHT_ALUMINIUM)
    with pytest.raises(InputError, match="material.fatigue_strength"):
        assess(res, al, MM_MPA, model=PLANE, cycles=cyc)
    # a chosen method names its own keys
    with pytest.raises(InputError, match="material.siebel_sg"):
        assess(res, M600, MM_MPA, model=PLANE, cycles=cyc, notch_factor="siebel_stieler")
    # with the static checks only, Sy is enough; with notch_factor = "kt" no notch constant is needed
    assert assess(res, Strengths(yield_strength=300.0), MM_MPA, model=PLANE).peaks[0].fatigue is None
    ok = assess(res, Strengths(yield_strength=300.0, ultimate_strength=500.0, fatigue_strength=200.0,
                               group=MaterialGroup.WROUGHT_ALUMINIUM), MM_MPA, model=PLANE, cycles=cyc,
                notch_factor="kt")
    assert ok.fatigue_governing is not None


def test_endurance_estimate_is_reported():
    # no fatigue strength but a steel with Su = 600: Se' = 0.5 Su = 300 MPa (Shigley eq. 6-8, from memory), a
    # specimen value: the caution says the factors are too high
    m = Strengths(yield_strength=450.0, ultimate_strength=600.0, group=MaterialGroup.STEEL)
    res = result_of(notch_peak())
    a = assess(res, m, MM_MPA, model=PLANE, cycles=cycles_from_factors(res.peaks, 1.0, -1.0))
    se = [e for e in a.estimates if e.quantity == "fatigue_strength"]
    assert se and se[0].value == 300.0 and se[0].dimension == "stress"
    assert a.peaks[0].fatigue.fatigue_strength == 300.0
    assert any("polished-specimen" in c for c in a.cautions)


# --- case files -------------------------------------------------------------------------------------

BASE = """
[part]
family = "strip_hole"
thickness = 5
dimensions = { W = 40, d = 8 }
[load]
stress = 50
[mesh]
elements_per_radius = 8
"""


def test_case_file_strengths_cycle_and_options():
    case = parse_case(BASE + "[material]\n" + STRENGTHS + """peterson_a = 0.2
[cycle]
mean_factor = 0.5
alternating_factor = 0.75
[assessment]
notch_factor = "peterson"
criteria = ["gerber", "soderberg"]
""")
    m = case.material
    assert (m.yield_strength, m.ultimate_strength, m.fatigue_strength) == (450, 600, 250)
    assert m.fatigue_basis == "corrected" and m.group == "steel" and m.peterson_a == 0.2
    assert (case.cycle.max_factor, case.cycle.min_factor, case.cycle.form) == (1.25, -0.25, "mean")
    assert case.assessment.notch_factor == "peterson" and case.assessment.criteria == ("gerber", "soderberg")
    s = strengths_of(m)
    assert s.group is MaterialGroup.STEEL and s.fatigue_basis.value == "corrected by the user"
    # a case without any of it reads as before
    plain = parse_case(BASE)
    assert plain.cycle is None and plain.material.strengths_given == ()


@pytest.mark.parametrize("extra, item", [
    ("[material]\nyield_strength = -5", "material.yield_strength"),
    ("[material]\nyield_strength = 700\nultimate_strength = 600", "material.yield_strength"),
    ("[material]\nfatigue_strength = 700\nultimate_strength = 600", "material.fatigue_strength"),
    ("[material]\nultimate_strength = \"x\"", "material.ultimate_strength"),
    ("[material]\ngroup = \"titanium\"", "material.group"),
    ("[material]\nfatigue_basis = \"corrected\"", "material.fatigue_basis"),
    ("[material]\nfatigue_strength = 200\nfatigue_basis = \"polished\"", "material.fatigue_basis"),
    ("[material]\nneuber_rho = 0", "material.neuber_rho"),
    ("[material]\nyeild_strength = 300", "material.yeild_strength"),
    ("[cycle]\nmax_factor = 0.2\nmin_factor = 1", "cycle.max_factor"),
    ("[cycle]\nmax_factor = 1", "cycle.min_factor"),
    ("[cycle]\nmax_factor = 1\nmin_factor = 0\nmean_factor = 0.5", "cycle.mean_factor"),
    ("[cycle]\nmean_factor = 1\nalternating_factor = -1", "cycle.alternating_factor"),
    ("[cycle]\nmax_factor = 0\nmin_factor = 0", "cycle"),
    ("[cycle]\nmaximum = 1", "cycle.maximum"),
    ("[assessment]\nnotch_factor = \"smallest\"", "assessment.notch_factor"),
    ("[assessment]\ncriteria = [\"goodman\", \"goodman\"]", "assessment.criteria[1]"),
    ("[assessment]\ncriteria = []", "assessment.criteria"),
])
def test_case_file_mistakes_are_named(extra, item):
    with pytest.raises(CaseError) as e:
        parse_case(BASE + extra)
    assert e.value.item == item


def test_cli_refuses_before_solving(tmp_path, capsys):
    path = tmp_path / "bare.toml"
    path.write_text(BASE + "[cycle]\nmax_factor = 1\nmin_factor = 0\n")
    assert main(["assess", str(path)]) == 2
    err = capsys.readouterr().err
    for key in ("material.yield_strength", "material.fatigue_strength", "material.ultimate_strength"):
        assert key in err
    assert "Stress peaks" not in capsys.readouterr().out      # nothing was solved or printed
    with pytest.raises(InputError, match="material.yield_strength"):
        assess_case(parse_case(BASE))


# --- solved parts ---------------------------------------------------------------------------------

CYCLE = "[material]\n" + STRENGTHS + "\n[cycle]\nmax_factor = {hi}\nmin_factor = {lo}\n"


def _verdict(text: str):
    case = parse_case(text)
    return assess_case(case, solve(case, estimate=False, charts=False))


def test_reversed_load_and_mirrored_part_give_the_same_verdict():
    # plausible-wrong-number check: the same physical cycle on the part drawn mirrored (y -> -y, outline
    # clockwise), and on the part with its load reversed and the factors negated (load x -0.1 .. load x -1
    # is the same cycle as load x 1 .. load x 0.1), must give the same verdict
    base = _verdict(asymmetric_strip(1.0, force=20000.0, extra=CYCLE.format(hi=1.0, lo=0.1)))
    rev = _verdict(asymmetric_strip(1.0, force=-20000.0, extra=CYCLE.format(hi=-0.1, lo=-1.0)))
    mir = _verdict(asymmetric_strip(-1.0, force=20000.0, extra=CYCLE.format(hi=1.0, lo=0.1)))
    g = base.fatigue_governing
    assert g.feature == "notch 'notch'" and g.check == "modified Goodman"
    assert rev.fatigue_governing.feature == g.feature and rev.fatigue_governing.check == g.check
    assert rev.fatigue_governing.factor == pytest.approx(g.factor, rel=1e-9)
    assert mir.fatigue_governing.feature == g.feature and mir.fatigue_governing.check == g.check
    assert mir.fatigue_governing.factor == pytest.approx(g.factor, rel=0.01)   # another mesh
    b, m = base.peak(g.rank), mir.peak(mir.fatigue_governing.rank)
    for fb, fm in zip(b.notch_factors, m.notch_factors):
        assert fb.method == fm.method and (fb.kf is None) == (fm.kf is None)
        if fb.kf is not None:
            assert fm.kf == pytest.approx(fb.kf, rel=0.01)
    assert base.static_net_governing.factor == pytest.approx(rev.static_net_governing.factor, rel=1e-9)


def test_load_case_entry_point():
    # the cycle may arrive per peak from elsewhere (load cases): the same numbers as the stated factors
    case = parse_case(asymmetric_strip(1.0, force=20000.0, extra=CYCLE.format(hi=1.0, lo=0.1)))
    res = solve(case, estimate=False, charts=False)
    stated = assess_case(case, res)
    given = CycleInput("two load cases", {p.rank: PeakCycle(p.peak, 0.1 * p.peak, p.sigma_nom_net,
                                                            0.1 * p.sigma_nom_net) if p.peak > 0 else
                                          PeakCycle(0.1 * p.peak, p.peak, 0.1 * p.sigma_nom_net, p.sigma_nom_net)
                                          for p in res.peaks})
    other = assess_case(case, res, cycles=given)
    assert other.cycle == "two load cases"
    assert other.fatigue_governing.factor == pytest.approx(stated.fatigue_governing.factor, rel=1e-12)


def test_singular_corner_of_a_solved_part():
    case = parse_case("""
[part]
thickness = 1
outline = [
  { x = 0, y = 0, edge = "bottom" }, { x = 200, y = 0, edge = "right" }, { x = 200, y = 20 },
  { x = 100, y = 20 }, { x = 100, y = 40 }, { x = 0, y = 40, edge = "left" },
]
[load]
ends = ["left", "right"]
force = 1000
[mesh]
elements_per_radius = 8
""" + CYCLE.format(hi=1.0, lo=0.0))
    a = assess_case(case, solve(case, estimate=False, charts=False))
    sing = [p for p in a.peaks if p.singular]
    assert sing and all(p.fatigue is None and all(f.kf is None for f in p.notch_factors) for p in sing)
    assert a.fatigue_governing is None or not a.peak(a.fatigue_governing.rank).singular
    assert "SINGULAR" in format_assessment(a)


# --- outputs ------------------------------------------------------------------------------------------

def test_units_json_and_text():
    res = result_of(notch_peak())
    a = assess(res, M600, MM_MPA, model=PLANE, cycles=cycles_from_factors(res.peaks, 1.0, 0.0))
    d = a.to_dict()
    assert d["schema"] == ASSESSMENT_SCHEMA and json.loads(json.dumps(d))["peaks"][0]["rank"] == 1
    ksi = convert_assessment(a, parse_output_units("ksi,in"))
    p, q = a.peaks[0], ksi.peaks[0]
    f = 1 / 6.894757293168361                        # MPa -> ksi (1 ksi = 6.894757 MPa, exact lbf and inch)
    assert q.peak == pytest.approx(p.peak * f, rel=1e-9)
    assert q.fatigue.local_amplitude == pytest.approx(p.fatigue.local_amplitude * f, rel=1e-9)
    assert ksi.strengths.yield_strength == pytest.approx(450 * f, rel=1e-9)
    assert q.relative_gradient.fe == pytest.approx(2.2 * 25.4, rel=1e-12)       # 1/mm -> 1/in
    assert q.radius == pytest.approx(1 / 25.4, rel=1e-12)
    peterson = [e for e in ksi.estimates if e.quantity == "peterson_a"][0]
    assert peterson.value == pytest.approx(0.235998 / 25.4, rel=1e-5)
    # ratios do not change
    assert q.fatigue.governing_factor == p.fatigue.governing_factor and q.kt == p.kt
    assert [x.kf for x in q.notch_factors] == [x.kf for x in p.notch_factors]
    text = format_assessment(ksi)
    assert "stresses in ksi" in text and "1/in" in text
    assert text.count("Caution:") >= 3 and "empirical" in text


def test_demo_case_through_the_command_line(tmp_path, capsys):
    out = tmp_path / "out"
    code = main(["assess", str(DEMO), "--no-estimate", "--out", str(out), "--html",
                 "--units", "MPa,mm"])
    assert code == 0
    text = capsys.readouterr().out
    assert "Strength and fatigue assessment: demo fatigue hanger" in text and "[demo data" in text
    a = json.loads((out / "assessment.json").read_text())
    assert a["schema"] == ASSESSMENT_SCHEMA and a["demo"] is True
    g = a["fatigue_governing"]
    assert g["feature"] == "notch 'upper clip notch'" and g["check"] == "modified Goodman"
    assert f"n = {g['factor']:.3g}" in text
    html = (out / "report.html").read_text()
    assert "Strength and fatigue assessment" in html and "empirical" in html
    assert (out / "result.json").exists() and (out / "report.txt").exists()


def test_documented_snippets_read():
    # the [material] and [cycle] examples of docs/case-format.md are valid case-file text
    import re

    text = (Path(__file__).resolve().parents[1] / "docs" / "case-format.md").read_text(encoding="utf-8")
    blocks = re.findall(r"```toml\n(.*?)```", text, re.S)
    material = next(b for b in blocks if "yield_strength" in b)
    cycle = next(b for b in blocks if b.lstrip().startswith("[cycle]"))
    case = parse_case(BASE + material + cycle)
    assert case.material.yield_strength == 460 and case.cycle.min_factor == 0.1


def test_methods_use_the_radius_at_the_peak():
    # a peak on an ellipse away from its sharpest point: the feature's smallest radius is 1, the boundary's
    # radius at the peak 4 (recorded with the gradient). Peterson with a = 0.25 (given): q = 1/(1 + 0.25/4)
    # = 0.941176 (hand calculation), not 1/(1 + 0.25) = 0.8
    p = notch_peak()
    p = type(p)(**{**p.__dict__, "gradient": PeakGradient(2.2, surface=250.0, radius=4.0)})
    m = Strengths(yield_strength=450.0, peterson_a=0.25)
    a = assess_peak(p, m, MM_MPA, model=PLANE, axis=(1, 0), cycle=None)
    assert a.radius == 4.0
    assert a.notch_factors[0].q == pytest.approx(0.941176, rel=1e-6)


def test_loading_class_and_refusals_per_peak():
    # the load type that makes most of the peak stress selects the Kuhn-Hardrath polynomial and the chart
    # gradient: here the moment (180 of 250), so bending: the chart adds 2/d = 2/10 (FKM, from memory)
    p = notch_peak()
    p = type(p)(**{**p.__dict__, "components": (ComponentKt("force", "force", 70.0, 28.0, 2.5, None, None),
                                                ComponentKt("moment", "moment", 180.0, 72.0, 2.5, None, None))})
    a = assess_peak(p, M600, MM_MPA, model=PLANE, axis=(1, 0), cycle=None)
    assert a.loading == "bending" and a.relative_gradient.chart == pytest.approx(2.0 + 0.2)
    # a torque: Peterson's steel fit is for normal stress and Heywood's constants too: each refuses with its
    # reason instead of stopping the assessment; Neuber has a torsion polynomial
    t = type(p)(**{**p.__dict__, "components": (ComponentKt("torque", "torque", 250.0, 100.0, 2.5, None, None),)})
    b = assess_peak(t, M600, MM_MPA, model=PLANE, axis=(1, 0), cycle=None)
    kf = {f.method: f for f in b.notch_factors}
    assert b.loading == "torsion"
    assert kf["Peterson"].kf is None and "normal stress" in kf["Peterson"].reason
    assert kf["Heywood"].kf is None and "torsion" in kf["Heywood"].reason
    assert kf["Neuber/Kuhn-Hardrath"].kf is not None
