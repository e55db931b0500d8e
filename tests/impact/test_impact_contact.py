"""Tests for impact.contact: the slide-or-grip impulse on a free or clamped racket."""

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from rallyarc.impact.contact import collide, hit
from rallyarc.impact.racket import (
    Racket,
    effective_mass,
    racket_inverse_masses,
    tangential_inverse_mass,
)

M_BALL, R_BALL, ALPHA = 0.057, 0.0335, 0.55
ZERO_K = np.zeros((2, 2))
Z = np.array([0.0, 0.0, 1.0])
X = np.array([1.0, 0.0, 0.0])


def _clamped(v, w, mu, e_n, e_t=0.0, alpha=ALPHA, r=R_BALL):
    """A ball on a rigid, fixed surface with normal +z (long axis +x, so c = +y)."""
    return collide(v, w, [0.0, 0.0, 0.0], Z, X, M_BALL, r, alpha, 0.0, ZERO_K, e_n, mu, e_t)


def _random_impacts(rng, n):
    """N random ball-racket impacts, with the racket's full rigid-body state.

    Returns the keyword arguments of ``collide`` and a dict describing the racket as a rigid
    body (mass, inertia tensor in the court frame, lever arm, CM and angular velocity).
    """
    mass = rng.uniform(0.25, 0.36, n)
    balance = rng.uniform(0.30, 0.36, n)
    i_cm = rng.uniform(0.010, 0.020, n)
    swingweight = i_cm + mass * (balance - 0.10) ** 2
    twistweight = rng.uniform(0.0010, 0.0020, n)
    x_impact = rng.uniform(0.40, 0.66, n)
    offaxis = rng.uniform(-0.05, 0.05, n)

    normal = rng.normal(size=(n, 3))
    normal /= np.linalg.norm(normal, axis=1, keepdims=True)
    axis = np.cross(normal, rng.normal(size=(n, 3)))
    axis /= np.linalg.norm(axis, axis=1, keepdims=True)
    across = np.cross(normal, axis)
    lever = (x_impact - balance)[:, None] * axis + offaxis[:, None] * across

    v_cm = rng.normal(scale=20.0, size=(n, 3))
    omega = rng.normal(scale=20.0, size=(n, 3))
    face_velocity = v_cm + np.cross(omega, lever)
    # The ball comes into the face at 1-60 m/s, with an arbitrary in-plane part and spin.
    tangential = np.cross(normal, rng.normal(scale=20.0, size=(n, 3)))
    ball_velocity = face_velocity - rng.uniform(1.0, 60.0, n)[:, None] * normal + tangential
    ball_spin = rng.normal(scale=400.0, size=(n, 3))

    rotation = np.stack([axis, across, normal], axis=-1)  # columns a, c, n
    body = np.zeros((n, 3, 3))
    body[:, 0, 0] = twistweight
    body[:, 1, 1] = i_cm
    body[:, 2, 2] = i_cm + twistweight
    inertia = rotation @ body @ np.transpose(rotation, (0, 2, 1))

    inv_n = 1.0 / effective_mass(mass, balance, swingweight, x_impact, offaxis, twistweight)
    inv_t = tangential_inverse_mass(mass, balance, swingweight, twistweight, x_impact, offaxis)
    kwargs = dict(
        ball_velocity=ball_velocity,
        ball_spin=ball_spin,
        face_velocity=face_velocity,
        face_normal=normal,
        face_axis=axis,
        ball_mass=rng.uniform(0.050, 0.060, n),
        ball_radius=rng.uniform(0.032, 0.036, n),
        ball_alpha=rng.uniform(0.50, 0.667, n),
        racket_inv_mass_normal=inv_n,
        racket_inv_mass_tangential=inv_t,
    )
    rigid = dict(mass=mass, inertia=inertia, lever=lever, v_cm=v_cm, omega=omega)
    return kwargs, rigid


