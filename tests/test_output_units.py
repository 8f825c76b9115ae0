"""Results shown in other units: convert_result on whole results, the printers, the case key and --units.

Conversion factors are checked against NIST Special Publication 811 (2008), Appendix B.8 (7 significant
digits; the inch is exact): 1 psi = 6.894 757 E+03 Pa, 1 lbf = 4.448 222 N, 1 in = 2.54 E-02 m exactly,
1 kip = 1000 lbf. SI prefixes: SI Brochure, 9th ed. (BIPM 2019), Table 7 (kN/mm^2 = GPa = 1000 MPa).
That Kt (a ratio of two stresses) does not change with units is dimensional analysis. The bookkeeping
rules (which field has which dimension, the force unit shown with ksi and in) are our own.
"""

from __future__ import annotations

import dataclasses
import json
import math

import pytest

from fekt.api import parse_case, solve_full
from fekt.cli.main import main
from fekt.errors import CaseError
from fekt.pipeline import case_hash
from fekt.records import ChartCheck, Result
from fekt.report import units as U
from fekt.report.text import format_result
from fekt.report.units import OutputUnits, convert_result, engineering

PSI_PA = 6.894757e3   # NIST SP 811 B.8
LBF_N = 4.448222      # NIST SP 811 B.8
IN_MM = 25.4          # NIST SP 811 B.8 (exact)
SP811 = 5e-7          # SP 811 prints 7 significant digits

INCH_CASE = """
[case]
name = "inch strip"
[units]
length = "in"
force = "lbf"
[part]
model = "plane_stress"
thickness = 0.25
outline = [
  { x = 0, y = 0, edge = "bottom" },
  { x = 12, y = 0, edge = "right" },
  { x = 12, y = 1.5, edge = "top" },
  { x = 0, y = 1.5, edge = "left" },
]
[[part.cutouts]]
name = "hole"
shape = "circle"
center = [6, 0.75]
diameter = 0.45
[material]
E = 30e6
nu = 0.3
[load]
ends = ["left", "right"]
force = 4000
moment = 150
[mesh]
elements_per_radius = 6
"""

KN_CASE = (INCH_CASE.replace('length = "in"', 'length = "mm"').replace('force = "lbf"', 'force = "kN"')
           .replace("E = 30e6", "E = 210").replace("force = 4000", "force = 24").replace("moment = 150", "moment = 0"))


@pytest.fixture(scope="module")
def inch():
    """An inch/pound-force case solved with its bands and chart checks (stresses in psi)."""
    return solve_full(parse_case(INCH_CASE, "inch.toml")).result


def _peaks_pairs(a: Result, b: Result):
    assert len(a.peaks) == len(b.peaks)
    return list(zip(a.peaks, b.peaks))


def test_inch_pound_result_in_mpa_and_mm_sp811(inch):
    m = convert_result(inch, OutputUnits("MPa", "mm"))
    assert (m.units.stress, m.units.length, m.units.force, m.units.moment) == ("MPa", "mm", "N", "N*mm")
    s, L, F = PSI_PA * 1e-6, IN_MM, LBF_N
    for p, q in _peaks_pairs(inch, m):
        assert q.peak == pytest.approx(p.peak * s, rel=SP811)
        assert q.sigma_nom_net == pytest.approx(p.sigma_nom_net * s, rel=SP811)
        if p.sigma_nom_gross is None:            # no gross section for this feature
            assert q.sigma_nom_gross is None
        else:
            assert q.sigma_nom_gross == pytest.approx(p.sigma_nom_gross * s, rel=SP811)
        assert q.scatter == pytest.approx(p.scatter * s, rel=SP811)
        assert (q.x, q.y) == pytest.approx((p.x * L, p.y * L), rel=1e-15)
        assert q.element_size == pytest.approx(p.element_size * L, rel=1e-15)
        ns, qs = p.net_section, q.net_section
        assert qs.width == pytest.approx(ns.width * L, rel=1e-15)
        assert qs.area == pytest.approx(ns.area * L ** 2, rel=1e-14)        # in^2 -> mm^2: 645.16
        assert qs.inertia == pytest.approx(ns.inertia * L ** 4, rel=1e-14)  # in^4 -> mm^4
        for a, b in zip(qs.intervals, ns.intervals):
            assert a == pytest.approx(tuple(v * L for v in b), rel=1e-15)
        assert q.N == pytest.approx(p.N * F, rel=SP811)                     # lbf -> N
        assert q.M == pytest.approx(p.M * F * L, rel=SP811)                 # lbf*in -> N*mm
        # Kt is a ratio of two stresses: the same numbers, to the last bit
        assert (q.kt_net, q.kt_gross, q.band) == (p.kt_net, p.kt_gross, p.band)
        if isinstance(p.chart, ChartCheck):        # chart Kt unchanged, the chart's dimensions are lengths
            assert q.chart == dataclasses.replace(p.chart, dims=q.chart.dims)
            assert q.chart.dims == pytest.approx({k: v * L for k, v in p.chart.dims.items()}, rel=1e-15)
        else:
            assert q.chart == p.chart
    assert m.material["E"] == pytest.approx(30e6 * s, rel=SP811)           # 206 842.7 MPa
    assert m.load.force == pytest.approx(4000 * F, rel=SP811)
    assert m.thickness == pytest.approx(0.25 * L, rel=1e-15)
    assert m.load.ends[0].moment == pytest.approx(inch.load.ends[0].moment * F * L, rel=SP811)
    assert m.most_compressive.sigma == pytest.approx(inch.most_compressive.sigma * s, rel=SP811)
    assert m.mesh.area == pytest.approx(inch.mesh.area * L ** 2, rel=1e-14)
    assert m.mesh.size_max == pytest.approx(inch.mesh.size_max * L, rel=1e-15)


