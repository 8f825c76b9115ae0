"""The review package of real runs: report.html of a solve, a refinement study and a sweep, generated
through the command line and opened in a real headless Chromium.

Sources of the checks: ``img.complete`` / ``naturalWidth`` -- HTML Living Standard (WHATWG); resource
entries -- W3C Resource Timing Level 2; the A4 sheet, 210 mm x 297 mm = 595.3 pt x 841.9 pt -- ISO 216.
That the peak table holds exactly the result's peaks in rank order, that every figure is shown and that
nothing is fetched are our own requirements for a self-contained review document (no external source).

The demo part (cases/demo_link.toml) is demo data: an invented part.
"""

from __future__ import annotations

import json
import os
import re

import pytest

from browser import (chromium, figures, keep_copy, not_displayed, open_page, outside_requests,  # noqa: F401
                     print_pdf, requests_of_page, resource_urls, screenshot)
from fekt.cli.main import main
from fekt.report.units import engineering
from fekt.report.review import DASH

ROOT = os.path.dirname(os.path.dirname(os.path.abspath(__file__)))
DEMO = os.path.join(ROOT, "cases", "demo_link.toml")
STRIP = os.path.join(ROOT, "cases", "strip_hole.toml")
CHART_STRIP = os.path.join(ROOT, "cases", "chart_strip_hole.toml")
FAST = ["--elements-per-radius", "6"]

TABLE_JS = ("return Array.from(document.querySelectorAll('#peaks tbody tr'))"
            ".map(r => Array.from(r.cells).map(c => c.textContent))")


@pytest.fixture(scope="module")
def demo_run(tmp_path_factory):
    """fekt solve of the demo part with --html and --vtu (coarse mesh, with the two-grid bands)."""
    out = tmp_path_factory.mktemp("review") / "demo_link"
    assert main(["solve", DEMO, *FAST, "--out", str(out), "--html", "--vtu"]) == 0
    with open(out / "result.json", encoding="utf-8") as fh:
        return out, json.load(fh)


def test_solve_html_is_written_self_contained(demo_run):
    out, result = demo_run
    assert sorted(n for n in os.listdir(out) if not n.startswith(".")) == ["field.vtu", "report.html", "report.txt", "result.json", "stress.png"]
    html = (out / "report.html").read_text(encoding="utf-8")
    assert "<script" not in html and "http://" not in html and "https://" not in html
    assert html.count("data:image/png;base64,") == 1
    # the case file itself is echoed, and every peak's Kt as fekt computed it
    assert "lightening hole" in html and "force = 24000" in html
    for p in result["peaks"]:
        assert engineering(p["kt_net"], 4) in html
    assert result["caution"].split(";")[0] in html
    assert result["provenance"]["case_sha256_16"] in html


def test_solve_report_in_a_real_browser(demo_run, chromium, capsys):
    out, result = demo_run
    page = out / "report.html"
    open_page(chromium, page)

    # every figure displayed: the part / stress figure, decoded at its full pixel size
    figs = figures(chromium)
    assert [f["kind"] for f in figs] == ["img"]
    assert not_displayed(figs) == []
    assert figs[0]["naturalWidth"] >= 1000

    # the peak table holds exactly the result's peaks, in rank order, with fekt's Kt values
    rows = chromium.execute_script(TABLE_JS)
    peaks = sorted(result["peaks"], key=lambda p: p["rank"])
    assert [r[0] for r in rows] == [str(p["rank"]) for p in peaks] == [str(i + 1) for i in range(len(peaks))]
    assert [r[1] for r in rows] == [p["feature"] for p in peaks]
    assert [r[3] for r in rows] == [engineering(p["kt_net"], 4) for p in peaks]
    # a feature without a gross section (plain shoulder, edge) shows a dash, not a number
    assert [r[5] for r in rows] == [DASH if p["kt_gross"] is None else engineering(p["kt_gross"], 4) for p in peaks]
    first = chromium.execute_script("return document.querySelector('#peaks tbody tr').className")
    assert first == "em"

    # no table is wider than the page (a wide table would be cut off when printed)
    too_wide = chromium.execute_script(
        "return Array.from(document.querySelectorAll('.tablewrap'))"
        ".filter(w => w.scrollWidth > w.clientWidth + 1).map(w => w.firstElementChild.id)")
    assert too_wide == []

    # nothing fetched, no script, the demo banner and the caution are on the page
    assert chromium.execute_script("return document.scripts.length") == 0
    assert all(u.startswith("data:") for u in resource_urls(chromium))
    requests = requests_of_page(chromium, page)
    assert requests and outside_requests(requests, page) == []
    assert "Demo data" in chromium.execute_script("return document.querySelector('.demo').textContent")
    assert "licensed engineering practice" in chromium.execute_script(
        "return document.querySelector('aside.caution').textContent")

    shot = screenshot(chromium, out / "fekt_review_demo_link.png")
    assert shot.read_bytes().startswith(b"\x89PNG\r\n\x1a\n")
    pdf = print_pdf(chromium, out / "fekt_review_demo_link.pdf").read_bytes()
    boxes = [tuple(map(float, m)) for m in re.findall(rb"/MediaBox\s*\[\s*0\s+0\s+([\d.]+)\s+([\d.]+)\s*\]", pdf)]
    assert boxes and all(w == pytest.approx(595.3, abs=1.5) and h == pytest.approx(841.9, abs=1.5) for w, h in boxes)
    kept = [keep_copy(p) for p in (shot, out / "fekt_review_demo_link.pdf", page)]
    with capsys.disabled():
        print(f"\n  review report {page} ({page.stat().st_size} bytes), screenshot {shot}"
              + (f"; copies in {kept[0].parent}" if kept[0] else "") + f"; {len(boxes)} A4 page(s) when printed")


