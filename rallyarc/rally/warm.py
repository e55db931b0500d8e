"""Starting points for a block's aim solves, learned from the shots the block has already solved.

Every round solves thousands of swings of the same few stroke styles against similar balls. For
each hitter and stroke style, :class:`WarmStart` keeps a least-squares fit of the solved swing
parameters (face tilt, head speed, and the swing direction as its offset from the direction to
the target) on the incoming ball (position, velocity, spin) and the aim point, linear in those
and in the squares of the velocity and the aim point. From the second round on it gives the aim
solver its starting values: within a degree or two of the solution, where the stroke's own swing
lands metres away, so the solver needs fewer iterations. The solutions themselves are those of
the same tolerances; only where the solver starts changes.

The fit is kept as running sums of its normal equations, so learning and guessing cost the same
however many shots the block has played. It depends only on the block's earlier rounds, so a
block's tables still depend on its seed alone. Two pattern variants played on one seed
(:mod:`rallyarc.rally.whatif`) meet the same random numbers but learn from their own shots: their
solved swings for the same target may differ within the landing tolerance.
"""

from __future__ import annotations

import numpy as np

#: Solved shots a style needs before its fit is used (a few per fitted coefficient).
MIN_SHOTS = 60
#: Relative ridge added to the normal equations (not to the constant's), for styles whose balls
#: vary little.
RIDGE = 1e-9
#: Parameters the fit predicts; the swing direction as its offset from the target's direction.
FITTED = ("face_tilt", "swing_direction", "head_speed")


def features(ball, target_x, target_y):
    """Fit features of N shots ``(N, 17)``: a constant, the incoming ball's position [10 m],
    velocity [30 m/s] and spin [300 rad/s], the aim point [10 m], and the squares of the scaled
    velocity and aim point."""
    vel = ball.velocity / 30.0
    aim = np.column_stack([target_x, target_y]) / 10.0
    return np.column_stack(
        [
            np.ones(len(target_x)),
            ball.position / 10.0,
            vel,
            ball.spin / 300.0,
            aim,
            vel**2,
            aim**2,
        ]
    )


def _values(ball, target_x, target_y, swing):
    """The fitted quantities of solved swings ``(N, 3)``, in the order of :data:`FITTED`."""
    heading = np.arctan2(target_y - ball.position[:, 1], target_x - ball.position[:, 0])
    offset = np.angle(np.exp(1j * (swing.swing_direction - heading)))
    return np.column_stack([swing.face_tilt, offset, swing.head_speed])


class WarmStart:
    """The fits of one block, by key (hitter, aim style, stroke name)."""

    def __init__(self):
        self._sums = {}  # key -> [X'X (17, 17), X'Y (17, 3), shots]

    def learn(self, key, ball, target_x, target_y, swing, solved):
        """Add the ``solved`` (N,) bool shots of N solved swings to the fit of ``key``."""
        if not np.any(solved):
            return
        x = features(ball, target_x, target_y)[solved]
        y = _values(ball, target_x, target_y, swing)[solved]
        sums = self._sums.get(key)
        if sums is None:
            k = x.shape[1]
            sums = self._sums[key] = [np.zeros((k, k)), np.zeros((k, len(FITTED))), 0]
        sums[0] += x.T @ x
        sums[1] += x.T @ y
        sums[2] += x.shape[0]

    def ready(self, key):
        """Whether the fit of ``key`` has enough shots to guess from."""
        sums = self._sums.get(key)
        return sums is not None and sums[2] >= MIN_SHOTS

    def guess(self, key, ball, target_x, target_y, names):
        """Starting values ``(N, len(names))`` [SI] of the parameters ``names`` for N shots of
        ``key``; NaN where the fit has too few shots yet (the solver's default start)."""
        n = len(target_x)
        out = np.full((n, len(names)), np.nan)
        if not self.ready(key):
            return out
        xtx, xty, _ = self._sums[key]
        ridge = RIDGE * np.trace(xtx) * np.diag(np.r_[0.0, np.ones(xtx.shape[0] - 1)])
        coef = np.linalg.solve(xtx + ridge, xty)
        pred = features(ball, target_x, target_y) @ coef
        heading = np.arctan2(target_y - ball.position[:, 1], target_x - ball.position[:, 0])
        for j, name in enumerate(names):
            value = pred[:, FITTED.index(name)]
            out[:, j] = value + heading if name == "swing_direction" else value
        return np.where(np.isfinite(out), out, np.nan)