def _contact_point_slip(kw, res):
    """Outgoing slip of the ball's contact point relative to the face (after contact)."""
    n = kw["face_normal"]
    lever_ball = -kw["ball_radius"][:, None] * n
    rel = (
        res.velocity
        + np.cross(res.spin, lever_ball)
        - (kw["face_velocity"] + res.face_velocity_change)
    )
    return rel - np.einsum("ij,ij->i", rel, n)[:, None] * n


def _incoming_slip(kw):
    n = kw["face_normal"]
    lever_ball = -kw["ball_radius"][:, None] * n
    rel = kw["ball_velocity"] + np.cross(kw["ball_spin"], lever_ball) - kw["face_velocity"]
    return rel - np.einsum("ij,ij->i", rel, n)[:, None] * n


# --- Published worked values -------------------------------------------------------------


def test_brody_cross_head_on_through_collide():
    racket = Racket(0.32, 0.32, 0.032)
    # ball at 20 m/s toward the racket (face normal +x), racket point at 30 m/s along +x
    res = hit(
        [-20.0, 0, 0],
        [0, 0, 0],
        [30.0, 0, 0],
        X,
        [0, 1.0, 0],
        racket,
        0.52,
        0.0,
        0.057,
        R_BALL,
        ALPHA,
        0.85,
        0.4,
    )
    # v_out = e_A v_in + (1 + e_A) V = 50.28 m/s (Brody 1997, Am. J. Phys. 65:981)
    assert res.velocity[0, 0] == pytest.approx(50.28, abs=0.01)
    np.testing.assert_allclose(res.velocity[0, 1:], 0.0, atol=1e-15)
    np.testing.assert_allclose(res.spin, 0.0, atol=1e-15)
    np.testing.assert_allclose(res.tangential_impulse, 0.0, atol=1e-15)
    assert res.grip[0] and res.regime[0] == "grip"  # no slip: no tangential impulse
    # the same through the low-level call with M_e from the worked racket
    m_e = effective_mass(0.32, 0.32, 0.032, 0.52)
    low = collide(
        [-20.0, 0, 0],
        [0, 0, 0],
        [30.0, 0, 0],
        X,
        [0, 1.0, 0],
        0.057,
        R_BALL,
        ALPHA,
        1.0 / m_e,
        ZERO_K,
        0.85,
        0.4,
    )
    assert low.velocity[0, 0] == pytest.approx(res.velocity[0, 0], rel=1e-15)
    # the racket point slows by J_n / M_e (momentum along the normal is conserved)
    assert res.face_velocity_change[0, 0] == pytest.approx(-res.normal_impulse[0] / m_e, rel=1e-12)


def test_clamped_grip_worked_bounce():
    res = _clamped([15.0, 0.0, -15.0], [0.0, 0.0, 0.0], mu=0.6, e_n=0.8)
    assert res.grip[0]  # grip (Cross 2002, Am. J. Phys. 70:1093, doi:10.1119/1.1507792)
    # v_x2 = v_x1 / (1 + alpha) = 9.6774 m/s (Cross 2002, doi:10.1119/1.1507792)
    assert res.velocity[0, 0] == pytest.approx(9.6774, abs=1e-4)
    # v_z2 = e |v_z1| = 12.0 m/s (Brody 1984, Phys. Teach. 22:494)
    assert res.velocity[0, 2] == pytest.approx(12.0, abs=1e-12)
    # w_2 = v_x2 / r = 288.88 rad/s about +y, topspin for travel along +x (Cross 2002)
    assert res.spin[0, 1] == pytest.approx(288.88, abs=0.01)
    np.testing.assert_allclose(res.spin[0, [0, 2]], 0.0, atol=1e-12)
    assert res.spin_limit_reached[0]
    assert res.spin_ratio_out[0] == pytest.approx(1.0, rel=1e-12)


