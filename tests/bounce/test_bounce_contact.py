"""Tests of bounce.contact: the slide-or-grip bounce, worked values, validation and batching."""

import math

import numpy as np
import pytest

from rallyarc.bounce.contact import (
    DEFAULT_REFERENCE_SPEED_MPS,
    Bounce2D,
    BounceResult,
    Surface,
    bounce,
    bounce_2d,
    critical_angle,
    normal_restitution,
)

R = 0.0335
ALPHA = 0.55
HARD = Surface(friction=0.6, restitution=0.8)


def _random_balls(rng, n, speed=40.0, spin=400.0):
    velocity = rng.uniform(-speed, speed, (n, 3))
    velocity[:, 2] = -rng.uniform(0.5, speed, n)
    spin_vectors = rng.uniform(-spin, spin, (n, 3))
    return velocity, spin_vectors


def _rotation_z(angle):
    c, s = math.cos(angle), math.sin(angle)
    return np.array([[c, -s, 0.0], [s, c, 0.0], [0.0, 0.0, 1.0]])


# --- published worked values ---------------------------------------------------------------


def test_worked_bounce_15_15_grips():
    result = bounce([15.0, 0.0, -15.0], [0.0, 0.0, 0.0], R, ALPHA, HARD)
    assert bool(result.grip)  # Cross 2002 (doi:10.1119/1.1507792) via REFERENCES.md worked bounce
    # Re-derived: J_grip = 0.55 * 15 / 1.55 = 5.3226 < mu J_n = 0.6 * 27 = 16.2 -> grip,
    # v_x2 = 15 / 1.55 = 9.67742, w_2 = v_x2 / r = 288.878 rad/s.
    assert result.velocity[0] == pytest.approx(9.6774, abs=5e-5)  # REFERENCES.md, 4 decimals
    assert result.velocity[2] == pytest.approx(12.0, abs=1e-12)  # REFERENCES.md, v_z2 = e |v_z1|
    assert result.spin[1] == pytest.approx(288.88, abs=5e-3)  # REFERENCES.md, 2 decimals
    assert result.velocity[0] == pytest.approx(15.0 / 1.55, rel=1e-14)  # exact re-derivation
    assert result.spin[1] == pytest.approx(15.0 / 1.55 / R, rel=1e-14)  # exact re-derivation
    assert result.normal_impulse == pytest.approx(27.0, rel=1e-14)  # (1 + e)|v_z| = 1.8 * 15
    assert result.velocity[1] == 0.0
    assert result.spin[0] == 0.0 and result.spin[2] == 0.0


def test_worked_bounce_sliding_at_pace_test_geometry():
    theta = math.radians(16.0)
    v = [30.0 * math.cos(theta), 0.0, -30.0 * math.sin(theta)]
    result = bounce(v, [0.0, 0.0, 0.0], R, ALPHA, HARD)
    assert not bool(result.grip)  # 16 deg is below the 18.2 deg critical angle for mu .6, e .8
    assert result.velocity[0] == pytest.approx(19.907, abs=5e-4)  # REFERENCES.md, 3 decimals
    assert result.velocity[2] == pytest.approx(6.615, abs=5e-4)  # REFERENCES.md, 3 decimals
    # sliding: J = mu (1 + e) |v_z| = 0.6 * 1.8 * 30 sin(16 deg) = 8.9305 per unit mass
    assert result.tangential_impulse == pytest.approx(0.6 * 1.8 * 30.0 * math.sin(theta), rel=1e-14)


def test_spin_update_for_slip_along_x_adds_j_over_alpha_r_to_wy():
    # Derivation check: impulse -J x_hat at -r z_hat gives angular impulse r J y_hat, so
    # w_y' = w_y + J / (alpha r), and nothing else changes in the spin.
    w_in = np.array([0.0, -50.0, 20.0])
    result = bounce([12.0, 0.0, -5.0], w_in, R, ALPHA, HARD)
    j = result.tangential_impulse
    assert result.slip_in[0] > 0.0 and result.slip_in[1] == 0.0
    assert result.spin[1] == pytest.approx(w_in[1] + j / (ALPHA * R), rel=1e-14)
    assert result.spin[0] == 0.0
    assert result.spin[2] == 20.0


