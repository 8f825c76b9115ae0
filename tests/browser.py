"""A real browser for tests: the system's headless Chromium driven through selenium.

Uses Debian's ``chromium`` and ``chromium-driver`` packages (``/usr/bin/chromium``,
``/usr/bin/chromedriver``; other paths through FEKT_CHROMIUM / FEKT_CHROMEDRIVER). Nothing is
downloaded: both paths are given to selenium, so its driver manager is not consulted.

Where the browser, the driver or selenium is missing, the ``chromium`` fixture SKIPS the test and
says what to install. Set FEKT_REQUIRE_BROWSER=1 to make that a failure instead (CI machines that
installed the browser must not skip quietly).

What the helpers measure (common practice for browser tests; the browser features are specified in
the HTML Living Standard -- ``img.complete``, ``naturalWidth`` -- in W3C Resource Timing Level 2 --
``performance.getEntriesByType('resource')`` -- and in the Chrome DevTools Protocol -- the Network
domain events in the performance log, ``Page.captureScreenshot``, ``Page.printToPDF``).
"""

from __future__ import annotations

import base64
import contextlib
import json
import os
import shutil
from pathlib import Path

import pytest

CHROMIUM = os.environ.get("FEKT_CHROMIUM", "/usr/bin/chromium")
CHROMEDRIVER = os.environ.get("FEKT_CHROMEDRIVER", "/usr/bin/chromedriver")

#: launch flags: headless, as root on a CI machine, and no traffic of the browser's own
FLAGS = ("--headless", "--no-sandbox", "--disable-gpu", "--disable-quic", "--no-first-run",
         "--disable-background-networking", "--disable-component-update", "--disable-sync",
         "--disable-dev-shm-usage",
         # every host name fails to resolve: a page that tries to fetch something still shows the
         # attempt in the logs, but nothing leaves the machine
         "--host-resolver-rules=MAP * ~NOTFOUND",
         "--window-size=1024,900", "--hide-scrollbars", "--force-device-scale-factor=1")

INSTALL = "apt-get install -y chromium chromium-driver"


def unavailable_reason() -> str | None:
    """Why no browser test can run here, or None when everything is installed."""
    try:
        import selenium  # noqa: F401
    except ImportError:
        return "selenium is not installed (pip install -e '.[test]')"
    for path, package in ((CHROMIUM, "chromium"), (CHROMEDRIVER, "chromium-driver")):
        if not (os.path.isfile(path) and os.access(path, os.X_OK)):
            return f"no browser test: {path} not found (Debian package {package}: {INSTALL})"
    return None


@contextlib.contextmanager
def headless_chromium(profile_dir: Path, log_path: Path):
    """A selenium driver of a fresh headless Chromium with its own profile folder; quit on exit."""
    from selenium import webdriver
    from selenium.webdriver.chrome.options import Options
    from selenium.webdriver.chrome.service import Service

    options = Options()
    options.binary_location = CHROMIUM
    for flag in FLAGS:
        options.add_argument(flag)
    options.add_argument(f"--user-data-dir={profile_dir}")
    options.set_capability("goog:loggingPrefs", {"performance": "ALL", "browser": "ALL"})
    service = Service(executable_path=CHROMEDRIVER, log_output=str(log_path))
    driver = webdriver.Chrome(options=options, service=service)
    try:
        yield driver
    finally:
        driver.quit()


@pytest.fixture(scope="module")
def chromium(tmp_path_factory):
    """A headless Chromium for the tests of one module (skipped with the reason if none is installed)."""
    reason = unavailable_reason()
    if reason:
        if os.environ.get("FEKT_REQUIRE_BROWSER"):
            pytest.fail(f"FEKT_REQUIRE_BROWSER is set but {reason}")
        pytest.skip(reason)
    root = tmp_path_factory.mktemp("chromium")
    with headless_chromium(root / "profile", root / "chromedriver.log") as driver:
        yield driver


# --- looking at a page ---------------------------------------------------------------------------

def open_page(driver, path: Path, timeout: float = 20.0) -> None:
    """Load a local file and wait until it and every image in it has finished loading."""
    from selenium.webdriver.support.ui import WebDriverWait

    driver.get_log("performance")  # drop what earlier pages logged
    driver.get(Path(path).resolve().as_uri())
    WebDriverWait(driver, timeout).until(lambda d: d.execute_script(
        "return document.readyState === 'complete' && Array.from(document.images).every(i => i.complete)"))


