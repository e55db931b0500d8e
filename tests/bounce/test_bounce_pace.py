"""Tests of bounce.pace: the ITF CS 01/02 court pace rating, formula and simulated test."""

import doctest
import math

import numpy as np
import pytest

import rallyarc.bounce.pace
from rallyarc.bounce.contact import DEFAULT_REFERENCE_SPEED_MPS, Surface, normal_restitution
from rallyarc.bounce.pace import (
    CATEGORY_NAMES,
    PACE_TEST_ANGLE_RAD,
    PACE_TEST_MAX_SPIN_RAD_S,
    PACE_TEST_SPEED_MPS,
    PaceRating,
    court_pace_rating,
    pace_category,
    rate_surface,
)

# --- formula -------------------------------------------------------------------------------


def test_cpr_worked_mu_06_e_080():
    cpr = court_pace_rating(0.6, 0.80)
    assert cpr == pytest.approx(41.5, abs=1e-9)  # ITF CS 01/02 worked value, REFERENCES.md
    assert pace_category(cpr) == 4  # ITF CS 01/02: 40-44 medium-fast


def test_cpr_worked_mu_05_e_080():
    cpr = court_pace_rating(0.5, 0.80)
    assert cpr == pytest.approx(51.5, abs=1e-9)  # ITF CS 01/02 worked value, REFERENCES.md
    assert pace_category(cpr) == 5  # ITF CS 01/02: 45 and up fast


def test_temperature_correction_sign_and_size():
    # ITF CS 01/02: e_T = e + 0.003 (23 - T). At 33 C, e_T = 0.80 - 0.03 -> CPR + 4.5;
    # at 13 C, e_T = 0.80 + 0.03 -> CPR - 4.5.
    assert court_pace_rating(0.6, 0.80, 33.0) == pytest.approx(46.0, abs=1e-9)
    assert court_pace_rating(0.6, 0.80, 13.0) == pytest.approx(37.0, abs=1e-9)
    assert court_pace_rating(0.6, 0.80, 23.0) == pytest.approx(41.5, abs=1e-9)
    warm = court_pace_rating(0.6, 0.80, np.array([20.0, 25.0, 30.0]))
    assert np.all(np.diff(warm) > 0.0)  # warmer test -> lower corrected e -> higher CPR


def test_cpr_is_vectorized_and_decreasing_in_friction_and_restitution():
    mu = np.linspace(0.3, 0.9, 7)
    cpr = court_pace_rating(mu, 0.8)
    assert cpr.shape == (7,)
    np.testing.assert_allclose(np.diff(cpr), -10.0, rtol=1e-9)  # 100 per unit of mu, step 0.1
    by_e = court_pace_rating(0.6, [0.7, 0.8, 0.9])
    np.testing.assert_allclose(np.diff(by_e), -15.0, rtol=1e-9)  # 150 per unit of e, step 0.1


@pytest.mark.parametrize(
    ("args", "message"),
    [
        ((0.6, 0.8, -10.5), "temperature_c"),
        ((0.6, 0.8, 50.5), "temperature_c"),
        ((0.6, 0.8, float("nan")), "temperature_c"),
        ((-0.1, 0.8, 23.0), "measured_friction"),
        ((0.6, 1.1, 23.0), "measured_restitution"),
    ],
)
def test_court_pace_rating_validation(args, message):
    with pytest.raises(ValueError, match=message):
        court_pace_rating(*args)


def test_temperature_range_ends_are_accepted():
    assert court_pace_rating(0.6, 0.8, -10.0) == pytest.approx(41.5 - 0.45 * 33, abs=1e-9)
    assert court_pace_rating(0.6, 0.8, 50.0) == pytest.approx(41.5 + 0.45 * 27, abs=1e-9)


# --- categories ----------------------------------------------------------------------------


