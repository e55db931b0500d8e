"""The ITF drop test simulated with air drag: a ball's rebound for a given restitution."""

from __future__ import annotations

import numpy as np

from rallyarc.flight.forces import FlightParams
from rallyarc.flight.integrate import apex, fly, ground_contact

#: Drop height of the ITF rebound test, to the bottom of the ball [m] (ITF Rules, Appendix I).
DROP_HEIGHT_M = 2.54


def drop_test_rebound(ball, restitution=None, air_density_kgm3=1.204):
    """Rebound height [m] of the ITF drop test, simulated with air drag.

    The ball falls from rest with its bottom at 2.54 m onto a rigid surface, leaves it with
    ``restitution`` times its arrival speed (its own restitution by default), and rises to its
    apex; the rebound is the apex height of the ball's bottom. Air: 20 C dry air at sea level
    (1.204 kg/m^3), the test's temperature.

    Parameters
    ----------
    ball : Ball
    restitution : float or array (N,), optional

    Returns
    -------
    numpy.ndarray
        ``(N,)`` rebound heights [m].
    """
    e = np.atleast_1d(np.asarray(ball.restitution if restitution is None else restitution, float))
    params = FlightParams(
        mass=ball.mass, radius=ball.radius, air_density=air_density_kgm3, aero=ball.aero
    )
    start = np.tile([0.0, 0.0, DROP_HEIGHT_M + ball.radius], (1, 1))
    down = fly(
        start,
        np.zeros((1, 3)),
        np.zeros((1, 3)),
        params,
        [ground_contact(ball.radius)],
        rtol=1e-9,
        atol=1e-10,
    )
    v_in = -down.velocity[0, 2]
    n = e.size
    up = fly(
        np.tile([0.0, 0.0, ball.radius], (n, 1)),
        np.stack([np.zeros(n), np.zeros(n), e * v_in], axis=1),
        np.zeros((n, 3)),
        params,
        [apex(), ground_contact(ball.radius)],
        rtol=1e-9,
        atol=1e-10,
    )
    return up.events["apex"].position[:, 2] - ball.radius
