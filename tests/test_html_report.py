"""The self-contained HTML report, rendered and then opened in a real headless Chromium.

Sources of the checks: HTML escaping and the meaning of ``img.complete`` / ``naturalWidth`` -- HTML
Living Standard (WHATWG); resource entries -- W3C Resource Timing Level 2; Content-Security-Policy --
W3C CSP Level 3; the A4 sheet, 210 mm x 297 mm = 595.3 pt x 841.9 pt -- ISO 216. That a report must
show every figure, fetch nothing and keep tables whole is our own requirement (common practice for
self-contained documents, no external source).

The figures and numbers below are demo data (an invented part), labelled as such in the document.
"""

from __future__ import annotations

import io
import re
from importlib import resources

import numpy as np
import pytest

from browser import (chromium, figures, keep_copy, not_displayed, open_page, outside_requests,  # noqa: F401
                     print_pdf, requests_of_page, resource_urls, screenshot)
from fekt.report.html import (Caution, Document, Figure, Heading, KeyValues, Paragraph, Preformatted, Provenance,
                              Table, WarningList, clean_text, inline_svg, render)
from fekt.report.units import engineering, unit_free

NASTY_NAME = "plate <b>&</b> $W/d$ \x1b[31mred\x1b[0m \u202eevil\u202c\nsecond line"
PEAK_ROWS = (("1", "hole, right", "2.52", "2.43", "±0.01"),
             ("2", "hole, left", "2.51", "2.42", "±0.01"),
             ("3", "fillet, lower", "1.74", "1.31", "±0.02"))

CASE_TEXT = """# demo case (invented part)
[case]
name = "plate <b>&</b> $W/d$"
[units]
length = "mm"
force = "N"
[parameters]
W = 40.0   # width
d = 12.0   # hole diameter \x07
"""


# --- demo figures (matplotlib Figure objects, no pyplot, no global backend) -----------------------

def _field_png() -> bytes:
    """Hoop-type stress sigma_xx / S around a circular hole in a wide plate (Kirsch solution, unit radius)."""
    from matplotlib.figure import Figure as MplFigure

    x, y = np.meshgrid(np.linspace(-4, 4, 241), np.linspace(-3, 3, 181))
    r2 = x ** 2 + y ** 2
    th = np.arctan2(y, x)
    a2 = 1.0 / np.maximum(r2, 1e-12)
    s = 1 - a2 * (1.5 * np.cos(2 * th) + np.cos(4 * th)) + 1.5 * a2 ** 2 * np.cos(4 * th)
    s = np.ma.masked_where(r2 < 1.0, s)
    fig = MplFigure(figsize=(6.0, 3.6), dpi=100, layout="constrained")
    ax = fig.subplots()
    mesh = ax.pcolormesh(x, y, s, cmap="cividis", shading="auto")
    fig.colorbar(mesh, ax=ax, label="σxx / S  [-]")
    ax.set_aspect("equal")
    ax.set_xlabel("x  [mm]")
    ax.set_ylabel("y  [mm]")
    ax.set_title("Demo data: stress around a hole")
    buf = io.BytesIO()
    fig.savefig(buf, format="png")
    return buf.getvalue()


def _convergence_svg() -> str:
    from matplotlib.figure import Figure as MplFigure

    dofs = np.array([2.1e3, 8.0e3, 3.1e4, 1.2e5])
    kt = np.array([2.47, 2.505, 2.515, 2.518])
    fig = MplFigure(figsize=(5.0, 3.2), layout="constrained")
    ax = fig.subplots()
    ax.semilogx(dofs, kt, "o-", color="black", mfc="white", label="Kt_net per mesh")
    ax.axhline(2.519, color="0.4", ls="--", label="extrapolated")
    ax.set_xlabel("degrees of freedom  [-]")
    ax.set_ylabel("Kt_net  [-]")
    ax.set_title("Demo data: refinement study")
    ax.legend(frameon=False)
    buf = io.StringIO()
    fig.savefig(buf, format="svg")
    return buf.getvalue()


def sample_document() -> Document:
    return Document(
        title=f"Kt report: {NASTY_NAME}",
        subtitle="fekt solve, plane stress, 1 load case",
        demo=True,
        blocks=(
            Heading("Inputs", anchor="inputs"),
            KeyValues((("case", NASTY_NAME), ("width W", f"{engineering(40.0)} mm"),
                       ("hole diameter d", f"{engineering(12.0)} mm"), ("force", f"{engineering(59873.2)} N"))),
            Preformatted(CASE_TEXT, caption="The case file as read"),
            Heading("Peaks", anchor="peaks-heading"),
            Paragraph("Ranked by Kt_net. Bands are the discretisation uncertainty of the finest mesh.\n\n"
                      "Values < 1 would mean $no$ concentration."),
            Table(headers=("#", "feature", "Kt_net", "Kt_gross", "band"), rows=PEAK_ROWS,
                  numeric=(True, False, True, True, True), emphasis=(True, False, False),
                  caption="Hot spots (demo data)", note=f"Kt to three significant digits, e.g. {unit_free(2.5169)}.",
                  anchor="peaks"),
            Figure(caption="Normalised stress near the hole (demo data).", alt="Colour map of stress around a hole",
                   png=_field_png(), anchor="field"),
            Figure(caption="Kt_net against mesh size (demo data).", alt="Kt_net rising towards 2.52 as DOFs grow",
                   svg=_convergence_svg(), anchor="convergence"),
            WarningList(("The hole is within 2 d of the loaded end <left>.",)),
            Caution("Linear-elastic Kt of the idealised geometry.\n\nNot a fatigue notch factor."),
            Provenance((("fekt", "0.1.0"), ("case hash", "sha256:0123abcd"), ("started", "2025-01-01T00:00:00Z"))),
        ),
        footer="Written by fekt.")