def test_clamped_sliding_worked_bounce():
    angle = np.deg2rad(16.0)
    v = 30.0 * np.array([np.cos(angle), 0.0, -np.sin(angle)])
    res = _clamped(v, [0.0, 0.0, 0.0], mu=0.6, e_n=0.8)
    assert not res.grip[
        0
    ]  # slides throughout (ITF CS 01/02 geometry; Cross 2005, doi:10.1119/1.2008299)
    # v_x2 = v_x1 - mu (1 + e) |v_z1| = 19.907 m/s (ITF CS 01/02 pace test geometry)
    assert res.velocity[0, 0] == pytest.approx(19.907, abs=1e-3)
    # v_z2 = e |v_z1| = 6.615 m/s (ITF CS 01/02 pace test geometry)
    assert res.velocity[0, 2] == pytest.approx(6.615, abs=1e-3)
    assert not res.spin_limit_reached[0]


@settings(max_examples=200, deadline=None)
@given(
    vx=st.floats(-40, 40),
    vz=st.floats(-40, -0.1),
    wy=st.floats(-600, 600),
    mu=st.floats(0, 1.5),
    e=st.floats(0, 1),
    e_x=st.floats(0, 1),
    alpha=st.floats(0.4, 0.667),
)
def test_clamped_matches_published_bounce_formulas(vx, vz, wy, mu, e, e_x, alpha):
    # Slide-or-grip bounce (Cross 2002, doi:10.1119/1.1507792; Cross 2005, doi:10.1119/1.2008299):
    # J_n = (1 + e)|v_z1|, J_grip = alpha (1 + e_x)|u1| / (1 + alpha), J = min(mu J_n, J_grip),
    # v_x2 = v_x1 - sign(u1) J, w_2 = w_1 + sign(u1) J / (alpha r), all per unit mass.
    r = R_BALL
    u1 = vx - r * wy
    j_n = (1 + e) * abs(vz)
    j_grip = alpha * (1 + e_x) * abs(u1) / (1 + alpha)
    j = j_grip if mu * j_n >= j_grip else mu * j_n
    res = _clamped([vx, 0.0, vz], [0.0, wy, 0.0], mu=mu, e_n=e, e_t=e_x, alpha=alpha)
    assert res.velocity[0, 2] == pytest.approx(e * abs(vz), rel=1e-12, abs=1e-12)
    assert res.velocity[0, 0] == pytest.approx(vx - np.sign(u1) * j, rel=1e-10, abs=1e-10)
    assert res.spin[0, 1] == pytest.approx(wy + np.sign(u1) * j / (alpha * r), rel=1e-10, abs=1e-7)
    if abs(mu * j_n - j_grip) > 1e-9 * (1.0 + j_grip):  # at the boundary both give one impulse
        assert res.grip[0] == (mu * j_n > j_grip)


# --- Physics checks on random racket impacts ----------------------------------------------


def test_grip_leaves_contact_point_at_rest():
    kw, _ = _random_impacts(np.random.default_rng(11), 20_000)
    res = collide(**kw, e_n=0.85, mu=50.0)
    assert res.grip.all()
    slip_in = np.linalg.norm(_incoming_slip(kw), axis=1)
    slip_out = np.linalg.norm(_contact_point_slip(kw, res), axis=1)
    assert np.all(slip_out <= 1e-10 * (1.0 + slip_in))
    assert res.spin_limit_reached.all()
    np.testing.assert_allclose(res.spin_ratio_out, 1.0, rtol=1e-9)


def test_grip_with_tangential_restitution_reverses_slip():
    kw, _ = _random_impacts(np.random.default_rng(12), 5_000)
    e_t = np.linspace(0.0, 1.0, 5_000)
    res = collide(**kw, e_n=0.85, mu=50.0, e_t=e_t)
    assert res.grip.all()
    u_in = _incoming_slip(kw)
    np.testing.assert_allclose(_contact_point_slip(kw, res), -e_t[:, None] * u_in, atol=1e-9)


