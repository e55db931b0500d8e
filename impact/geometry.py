"""Coach-style stroke inputs turned into face vectors and swing velocities.

Angles are in radians, in the court frame (x toward the far baseline, y to the left, z up),
for a ball hit toward +x. Every function takes numbers or arrays of N values and returns
``(N, 3)`` arrays.
"""

from __future__ import annotations

import numpy as np

__all__ = ["face_orientation", "swing_velocity"]


def face_orientation(tilt, azimuth=0.0, roll=0.0):
    r"""Face normal and long axis of a racket from three angles.

    Parameters
    ----------
    tilt : float or array_like
        Vertical angle of the face normal above the horizontal [rad]: positive is an open face
        (normal points up), negative a closed face, 0 a vertical face.
    azimuth : float or array_like, optional
        Horizontal angle of the face normal from +x [rad], positive toward +y (to the left).
        Default 0.
    roll : float or array_like, optional
        Angle of the long axis (butt to tip) within the face plane [rad], measured from the
        face's horizontal line on its +y side toward its upper side. 0: racket horizontal,
        tip toward +y (a left-hander's forehand, a right-hander's backhand); pi: horizontal,
        tip toward -y (a right-hander's forehand); pi/2: tip up (a serve). Default 0.

    Returns
    -------
    normal : numpy.ndarray
        Unit face normal ``n``, ``(N, 3)`` [-].
    axis : numpy.ndarray
        Unit long axis ``a``, perpendicular to ``n``, ``(N, 3)`` [-].

    Notes
    -----
    With ``t`` the tilt and ``p`` the azimuth, the normal, the face's horizontal line ``h`` and
    its upward line ``u = n x h`` are

    .. math::
        n = (\cos t \cos p,\ \cos t \sin p,\ \sin t), \quad
        h = (-\sin p,\ \cos p,\ 0), \quad
        u = (-\sin t \cos p,\ -\sin t \sin p,\ \cos t)

    and the axis is ``a = cos(roll) h + sin(roll) u``. ``(h, u, n)`` is orthonormal for every
    tilt, including a horizontal face.
    """
    tilt, azimuth, roll = np.broadcast_arrays(
        *(np.atleast_1d(np.asarray(x, dtype=float)) for x in (tilt, azimuth, roll))
    )
    if tilt.ndim != 1:
        raise ValueError(f"angles must be numbers or 1-D arrays, got shape {tilt.shape}")
    ct, st = np.cos(tilt), np.sin(tilt)
    cp, sp = np.cos(azimuth), np.sin(azimuth)
    normal = np.stack([ct * cp, ct * sp, st], axis=-1)
    horizontal = np.stack([-sp, cp, np.zeros_like(sp)], axis=-1)
    upward = np.stack([-st * cp, -st * sp, ct], axis=-1)
    axis = np.cos(roll)[:, None] * horizontal + np.sin(roll)[:, None] * upward
    return normal, axis


def swing_velocity(head_speed, path_angle=0.0, direction=0.0):
    r"""Velocity of the racket at the impact point from speed and two angles.

    Parameters
    ----------
    head_speed : float or array_like
        Speed of the racket at the impact point [m/s].
    path_angle : float or array_like, optional
        Angle of the swing path above the horizontal [rad]: positive is low-to-high.
        Default 0.
    direction : float or array_like, optional
        Horizontal direction of the swing from +x [rad], positive toward +y. Default 0.

    Returns
    -------
    numpy.ndarray
        Velocity ``(N, 3)`` [m/s].

    Notes
    -----
    .. math:: V = s\,(\cos p \cos d,\ \cos p \sin d,\ \sin p)
    """
    speed, path, direction = np.broadcast_arrays(
        *(np.atleast_1d(np.asarray(x, dtype=float)) for x in (head_speed, path_angle, direction))
    )
    if speed.ndim != 1:
        raise ValueError(f"inputs must be numbers or 1-D arrays, got shape {speed.shape}")
    cp = np.cos(path)
    unit = np.stack([cp * np.cos(direction), cp * np.sin(direction), np.sin(path)], axis=-1)
    return speed[:, None] * unit
