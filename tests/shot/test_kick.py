"""Kick in the coach's sense: how steeply and how high the ball rises after the bounce, and the
sideways jump (the change of heading at the bounce)."""

import numpy as np
import pytest

from rallyarc import domain
from rallyarc.shot import METRICS, BallState, launch, play
from rallyarc.units import KMH, RPM


def test_the_kick_serve_reads_the_highest_kick_of_the_three_serves():
    sc = domain.load_scenario("serve_demo")
    result = play(sc.strokes, sc.conditions, record=False)
    m = result.metrics
    kick = list(result.labels).index("kick_serve")
    assert np.argmax(m["bounce_angle_out_deg"]) == kick
    assert np.argmax(m["bounce_apex_m"]) == kick
    assert np.isfinite(m["bounce_heading_change_deg"]).all()


def test_no_metric_reads_rebound_minus_arrival():
    assert "bounce_kick_deg" not in METRICS
    assert METRICS["bounce_angle_out_deg"].label.startswith("kick")


@pytest.mark.parametrize("sign", [1.0, -1.0])
def test_spin_about_the_travel_direction_jumps_the_ball_sideways(sign):
    # Spin about +x for a ball toward +x moves the bottom of the ball toward +y; the court's
    # friction pushes the ball the other way, to -y (its right).
    sc = domain.load_scenario("demo")
    v = 100 * KMH * np.array([np.cos(np.radians(6)), 0.0, np.sin(np.radians(6))])
    start = BallState.of([-11.0, 0.0, 1.0], v, [sign * 3000 * RPM, 0.0, 0.0])
    m = launch(start, sc.conditions, record=False).metrics
    assert m["outcome"][0] == "in"
    assert np.sign(m["bounce_heading_change_deg"][0]) == -sign
    assert abs(m["bounce_heading_change_deg"][0]) > 1.0


def test_a_ball_without_sidespin_bounces_straight_on():
    sc = domain.load_scenario("demo")
    v = 100 * KMH * np.array([np.cos(np.radians(8)), 0.0, np.sin(np.radians(8))])
    start = BallState.of([-11.0, 0.0, 1.0], v, [0.0, 2000 * RPM, 0.0])
    m = launch(start, sc.conditions, record=False).metrics
    assert m["outcome"][0] == "in"
    assert m["bounce_heading_change_deg"][0] == pytest.approx(0.0, abs=1e-6)