def test_study_report_in_a_real_browser(tmp_path, chromium):
    out = tmp_path / "study"
    assert main(["converge", STRIP, "--levels", "2", "--elements-per-radius", "4", "--out", str(out), "--html"]) == 0
    study = json.loads((out / "study.json").read_text(encoding="utf-8"))
    page = out / "report.html"
    open_page(chromium, page)
    figs = figures(chromium)
    assert len(figs) == 1 and not_displayed(figs) == []
    rows = chromium.execute_script(TABLE_JS)
    assert [r[0] for r in rows] == [str(s["rank"]) for s in study["spots"]]
    levels = chromium.execute_script("return document.querySelectorAll('#level-table tbody tr').length")
    assert levels == 2
    assert outside_requests(requests_of_page(chromium, page), page) == []
    keep_copy(screenshot(chromium, tmp_path / "fekt_review_study.png"))


def test_sweep_report_in_a_real_browser(tmp_path, chromium):
    out = tmp_path / "sweep"
    assert main(["sweep", CHART_STRIP, "--vary", "d=8,12,45", "--out", str(out), "--executor", "serial",
                 "--no-estimate", "--html", "--fit", "poly:1"]) == 0
    data = json.loads((out / "sweep.json").read_text(encoding="utf-8"))
    page = out / "report.html"
    open_page(chromium, page)
    figs = figures(chromium)
    assert len(figs) == 1 and not_displayed(figs) == []
    rows = chromium.execute_script(TABLE_JS)
    assert [r[0] for r in rows] == ["0", "1", "2"]
    assert [r[2] for r in rows] == [p["status"] for p in data["points"]] == ["ok", "ok", "invalid"]
    assert outside_requests(requests_of_page(chromium, page), page) == []
    keep_copy(screenshot(chromium, tmp_path / "fekt_review_sweep.png"))


def test_html_and_vtu_need_an_output_folder(capsys):
    assert main(["solve", STRIP, "--html"]) == 2
    assert "--html" in capsys.readouterr().err
    assert main(["converge", STRIP, "--html"]) == 2
    assert main(["solve", STRIP, "--vtu"]) == 2
    assert "--out" in capsys.readouterr().err


@pytest.mark.parametrize("name,words", [("sharp_corner.toml", ["(singular)", "give the corner a radius"]),
                                        ("chart_strip_hole.toml", ["The case is the standard shape", "chart-checks"])])
def test_solve_documents_of_other_cases(name, words):
    # a singular corner and a standard-shape family check render with their own sentences
    import dataclasses

    from fekt.api import load_case, solve_full
    from fekt.report.html import render
    from fekt.report.review import peak_rows, solve_document

    case = load_case(os.path.join(ROOT, "cases", name))
    case = dataclasses.replace(case, mesh=dataclasses.replace(case.mesh, elements_per_radius=6))
    solved = solve_full(case, estimate=False)
    html = render(solve_document(solved, figure=b"\x89PNG\r\n\x1a\n"))
    for w in words:
        assert w in html
    assert len(peak_rows(solved.result)) == len(solved.result.peaks)
    assert "no band" in html      # without the estimate the report says the Kt values have no band
