"""Tests for impact.geometry: face orientation and swing velocity from angles."""

import numpy as np
import pytest

from rallyarc.impact.geometry import face_orientation, swing_velocity


def test_face_orientation_unit_and_orthogonal():
    rng = np.random.default_rng(5)
    n = 50_000
    tilt = np.concatenate([rng.uniform(-np.pi / 2, np.pi / 2, n - 2), [np.pi / 2, -np.pi / 2]])
    normal, axis = face_orientation(
        tilt, rng.uniform(-np.pi, np.pi, n), rng.uniform(0, 2 * np.pi, n)
    )
    assert normal.shape == axis.shape == (n, 3)
    np.testing.assert_allclose(np.linalg.norm(normal, axis=1), 1.0, rtol=1e-14)
    np.testing.assert_allclose(np.linalg.norm(axis, axis=1), 1.0, rtol=1e-14)
    np.testing.assert_allclose(np.einsum("ij,ij->i", normal, axis), 0.0, atol=1e-15)


def test_face_orientation_square_face():
    normal, axis = face_orientation(0.0)
    np.testing.assert_allclose(normal, [[1.0, 0.0, 0.0]], atol=1e-15)
    np.testing.assert_allclose(axis, [[0.0, 1.0, 0.0]], atol=1e-15)  # roll 0: tip toward +y


@pytest.mark.parametrize("tilt", [0.1, 0.4, 1.2])
def test_tilt_sign_open_and_closed(tilt):
    open_normal, _ = face_orientation(tilt)
    closed_normal, _ = face_orientation(-tilt)
    assert open_normal[0, 2] == pytest.approx(np.sin(tilt), rel=1e-14)  # open: normal up
    assert closed_normal[0, 2] == pytest.approx(-np.sin(tilt), rel=1e-14)  # closed: down
    assert open_normal[0, 0] > 0.0 and closed_normal[0, 0] > 0.0  # both face the far side


def test_azimuth_turns_normal_to_the_left():
    normal, axis = face_orientation(0.0, np.deg2rad(10.0))
    assert normal[0, 1] > 0.0
    assert normal[0, 2] == pytest.approx(0.0, abs=1e-15)
    assert axis[0, 2] == pytest.approx(0.0, abs=1e-15)  # roll 0 keeps the racket level


def test_roll_conventions():
    _, serve = face_orientation(0.3, 0.0, np.pi / 2)
    assert serve[0, 2] == pytest.approx(np.cos(0.3), rel=1e-14)  # tip up, leaning with the face
    _, forehand = face_orientation(0.0, 0.0, np.pi)
    np.testing.assert_allclose(forehand, [[0.0, -1.0, 0.0]], atol=1e-15)  # tip toward -y


def test_face_orientation_scalar_list_array():
    n1, a1 = face_orientation(0.2, 0.1, 0.3)
    n2, a2 = face_orientation([0.2, -0.2], 0.1, [0.3, 0.3])
    assert n1.shape == (1, 3) and n2.shape == (2, 3)
    np.testing.assert_allclose(n2[0], n1[0], rtol=1e-15)
    np.testing.assert_allclose(a2[0], a1[0], rtol=1e-15)
    with pytest.raises(ValueError, match="1-D"):
        face_orientation(np.zeros((2, 2)))


def test_swing_velocity_magnitude_and_direction():
    rng = np.random.default_rng(6)
    n = 50_000
    speed = rng.uniform(0.0, 45.0, n)
    path = rng.uniform(-np.pi / 2, np.pi / 2, n)
    v = swing_velocity(speed, path, rng.uniform(-np.pi, np.pi, n))
    assert v.shape == (n, 3)
    np.testing.assert_allclose(np.linalg.norm(v, axis=1), speed, rtol=1e-14)
    np.testing.assert_allclose(v[:, 2], speed * np.sin(path), rtol=1e-14, atol=1e-14)
    low_to_high = swing_velocity(30.0, np.deg2rad(20.0))
    assert low_to_high[0, 2] > 0.0 and low_to_high[0, 0] > 0.0
    np.testing.assert_allclose(swing_velocity(30.0), [[30.0, 0.0, 0.0]], atol=1e-14)
    np.testing.assert_allclose(swing_velocity(30.0, 0.0, np.pi / 2), [[0.0, 30.0, 0.0]], atol=1e-14)


def test_swing_velocity_scalar_list_array():
    assert swing_velocity(30.0, 0.1, 0.2).shape == (1, 3)
    assert swing_velocity([30.0, 31.0, 32.0], 0.1, 0.2).shape == (3, 3)
    assert swing_velocity(np.full(1000, 30.0), np.zeros(1000)).shape == (1000, 3)