@pytest.mark.parametrize(
    ("cpr", "category"),
    [
        (-5.0, 1),
        (0.0, 1),
        (29.9, 1),  # ITF CS 01/02: 0-29 slow
        (30.0, 2),  # ITF CS 01/02: 30-34 medium-slow
        (34.9, 2),
        (35.0, 3),  # ITF CS 01/02: 35-39 medium
        (39.9, 3),
        (40.0, 4),  # ITF CS 01/02: 40-44 medium-fast
        (44.9, 4),
        (45.0, 5),  # ITF CS 01/02: 45 and up fast
        (80.0, 5),
    ],
)
def test_pace_category_boundaries(cpr, category):
    assert pace_category(cpr) == category
    assert isinstance(pace_category(cpr), int)


def test_pace_category_vectorized_and_names():
    categories = pace_category(np.array([[10.0, 32.0, 37.0], [42.0, 47.0, 45.0]]))
    np.testing.assert_array_equal(categories, [[1, 2, 3], [4, 5, 5]])
    assert categories.dtype.kind == "i"
    np.testing.assert_array_equal(pace_category([29.9, 30.0]), [1, 2])
    assert CATEGORY_NAMES == {
        1: "slow",
        2: "medium-slow",
        3: "medium",
        4: "medium-fast",
        5: "fast",
    }  # ITF CS 01/02 category names


def test_pace_category_is_not_moved_by_float_rounding_on_a_bound():
    # 100 (1 - 0.55) + 150 (0.81 - 0.81) is exactly 45 but evaluates to 44.99999999999999.
    cpr = court_pace_rating(0.55, 0.81)
    assert cpr != 45.0 and cpr == pytest.approx(45.0, abs=1e-12)
    assert pace_category(cpr) == 5
    assert pace_category(45.0 - 1e-6) == 4  # a real difference still counts


def test_pace_category_rejects_nan():
    with pytest.raises(ValueError, match="court_pace_rating"):
        pace_category(float("nan"))


# --- simulated test ------------------------------------------------------------------------


def test_pace_test_constants():
    assert PACE_TEST_SPEED_MPS == 30.0  # ITF CS 01/02: 30 m/s
    assert math.degrees(PACE_TEST_ANGLE_RAD) == pytest.approx(16.0, abs=1e-12)  # ITF: 16 deg
    assert PACE_TEST_MAX_SPIN_RAD_S == pytest.approx(18.85, abs=5e-3)  # 3 rev/s = 6 pi rad/s
    assert DEFAULT_REFERENCE_SPEED_MPS == pytest.approx(
        PACE_TEST_SPEED_MPS * math.sin(PACE_TEST_ANGLE_RAD), rel=1e-15
    )


def test_rate_surface_reproduces_mu_and_e_on_a_sliding_surface():
    rating = rate_surface(Surface(friction=0.6, restitution=0.8))
    assert isinstance(rating, PaceRating)
    assert not rating.ball_gripped
    assert rating.note == ""
    assert rating.measured_friction == pytest.approx(0.6, rel=1e-13)  # slides: measures mu
    assert rating.measured_restitution == pytest.approx(0.8, rel=1e-13)  # measures e
    assert rating.court_pace_rating == pytest.approx(41.5, abs=1e-9)  # ITF CS 01/02 worked
    assert rating.category == 4 and rating.category_name == "medium-fast"
    assert rating.surface_friction == 0.6
    assert rating.temperature_c == 23.0
    assert rating.temperature_corrected_restitution == pytest.approx(0.8, rel=1e-13)


def test_rate_surface_worked_fast_surface():
    rating = rate_surface(Surface(friction=0.5, restitution=0.8))
    assert rating.court_pace_rating == pytest.approx(51.5, abs=1e-9)  # ITF CS 01/02 worked
    assert rating.category == 5 and rating.category_name == "fast"


