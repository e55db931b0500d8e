"""Forces on a ball in flight, as accelerations, and the parameters they need.

The hot path works on component-first arrays shaped ``(3, N)`` (one row per axis), which keeps
each component contiguous for numpy. The public :func:`acceleration` takes and returns the
project's usual ``(N, 3)`` layout.
"""

from __future__ import annotations

from dataclasses import dataclass, field

import numpy as np

from .aero import StepanekAero
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
        Aerodynamic model with ``drag(S)`` and ``lift_slope(S)`` (see :mod:`flight.aero`).
    spin_decay_rate : float
        Exponential spin decay rate ``k`` [1/s]: ``w(t) = w0 exp(-k t)``. The default 0 keeps
        the spin constant: no decay law for tennis balls has been published, and the losses over
        a 1-2 s flight are small (a few per cent, from memory). Set a rate when you have one.
    wind : array of 3
        Wind velocity in the court frame [m/s], uniform and steady.
    gravity : float
        Gravitational acceleration [m/s^2], standard gravity by default.
    """

    mass: float = 0.0577
    radius: float = 0.0335
    air_density: float = ISA_SEA_LEVEL_DENSITY
    aero: object = field(default_factory=StepanekAero)
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
