"""Python calls that say their units: unit-suffixed swing keywords with the command line's
ranges, names accepted wherever an object is, and light lazy entry points on ``rallyarc``."""

import subprocess
import sys

import numpy as np
import pytest

import rallyarc
from rallyarc import domain
from rallyarc.errors import InputError
from rallyarc.shot import play


def test_unit_keywords_play_what_they_say():
    sc = domain.load_scenario("demo")
    stroke = domain.load_stroke("topspin_drive")
    by_name = play("topspin_drive", "demo", head_speed_kmh=95, face_tilt_deg=2)
    by_object = play([stroke], sc, head_speed_kmh=95, face_tilt_deg=2)
    assert by_name.swing.head_speed[0] == pytest.approx(95 / 3.6)
    assert np.degrees(by_name.swing.face_tilt[0]) == pytest.approx(2.0)
    assert by_name.metrics["land_x_m"][0] == by_object.metrics["land_x_m"][0]
    sweep = play("topspin_drive", "demo", face_tilt_deg=[1.0, 2.0, 3.0])
    assert len(sweep) == 3


@pytest.mark.parametrize(
    ("keywords", "message"),
    [
        ({"face_tilt": np.array([2.0])}, "face_tilt_deg="),  # degrees given as radians
        ({"head_speed": 95}, "head_speed_kmh="),  # km/h given as m/s
        ({"head_speed_kmh": 500}, "3.6 to 252 km/h"),  # the CLI refuses 500 km/h too
        ({"face_tilt_deg": [0.0, 75.0]}, "-60 to 60 deg"),
        ({"speed": 3}, "not a swing keyword"),
        ({"head_speed_kmh": 90, "head_speed_mps": 25}, "given twice"),
    ],
)
def test_out_of_range_or_unknown_keywords_are_refused(keywords, message):
    with pytest.raises(InputError, match=message):
        play("topspin_drive", "demo", **keywords)


def test_a_serve_by_name_needs_no_incoming_ball():
    result = play(["flat_serve", "kick_serve"], "serve_demo", record=False)
    assert list(result.outcome) == ["in", "in"]
    assert len(repr(result)) < 200


def test_feed_ball_takes_coach_units_and_checks_them():
    fed = rallyarc.feed_ball(speed_kmh=90, elevation_deg=8, spin_rpm=1500)
    assert fed.outcome == "in"
    assert fed.record()["inputs"]["speed_kmh"] == pytest.approx(90.0)
    with pytest.raises(InputError, match="elevation_deg"):
        rallyarc.feed_ball(elevation_deg=95)


def test_import_rallyarc_is_light_and_names_its_entry_points():
    code = "import sys, rallyarc; print('numpy' in sys.modules, sorted(rallyarc.__all__))"
    out = subprocess.run(
        [sys.executable, "-P", "-c", code], capture_output=True, text=True, check=True
    )
    assert out.stdout.startswith("False")
    assert rallyarc.__doc__ and "play" in rallyarc.__doc__
    for name in rallyarc.__all__:
        entry = getattr(rallyarc, name)
        assert entry.__doc__, name
    assert rallyarc.play is play
    with pytest.raises(AttributeError):
        rallyarc.no_such_thing  # noqa: B018