def test_grip_with_zero_tangential_restitution_matches_closed_form_2d():
    # Cross 2002 (doi:10.1119/1.1507792): v_x2 = (v_x1 + alpha r w_1) / (1 + alpha), r w_2 = v_x2.
    vx, wy = 8.0, -120.0
    result = bounce([vx, 0.0, -10.0], [0.0, wy, 0.0], R, ALPHA, Surface(1.0, 0.75))
    assert bool(result.grip)
    expected = (vx + ALPHA * R * wy) / (1.0 + ALPHA)
    assert result.velocity[0] == pytest.approx(expected, rel=1e-13)
    assert R * result.spin[1] == pytest.approx(expected, rel=1e-13)


# --- grip and slide rules ------------------------------------------------------------------


def test_grip_leaves_contact_point_at_rest_for_many_random_balls():
    rng = np.random.default_rng(20240601)
    velocity, spin = _random_balls(rng, 20_000)
    result = bounce(velocity, spin, R, ALPHA, Surface(friction=1.2, restitution=0.7))
    grip = result.grip
    assert 1000 < grip.sum() < grip.size  # both branches are exercised
    scale = np.linalg.norm(result.slip_in[grip], axis=-1)
    residual = np.linalg.norm(result.slip_out[grip], axis=-1)
    assert np.all(residual <= 1e-12 * np.maximum(scale, 1.0))
    # and it rolls: contact point velocity recomputed from the outputs is zero as well
    c = result.velocity[grip] + np.cross(result.spin[grip], np.array([0.0, 0.0, -R]))
    np.testing.assert_allclose(c[:, :2], 0.0, atol=1e-11)


def test_sliding_transfers_exactly_mu_times_normal_impulse():
    rng = np.random.default_rng(7)
    velocity, spin = _random_balls(rng, 20_000)
    surface = Surface(friction=0.35, restitution=0.8)
    result = bounce(velocity, spin, R, ALPHA, surface)
    slide = ~result.grip
    assert slide.sum() > 1000 and result.grip.sum() > 100
    np.testing.assert_allclose(
        result.tangential_impulse[slide], 0.35 * result.normal_impulse[slide], rtol=1e-14
    )
    dv = np.linalg.norm(result.velocity[slide, :2] - velocity[slide, :2], axis=-1)
    np.testing.assert_allclose(dv, 0.35 * result.normal_impulse[slide], rtol=1e-12, atol=1e-12)
    # slip keeps its direction and only shrinks while sliding (e_t = 0)
    u_in = result.slip_in[slide]
    u_out = result.slip_out[slide]
    cross = u_in[:, 0] * u_out[:, 1] - u_in[:, 1] * u_out[:, 0]
    assert np.all(np.abs(cross) <= 1e-9 * np.sum(u_in**2, axis=-1) + 1e-12)
    assert np.all(np.sum(u_in * u_out, axis=-1) > 0.0)


def test_grip_with_tangential_restitution_reverses_slip_by_e_t():
    rng = np.random.default_rng(11)
    velocity, spin = _random_balls(rng, 5000)
    surface = Surface(friction=2.0, restitution=0.8, tangential_restitution=0.4)
    result = bounce(velocity, spin, R, ALPHA, surface)
    grip = result.grip
    assert grip.sum() > 1000
    np.testing.assert_allclose(
        result.slip_out[grip], -0.4 * result.slip_in[grip], rtol=1e-10, atol=1e-10
    )
    expected = ALPHA * 1.4 * np.linalg.norm(result.slip_in, axis=-1) / (1.0 + ALPHA)
    np.testing.assert_allclose(result.grip_impulse, expected, rtol=1e-14)


