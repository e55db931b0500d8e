"""Moment-of-inertia ratio ``alpha = I / (m r^2)`` of a ball.

``alpha`` sets how strongly a tangential impulse at the contact point changes the spin compared
with the linear velocity: a friction impulse ``J`` (per unit mass) changes the centre-of-mass speed
by ``J`` and the surface speed ``r w`` by ``J / alpha``.
"""

from __future__ import annotations

import numpy as np
from numpy.typing import ArrayLike, NDArray

__all__ = [
    "SOLID_SPHERE_ALPHA",
    "THIN_SHELL_ALPHA",
    "TENNIS_BALL_ALPHA",
    "MAX_ALPHA",
    "thick_shell_alpha",
    "alpha_from_moment_of_inertia",
    "kinetic_energy_per_unit_mass",
]

#: ``alpha`` of a uniform solid sphere [-].
SOLID_SPHERE_ALPHA = 0.4
#: ``alpha`` of a thin spherical shell [-]; the largest value a ball whose mass lies within its
#: radius can have.
THIN_SHELL_ALPHA = 2.0 / 3.0
#: Largest physically possible ``alpha`` of a ball (all mass at its surface) [-].
MAX_ALPHA = THIN_SHELL_ALPHA
#: Typical ``alpha`` of a pressurised tennis ball [-] (common practice).
TENNIS_BALL_ALPHA = 0.55


def _as_float_array(value: ArrayLike, name: str) -> NDArray[np.float64]:
    try:
        array = np.asarray(value, dtype=np.float64)
    except (TypeError, ValueError) as exc:
        raise ValueError(f"{name} must be a real number or an array of real numbers") from exc
    if not np.all(np.isfinite(array)):
        raise ValueError(f"{name} must be finite")
    return array


def _scalar_or_array(array: NDArray[np.float64]) -> float | NDArray[np.float64]:
    return float(array) if array.ndim == 0 else array


def thick_shell_alpha(inner_radius: ArrayLike, outer_radius: ArrayLike) -> float | NDArray:
    r"""Moment-of-inertia ratio of a uniform thick spherical shell.

    Parameters
    ----------
    inner_radius : float or array_like
        Inner radius of the shell wall [m]; ``0 <= inner_radius <= outer_radius``.
        ``0`` is a solid sphere.
    outer_radius : float or array_like
        Outer radius of the ball [m]; ``> 0``. Broadcasts with ``inner_radius``.

    Returns
    -------
    float or numpy.ndarray
        ``alpha = I / (m r^2)`` [-], in ``[0.4, 2/3]``. A float for scalar input, otherwise an
        array of the broadcast shape.

    Raises
    ------
    ValueError
        If a radius is not finite, ``outer_radius <= 0``, ``inner_radius < 0`` or
        ``inner_radius > outer_radius``.

    Notes
    -----
    For a uniform shell with radius ratio :math:`x = r_i / r_o`,

    .. math::

        \alpha = \frac{2}{5} \frac{1 - x^5}{1 - x^3}
               = \frac{2}{5} \frac{1 + x + x^2 + x^3 + x^4}{1 + x + x^2},

    the second form follows from dividing both factors by :math:`1 - x` and is evaluated here, so
    the thin-shell limit :math:`x \to 1` (:math:`\alpha = 2/3`) needs no special case and loses no
    precision. :math:`x = 0` gives the solid sphere, :math:`\alpha = 2/5`.

    References
    ----------
    .. [1] R. Cross, "Grip-slip behavior of a bouncing ball", Am. J. Phys. 70, 1093 (2002),
       doi:10.1119/1.1507792.

    Examples
    --------
    >>> round(thick_shell_alpha(0.0, 0.0335), 12)
    0.4
    >>> round(thick_shell_alpha(0.0335, 0.0335), 12)
    0.666666666667
    """
    inner = _as_float_array(inner_radius, "inner_radius")
    outer = _as_float_array(outer_radius, "outer_radius")
    if np.any(outer <= 0.0):
        raise ValueError("outer_radius must be > 0 [m]")
    if np.any(inner < 0.0):
        raise ValueError("inner_radius must be >= 0 [m]")
    inner, outer = np.broadcast_arrays(inner, outer)
    if np.any(inner > outer):
        raise ValueError("inner_radius must be <= outer_radius")
    x = inner / outer
    x2 = x * x
    alpha = 0.4 * (1.0 + x + x2 + x2 * x + x2 * x2) / (1.0 + x + x2)
    return _scalar_or_array(alpha)


