"""Ball-court contact: the rigid-body slide-or-grip impulse model in three dimensions.

Court frame: z up, the court is the plane z = 0 and a ball touches it when its centre is at
z = r. Spin is a vector in the court frame; for a ball travelling toward +x, spin about +y is
topspin and spin about z is sidespin. All quantities are SI and every function takes a batch of
balls: vectors shaped ``(..., 3)`` (usually ``(N, 3)``), per-ball scalars shaped ``(...)`` or plain
numbers that broadcast.
"""

from __future__ import annotations

import math
import numbers
from dataclasses import dataclass
from typing import NamedTuple

import numpy as np
from numpy.typing import ArrayLike, NDArray

from .ball import MAX_ALPHA

__all__ = [
    "DEFAULT_REFERENCE_SPEED_MPS",
    "Surface",
    "BounceResult",
    "Bounce2D",
    "normal_restitution",
    "bounce",
    "bounce_2d",
    "critical_angle",
]

#: Normal impact speed of the court pace test impact, 30 m/s at 16 degrees to the surface
#: (ITF CS 01/02) [m/s], about 8.269 m/s. It is the default speed at which a :class:`Surface`'s
#: ``restitution`` holds, so that ``restitution`` is the value the pace test measures.
DEFAULT_REFERENCE_SPEED_MPS = 30.0 * math.sin(math.radians(16.0))


def _real_field(name: str, value: object, unit: str) -> float:
    if isinstance(value, bool) or not isinstance(value, numbers.Real):
        raise ValueError(f"{name} must be a real number {unit}; got {value!r}")
    number = float(value)
    if not math.isfinite(number):
        raise ValueError(f"{name} must be finite {unit}; got {number!r}")
    return number


@dataclass(frozen=True)
class Surface:
    r"""Contact properties of a court surface for a given ball.

    Parameters
    ----------
    friction : float
        Coulomb sliding friction coefficient ``mu`` between ball and surface [-]; ``>= 0``.
    restitution : float
        Normal coefficient of restitution ``e`` at ``reference_speed_mps`` [-]; in ``[0, 1]``.
    restitution_slope_s_per_m : float, optional
        Linear change of ``e`` with the normal impact speed [s/m]; default 0 (``e`` constant).
        Usually negative: balls bounce relatively lower at higher impact speed.
    reference_speed_mps : float, optional
        Normal impact speed at which ``e == restitution`` [m/s]; ``> 0``. Default
        :data:`DEFAULT_REFERENCE_SPEED_MPS`, the normal speed of the court pace test.
    tangential_restitution : float, optional
        Tangential coefficient of restitution ``e_t`` of the contact point for a ball that grips
        [-]; in ``[0, 1]``. Default 0: the contact point ends at rest (friction-only model).

    Raises
    ------
    ValueError
        Naming the field and its allowed range when a value is out of range, not finite or not a
        real number.

    Notes
    -----
    The normal coefficient of restitution at normal impact speed :math:`v_n` is

    .. math:: e(v_n) = \operatorname{clip}\bigl(e + s\,(v_n - v_\mathrm{ref}),\ 0,\ 1\bigr),

    with :math:`s` = ``restitution_slope_s_per_m`` and :math:`v_\mathrm{ref}` =
    ``reference_speed_mps``; see :func:`normal_restitution`.

    References
    ----------
    .. [1] R. Cross, "Grip-slip behavior of a bouncing ball", Am. J. Phys. 70, 1093 (2002),
       doi:10.1119/1.1507792.
    """

    friction: float
    restitution: float
    restitution_slope_s_per_m: float = 0.0
    reference_speed_mps: float = DEFAULT_REFERENCE_SPEED_MPS
    tangential_restitution: float = 0.0

    def __post_init__(self) -> None:
        friction = _real_field("friction", self.friction, "[-]")
        restitution = _real_field("restitution", self.restitution, "[-]")
        slope = _real_field("restitution_slope_s_per_m", self.restitution_slope_s_per_m, "[s/m]")
        reference = _real_field("reference_speed_mps", self.reference_speed_mps, "[m/s]")
        tangential = _real_field("tangential_restitution", self.tangential_restitution, "[-]")
        if friction < 0.0:
            raise ValueError(f"friction must be >= 0 [-]; got {friction}")
        if not 0.0 <= restitution <= 1.0:
            raise ValueError(f"restitution must be in [0, 1] [-]; got {restitution}")
        if reference <= 0.0:
            raise ValueError(f"reference_speed_mps must be > 0 [m/s]; got {reference}")
        if not 0.0 <= tangential <= 1.0:
            raise ValueError(f"tangential_restitution must be in [0, 1] [-]; got {tangential}")
        object.__setattr__(self, "friction", friction)
        object.__setattr__(self, "restitution", restitution)
        object.__setattr__(self, "restitution_slope_s_per_m", slope)
        object.__setattr__(self, "reference_speed_mps", reference)
        object.__setattr__(self, "tangential_restitution", tangential)

    def normal_restitution(self, normal_speed: ArrayLike) -> float | NDArray:
        """Normal coefficient of restitution at a normal impact speed; see
        :func:`normal_restitution`."""
        return normal_restitution(self, normal_speed)