def test_grip_slip_stops_the_contact_point_then_slips_back_with_all_the_friction():
    # Between the stop impulse alpha |u| / (1 + alpha) and the grip impulse alpha (1 + e_t) |u| /
    # (1 + alpha) the contact point stops, then slips back: all of mu J_n is used and the slip
    # reverses by less than e_t (Cross 2002, Am. J. Phys. 70:1093, doi:10.1119/1.1507792:
    # grip-slip).
    rng = np.random.default_rng(12)
    velocity, spin = _random_balls(rng, 20_000)
    surface = Surface(friction=0.5, restitution=0.8, tangential_restitution=0.6)
    result = bounce(velocity, spin, R, ALPHA, surface)
    mid = result.stopped & ~result.grip
    assert mid.sum() > 500
    assert set(result.regime[mid]) == {"grip-slip"}
    assert set(result.regime[result.grip]) == {"grip"}
    assert set(result.regime[~result.stopped & result.approaching]) == {"slide"}
    np.testing.assert_allclose(
        result.tangential_impulse[mid], result.friction_limit[mid], rtol=1e-15
    )
    u_in, u_out = result.slip_in[mid], result.slip_out[mid]
    back = -np.sum(u_in * u_out, axis=-1) / np.sum(u_in**2, axis=-1)
    assert np.all(back >= -1e-12) and np.all(back < 0.6)
    stop = ALPHA * np.linalg.norm(result.slip_in, axis=-1) / (1.0 + ALPHA)
    np.testing.assert_array_equal(
        result.stopped, result.approaching & (result.friction_limit >= stop * (1 - 1e-15))
    )


def test_grip_decision_uses_friction_limit_versus_grip_impulse():
    rng = np.random.default_rng(3)
    velocity, spin = _random_balls(rng, 5000)
    result = bounce(velocity, spin, R, ALPHA, HARD)
    np.testing.assert_array_equal(result.grip, result.friction_limit >= result.grip_impulse)
    np.testing.assert_allclose(result.friction_limit, 0.6 * result.normal_impulse, rtol=1e-15)
    assert np.all(result.tangential_impulse <= result.friction_limit * (1 + 1e-15))
    assert np.all(result.tangential_impulse <= result.grip_impulse * (1 + 1e-15))


def test_rolling_ball_has_no_friction_impulse():
    # slip is zero for a ball rolling along +x (r w_y = v_x): grips with J = 0.
    result = bounce([10.0, 0.0, -4.0], [0.0, 10.0 / R, 0.0], R, ALPHA, HARD)
    assert bool(result.grip)
    assert result.tangential_impulse == 0.0
    assert result.velocity[0] == pytest.approx(10.0, rel=1e-15)
    assert result.spin[1] == pytest.approx(10.0 / R, rel=1e-15)


def test_frictionless_surface_keeps_tangential_motion_and_spin():
    w = np.array([30.0, -200.0, 50.0])
    result = bounce([9.0, -2.0, -7.0], w, R, ALPHA, Surface(friction=0.0, restitution=0.6))
    assert not bool(result.grip)
    np.testing.assert_array_equal(result.velocity[:2], [9.0, -2.0])
    np.testing.assert_array_equal(result.spin, w)
    assert result.velocity[2] == pytest.approx(0.6 * 7.0, rel=1e-15)


# --- critical angle ------------------------------------------------------------------------


def test_critical_angle_value_and_limits():
    # Brody 1984 / Cross 2002 (doi:10.1119/1.1507792): tan(theta) = alpha/((1+alpha) mu (1+e)).
    # By hand for mu 0.6, e 0.8: 0.55 / (1.55 * 0.6 * 1.8) = 0.328554 -> 18.188 deg.
    theta = critical_angle(0.6, 0.8, ALPHA)
    assert math.tan(theta) == pytest.approx(0.55 / (1.55 * 0.6 * 1.8), rel=1e-14)
    assert math.degrees(theta) == pytest.approx(18.188, abs=5e-4)
    assert critical_angle(0.0, 0.8, ALPHA) == pytest.approx(math.pi / 2, abs=1e-15)
    with_et = critical_angle(0.6, 0.8, ALPHA, tangential_restitution=0.5)
    assert math.tan(with_et) == pytest.approx(1.5 * math.tan(theta), rel=1e-14)
    grid = critical_angle(np.array([0.2, 0.6, 1.0]), np.array([[0.0], [1.0]]), ALPHA)
    assert grid.shape == (2, 3)


