"""Forces on a ball in flight, as accelerations, and the parameters they need.

The hot path works on component-first arrays shaped ``(3, N)`` (one row per axis), which keeps
each component contiguous for numpy. The public :func:`acceleration` takes and returns the
project's usual ``(N, 3)`` layout.
"""

from __future__ import annotations

from dataclasses import dataclass, field

import numpy as np

from .aero import CrossLindseyAero
from .air import G0, ISA_SEA_LEVEL_DENSITY


def _vector3(value, name):
    vec = np.asarray(value, dtype=float).reshape(-1)
    if vec.shape != (3,) or not np.all(np.isfinite(vec)):
        raise ValueError(f"{name} must be three finite numbers")
    return vec


@dataclass(frozen=True)
class FlightParams:
    """What the flight of one kind of ball in one kind of air depends on.

    Parameters
    ----------
    mass : float
        Ball mass [kg].
    radius : float
        Ball radius [m].
    air_density : float
        Air density [kg/m^3] (see :mod:`flight.air`); 0 gives flight in a vacuum.
    aero : object
        Aerodynamic model with ``drag(S)`` and ``lift_slope(S)`` (see :mod:`flight.aero`);
        default the free-flight model of Cross and Lindsey (2014).
    spin_decay_rate : float
        Exponential spin decay rate ``k`` [1/s]: ``w(t) = w0 exp(-k t)``. 0 (default here)
        keeps the spin constant; :func:`spin_decay_rate` gives a rate from the aerodynamic
        torque, which the application uses by default.
    wind : array of 3
        Wind velocity in the court frame [m/s], uniform and steady.
    gravity : float
        Gravitational acceleration [m/s^2], standard gravity by default.
    """

    mass: float = 0.0577
    radius: float = 0.0335
    air_density: float = ISA_SEA_LEVEL_DENSITY
    aero: object = field(default_factory=CrossLindseyAero)
    spin_decay_rate: float = 0.0
    wind: tuple = (0.0, 0.0, 0.0)
    gravity: float = G0

    def __post_init__(self):
        checks = (
            ("mass", self.mass, 1e-4, 10.0),
            ("radius", self.radius, 1e-3, 1.0),
            ("air_density", self.air_density, 0.0, 5.0),
            ("spin_decay_rate", self.spin_decay_rate, 0.0, 100.0),
            ("gravity", self.gravity, 0.0, 100.0),
        )
        for name, value, low, high in checks:
            if not (np.isfinite(value) and low <= value <= high):
                raise ValueError(f"{name} must lie in {low} to {high}, got {value}")
        object.__setattr__(self, "wind", tuple(_vector3(self.wind, "wind")))

    @property
    def area(self):
        """Cross-section ``pi r^2`` [m^2]."""
        return np.pi * self.radius**2

    @property
    def drag_factor(self):
        """``rho A / (2 m)`` [1/m]: drag acceleration is this times ``C_D v^2``."""
        return self.air_density * self.area / (2.0 * self.mass)


#: Torque parameter of the spin-down model [-]: the lift force's line of action passes this
#: fraction of the radius from the ball's centre. 0.1 is the illustrative value of Nathan (2008);
#: no tennis measurement has been confirmed for this project.
SPIN_DECAY_TORQUE_PARAMETER = 0.1
#: Ball speed and spin parameter at which :func:`spin_decay_rate` is evaluated for a whole
#: flight by default: a rally drive (about 90 km/h, 2000 rpm), `common practice`.
SPIN_DECAY_REFERENCE_SPEED_MPS = 25.0
SPIN_DECAY_REFERENCE_SPIN_PARAMETER = 0.28