def normal_restitution(surface: Surface, normal_speed: ArrayLike) -> float | NDArray:
    r"""Normal coefficient of restitution of a surface at a normal impact speed.

    Parameters
    ----------
    surface : Surface
        The court surface.
    normal_speed : float or array_like
        Normal impact speed :math:`|v_z|` [m/s]; the sign is ignored.

    Returns
    -------
    float or numpy.ndarray
        ``e`` [-] in ``[0, 1]``; a float for scalar input, otherwise an array of the input shape.

    Raises
    ------
    ValueError
        If ``normal_speed`` is not finite.

    Notes
    -----
    .. math::

        e(v_n) = \operatorname{clip}\bigl(e_\mathrm{ref} + s\,(v_n - v_\mathrm{ref}),\ 0,\ 1\bigr)

    with :math:`e_\mathrm{ref}` = ``surface.restitution``, :math:`s` =
    ``surface.restitution_slope_s_per_m`` [s/m] and :math:`v_\mathrm{ref}` =
    ``surface.reference_speed_mps`` [m/s]. With :math:`s = 0` (the default) ``e`` is constant.

    References
    ----------
    .. [1] R. Cross, "Bounce of a spinning ball near normal incidence", Am. J. Phys. 73, 914
       (2005), doi:10.1119/1.2008299.
    """
    speed = np.abs(np.asarray(normal_speed, dtype=np.float64))
    if not np.all(np.isfinite(speed)):
        raise ValueError("normal_speed must be finite [m/s]")
    e = surface.restitution + surface.restitution_slope_s_per_m * (
        speed - surface.reference_speed_mps
    )
    e = np.clip(e, 0.0, 1.0)
    return float(e) if e.ndim == 0 else e


@dataclass(frozen=True)
class BounceResult:
    """Outcome of a bounce for a batch of balls; every field is a numpy array.

    Shapes: ``(...)`` is the broadcast batch shape of the inputs (``(N,)`` for N balls, ``()`` for
    one ball given as a 3-vector).

    Attributes
    ----------
    velocity : numpy.ndarray, shape (..., 3)
        Velocity after the bounce [m/s].
    spin : numpy.ndarray, shape (..., 3)
        Spin after the bounce [rad/s].
    grip : numpy.ndarray of bool, shape (...)
        True where the ball grips: friction stops the contact point and returns the full
        spring-back ``e_t``. False where it slides throughout, where it stops and then slips back
        before the spring-back is complete (see ``stopped``), or where it did not bounce.
    stopped : numpy.ndarray of bool, shape (...)
        True where the friction impulse was large enough to bring the contact point to rest:
        the slide ended. With ``e_t = 0`` this is exactly ``grip``.
    normal_impulse : numpy.ndarray, shape (...)
        Normal impulse per unit mass ``J_n`` [m/s] (along +z).
    tangential_impulse : numpy.ndarray, shape (...)
        Magnitude of the friction impulse per unit mass ``J`` [m/s] (``>= 0``), directed against
        ``slip_in``.
    slip_in : numpy.ndarray, shape (..., 2)
        Horizontal (x, y) velocity of the contact point before the bounce [m/s].
    slip_out : numpy.ndarray, shape (..., 2)
        Horizontal (x, y) velocity of the contact point after the bounce [m/s].
    grip_impulse : numpy.ndarray, shape (...)
        Friction impulse per unit mass that grips, ``J_grip`` [m/s].
    friction_limit : numpy.ndarray, shape (...)
        Largest friction impulse per unit mass, ``mu J_n`` [m/s]; the ball grips where
        ``friction_limit >= grip_impulse``.
    restitution : numpy.ndarray, shape (...)
        Normal coefficient of restitution at the ball's normal speed [-] (for balls not
        approaching the court, the value the surface would give; nothing is applied).
    approaching : numpy.ndarray of bool, shape (...)
        True where ``v_z < 0`` and the bounce was applied; False where the ball was not moving
        into the court (``v_z >= 0``) and is returned unchanged with zero impulses.
    """

    velocity: NDArray[np.float64]
    spin: NDArray[np.float64]
    grip: NDArray[np.bool_]
    stopped: NDArray[np.bool_]
    normal_impulse: NDArray[np.float64]
    tangential_impulse: NDArray[np.float64]
    slip_in: NDArray[np.float64]
    slip_out: NDArray[np.float64]
    grip_impulse: NDArray[np.float64]
    friction_limit: NDArray[np.float64]
    restitution: NDArray[np.float64]
    approaching: NDArray[np.bool_]

    @property
    def regime(self) -> NDArray[np.str_]:
        """The bounce in words, shape ``(...)``: ``"slide"`` (the contact point slid
        throughout), ``"grip"`` (it stopped and the full spring-back was returned),
        ``"grip-slip"`` (it stopped, then slipped back before the spring-back was complete)
        or ``"none"`` (no bounce)."""
        return np.where(
            self.grip,
            "grip",
            np.where(self.stopped, "grip-slip", np.where(self.approaching, "slide", "none")),
        )