@pytest.mark.parametrize("mu", [0.1, 0.3, 0.6, 0.9, 1.5])
@pytest.mark.parametrize("e", [0.0, 0.5, 0.8, 1.0])
def test_spin_free_ball_slides_below_and_grips_above_critical_angle(mu, e):
    surface = Surface(friction=mu, restitution=e)
    theta_c = critical_angle(mu, e, ALPHA)
    below = np.array([theta_c * f for f in (0.2, 0.6, 0.99)])
    above = np.array([theta_c + (math.pi / 2 - theta_c) * f for f in (0.01, 0.5, 1.0)])
    angles = np.concatenate([below, above])
    speed = 25.0
    velocity = np.stack(
        [speed * np.cos(angles), np.zeros_like(angles), -speed * np.sin(angles)], axis=-1
    )
    result = bounce(velocity, np.zeros_like(velocity), R, ALPHA, surface)
    np.testing.assert_array_equal(result.grip, [False, False, False, True, True, True])


# --- sidespin, 3D and frame independence ---------------------------------------------------


def test_pure_spin_about_z_is_kept():
    w = np.array([0.0, 0.0, 350.0])
    # dropped vertically: no slip at all, everything but v_z is unchanged
    straight = bounce([0.0, 0.0, -9.0], w, R, ALPHA, HARD)
    np.testing.assert_array_equal(straight.spin, w)
    np.testing.assert_array_equal(straight.velocity[:2], [0.0, 0.0])
    np.testing.assert_array_equal(straight.slip_in, [0.0, 0.0])
    # moving obliquely: friction acts, yet the z spin is untouched and the new spin is horizontal
    oblique = bounce([12.0, -5.0, -9.0], w, R, ALPHA, HARD)
    assert oblique.spin[2] == 350.0
    assert np.hypot(oblique.spin[0], oblique.spin[1]) > 0.0


def test_sidespin_about_x_bends_the_bounce_sideways():
    # Spin about +x moves the contact point toward +y (u_y = v_y + r w_x), so friction pushes the
    # ball toward -y and reduces w_x.
    result = bounce([15.0, 0.0, -10.0], [200.0, 0.0, 0.0], R, ALPHA, HARD)
    assert result.slip_in[1] == pytest.approx(R * 200.0, rel=1e-15)
    assert result.velocity[1] < 0.0
    assert result.spin[0] < 200.0


@pytest.mark.parametrize("angle", [0.3, math.pi / 2, 2.0, math.pi, -1.1])
def test_rotating_inputs_about_z_rotates_the_result(angle):
    rng = np.random.default_rng(5)
    velocity, spin = _random_balls(rng, 2000)
    rot = _rotation_z(angle)
    surface = Surface(0.5, 0.75, tangential_restitution=0.2)
    base = bounce(velocity, spin, R, ALPHA, surface)
    turned = bounce(velocity @ rot.T, spin @ rot.T, R, ALPHA, surface)
    np.testing.assert_allclose(turned.velocity, base.velocity @ rot.T, rtol=1e-11, atol=1e-10)
    np.testing.assert_allclose(turned.spin, base.spin @ rot.T, rtol=1e-11, atol=1e-8)
    np.testing.assert_allclose(turned.slip_out, base.slip_out @ rot[:2, :2].T, atol=1e-10)
    np.testing.assert_array_equal(turned.grip, base.grip)