def test_grip_slip_stops_the_slip_then_springs_back_part_way():
    # Where mu J_n lies between the stopping impulse and (1 + e_t) times it, the contact point
    # stops and then slips back (grip-slip, Cross 2002, doi:10.1119/1.1507792): all of the
    # friction is used, the slip reverses along its own line by less than e_t, and more friction
    # would give more spin (the spin limit is not reached).
    rng = np.random.default_rng(15)
    kw, _ = _random_impacts(rng, 20_000)
    mu = rng.uniform(0.0, 1.0, 20_000)
    res = collide(**kw, e_n=0.85, mu=mu, e_t=0.5)
    mid = res.stopped & ~res.grip
    assert mid.sum() > 500
    assert set(res.regime[mid]) == {"grip-slip"}
    assert not res.spin_limit_reached[mid].any()
    np.testing.assert_array_equal(res.spin_limit_reached, res.grip)
    j_t = np.linalg.norm(res.tangential_impulse[mid], axis=1)
    np.testing.assert_allclose(j_t, mu[mid] * res.normal_impulse[mid], rtol=1e-12)
    u_in = _incoming_slip(kw)[mid]
    u_out = _contact_point_slip(kw, res)[mid]
    back = -np.einsum("ij,ij->i", u_in, u_out) / np.einsum("ij,ij->i", u_in, u_in)
    assert np.all(back >= -1e-9) and np.all(back <= 0.5 + 1e-9)
    np.testing.assert_allclose(u_out, -back[:, None] * u_in, atol=1e-9)


def test_sliding_transfers_exactly_mu_times_normal_impulse():
    kw, _ = _random_impacts(np.random.default_rng(13), 20_000)
    mu = np.random.default_rng(14).uniform(0.0, 0.02, 20_000)
    res = collide(**kw, e_n=0.85, mu=mu)
    sliding = ~res.grip
    assert sliding.mean() > 0.99
    j_t = np.linalg.norm(res.tangential_impulse[sliding], axis=1)
    np.testing.assert_allclose(j_t, mu[sliding] * res.normal_impulse[sliding], rtol=1e-12, atol=0)
    assert not res.spin_limit_reached[sliding].any()


def _kinetic_energy(v, w, m, r, alpha, rigid, v_cm, omega):
    ball = 0.5 * m * np.sum(v**2, axis=1) + 0.5 * alpha * m * r**2 * np.sum(w**2, axis=1)
    rot = np.einsum("ni,nij,nj->n", omega, rigid["inertia"], omega)
    return ball + 0.5 * rigid["mass"] * np.sum(v_cm**2, axis=1) + 0.5 * rot


@settings(max_examples=40, deadline=None)
@given(
    seed=st.integers(0, 2**32 - 1),
    e_n=st.floats(0.0, 1.0),
    e_t=st.floats(0.0, 1.0),
    mu=st.floats(0.0, 2.0),
)
def test_contact_never_adds_energy_on_rigid_racket(seed, e_n, e_t, mu):
    rng = np.random.default_rng(seed)
    n = 2_500
    kw, rigid = _random_impacts(rng, n)
    # half the batch takes the drawn parameters, half random ones (edge values included)
    half = rng.random(n) < 0.5
    e_n_all = np.where(half, e_n, rng.uniform(0.0, 1.0, n))
    e_t_all = np.where(half, e_t, rng.uniform(0.0, 1.0, n))
    mu_all = np.where(half, mu, rng.uniform(0.0, 2.0, n))
    res = collide(**kw, e_n=e_n_all, mu=mu_all, e_t=e_t_all)

    # Newton-Euler impulse equations: the racket receives -J at the lever arm.
    impulse = res.normal_impulse[:, None] * kw["face_normal"] + res.tangential_impulse
    v_cm_out = rigid["v_cm"] - impulse / rigid["mass"][:, None]
    torque = np.cross(rigid["lever"], -impulse)
    omega_out = rigid["omega"] + np.linalg.solve(rigid["inertia"], torque[..., None])[..., 0]
    face_out = v_cm_out + np.cross(omega_out, rigid["lever"])
    np.testing.assert_allclose(
        face_out, kw["face_velocity"] + res.face_velocity_change, rtol=0, atol=1e-9
    )

    m, r, alpha = kw["ball_mass"], kw["ball_radius"], kw["ball_alpha"]
    before = _kinetic_energy(
        kw["ball_velocity"], kw["ball_spin"], m, r, alpha, rigid, rigid["v_cm"], rigid["omega"]
    )
    after = _kinetic_energy(res.velocity, res.spin, m, r, alpha, rigid, v_cm_out, omega_out)
    assert np.all(after <= before * (1.0 + 1e-12))


