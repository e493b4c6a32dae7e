"""The dashboard in a real browser: ``streamlit run`` on a loopback port, headless Chromium
driven by Playwright.

A three-line recipe is pasted into the table from the clipboard, as a spreadsheet puts it
there; the freezing point read off the page and the downloaded CSV and HTML files are
compared with the library's own evaluation of the same recipe.

Skipped when Chromium or Playwright is missing, except under CI (``CI=true``), where a
missing browser is a failure, so a broken install step cannot pass green.
``SOLUTIONS_CHROMIUM`` names another Chromium binary (default: ``chromium`` on the PATH,
else /usr/bin/chromium).
"""
import csv
import io
import os
import re
import shutil
import socket
import subprocess
import sys
import time
import urllib.request
from pathlib import Path

import pandas as pd
import pytest

from solutions.evaluate import evaluate
from solutions.ingredients import default_library
from solutions.recipe import read_recipe
from solutions.report import summary_csv

pytestmark = pytest.mark.browser

ROOT = Path(__file__).resolve().parents[1]
CHROMIUM = os.environ.get("SOLUTIONS_CHROMIUM") or shutil.which("chromium") or "/usr/bin/chromium"
FLAGS = ["--headless", "--no-sandbox", "--disable-gpu", "--disable-quic", "--no-first-run",
         "--disable-background-networking", "--disable-component-update", "--disable-sync"]
SHOTS = Path(os.environ.get("SOLUTIONS_SHOTS", "/tmp/shots"))
ROWS = [("sucrose", "10", "% w/w"), ("sodium chloride", "0.5", "% w/w"), ("water", "balance", "")]


def _need_browser():
    missing = None
    if not Path(CHROMIUM).exists():
        missing = f"Chromium not found ({CHROMIUM})"
    else:
        try:
            import playwright.sync_api  # noqa: F401
        except ImportError:
            missing = "Playwright for Python is not installed"
    if missing:
        if os.environ.get("CI") == "true":
            pytest.fail(f"{missing}, and CI=true: the browser tests must run in CI")
        pytest.skip(missing)


def _free_port() -> int:
    with socket.socket() as s:
        s.bind(("127.0.0.1", 0))
        return s.getsockname()[1]


@pytest.fixture(scope="module")
def server(tmp_path_factory):
    _need_browser()
    port = _free_port()
    log_path = tmp_path_factory.mktemp("streamlit") / "server.log"
    log = open(log_path, "w")
    proc = subprocess.Popen(
        [sys.executable, "-m", "streamlit", "run", "streamlit_app.py",
         "--server.headless", "true", "--server.address", "127.0.0.1",
         "--server.port", str(port), "--browser.gatherUsageStats", "false"],
        cwd=ROOT, stdout=log, stderr=subprocess.STDOUT)
    url = f"http://127.0.0.1:{port}"
    try:
        deadline = time.monotonic() + 60
        while True:
            try:
                with urllib.request.urlopen(url + "/_stcore/health", timeout=1) as r:
                    if r.status == 200:
                        break
            except OSError:
                if proc.poll() is not None or time.monotonic() > deadline:
                    log.flush()
                    raise RuntimeError("the Streamlit server did not start:\n"
                                       + log_path.read_text()) from None
                time.sleep(0.2)
        yield url
    finally:
        proc.terminate()
        try:
            proc.wait(10)
        except subprocess.TimeoutExpired:
            proc.kill()
        log.close()
        # a traceback in the server log means the page failed somewhere
        assert "Traceback" not in log_path.read_text(), log_path.read_text()


@pytest.fixture(scope="module")
def chromium_browser():
    _need_browser()
    from playwright.sync_api import sync_playwright
    with sync_playwright() as p:
        b = p.chromium.launch(executable_path=CHROMIUM, args=FLAGS)
        yield b
        b.close()


@pytest.fixture()
def app_page(server, chromium_browser):
    ctx = chromium_browser.new_context(viewport={"width": 1400, "height": 1800},
                                       accept_downloads=True)
    ctx.grant_permissions(["clipboard-read", "clipboard-write"], origin=server)
    pg = ctx.new_page()
    pg.set_default_timeout(60_000)
    pg.goto(server + "/")
    pg.wait_for_selector("[data-testid=stMetric]")
    yield pg
    ctx.close()


def _settle(pg):
    """Wait until the script run triggered last has finished."""
    pg.wait_for_timeout(300)
    pg.wait_for_function("() => !document.querySelector('[data-testid=stStatusWidget]')"
                         " || !document.querySelector('[data-testid=stStatusWidget]')"
                         ".innerText.includes('Running')")
    pg.wait_for_timeout(300)


def _metric(pg, label: str) -> str:
    m = pg.locator("[data-testid=stMetric]").filter(has_text=label).first
    return m.locator("[data-testid=stMetricValue]").inner_text()


def _library_dict():
    table = pd.DataFrame(ROWS, columns=["ingredient", "amount", "unit"])
    r = read_recipe(table, default_library(), name="my recipe")
    d = evaluate(r, T=298.15).to_dict()
    return {**d, "recipe": [dict(zip(("ingredient", "amount", "unit"), row)) for row in ROWS]}


def _paste_recipe(pg, rows=ROWS, wait_for_metric=True):
    pg.get_by_role("button", name="Clear table").click()
    pg.get_by_text("No results:").wait_for()
    tsv = "\n".join("\t".join(r) for r in rows)
    pg.evaluate("t => navigator.clipboard.writeText(t)", tsv)
    grid = pg.locator("[data-testid=stDataFrameResizable]").first
    box = grid.bounding_box()
    # first data cell: past the ~33 px row-selector column and the ~35 px header row
    pg.mouse.click(box["x"] + 33 + 40, box["y"] + 35 + 17)
    pg.keyboard.press("Control+V")
    if wait_for_metric:
        pg.locator("[data-testid=stMetric]").first.wait_for()
    _settle(pg)