def test_mirror_in_the_xz_plane_mirrors_the_result():
    # Reflection y -> -y: velocity (x, -y, z); spin is an axial vector, (-w_x, w_y, -w_z).
    rng = np.random.default_rng(9)
    velocity, spin = _random_balls(rng, 2000)
    flip_v = np.array([1.0, -1.0, 1.0])
    flip_w = np.array([-1.0, 1.0, -1.0])
    base = bounce(velocity, spin, R, ALPHA, HARD)
    mirrored = bounce(velocity * flip_v, spin * flip_w, R, ALPHA, HARD)
    np.testing.assert_allclose(mirrored.velocity, base.velocity * flip_v, rtol=1e-13, atol=1e-12)
    np.testing.assert_allclose(mirrored.spin, base.spin * flip_w, rtol=1e-13, atol=1e-10)


# --- balls not approaching the court -------------------------------------------------------


def test_balls_moving_up_or_level_are_unchanged_and_flagged():
    velocity = np.array([[10.0, 1.0, 0.0], [10.0, 1.0, 3.0], [10.0, 1.0, -3.0]])
    spin = np.array([[0.0, 100.0, 5.0]] * 3)
    result = bounce(velocity, spin, R, ALPHA, HARD)
    np.testing.assert_array_equal(result.approaching, [False, False, True])
    np.testing.assert_array_equal(result.velocity[:2], velocity[:2])
    np.testing.assert_array_equal(result.spin[:2], spin[:2])
    np.testing.assert_array_equal(result.grip[:2], [False, False])
    np.testing.assert_array_equal(result.normal_impulse[:2], [0.0, 0.0])
    np.testing.assert_array_equal(result.tangential_impulse[:2], [0.0, 0.0])
    np.testing.assert_array_equal(result.slip_out[:2], result.slip_in[:2])
    assert result.velocity[2, 2] == pytest.approx(0.8 * 3.0, rel=1e-15)


# --- restitution and surface ---------------------------------------------------------------


def test_normal_restitution_linear_in_speed_and_clipped():
    surface = Surface(0.5, 0.8, restitution_slope_s_per_m=-0.01, reference_speed_mps=8.0)
    assert normal_restitution(surface, 8.0) == pytest.approx(0.8, rel=1e-15)
    assert normal_restitution(surface, 18.0) == pytest.approx(0.7, rel=1e-14)
    assert surface.normal_restitution(-18.0) == pytest.approx(0.7, rel=1e-14)  # sign ignored
    assert normal_restitution(surface, 200.0) == 0.0  # clipped at 0
    rising = Surface(0.5, 0.95, restitution_slope_s_per_m=0.02, reference_speed_mps=8.0)
    assert normal_restitution(rising, 20.0) == 1.0  # clipped at 1
    np.testing.assert_allclose(
        normal_restitution(surface, [0.0, 8.0, 28.0]), [0.88, 0.8, 0.6], rtol=1e-14
    )


def test_speed_dependent_restitution_is_used_by_bounce():
    surface = Surface(0.5, 0.8, restitution_slope_s_per_m=-0.01, reference_speed_mps=8.0)
    result = bounce([[5.0, 0.0, -18.0], [5.0, 0.0, -8.0]], [0.0, 0.0, 0.0], R, ALPHA, surface)
    np.testing.assert_allclose(result.restitution, [0.7, 0.8], rtol=1e-14)
    np.testing.assert_allclose(result.velocity[:, 2], [0.7 * 18.0, 0.8 * 8.0], rtol=1e-14)
    np.testing.assert_allclose(result.normal_impulse, [1.7 * 18.0, 1.8 * 8.0], rtol=1e-14)


def test_surface_defaults_and_coercion():
    surface = Surface(friction=1, restitution=np.float32(0.5))
    assert isinstance(surface.friction, float) and isinstance(surface.restitution, float)
    assert surface.restitution_slope_s_per_m == 0.0
    assert surface.tangential_restitution == 0.0
    assert surface.reference_speed_mps == pytest.approx(30.0 * math.sin(math.radians(16.0)))
    assert DEFAULT_REFERENCE_SPEED_MPS == pytest.approx(8.2691, abs=5e-5)
    with pytest.raises(AttributeError):
        surface.friction = 0.3  # frozen


