"""Where the receiver meets the ball.

On the ball's path after its bounce and before a second bounce, a point is within reach when
its height lies between the player's lowest and highest contact, it is no deeper than the
player's deepest position behind the baseline, and its horizontal distance from where the
player stands when the opponent strikes (``start``; home when not given) is at most ``reach_m``
plus the run ``run_speed_mps * (t - reaction_s)`` from the opponent's contact. The player aims
to meet the ball at the point their timing names: on the rise or on the drop where the ball
passes the middle of their preferred contact-height range (at the apex when the bounce does
not rise that high), or at the apex. When that point is out of
reach, they meet the ball at the point within reach nearest to it in time (a heavy high ball
the player cannot back away from is met above the preferred range). No point within reach ends
the rally: a winner (an ace for a serve).

At the contact the player has run only as far as the ball needs: to within ``reach_m`` of it
(:attr:`Contact.body`). The share of the run the time allowed that they needed is the
contact's ``stretch`` (0: the ball came within reach of where they stood; 1: the full run).
Where the player goes after their own shot is :func:`recover`.

Everything here is in the hitter's chain frame, where the receiver stands at the far end.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from rallyarc import court
from rallyarc.shot.stages import uses_compiled

#: A contact this close in time to the bounce's apex is "at the apex" [s].
APEX_WINDOW_S = 0.02
#: Samples of each ball's path after its bounce when looking for the contact point where the
#: target point is out of reach: about 20 ms apart on a path of 1.3 s (the ball moves about
#: 0.5 m between samples); the edge of the reachable stretch is then found by bisection. A
#: reachable stretch shorter than the spacing can be missed (against 160 samples, the demo
#: rallies table stayed the same and contact points moved by at most 0.02 mm).
PATH_SAMPLES = 64
#: Iterations of the root search for the time the ball passes a height (the Illinois
#: iteration converges superlinearly: 16 iterations put it within a nanosecond).
ROOT_ITERATIONS = 16
#: Iterations of the bisection for the edge of the reachable stretch (a sample spacing of
#: about 20 ms halved 20 times: within about 20 ns).
BISECT_ITERATIONS = 20
#: Searches for the contact time: ``"numpy"`` all balls at once (the reference),
#: ``"compiled"`` the same search one ball at a time compiled with numba.


@dataclass
class Contact:
    """Where receivers meet N balls that landed in, in the hitter's chain frame: ``found``
    (N,) bool, ``t`` [s] after the hitter's contact, the ball's position [m], velocity [m/s]
    and spin [rad/s] there ``(N, 3)``, the timing's target time ``target_t`` [s], ``reason``
    (why no point was within reach), ``phase`` (rise, apex or drop), the receiver's ``body``
    position (x, y) [m] at the contact and the ``stretch`` of the run (see the module)."""

    found: np.ndarray
    t: np.ndarray
    position: np.ndarray
    velocity: np.ndarray
    spin: np.ndarray
    target_t: np.ndarray
    reason: np.ndarray
    phase: np.ndarray
    body: np.ndarray | None = None
    stretch: np.ndarray | None = None


def _bisect(f, a, b, iterations=BISECT_ITERATIONS):
    """Vectorized bisection for a sign change of ``f`` between times ``a`` and ``b``
    (``f(a)`` false, ``f(b)`` true, or the reverse); returns the time next to the true side."""
    fa = f(a)
    for _ in range(iterations):
        mid = 0.5 * (a + b)
        fm = f(mid)
        same = fm == fa
        a = np.where(same, mid, a)
        b = np.where(same, b, mid)
    return np.where(fa, a, b)


class _Path:
    """The n balls' paths from their bounce (``t_b`` [s]) to a second bounce (``t_e``): their
    recorded ``trajectory`` after the bounce (of these balls alone, so that sampling costs what
    they cost), and the receiver's reach along them."""

    def __init__(self, trajectory, t_e, t_b, receiver, start=None):
        self.trajectory = trajectory
        self.t_b = t_b
        self.t_e = t_e
        self.n = t_e.size
        self.receiver = receiver
        # the receiver in the hitter's frame: home at (L/2 + behind, -y) (180 degree rotation)
        home = np.array([court.HALF_LENGTH + receiver.home_behind, -receiver.home_y])
        self.start = np.tile(home, (self.n, 1)) if start is None else np.asarray(start, float)
        self.deepest = court.HALF_LENGTH + receiver.deepest_behind

    def subset(self, cols):
        """The paths of some of the balls (indices ``cols``)."""
        part = _Path.__new__(_Path)
        part.trajectory = self.trajectory.take(cols)
        part.t_b, part.t_e, part.start = self.t_b[cols], self.t_e[cols], self.start[cols]
        part.n, part.receiver, part.deepest = cols.size, self.receiver, self.deepest
        return part

    def sample(self, times):
        """Positions, velocities and spins of the n balls at times (M, n)."""
        return self.trajectory.sample(times)

    def positions(self, times):
        """Positions alone of the n balls at times (M, n), for the searches."""
        return self.trajectory.sample_positions(times)

    def feasible_parts(self, times, pos):
        """Within the height range after the bounce, not too deep, and within the run."""
        r, t_b, start = self.receiver, self.t_b, self.start
        z = pos[..., 2]
        height = (z >= r.lowest) & (z <= r.highest)
        depth = pos[..., 0] <= self.deepest
        dist = np.hypot(pos[..., 0] - start[:, 0], pos[..., 1] - start[:, 1])
        move = dist <= r.reach + r.run_speed * np.maximum(0.0, times - r.reaction)
        after_bounce = times > t_b[None, :] if times.ndim == 2 else times > t_b
        return height & after_bounce, depth, move

    def feasible(self, times, pos):
        h, d, mv = self.feasible_parts(times, pos)
        return h & d & mv