def test_pasted_recipe_freezing_point_and_csv_download(app_page, tmp_path):
    page = app_page
    _paste_recipe(page)
    # the grid holds what was pasted, row by row (column 0 is the row selector)
    for i, row in enumerate(ROWS):
        cells = [page.locator(f"[data-testid=glide-cell-{c}-{i}]").first.inner_text()
                 for c in (1, 2, 3)]
        assert tuple(cells) == row
    d = _library_dict()
    shown = _metric(page, "Freezing point")
    m = re.search(r"-?\d+\.(\d+)", shown.replace("−", "-"))
    assert m, shown
    half_ulp = 0.5 * 10.0 ** -len(m.group(1))
    assert abs(float(m.group(0)) - d["solution"]["freezing_point_C"]) <= half_ulp + 1e-12
    assert not page.locator("[data-testid=stException]").count()
    SHOTS.mkdir(parents=True, exist_ok=True)
    page.screenshot(path=str(SHOTS / "browser_pasted.png"), full_page=True)

    with page.expect_download() as dl:
        page.get_by_role("button", name="Summary table (CSV)").click()
    path = tmp_path / "summary.csv"
    dl.value.save_as(path)
    text = path.read_bytes().decode("utf-8")   # keep the CSV's own line ends
    assert text == summary_csv(d)
    rows = list(csv.reader(io.StringIO(text)))
    fp = next(r for r in rows if r[:3] == ["property", "solution", "Freezing point"])
    assert float(fp[3]) == pytest.approx(d["solution"]["freezing_point_C"], rel=1e-11)
    assert [r[1:5] for r in rows if r[0] == "recipe row"] == \
        [[n, "amount", a, u] for n, a, u in ROWS]


def test_html_report_download_is_self_contained(app_page, tmp_path):
    page = app_page
    with page.expect_download() as dl:
        page.get_by_role("button", name="Printable report (HTML)").click()
    path = tmp_path / "report.html"
    dl.value.save_as(path)
    html = path.read_text(encoding="utf-8")
    assert "<script" not in html.lower() and not re.search(r"<link\b", html, re.I)
    assert html.count("<svg") == 3
    assert "Freezing point" in html and "Osmolality" in html


IMG = "![x](http://127.0.0.1:1/b.png)"
TAG = '<img src="http://127.0.0.1:1/c.png">'


def test_pasted_names_are_shown_as_typed_never_fetched(app_page):
    """Names pasted from a spreadsheet that look like Markdown or HTML images: the page
    shows the characters, makes no image or link of them and requests nothing."""
    page = app_page
    asked = []
    page.on("request", lambda r: asked.append(r.url) if "127.0.0.1:1/" in r.url else None)
    rows = [(IMG, "1", "g", "NaCl"), (TAG, "1", "g", "KCl"), ("water", "100", "g", "")]
    _paste_recipe(page, rows)
    assert not page.locator("[data-testid=stException]").count()
    assert page.locator("img[src*='127.0.0.1:1']").count() == 0
    assert page.locator("a[href*='127.0.0.1:1']").count() == 0
    body = page.locator("[data-testid=stMain]").inner_text().replace("\u2060", "")
    assert IMG in body and TAG in body
    page.wait_for_timeout(500)
    assert asked == []
    SHOTS.mkdir(parents=True, exist_ok=True)
    page.screenshot(path=str(SHOTS / "browser_markup_names.png"), full_page=True)


@pytest.mark.parametrize("name, rows, metric", [
    ("demo", None, True),
    ("propylene_glycol_70", [("propylene glycol", "70", "% w/w"), ("water", "balance", "")],
     True),
    ("long_names", [("magnesium chloride hexahydrate", "2.5", "% w/w"),
                    ("sodium citrate dihydrate", "0.5", "% w/w"), ("water", "balance", "")],
     True),
    ("bad_paste", [("sodium chloride", "0,9", "% w/v"), ("water", "q.s. to 1000", "mL")],
     False),
    ("sanitizer_70_ethanol", [("ethanol", "70", "% v/v"), ("water", "q.s. to 1000", "mL")],
     True),
])
def test_screenshots(app_page, name, rows, metric):
    """The page for a demo recipe, a 70 % propylene glycol recipe and a bad paste: no
    exception element, results or a plain message; the PNGs go to $SOLUTIONS_SHOTS."""
    page = app_page
    if rows is not None:
        _paste_recipe(page, rows, wait_for_metric=metric)
    assert not page.locator("[data-testid=stException]").count()
    # the results section's own elements (the tool tabs below have metrics and charts too)
    outside_tabs = "[not(ancestor::div[@data-testid='stTabs'])]"
    metrics = page.locator(f"xpath=//div[@data-testid='stMetric']{outside_tabs}")
    if metric:
        assert metrics.count() >= 4
        charts = page.locator(f"xpath=//div[@data-testid='stVegaLiteChart']{outside_tabs}")
        charts.nth(2).locator("canvas, svg").first.wait_for()
        assert charts.count() == 3
    else:
        page.get_by_text("Numbers use a decimal comma", exact=False).first.wait_for()
        assert metrics.count() == 0
    SHOTS.mkdir(parents=True, exist_ok=True)
    # Streamlit scrolls inside its own container: a tall window shows the whole page
    page.set_viewport_size({"width": 1400, "height": 4400})
    _settle(page)
    page.screenshot(path=str(SHOTS / f"page_{name}.png"), full_page=True)