# --- rendering, without a browser ----------------------------------------------------------------

def test_template_ships_with_the_package():
    assert resources.files("fekt.report").joinpath("templates", "report.html.j2").is_file()


def test_user_text_is_escaped_and_cleaned():
    html = render(sample_document())
    assert "<b>&</b>" not in html and "&lt;b&gt;&amp;&lt;/b&gt;" in html
    assert "\x1b" not in html and "\x07" not in html and "\u202e" not in html and "[31m" not in html
    assert "$W/d$" in html                                    # dollars are plain text
    assert "59\u202f870 N" in html                            # the narrow no-break space survives cleaning
    assert "&lt;left&gt;" in html


def test_clean_text():
    assert clean_text("a\x00b\x01c\x7fd\x85e\r\nf\rg\th\x1b") == "abcde\nf\ng\th"
    assert clean_text("x\u202ey\u2066z\u200f") == "xyz"
    assert clean_text("bad \ud800 surrogate") == "bad \ufffd surrogate"
    # terminal escape sequences go whole (ECMA-48 control sequences and strings), not just their ESC byte
    assert clean_text("a\x1b[1;31mred\x1b[0m b") == "ared b"
    assert clean_text("x\x1b]0;window title\x07y") == "xy"
    assert clean_text("p\x1b]8;;http://e.invalid\x1b\\link\x1b]8;;\x1b\\q") == "plinkq"


def test_nothing_refers_outside_the_file():
    html = render(sample_document())
    assert not re.search(r"""(src|href)\s*=\s*["']?(https?:|//|file:)""", html, re.I)
    assert "@import" not in html and "<script" not in html.lower() and "<link" not in html.lower()
    assert not re.search(r"url\(\s*['\"]?(?!#)", html)
    assert "default-src 'none'" in html                       # the browser is told to load nothing


def test_figure_ids_do_not_clash():
    svg = _convergence_svg()
    doc = Document("two", blocks=(Figure("a", "a", svg=svg), Figure("b", "b", svg=svg)))
    ids = re.findall(r'\bid="([^"]+)"', render(doc))
    assert ids and len(ids) == len(set(ids))


@pytest.mark.parametrize("svg,words", [
    ('<svg xmlns="http://www.w3.org/2000/svg"><script>alert(1)</script></svg>', "<script>"),
    ('<svg xmlns="http://www.w3.org/2000/svg" onload="alert(1)"/>', "event handler"),
    ('<svg xmlns="http://www.w3.org/2000/svg" xmlns:xlink="http://www.w3.org/1999/xlink">'
     '<image xlink:href="http://example.invalid/a.png"/></svg>', "outside"),
    ('<svg xmlns="http://www.w3.org/2000/svg"><rect style="fill: url(http://x.invalid/p)"/></svg>', "outside"),
    ('<svg xmlns="http://www.w3.org/2000/svg"><style>@import "http://x.invalid/a.css";</style></svg>', "outside"),
    ("<html/>", "not an SVG"),
    ("<svg", "well-formed"),
])
def test_inline_svg_refuses_what_could_run_or_fetch(svg, words):
    with pytest.raises(ValueError, match=words):
        inline_svg(svg, "f1-")


def test_view_model_validation():
    with pytest.raises(ValueError, match="exactly one"):
        Figure("c", "alt")
    with pytest.raises(ValueError, match="not a PNG"):
        Figure("c", "alt", png=b"GIF89a")
    with pytest.raises(ValueError, match="alt text"):
        Figure("c", " ", svg="<svg/>")
    with pytest.raises(ValueError, match="row 1 has 1 cells"):
        Table(("a", "b"), (("1", "2"), ("3",)))
    with pytest.raises(TypeError, match="format numbers first"):
        Table(("a",), ((2.5,),))
    with pytest.raises(TypeError, match="not a report block"):
        Document("t", blocks=("just text",))
    t = Table(["a"], [["1"], ["2"]])                           # lists become tuples: the view is frozen
    assert t.rows == (("1",), ("2",)) and hash(t)


# --- in the browser ------------------------------------------------------------------------------

