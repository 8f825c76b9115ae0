"""Files colleagues open: CSV headers with units, the sweep's fixed parameters and both Kt bases, JSON
schema versions, and progress on stderr line by line when it is not a terminal (a bar when it is).

The unit factor checked is NIST SP 811 (2008) B.8 (1 ksi = 6.894 757 MPa); the file layouts are our own
(documented in README.md and fekt/report/sweep.py).
"""

from __future__ import annotations

import csv
import io
import json
import os

import pytest

from fekt.cli.main import main
from fekt.cli.review_out import Progress
from fekt.records import RESULT_SCHEMA, STUDY_SCHEMA, SWEEP_SCHEMA, TARGET_SCHEMA

ROOT = os.path.dirname(os.path.dirname(os.path.abspath(__file__)))
CHART_STRIP = os.path.join(ROOT, "cases", "chart_strip_hole.toml")   # W = 40, d = "0.3*W"
STRIP = os.path.join(ROOT, "cases", "strip_hole.toml")
KSI_MPA = 6.894757   # NIST SP 811 B.8


def _csv(path):
    with open(path, newline="", encoding="utf-8") as fh:
        rows = list(csv.reader(fh))
    return rows[0], [dict(zip(rows[0], r)) for r in rows[1:]]


@pytest.fixture(scope="module")
def sweep_run(tmp_path_factory):
    out = tmp_path_factory.mktemp("files") / "sweep"
    args = ["sweep", CHART_STRIP, "--vary", "d=8,12", "--out", str(out), "--executor", "serial", "--units", "ksi"]
    import contextlib

    err = io.StringIO()
    with contextlib.redirect_stderr(err):
        assert main(args) == 0
    return out, err.getvalue()


def test_sweep_csv_units_fixed_parameters_and_both_bases(sweep_run):
    out, _ = sweep_run
    headers, rows = _csv(out / "sweep.csv")
    assert headers[:3] == ["index", "d (varied) [case: mm, N]", "W [case: mm, N]"]
    for h in ("kt_net [-]", "kt_net_band [-]", "kt_gross [-]", "kt_gross_band [-]", "chart_kt [-]", "peak [ksi]",
              "seconds [s]"):
        assert h in headers
    assert [float(r["d (varied) [case: mm, N]"]) for r in rows] == [8.0, 12.0]
    assert [float(r["W [case: mm, N]"]) for r in rows] == [40.0, 40.0]      # the parameter not varied
    for r in rows:
        assert float(r["kt_gross [-]"]) > float(r["kt_net [-]"]) > 1
        assert float(r["kt_net_band [-]"]) > 0 and float(r["kt_gross_band [-]"]) > 0
    data = json.loads((out / "sweep.json").read_text(encoding="utf-8"))
    assert data["schema"] == SWEEP_SCHEMA and data["units"]["peak"] == "ksi"
    # the resume file keeps the case's units (MPa); the CSV and JSON show ksi
    with open(out / "points.jsonl", encoding="utf-8") as fh:
        raw = [json.loads(line) for line in fh][1:]  # after the header line (fekt_resume, case hash, settings)
    for r, p, j in zip(rows, sorted(raw, key=lambda p: p["index"]), data["points"]):
        assert float(r["peak [ksi]"]) == pytest.approx(p["peak"] / KSI_MPA, rel=5e-7)
        assert j["peak"] == pytest.approx(p["peak"] / KSI_MPA, rel=5e-7)
        assert j["kt_net"] == p["kt_net"] and j["parameters"] == {"W": 40.0, "d": p["values"]["d"]}


def test_sweep_progress_is_logged_line_by_line(sweep_run):
    _, err = sweep_run
    lines = [line for line in err.splitlines() if line.startswith("sweep ")]
    assert [line.split(":")[0] for line in lines] == ["sweep 1/2", "sweep 2/2"]
    assert "Kt_net = " in lines[0] and "\r" not in err


def test_target_progress_and_schema(tmp_path, capsys):
    case = tmp_path / "coarse.toml"   # a coarse mesh: this checks the output, not the answer
    case.write_text(open(CHART_STRIP, encoding="utf-8").read() + "\n[mesh]\nelements_per_radius = 5\n",
                    encoding="utf-8")
    assert main(["target", str(case), "--vary", "d", "--kt", "2.4", "--bounds", "8:16", "--json"]) == 0
    captured = capsys.readouterr()
    data = json.loads(captured.out)
    assert data["schema"] == TARGET_SCHEMA and data["peak"] > 0 and data["units"] == {"peak": "MPa"}
    steps = [line for line in captured.err.splitlines() if line.startswith("target ")]
    assert len(steps) == data["evaluations"] and steps[0].startswith("target 1: d = ")  # one line per solve


def test_progress_bar_on_a_terminal():
    class Terminal(io.StringIO):
        def isatty(self):
            return True

    term = Terminal()
    bar = Progress("sweep", total=3, stream=term)
    for i in range(3):
        bar.step(f"point {i}")
    bar.close()
    text = term.getvalue()
    assert "3/3" in text and "\r" in text and "sweep 1/3:" not in text


def test_study_csv_headers_and_json_schemas(tmp_path, capsys):
    out = tmp_path / "study"
    assert main(["converge", STRIP, "--levels", "2", "--elements-per-radius", "4", "--out", str(out),
                 "--units", "MPa,in"]) == 0
    headers, rows = _csv(out / "study.csv")
    assert headers[:4] == ["rank", "feature", "x [in]", "y [in]"] and "kt_net [-]" in headers
    assert max(float(r["x [in]"]) for r in rows) < 320 / 25.4                  # inches (NIST SP 811: 25.4 mm)
    assert json.loads((out / "study.json").read_text())["schema"] == STUDY_SCHEMA
    res = tmp_path / "res"
    assert main(["solve", STRIP, "--elements-per-radius", "4", "--no-estimate", "--out", str(res)]) == 0
    assert json.loads((res / "result.json").read_text())["schema"] == RESULT_SCHEMA
