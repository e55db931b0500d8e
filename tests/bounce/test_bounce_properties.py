"""Physics invariants of the bounce over random 3D balls (hypothesis and seeded batches)."""

import numpy as np
from hypothesis import given, settings
from hypothesis import strategies as st
from hypothesis.extra import numpy as hnp

from rallyarc.bounce.ball import kinetic_energy_per_unit_mass
from rallyarc.bounce.contact import Surface, bounce

_finite = {"allow_nan": False, "allow_infinity": False}


@st.composite
def ball_batches(draw):
    n = draw(st.integers(min_value=1, max_value=200))
    velocity = draw(hnp.arrays(np.float64, (n, 3), elements=st.floats(-70.0, 70.0, **_finite)))
    # spin about any axis, sidespin included, up to about 6000 rpm
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


def _energy_never_increases(velocity, spin, radius, alpha, surface):
    result = bounce(velocity, spin, radius, alpha, surface)
    before = kinetic_energy_per_unit_mass(velocity, spin, radius, alpha)
    after = kinetic_energy_per_unit_mass(result.velocity, result.spin, radius, alpha)
    # rounding slack only: 1e-12 of the energy scale
    assert np.all(after <= before + 1e-12 * np.maximum(before, 1.0)), np.max(after - before)
    return result


@settings(max_examples=150, deadline=None)
@given(batch=ball_batches(), surface=surfaces)
def test_energy_never_increases_hypothesis(batch, surface):
    velocity, spin, radius, alpha = batch
    result = _energy_never_increases(velocity, spin, radius, alpha, surface)
    # Coulomb bound and impulse signs hold for every ball
    assert np.all(result.normal_impulse >= 0.0)
    assert np.all(result.tangential_impulse >= 0.0)
    assert np.all(result.tangential_impulse <= result.friction_limit * (1 + 1e-15))
    # spin about the vertical is never changed by the contact
    np.testing.assert_array_equal(result.spin[:, 2], spin[:, 2])


def test_energy_never_increases_seeded_batches():
    rng = np.random.default_rng(1984)
    for _ in range(40):  # 40 random surfaces x 2500 balls
        surface = Surface(
            friction=rng.uniform(0.0, 2.0),
            restitution=rng.uniform(0.0, 1.0),
            tangential_restitution=rng.uniform(0.0, 1.0),
        )
        n = 2500
        velocity = rng.normal(0.0, 25.0, (n, 3))
        velocity[:, 2] = -np.abs(velocity[:, 2])
        axis = rng.normal(size=(n, 3))
        axis /= np.linalg.norm(axis, axis=-1, keepdims=True)
        spin = axis * rng.uniform(0.0, 600.0, (n, 1))
        radius = rng.uniform(0.03, 0.037, n)
        alpha = rng.uniform(0.4, 2.0 / 3.0, n)
        _energy_never_increases(velocity, spin, radius, alpha, surface)


def test_energy_loss_of_a_sliding_or_gripping_bounce_is_the_contact_work():
    # Per unit mass, the tangential loss equals J times the mean of the slip before and after
    # along the slip direction; the normal loss is (1 - e^2) v_z^2 / 2.
    rng = np.random.default_rng(2)
    velocity = rng.normal(0.0, 20.0, (4000, 3))
    velocity[:, 2] = -np.abs(velocity[:, 2]) - 0.1
    spin = rng.normal(0.0, 250.0, (4000, 3))
    surface = Surface(0.5, 0.7, tangential_restitution=0.3)
    result = bounce(velocity, spin, 0.0335, 0.55, surface)
    before = kinetic_energy_per_unit_mass(velocity, spin, 0.0335, 0.55)
    after = kinetic_energy_per_unit_mass(result.velocity, result.spin, 0.0335, 0.55)
    u_hat = result.slip_in / np.linalg.norm(result.slip_in, axis=-1, keepdims=True)
    mean_slip = 0.5 * np.sum((result.slip_in + result.slip_out) * u_hat, axis=-1)
    normal_loss = 0.5 * (1.0 - 0.7**2) * velocity[:, 2] ** 2
    expected = normal_loss + result.tangential_impulse * mean_slip
    np.testing.assert_allclose(before - after, expected, rtol=1e-9, atol=1e-9)
    assert result.grip.any() and (~result.grip).any()


@settings(max_examples=60, deadline=None)
@given(
    batch=ball_batches(),
    surface=surfaces,
    angle=st.floats(-np.pi, np.pi, **_finite),
)
def test_rotation_about_vertical_commutes_with_bounce(batch, surface, angle):
    velocity, spin, radius, alpha = batch
    c, s = np.cos(angle), np.sin(angle)
    rot = np.array([[c, -s, 0.0], [s, c, 0.0], [0.0, 0.0, 1.0]])
    base = bounce(velocity, spin, radius, alpha, surface)
    turned = bounce(velocity @ rot.T, spin @ rot.T, radius, alpha, surface)
    scale_v = 1e-9 * (1.0 + np.abs(velocity).max())
    scale_w = 1e-9 * (1.0 + np.abs(spin).max() + np.abs(velocity).max() / (alpha * radius))
    np.testing.assert_allclose(turned.velocity, base.velocity @ rot.T, atol=scale_v)
    np.testing.assert_allclose(turned.spin, base.spin @ rot.T, atol=scale_w)
