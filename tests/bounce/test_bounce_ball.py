"""Tests of bounce.ball: moment-of-inertia ratio helpers and ball kinetic energy."""

import doctest

import numpy as np
import pytest

import rallyarc.bounce.ball
from rallyarc.bounce.ball import (
    MAX_ALPHA,
    SOLID_SPHERE_ALPHA,
    THIN_SHELL_ALPHA,
    alpha_from_moment_of_inertia,
    kinetic_energy_per_unit_mass,
    thick_shell_alpha,
)


def test_thick_shell_alpha_solid_sphere_limit():
    # Cross 2002 (doi:10.1119/1.1507792), thick shell with x = 0 is a solid sphere: 2/5.
    assert thick_shell_alpha(0.0, 0.0335) == pytest.approx(0.4, abs=1e-15)
    assert SOLID_SPHERE_ALPHA == 0.4


def test_thick_shell_alpha_thin_shell_limit_at_and_near_one():
    # Cross 2002 (doi:10.1119/1.1507792): thin shell alpha = 2/3; x == 1 uses the limit.
    assert thick_shell_alpha(0.0335, 0.0335) == pytest.approx(2.0 / 3.0, abs=1e-15)
    assert THIN_SHELL_ALPHA == MAX_ALPHA == pytest.approx(2.0 / 3.0, abs=1e-15)
    # Continuity just below the limit (alpha rises to 2/3 from below); slack 1e-8.
    near = thick_shell_alpha(1.0 - 1e-9, 1.0)
    assert near == pytest.approx(2.0 / 3.0, abs=1e-8)
    assert near < 2.0 / 3.0


def test_thick_shell_alpha_half_radius_by_hand():
    # By hand: x = 1/2, (1 - 1/32) / (1 - 1/8) = (31/32) / (7/8) = 31/28, alpha = 0.4 * 31/28
    # = 31/70 = 0.442857142857...
    assert thick_shell_alpha(0.5, 1.0) == pytest.approx(31.0 / 70.0, rel=1e-14)
    # Same ratio with SI radii of a ball: scale invariance.
    assert thick_shell_alpha(0.01675, 0.0335) == pytest.approx(31.0 / 70.0, rel=1e-14)


def test_thick_shell_alpha_matches_direct_formula_and_is_monotonic():
    x = np.linspace(0.0, 0.99, 200)
    direct = 0.4 * (1.0 - x**5) / (1.0 - x**3)
    alpha = thick_shell_alpha(x, 1.0)
    np.testing.assert_allclose(alpha, direct, rtol=1e-12)
    assert np.all(np.diff(alpha) > 0.0)
    assert np.all((alpha >= 0.4) & (alpha < 2.0 / 3.0))


def test_thick_shell_alpha_scalar_list_array():
    assert isinstance(thick_shell_alpha(0.5, 1.0), float)
    from_list = thick_shell_alpha([0.0, 0.5, 1.0], [1.0, 1.0, 1.0])
    np.testing.assert_allclose(from_list, [0.4, 31.0 / 70.0, 2.0 / 3.0], rtol=1e-14)
    many = thick_shell_alpha(np.full(1000, 0.0303), 0.0335)
    assert many.shape == (1000,)
    assert np.all(many == many[0])


@pytest.mark.parametrize(
    ("inner", "outer", "message"),
    [
        (0.01, 0.0, "outer_radius"),
        (0.01, -0.03, "outer_radius"),
        (-0.001, 0.03, "inner_radius"),
        (0.04, 0.03, "inner_radius must be <= outer_radius"),
        (np.nan, 0.03, "inner_radius"),
        ("thick", 0.03, "inner_radius"),
    ],
)
def test_thick_shell_alpha_validation(inner, outer, message):
    with pytest.raises(ValueError, match=message):
        thick_shell_alpha(inner, outer)


def test_alpha_from_moment_of_inertia_solid_sphere_and_bounds():
    m, r = 0.057, 0.0335
    assert alpha_from_moment_of_inertia(0.4 * m * r**2, m, r) == pytest.approx(0.4, rel=1e-14)
    np.testing.assert_allclose(
        alpha_from_moment_of_inertia([0.4 * m * r**2, 0.55 * m * r**2], m, r),
        [0.4, 0.55],
        rtol=1e-14,
    )
    with pytest.raises(ValueError, match="2/3"):
        alpha_from_moment_of_inertia(0.7 * m * r**2, m, r)
    with pytest.raises(ValueError, match="mass"):
        alpha_from_moment_of_inertia(1e-5, 0.0, r)
    with pytest.raises(ValueError, match="moment_of_inertia"):
        alpha_from_moment_of_inertia(-1e-5, m, r)
    with pytest.raises(ValueError, match="radius"):
        alpha_from_moment_of_inertia(1e-5, m, 0.0)


def test_kinetic_energy_per_unit_mass_by_hand():
    # By hand: 0.5 * (9 + 16) + 0.5 * 0.5 * 0.03**2 * 100**2 = 12.5 + 2.25 = 14.75 J/kg.
    energy = kinetic_energy_per_unit_mass([3.0, 4.0, 0.0], [0.0, 0.0, 100.0], 0.03, 0.5)
    assert energy == pytest.approx(14.75, rel=1e-14)
    batch = kinetic_energy_per_unit_mass(
        np.tile([3.0, 4.0, 0.0], (5, 1)), np.tile([0.0, 100.0, 0.0], (5, 1)), 0.03, 0.5
    )
    np.testing.assert_allclose(batch, np.full(5, 14.75), rtol=1e-14)
    with pytest.raises(ValueError, match="velocity"):
        kinetic_energy_per_unit_mass([3.0, 4.0], [0.0, 0.0, 1.0], 0.03, 0.5)


def test_ball_docstring_examples():
    failures, _ = doctest.testmod(rallyarc.bounce.ball, verbose=False)
    assert failures == 0