def spin_decay_rate(
    air_density,
    radius,
    mass,
    alpha,
    aero,
    speed=SPIN_DECAY_REFERENCE_SPEED_MPS,
    spin_parameter=SPIN_DECAY_REFERENCE_SPIN_PARAMETER,
    torque_parameter=SPIN_DECAY_TORQUE_PARAMETER,
):
    r"""Exponential spin decay rate from the aerodynamic torque on a spinning ball [1/s].

    Parameters
    ----------
    air_density : float
        Air density [kg/m^3].
    radius : float
        Ball radius [m].
    mass : float
        Ball mass [kg].
    alpha : float
        Moment-of-inertia factor ``I / (m r^2)`` [-].
    aero : object
        Aerodynamic model; its ``lift_slope(S)`` gives ``C_L / S`` [-].
    speed : float, optional
        Ball speed at which the rate is evaluated [m/s].
    spin_parameter : float, optional
        Spin parameter ``S = r w / v`` at which ``C_L / S`` is evaluated [-].
    torque_parameter : float, optional
        Fraction ``k`` of the radius at which the lift force acts off the centre [-].

    Returns
    -------
    float
        ``lambda`` [1/s], so that ``w(t) = w0 exp(-lambda t)``.

    Notes
    -----
    The lift force ``F_L = 1/2 rho A C_L v^2`` is taken to act ``k r`` from the centre, so that
    its torque slows the spin:

    .. math:: \alpha m r^2 \frac{d\omega}{dt} = -k r \tfrac12 \rho A C_L v^2.

    With ``C_L = (C_L/S) r \omega / v`` this is exponential decay at the rate

    .. math:: \lambda = \frac{k \rho A v}{2 \alpha m} \frac{C_L}{S}.

    The rate depends on the speed; one rate for a whole flight is evaluated at a typical rally
    speed (the batch integrator's spin decay is exact for a constant rate). For a standard ball
    at sea level, 25 m/s and S = 0.28 it is about 0.11 1/s: about 10 % of the spin in a one-second
    flight.

    References
    ----------
    .. [1] A. M. Nathan, "The effect of spin-down on the flight of a baseball" (2008), eq. 2:
       the torque model and the torque parameter 0.1 of its numerical example.
    """
    area = np.pi * radius**2
    slope = float(np.asarray(aero.lift_slope(spin_parameter), dtype=float))
    return float(torque_parameter * air_density * area * speed * slope / (2.0 * alpha * mass))


def gravity_acceleration(params):
    """Gravity as a column ``(3, 1)`` [m/s^2]."""
    return np.array([[0.0], [0.0], [-params.gravity]])


def spin_at(spin0, t, params):
    """Spin after ``t`` seconds of exponential decay [rad/s].

    ``spin0`` is ``(3, N)``, ``t`` is ``(N,)``; the decay is exact, so spin needs no integration.
    """
    if params.spin_decay_rate == 0.0:
        return spin0
    return spin0 * np.exp(-params.spin_decay_rate * t)


def aerodynamic_acceleration(air_velocity, spin, params):
    """Drag and Magnus lift on balls moving through the air, component-first ``(3, N)`` [m/s^2].

    Parameters
    ----------
    air_velocity : array (3, N)
        Ball velocity relative to the air [m/s].
    spin : array (3, N)
        Spin vector [rad/s].
    params : FlightParams

    Notes
    -----
    Drag ``F_D = -1/2 rho A C_D |v| v``; lift ``F_L = 1/2 rho A C_L v^2 (w x v) / |w x v|``.
    With the spin parameter ``S = r |w x v| / v^2`` (only the spin across the path lifts) the
    lift is ``1/2 rho A r (C_L / S) (w x v)``, finite for a ball without spin.

    References
    ----------
    Stepanek, A. (1988), Am. J. Phys. 56:138-142.
    """
    vx, vy, vz = air_velocity
    wx, wy, wz = spin
    speed2 = vx * vx + vy * vy + vz * vz
    # w x v, one component at a time (no (3, N) temporaries on the hot path)
    cx = wy * vz - wz * vy
    cy = wz * vx - wx * vz
    cz = wx * vy - wy * vx
    s = params.radius * np.sqrt(cx * cx + cy * cy + cz * cz) / np.maximum(speed2, 1e-300)
    k = params.drag_factor
    drag = -k * params.aero.drag(s) * np.sqrt(speed2)  # times v
    lift = k * params.radius * params.aero.lift_slope(s)  # times w x v
    out = np.empty((3,) + np.shape(cx))
    out[0] = drag * vx + lift * cx
    out[1] = drag * vy + lift * cy
    out[2] = drag * vz + lift * cz
    return out


def acceleration(velocity, spin, params):
    """Total acceleration of balls in flight: gravity, drag and lift [m/s^2].

    Parameters
    ----------
    velocity : array (N, 3)
        Ball velocity over the ground [m/s].
    spin : array (N, 3)
        Spin vector [rad/s].
    params : FlightParams

    Returns
    -------
    array (N, 3)
    """
    v = np.atleast_2d(np.asarray(velocity, dtype=float)).T
    w = np.broadcast_to(np.atleast_2d(np.asarray(spin, dtype=float)).T, v.shape)
    air = v - np.asarray(params.wind)[:, None]
    return (gravity_acceleration(params) + aerodynamic_acceleration(air, w, params)).T