_FIGURES_JS = """
const out = [];
const shown = el => { const s = getComputedStyle(el); return s.display !== 'none' && s.visibility !== 'hidden'; };
for (const img of document.images) {
  const r = img.getBoundingClientRect();
  out.push({kind: 'img', complete: img.complete, naturalWidth: img.naturalWidth, naturalHeight: img.naturalHeight,
            width: r.width, height: r.height, shown: shown(img), src: img.currentSrc.slice(0, 40)});
}
for (const svg of document.querySelectorAll('svg')) {
  if (svg.parentElement.closest('svg')) continue;          // only outermost svg elements
  const r = svg.getBoundingClientRect();
  let bw = 0, bh = 0;
  try { const b = svg.getBBox(); bw = b.width; bh = b.height; } catch (e) {}
  out.push({kind: 'svg', width: r.width, height: r.height, bboxWidth: bw, bboxHeight: bh, shown: shown(svg)});
}
return out;
"""


def figures(driver) -> list[dict]:
    """Every image and outermost inline SVG with what the browser made of it (sizes in CSS px)."""
    return driver.execute_script(_FIGURES_JS)


def not_displayed(figs: list[dict]) -> list[dict]:
    """The figures the reader would not see: an image that failed to decode, anything of zero size."""
    bad = []
    for f in figs:
        ok = f["shown"] and f["width"] > 0 and f["height"] > 0
        if f["kind"] == "img":
            ok = ok and f["complete"] and f["naturalWidth"] > 0 and f["naturalHeight"] > 0
        else:
            ok = ok and f["bboxWidth"] > 0 and f["bboxHeight"] > 0
        if not ok:
            bad.append(f)
    return bad


def resource_urls(driver) -> list[str]:
    """URLs of every resource the page loaded, as the page itself saw them (Resource Timing)."""
    return driver.execute_script("return performance.getEntriesByType('resource').map(e => e.name)")


def requests_of_page(driver, page: Path) -> list[tuple[str, str]]:
    """Every request the page at ``page`` made since :func:`open_page` (DevTools performance log), as
    (url, how it ended): "" when it went out (loaded or failed on the way), else the reason the
    browser blocked it before sending (e.g. "csp": refused by the page's Content-Security-Policy)."""
    own = Path(page).resolve().as_uri()
    urls, ended = {}, {}
    for entry in driver.get_log("performance"):
        message = json.loads(entry["message"])["message"]
        method, params = message.get("method"), message.get("params", {})
        if method == "Network.requestWillBeSent" and params.get("documentURL", "").split("#")[0] == own:
            urls[params["requestId"]] = params["request"]["url"]
        elif method == "Network.loadingFailed":
            ended[params["requestId"]] = params.get("blockedReason") or ""
        elif method == "Network.webSocketCreated":
            urls[params["requestId"]] = params["url"]
    return [(url, ended.get(rid, "")) for rid, url in urls.items()]


def outside_requests(requests: list[tuple[str, str]], page: Path) -> list[tuple[str, str]]:
    """The requests other than the page itself and ``data:`` URIs: each one an attempt to fetch from elsewhere."""
    own = Path(page).resolve().as_uri()
    return [(u, how) for u, how in requests if not (u.startswith("data:") or u.split("#")[0] == own)]


def screenshot(driver, path: Path) -> Path:
    """A PNG of the whole page, not only the window."""
    metrics = driver.execute_cdp_cmd("Page.getLayoutMetrics", {})
    size = metrics.get("cssContentSize") or metrics["contentSize"]
    shot = driver.execute_cdp_cmd("Page.captureScreenshot", {
        "format": "png", "captureBeyondViewport": True,
        "clip": {"x": 0, "y": 0, "width": size["width"], "height": size["height"], "scale": 1}})
    Path(path).write_bytes(base64.b64decode(shot["data"]))
    return Path(path)


def print_pdf(driver, path: Path) -> Path:
    """Print the page as the reader's browser would, with the page size its style sheet asks for."""
    pdf = driver.execute_cdp_cmd("Page.printToPDF", {"preferCSSPageSize": True, "printBackground": True})
    Path(path).write_bytes(base64.b64decode(pdf["data"]))
    return Path(path)


def keep_copy(path: Path) -> Path | None:
    """Copy a file into FEKT_SCREENSHOT_DIR when that is set (for looking at it after the run)."""
    folder = os.environ.get("FEKT_SCREENSHOT_DIR")
    if not folder:
        return None
    os.makedirs(folder, exist_ok=True)
    return Path(shutil.copy2(path, os.path.join(folder, Path(path).name)))
