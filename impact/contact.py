r"""Ball-racket contact: the slide-or-grip impulse model on a free racket.

One impact is one pair of impulses on the ball at its contact point: a normal impulse set by
the normal coefficient of restitution, and a tangential friction impulse that either stops the
contact point's slip on the strings (grip) or is limited to ``mu`` times the normal impulse
(slide). The racket enters only through its inverse mass at the impact point
(:mod:`impact.racket`), so a clamped racket (zero inverse mass) gives the ball-on-a-rigid-surface
bounce.

All functions take N balls at once: vectors shaped ``(N, 3)`` (or one ``(3,)`` vector shared by
all balls), scalars shaped ``(N,)`` or plain numbers. Results are always batched: ``(N, 3)``
and ``(N,)``.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from .racket import Racket, racket_inverse_masses

__all__ = ["ContactResult", "collide", "hit"]

_UNIT_TOL = 1e-6


@dataclass(frozen=True)
class ContactResult:
    """Outcome of N ball-racket impacts (every field is an array over the N balls).

    Attributes
    ----------
    velocity : numpy.ndarray
        Ball velocity after contact, ``(N, 3)`` [m/s].
    spin : numpy.ndarray
        Ball spin after contact, ``(N, 3)`` [rad/s].
    approaching : numpy.ndarray
        ``(N,)`` bool. False where the ball was not moving into the face (``v_n >= 0``); those
        balls are returned unchanged with zero impulses.
    grip : numpy.ndarray
        ``(N,)`` bool. True where friction held the contact point through the whole exchange:
        it stopped the slip and returned the strings' full spring-back (with ``e_t = 0``: it
        stopped the slip). False where the ball slid throughout, where it stopped and then
        slipped back before the spring-back was complete (see ``stopped``), or where it did
        not touch. See :attr:`regime` for words.
    normal_impulse : numpy.ndarray
        Normal impulse on the ball along ``+n``, ``(N,)`` [N s].
    tangential_impulse : numpy.ndarray
        Friction impulse on the ball, in the face plane, ``(N, 3)`` [N s].
    face_velocity_change : numpy.ndarray
        Change of the racket's velocity at the impact point, ``(N, 3)`` [m/s]; the face moves
        at ``face_velocity + face_velocity_change`` after contact.
    approach_normal_mps : numpy.ndarray
        Speed of the ball into the face, relative to the moving face, ``(N,)`` [m/s]; positive
        when approaching.
    approach_parallel_velocity : numpy.ndarray
        Component of the ball's velocity relative to the face that lies in the face plane,
        ``(N, 3)`` [m/s] (how much the swing brushes across the ball's path).
    approach_parallel_mps : numpy.ndarray
        Magnitude of ``approach_parallel_velocity``, ``(N,)`` [m/s].
    slip_linear_mps : numpy.ndarray
        Magnitude of the part of the contact point's slip that comes from the ball's motion
        relative to the face, ``(N,)`` [m/s]. Same number as ``approach_parallel_mps``, kept
        under this name beside ``slip_spin_mps``.
    slip_spin_mps : numpy.ndarray
        Magnitude of the part of the slip that comes from the incoming spin,
        ``|w x (-r n)|`` (in the face plane), ``(N,)`` [m/s].
    slip_ratio : numpy.ndarray
        Spin part projected on the direction of the linear part, divided by the linear part,
        ``(N,)`` [-]: positive when the incoming spin adds to the slip, negative when it opposes
        it (``-1``: the spin cancels the slip along that direction). NaN where the linear part
        is zero.
    spin_change : numpy.ndarray
        ``w' - w``, ``(N, 3)`` [rad/s].
    stopped : numpy.ndarray
        ``(N,)`` bool. True where the friction impulse was large enough to bring the contact
        point to rest relative to the face: the slide ended. With ``e_t = 0`` this is exactly
        the grip regime. With ``e_t > 0`` the strings then spring back; where friction runs out
        before the full spring-back is returned, the contact point slips back (``stopped`` but
        not ``grip``: the ``"grip-slip"`` regime).
    spin_ratio_out : numpy.ndarray
        ``r |w'_t| / |remaining parallel speed|``, ``(N,)`` [-], where ``w'_t`` is the outgoing
        spin's component in the face plane and the remaining parallel speed is the in-plane
        part of ``v' - V'`` (``V'`` the face after contact). 1 at grip with ``e_t = 0``; NaN
        where the remaining parallel speed is zero.
    """

    velocity: np.ndarray
    spin: np.ndarray
    approaching: np.ndarray
    grip: np.ndarray
    normal_impulse: np.ndarray
    tangential_impulse: np.ndarray
    face_velocity_change: np.ndarray
    approach_normal_mps: np.ndarray
    approach_parallel_velocity: np.ndarray
    approach_parallel_mps: np.ndarray
    slip_linear_mps: np.ndarray
    slip_spin_mps: np.ndarray
    slip_ratio: np.ndarray
    spin_change: np.ndarray
    stopped: np.ndarray
    spin_ratio_out: np.ndarray

    @property
    def spin_limit_reached(self) -> np.ndarray:
        """``(N,)`` bool: more friction could give the ball no more spin. That is the grip
        regime: the contact point stopped and the full spring-back was returned. Where the
        ball slid throughout, or stopped and then slipped back, the whole friction impulse
        ``mu J_n`` was used, and more friction would have given more spin."""
        return self.grip

    @property
    def regime(self) -> np.ndarray:
        """Contact regime in words, ``(N,)`` str: ``"slide"`` (the contact point slid
        throughout), ``"grip"`` (it stopped and the full spring-back was returned),
        ``"grip-slip"`` (it stopped, then slipped back before the spring-back was complete)
        or ``"none"`` (no contact)."""
        return np.where(
            self.grip,
            "grip",
            np.where(self.stopped, "grip-slip", np.where(self.approaching, "slide", "none")),
        )


def collide(
    ball_velocity,
    ball_spin,
    face_velocity,
    face_normal,
    face_axis,
    ball_mass,
    ball_radius,
    ball_alpha,
    racket_inv_mass_normal,
    racket_inv_mass_tangential,
    e_n,
    mu,
    e_t=0.0,
):
    r"""Impulsive slide-or-grip contact of N balls with a racket face.

    Parameters
    ----------
    ball_velocity : array_like
        Ball centre velocity before contact, ``(N, 3)`` or ``(3,)`` [m/s].
    ball_spin : array_like
        Ball angular velocity before contact, ``(N, 3)`` or ``(3,)`` [rad/s].
    face_velocity : array_like
        Velocity of the racket at the impact point before contact, ``(N, 3)`` or ``(3,)`` [m/s].
    face_normal : array_like
        Unit face normal ``n``, out of the hitting face toward the ball's side,
        ``(N, 3)`` or ``(3,)`` [-].
    face_axis : array_like
        Unit long axis ``a`` of the racket (butt to tip), perpendicular to ``n``,
        ``(N, 3)`` or ``(3,)`` [-]. It fixes the basis ``(a, c = n x a)`` of
        ``racket_inv_mass_tangential``.
    ball_mass : float or array_like
        Ball mass ``m`` [kg].
    ball_radius : float or array_like
        Ball radius ``r`` [m].
    ball_alpha : float or array_like
        Ball moment-of-inertia factor ``alpha = I / (m r^2)`` [-].
    racket_inv_mass_normal : float or array_like
        Racket inverse mass along ``n`` at the impact point, ``1/M_e`` [1/kg]; 0 for a clamped
        racket.
    racket_inv_mass_tangential : array_like
        Racket in-plane inverse-mass matrix ``K_r`` at the impact point in the ``(a, c)``
        basis, ``(2, 2)`` or ``(N, 2, 2)`` [1/kg]; zeros for a clamped racket.
    e_n : float or array_like
        Normal coefficient of restitution of ball on strings (racket clamped), in [0, 1] [-].
    mu : float or array_like
        Ball-string friction coefficient, >= 0 [-].
    e_t : float or array_like, optional
        Tangential restitution in [0, 1] [-]; 0 (default) is the friction-only model in which
        a gripping ball leaves with its contact point at rest relative to the face.

    Returns
    -------
    ContactResult
        Ball state after contact, impulses, regime and coach quantities.

    Raises
    ------
    ValueError
        If shapes do not broadcast, ``face_normal`` or ``face_axis`` is not a unit vector,
        they are not perpendicular, or a parameter is out of range.

    Notes
    -----
    With ``v_rel = v - V`` and ``v_n = v_rel . n`` (negative when approaching):

    1. Balls with ``v_n >= 0`` are not approaching the face; they are returned unchanged with
       zero impulses and ``approaching = False``.
    2. Normal impulse on the ball along ``+n``:

       .. math:: J_n = \frac{(1 + e_n)(-v_n)}{1/m + 1/M_e}

       which for a head-on hit gives ``v_out = e_A v_in + (1 + e_A) V`` with the apparent
       coefficient of restitution ``e_A`` of :func:`impact.racket.apparent_cor`.
    3. Slip of the ball's contact point (at ``-r n`` from its centre) relative to the face:
       ``u = v_rel,t + w x (-r n)``, in the face plane. A tangential impulse ``J_t`` on the
       ball changes it by ``K J_t`` with
       ``K = (1/m)(1 + 1/alpha) I_2 + K_r`` in the ``(a, c)`` basis, so the impulse that stops
       the slip is ``J_stop = K^{-1} u`` (solved as an explicit 2x2 inverse).
    4. Grip if ``(1 + e_t) |J_stop| <= mu J_n``: ``J_t = -(1 + e_t) J_stop``, so the outgoing
       slip is ``-e_t u``. Otherwise the ball slides throughout: ``J_t = -mu J_n J_stop/|J_stop|``,
       exactly ``mu J_n`` in magnitude. ``u = 0`` gives no tangential impulse and counts as grip.
    5. Ball after contact:

       .. math:: v' = v + (J_n n + J_t)/m, \qquad
          w' = w + \frac{(-r n) \times (J_n n + J_t)}{\alpha m r^2}

    6. Racket's impact point: ``dV = -(K_r J_t + J_n n / M_e)``.

    What the tangential direction uses: when sliding, friction acts along ``-J_stop``, the
    direction of the impulse that would stop the slip, rather than exactly against the
    instantaneous slip. The two coincide when ``K`` is isotropic (a clamped racket, or an
    impact on the long axis at the centre of mass); for the racket's slightly anisotropic
    ``K_r`` this is an approximation that keeps a single impulse per contact. With it, no
    contact adds kinetic energy for any ``e_n, e_t`` in [0, 1].

    References
    ----------
    .. [1] H. Brody, Phys. Teach. 22, 494 (1984).
    .. [2] R. Cross, Am. J. Phys. 70, 1093 (2002), doi:10.1119/1.1507792.
    .. [3] R. Cross, Am. J. Phys. 73, 914 (2005), doi:10.1119/1.2008299.
    .. [4] R. Cross, Sports Engineering 6, 235 (2003).
    .. [5] H. Brody, Am. J. Phys. 65, 981 (1997).
    """
    vectors, scalars = named_inputs(
        (ball_velocity, ball_spin, face_velocity, face_normal, face_axis),
        (
            ("ball_mass", ball_mass),
            ("ball_radius", ball_radius),
            ("ball_alpha", ball_alpha),
            ("racket_inv_mass_normal", racket_inv_mass_normal),
            ("e_n", e_n),
            ("mu", mu),
            ("e_t", e_t),
        ),
    )
    k_r = tangential_inverse_mass(racket_inv_mass_tangential)
    try:
        n_balls = np.broadcast_shapes(
            *[x.shape[:1] for x in vectors], *[x.shape for x in scalars], k_r.shape[:1]
        )[0]
    except ValueError as err:
        raise ValueError(f"inputs do not share one batch size N: {err}") from None
    v, w, face_v, n, a = (np.broadcast_to(x, (n_balls, 3)) for x in vectors)
    m, r, alpha, inv_big_m, e_n, mu, e_t = (np.broadcast_to(x, (n_balls,)) for x in scalars)
    k_r = np.broadcast_to(k_r, (n_balls, 2, 2))
    _check_inputs(n, a, m, r, alpha, inv_big_m, k_r, e_n, mu, e_t)

    c = np.cross(n, a)
    inv_m = 1.0 / m

    # Approach: relative velocity split along and across the face.
    v_rel = v - face_v
    v_n = _dot(v_rel, n)
    approaching = v_n < 0.0
    v_rel_t = v_rel - v_n[:, None] * n
    spin_slip = np.cross(w, -r[:, None] * n)  # already in the face plane
    u = v_rel_t + spin_slip

    # Normal impulse on the ball [N s].
    j_n = np.where(approaching, (1.0 + e_n) * (-v_n) / (inv_m + inv_big_m), 0.0)

    # Stopping impulse in the (a, c) basis: J_stop = K^{-1} u.
    k_b = inv_m * (1.0 + 1.0 / alpha)
    k00 = k_r[:, 0, 0] + k_b
    k01 = k_r[:, 0, 1]
    k10 = k_r[:, 1, 0]
    k11 = k_r[:, 1, 1] + k_b
    det = k00 * k11 - k01 * k10
    u_a = _dot(u, a)
    u_c = _dot(u, c)
    stop_a = np.where(approaching, (k11 * u_a - k01 * u_c) / det, 0.0)
    stop_c = np.where(approaching, (k00 * u_c - k10 * u_a) / det, 0.0)
    stop_mag = np.hypot(stop_a, stop_c)

    # Slide or grip.
    grip = approaching & ((1.0 + e_t) * stop_mag <= mu * j_n)
    sliding = approaching & ~grip  # here 0 <= mu J_n < (1 + e_t)|J_stop|, so |J_stop| > 0
    slide_scale = np.where(sliding, -mu * j_n / np.where(sliding, stop_mag, 1.0), 0.0)
    scale = np.where(grip, -(1.0 + e_t), slide_scale)
    jt_a = scale * stop_a
    jt_c = scale * stop_c
    j_t = jt_a[:, None] * a + jt_c[:, None] * c
    impulse = j_n[:, None] * n + j_t

    # Ball and racket after contact.
    v_out = v + impulse * inv_m[:, None]
    lever = -r[:, None] * n
    w_out = w + np.cross(lever, impulse) / (alpha * m * r**2)[:, None]
    dv_a = -(k_r[:, 0, 0] * jt_a + k_r[:, 0, 1] * jt_c)
    dv_c = -(k_r[:, 1, 0] * jt_a + k_r[:, 1, 1] * jt_c)
    d_face = dv_a[:, None] * a + dv_c[:, None] * c - (j_n * inv_big_m)[:, None] * n

    # Coach quantities (ratios of tiny nonzero speeds may be huge; they overflow to inf).
    linear_mag = _norm(v_rel_t)
    remaining = v_out - (face_v + d_face)
    remaining_t = remaining - _dot(remaining, n)[:, None] * n
    remaining_mag = _norm(remaining_t)
    with np.errstate(over="ignore"):
        spin_along = np.divide(
            _dot(spin_slip, v_rel_t), linear_mag, out=np.zeros(n_balls), where=linear_mag > 0.0
        )
        slip_ratio = np.divide(
            spin_along, linear_mag, out=np.full(n_balls, np.nan), where=linear_mag > 0.0
        )
        spin_ratio_out = np.divide(
            _norm(np.cross(w_out, lever)),
            remaining_mag,
            out=np.full(n_balls, np.nan),
            where=remaining_mag > 0.0,
        )
    stopped = approaching & (np.hypot(jt_a, jt_c) >= stop_mag)

    return ContactResult(
        velocity=v_out,
        spin=w_out,
        approaching=approaching,
        grip=grip,
        normal_impulse=j_n,
        tangential_impulse=j_t,
        face_velocity_change=d_face,
        approach_normal_mps=-v_n,
        approach_parallel_velocity=v_rel_t,
        approach_parallel_mps=linear_mag,
        slip_linear_mps=linear_mag.copy(),
        slip_spin_mps=_norm(spin_slip),
        slip_ratio=slip_ratio,
        spin_change=w_out - w,
        stopped=stopped,
        spin_ratio_out=spin_ratio_out,
    )


def hit(
    ball_velocity,
    ball_spin,
    face_velocity,
    face_normal,
    face_axis,
    racket: Racket,
    impact_from_butt_m,
    offaxis_m,
    ball_mass,
    ball_radius,
    ball_alpha,
    e_n,
    mu,
    e_t=0.0,
):
    """Contact of N balls with a free ``racket`` at a given impact point.

    Computes the racket's inverse masses at the impact point with
    :func:`impact.racket.racket_inverse_masses` and calls :func:`collide`.

    Parameters
    ----------
    ball_velocity, ball_spin, face_velocity, face_normal, face_axis
        As in :func:`collide` ([m/s], [rad/s], [m/s], [-], [-]).
    racket : Racket
        The racket's mass properties.
    impact_from_butt_m : float or array_like
        Impact point's distance from the butt along the long axis [m].
    offaxis_m : float or array_like
        Impact point's offset along ``c = n x a`` [m] (0 on the long axis).
    ball_mass, ball_radius, ball_alpha, e_n, mu, e_t
        As in :func:`collide` ([kg], [m], [-], [-], [-], [-]).

    Returns
    -------
    ContactResult
        See :func:`collide`.
    """
    inv_n, inv_t = racket_inverse_masses(racket, impact_from_butt_m, offaxis_m)
    return collide(
        ball_velocity,
        ball_spin,
        face_velocity,
        face_normal,
        face_axis,
        ball_mass,
        ball_radius,
        ball_alpha,
        inv_n,
        inv_t,
        e_n,
        mu,
        e_t,
    )


def _dot(x, y):
    return np.einsum("ij,ij->i", x, y)


def _norm(x):
    return np.sqrt(_dot(x, x))


#: The contact's vector arguments, in the order :func:`named_inputs` takes them.
VECTOR_ARGUMENTS = ("ball_velocity", "ball_spin", "face_velocity", "face_normal", "face_axis")


def named_inputs(vectors, scalars):
    """The contact's inputs as arrays, each checked against its argument's name: the five
    vectors of :data:`VECTOR_ARGUMENTS` as ``(1 or N, 3)`` and the ``(name, value)`` numbers
    as ``(1 or N,)``; a ValueError names the argument of a wrong shape."""
    return (
        [_vectors(x, name) for x, name in zip(vectors, VECTOR_ARGUMENTS, strict=True)],
        [_scalars(x, name) for name, x in scalars],
    )


def tangential_inverse_mass(k_r):
    """The racket's tangential inverse mass as ``(1 or N, 2, 2)`` [1/kg]; a ValueError for
    any other shape."""
    k_r = np.asarray(k_r, dtype=float)
    if k_r.ndim == 2:
        k_r = k_r[None]
    if k_r.ndim != 3 or k_r.shape[1:] != (2, 2):
        raise ValueError(
            f"racket_inv_mass_tangential must have shape (2, 2) or (N, 2, 2), got {k_r.shape}"
        )
    return k_r


def _vectors(x, name):
    arr = np.asarray(x, dtype=float)
    if arr.ndim == 1:
        arr = arr[None, :]
    if arr.ndim != 2 or arr.shape[1] != 3:
        raise ValueError(f"{name} must have shape (3,) or (N, 3), got {np.shape(x)}")
    return arr


def _scalars(x, name):
    arr = np.asarray(x, dtype=float)
    if arr.ndim == 0:
        arr = arr[None]
    if arr.ndim != 1:
        raise ValueError(f"{name} must be a number or have shape (N,), got {np.shape(x)}")
    return arr


def _check_inputs(n, a, m, r, alpha, inv_big_m, k_r, e_n, mu, e_t):
    if np.any(np.abs(_norm(n) - 1.0) > _UNIT_TOL):
        raise ValueError("face_normal must be a unit vector")
    if np.any(np.abs(_norm(a) - 1.0) > _UNIT_TOL):
        raise ValueError("face_axis must be a unit vector")
    if np.any(np.abs(_dot(n, a)) > _UNIT_TOL):
        raise ValueError("face_axis must be perpendicular to face_normal")
    for value, name in ((m, "ball_mass"), (r, "ball_radius"), (alpha, "ball_alpha")):
        if not np.all(value > 0.0):
            raise ValueError(f"{name} must be positive")
    if not np.all(inv_big_m >= 0.0):
        raise ValueError("racket_inv_mass_normal must be >= 0")
    if not np.all(np.isfinite(k_r)) or np.any(
        np.abs(k_r[:, 0, 1] - k_r[:, 1, 0]) > 1e-12 * (np.abs(k_r[:, 0, 1]) + 1.0)
    ):
        raise ValueError("racket_inv_mass_tangential must be finite and symmetric")
    if np.any(k_r[:, 0, 0] < 0.0) or np.any(
        k_r[:, 0, 0] * k_r[:, 1, 1] - k_r[:, 0, 1] * k_r[:, 1, 0] < -1e-15
    ):
        raise ValueError("racket_inv_mass_tangential must be positive semi-definite")
    for value, name in ((e_n, "e_n"), (e_t, "e_t")):
        if not np.all((value >= 0.0) & (value <= 1.0)):
            raise ValueError(f"{name} must lie in [0, 1]")
    if not np.all(mu >= 0.0):
        raise ValueError("mu must be >= 0")
