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
    nearest reachable shot when unreachable), with metrics in the court frame of the shot, or
    None when the aim was asked not to play it. ``metrics`` are the metrics the verdicts came
    from (``result.metrics`` when played); ``swing`` the solved swings (strokes only).
    """

    settings: dict
    reachable: np.ndarray
    reason: np.ndarray
    result: object
    target_x: np.ndarray
    target_y: np.ndarray
    iterations: int
    mirrored: bool = False
    metrics: dict | None = None
    swing: object = None

    def landing(self):
        """Landing points (N, 2) in the court frame."""
        m = self.metrics if self.metrics is not None else self.result.metrics
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


#: Solver methods: "newton" (the default: a finite-difference Jacobian at every trial point)
#: and "broyden" (a finite-difference Jacobian at the start, then Broyden updates, refreshed
#: where a step fails or stalls: fewer evaluations, more iterations).
METHODS = ("newton", "broyden")
#: A Broyden step that lowers the cost by less than this factor counts as a stall.
STALL_RATIO = 0.9


def solve(evaluate, p0, lo, hi, scale, iterations=30, method="newton", active=None):
    """Damped Gauss-Newton (Levenberg-Marquardt) on N independent square systems
    ``evaluate(P) = 0``, with the parameters kept inside ``[lo, hi]``.

    ``evaluate(P, idx)`` takes parameter rows ``P`` and the system of each row ``idx``
    (indices into the N systems, repeated where ``P`` holds perturbed points of a system) and
    returns residuals of the same shape already divided by their tolerances, so a point is
    solved when the sum of squares is at most 1. Each iteration evaluates the points of all
    open systems in one call, so they all fly together; a solved system, or one whose damping
    has grown past any useful step, is left alone.

    ``method`` "newton" takes the Jacobian from k forward differences at every trial point;
    "broyden" takes it from differences at the start only and then updates it from each step
    (Broyden's rank-one update, one evaluation per iteration), going back to differences at
    the current point where a step fails or lowers the cost by less than :data:`STALL_RATIO`.
    Both stop after ``iterations`` iterations. ``active`` ``(N, k)`` bool, optional: the
    parameters each system may move (the others keep their start values; a system with j
    inactive parameters must have its last j residuals zero). Returns
    ``(p, solved, iterations)``.
    """
    if method not in METHODS:
        raise ValueError(f"method must be one of {', '.join(METHODS)}")
    p = np.clip(np.array(p0, float), lo, hi)
    n, k = p.shape
    scale = np.broadcast_to(np.asarray(scale, float), (k,))
    active = np.ones((n, k), bool) if active is None else np.asarray(active, bool)
    if method == "newton":
        return _newton(evaluate, p, lo, hi, scale, iterations, active)
    return _broyden(evaluate, p, lo, hi, scale, iterations, active)


def _fd_points(q, hi, h, active):
    """Forward-perturbed points of the rows of ``q``, one block per parameter holding the rows
    where it is active (perturbed downward at the upper bound, so that every perturbed point
    stays in range); returns the points, the rows of each block and the signed steps."""
    k = q.shape[1]
    dirs = np.where(q + h >= hi, -1.0, 1.0)
    blocks = [np.flatnonzero(active[:, j]) for j in range(k)]
    points = [q[rows] + np.eye(k)[j] * (h * dirs[rows]) for j, rows in enumerate(blocks)]
    return np.concatenate(points), blocks, h * dirs


def _fd_jacobian(r0, r_pert, blocks, steps, active):
    """Jacobians ``(m, k eqs, k params)`` from residuals at points and their perturbations."""
    m, k = r0.shape
    jac = np.zeros((k, m, k))  # (k params, m, k eqs), then turned as the solve needs it
    at = 0
    for j, rows in enumerate(blocks):
        part = r_pert[at : at + rows.size]
        at += rows.size
        jac[j, rows] = (part - r0[rows]) / steps[rows, j][:, None]
    jac = np.transpose(jac, (1, 2, 0))  # (m, k eqs, k params)
    return _pinned(np.where(np.isfinite(jac), jac, 0.0), active)


def _pinned(jac, active):
    """Jacobians in which every inactive parameter has a column of its own: an identity row in
    place of one of the zero residuals, and no part in the active residuals."""
    if active.all():
        return jac
    jac = np.where(active[:, None, :], jac, 0.0)
    k = active.shape[1]
    off = ~active
    count = off.sum(axis=1)
    # a system's j inactive parameters take its last j rows, in parameter order
    jac[np.arange(k)[None, :] >= (k - count)[:, None]] = 0.0
    i, j = np.nonzero(off)
    rows = k - count[i] + (np.cumsum(off, axis=1) - 1)[i, j]
    jac[i, rows, j] = 1.0
    return jac


def _lm_step(jac, r, lam, scale, active):
    """The damped Gauss-Newton steps of the systems (rows of ``jac`` and ``r``)."""
    k = r.shape[1]
    jt = np.transpose(jac, (0, 2, 1))
    jtj = jt @ jac
    damp = lam[:, None] * (np.einsum("nii->ni", jtj) + 1e-9)
    step = np.linalg.solve(jtj + damp[:, :, None] * np.eye(k), -(jt @ r[:, :, None]))[:, :, 0]
    return np.where(active, np.clip(step, -5 * scale, 5 * scale), 0.0)


def _newton(evaluate, p, lo, hi, scale, iterations, active):
    n, k = p.shape
    h = 1e-4 * scale

    def residual_and_jacobian(q, idx):
        pert, blocks, steps = _fd_points(q, hi, h, active[idx])
        rows = np.concatenate([idx] + [idx[b] for b in blocks])
        res = evaluate(np.concatenate([q, pert]), rows)
        m = len(idx)
        return res[:m], _fd_jacobian(res[:m], res[m:], blocks, steps, active[idx])

    r, jac = residual_and_jacobian(p, np.arange(n))
    cost = np.sum(r**2, axis=1)
    lam = np.full(n, 1e-2)
    done = 0
    while done < iterations:
        open_ = np.flatnonzero((cost > 1.0) & (lam < 1e8))
        if open_.size == 0:
            break
        done += 1
        step = _lm_step(jac[open_], r[open_], lam[open_], scale, active[open_])
        trial = np.clip(p[open_] + step, lo, hi)
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


def _broyden(evaluate, p, lo, hi, scale, iterations, active):
    """Levenberg-Marquardt with Broyden updates; each iteration is one call of ``evaluate``
    over the open systems' trial points and the perturbations of those being refreshed."""
    n, k = p.shape
    h = 1e-4 * scale
    every = np.arange(n)
    pert, blocks, steps = _fd_points(p, hi, h, active)
    res = evaluate(np.concatenate([p, pert]), np.concatenate([every] + blocks))
    r = res[:n].copy()
    jac = _fd_jacobian(r, res[n:], blocks, steps, active)
    cost = np.sum(r**2, axis=1)
    lam = np.full(n, 1e-2)
    fresh = np.ones(n, bool)  # the Jacobian is from differences at p
    refresh = np.zeros(n, bool)  # take differences at p on the next iteration
    done = 0
    while done < iterations:
        open_ = np.flatnonzero((cost > 1.0) & (lam < 1e8))
        if open_.size == 0:
            break
        done += 1
        redo, go = open_[refresh[open_]], open_[~refresh[open_]]
        step = _lm_step(jac[go], r[go], lam[go], scale, active[go])
        trial = np.clip(p[go] + step, lo, hi)
        pert, blocks, steps = _fd_points(p[redo], hi, h, active[redo])
        rows = np.concatenate([go] + [redo[b] for b in blocks])
        res = evaluate(np.concatenate([trial, pert]), rows)
        r_t = res[: go.size]
        if redo.size:
            jac[redo] = _fd_jacobian(r[redo], res[go.size :], blocks, steps, active[redo])
            fresh[redo], refresh[redo] = True, False
        cost_t = np.sum(r_t**2, axis=1)
        better = cost_t < cost[go]
        was_fresh = fresh[go]
        failed_fresh = ~better & was_fresh
        updated = _broyden_update(jac[go], trial - p[go], r_t - r[go], scale, active[go])
        jac[go] = np.where(failed_fresh[:, None, None], jac[go], updated)
        stalled = better & (cost_t > STALL_RATIO * cost[go]) & ~was_fresh
        won = go[better]
        p[won], r[won], cost[won] = trial[better], r_t[better], cost_t[better]
        # a failed or stalled step of an updated Jacobian: differences at p next time; a failed
        # step of a Jacobian from differences: more damping (its Jacobian stays the one at p)
        fresh[go] = failed_fresh
        refresh[go] = (~better | stalled) & ~failed_fresh
        lam[go] = np.where(better, lam[go] * 0.3, np.where(failed_fresh, lam[go] * 10.0, lam[go]))
    return p, cost <= 1.0, done


def _broyden_update(jac, dp, dr, scale, active):
    """Broyden's rank-one update of Jacobians from the steps ``dp`` and the residual changes
    ``dr``, in parameters measured in ``scale``."""
    du = dp / scale
    norm = np.sum(du**2, axis=1)
    ok = np.isfinite(dr).all(axis=1) & (norm > 0)
    miss = dr - np.einsum("nij,nj->ni", jac, dp)
    upd = miss[:, :, None] * (du / scale)[:, None, :] / np.where(ok, norm, 1.0)[:, None, None]
    return _pinned(np.where(ok[:, None, None], jac + upd, jac), active)


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
