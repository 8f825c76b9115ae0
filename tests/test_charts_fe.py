"""FE against published chart fits at interior points, chart coverage flags, nearest charts.

Every fit here is recalled from memory (references section 2; see fekt charts): a point passes when
the FE Kt lies within the fit's stated band, or it is a documented discrepancy
(docs/known-discrepancies.md) whose size is pinned here, so the test fails if it changes.
"""

from __future__ import annotations

import os

import pytest

from fekt.api import solve
from fekt.api import load_case, parse_case
from fekt.charts.grid import case_for, default_grid
from fekt.cli.main import main
from fekt.records import ChartCheck, to_jsonable
from fekt.report.words import no_chart_text


def family_chart(r) -> dict:
    """The family check of a result as one dict: the compared peak's chart record with its verdict."""
    check = r.family_check
    record = r.peak(check.peak_rank).chart if check.peak_rank is not None else None
    if not isinstance(record, ChartCheck):
        return {"verdict": "no chart", "reason": no_chart_text(check.no_chart)}
    chk = to_jsonable(record)
    chk["verdict"] = "outside coverage" if chk["coverage"] == "outside" else "within coverage"
    return chk


def nearest_list(r) -> list[dict]:
    out = []
    for p in r.peaks:
        if p.chart is None:
            continue
        d = {"feature": p.feature, **to_jsonable(p.chart)} if isinstance(p.chart, ChartCheck) else \
            {"feature": p.feature, "verdict": no_chart_text(p.chart)}
        out.append(d)
    return out

ROOT = os.path.dirname(os.path.dirname(os.path.abspath(__file__)))

# Opposite U-notches in tension: converged FE lies above the recalled Pilkey fit (Peterson's SCF
# 3rd ed., from memory, moderate confidence) by more than its 5 % band at these points. fekt's FE
# reproduces the semi-infinite semicircular notch (3.068 vs 3.065, Pilkey fit from memory) and
# Kirsch/Howland/Inglis, so we report the difference instead of changing anything.
DISCREPANCY = {
    ("opposite_u_notches", "tension", "2t/H=0.2, t/r=0.5"),
    ("opposite_u_notches", "tension", "2t/H=0.2, t/r=1.0"),
    ("opposite_u_notches", "tension", "2t/H=0.2, t/r=2.0"),
    ("opposite_u_notches", "tension", "2t/H=0.2, t/r=5.0"),
    ("opposite_u_notches", "tension", "2t/H=0.4, t/r=1.0"),
    ("opposite_u_notches", "tension", "2t/H=0.4, t/r=2.0"),
    ("opposite_u_notches", "tension", "2t/H=0.4, t/r=5.0"),
    ("opposite_u_notches", "tension", "2t/H=0.6, t/r=2.0"),
    ("opposite_u_notches", "tension", "2t/H=0.6, t/r=5.0"),
}
GRID = default_grid()


@pytest.mark.parametrize("point", GRID, ids=[f"{p.family}-{p.load}-{p.label}" for p in GRID])
def test_fe_against_chart(point):
    r = solve(case_for(point), estimate=False)
    chk = family_chart(r)
    assert chk["coverage"] == "inside", chk["coverage_notes"]
    key = (point.family, point.load, point.label)
    if key in DISCREPANCY:
        assert 4.0 < chk["difference_pct"] < 13.0  # documented: +5.9 % .. +10.8 %
    else:
        assert chk["within_band"], (chk["difference_pct"], chk["band_pct"])


def test_interior_point_count():
    assert len(GRID) >= 30


def _family(fam: str, dims: str, load: str = "force = 1000") -> dict:
    c = parse_case(f'[part]\nfamily = "{fam}"\nthickness = 1\ndimensions = {{{dims}}}\n[load]\n{load}\n')
    return family_chart(solve(c, estimate=False))


@pytest.mark.parametrize("fam,dims,ratio", [
    ("opposite_u_notches", "H = 40, t = 12, r = 0.2", "t/r"),      # t/r = 60 > 50
    ("shoulder_fillet", "D = 60, d = 40, r = 0.4", "h/r"),          # h/r = 25 > 20
    ("elliptical_hole", "a = 4, b = 2, W = 40", "2a/W"),            # 2a/W = 0.2 > 0.1
])
def test_outside_coverage_is_flagged(fam, dims, ratio):
    chk = _family(fam, dims)
    assert chk["verdict"] == "outside coverage"
    assert any(n.startswith(ratio) for n in chk["coverage_notes"])


def test_no_chart_family_and_combined_load():
    assert _family("single_u_notch", "H = 40, t = 4, r = 2")["verdict"] == "no chart"
    assert _family("strip_hole", "W = 40, d = 12", "force = 1000\nmoment = 1000")["verdict"] == "no chart"


def test_free_form_parts_get_nearest_chart_or_none():
    link = nearest_list(solve(load_case(os.path.join(ROOT, "cases", "demo_link.toml")), estimate=False))
    kinds = {n["feature"]: n for n in link}
    hole = kinds["cut-out 'lightening hole'"]
    assert hole["fit"].startswith("strip-hole") and hole["dims"]["d"] == pytest.approx(12.0)
    assert any(n.get("fit", "").startswith("shoulder-fillet") for n in link)
    bracket = nearest_list(solve(load_case(os.path.join(ROOT, "cases", "demo_bracket.toml")), estimate=False))
    assert all("chart_kt_net" not in n for n in bracket if n["feature"].startswith("cut-out"))


def test_fekt_charts_lists_every_family(capsys):
    from fekt.families import REGISTRY as FAMILIES

    assert main(["charts"]) == 0
    out = capsys.readouterr().out
    for fam in FAMILIES:
        assert fam in out
    assert "from memory" in out