def _vectors(value: ArrayLike, name: str, unit: str) -> NDArray[np.float64]:
    try:
        array = np.asarray(value, dtype=np.float64)
    except (TypeError, ValueError) as exc:
        raise ValueError(f"{name} must be an array of real numbers {unit}") from exc
    if array.ndim == 0 or array.shape[-1] != 3:
        raise ValueError(f"{name} must have shape (3,) or (N, 3) {unit}; got {array.shape}")
    if not np.all(np.isfinite(array)):
        raise ValueError(f"{name} must be finite {unit}")
    return array


def _per_ball(value: ArrayLike, name: str, unit: str) -> NDArray[np.float64]:
    try:
        array = np.asarray(value, dtype=np.float64)
    except (TypeError, ValueError) as exc:
        raise ValueError(f"{name} must be a real number or an array of them {unit}") from exc
    if not np.all(np.isfinite(array)):
        raise ValueError(f"{name} must be finite {unit}")
    return array


def _check_radius(radius: ArrayLike) -> NDArray[np.float64]:
    r = _per_ball(radius, "radius", "[m]")
    if np.any(r <= 0.0):
        raise ValueError("radius must be > 0 [m]")
    return r


def _check_alpha(alpha: ArrayLike) -> NDArray[np.float64]:
    a = _per_ball(alpha, "alpha", "[-]")
    if np.any(a <= 0.0) or np.any(a > MAX_ALPHA):
        raise ValueError("alpha must be in (0, 2/3] [-] (0.4 solid sphere, 2/3 thin shell)")
    return a


def _slide_or_grip(approaching, friction_limit, grip_impulse, surface):
    """The slide-or-grip rule on per-unit-mass impulses: ``grip`` where friction can give the
    grip impulse, ``stopped`` where it can at least stop the contact point (the grip impulse
    over ``1 + e_t``), and the friction impulse applied (0 where the ball is not approaching)."""
    slides = friction_limit < grip_impulse
    grip = approaching & ~slides
    stopped = approaching & (
        friction_limit * (1.0 + surface.tangential_restitution) >= grip_impulse
    )
    impulse = np.where(approaching, np.where(slides, friction_limit, grip_impulse), 0.0)
    return grip, stopped, impulse


