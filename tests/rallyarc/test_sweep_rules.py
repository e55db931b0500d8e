"""Varying a stroke: swing overrides turn the face with the swing, window axes pair one family,
and a stroke's own values are those the chain uses."""

import math

import numpy as np
import pytest

from rallyarc import domain, sweep
from rallyarc.shot import BallState
from rallyarc.sweep import own_value, with_swing
from rallyarc.window import check_window_axes


def test_a_new_swing_direction_keeps_the_face_offset():
    stroke = domain.load_stroke("topspin_drive")
    turned = with_swing(stroke, swing_direction=math.radians(5.0), face_tilt=0.01)
    offset = stroke.face_azimuth - stroke.swing_direction
    assert turned.face_azimuth - turned.swing_direction == pytest.approx(offset, abs=1e-15)
    assert turned.face_tilt == 0.01 and turned.head_speed == stroke.head_speed
    assert with_swing(stroke, head_speed=20.0).face_azimuth == stroke.face_azimuth
    with pytest.raises(ValueError, match="face_azimuth"):
        with_swing(stroke, face_azimuth=0.1)


@pytest.mark.parametrize(
    "x, y, ok",
    [
        ("face_tilt", "swing_path", True),
        ("launch_angle", "launch_speed", True),
        ("launch_angle", "launch_angle", False),
        ("launch_angle", "head_speed", False),
        ("incoming_speed", "incoming_spin", False),
    ],
)
def test_window_axes_are_two_parameters_of_one_family(x, y, ok):
    if ok:
        assert [p.name for p in check_window_axes(x, y)] == [x, y]
    else:
        with pytest.raises(ValueError, match="two different swing parameters"):
            check_window_axes(x, y)


def test_own_values_of_a_groundstroke():
    sc = domain.load_scenario("demo")
    stroke = sc.strokes[0]
    incoming = BallState.of(*domain.incoming_state(sc.incoming))
    assert own_value(stroke, "face_tilt", sc.conditions, incoming) == stroke.face_tilt
    speed = own_value(stroke, "incoming_speed", sc.conditions, incoming)
    assert speed == pytest.approx(np.linalg.norm(incoming.velocity[0]))
    launch = sweep.Launch.from_stroke(stroke, sc.conditions, incoming)
    assert own_value(stroke, "launch_spin", sc.conditions, incoming) == launch.topspin
    with pytest.raises(ValueError, match="serve has no incoming ball"):
        own_value(stroke, "incoming_spin", sc.conditions, None)
