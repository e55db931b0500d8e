"""The report page and the 3D page as files: self-contained, within their size limits, every
number finite or null, the tap numbers the CLI's JSON, the paths the recorded ones."""

from __future__ import annotations

import html
import json
import re

import numpy as np
import pytest
from click.testing import CliRunner

from rallyarc.cli import main
from rallyarc.drill import SAFETY as DRILL_SAFETY
from rallyarc.shot import play
from rallyarc.viz import webview

MB = 1_000_000


def _run(*args):
    result = CliRunner().invoke(main, [str(a) for a in args])
    assert result.exit_code == 0, result.output
    return result.output


def _data(text):
    """The 3D view's data of a page, parsed strictly: NaN or Infinity would fail."""
    block = re.search(r'<script type="application/json" class="view3d-data">(.*?)</script>', text)

    def refuse(name):
        raise AssertionError(f"{name} in the page's data")

    return json.loads(block.group(1).replace("<\\/", "</"), parse_constant=refuse)


@pytest.fixture(scope="module")
def pages(tmp_path_factory):
    folder = tmp_path_factory.mktemp("pages")
    out = {}
    for name, args in {
        "report": ("report", "demo"),
        "report40": ("report", "demo", "--scatter", "40", "--no-studies"),
        "scene": ("scene", "demo", "--out", folder / "s.png", "--export"),
        "scene40": ("scene", "demo", "--scatter", "40", "--out", folder / "s40.png", "--export"),
    }.items():
        path = folder / f"{name}.html"
        _run(*args, *(["-o"] if name.startswith("report") else []), path)
        out[name] = path
    return out


@pytest.mark.parametrize(
    "name, limit",
    [("report", 2 * MB), ("scene", 2 * MB), ("report40", 5 * MB), ("scene40", 5 * MB)],
)
def test_pages_stay_within_their_size_limits(pages, name, limit):
    assert pages[name].stat().st_size <= limit


@pytest.mark.parametrize("name", ["report", "scene", "report40"])
def test_pages_fetch_nothing_and_hold_only_finite_numbers(pages, name):
    text = pages[name].read_text(encoding="utf-8")
    assert not re.search(r"""(?:src|href)\s*=\s*["']?(?:https?:)?//""", text)
    assert "@import" not in text
    assert "<link" not in text
    data = _data(text)
    assert data["three"] == webview.THREE_VERSION
    shots = 240 if name.endswith("40") else 6
    assert len(data["shots"]) == shots


def test_the_tap_numbers_are_the_clis_json_values(pages):
    data = _data(pages["report"].read_text(encoding="utf-8"))
    shots = json.loads(_run("compare", "demo", "--json"))["shots"]
    fields = {
        "impact_speed_mps": ("impact", "speed_mps"),
        "impact_topspin_rpm": ("impact", "topspin_rpm"),
        "impact_sidespin_rpm": ("impact", "sidespin_rpm"),
        "net_clearance_m": ("net_crossing", "clearance_m"),
        "land_depth_m": ("landing", "depth_m"),
        "bounce_apex_m": ("bounce", "apex_m"),
        "receiver_height_m": ("receiver", "height_m"),
    }
    for page_shot, record in zip(data["shots"], shots, strict=True):
        assert page_shot["label"] == record["inputs"]["label"].replace("_", " ")
        for number in page_shot["numbers"]:
            block, field = fields[number["key"]]
            expected = (record[block] or {}).get(field)
            assert number["value"] == expected
            assert (number["text"] == "-") == (expected is None)


def test_a_missing_number_is_null_on_the_page_and_shown_as_a_dash():
    record = {"impact": {"speed_mps": float("nan")}, "net_crossing": None, "receiver": {}}
    numbers = {n["key"]: n for n in webview.tap_numbers(record)}
    assert numbers["impact_speed_mps"]["value"] is None
    assert numbers["impact_speed_mps"]["text"] == "-"
    assert numbers["net_clearance_m"]["text"] == "-"


def test_the_paths_are_the_recorded_ones_to_the_millimetre(demo_result):
    data = webview.scene_data(demo_result)
    for shot in data["shots"]:
        _, pos, _ = demo_result.path(shot["index"], dt=0.005)
        assert np.abs(webview.decode(shot["path"]) - pos).max() <= 0.0005 + 1e-9


def test_each_stroke_has_its_palette_colour(demo_result):
    from rallyarc.viz import palette

    data = webview.scene_data(demo_result)
    assert [c for _, c in data["legend"]] == list(palette.VARIANT_HEX[:6])
    assert data["court"]["colours"] == palette.COURT_HEX


def test_a_drill_adds_its_sheet_and_the_safety_caution(tmp_path):
    path = tmp_path / "r.html"
    _run("report", "demo", "--drill", "demo_drill", "--no-studies", "-o", path)
    text = path.read_text(encoding="utf-8")
    assert 'id="drill"' in text
    assert html.escape(DRILL_SAFETY) in text


def test_the_feed_caution_stands_by_the_incoming_ball(pages):
    from rallyarc.feed import SAFETY

    text = pages["report"].read_text(encoding="utf-8")
    assert html.escape(SAFETY) in text and "qualified coaching practice" in text


@pytest.mark.parametrize(
    "args, words",
    [
        (("report", "-o", "r.pdf"), "--out: r.pdf must end in .html"),
        (("report", "--drill", "no_such_drill", "-o", "r.html"), "--drill:"),
    ],
)
def test_bad_report_options_give_one_line_errors(tmp_path, monkeypatch, args, words):
    monkeypatch.chdir(tmp_path)
    result = CliRunner().invoke(main, list(args))
    assert result.exit_code == 2
    assert words in result.output
    assert "Traceback" not in result.output


def test_an_existing_page_is_kept_without_force(tmp_path):
    path = tmp_path / "r.html"
    path.write_text("mine")
    result = CliRunner().invoke(main, ["report", "-o", str(path)])
    assert result.exit_code == 2
    assert path.read_text() == "mine"


@pytest.fixture(scope="module")
def demo_result():
    from rallyarc import domain
    from rallyarc.shot import BallState

    sc = domain.load_scenario("demo")
    return play(sc.strokes, sc.conditions, BallState.of(*domain.incoming_state(sc.incoming)))


def test_the_story_names_the_bounce_and_string_models(pages):
    # the page says which physics it was played with: the defaults, or the modes asked for
    import dataclasses

    from rallyarc import domain
    from rallyarc.viz.report import story_html

    text = pages["report"].read_text(encoding="utf-8")
    assert "deforming ball" in text and "friction and spring-back" in text
    assert "rigid ball" not in text
    sc = domain.load_scenario("demo")
    other = dataclasses.replace(
        sc, conditions=dataclasses.replace(sc.conditions, deforming_ball=False, friction_only=True)
    )
    story = story_html(other)
    assert "rigid ball" in story and "friction alone" in story
    assert "deforming ball" not in story