def alpha_from_moment_of_inertia(
    moment_of_inertia: ArrayLike, mass: ArrayLike, radius: ArrayLike
) -> float | NDArray:
    r"""Moment-of-inertia ratio from a measured moment of inertia.

    Parameters
    ----------
    moment_of_inertia : float or array_like
        Moment of inertia about a diameter [kg m^2]; ``> 0``.
    mass : float or array_like
        Ball mass [kg]; ``> 0``.
    radius : float or array_like
        Ball radius [m]; ``> 0``.

    Returns
    -------
    float or numpy.ndarray
        ``alpha = I / (m r^2)`` [-].

    Raises
    ------
    ValueError
        If an input is not finite or not positive, or if the result exceeds 2/3, which no ball
        with its mass inside its radius can have.

    Notes
    -----
    .. math:: \alpha = \frac{I}{m r^2}, \qquad 0 < \alpha \le \frac{2}{3}.

    The bound holds because every mass element at distance :math:`s \le r` from the centre
    contributes :math:`\tfrac{2}{3} s^2 \, dm` on average over the three axes.

    References
    ----------
    .. [1] R. Cross, "Grip-slip behavior of a bouncing ball", Am. J. Phys. 70, 1093 (2002),
       doi:10.1119/1.1507792.
    """
    inertia = _as_float_array(moment_of_inertia, "moment_of_inertia")
    m = _as_float_array(mass, "mass")
    r = _as_float_array(radius, "radius")
    if np.any(inertia <= 0.0):
        raise ValueError("moment_of_inertia must be > 0 [kg m^2]")
    if np.any(m <= 0.0):
        raise ValueError("mass must be > 0 [kg]")
    if np.any(r <= 0.0):
        raise ValueError("radius must be > 0 [m]")
    alpha = inertia / (m * r * r)
    if np.any(alpha > MAX_ALPHA * (1.0 + 1e-12)):
        raise ValueError(
            "moment_of_inertia / (mass * radius**2) must be <= 2/3 (thin shell); "
            "check the units of moment_of_inertia [kg m^2], mass [kg] and radius [m]"
        )
    return _scalar_or_array(alpha)


def kinetic_energy_per_unit_mass(
    velocity: ArrayLike, spin: ArrayLike, radius: ArrayLike, alpha: ArrayLike
) -> float | NDArray:
    r"""Translational plus rotational kinetic energy of a ball, per unit mass.

    Parameters
    ----------
    velocity : array_like, shape (..., 3)
        Centre-of-mass velocity [m/s].
    spin : array_like, shape (..., 3)
        Angular velocity [rad/s].
    radius : float or array_like, shape (...)
        Ball radius [m]; ``> 0``.
    alpha : float or array_like, shape (...)
        Moment-of-inertia ratio ``I / (m r^2)`` [-]; ``> 0``.

    Returns
    -------
    float or numpy.ndarray, shape (...)
        Kinetic energy divided by the ball mass [J/kg = m^2/s^2].

    Notes
    -----
    With :math:`I = \alpha m r^2` about every diameter (a spherically symmetric ball),

    .. math::

        \frac{E}{m} = \tfrac{1}{2} |\mathbf{v}|^2
                    + \tfrac{1}{2} \alpha r^2 |\boldsymbol{\omega}|^2.

    References
    ----------
    .. [1] R. Cross, "Grip-slip behavior of a bouncing ball", Am. J. Phys. 70, 1093 (2002),
       doi:10.1119/1.1507792.
    """
    v = _as_float_array(velocity, "velocity")
    w = _as_float_array(spin, "spin")
    if v.shape[-1:] != (3,):
        raise ValueError(f"velocity must have shape (..., 3) [m/s]; got {v.shape}")
    if w.shape[-1:] != (3,):
        raise ValueError(f"spin must have shape (..., 3) [rad/s]; got {w.shape}")
    r = _as_float_array(radius, "radius")
    a = _as_float_array(alpha, "alpha")
    if np.any(r <= 0.0):
        raise ValueError("radius must be > 0 [m]")
    if np.any(a <= 0.0):
        raise ValueError("alpha must be > 0 [-]")
    energy = 0.5 * np.sum(v * v, axis=-1) + 0.5 * a * r * r * np.sum(w * w, axis=-1)
    return _scalar_or_array(np.asarray(energy))
