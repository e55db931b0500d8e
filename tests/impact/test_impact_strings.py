"""String-bed restitution against impact speed (scalar, list, array) and the spring-back default."""

import numpy as np
import pytest

from rallyarc.impact.strings import (
    DEFAULT_STRING_TANGENTIAL_RESTITUTION,
    STRING_RESTITUTION_REFERENCE_SPEED_MPS,
    string_restitution,
)


def test_restitution_holds_at_the_reference_speed_and_is_constant_without_slope():
    v_ref = STRING_RESTITUTION_REFERENCE_SPEED_MPS
    assert float(string_restitution(0.85, v_ref, -0.004)) == pytest.approx(0.85, abs=1e-15)
    np.testing.assert_array_equal(string_restitution(0.85, [5.0, 30.0, 60.0]), 0.85)


def test_restitution_is_linear_in_speed_and_clipped_for_many_balls():
    # exact: e = e_ref + s (|v| - v_ref), clipped to [0, 1]
    speed = np.linspace(-80.0, 80.0, 1001)
    e = string_restitution(0.85, speed, -0.004)
    want = np.clip(0.85 - 0.004 * (np.abs(speed) - 30.0), 0.0, 1.0)
    np.testing.assert_allclose(e, want, rtol=0, atol=1e-15)
    assert string_restitution(0.85, 200.0, -0.01) == 0.0
    assert string_restitution(0.99, 0.0, -0.01) == 1.0


def test_default_spring_back_lies_in_the_physical_range():
    assert 0.0 < DEFAULT_STRING_TANGENTIAL_RESTITUTION < 1.0