def test_elastic_grip_conserves_energy():
    # e_n = e_t = 1 with grip reverses both relative velocities: no loss (exact result)
    kw, rigid = _random_impacts(np.random.default_rng(15), 2_000)
    res = collide(**kw, e_n=1.0, mu=50.0, e_t=1.0)
    impulse = res.normal_impulse[:, None] * kw["face_normal"] + res.tangential_impulse
    v_cm_out = rigid["v_cm"] - impulse / rigid["mass"][:, None]
    torque = np.cross(rigid["lever"], -impulse)
    omega_out = rigid["omega"] + np.linalg.solve(rigid["inertia"], torque[..., None])[..., 0]
    m, r, alpha = kw["ball_mass"], kw["ball_radius"], kw["ball_alpha"]
    before = _kinetic_energy(
        kw["ball_velocity"], kw["ball_spin"], m, r, alpha, rigid, rigid["v_cm"], rigid["omega"]
    )
    after = _kinetic_energy(res.velocity, res.spin, m, r, alpha, rigid, v_cm_out, omega_out)
    np.testing.assert_allclose(after, before, rtol=1e-10)


def test_normal_restitution_relative_to_moving_face():
    kw, _ = _random_impacts(np.random.default_rng(16), 5_000)
    res = collide(**kw, e_n=0.8, mu=0.4)
    n = kw["face_normal"]
    v_n_in = np.einsum("ij,ij->i", kw["ball_velocity"] - kw["face_velocity"], n)
    v_n_out = np.einsum(
        "ij,ij->i", res.velocity - kw["face_velocity"] - res.face_velocity_change, n
    )
    np.testing.assert_allclose(v_n_out, -0.8 * v_n_in, rtol=1e-10)
    np.testing.assert_allclose(res.approach_normal_mps, -v_n_in, rtol=1e-14)


# --- Coach quantities and edge cases ------------------------------------------------------


def test_slip_ratio_sign_for_topspin_and_backspin():
    # Ball travelling +x onto a surface with normal +z: spin about +y (topspin) moves the
    # contact point toward -x, against the +x linear slip; backspin adds to it.
    v = [10.0, 0.0, -10.0]
    top = _clamped(v, [0.0, 150.0, 0.0], mu=0.5, e_n=0.8)
    back = _clamped(v, [0.0, -150.0, 0.0], mu=0.5, e_n=0.8)
    assert top.slip_ratio[0] == pytest.approx(-R_BALL * 150.0 / 10.0, rel=1e-12)
    assert back.slip_ratio[0] == pytest.approx(R_BALL * 150.0 / 10.0, rel=1e-12)
    assert top.slip_spin_mps[0] == pytest.approx(R_BALL * 150.0, rel=1e-12)
    assert top.slip_linear_mps[0] == pytest.approx(10.0, rel=1e-12)
    assert top.approach_parallel_mps[0] == pytest.approx(10.0, rel=1e-12)
    np.testing.assert_allclose(top.approach_parallel_velocity, [[10.0, 0.0, 0.0]], atol=1e-15)
    assert top.approach_normal_mps[0] == pytest.approx(10.0, rel=1e-15)
    np.testing.assert_allclose(top.spin_change, top.spin - [[0.0, 150.0, 0.0]], atol=1e-12)