def _target_time(path, apex_ev, col, radius):
    """The time the receiver's timing names [s] and the time of the bounce's apex [s]
    (``col``: the balls' columns in the flight whose apex event ``apex_ev`` is)."""
    t_b = path.t_b
    t_apex = np.where(apex_ev.occurred[col], apex_ev.t[col], t_b)
    z_apex = np.where(apex_ev.occurred[col], apex_ev.position[col, 2], radius)
    receiver = path.receiver
    if receiver.timing == "apex":
        return t_apex, t_apex
    mid = 0.5 * (receiver.contact_band[0] + receiver.contact_band[1])
    high = z_apex > mid

    k = np.flatnonzero(high)
    cross = t_apex.copy()
    if k.size:
        part = path.subset(k)
        if receiver.timing == "rise":
            cross[k] = _root(lambda t: _height(part, t, mid), t_b[k], t_apex[k])
        else:
            cross[k] = _root(lambda t: _height(part, t, mid), t_apex[k], path.t_e[k])
    return cross, t_apex


def _height(path, t, level):
    """The balls' heights above ``level`` [m] at times ``t`` (n,) [s]."""
    return path.positions(t[None, :])[0, :, 2] - level


def _root(f, a, b, iterations=ROOT_ITERATIONS):
    """Vectorized Illinois (modified regula falsi) iteration for a root of ``f`` between times
    ``a`` and ``b``, where ``f`` has opposite signs (or is zero) at the two ends.

    References
    ----------
    Dowell, M. and Jarratt, P. (1971), A modified regula falsi method for computing the root
    of an equation, BIT 11:168-174.
    """
    a, b = a.astype(float), b.astype(float)
    fa, fb = f(a), f(b)
    t = np.where(fa == 0, a, b)
    last = np.zeros(a.shape, int)  # which end the previous iteration kept: -1 a, +1 b
    for _ in range(iterations):
        width = fb - fa
        t = np.where(width != 0, (a * fb - b * fa) / np.where(width != 0, width, 1.0), a)
        t = np.clip(t, np.minimum(a, b), np.maximum(a, b))
        ft = f(t)
        keep_b = np.sign(ft) == np.sign(fa)  # the root lies between t and b
        # Illinois: the end kept twice running has its value halved
        fb = np.where(keep_b & (last == 1), 0.5 * fb, fb)
        fa = np.where(~keep_b & (last == -1), 0.5 * fa, fa)
        a, fa = np.where(keep_b, t, a), np.where(keep_b, ft, fa)
        b, fb = np.where(keep_b, b, t), np.where(keep_b, fb, ft)
        last = np.where(keep_b, 1, -1)
    return t


