"""Ball velocity and spin vectors from the quantities people give: speed, elevation, heading,
topspin and sidespin (SI: m/s, rad, rad/s), and back.

Headings (azimuths) are measured in the court's horizontal plane from +x toward +y. Topspin is
spin about ``z x h`` for a ball travelling along the horizontal unit vector ``h`` (the ball's top
turns forward), sidespin is spin about +z. Every function takes N balls at once.
"""

from __future__ import annotations

import numpy as np

__all__ = ["heading_vector", "topspin_axis", "velocity", "spin", "topspin_sidespin", "unit"]


def heading_vector(azimuth):
    """Horizontal unit vectors ``(N, 3)`` of headings ``azimuth`` [rad] ``(N,)``."""
    azimuth = np.atleast_1d(np.asarray(azimuth, float))
    return np.stack([np.cos(azimuth), np.sin(azimuth), np.zeros_like(azimuth)], axis=1)


def topspin_axis(azimuth):
    """Unit topspin axes ``z x h`` ``(N, 3)`` for headings ``azimuth`` [rad] ``(N,)``."""
    azimuth = np.atleast_1d(np.asarray(azimuth, float))
    return np.stack([-np.sin(azimuth), np.cos(azimuth), np.zeros_like(azimuth)], axis=1)


def velocity(speed, elevation, azimuth):
    """Velocities ``(N, 3)`` [m/s] from speed [m/s], elevation above the horizontal (negative:
    descending) and heading [rad], each ``(N,)`` or scalar."""
    speed, elevation, azimuth = np.broadcast_arrays(
        *(np.atleast_1d(np.asarray(a, float)) for a in (speed, elevation, azimuth))
    )
    ce = np.cos(elevation)
    direction = np.stack([ce * np.cos(azimuth), ce * np.sin(azimuth), np.sin(elevation)], axis=1)
    return speed[:, None] * direction


def spin(topspin, sidespin, azimuth):
    """Spin vectors ``(N, 3)`` [rad/s] from topspin and sidespin [rad/s] of balls heading
    ``azimuth`` [rad]."""
    topspin, sidespin, azimuth = np.broadcast_arrays(
        *(np.atleast_1d(np.asarray(a, float)) for a in (topspin, sidespin, azimuth))
    )
    return topspin[:, None] * topspin_axis(azimuth) + sidespin[:, None] * np.array([0.0, 0.0, 1.0])


def topspin_sidespin(velocity, spin):
    """Topspin [rad/s] (spin about ``z x`` the horizontal travel direction; negative: backspin)
    and sidespin [rad/s] (about +z) of balls ``(N, 3)``; the definitions of the shot metrics.

    A ball with no horizontal travel has its topspin taken about +y (the court's own topspin
    axis for a ball toward +x)."""
    horizontal = velocity[:, :2]
    norm = np.linalg.norm(horizontal, axis=1)
    safe = np.where(norm > 0, norm, 1.0)
    dx, dy = horizontal[:, 0] / safe, horizontal[:, 1] / safe
    # z x (dx, dy, 0) = (-dy, dx, 0)
    top = -dy * spin[:, 0] + dx * spin[:, 1]
    return np.where(norm > 0, top, spin[:, 1]), spin[:, 2]


def unit(vectors, name="vector"):
    """Unit vectors ``(N, 3)`` along ``vectors`` ``(N, 3)`` or ``(3,)``: the one guarded way to
    normalise a direction in the application.

    A vector of ordinary length is divided by its norm; one with tiny or huge components
    (``0, 1e-200, 0``), whose squared norm would underflow or overflow, is first divided by its
    largest component. A vector that has no direction (all zero) or a component that is not
    finite raises ValueError naming ``name``.
    """
    v = np.atleast_2d(np.asarray(vectors, dtype=float))
    if not np.all(np.isfinite(v)):
        raise ValueError(f"{name} must have finite components")
    scale = np.max(np.abs(v), axis=1, keepdims=True)
    if np.any(scale == 0.0):
        raise ValueError(f"{name} must not be the zero vector")
    ordinary = (scale > 1e-150) & (scale < 1e150)
    v = np.where(ordinary, v, v / scale)
    return v / np.linalg.norm(v, axis=1, keepdims=True)