def test_slip_ratio_nan_without_linear_slip():
    res = _clamped([0.0, 0.0, -10.0], [0.0, 100.0, 0.0], mu=0.5, e_n=0.8)
    assert np.isnan(res.slip_ratio[0])
    assert res.slip_spin_mps[0] == pytest.approx(R_BALL * 100.0, rel=1e-12)


def test_sidespin_component_along_normal_is_untouched():
    # Spin about the face normal exerts no slip at the contact point: it passes unchanged.
    res = _clamped([5.0, 0.0, -10.0], [0.0, 0.0, 300.0], mu=0.5, e_n=0.8)
    assert res.spin[0, 2] == pytest.approx(300.0, rel=1e-15)


def test_ball_not_approaching_is_unchanged():
    v = np.array([[3.0, 1.0, 2.0], [3.0, 1.0, 0.0], [3.0, 1.0, -2.0]])
    w = np.array([[10.0, 20.0, 30.0]] * 3)
    res = _clamped(v, w, mu=0.5, e_n=0.8)
    np.testing.assert_array_equal(res.approaching, [False, False, True])
    np.testing.assert_array_equal(res.velocity[:2], v[:2])
    np.testing.assert_array_equal(res.spin[:2], w[:2])
    np.testing.assert_array_equal(res.normal_impulse[:2], 0.0)
    np.testing.assert_array_equal(res.tangential_impulse[:2], 0.0)
    np.testing.assert_array_equal(res.face_velocity_change[:2], 0.0)
    assert list(res.regime[:2]) == ["none", "none"]
    assert not res.grip[:2].any() and not res.spin_limit_reached[:2].any()
    assert res.normal_impulse[2] > 0.0


def test_zero_friction_keeps_tangential_motion_and_spin():
    res = _clamped([12.0, -3.0, -8.0], [40.0, 90.0, 10.0], mu=0.0, e_n=0.7)
    np.testing.assert_allclose(res.velocity, [[12.0, -3.0, 5.6]], rtol=1e-14)
    np.testing.assert_allclose(res.spin, [[40.0, 90.0, 10.0]], rtol=1e-14)
    assert res.regime[0] == "slide"


def test_scalar_list_and_array_inputs():
    racket = Racket(0.32, 0.32, 0.032)
    args = dict(
        racket=racket,
        impact_from_butt_m=0.52,
        offaxis_m=0.01,
        ball_mass=M_BALL,
        ball_radius=R_BALL,
        ball_alpha=ALPHA,
        e_n=0.85,
        mu=0.4,
    )
    single = hit(
        np.array([-20.0, 2.0, -3.0]),
        np.array([0.0, 50.0, 0.0]),
        np.array([30.0, 0.0, 5.0]),
        X,
        [0.0, 1.0, 0.0],
        **args,
    )
    assert single.velocity.shape == (1, 3) and single.grip.shape == (1,)
    from_lists = hit(
        [[-20.0, 2.0, -3.0], [-25.0, 0.0, 0.0]],
        [[0.0, 50.0, 0.0]] * 2,
        [30.0, 0.0, 5.0],
        [1.0, 0.0, 0.0],
        [0.0, 1.0, 0.0],
        **args,
    )
    assert from_lists.velocity.shape == (2, 3)
    np.testing.assert_allclose(from_lists.velocity[0], single.velocity[0], rtol=1e-15)

    n = 100_000
    rng = np.random.default_rng(17)
    v = np.array([-20.0, 0.0, 0.0]) + rng.normal(scale=3.0, size=(n, 3))
    many = hit(
        v,
        [0.0, 50.0, 0.0],
        [30.0, 0.0, 5.0],
        X,
        [0.0, 1.0, 0.0],
        **{**args, "impact_from_butt_m": rng.uniform(0.45, 0.6, n), "mu": rng.uniform(0.2, 0.5, n)},
    )
    for field in (
        "velocity",
        "spin",
        "tangential_impulse",
        "face_velocity_change",
        "approach_parallel_velocity",
        "spin_change",
    ):
        assert getattr(many, field).shape == (n, 3), field
    for field in (
        "approaching",
        "grip",
        "normal_impulse",
        "approach_normal_mps",
        "approach_parallel_mps",
        "slip_linear_mps",
        "slip_spin_mps",
        "slip_ratio",
        "stopped",
        "spin_limit_reached",
        "spin_ratio_out",
    ):
        assert getattr(many, field).shape == (n,), field
    assert many.regime.shape == (n,)
    # a batch gives the same numbers as its members one at a time
    x_imp = rng.uniform(0.45, 0.6, 3)
    batch = hit(
        v[:3],
        [0.0, 50.0, 0.0],
        [30.0, 0.0, 5.0],
        X,
        [0.0, 1.0, 0.0],
        **{**args, "impact_from_butt_m": x_imp},
    )
    for i in range(3):
        one = hit(
            v[i],
            [0.0, 50.0, 0.0],
            [30.0, 0.0, 5.0],
            X,
            [0.0, 1.0, 0.0],
            **{**args, "impact_from_butt_m": x_imp[i]},
        )
        np.testing.assert_allclose(batch.velocity[i], one.velocity[0], rtol=1e-14)
        np.testing.assert_allclose(batch.spin[i], one.spin[0], rtol=1e-14, atol=1e-12)


