"""Shot choice: which entry of the repertoire a hitter plays, and where they aim it.

1. The hitter chooses a shot (seeded random numbers). A shot with conditions on the incoming
   ball (contact height, forehand or backhand side, incoming topspin) is played with its
   probability when the ball meets them; the rest is shared by the shots without conditions in
   proportion to their probabilities (:func:`shot_weights`). A serve is chosen from the first
   or second serves by their probabilities alone.
2. The aim point is drawn uniformly in the shot's target zone, then displaced by the aim scatter
   (normal, SD ``aim_m`` along and across the court). Every scatter SD grows by the factor
   :func:`scatter_factor` when the ball is met outside the preferred contact heights.

Targets are in the hitter's frame. A serve's target is mirrored across the centre line on the
ad side; a rally ball's target sign follows its ``direction`` (:func:`_direction_sign`).
"""

from __future__ import annotations

import numpy as np

from rallyarc.rally.frames import contact_side
from rallyarc.shot import topspin_sidespin


def _choose(u, weights):
    """Index of the entry chosen by uniform numbers ``u`` (N,) with weights ``(N, k)``."""
    total = weights.sum(axis=1, keepdims=True)
    cum = np.cumsum(weights, axis=1) / np.where(total > 0, total, 1.0)
    return np.minimum((u[:, None] > cum).sum(axis=1), weights.shape[1] - 1)


def _eligible(entry, height, side, topspin):
    ok = np.ones(height.shape, bool)
    if entry.when_height_above is not None:
        ok &= height > entry.when_height_above
    if entry.when_height_below is not None:
        ok &= height < entry.when_height_below
    if entry.when_side is not None:
        ok &= side == entry.when_side
    if entry.when_topspin_above is not None:
        ok &= topspin > entry.when_topspin_above
    return ok


def scatter_factor(player, height, serve):
    """The factor on a player's scatter SDs for contacts at ``height`` [m]: 1 inside the
    preferred range (and for serves), growing by ``outside_range_per_m`` per metre outside it.

    A modelling assumption of the pattern file (common practice: a ball met away from the
    preferred height is controlled less well), not a result of the physics.
    """
    lo, hi = player.contact_band
    outside = np.maximum(0.0, np.maximum(lo - height, height - hi))
    return np.where(serve, 1.0, 1.0 + player.scatter["outside_range_per_m"] * outside)


def shot_weights(shots, height, side, topspin):
    """Probabilities ``(N, k)`` of a repertoire's shots against N incoming balls.

    A shot with conditions is played with its probability when the ball meets them (if the
    eligible conditional shots add up to more than 1 they share 1 in proportion); the rest of
    the probability goes to the shots without conditions, in proportion to theirs.
    """
    cond = np.array([s.conditional for s in shots])
    p = np.array([s.probability for s in shots], float)
    ok = np.stack([_eligible(s, height, side, topspin) for s in shots], axis=1)
    wc = np.where(cond[None, :] & ok, p[None, :], 0.0)
    total_c = wc.sum(axis=1, keepdims=True)
    wc = np.where(total_c > 1.0, wc / np.where(total_c > 0, total_c, 1.0), wc)
    rest = 1.0 - wc.sum(axis=1, keepdims=True)
    pu = np.where(cond, 0.0, p)
    return wc + rest * pu[None, :] / pu.sum()


def _direction_sign(entry, contact_y, receiver):
    if entry.direction == "crosscourt":
        return np.where(contact_y >= 0, -1.0, 1.0)
    if entry.direction == "line":
        return np.where(contact_y >= 0, 1.0, -1.0)
    if entry.direction in ("backhand", "forehand"):
        # the receiver faces -x in the hitter's frame: a right-hander's backhand is at -y
        left = -1.0 if entry.direction == "backhand" else 1.0
        sign = left if receiver.handedness == "right" else -left
        return np.full(contact_y.shape, sign)
    return np.ones(contact_y.shape)


def choose_shots(player, kind, u, ball):
    """The entries a hitter plays against N balls.

    Parameters
    ----------
    player : Player
    kind : array (N,) of str
        ``"first"`` or ``"second"`` for a serve, ``""`` for a ball in play.
    u : array (N,)
        Uniform random numbers, one per ball.
    ball : BallState
        The incoming balls in the hitter's frame (a serve's is not used).

    Returns
    -------
    entries : list of PatternShot
        The serve pools met and the repertoire, in that order.
    entry_of : int array (N,)
        The index in ``entries`` of each ball's shot.
    """
    entry_of = np.full(kind.size, -1)
    entries = []

    def take(k, pool, weights):
        pick = _choose(u[k], weights)
        for j, s in enumerate(pool):
            entries.append(s)
            entry_of[k[pick == j]] = len(entries) - 1

    for which, pool in (("first", player.first_serves), ("second", player.second_serves)):
        k = np.flatnonzero(kind == which)
        if k.size:
            take(k, pool, np.tile([s.probability for s in pool], (k.size, 1)))
    k = np.flatnonzero(kind == "")
    if k.size:
        height = ball.position[k, 2]
        top_in, _ = topspin_sidespin(ball.velocity[k], ball.spin[k])
        sides = contact_side(ball.position[k, 1], player)
        take(k, player.shots, shot_weights(player.shots, height, sides, top_in))
    return entries, entry_of


def draw_targets(entries, entry_of, u, serve_side, contact_y, receiver):
    """Intended aim points ``(N, 2)`` [m] in the hitter's frame, uniform in each shot's zone.

    ``u`` (N, 2) are uniform random numbers, ``serve_side`` the side (``"deuce"``, ``"ad"``) of
    each rally's point, ``contact_y`` the lateral contact positions [m] in the hitter's frame.
    """
    tx = np.zeros(entry_of.size)
    ty = np.zeros(entry_of.size)
    for j, s in enumerate(entries):
        k = np.flatnonzero(entry_of == j)
        if k.size == 0:
            continue
        ut = u[k]
        x = s.target_x[0] + ut[:, 0] * (s.target_x[1] - s.target_x[0])
        y = s.target_y[0] + ut[:, 1] * (s.target_y[1] - s.target_y[0])
        if s.serve:
            sign = np.where(serve_side[k] == "ad", -1.0, 1.0)
        else:
            sign = _direction_sign(s, contact_y[k], receiver)
        tx[k], ty[k] = x, sign * y
    return np.stack([tx, ty], axis=1)


def scatter_aim(player, intended, height, serve, z):
    """Aim points ``(N, 2)`` [m]: the intended ones displaced by the aim scatter, with normal
    numbers ``z`` (N, 2); also returns the scatter factor (N,) of :func:`scatter_factor`."""
    grow = scatter_factor(player, height, serve)
    tx = intended[:, 0] + grow * player.scatter["aim"] * z[:, 0]
    ty = intended[:, 1] + grow * player.scatter["aim"] * z[:, 1]
    return np.stack([tx, ty], axis=1), grow