def _nearest_within_reach(path, target):
    """The contact time [s] within reach nearest to ``target``, whether there is one, and why
    not where there is none: the target itself where it is within reach, else a search of the
    sampled path of the other balls (:func:`_search`)."""
    at_target = path.feasible(target[None, :], path.positions(target[None, :]))[0]
    t_c, found = target.copy(), at_target.copy()
    reason = np.full(path.n, "", dtype=object)
    rest = np.flatnonzero(~at_target)
    if rest.size:
        part = path.subset(rest)
        t_c[rest], found[rest], grid, grid_pos = _search(part, target[rest])
        reason[rest] = _unreached_reason(part, grid, grid_pos, found[rest])
    return t_c, found, reason.astype(str)


def _search(path, target):
    """For balls whose target point is out of reach: the time within reach nearest to it on
    the path sampled at :data:`PATH_SAMPLES` points, refined by bisection toward the target;
    whether there is one; and the sampled path ``(grid, grid_pos)``."""
    n, t_b, cols = path.n, path.t_b, np.arange(path.n)
    frac = np.linspace(0.0, 1.0, PATH_SAMPLES)[:, None]
    grid = t_b[None, :] + frac * (path.t_e - t_b)[None, :]
    grid_pos = path.positions(grid)
    ok = path.feasible(grid, grid_pos)
    gap = np.where(ok, np.abs(grid - target[None, :]), np.inf)
    j = np.argmin(gap, axis=0)
    found = np.isfinite(gap[j, cols])
    t_c = grid[j, cols]

    # refine toward the target: bisect between the feasible sample and its neighbour
    step = np.where(grid[j, cols] < target, 1, -1)
    nb = np.clip(j + step, 0, PATH_SAMPLES - 1)
    t_nb = grid[nb, cols]
    refine = found & ~ok[nb, np.arange(n)] & (nb != j)
    if refine.any():
        r = np.flatnonzero(refine)

        def ok_at(t):
            full = t_c.copy()
            full[r] = t
            p = path.positions(full[None, :])
            return path.feasible(full[None, :], p)[0, r]

        t_c[r] = _bisect(ok_at, t_c[r].copy(), t_nb[r].copy())
    return t_c, found, grid, grid_pos


def _unreached_reason(path, grid, grid_pos, found):
    """Why no point of a ball's path was within reach (``""`` where one was)."""
    h, d, mv = path.feasible_parts(grid, grid_pos)
    reason = np.full(path.n, "", dtype=object)
    none = ~found
    reason[none & (d & mv).any(axis=0)] = "out of height range"
    reason[none & (reason == "") & (h & d).any(axis=0)] = "too far to run"
    reason[none & (reason == "")] = "past the deepest position"
    return reason.astype(str)


def _run(path, t_c, pos):
    """The receiver's body position (n, 2) at contact times ``t_c`` and the stretch (n,)."""
    r, start = path.receiver, path.start
    gap = pos[:, :2] - start
    dist = np.hypot(gap[:, 0], gap[:, 1])
    needed = np.maximum(0.0, dist - r.reach)
    allowed = r.run_speed * np.maximum(0.0, t_c - r.reaction)
    stretch = np.where(needed > 0, needed / np.where(allowed > 0, allowed, needed + 1.0), 0.0)
    body = start + gap * (needed / np.where(dist > 0, dist, 1.0))[:, None]
    return body, np.minimum(stretch, 1.0)