def test_hit_matches_collide_with_racket_inverse_masses():
    racket = Racket(0.30, 0.33, 0.031, twistweight_kgm2=0.0013)
    inv_n, inv_t = racket_inverse_masses(racket, 0.55, -0.03)
    common = ([-18.0, 4.0, -2.0], [10.0, -80.0, 30.0], [28.0, 2.0, 6.0], X, [0.0, 0.6, 0.8])
    a = hit(*common, racket, 0.55, -0.03, M_BALL, R_BALL, ALPHA, 0.85, 0.35)
    b = collide(*common, M_BALL, R_BALL, ALPHA, inv_n, inv_t, 0.85, 0.35)
    np.testing.assert_array_equal(a.velocity, b.velocity)
    np.testing.assert_array_equal(a.spin, b.spin)


@pytest.mark.parametrize(
    "change, match",
    [
        (dict(face_normal=[0.0, 0.0, 2.0]), "face_normal"),
        (dict(face_axis=[1.0, 0.0, 1.0]), "face_axis"),
        (dict(face_axis=[0.0, 0.0, 1.0]), "perpendicular"),
        (dict(ball_velocity=np.zeros((3, 3)), ball_spin=np.zeros((2, 3))), "batch size"),
        (dict(ball_velocity=[1.0, 2.0]), "ball_velocity"),
        (dict(ball_mass=0.0), "ball_mass"),
        (dict(e_n=1.2), "e_n"),
        (dict(e_t=-0.1), "e_t"),
        (dict(mu=-0.1), "mu"),
        (dict(racket_inv_mass_normal=-1.0), "racket_inv_mass_normal"),
        (dict(racket_inv_mass_tangential=np.zeros(3)), "racket_inv_mass_tangential"),
        (dict(racket_inv_mass_tangential=[[1.0, 0.5], [0.0, 1.0]]), "symmetric"),
        (dict(racket_inv_mass_tangential=[[-1.0, 0.0], [0.0, 1.0]]), "semi-definite"),
    ],
)
def test_invalid_inputs_raise(change, match):
    kwargs = dict(
        ball_velocity=[10.0, 0.0, -10.0],
        ball_spin=[0.0, 0.0, 0.0],
        face_velocity=[0.0] * 3,
        face_normal=Z,
        face_axis=X,
        ball_mass=M_BALL,
        ball_radius=R_BALL,
        ball_alpha=ALPHA,
        racket_inv_mass_normal=0.0,
        racket_inv_mass_tangential=ZERO_K,
        e_n=0.8,
        mu=0.5,
    )
    kwargs.update(change)
    with pytest.raises(ValueError, match=match):
        collide(**kwargs)
