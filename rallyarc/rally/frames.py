"""The two ends of the court and the sides of a player.

Every shot is computed in its hitter's chain frame: the hitter at the near end (x < 0) hitting
toward +x, as in :func:`rallyarc.shot.simulate`. The near player's chain frame is the court
frame; the far player's is the court rotated 180 degrees about z, ``(x, y, z) -> (-x, -y, z)``,
applied alike to positions, velocities and spins (a proper rotation, so spin, an axial vector,
turns like any vector). The tables report positions in the court frame.
"""

from __future__ import annotations

import numpy as np

#: The two ends, in the order of a pattern pair's players.
ENDS = ("near", "far")
#: The rotation by 180 degrees about z as a factor on ``(x, y, z)``.
FLIP = np.array([-1.0, -1.0, 1.0])


def to_other_end(vectors):
    """Vectors ``(N, 3)`` from one end's chain frame to the other's: rotation by 180 degrees
    about z, ``(x, y, z) -> (-x, -y, z)``. The same for positions, velocities and spins, and
    its own inverse."""
    return np.asarray(vectors, float) * FLIP


def court_factor(end_index):
    """The factor on ``(x, y, z)`` that turns a hitter's chain frame into the court frame:
    ones for the near player (index 0), :data:`FLIP` for the far player (index 1)."""
    return FLIP if end_index == 1 else np.ones(3)


def contact_side(y, player):
    """``"forehand"`` or ``"backhand"`` for contacts at lateral position ``y`` in the player's
    own frame: a right-hander facing +x has the forehand on the right (y below the home
    position's y)."""
    right = np.asarray(y) < player.home_y
    forehand = right if player.handedness == "right" else ~right
    return np.where(forehand, "forehand", "backhand")
