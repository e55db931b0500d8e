"""Bounce stage checks against the published slide-or-grip model (Cross 2002, 2005)."""

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from rallyarc.bounce.ball import thick_shell_alpha
from rallyarc.bounce.contact import Surface, bounce, critical_angle

R = 0.0335


def energy(v, w, alpha):
    """Kinetic energy per unit mass, translation plus rotation with I = alpha m r^2."""
    return 0.5 * (v**2).sum(axis=1) + 0.5 * alpha * R**2 * (w**2).sum(axis=1)


@settings(max_examples=60)
@given(seed=st.integers(0, 2**31), mu=st.floats(0, 2), e=st.floats(0, 1), e_t=st.floats(0, 1))
def test_bounce_never_adds_energy(seed, mu, e, e_t):
    # a friction-only contact with e, e_t <= 1 cannot add energy (Cross 2005, Am. J. Phys. 73:914)
    rng = np.random.default_rng(seed)
    n = 2000
    v = rng.normal(0, 15, (n, 3))
    v[:, 2] = -np.abs(v[:, 2]) - 0.1
    w = rng.normal(0, 300, (n, 3))  # spin about any axis, sidespin included
    res = bounce(v, w, R, 0.55, Surface(friction=mu, restitution=e, tangential_restitution=e_t))
    assert np.all(energy(res.velocity, res.spin, 0.55) <= energy(v, w, 0.55) * (1 + 1e-12) + 1e-12)


@pytest.mark.parametrize("mu, e", [(0.3, 0.8), (0.6, 0.8), (0.8, 0.85), (1.2, 0.7)])
def test_spin_free_ball_slides_below_and_grips_above_the_critical_angle(mu, e):
    # Cross 2002: tan(theta_c) = alpha / ((1 + alpha) mu (1 + e)) for a ball without spin
    theta_c = float(critical_angle(mu, e, 0.55))
    assert np.tan(theta_c) == pytest.approx(0.55 / (1.55 * mu * (1 + e)), rel=1e-12)
    angles = np.array([theta_c * 0.97, theta_c * 1.03])
    v = np.stack([20 * np.cos(angles), np.zeros(2), -20 * np.sin(angles)], axis=1)
    res = bounce(v, np.zeros((2, 3)), R, 0.55, Surface(friction=mu, restitution=e))
    assert list(res.grip) == [False, True]


def test_thick_shell_alpha_limits_and_a_mid_value():
    # solid sphere 2/5 and thin shell 2/3 (rigid-body moments of inertia, handbook values)
    assert thick_shell_alpha(0.0, R) == pytest.approx(0.4)
    assert thick_shell_alpha(R * (1 - 1e-9), R) == pytest.approx(2 / 3, rel=1e-6)
    x = 0.8  # 0.4 (1 - x^5) / (1 - x^3) by hand: 0.4 * 0.67232 / 0.488 = 0.551082
    assert thick_shell_alpha(x * R, R) == pytest.approx(0.551082, rel=1e-5)
