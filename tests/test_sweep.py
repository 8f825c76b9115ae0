"""Sweeps, resume, invalid points, executors, fits and goal-seeking (sources beside each check)."""

from __future__ import annotations

import json
import os

import pytest

from fekt.case.loader import read_case_table
from fekt.cli.main import main
from fekt.cli.sweep_cmd import parse_vary
from fekt.errors import InputError
from fekt.studies import sweep as sw

ROOT = os.path.dirname(os.path.dirname(os.path.abspath(__file__)))
STRIP = os.path.join(ROOT, "cases", "chart_strip_hole.toml")


def test_parse_vary():
    assert parse_vary("d=4:20:5") == ("d", [4.0, 8.0, 12.0, 16.0, 20.0])
    assert parse_vary("r = 1, 2,3") == ("r", [1.0, 2.0, 3.0])
    for bad in ("d", "d=1:2", "d=a:b:3", "d=1:2:0", "=1,2"):
        with pytest.raises(InputError):
            parse_vary(bad)
    assert len(sw.grid([("a", [1, 2]), ("b", [3, 4, 5])])) == 6


def test_invalid_point_is_recorded_and_the_sweep_goes_on():
    table = read_case_table(STRIP)
    res = sw.run_points(table, STRIP, [{"d": 8.0}, {"d": 45.0}, {"d": 12.0}], estimate=False, executor="serial")
    assert [r.status for r in res] == ["ok", "invalid", "ok"]
    assert "smaller than the width" in res[1].message


@pytest.fixture(scope="module")
def serial_results():
    table = read_case_table(STRIP)
    pts = [{"d": 6.0}, {"d": 12.0}, {"d": 18.0}]
    return table, pts, sw.run_points(table, STRIP, pts, estimate=False, executor="serial")


def test_pool_matches_serial(serial_results):
    table, pts, ref = serial_results
    got = sw.run_points(table, STRIP, pts, estimate=False, executor="pool", workers=2)
    assert [r.kt_net for r in got] == [r.kt_net for r in ref]  # identical, not just close


def test_dask_local_cluster_matches_serial(serial_results):
    distributed = pytest.importorskip("dask.distributed")
    table, pts, ref = serial_results
    with distributed.LocalCluster(n_workers=2, threads_per_worker=1, processes=True, dashboard_address=None) as cl, \
            distributed.Client(cl) as client:
        got = sw.run_points(table, STRIP, pts, estimate=False, executor="dask", scheduler=client)
    assert [r.kt_net for r in got] == [r.kt_net for r in ref]


def test_resume_computes_only_missing_points(tmp_path, monkeypatch, capsys):
    out = tmp_path / "sw"
    args = ["sweep", STRIP, "--vary", "d=6:18:4", "--out", str(out), "--executor", "serial", "--no-estimate"]
    real = sw.run_point
    calls = []

    def interrupted(table, source, index, values, estimate=True, feature=None):
        if len(calls) == 2:
            raise KeyboardInterrupt
        calls.append(index)
        return real(table, source, index, values, estimate, feature)

    monkeypatch.setattr(sw, "run_point", interrupted)
    assert main(args) == 130
    assert len(open(out / "points.jsonl").read().splitlines()) == 1 + 2  # the header and two points
    monkeypatch.setattr(sw, "run_point", lambda *a, **k: (calls.append(a[2]), real(*a, **k))[1])
    assert main(args) == 2  # the folder exists: resume or force must be said
    assert main(args + ["--resume", "--json"]) == 0
    data = json.loads(capsys.readouterr().out)
    assert data["resumed_points"] == 2
    assert calls == [0, 1, 2, 3]  # the first run did 0 and 1; the resumed run only 2 and 3
    assert [p["index"] for p in data["points"]] == [0, 1, 2, 3]


def test_fit_forms(serial_results):
    _, _, res = serial_results
    f = sw.fit_results(res, ["d"], "poly:2")
    assert f.max_residual < 1e-9  # three points, quadratic: exact
    assert f.ranges == {"d": (6.0, 18.0)}
    with pytest.raises(InputError):
        sw.fit_results(res, ["d"], "cubic-sqrt")


def test_goal_seek_reproduces_howland():
    # Howland (1930), gross Kt 3.36 at d/W = 0.3 (from memory; table trusted to 1 %): the answer must
    # lie where the table's 1 % band puts it, d/W within 0.3 +- 0.02 (slope dKt/d(d/W) ~ 2.2 here)
    table = read_case_table(STRIP)
    t = sw.goal_seek(table, STRIP, "d", 3.36, (4.0, 20.0), basis="gross")
    assert abs(t.value / 40.0 - 0.3) <= 0.02
    assert t.kt == pytest.approx(3.36, abs=max(t.kt_band or 0, 5e-3))
    assert t.keeps_below == "below"  # a smaller hole keeps Kt lower
    assert t.feature == "cut-out 'hole'"


def test_cli_target(capsys):
    assert main(["target", STRIP, "--vary", "d", "--kt", "3.36", "--basis", "gross", "--bounds", "8:16"]) == 0
    out = capsys.readouterr().out
    assert out.startswith("d <= ") and "keeps Kt_gross of 'cut-out 'hole'' at or below 3.36" in out