def test_inch_pound_result_in_ksi(inch):
    k = convert_result(inch, OutputUnits("ksi", "in"))
    assert (k.units.stress, k.units.length, k.units.force, k.units.moment) == ("ksi", "in", "kip", "kip*in")
    for p, q in _peaks_pairs(inch, k):
        assert q.peak == pytest.approx(p.peak / 1000, rel=1e-14)            # 1 kip = 1000 lbf (SP 811)
        assert (q.x, q.y, q.net_section.area) == (p.x, p.y, p.net_section.area)
        assert q.N == pytest.approx(p.N / 1000, rel=1e-14)
        assert (q.kt_net, q.kt_gross, q.band) == (p.kt_net, p.kt_gross, p.band)


def test_kilonewton_millimetre_case_in_mpa():
    r = solve_full(parse_case(KN_CASE, "kn.toml"), estimate=False).result
    assert r.units.stress == "GPa"                                          # kN/mm^2 (SI Brochure Table 7)
    m = convert_result(r, OutputUnits("MPa", "mm"))
    assert (m.units.stress, m.units.force) == ("MPa", "N")
    for p, q in _peaks_pairs(r, m):
        assert q.peak == pytest.approx(1000 * p.peak, rel=1e-14)
        assert q.N == pytest.approx(1000 * p.N, rel=1e-14)                  # kN -> N
        assert (q.x, q.kt_net, q.kt_gross) == (p.x, p.kt_net, p.kt_gross)
    # 24 kN over the net section (1.5 - 0.45) mm x 0.25 mm = 91.43 GPa: the nominal stress in MPa
    hole = next(q for q in m.peaks if q.feature.startswith("cut-out"))
    assert hole.sigma_nom_net == pytest.approx(24e3 / (1.05 * 0.25), rel=1e-9)


def test_converting_twice_equals_converting_once(inch):
    once = convert_result(inch, OutputUnits("MPa", "in"))
    twice = convert_result(convert_result(inch, OutputUnits("ksi", "mm")), OutputUnits("MPa", "in"))
    for p, q in _peaks_pairs(once, twice):
        assert (q.peak, q.x, q.N, q.M, q.net_section.inertia) == pytest.approx(
            (p.peak, p.x, p.N, p.M, p.net_section.inertia), rel=1e-13)
    assert twice.units == once.units
    assert sum(n.startswith("Numbers are shown in") for n in twice.notes) == 1


def test_unchanged_units_change_nothing(inch):
    assert convert_result(inch, OutputUnits("psi", "in")) == inch


def test_a_field_of_unknown_dimension_stops_the_conversion(inch, monkeypatch):
    # a field added to a record later must not slip through in the case's units
    table = {k: dict(v) for k, v in U._RECORD_FIELDS.items()}
    del table["StressPeak"]["scatter"]
    monkeypatch.setattr(U, "_RECORD_FIELDS", table)
    with pytest.raises(TypeError, match="StressPeak.scatter"):
        convert_result(inch, OutputUnits("MPa", "mm"))


