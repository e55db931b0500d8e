"""A scenario's [[directions]] send its strokes where coaches say: the swing turns, the face
turns with it, and the demo's replies go crosscourt, down the line and inside-out."""

import math

import numpy as np
import pytest

from rallyarc import domain
from rallyarc.errors import InputError
from rallyarc.shot import BallState, play


def test_a_turned_stroke_keeps_the_face_offset_from_the_swing():
    stroke = domain.load_stroke("kick_serve")  # a stroke whose face is offset from the swing
    turned = stroke.turned(math.radians(5.0))
    assert turned.swing_direction == pytest.approx(math.radians(5.0))
    offset = stroke.face_azimuth - stroke.swing_direction
    assert turned.face_azimuth - turned.swing_direction == pytest.approx(offset, abs=1e-15)
    assert turned.face_tilt == stroke.face_tilt and turned.head_speed == stroke.head_speed


def test_the_demo_replies_go_in_three_directions_and_all_land_in():
    sc = domain.load_scenario("demo")
    labels = {s.name: s.label for s in sc.strokes}
    assert "inside-out" in labels["topspin_drive"]
    assert "down the line" in labels["flat_drive"] and "crosscourt" in labels["slice"]
    result = play(sc.strokes, sc.conditions, BallState.of(*domain.incoming_state(sc.incoming)))
    m = result.metrics
    assert list(m["outcome"]) == ["in"] * len(sc.strokes)
    y = m["land_y_m"]
    # from the backhand half (y > 0): down the line lands on the same side, inside-out and
    # crosscourt on the other; the landings spread across most of the singles court
    assert y[0] > 1.0 and y[4] > 1.0 and y[1] < -1.0 and y[3] < -1.0
    assert np.ptp(y) > 4.0


def test_a_direction_for_a_stroke_the_scenario_does_not_play_is_refused(tmp_path):
    text = (
        "name = 'x'\nsource = 'test'\ndescription = 'x'\nplayer = 'x'\nclub = 'x'\n"
        "ball = 'itf_type2'\nracket = 'standard'\nair = 'sea_level'\nsurface = 'hard_medium'\n"
        "strokes = ['flat_drive']\n"
        "[incoming]\nposition_m = [-12.3, 0.0, 0.95]\nspeed_kmh = 75.0\ndescent_deg = 12.0\n"
        "[[directions]]\nstroke = 'lob'\nwhere = 'crosscourt'\nswing_direction_deg = 5.0\n"
    )
    path = tmp_path / "s.toml"
    path.write_text(text, encoding="utf-8")
    with pytest.raises(InputError, match="directions.*'lob'.*flat_drive"):
        domain.load_scenario(str(path))
    path.write_text(text.replace("'crosscourt'", "'sideways'"), encoding="utf-8")
    with pytest.raises(InputError, match="where"):
        domain.load_scenario(str(path))