def recover(body, home, run_speed, time):
    """Where a player who stood at ``body`` (n, 2) [m] at their contact is after ``time`` (n,)
    [s] of running toward ``home`` (2,) at ``run_speed`` [m/s]: the recovery between shots,
    cut short when the opponent strikes (every position in the player's own frame)."""
    gap = np.asarray(home, float)[None, :] - body
    dist = np.hypot(gap[:, 0], gap[:, 1])
    step = np.minimum(dist, run_speed * np.maximum(0.0, time))
    return body + gap * (step / np.where(dist > 0, dist, 1.0))[:, None]


def _compiled_search(result, col, path):
    """The target time, apex time, contact time [s], found flag and unreached reason of every
    ball of ``path`` (columns ``col`` of the flight after the bounce) from the compiled kernel
    (:mod:`rallyarc.rally.meet_compiled`)."""
    from rallyarc.rally.meet_compiled import REASONS, search

    after = result.after_bounce.flight
    target, t_apex, t_c, found, code = search(
        after.trajectory,
        col,
        path.t_b,
        path.t_e,
        path.start,
        after.events["apex"],
        result.conditions.ball.radius,
        path.receiver,
        path.deepest,
        np.linspace(0.0, 1.0, PATH_SAMPLES),
        ROOT_ITERATIONS,
        BISECT_ITERATIONS,
    )
    reason = np.array(REASONS, dtype=object)[code].astype(str)
    return target, t_apex, t_c, found, reason


def meet(result, balls, receiver, start=None, engine="numpy"):
    """Find where ``receiver`` meets the balls ``balls`` (indices of shots that landed in) of
    one chain result ``result`` (recorded), all in the hitter's chain frame; ``start`` (n, 2)
    [m] is where the receiver stands when the hitter strikes (home when not given).

    ``engine`` (one of :data:`rallyarc.shot.stages.ENGINES`) runs the search for the contact
    time: ``"numpy"`` all balls at once in numpy, ``"compiled"`` one ball at a time in the
    numba kernel of :mod:`rallyarc.rally.meet_compiled` (loaded on first use), which finds the
    same times to rounding.

    Returns a :class:`Contact` for those balls.
    """
    uses_compiled(engine)  # refuses an unknown engine before any work
    balls = np.asarray(balls, int)
    if balls.size == 0:
        return Contact(
            np.zeros(0, bool),
            *(np.zeros((0,) + s) for s in ((), (3,), (3,), (3,), ())),
            np.array([], str),
            np.array([], str),
            np.zeros((0, 2)),
            np.zeros(0),
        )
    if result.after_bounce is None:
        raise ValueError("every ball must have bounced")
    after = result.after_bounce.flight
    try:
        col = result.after_bounce.columns(balls)
    except ValueError:
        raise ValueError("every ball must have bounced") from None
    trajectory = result.after_bounce.trajectory_of(balls)
    path = _Path(trajectory, after.t[col], result.metrics["bounce_t_s"][balls], receiver, start)
    if engine == "compiled":
        target, t_apex, t_c, found, reason = _compiled_search(result, col, path)
    else:
        radius = result.conditions.ball.radius
        target, t_apex = _target_time(path, after.events["apex"], col, radius)
        t_c, found, reason = _nearest_within_reach(path, target)
    pos, vel, spin = (a[0] for a in path.sample(t_c[None, :]))
    phase = np.where(
        np.abs(t_c - t_apex) <= APEX_WINDOW_S, "apex", np.where(t_c < t_apex, "rise", "drop")
    )
    body, stretch = _run(path, t_c, pos)
    return Contact(found, t_c, pos, vel, spin, target, reason, phase, body, stretch)
