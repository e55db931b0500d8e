"""Ball-court contact of a ball that compresses: the friction acts below the centre at the
flattened contact, not at the full radius.

Same frame, units and batch shapes as :mod:`bounce.contact`.
"""

from __future__ import annotations

import math

import numpy as np
from numpy.typing import ArrayLike

from .contact import (
    BounceResult,
    Surface,
    _check_alpha,
    _check_radius,
    _per_ball,
    _slide_or_grip,
    _vectors,
    normal_restitution,
)

__all__ = [
    "ITF_DEFORMATION_LOAD_N",
    "ITF_FORWARD_DEFORMATION_M",
    "ITF_MAX_COMPRESSION_M",
    "DEFAULT_BALL_STIFFNESS_N_PER_M",
    "lever_ratio",
    "bounce_deforming",
]

#: Load of the ITF ball deformation test, 18 lb (8.165 kg) [N] (ITF Rules of Tennis, Appendix I).
ITF_DEFORMATION_LOAD_N = 8.165 * 9.80665
#: Mid-range forward deformation of an approved ball under that load, 0.56-0.74 cm [m]
#: (ITF Rules of Tennis, Appendix I).
ITF_FORWARD_DEFORMATION_M = 0.0065
#: Largest compression of the ITF deformation test, one inch [m] (ITF Rules of Tennis,
#: Appendix I); the compression used here never exceeds it.
ITF_MAX_COMPRESSION_M = 0.0254
#: Static stiffness of an approved ball [N/m], load over forward deformation (about 12.3 kN/m).
DEFAULT_BALL_STIFFNESS_N_PER_M = ITF_DEFORMATION_LOAD_N / ITF_FORWARD_DEFORMATION_M


def lever_ratio(normal_speed, radius, mass, stiffness=DEFAULT_BALL_STIFFNESS_N_PER_M):
    r"""Lever arm of the friction force about the centre, over the radius, of a compressed ball.

    Parameters
    ----------
    normal_speed : float or array_like
        Normal impact speed :math:`|v_z|` [m/s].
    radius : float or array_like
        Ball radius [m]; ``> 0``.
    mass : float or array_like
        Ball mass [kg]; ``> 0``.
    stiffness : float, optional
        Ball stiffness [N/m]; ``> 0``. Default :data:`DEFAULT_BALL_STIFFNESS_N_PER_M`.
        ``inf`` is a rigid ball (ratio 1).

    Returns
    -------
    numpy.ndarray
        :math:`q = R/r` [-] in ``(0, 1]``.

    Notes
    -----
    A ball of stiffness :math:`k` meeting the court at normal speed :math:`v_n` compresses by
    :math:`d = v_n\sqrt{m/k}` (a linear spring; capped at :data:`ITF_MAX_COMPRESSION_M`), and the
    normal force :math:`N \propto` compression follows a half sine. The friction force acts at the
    contact, :math:`r - x(t)` below the centre; weighted by the normal force (friction follows it
    while the ball slides) the mean lever arm is

    .. math:: R = r - \frac{\int x^2\,dt}{\int x\,dt} = r - \frac{\pi}{4} d,
              \qquad q = R / r.

    The static stiffness overstates the compression of a fast impact (a ball stiffens as it is
    compressed quickly), so :math:`q` is a lower bound of the lever arm ratio.

    References
    ----------
    .. [1] R. Cross, "Grip-slip behavior of a bouncing ball", Am. J. Phys. 70, 1093 (2002),
       doi:10.1119/1.1507792.
    .. [2] International Tennis Federation, Rules of Tennis, Appendix I (ball deformation test).
    """
    v = np.abs(_per_ball(normal_speed, "normal_speed", "[m/s]"))
    r = _check_radius(radius)
    m = _per_ball(mass, "mass", "[kg]")
    if np.any(m <= 0.0):
        raise ValueError("mass must be > 0 [kg]")
    if not stiffness > 0.0:
        raise ValueError("stiffness must be > 0 [N/m]")
    depth = np.minimum(v * np.sqrt(m / stiffness), ITF_MAX_COMPRESSION_M)
    return np.clip(1.0 - 0.25 * math.pi * depth / r, 0.05, 1.0)