def test_report_in_a_real_browser(chromium, tmp_path, capsys):
    page = tmp_path / "demo_report.html"
    page.write_text(render(sample_document()), encoding="utf-8")
    open_page(chromium, page)

    # every figure is displayed: one PNG decoded to its pixel size, one inline SVG with drawn content
    figs = figures(chromium)
    assert sorted(f["kind"] for f in figs) == ["img", "svg"]
    assert not_displayed(figs) == []
    img = next(f for f in figs if f["kind"] == "img")
    assert (img["naturalWidth"], img["naturalHeight"]) == (600, 360)   # 6.0 x 3.6 in at 100 dpi
    assert chromium.execute_script("return document.querySelectorAll('figure').length") == 2

    # the peak table has the expected rows, the first emphasised
    rows = chromium.execute_script(
        "return Array.from(document.querySelectorAll('#peaks tbody tr'))"
        ".map(r => [r.className, Array.from(r.cells).map(c => c.textContent)])")
    assert [tuple(cells) for _, cells in rows] == list(PEAK_ROWS)
    assert [cls for cls, _ in rows] == ["em", "", ""]
    align = chromium.execute_script("return getComputedStyle(document.querySelector('#peaks tbody td:nth-child(3)'))"
                                    ".textAlign")
    assert align == "right"

    # user text is shown as text: no element made of it, no script on the page, title readable
    assert chromium.execute_script("return document.scripts.length") == 0
    assert chromium.execute_script("return document.querySelectorAll('h1 b, td b').length") == 0
    h1 = chromium.execute_script("return document.querySelector('h1').textContent")
    assert h1 == "Kt report: " + clean_text(NASTY_NAME)
    assert "Demo data" in chromium.execute_script("return document.querySelector('.demo').textContent")

    # nothing fetched: the page's own resource list and every request the browser attempted
    assert all(u.startswith("data:") for u in resource_urls(chromium))
    requests = requests_of_page(chromium, page)
    assert requests and outside_requests(requests, page) == []   # the page itself was seen, nothing else

    # a picture of the page, and a print to A4
    shot = screenshot(chromium, tmp_path / "fekt_demo_report.png")
    assert shot.read_bytes().startswith(b"\x89PNG\r\n\x1a\n")
    pdf = print_pdf(chromium, tmp_path / "fekt_demo_report.pdf").read_bytes()
    boxes = [tuple(map(float, m)) for m in re.findall(rb"/MediaBox\s*\[\s*0\s+0\s+([\d.]+)\s+([\d.]+)\s*\]", pdf)]
    assert boxes, "no page sizes found in the printed PDF"
    for w, h in boxes:
        assert w == pytest.approx(595.3, abs=1.5) and h == pytest.approx(841.9, abs=1.5)  # ISO 216 A4
    kept = [keep_copy(p) for p in (shot, tmp_path / "fekt_demo_report.pdf", page)]
    with capsys.disabled():
        print(f"\n  HTML report {page} ({page.stat().st_size} bytes), screenshot {shot}"
              + (f"; copies in {kept[0].parent}" if kept[0] else "") + f"; {len(boxes)} A4 page(s) when printed")


# --- the harness catches what it is meant to catch ----------------------------------------------

BROKEN_PAGE = """<!DOCTYPE html><html><head><meta charset="utf-8"><title>bad</title></head><body>
<img id="far" src="http://fekt-test.invalid/figure.png" alt="fetched from elsewhere">
<img id="broken" src="data:image/png;base64,iVBORw0KGgoAAAA" alt="not a decodable PNG">
<svg id="empty" xmlns="http://www.w3.org/2000/svg" width="200" height="100"></svg>
<svg id="good" xmlns="http://www.w3.org/2000/svg" width="200" height="100"><rect width="50" height="40"/></svg>
</body></html>"""


def test_harness_sees_missing_figures_and_outside_fetches(chromium, tmp_path):
    page = tmp_path / "broken.html"
    page.write_text(BROKEN_PAGE, encoding="utf-8")
    open_page(chromium, page)
    bad = not_displayed(figures(chromium))
    assert sorted(f["kind"] for f in bad) == ["img", "img", "svg"]   # both bad images, the empty svg
    # the attempt is seen (it went out and failed to resolve: the test browser resolves no host name)
    assert outside_requests(requests_of_page(chromium, page), page) == [("http://fekt-test.invalid/figure.png", "")]


def test_report_policy_blocks_fetches_even_if_markup_slipped_in(chromium, tmp_path):
    # defence in depth: an outside image spliced into a rendered report is refused by its Content-Security-Policy
    html = render(Document("csp", blocks=(Paragraph("x"),)))
    html = html.replace("<main>", '<main><img id="far" src="http://fekt-test.invalid/figure.png" alt="far">')
    page = tmp_path / "csp.html"
    page.write_text(html, encoding="utf-8")
    open_page(chromium, page)
    assert outside_requests(requests_of_page(chromium, page), page) == [("http://fekt-test.invalid/figure.png", "csp")]
    assert len(not_displayed(figures(chromium))) == 1
