"""Court pace rating (CPR) of a surface, following the ITF test method CS 01/02.

The test fires a ball at 30 m/s and 16 degrees to the surface with little spin, measures the
horizontal and vertical velocity components just before and after the bounce, and derives a
friction and a restitution coefficient from them, assuming the ball slides throughout the
contact. :func:`rate_surface` simulates that test with :func:`bounce.contact.bounce`, so it also
shows when that assumption fails (the ball grips and the measured friction is lower than the
surface's true friction).
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np
from numpy.typing import ArrayLike, NDArray

from .ball import TENNIS_BALL_ALPHA
from .contact import Surface, bounce

__all__ = [
    "PACE_TEST_SPEED_MPS",
    "PACE_TEST_ANGLE_RAD",
    "PACE_TEST_MAX_SPIN_RAD_S",
    "REFERENCE_TEMPERATURE_C",
    "TEMPERATURE_RANGE_C",
    "CATEGORY_NAMES",
    "PaceRating",
    "court_pace_rating",
    "pace_category",
    "rate_surface",
]

#: Ball speed of the test impact [m/s] (ITF CS 01/02: 30 +- 2 m/s).
PACE_TEST_SPEED_MPS = 30.0
#: Angle of the test impact to the surface [rad] (ITF CS 01/02: 16 +- 2 degrees).
PACE_TEST_ANGLE_RAD = math.radians(16.0)
#: Largest spin the test allows, 3 rev/s [rad/s].
PACE_TEST_MAX_SPIN_RAD_S = 3.0 * 2.0 * math.pi
#: Temperature to which the standard corrects the measured restitution [C].
REFERENCE_TEMPERATURE_C = 23.0
#: Temperatures accepted by this module [C]; the linear correction is not meant for extremes.
TEMPERATURE_RANGE_C = (-10.0, 50.0)
#: ITF court pace categories by number.
CATEGORY_NAMES = {
    1: "slow",
    2: "medium-slow",
    3: "medium",
    4: "medium-fast",
    5: "fast",
}
# Lower CPR bound of categories 2, 3, 4 and 5; below 30 is category 1.
_CATEGORY_LOWER_BOUNDS = np.array([30.0, 35.0, 40.0, 45.0])
# CPR values are rounded to this many decimals before they are compared with the bounds, so that
# floating-point rounding in the formula (e.g. 44.99999999999999 for an exact 45) cannot change the
# category.
_CATEGORY_DECIMALS = 9


@dataclass(frozen=True)
class PaceRating:
    """Court pace rating of a surface obtained by simulating the ITF CS 01/02 test impact.

    Attributes
    ----------
    court_pace_rating : float
        CPR [-].
    category : int
        ITF pace category, 1 (slow) to 5 (fast).
    category_name : str
        ``"slow"``, ``"medium-slow"``, ``"medium"``, ``"medium-fast"`` or ``"fast"``.
    measured_friction : float
        Friction coefficient the test derives from the simulated velocities [-].
    measured_restitution : float
        Restitution the test derives from the simulated velocities, at ``temperature_c`` [-].
    temperature_corrected_restitution : float
        ``measured_restitution`` corrected to 23 C [-].
    temperature_c : float
        Temperature of the test [C].
    ball_gripped : bool
        True when the simulated ball gripped during the test impact, so that
        ``measured_friction < surface_friction``.
    surface_friction : float
        The surface's sliding friction coefficient ``mu`` [-].
    note : str
        Explanation when the rating does not measure the surface's true friction; empty otherwise.
    """

    court_pace_rating: float
    category: int
    category_name: str
    measured_friction: float
    measured_restitution: float
    temperature_corrected_restitution: float
    temperature_c: float
    ball_gripped: bool
    surface_friction: float
    note: str


def _check_temperature(temperature_c: ArrayLike) -> NDArray[np.float64]:
    low, high = TEMPERATURE_RANGE_C
    t = np.asarray(temperature_c, dtype=np.float64)
    if not np.all(np.isfinite(t)) or np.any(t < low) or np.any(t > high):
        raise ValueError(f"temperature_c must be in [{low:g}, {high:g}] [C]")
    return t


def court_pace_rating(
    measured_friction: ArrayLike,
    measured_restitution: ArrayLike,
    temperature_c: ArrayLike = REFERENCE_TEMPERATURE_C,
) -> float | NDArray:
    r"""Court pace rating from a measured friction and restitution (the formula only).

    Parameters
    ----------
    measured_friction : float or array_like
        Friction coefficient measured in the test impact [-]; ``>= 0``.
    measured_restitution : float or array_like
        Vertical restitution measured in the test impact at ``temperature_c`` [-]; in ``[0, 1]``.
    temperature_c : float or array_like, optional
        Temperature during the test [C]; in ``[-10, 50]``; default 23.

    Returns
    -------
    float or numpy.ndarray
        CPR [-]; a float for scalar inputs, otherwise an array of the broadcast shape. Higher is
        faster; see :func:`pace_category`.

    Raises
    ------
    ValueError
        If ``measured_friction < 0``, ``measured_restitution`` is outside ``[0, 1]``, an input
        is not finite, or ``temperature_c`` is outside ``[-10, 50]``.

    Notes
    -----
    .. math::

        e_T = e + 0.003\,(23 - T), \qquad
        \mathrm{CPR} = 100\,(1 - \mu) + 150\,(0.81 - e_T),

    with :math:`T` in C. A surface tested warmer than 23 C has its restitution lowered by the
    correction, which raises its CPR.

    References
    ----------
    .. [1] International Tennis Federation, ITF Guide to Test Methods for Tennis Court Surfaces,
       test method ITF CS 01/02: Court Pace Rating.

    Examples
    --------
    >>> round(court_pace_rating(0.6, 0.80), 9)
    41.5
    """
    mu = np.asarray(measured_friction, dtype=np.float64)
    e = np.asarray(measured_restitution, dtype=np.float64)
    if not np.all(np.isfinite(mu)) or np.any(mu < 0.0):
        raise ValueError("measured_friction must be finite and >= 0 [-]")
    if not np.all(np.isfinite(e)) or np.any(e < 0.0) or np.any(e > 1.0):
        raise ValueError("measured_restitution must be in [0, 1] [-]")
    t = _check_temperature(temperature_c)
    e_corrected = e + 0.003 * (REFERENCE_TEMPERATURE_C - t)
    cpr = 100.0 * (1.0 - mu) + 150.0 * (0.81 - e_corrected)
    return float(cpr) if cpr.ndim == 0 else cpr


def pace_category(court_pace_rating: ArrayLike) -> int | NDArray:
    """ITF court pace category of a CPR value.

    Parameters
    ----------
    court_pace_rating : float or array_like
        CPR [-].

    Returns
    -------
    int or numpy.ndarray of int
        1 slow (CPR < 30), 2 medium-slow (30 to < 35), 3 medium (35 to < 40), 4 medium-fast
        (40 to < 45), 5 fast (>= 45). An int for scalar input, otherwise an integer array of the
        input shape. Names are in :data:`CATEGORY_NAMES`.

    Raises
    ------
    ValueError
        If a value is not finite.

    Notes
    -----
    The standard lists the categories as CPR 0-29, 30-34, 35-39, 40-44 and 45 and up; here
    they are half-open intervals so that non-integer CPR values fall in one category. Values are
    rounded to 9 decimals first, so floating-point rounding of the formula does not move a value
    that is exactly on a bound.

    References
    ----------
    .. [1] International Tennis Federation, ITF Guide to Test Methods for Tennis Court Surfaces,
       test method ITF CS 01/02: Court Pace Rating.
    """
    cpr = np.asarray(court_pace_rating, dtype=np.float64)
    if not np.all(np.isfinite(cpr)):
        raise ValueError("court_pace_rating must be finite")
    category = 1 + np.searchsorted(
        _CATEGORY_LOWER_BOUNDS, np.round(cpr, _CATEGORY_DECIMALS), side="right"
    )
    return int(category) if category.ndim == 0 else category.astype(np.int64)


def rate_surface(
    surface: Surface,
    radius: float = 0.0335,
    alpha: float = TENNIS_BALL_ALPHA,
    temperature_c: float = REFERENCE_TEMPERATURE_C,
    spin: float = 0.0,
) -> PaceRating:
    r"""Rate a surface by simulating the ITF CS 01/02 court pace test impact.

    Parameters
    ----------
    surface : Surface
        The surface; its properties are taken as those at ``temperature_c``.
    radius : float, optional
        Ball radius [m]; default 0.0335.
    alpha : float, optional
        Ball moment-of-inertia ratio ``I / (m r^2)`` [-]; default 0.55.
    temperature_c : float, optional
        Temperature of the test [C], in ``[-10, 50]``; default 23.
    spin : float, optional
        Spin of the test ball about the horizontal axis across its travel [rad/s], positive
        topspin, negative backspin; ``|spin| <= 3 rev/s = 18.85 rad/s`` as the standard allows;
        default 0.

    Returns
    -------
    PaceRating
        Rating, category, the measured and corrected coefficients, and whether the ball gripped.

    Raises
    ------
    ValueError
        If ``temperature_c`` or ``spin`` is out of range, and as :func:`bounce.contact.bounce`.

    Notes
    -----
    The ball arrives at :math:`s = 30` m/s and :math:`\theta = 16^\circ`,
    :math:`\mathbf v_1 = (s\cos\theta, 0, -s\sin\theta)`, spin :math:`(0, \omega, 0)`, and is
    bounced with :func:`bounce.contact.bounce`. From the velocities the standard measures

    .. math::

        e = \frac{v_{2z}}{|v_{1z}|}, \qquad
        \mu_\mathrm{m} = \frac{v_{1x} - v_{2x}}{|v_{1z}| + v_{2z}},

    and the rating follows from :func:`court_pace_rating`. Because
    :math:`|v_{1z}| + v_{2z} = J_n` and :math:`v_{1x} - v_{2x} = J`, the measured friction is
    :math:`J / J_n`: exactly the surface's :math:`\mu` when the ball slides throughout, and
    :math:`J_\mathrm{grip} / J_n < \mu` when it grips. A spin-free ball grips at 16 degrees when
    :math:`\mu \ge \alpha / ((1+\alpha)(1+e)\tan 16^\circ)`, about 0.69 for
    :math:`\alpha = 0.55, e = 0.8`; such a rating then measures the grip, not the surface.

    References
    ----------
    .. [1] International Tennis Federation, ITF Guide to Test Methods for Tennis Court Surfaces,
       test method ITF CS 01/02: Court Pace Rating.
    .. [2] R. Cross, "Grip-slip behavior of a bouncing ball", Am. J. Phys. 70, 1093 (2002),
       doi:10.1119/1.1507792.
    """
    temperature = float(_check_temperature(temperature_c))
    spin_value = float(np.asarray(spin, dtype=np.float64))
    if not math.isfinite(spin_value) or abs(spin_value) > PACE_TEST_MAX_SPIN_RAD_S:
        raise ValueError(
            f"spin must be within +-{PACE_TEST_MAX_SPIN_RAD_S:.4f} rad/s (3 rev/s) [rad/s]"
        )
    if not isinstance(surface, Surface):
        raise ValueError(f"surface must be a Surface; got {type(surface).__name__}")
    speed = PACE_TEST_SPEED_MPS
    v_in = np.array(
        [speed * math.cos(PACE_TEST_ANGLE_RAD), 0.0, -speed * math.sin(PACE_TEST_ANGLE_RAD)]
    )
    result = bounce(v_in, np.array([0.0, spin_value, 0.0]), radius, alpha, surface)
    v_out = result.velocity
    normal_in = -v_in[2]
    measured_restitution = float(v_out[2] / normal_in)
    measured_friction = float((v_in[0] - v_out[0]) / (normal_in + v_out[2]))
    e_corrected = measured_restitution + 0.003 * (REFERENCE_TEMPERATURE_C - temperature)
    cpr = court_pace_rating(measured_friction, measured_restitution, temperature)
    category = pace_category(cpr)
    gripped = bool(result.grip)
    note = ""
    if gripped:
        note = (
            "The simulated ball gripped the surface during the test impact, so the measured "
            f"friction {measured_friction:.3f} is below the surface's sliding friction "
            f"{surface.friction:.3f}: the test assumes the ball slides throughout, and this "
            "rating reflects the grip limit rather than the surface friction."
        )
    return PaceRating(
        court_pace_rating=cpr,
        category=category,
        category_name=CATEGORY_NAMES[category],
        measured_friction=measured_friction,
        measured_restitution=measured_restitution,
        temperature_corrected_restitution=e_corrected,
        temperature_c=temperature,
        ball_gripped=gripped,
        surface_friction=surface.friction,
        note=note,
    )