def _records(x, seen):
    if dataclasses.is_dataclass(x) and not isinstance(x, type):
        seen.setdefault(type(x).__name__, set()).update(f.name for f in dataclasses.fields(x))
        for f in dataclasses.fields(x):
            _records(getattr(x, f.name), seen)
    elif isinstance(x, (tuple, list)):
        for v in x:
            _records(v, seen)
    return seen


def test_every_field_of_a_result_has_a_dimension(inch):
    from fekt.studies.convergence import LevelFacts, SpotStudy, Study
    from fekt.studies.sweep import PointResult, TargetResult

    seen = _records(inch, {})
    for cls in (Study, SpotStudy, LevelFacts, PointResult, TargetResult):
        seen.setdefault(cls.__name__, set()).update(f.name for f in dataclasses.fields(cls))
    seen.pop("ConvergenceEstimate", None)   # inside Study spots: Kt values only, never converted
    for name, fields in seen.items():
        assert name in U._RECORD_FIELDS, name
        assert fields <= set(U._RECORD_FIELDS[name]), (name, fields - set(U._RECORD_FIELDS[name]))


def test_text_report_has_no_exponent_notation(inch):
    # psi values of tens of thousands were printed as 1.234e+04 before
    text = format_result(inch)
    assert "e+0" not in text and "e-0" not in text
    assert engineering(inch.peaks[0].peak, 4, group="") in text
    ksi = format_result(convert_result(inch, OutputUnits("ksi", "in")))
    assert "stresses in ksi" in ksi and "Numbers are shown in ksi and in" in ksi


# --- the case key and the option ------------------------------------------------------------------

def test_case_key_output_units_and_the_hash():
    c = parse_case(INCH_CASE.replace('force = "lbf"', 'force = "lbf"\noutput = "MPa, mm"'), "inch.toml")
    assert c.units.output == "MPa, mm"
    assert case_hash(c) == case_hash(parse_case(INCH_CASE, "inch.toml"))   # output units change no number


@pytest.mark.parametrize("value,words", [('"bar,mm"', "unknown unit 'bar'"), ('"MPa,GPa"', "two stress units"),
                                         ("3", "expected a string"), ('""', "one or two units")])
def test_case_key_bad_output_unit(value, words):
    with pytest.raises(CaseError) as err:
        parse_case(INCH_CASE.replace('force = "lbf"', f'force = "lbf"\noutput = {value}'), "inch.toml")
    assert err.value.item == "units.output" and words in str(err.value)


def test_cli_units_option_and_case_key(tmp_path, capsys):
    path = tmp_path / "inch.toml"
    path.write_text(INCH_CASE.replace('force = "lbf"', 'force = "lbf"\noutput = "ksi"'), encoding="utf-8")
    args = ["solve", str(path), "--no-estimate", "--json"]
    assert main(args) == 0
    keyed = json.loads(capsys.readouterr().out)
    assert keyed["units"] == {"length": "in", "force": "kip", "stress": "ksi", "moment": "kip*in"}
    assert main(args + ["--units", "MPa"]) == 0                          # the option wins; length from the case
    opt = json.loads(capsys.readouterr().out)
    assert opt["units"] == {"length": "in", "force": "N", "stress": "MPa", "moment": "N*in"}
    for a, b in zip(keyed["peaks"], opt["peaks"]):
        assert b["peak"] == pytest.approx(a["peak"] * 1000 * PSI_PA * 1e-6, rel=SP811)
        assert b["kt_net"] == a["kt_net"]
    assert main(args + ["--units", "bar"]) == 2
    assert "--units: unknown unit 'bar'" in capsys.readouterr().err


def test_force_unit_shown_with_output_units():
    assert U.force_unit(OutputUnits("MPa", "mm")) == "N"       # N/mm^2 = MPa
    assert U.force_unit(OutputUnits("ksi", "in")) == "kip"     # kip/in^2 = ksi
    assert U.force_unit(OutputUnits("psi", "in")) == "lbf"
    assert U.force_unit(OutputUnits("ksi", "mm")) == "lbf"     # no exact pair: the system's base force
    assert U.force_unit(OutputUnits("kPa", "cm")) == "N"
    assert math.isclose(U.record_units("in", "lbf", "psi", OutputUnits("ksi", "mm")).factors["F"], 1.0)
