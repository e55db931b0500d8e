"""The solver both aims share: a damped Gauss-Newton iteration on N independent square
systems, all perturbed shots of all targets flown in one call of the chain; and the result
object the aims return."""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from rallyarc import court

#: Landing accuracy the solvers aim for [m] (the round-trip tests require 5 cm).
LAND_TOL_M = 0.02
#: Accuracy of a requested net clearance or height at the player [m].
HEIGHT_TOL_M = 0.02


@dataclass
class AimResult:
    """Solved settings for N targets.

    ``settings`` maps a parameter name to ``(N,)`` SI values; ``reachable`` ``(N,)`` bool;
    ``reason`` ``(N,)`` str ("" when reachable); ``result`` the chain run at the solution (the
    nearest reachable shot when unreachable), with metrics in the court frame of the shot.
    """

    settings: dict
    reachable: np.ndarray
    reason: np.ndarray
    result: object
    target_x: np.ndarray
    target_y: np.ndarray
    iterations: int
    mirrored: bool = False

    def landing(self):
        """Landing points (N, 2) in the court frame."""
        m = self.result.metrics
        pts = np.stack([m["land_x_m"], m["land_y_m"]], axis=1)
        return -pts if self.mirrored else pts

    def trajectory_frame(self, dt=0.005):
        """Trajectories of the solved shots in the court frame (see ShotResult)."""
        frame = self.result.trajectory_frame(dt)
        if self.mirrored:
            for col in ("x_m", "y_m", "vx_mps", "vy_mps", "spin_x_rpm", "spin_y_rpm"):
                frame[col] = -frame[col]
        return frame

    def miss_distance(self):
        land = self.landing()
        return np.hypot(land[:, 0] - self.target_x, land[:, 1] - self.target_y)


def solve(evaluate, p0, lo, hi, scale, iterations=30):
    """Damped Gauss-Newton (Levenberg-Marquardt) on N independent square systems
    ``evaluate(P) = 0``, with the parameters kept inside ``[lo, hi]``.

    ``evaluate(P, idx)`` takes parameters ``P`` of the points ``idx`` (indices into the N
    systems), possibly stacked several times (``P`` has ``r * len(idx)`` rows, block after
    block), and returns residuals of the same shape already divided by their tolerances, so a
    point is solved when the sum of squares is at most 1. Each iteration evaluates the trial
    points of the systems still open and their k forward perturbations in one stacked call, so
    they all fly together; a solved system, or one whose damping has grown past any useful step,
    is left alone. Returns ``(p, solved, iterations)``.
    """
    p = np.clip(np.array(p0, float), lo, hi)
    n, k = p.shape
    h = 1e-4 * scale

    def residual_and_jacobian(q, idx):
        # perturb downward at the upper bound so that every perturbed point stays in range
        m = len(idx)
        dirs = np.where(q + h >= hi, -1.0, 1.0)
        stack = [q] + [q + np.eye(k)[j] * (h * dirs) for j in range(k)]
        res = evaluate(np.concatenate(stack), idx).reshape(k + 1, m, k)
        jac = (res[1:] - res[0][None]) / (h * dirs).T[:, :, None]  # (k params, m, k eqs)
        jac = np.transpose(jac, (1, 2, 0))  # (m, k eqs, k params)
        return res[0], np.where(np.isfinite(jac), jac, 0.0)

    r, jac = residual_and_jacobian(p, np.arange(n))
    cost = np.sum(r**2, axis=1)
    lam = np.full(n, 1e-2)
    done = 0
    while done < iterations:
        open_ = np.flatnonzero((cost > 1.0) & (lam < 1e8))
        if open_.size == 0:
            break
        done += 1
        jo, ro = jac[open_], r[open_]
        jt = np.transpose(jo, (0, 2, 1))
        jtj = jt @ jo
        damp = lam[open_, None] * (np.einsum("nii->ni", jtj) + 1e-9)
        step = np.linalg.solve(jtj + damp[:, :, None] * np.eye(k), -(jt @ ro[:, :, None]))
        trial = np.clip(p[open_] + np.clip(step[:, :, 0], -5 * scale, 5 * scale), lo, hi)
        r_t, jac_t = residual_and_jacobian(trial, open_)
        cost_t = np.sum(r_t**2, axis=1)
        better = cost_t < cost[open_]
        won = open_[better]
        p[won], r[won], jac[won], cost[won] = (
            trial[better],
            r_t[better],
            jac_t[better],
            cost_t[better],
        )
        lam[open_] = np.where(better, lam[open_] * 0.3, lam[open_] * 10.0)
    return p, cost <= 1.0, done


def finite(values, fallback):
    return np.where(np.isfinite(values), values, fallback)


def height_value(m, key):
    """Clearance or receiver height, extended continuously where it is undefined."""
    value = m[key]
    if key == "receiver_height_m":
        # bounced twice before the plane: how far short, as a negative height
        short = m["bounce_second_x_m"] - (court.HALF_LENGTH + 1.0)
        value = np.where(np.isfinite(value), value, finite(short, -5.0))
    return finite(value, -2.0)
