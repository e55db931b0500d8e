"""The plain-float right-hand side of the per-shot reference is the project's force function
written out: both give the same shots (a check of the benchmark's fair baseline)."""

import numpy as np
import pytest

from rallyarc import domain
from rallyarc.batch import RandomShots
from rallyarc.flight.aero import AERO_MODELS
from rallyarc.flight.forces import FlightParams, acceleration
from rallyarc.reference import REFERENCE, _numpy_rhs, _plain_rhs, play_shots


@pytest.mark.parametrize("model", sorted(AERO_MODELS))
def test_plain_and_numpy_right_hand_sides_agree_for_every_aero_model(model):
    rng = np.random.default_rng(4)
    params = FlightParams(aero=AERO_MODELS[model], spin_decay_rate=0.3, wind=(1.0, -0.5, 0.2))
    for _ in range(50):
        w0 = rng.normal(0.0, 300.0, 3)
        y = np.concatenate([rng.normal(0.0, 3.0, 3), rng.normal(0.0, 20.0, 3)])
        t = rng.uniform(0.0, 1.0)
        a = np.asarray(_plain_rhs(w0, 0.0, params)(t, y))
        b = _numpy_rhs(w0, 0.0, params)(t, y)
        # same formulas, floating-point rounding only (not a published value)
        np.testing.assert_allclose(a, b, rtol=1e-12, atol=1e-12)
        spin = w0 * np.exp(-0.3 * t)
        np.testing.assert_allclose(a[3:], acceleration(y[3:][None], spin[None], params)[0],
                                   rtol=1e-12, atol=1e-12)  # fmt: skip


def test_plain_reference_plays_the_same_shots():
    conditions = domain.load_scenario("demo").conditions
    incoming, swing, serve = RandomShots(12, seed=3).take(0, 12)
    a = play_shots(incoming, swing, conditions, serve, **REFERENCE)
    b = play_shots(incoming, swing, conditions, serve, **REFERENCE, rhs="plain")
    assert list(a["outcome"]) == list(b["outcome"])
    # DOP853 at rtol 1e-10 on both: landings agree far below a micrometre
    np.testing.assert_allclose(a["land_x_m"], b["land_x_m"], atol=1e-7, equal_nan=True)
    np.testing.assert_allclose(a["land_y_m"], b["land_y_m"], atol=1e-7, equal_nan=True)
