"""End to end through the command line, in-process (fekt.cli.main.main)."""

from __future__ import annotations

import glob
import json
import os

import pytest

from fekt.cli.main import main

ROOT = os.path.dirname(os.path.dirname(os.path.abspath(__file__)))
CASES = sorted(glob.glob(os.path.join(ROOT, "cases", "*.toml")))
#: shaft cases load and solve (tests/test_shaft_*.py) but the peak post-processing does not combine load
#: components of different circumferential harmonics yet: strict, so the mark goes when it does
SHAFT_POST = pytest.mark.xfail(strict=True, reason="post-processing of shafts (components of harmonics 0 and 1 "
                               "combined at the critical angle) is not integrated yet")
CASE_PARAMS = [pytest.param(p, marks=SHAFT_POST) if "shaft" in os.path.basename(p) else p for p in CASES]


@pytest.mark.parametrize("path", CASE_PARAMS, ids=[os.path.basename(p) for p in CASES])
def test_every_case_solves_end_to_end(path, capsys):
    assert main(["solve", path, "--json"]) == 0
    data = json.loads(capsys.readouterr().out)
    assert data["peaks"], "every case has at least one stress peak"
    assert "codes" in data["caution"]
    for h in data["peaks"]:
        if not h["singular"] and h["feature_kind"] != "edge":
            assert h["equilibrium_error"] <= 0.005


def test_demo_link_lists_hole_and_fillet_with_own_sections(capsys):
    assert main(["solve", os.path.join(ROOT, "cases", "demo_link.toml"), "--json"]) == 0
    data = json.loads(capsys.readouterr().out)
    feats = {h["feature"]: h for h in data["peaks"]}
    hole = [h for f, h in feats.items() if f.startswith("cut-out")]
    fillet = [h for f, h in feats.items() if f.startswith("fillet")]
    assert hole and fillet
    assert hole[0]["net_section"]["width"] < fillet[0]["net_section"]["width"]
    assert data["demo"] is True


def test_sharp_corner_is_flagged_singular(capsys):
    assert main(["solve", os.path.join(ROOT, "cases", "sharp_corner.toml")]) == 0
    out = capsys.readouterr().out
    assert "SINGULAR" in out and "no finite value" in out


def test_out_dir_written_and_not_overwritten(tmp_path, capsys):
    out = tmp_path / "res"
    case = os.path.join(ROOT, "cases", "strip_hole.toml")
    assert main(["solve", case, "--out", str(out)]) == 0
    assert sorted(n for n in os.listdir(out) if not n.startswith(".")) == ["report.txt", "result.json", "stress.png"]
    assert main(["solve", case, "--out", str(out)]) == 2
    assert "already exists" in capsys.readouterr().err
    assert main(["solve", case, "--out", str(out), "--force"]) == 0
    assert not [p for p in os.listdir(tmp_path) if p.startswith(".")]


def test_invalid_case_exit_code_and_message(tmp_path, capsys):
    bad = tmp_path / "bad.toml"
    bad.write_text(open(os.path.join(ROOT, "cases", "strip_hole.toml")).read().replace("diameter", "diamter"))
    assert main(["solve", str(bad)]) == 2
    err = capsys.readouterr().err
    assert "diamter" in err and "did you mean" in err and "Traceback" not in err


def test_missing_file(capsys):
    assert main(["solve", "no/such/case.toml"]) == 2
    assert "not found" in capsys.readouterr().err


def test_python_api():
    import fekt

    case = fekt.load_case(os.path.join(ROOT, "cases", "strip_hole.toml"))
    r = fekt.solve(case)
    assert r.to_dict()["peaks"][0]["kt_net"] == pytest.approx(r.peaks[0].kt_net)