def bounce(
    velocity: ArrayLike,
    spin: ArrayLike,
    radius: ArrayLike,
    alpha: ArrayLike,
    surface: Surface,
) -> BounceResult:
    r"""Bounce a batch of balls off a horizontal court with the slide-or-grip rule.

    Parameters
    ----------
    velocity : array_like, shape (N, 3) or (3,)
        Centre-of-mass velocity just before contact, court frame [m/s].
    spin : array_like, shape (N, 3) or (3,)
        Spin (angular velocity) just before contact, court frame [rad/s]. Any axis: topspin or
        backspin about y, sidespin about z, and spin about x.
    radius : float or array_like, shape (N,)
        Ball radius [m]; ``> 0``.
    alpha : float or array_like, shape (N,)
        Moment-of-inertia ratio ``I / (m r^2)`` [-]; in ``(0, 2/3]`` (about 0.55 for a tennis
        ball).
    surface : Surface
        Friction, normal restitution (possibly speed dependent) and tangential restitution.

    Returns
    -------
    BounceResult
        Velocity and spin after the bounce, grip flags, impulses and contact-point slip. Inputs
        broadcast against each other; a single ball given as 3-vectors gives 0-d scalar fields.

    Raises
    ------
    ValueError
        If a vector does not end in a dimension of 3, an input is not finite, ``radius <= 0`` or
        ``alpha`` is outside ``(0, 2/3]``.

    Notes
    -----
    The ball and court are rigid, the contact lasts an instant and the contact point is
    :math:`-r\hat z` from the centre. All impulses are per unit ball mass [m/s]. The contact point
    moves horizontally at the slip velocity

    .. math:: \mathbf c = \mathbf v + \boldsymbol\omega \times (-r \hat z), \qquad
              \mathbf u = (c_x, c_y) = (v_x - r\omega_y,\ v_y + r\omega_x).

    Normal impulse and rebound, with :math:`e = e(|v_z|)` from :func:`normal_restitution`:

    .. math:: J_n = (1 + e)|v_z|, \qquad v_z' = e |v_z|.

    A horizontal impulse :math:`-J\hat u` at the contact point changes :math:`\mathbf v` by
    :math:`-J\hat u` and, through the angular impulse :math:`(-r\hat z)\times(-J\hat u) =
    rJ\,\hat z\times\hat u` divided by :math:`I/m = \alpha r^2`, the spin by
    :math:`J\,(\hat z\times\hat u)/(\alpha r)`. The slip then changes by
    :math:`-J\,\hat u\,(1+\alpha)/\alpha`, so its direction never turns. The impulse that takes
    the slip to :math:`-e_t \mathbf u` (grip; for :math:`e_t = 0` the contact point ends at
    rest) is

    .. math:: J_\mathrm{grip} = \frac{\alpha (1 + e_t)|\mathbf u|}{1 + \alpha}.

    The ball slides throughout if :math:`\mu J_n < J_\mathrm{grip}`, and then
    :math:`J = \mu J_n`; otherwise it grips and :math:`J = J_\mathrm{grip}`. Finally

    .. math:: \mathbf v_t' = \mathbf v_t - J\hat u, \qquad
              \boldsymbol\omega' = \boldsymbol\omega + \frac{J\,(\hat z \times \hat u)}{\alpha r}.

    For slip along +x this is :math:`\omega_y' = \omega_y + J/(\alpha r)`. With :math:`e_t = 0` a
    gripping ball leaves with :math:`v_x' = (v_x + \alpha r\omega_y)/(1+\alpha)` and
    :math:`r\omega_y' = v_x'` (it rolls).

    Consequences and limits of the model:

    - Spin about the vertical (:math:`\omega_z`, a component of sidespin) is unchanged: a point
      contact exerts no torque about z (the normal force passes through the centre and the
      friction torque :math:`\hat z \times \hat u` is horizontal).
    - The bounce never adds kinetic energy for any :math:`\mu \ge 0` and
      :math:`e, e_t \in [0, 1]`.
    - With :math:`e_t > 0` and :math:`\alpha|\mathbf u|/(1+\alpha) \le \mu J_n < J_\mathrm{grip}`
      the contact point stops and then slips back (``"grip-slip"``, ``stopped`` but not
      ``grip``): :math:`J = \mu J_n`, and the contact point leaves moving backwards more slowly
      than :math:`e_t|\mathbf u|`.
    - Balls with :math:`v_z \ge 0` are not moving into the court: they are returned unchanged,
      with zero impulses, ``grip`` False and ``approaching`` False.

    References
    ----------
    .. [1] H. Brody, "That's how the ball bounces", Phys. Teach. 22, 494 (1984).
    .. [2] R. Cross, "Grip-slip behavior of a bouncing ball", Am. J. Phys. 70, 1093 (2002),
       doi:10.1119/1.1507792.
    .. [3] R. Cross, "Bounce of a spinning ball near normal incidence", Am. J. Phys. 73, 914
       (2005), doi:10.1119/1.2008299.
    """
    v = _vectors(velocity, "velocity", "[m/s]")
    w = _vectors(spin, "spin", "[rad/s]")
    r = _check_radius(radius)
    a = _check_alpha(alpha)
    if not isinstance(surface, Surface):
        raise ValueError(f"surface must be a Surface; got {type(surface).__name__}")
    shape = np.broadcast_shapes(v.shape[:-1], w.shape[:-1], r.shape, a.shape)
    v = np.broadcast_to(v, (*shape, 3))
    w = np.broadcast_to(w, (*shape, 3))
    r = np.broadcast_to(r, shape)
    a = np.broadcast_to(a, shape)

    vx, vy, vz = v[..., 0], v[..., 1], v[..., 2]
    wx, wy, wz = w[..., 0], w[..., 1], w[..., 2]

    approaching = vz < 0.0
    normal_speed = np.where(approaching, -vz, 0.0)
    e = np.asarray(normal_restitution(surface, vz), dtype=np.float64)
    e = np.broadcast_to(e, shape)
    normal_impulse = (1.0 + e) * normal_speed

    slip_in = np.stack((vx - r * wy, vy + r * wx), axis=-1)
    slip_speed = np.hypot(slip_in[..., 0], slip_in[..., 1])
    direction = np.divide(
        slip_in,
        slip_speed[..., None],
        out=np.zeros_like(slip_in),
        where=slip_speed[..., None] > 0.0,
    )
    grip_impulse = a * (1.0 + surface.tangential_restitution) * slip_speed / (1.0 + a)
    friction_limit = surface.friction * normal_impulse
    grip, stopped, impulse = _slide_or_grip(approaching, friction_limit, grip_impulse, surface)

    ux, uy = direction[..., 0], direction[..., 1]
    velocity_out = np.stack(
        (vx - impulse * ux, vy - impulse * uy, np.where(approaching, e * normal_speed, vz)),
        axis=-1,
    )
    spin_scale = impulse / (a * r)
    spin_out = np.stack((wx - spin_scale * uy, wy + spin_scale * ux, wz.copy()), axis=-1)
    slip_out = np.stack(
        (
            velocity_out[..., 0] - r * spin_out[..., 1],
            velocity_out[..., 1] + r * spin_out[..., 0],
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


class Bounce2D(NamedTuple):
    """Result of :func:`bounce_2d` in the vertical plane of the ball's travel.

    Attributes
    ----------
    vx : float or numpy.ndarray
        Horizontal velocity after the bounce, positive along the incoming travel [m/s].
    vz : float or numpy.ndarray
        Vertical velocity after the bounce, positive up [m/s].
    spin : float or numpy.ndarray
        Spin after the bounce, positive for topspin [rad/s].
    """

    vx: float | NDArray[np.float64]
    vz: float | NDArray[np.float64]
    spin: float | NDArray[np.float64]


def bounce_2d(
    speed: ArrayLike,
    angle_rad: ArrayLike,
    spin_topspin_rad_s: ArrayLike,
    radius: ArrayLike,
    alpha: ArrayLike,
    surface: Surface,
) -> Bounce2D:
    r"""Bounce in the vertical plane of travel, from speed, descent angle and topspin.

    Parameters
    ----------
    speed : float or array_like
        Incoming ball speed [m/s]; ``>= 0``.
    angle_rad : float or array_like
        Incoming angle below the horizontal (to the court plane) [rad]; in ``[0, pi/2]``.
    spin_topspin_rad_s : float or array_like
        Incoming spin about the horizontal axis perpendicular to the travel, positive for topspin
        and negative for backspin [rad/s].
    radius : float or array_like
        Ball radius [m]; ``> 0``.
    alpha : float or array_like
        Moment-of-inertia ratio ``I / (m r^2)`` [-]; in ``(0, 2/3]``.
    surface : Surface
        The court surface.

    Returns
    -------
    Bounce2D
        ``(vx, vz, spin)``: horizontal velocity along the incoming travel [m/s], vertical
        velocity (up) [m/s] and topspin [rad/s] after the bounce. Floats when every input is a
        scalar, otherwise arrays of the broadcast shape.

    Raises
    ------
    ValueError
        If ``speed < 0``, ``angle_rad`` is outside ``[0, pi/2]`` or an input is not finite; and
        as :func:`bounce`.

    Notes
    -----
    The ball is placed in the court frame travelling toward +x,

    .. math:: \mathbf v = (s\cos\theta,\ 0,\ -s\sin\theta), \qquad
              \boldsymbol\omega = (0,\ \omega_\mathrm{top},\ 0),

    and passed to :func:`bounce`; the result is read back as :math:`(v_x', v_z', \omega_y')`.
    An angle of 0 or a speed of 0 does not reach the court: the ball is returned unchanged.

    References
    ----------
    .. [1] H. Brody, "That's how the ball bounces", Phys. Teach. 22, 494 (1984).
    .. [2] R. Cross, "Grip-slip behavior of a bouncing ball", Am. J. Phys. 70, 1093 (2002),
       doi:10.1119/1.1507792.
    .. [3] R. Cross, "Bounce of a spinning ball near normal incidence", Am. J. Phys. 73, 914
       (2005), doi:10.1119/1.2008299.
    """
    s = _per_ball(speed, "speed", "[m/s]")
    theta = _per_ball(angle_rad, "angle_rad", "[rad]")
    top = _per_ball(spin_topspin_rad_s, "spin_topspin_rad_s", "[rad/s]")
    if np.any(s < 0.0):
        raise ValueError("speed must be >= 0 [m/s]")
    if np.any(theta < 0.0) or np.any(theta > 0.5 * np.pi):
        raise ValueError("angle_rad must be in [0, pi/2] [rad]")
    s, theta, top = np.broadcast_arrays(s, theta, top)
    zeros = np.zeros_like(s)
    velocity = np.stack((s * np.cos(theta), zeros, -s * np.sin(theta)), axis=-1)
    spin = np.stack((zeros, top, zeros), axis=-1)
    result = bounce(velocity, spin, radius, alpha, surface)
    vx = result.velocity[..., 0]
    vz = result.velocity[..., 2]
    wy = result.spin[..., 1]
    if vx.ndim == 0:
        return Bounce2D(float(vx), float(vz), float(wy))
    return Bounce2D(vx, vz, wy)


def critical_angle(
    friction: ArrayLike,
    restitution: ArrayLike,
    alpha: ArrayLike,
    tangential_restitution: ArrayLike = 0.0,
) -> float | NDArray:
    r"""Incidence angle below which a spin-free ball slides throughout the bounce.

    Parameters
    ----------
    friction : float or array_like
        Sliding friction coefficient ``mu`` [-]; ``>= 0``.
    restitution : float or array_like
        Normal coefficient of restitution ``e`` at the impact's normal speed [-]; in ``[0, 1]``.
    alpha : float or array_like
        Moment-of-inertia ratio ``I / (m r^2)`` [-]; in ``(0, 2/3]``.
    tangential_restitution : float or array_like, optional
        Tangential coefficient of restitution ``e_t`` [-]; in ``[0, 1]``; default 0.

    Returns
    -------
    float or numpy.ndarray
        Critical angle to the court plane [rad], in ``(0, pi/2]`` (``pi/2`` for ``mu = 0``: a
        frictionless ball always slides). A ball without spin arriving at a smaller angle slides
        throughout; at this angle or steeper it grips.

    Raises
    ------
    ValueError
        If an input is not finite or outside its range.

    Notes
    -----
    A spin-free ball at angle :math:`\theta` has slip :math:`|u| = s\cos\theta` and
    :math:`J_n = (1+e)s\sin\theta`. It slides throughout when :math:`\mu J_n < J_\mathrm{grip}`:

    .. math:: \tan\theta < \frac{\alpha (1 + e_t)}{(1 + \alpha)\,\mu\,(1 + e)}.

    References
    ----------
    .. [1] H. Brody, "That's how the ball bounces", Phys. Teach. 22, 494 (1984).
    .. [2] R. Cross, "Grip-slip behavior of a bouncing ball", Am. J. Phys. 70, 1093 (2002),
       doi:10.1119/1.1507792.
    .. [3] R. Cross, "Bounce of a spinning ball near normal incidence", Am. J. Phys. 73, 914
       (2005), doi:10.1119/1.2008299.
    """
    mu = _per_ball(friction, "friction", "[-]")
    e = _per_ball(restitution, "restitution", "[-]")
    a = _check_alpha(alpha)
    e_t = _per_ball(tangential_restitution, "tangential_restitution", "[-]")
    if np.any(mu < 0.0):
        raise ValueError("friction must be >= 0 [-]")
    if np.any(e < 0.0) or np.any(e > 1.0):
        raise ValueError("restitution must be in [0, 1] [-]")
    if np.any(e_t < 0.0) or np.any(e_t > 1.0):
        raise ValueError("tangential_restitution must be in [0, 1] [-]")
    theta = np.arctan2(a * (1.0 + e_t), (1.0 + a) * mu * (1.0 + e))
    return float(theta) if theta.ndim == 0 else theta
