"""The stroke preset taken from a published measured forehand: its swing is the published mean
kinematics, and it plays as its description says."""

import math

import pytest

import rallyarc
from rallyarc import domain
from rallyarc.units import KMH


def test_college_forehand_swings_as_the_published_mean():
    # Kwon et al. (2017), J. Sports Sci. Med. 16:505, abstract: racquet head 15.4 m/s
    # horizontally just before impact, on a path 18.6 deg above the horizontal
    stroke = domain.load_stroke("college_forehand")
    assert math.degrees(stroke.swing_path) == pytest.approx(18.6)
    horizontal = stroke.head_speed * math.cos(stroke.swing_path)
    assert horizontal == pytest.approx(15.4, abs=0.01)
    assert stroke.head_speed / KMH == pytest.approx(58.5)
    # Choppin, Goodwill & Haake (2011), abstract: players aim at the node point, near the
    # string bed's centre (0.52 m from the butt of the standard frame)
    assert stroke.impact_from_butt == pytest.approx(0.52)


def test_college_forehand_lands_about_two_metres_inside_the_baseline():
    shot = rallyarc.play("college_forehand", "demo")
    assert shot.outcome[0] == "in"
    assert 1.0 <= shot.metrics["land_depth_m"][0] <= 3.0
    assert shot.metrics["net_clearance_m"][0] > 0.3
