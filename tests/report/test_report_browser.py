"""The report page in a real browser: Debian's chromium driven by Playwright, offline.

The page is opened from a file URL with every http and https request aborted; any console
error, page error or request that leaves the file fails the test. Screenshots of each run are
kept in the test's temporary folder (``desktop_3d.png``, ``phone_3d.png``) for a person to look
at. The tests skip, saying so, only where no chromium is installed (CI installs it).
"""

from __future__ import annotations

import json
import re
import shutil
from pathlib import Path

import numpy as np
import pytest
from click.testing import CliRunner

from rallyarc.cli import main
from rallyarc.units import KMH_PER_MPS

CHROMIUM = next(
    (p for p in ("/usr/bin/chromium", shutil.which("chromium") or "") if p and Path(p).exists()),
    None,
)
pytestmark = pytest.mark.skipif(
    CHROMIUM is None, reason="chromium not found (apt-get install chromium); CI installs it"
)
ARGS = [
    "--headless",
    "--no-sandbox",
    "--disable-gpu",
    "--disable-background-networking",
    "--disable-component-update",
    "--disable-sync",
    "--no-first-run",
    # WebGL without a GPU: chromium's software renderer
    "--enable-unsafe-swiftshader",
]
PHONE = {
    "viewport": {"width": 390, "height": 844},
    "device_scale_factor": 2,
    "is_mobile": True,
    "has_touch": True,
}


def _run(*args):
    result = CliRunner().invoke(main, [str(a) for a in args])
    assert result.exit_code == 0, result.output
    return result.output


@pytest.fixture(scope="module")
def demo_page(tmp_path_factory):
    folder = tmp_path_factory.mktemp("report")
    path = folder / "report.html"
    _run("report", "demo", "-o", path)
    return path


@pytest.fixture(scope="module")
def cli_shots():
    """The shots of the demo scenario as ``rallyarc compare --json`` prints them."""
    return json.loads(_run("compare", "demo", "--json"))["shots"]


@pytest.fixture(scope="module")
def browser():
    from playwright.sync_api import sync_playwright

    with sync_playwright() as p:
        b = p.chromium.launch(executable_path=CHROMIUM, args=ARGS)
        yield b
        b.close()


class Offline:
    """A browser context with the network blocked that records console errors, page errors and
    any request for something other than the page's own file and blobs."""

    def __init__(self, browser, **context):
        self.context = browser.new_context(**context)
        self.problems = []
        self.context.route(re.compile(r"^https?://"), self._refuse)
        self.page = self.context.new_page()
        self.page.on("console", self._console)
        self.page.on("pageerror", lambda e: self.problems.append(f"page error: {e}"))

    def _refuse(self, route):
        self.problems.append(f"network request: {route.request.url}")
        route.abort()

    def _console(self, message):
        if message.type == "error":
            self.problems.append(f"console error: {message.text}")

    def open(self, path):
        self.page.goto(path.as_uri())
        self.page.wait_for_selector("figure.view3d[data-ready=true]", timeout=30000)
        return self.page

    def close(self):
        self.context.close()
        assert self.problems == []


def _pixels(png):
    """RGB pixels (H, W, 3) of a PNG screenshot."""
    import io

    from matplotlib.image import imread

    return (imread(io.BytesIO(png), format="png")[..., :3] * 255).round().astype(int)


def _contains_colour(pixels, hex_colour, tol=3):
    rgb = np.array([int(hex_colour[k : k + 2], 16) for k in (1, 3, 5)])
    return int(np.sum(np.all(np.abs(pixels - rgb) <= tol, axis=-1)))


def test_demo_page_opens_offline_draws_the_court_and_every_stroke_in_its_colour(
    browser, demo_page, tmp_path
):
    """No console error, no request; the canvas is not blank, and each stroke's palette colour
    is on it exactly (unlit tubes)."""
    run = Offline(browser, viewport={"width": 1280, "height": 900})
    page = run.open(demo_page)
    view = page.locator("figure.view3d canvas")
    view.scroll_into_view_if_needed()
    page.locator('button[data-camera="side"]').click()
    png = view.screenshot(path=str(tmp_path / "desktop_3d.png"))
    page.screenshot(path=str(tmp_path / "desktop_page.png"), full_page=True)
    pixels = _pixels(png)
    assert pixels.std() > 10
    assert len(np.unique(pixels.reshape(-1, 3), axis=0)) > 50
    data = json.loads(page.locator("script.view3d-data").text_content())
    for label, colour in data["legend"]:
        assert _contains_colour(pixels, colour) > 20, (label, colour)
    run.close()