def bounce_deforming(
    velocity: ArrayLike,
    spin: ArrayLike,
    radius: ArrayLike,
    alpha: ArrayLike,
    surface: Surface,
    mass: ArrayLike,
    stiffness: float = DEFAULT_BALL_STIFFNESS_N_PER_M,
) -> BounceResult:
    r"""Bounce a batch of compressing balls off a horizontal court with the slide-or-grip rule.

    Parameters
    ----------
    velocity, spin : array_like, shape (N, 3) or (3,)
        Velocity [m/s] and spin [rad/s] just before contact, court frame.
    radius : float or array_like, shape (N,)
        Ball radius [m]; ``> 0``.
    alpha : float or array_like, shape (N,)
        Moment-of-inertia ratio ``I / (m r^2)`` [-]; in ``(0, 2/3]``.
    surface : Surface
        Friction, normal restitution (possibly speed dependent) and tangential restitution.
    mass : float or array_like, shape (N,)
        Ball mass [kg]; ``> 0``.
    stiffness : float, optional
        Ball stiffness [N/m]; default :data:`DEFAULT_BALL_STIFFNESS_N_PER_M`. ``inf`` gives
        :func:`bounce.contact.bounce` exactly.

    Returns
    -------
    BounceResult
        As :func:`bounce.contact.bounce`; ``slip_in`` and ``slip_out`` are the velocities of the
        contact, :math:`R` below the centre.

    Notes
    -----
    As :func:`bounce.contact.bounce`, but the friction impulse acts at the lever arm
    :math:`R = q r` of :func:`lever_ratio` instead of :math:`r`. With
    :math:`\alpha' = \alpha / q^2` (the effective moment-of-inertia ratio about the contact):

    .. math:: \mathbf u = (v_x - R\omega_y,\ v_y + R\omega_x), \qquad
              J_\mathrm{grip} = \frac{\alpha'(1 + e_t)|\mathbf u|}{1 + \alpha'},

    the ball slides with :math:`J = \mu J_n` when :math:`\mu J_n < J_\mathrm{grip}`, else
    :math:`J = J_\mathrm{grip}`, and

    .. math:: \mathbf v_t' = \mathbf v_t - J\hat u, \qquad
              \boldsymbol\omega' = \boldsymbol\omega + \frac{J q\,(\hat z\times\hat u)}{\alpha r}.

    A sliding ball gains :math:`q` times the spin the rigid model gives it; the normal rebound
    and the horizontal speed lost while sliding are unchanged, so the court pace test's
    friction and restitution keep their meaning. The impulse never takes the contact's slip
    beyond :math:`-e_t\mathbf u`, so the bounce never adds kinetic energy for
    :math:`e, e_t \in [0, 1]`.

    References
    ----------
    .. [1] R. Cross, "Grip-slip behavior of a bouncing ball", Am. J. Phys. 70, 1093 (2002),
       doi:10.1119/1.1507792.
    .. [2] R. Cross, "Bounce of a spinning ball near normal incidence", Am. J. Phys. 73, 914
       (2005), doi:10.1119/1.2008299.
    .. [3] H. Brody, "That's how the ball bounces", Phys. Teach. 22, 494 (1984).
    """
    v = _vectors(velocity, "velocity", "[m/s]")
    w = _vectors(spin, "spin", "[rad/s]")
    r = _check_radius(radius)
    a = _check_alpha(alpha)
    if not isinstance(surface, Surface):
        raise ValueError(f"surface must be a Surface; got {type(surface).__name__}")
    m = _per_ball(mass, "mass", "[kg]")
    shape = np.broadcast_shapes(v.shape[:-1], w.shape[:-1], r.shape, a.shape, m.shape)
    v, w = np.broadcast_to(v, (*shape, 3)), np.broadcast_to(w, (*shape, 3))
    r, a = np.broadcast_to(r, shape), np.broadcast_to(a, shape)
    vx, vy, vz = v[..., 0], v[..., 1], v[..., 2]
    wx, wy, wz = w[..., 0], w[..., 1], w[..., 2]

    approaching = vz < 0.0
    normal_speed = np.where(approaching, -vz, 0.0)
    e = np.broadcast_to(np.asarray(normal_restitution(surface, vz), dtype=np.float64), shape)
    normal_impulse = (1.0 + e) * normal_speed
    q = np.broadcast_to(lever_ratio(normal_speed, r, np.broadcast_to(m, shape), stiffness), shape)
    lever = q * r
    a_eff = a / q**2

    slip_in = np.stack((vx - lever * wy, vy + lever * wx), axis=-1)
    slip_speed = np.hypot(slip_in[..., 0], slip_in[..., 1])
    direction = np.divide(
        slip_in, slip_speed[..., None], out=np.zeros_like(slip_in), where=slip_speed[..., None] > 0
    )
    grip_impulse = a_eff * (1.0 + surface.tangential_restitution) * slip_speed / (1.0 + a_eff)
    friction_limit = surface.friction * normal_impulse
    grip, stopped, impulse = _slide_or_grip(approaching, friction_limit, grip_impulse, surface)

    ux, uy = direction[..., 0], direction[..., 1]
    velocity_out = np.stack(
        (vx - impulse * ux, vy - impulse * uy, np.where(approaching, e * normal_speed, vz)),
        axis=-1,
    )
    spin_scale = impulse * q / (a * r)
    spin_out = np.stack((wx - spin_scale * uy, wy + spin_scale * ux, wz.copy()), axis=-1)
    slip_out = np.stack(
        (
            velocity_out[..., 0] - lever * spin_out[..., 1],
            velocity_out[..., 1] + lever * spin_out[..., 0],
        ),
        axis=-1,
    )
    return BounceResult(
        velocity=velocity_out,
        spin=spin_out,
        grip=np.asarray(grip),
        stopped=np.asarray(stopped),
        normal_impulse=np.asarray(normal_impulse),
        tangential_impulse=np.asarray(impulse),
        slip_in=slip_in,
        slip_out=slip_out,
        grip_impulse=np.asarray(grip_impulse),
        friction_limit=np.asarray(friction_limit),
        restitution=np.array(e),
        approaching=np.asarray(approaching),
    )
