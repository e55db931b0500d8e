"""Test-wide settings.

- The tests run against the installed package. ``python -m pytest`` puts the working directory
  (the repository root) first on ``sys.path``, where the source folder ``rallyarc/`` would
  shadow the installed ``rallyarc`` and lack the stage packages that the install maps into it
  (``rallyarc.impact``, ``rallyarc.flight``, ...). The root is dropped here, before any test
  imports the package; an editable install still resolves to the working tree through its own
  import hook.
- hypothesis runs derandomized so that every run checks the same cases.
"""

import os
import sys
from pathlib import Path

ROOT = Path(__file__).resolve().parents[1]
sys.path[:] = [p for p in sys.path if Path(p or os.getcwd()).resolve() != ROOT]

import pytest  # noqa: E402
from hypothesis import settings  # noqa: E402

settings.register_profile("rallyarc", derandomize=True, deadline=None)
settings.load_profile("rallyarc")


@pytest.fixture(scope="session")
def scattered_incoming():
    """A factory ``make(n, seed)`` of n incoming balls scattered around the demo scenario's:
    the contact moved by about 0.5, 1.5 and 0.2 m (height kept within 0.4-1.6 m), the velocity
    scaled by 0.7-1.3 and jittered by 1 m/s, the spin scaled by -0.5 to 1.5. Returns the demo
    scenario, the balls (a ``BallState``) and the random generator that drew them, for the
    caller's further draws."""
    import numpy as np

    from rallyarc import domain
    from rallyarc.shot import BallState

    def make(n, seed):
        rng = np.random.default_rng(seed)
        sc = domain.load_scenario("demo")
        inc = BallState.of(*domain.incoming_state(sc.incoming))
        pos = inc.position + rng.normal(0.0, [0.5, 1.5, 0.2], (n, 3))
        pos[:, 2] = np.clip(pos[:, 2], 0.4, 1.6)
        vel = inc.velocity * rng.uniform(0.7, 1.3, (n, 1)) + rng.normal(0.0, 1.0, (n, 3))
        spin = inc.spin * rng.uniform(-0.5, 1.5, (n, 1))
        return sc, BallState(pos, vel, spin), rng

    return make


@pytest.fixture(scope="session")
def same_rallies():
    """A check ``same(got, want, rtol, atol)`` that two rally runs played the same rallies: equal
    rally tables and shot tables with the same columns and rows, floats within the tolerances
    (NaN in the same places), everything else equal."""
    import numpy as np
    import pandas as pd

    def same(got, want, rtol, atol):
        pd.testing.assert_frame_equal(got.rallies, want.rallies)
        assert list(got.shots.columns) == list(want.shots.columns)
        assert len(got.shots) == len(want.shots) > 600
        for col in want.shots.columns:
            a, b = got.shots[col].to_numpy(), want.shots[col].to_numpy()
            if b.dtype.kind == "f":
                np.testing.assert_array_equal(np.isnan(a), np.isnan(b), err_msg=col)
                np.testing.assert_allclose(a, b, rtol=rtol, atol=atol, err_msg=col)
            else:
                np.testing.assert_array_equal(a, b, err_msg=col)

    return same