@pytest.mark.parametrize(
    ("kwargs", "message"),
    [
        ({"friction": -0.1, "restitution": 0.8}, "friction must be >= 0"),
        ({"friction": float("nan"), "restitution": 0.8}, "friction must be finite"),
        ({"friction": "rough", "restitution": 0.8}, "friction must be a real number"),
        ({"friction": True, "restitution": 0.8}, "friction must be a real number"),
        ({"friction": 0.5, "restitution": 1.2}, r"restitution must be in \[0, 1\]"),
        ({"friction": 0.5, "restitution": -0.01}, r"restitution must be in \[0, 1\]"),
        (
            {"friction": 0.5, "restitution": 0.8, "tangential_restitution": 1.5},
            r"tangential_restitution must be in \[0, 1\]",
        ),
        (
            {"friction": 0.5, "restitution": 0.8, "reference_speed_mps": 0.0},
            "reference_speed_mps must be > 0",
        ),
        (
            {"friction": 0.5, "restitution": 0.8, "restitution_slope_s_per_m": float("inf")},
            "restitution_slope_s_per_m must be finite",
        ),
    ],
)
def test_surface_validation_names_field_and_range(kwargs, message):
    with pytest.raises(ValueError, match=message):
        Surface(**kwargs)


@pytest.mark.parametrize(
    ("args", "message"),
    [
        (([1.0, 2.0], [0.0, 0.0, 0.0], R, ALPHA), "velocity must have shape"),
        (([1.0, 2.0, -3.0], [[0.0, 0.0]], R, ALPHA), "spin must have shape"),
        (([1.0, np.nan, -3.0], [0.0, 0.0, 0.0], R, ALPHA), "velocity must be finite"),
        (([1.0, 2.0, -3.0], [0.0, 0.0, 0.0], 0.0, ALPHA), "radius must be > 0"),
        (([1.0, 2.0, -3.0], [0.0, 0.0, 0.0], R, 0.7), r"alpha must be in \(0, 2/3\]"),
        (([1.0, 2.0, -3.0], [0.0, 0.0, 0.0], R, 0.0), r"alpha must be in \(0, 2/3\]"),
    ],
)
def test_bounce_validation(args, message):
    with pytest.raises(ValueError, match=message):
        bounce(*args, HARD)


def test_bounce_rejects_a_non_surface():
    with pytest.raises(ValueError, match="surface must be a Surface"):
        bounce([1.0, 0.0, -1.0], [0.0, 0.0, 0.0], R, ALPHA, {"friction": 0.5})


# --- batching: scalar, list, array (STYLE.md item 7) ---------------------------------------


def test_single_ball_list_gives_scalar_fields():
    result = bounce([15.0, 0.0, -15.0], [0.0, 0.0, 0.0], R, ALPHA, HARD)
    assert isinstance(result, BounceResult)
    assert result.velocity.shape == (3,) and result.spin.shape == (3,)
    assert result.slip_in.shape == (2,) and result.slip_out.shape == (2,)
    assert result.grip.shape == () and result.normal_impulse.shape == ()


def test_list_of_balls_and_array_of_many_balls_agree_with_single_calls():
    rng = np.random.default_rng(17)
    velocity, spin = _random_balls(rng, 500)
    radius = rng.uniform(0.03, 0.037, 500)
    alpha = rng.uniform(0.4, 0.66, 500)
    surface = Surface(0.55, 0.78, tangential_restitution=0.1)
    batch = bounce(velocity, spin, radius, alpha, surface)
    assert batch.velocity.shape == (500, 3) and batch.grip.shape == (500,)
    as_lists = bounce(
        velocity[:3].tolist(), spin[:3].tolist(), radius[:3].tolist(), alpha[:3].tolist(), surface
    )
    np.testing.assert_array_equal(as_lists.velocity, batch.velocity[:3])
    for i in range(0, 500, 50):  # a few balls one at a time (test-side loop only)
        one = bounce(velocity[i], spin[i], radius[i], alpha[i], surface)
        np.testing.assert_allclose(one.velocity, batch.velocity[i], rtol=1e-15)
        np.testing.assert_allclose(one.spin, batch.spin[i], rtol=1e-15)
        assert bool(one.grip) == bool(batch.grip[i])