def test_rate_surface_high_friction_grips_and_under_measures_mu():
    rating = rate_surface(Surface(friction=0.9, restitution=0.8))
    assert rating.ball_gripped
    assert rating.measured_friction < 0.9
    # Re-derived: the grip impulse over J_n, alpha cot(16 deg) / ((1 + alpha)(1 + e))
    # = 0.55 * 3.48741 / (1.55 * 1.8) = 0.68748.
    grip_limit = 0.55 / (math.tan(math.radians(16.0)) * 1.55 * 1.8)
    assert rating.measured_friction == pytest.approx(grip_limit, rel=1e-12)
    assert rating.surface_friction == 0.9
    assert "gripped" in rating.note and "below the surface's sliding friction" in rating.note
    assert rating.court_pace_rating == pytest.approx(
        court_pace_rating(rating.measured_friction, 0.8), rel=1e-14
    )


def test_rate_surface_friction_beyond_grip_limit_no_longer_changes_the_rating():
    ratings = [rate_surface(Surface(mu, 0.8)).court_pace_rating for mu in (0.7, 0.9, 1.5)]
    np.testing.assert_allclose(ratings, ratings[0], rtol=1e-14)


def test_rate_surface_spin_option_topspin_grips_backspin_slides():
    # mu 0.68, e 0.8: J_n = 1.8 * 8.2691 = 14.884, mu J_n = 10.121. Slip with no spin 28.838 m/s
    # -> J_grip 10.233 (slides); with 3 rev/s topspin 28.207 m/s -> 10.009 (grips);
    # with 3 rev/s backspin 29.470 m/s -> 10.457 (slides).
    surface = Surface(friction=0.68, restitution=0.8)
    assert not rate_surface(surface).ball_gripped
    assert rate_surface(surface, spin=PACE_TEST_MAX_SPIN_RAD_S).ball_gripped
    back = rate_surface(surface, spin=-PACE_TEST_MAX_SPIN_RAD_S)
    assert not back.ball_gripped
    assert back.measured_friction == pytest.approx(0.68, rel=1e-13)


@pytest.mark.parametrize(
    ("kwargs", "message"),
    [
        ({"temperature_c": -11.0}, "temperature_c"),
        ({"temperature_c": 51.0}, "temperature_c"),
        ({"spin": 19.0}, "spin"),
        ({"spin": -19.0}, "spin"),
        ({"alpha": 0.8}, "alpha"),
        ({"radius": -0.03}, "radius"),
    ],
)
def test_rate_surface_validation(kwargs, message):
    with pytest.raises(ValueError, match=message):
        rate_surface(Surface(0.6, 0.8), **kwargs)


def test_rate_surface_temperature_correction():
    rating = rate_surface(Surface(0.6, 0.8), temperature_c=33.0)
    assert rating.measured_restitution == pytest.approx(0.8, rel=1e-13)
    assert rating.temperature_corrected_restitution == pytest.approx(0.77, rel=1e-13)
    assert rating.court_pace_rating == pytest.approx(46.0, abs=1e-9)  # ITF CS 01/02 correction
    assert rating.category == 5


def test_rate_surface_with_speed_dependent_restitution_measures_e_at_test_speed():
    at_test = Surface(0.6, 0.8, restitution_slope_s_per_m=-0.02)
    assert rate_surface(at_test).measured_restitution == pytest.approx(0.8, rel=1e-13)
    elsewhere = Surface(0.6, 0.8, restitution_slope_s_per_m=-0.02, reference_speed_mps=5.0)
    expected = normal_restitution(elsewhere, 30.0 * math.sin(math.radians(16.0)))
    # 0.8 - 0.02 * (8.2691 - 5) = 0.73462
    assert expected == pytest.approx(0.73462, abs=5e-5)
    assert rate_surface(elsewhere).measured_restitution == pytest.approx(expected, rel=1e-13)


def test_pace_docstring_examples():
    failures, _ = doctest.testmod(rallyarc.bounce.pace, verbose=False)
    assert failures == 0