def test_the_table_has_one_row_per_stroke_with_the_text_tables_numbers(
    browser, demo_page, cli_shots
):
    run = Offline(browser, viewport={"width": 1280, "height": 900})
    page = run.open(demo_page)
    rows = page.locator("table.compare tbody tr")
    assert rows.count() == len(cli_shots)
    labels = [rows.nth(i).get_attribute("data-stroke") for i in range(rows.count())]
    assert labels == [s["inputs"]["label"] for s in cli_shots]
    headers = page.locator("table.compare thead tr").nth(1).locator("th").all_text_contents()
    speed = headers.index("ball speed [km/h]") + 1  # after the stroke column
    for i, shot in enumerate(cli_shots):
        cell = rows.nth(i).locator("td").nth(speed - 1).text_content()
        assert float(cell) == pytest.approx(shot["impact"]["speed_mps"] * KMH_PER_MPS, abs=0.5)
    run.close()


def _panel_numbers(page):
    panel = page.locator(".view3d-panel")
    assert panel.is_visible()
    shown = {}
    for row in panel.locator("tr").all():
        text = row.locator("td").text_content()
        shown[row.get_attribute("data-key")] = None if text == "-" else float(text.split()[0])
    return int(panel.get_attribute("data-shot")), shown


#: Where each tapped number sits in the CLI's JSON record, its factor to the unit shown and
#: half its last digit.
RECORD = {
    "impact_speed_mps": ("impact", "speed_mps", KMH_PER_MPS, 0.5),
    "impact_topspin_rpm": ("impact", "topspin_rpm", 1.0, 0.5),
    "impact_sidespin_rpm": ("impact", "sidespin_rpm", 1.0, 0.5),
    "net_clearance_m": ("net_crossing", "clearance_m", 1.0, 0.005),
    "land_depth_m": ("landing", "depth_m", 1.0, 0.005),
    "bounce_apex_m": ("bounce", "apex_m", 1.0, 0.005),
    "receiver_height_m": ("receiver", "height_m", 1.0, 0.005),
}


def _check_numbers(shown, record):
    assert set(shown) == set(RECORD)
    for key, (block, field, factor, half) in RECORD.items():
        value = (record.get(block) or {}).get(field)
        if value is None:
            assert shown[key] is None, key
        else:
            assert shown[key] == pytest.approx(value * factor, abs=half * 1.0001), key


def test_tapping_a_path_shows_the_numbers_of_the_clis_json(browser, demo_page, cli_shots, tmp_path):
    """Tap every path (side view, where they part) on a touch screen: the panel names a shot
    and its numbers are that shot's in ``rallyarc compare --json``; the lob is told apart."""
    run = Offline(browser, viewport={"width": 1280, "height": 900}, has_touch=True)
    page = run.open(demo_page)
    page.locator("figure.view3d").scroll_into_view_if_needed()
    page.locator('button[data-camera="side"]').click()
    seen = set()
    for i in range(len(cli_shots)):
        point = page.evaluate(
            f"document.querySelector('figure.view3d').rallyarcView.pointOf({i}, 0.3)"
        )
        page.touchscreen.tap(point["x"], point["y"])
        shot, shown = _panel_numbers(page)
        _check_numbers(shown, cli_shots[shot])
        seen.add(shot)
    page.locator("figure.view3d").screenshot(path=str(tmp_path / "desktop_tap.png"))
    lob = [s["inputs"]["label"] for s in cli_shots].index("lob")
    assert lob in seen and len(seen) >= 3
    run.close()


def _touch_drag(page, start, end, steps=8):
    cdp = page.context.new_cdp_session(page)
    (x0, y0), (x1, y1) = start, end

    def touch(kind, x, y):
        points = [] if kind == "touchEnd" else [{"x": x, "y": y, "id": 1}]
        cdp.send("Input.dispatchTouchEvent", {"type": kind, "touchPoints": points})

    touch("touchStart", x0, y0)
    for k in range(1, steps + 1):
        touch("touchMove", x0 + (x1 - x0) * k / steps, y0 + (y1 - y0) * k / steps)
    touch("touchEnd", x1, y1)


def test_on_a_phone_a_one_finger_drag_turns_the_view(browser, demo_page, tmp_path):
    run = Offline(browser, **PHONE)
    page = run.open(demo_page)
    page.screenshot(path=str(tmp_path / "phone_page.png"), full_page=True)
    view = page.locator("figure.view3d canvas")
    view.scroll_into_view_if_needed()
    box = view.bounding_box()
    assert box["width"] <= 390
    assert page.evaluate("document.documentElement.scrollWidth") <= 390  # no sideways scroll
    before = page.evaluate("document.querySelector('figure.view3d').rallyarcView.camera()")
    first = view.screenshot()
    cx, cy = box["x"] + box["width"] / 2, box["y"] + box["height"] / 2
    _touch_drag(page, (cx - 80, cy), (cx + 80, cy + 20))
    after = page.evaluate("document.querySelector('figure.view3d').rallyarcView.camera()")
    second = view.screenshot(path=str(tmp_path / "phone_3d.png"))
    assert np.linalg.norm(np.subtract(after, before)) > 1.0
    assert np.abs(_pixels(first) - _pixels(second)).mean() > 1.0
    assert _pixels(second).std() > 10
    run.close()