def test_one_spin_vector_broadcasts_over_many_balls():
    velocity = np.tile([20.0, 0.0, -6.0], (4, 1))
    result = bounce(velocity, [0.0, 150.0, 0.0], R, [0.4, 0.5, 0.6, 2.0 / 3.0], HARD)
    assert result.velocity.shape == (4, 3)
    assert np.all(np.diff(result.velocity[:, 0]) != 0.0)  # alpha matters per ball


# --- 2D helper ------------------------------------------------------------------------------


def test_bounce_2d_worked_values():
    out = bounce_2d(15.0 * math.sqrt(2.0), math.radians(45.0), 0.0, R, ALPHA, HARD)
    assert isinstance(out, Bounce2D) and isinstance(out.vx, float)
    vx, vz, spin = out
    assert vx == pytest.approx(9.6774, abs=5e-5)  # REFERENCES.md worked bounce
    assert vz == pytest.approx(12.0, abs=1e-12)  # REFERENCES.md worked bounce
    assert spin == pytest.approx(288.88, abs=5e-3)  # REFERENCES.md worked bounce
    slide = bounce_2d(30.0, math.radians(16.0), 0.0, R, ALPHA, HARD)
    assert slide.vx == pytest.approx(19.907, abs=5e-4)  # REFERENCES.md sliding at 16 deg
    assert slide.vz == pytest.approx(6.615, abs=5e-4)  # REFERENCES.md sliding at 16 deg


def test_bounce_2d_topspin_and_backspin():
    theta = math.radians(20.0)
    rolling = 25.0 * math.cos(theta) / R  # topspin that makes the contact point rest
    vx, _, spin = bounce_2d(25.0, theta, rolling, R, ALPHA, HARD)
    assert vx == pytest.approx(25.0 * math.cos(theta), rel=1e-14)
    assert spin == pytest.approx(rolling, rel=1e-14)
    none = bounce_2d(25.0, theta, 0.0, R, ALPHA, HARD)
    back = bounce_2d(25.0, theta, -300.0, R, ALPHA, HARD)
    assert back.vx < none.vx  # backspin raises the slip and the friction impulse
    assert none.vx < vx


def test_bounce_2d_arrays_match_3d_bounce():
    speed = np.array([10.0, 20.0, 30.0, 40.0])
    angle = np.radians([10.0, 20.0, 40.0, 70.0])
    top = np.array([-200.0, 0.0, 150.0, 400.0])
    out = bounce_2d(speed, angle, top, R, ALPHA, HARD)
    v = np.stack([speed * np.cos(angle), 0 * speed, -speed * np.sin(angle)], axis=-1)
    w = np.stack([0 * top, top, 0 * top], axis=-1)
    ref = bounce(v, w, R, ALPHA, HARD)
    np.testing.assert_array_equal(out.vx, ref.velocity[:, 0])
    np.testing.assert_array_equal(out.vz, ref.velocity[:, 2])
    np.testing.assert_array_equal(out.spin, ref.spin[:, 1])
    listed = bounce_2d(speed.tolist(), angle.tolist(), 0.0, R, ALPHA, HARD)
    assert listed.vx.shape == (4,)


def test_bounce_2d_validation_and_grazing():
    with pytest.raises(ValueError, match="speed"):
        bounce_2d(-1.0, 0.3, 0.0, R, ALPHA, HARD)
    with pytest.raises(ValueError, match="angle_rad"):
        bounce_2d(10.0, 2.0, 0.0, R, ALPHA, HARD)
    grazing = bounce_2d(10.0, 0.0, 50.0, R, ALPHA, HARD)
    assert grazing == (10.0, 0.0, 50.0)
