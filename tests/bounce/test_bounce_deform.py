"""The bounce of a compressing ball (rallyarc.bounce.deform): its rigid limit against the
published worked values, the pace-test impact, and energy never increasing."""

import math

import numpy as np
from hypothesis import given, settings
from hypothesis import strategies as st
from hypothesis.extra import numpy as hnp

from rallyarc.bounce.ball import kinetic_energy_per_unit_mass
from rallyarc.bounce.contact import Surface, bounce
from rallyarc.bounce.deform import DEFAULT_BALL_STIFFNESS_N_PER_M, bounce_deforming, lever_ratio

MASS = 0.0577
_finite = {"allow_nan": False, "allow_infinity": False}


@st.composite
def ball_batches(draw):
    n = draw(st.integers(min_value=1, max_value=200))
    velocity = draw(hnp.arrays(np.float64, (n, 3), elements=st.floats(-70.0, 70.0, **_finite)))
    spin = draw(hnp.arrays(np.float64, (n, 3), elements=st.floats(-650.0, 650.0, **_finite)))
    radius = draw(st.floats(0.02, 0.045, **_finite))
    alpha = draw(st.floats(0.05, 2.0 / 3.0, **_finite))
    return velocity, spin, radius, alpha


surfaces = st.builds(
    Surface,
    friction=st.floats(0.0, 2.0, **_finite),
    restitution=st.floats(0.0, 1.0, **_finite),
    restitution_slope_s_per_m=st.floats(-0.05, 0.05, **_finite),
    tangential_restitution=st.floats(0.0, 1.0, **_finite),
)


def test_rigid_limit_reproduces_the_worked_grip_bounce():
    # Brody 1984 / Cross 2002 grip case: v = (15, -15) m/s, no spin, mu 0.6, e 0.8,
    # alpha 0.55, r 0.0335 m -> v_x2 = 9.6774, v_z2 = 12.0, w_2 = 288.88 rad/s
    res = bounce_deforming(
        [15.0, 0.0, -15.0], np.zeros(3), 0.0335, 0.55, Surface(0.6, 0.8), MASS, stiffness=math.inf
    )
    np.testing.assert_allclose(res.velocity, [9.6774, 0.0, 12.0], atol=1e-4)
    np.testing.assert_allclose(res.spin[1], 288.88, atol=1e-2)


def test_sliding_pace_test_impact_keeps_the_standards_velocities():
    # ITF CS 01/02 geometry, 30 m/s at 16 deg, mu 0.6, e 0.8, sliding throughout:
    # v_x2 = 19.907, v_z2 = 6.615 (rigid worked value); a compressing ball slides the same way
    th = math.radians(16.0)
    v = [30.0 * math.cos(th), 0.0, -30.0 * math.sin(th)]
    res = bounce_deforming(v, np.zeros(3), 0.0335, 0.55, Surface(0.6, 0.8), MASS)
    assert not res.grip
    np.testing.assert_allclose(res.velocity[[0, 2]], [19.907, 6.615], atol=1e-3)
    rigid = bounce(v, np.zeros(3), 0.0335, 0.55, Surface(0.6, 0.8))
    q = lever_ratio(30.0 * math.sin(th), 0.0335, MASS)
    np.testing.assert_allclose(res.spin[1], q * rigid.spin[1], rtol=1e-12)


def test_stiffness_from_the_itf_deformation_test():
    # ITF Rules of Tennis, Appendix I: 18 lb (8.165 kg) load, forward deformation 0.56-0.74 cm
    assert 8.165 * 9.80665 / 0.0074 <= DEFAULT_BALL_STIFFNESS_N_PER_M <= 8.165 * 9.80665 / 0.0056


def test_lever_ratio_scalar_list_and_array():
    assert lever_ratio(0.0, 0.0335, MASS) == 1.0
    assert lever_ratio([0.0, 5.0], 0.0335, MASS).shape == (2,)
    q = lever_ratio(np.linspace(0.0, 30.0, 301), 0.0335, MASS)
    assert np.all(np.diff(q) <= 0.0) and np.all((q > 0.0) & (q <= 1.0))


@settings(max_examples=150, deadline=None)
@given(batch=ball_batches(), surface=surfaces, stiffness=st.floats(2e3, 1e6))
def test_energy_never_increases(batch, surface, stiffness):
    velocity, spin, radius, alpha = batch
    res = bounce_deforming(velocity, spin, radius, alpha, surface, MASS, stiffness)
    before = kinetic_energy_per_unit_mass(velocity, spin, radius, alpha)
    after = kinetic_energy_per_unit_mass(res.velocity, res.spin, radius, alpha)
    assert np.all(after <= before + 1e-12 * np.maximum(before, 1.0)), np.max(after - before)
    assert np.all(res.tangential_impulse <= res.friction_limit * (1 + 1e-15))
    np.testing.assert_array_equal(res.spin[:, 2], spin[:, 2])
