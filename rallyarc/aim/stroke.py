"""Aiming a stroke: the free swing parameters (face tilt or head speed, and swing direction)
that put the ball on a target, optionally with a net clearance or a height at the receiver."""

from __future__ import annotations

import math

import numpy as np

from rallyarc.aim.first import struck
from rallyarc.aim.solver import (
    HEIGHT_TOL_M,
    LAND_TOL_M,
    AimResult,
    finite,
    height_value,
    solve,
)
from rallyarc.shot import BallState, Swing, serve_states, simulate
from rallyarc.shot.stages import uses_compiled

_SWING_BOUNDS = {
    "face_tilt": (math.radians(-40.0), math.radians(50.0), math.radians(1.0)),
    "swing_direction": (math.radians(-45.0), math.radians(45.0), math.radians(1.0)),
    "head_speed": (3.0, 60.0, 1.0),
    "swing_path": (math.radians(-50.0), math.radians(70.0), math.radians(1.0)),
}
STYLES = {"tilt": ("face_tilt", "swing_direction"), "speed": ("head_speed", "swing_direction")}


def free_parameters(free, third=False):
    """The swing parameters an aim of style ``free`` solves, in the order of its settings: the
    style's two, then (``third``: a clearance or height is asked) head speed or face tilt."""
    names = list(STYLES[free])
    if third:
        names.append("head_speed" if free == "tilt" else "face_tilt")
    return names


def aim_stroke(
    incoming,
    stroke,
    conditions,
    target_x,
    target_y,
    free="tilt",
    clearance=None,
    receiver_height=None,
    which=None,
    method="newton",
    play=True,
    engine="numpy",
    start=None,
):
    """Solve a stroke's free swing parameters so that the ball lands on target.

    Parameters
    ----------
    incoming : BallState
        The ball at contact, one or N (a serve uses its toss when ``None``).
    stroke : rallyarc.domain.Stroke, or a sequence of them
        The stroke style (one for every target, or one per target, or K styles chosen per
        target by ``which``); its other swing values are kept. Targets of different styles
        solve together in one batch.
    target_x, target_y : float or array (N,)
        Landing targets [m], court frame (the hitter at the near end).
    free : {"tilt", "speed"}
        Solve face tilt and swing direction, or head speed and swing direction. The face
        azimuth turns with the swing direction (the stroke's offset between them is kept).
    clearance, receiver_height : float or array (N,), optional
        Also meet a net clearance [m] or a ball height at the receiver's plane [m]; the third
        free parameter is then head speed (style "tilt") or face tilt (style "speed"). NaN
        entries of an array: those targets have no such goal and keep the stroke's value of
        the third parameter (targets with and without one solve together in one batch).
    which : int array (N,), optional
        For a sequence of K strokes: the index of each target's stroke.
    method : {"newton", "broyden"}
        The solver's Jacobian rule (:func:`rallyarc.aim.solver.solve`).
    start : array (N, k), optional
        Starting values of the free parameters (SI, in the order of ``settings``: the style's
        two, then the third where a clearance or height is asked), for a caller that can guess
        them (rallies learn them from the shots already solved). NaN entries, and the third
        parameter of targets without a third goal, keep the default start: the stroke's own
        values, with the swing direction toward the target.
    play : bool
        Play the solved shots through the whole chain, recorded, as ``result``; when false,
        ``result`` is None and the verdicts come from the flight to the first bounce alone
        (``swing`` and ``metrics`` of the result hold the solved swings and that flight's
        metrics), for callers that play the shot themselves.
    engine : {"numpy", "compiled"}
        The impact and the integrator of the residual's first flight
        (:mod:`rallyarc.aim.first`): numpy, or the numba-compiled kernels, for callers that
        solve many batches and can pay for their compile (or cache load) on first use. With
        "compiled" and no receiver height, the whole solve runs compiled
        (:mod:`rallyarc.aim.compiled`: the numpy solver's iteration, of either method, with the
        same residual, one target at a time) where the conditions' racket and aero model have
        compiled forms; the final metrics and verdicts come from the residual's path as with
        numpy. The residuals that need the bounce (a receiver height) and the shots played for
        ``result`` use numpy.

    Returns
    -------
    AimResult
    """
    if free not in STYLES:
        raise ValueError(f"free must be one of {', '.join(STYLES)}")
    uses_compiled(engine)  # refuses an unknown engine before any work
    if clearance is not None and receiver_height is not None:
        raise ValueError("give a net clearance or a receiver height, not both")
    tx, ty = np.broadcast_arrays(
        np.atleast_1d(np.asarray(target_x, float)), np.atleast_1d(np.asarray(target_y, float))
    )
    extra = clearance if clearance is not None else receiver_height
    names = free_parameters(free, third=extra is not None)
    extra_key = "net_clearance_m" if clearance is not None else "receiver_height_m"
    active = has_extra = None
    if extra is not None:
        extra = np.broadcast_to(np.asarray(extra, float), tx.shape)
        has_extra = np.isfinite(extra)
        if not has_extra.all():  # NaN: this target has no clearance or height to meet
            active = np.stack([np.ones(tx.size, bool)] * 2 + [has_extra], axis=1)
            extra = np.where(has_extra, extra, 0.0)
    n = tx.size
    state, base, serve = _batch(incoming, stroke, which, n)
    lo = np.array([_SWING_BOUNDS[k][0] for k in names])
    hi = np.array([_SWING_BOUNDS[k][1] for k in names])
    scale = np.array([_SWING_BOUNDS[k][2] for k in names])
    goal = (extra, extra_key, active, has_extra)
    system = _StrokeSystem(state, base, serve, conditions, names, tx, ty, goal, engine)
    p0 = np.stack([getattr(base, k) for k in names], axis=1).astype(float)
    x0, y0 = state.position[:, 0], state.position[:, 1]
    p0[:, names.index("swing_direction")] = np.arctan2(ty - y0, tx - x0)
    if start is not None:
        guess = np.asarray(start, float)
        if guess.shape != p0.shape:
            raise ValueError(f"start must be shaped {p0.shape}, not {guess.shape}")
        use = np.isfinite(guess) if active is None else np.isfinite(guess) & active
        p0 = np.where(use, guess, p0)
    p0 = np.clip(p0, lo, hi)
    solved = None
    if engine == "compiled" and receiver_height is None:
        solved = _compiled_solve(system, p0, lo, hi, scale, active, method)
    if solved is None:
        solved = solve(system.evaluate, p0, lo, hi, scale, method=method, active=active)
    p, ok, iters = solved
    every = np.arange(n)
    result = system.run(p, every, record=True) if play else None
    m = result.metrics if play else system.first(p, every)
    ok = ok & ~np.isin(m["outcome"], ("net", "miss"))
    reason = _reasons(m, ok, tx, p, lo, hi, names, extra_key if extra is not None else None, active)
    settings = {name: p[:, j] for j, name in enumerate(names)}
    swing = system.swings(p, every)
    return AimResult(settings, ok, reason, result, tx, ty, iters, metrics=m, swing=swing)


def _compiled_solve(system, p0, lo, hi, scale, active, method="newton"):
    """The compiled solve of :mod:`rallyarc.aim.compiled` with the solver's ``method`` (numba
    loads on first use), or None where the conditions have no compiled form or a target's
    inputs are refused (the numpy solver then solves the batch)."""
    from rallyarc.aim.compiled import solve_stroke, supports

    if not supports(system.conditions):
        return None
    out = solve_stroke(system, p0, lo, hi, scale, active, method=method)
    return None if out is None else out[:3]


class _StrokeSystem:
    """The N aiming systems of :func:`aim_stroke`: the swings of parameters ``p`` for the
    targets ``idx`` (stacked ``len(p) // len(idx)`` times), the shots they play and the
    residuals divided by their tolerances."""

    def __init__(self, state, base, serve, conditions, names, tx, ty, goal, engine="numpy"):
        self.state, self.base, self.serve, self.conditions = state, base, serve, conditions
        self.engine = engine
        self.names, self.tx, self.ty = names, tx, ty
        # the third goal: values, metric key, which targets have one (active, has_extra)
        self.extra, self.extra_key, self.active, self.has_extra = goal
        self.offset = base.face_azimuth - base.swing_direction

    def swings(self, p, idx):
        reps = p.shape[0] // len(idx)
        fields = {f: np.tile(getattr(self.base, f)[idx], reps) for f in Swing.FIELDS}
        for j, name in enumerate(self.names):
            fields[name] = p[:, j]
        fields["face_azimuth"] = fields["swing_direction"] + np.tile(self.offset[idx], reps)
        return Swing(**fields)

    def _balls(self, idx, reps):
        s = self.state
        return BallState(*(np.tile(a[idx], (reps, 1)) for a in (s.position, s.velocity, s.spin)))

    def run(self, p, idx, record=False):
        reps = p.shape[0] // len(idx)
        serve = np.tile(self.serve[idx], reps)
        return simulate(
            self._balls(idx, reps), self.swings(p, idx), self.conditions, serve=serve,
            record=record,
        )  # fmt: skip

    def first(self, p, idx):
        # the residual's part of the chain: the receiver's height needs the bounce, the rest
        # only the flight to the first bounce
        if self.extra is not None and self.extra_key == "receiver_height_m":
            return self.run(p, idx).metrics
        reps = p.shape[0] // len(idx)
        serve = np.tile(self.serve[idx], reps)
        balls, swings = self._balls(idx, reps), self.swings(p, idx)
        return struck(balls, swings, self.conditions, serve, engine=self.engine)

    def evaluate(self, p, idx):
        reps = p.shape[0] // len(idx)
        m = self.first(p, idx)
        out = [
            (finite(m["flight_ground_x_m"], -30.0) - np.tile(self.tx[idx], reps)) / LAND_TOL_M,
            (finite(m["flight_ground_y_m"], 0.0) - np.tile(self.ty[idx], reps)) / LAND_TOL_M,
        ]
        if self.extra is not None:
            target = np.tile(self.extra[idx], reps)
            miss = (height_value(m, self.extra_key) - target) / HEIGHT_TOL_M
            if self.active is not None:
                miss = np.where(np.tile(self.has_extra[idx], reps), miss, 0)
            out.append(miss)
        return np.stack(out, axis=1)


def _batch(incoming, stroke, which, n):
    """The N targets' balls at contact, base swings and serve flags, from one stroke, one per
    target, or K strokes chosen per target by ``which``."""
    several = isinstance(stroke, list | tuple)
    styles = list(stroke) if several else [stroke]
    if which is None:
        if several and len(styles) != n:
            raise ValueError(f"give one stroke or one per target ({n}), not {len(styles)}")
        which = np.arange(n) if several else np.zeros(n, int)
    which = np.broadcast_to(np.asarray(which, int), (n,))
    if incoming is None:
        toss = serve_states(styles)
        incoming = BallState(toss.position[which], toss.velocity[which], toss.spin[which])
    state = BallState.of(incoming.position, incoming.velocity, incoming.spin, n)
    per_style = Swing.from_strokes(styles)
    base = Swing(**{f: getattr(per_style, f)[which] for f in Swing.FIELDS})
    serve = np.array([s.kind == "serve" for s in styles])[which]
    return state, base, serve


def _reasons(m, ok, tx, p, lo, hi, names, extra_key, active):
    reason = np.full(ok.shape, "", dtype=object)
    bound = (p <= lo + 1e-9) | (p >= hi - 1e-9)
    if active is not None:
        bound &= active
    at_bound = np.any(bound, axis=1)
    extra_key = np.full(ok.shape, extra_key, dtype=object)
    if active is not None:
        extra_key[~active[:, -1]] = None
    for i in np.flatnonzero(~ok):
        land = m["land_x_m"][i]
        if m["outcome"][i] == "net":
            why = "net: within the style's range every nearby swing puts the ball into the net"
        elif np.isfinite(land) and land > tx[i] + LAND_TOL_M:
            why = "too long: the style cannot bring the ball down short enough"
        elif extra_key[i] is not None and m["impact_spin_limit_reached"][i]:
            why = (
                "friction-only spin limit: the strings already grip the ball, so no swing of "
                "this style gives the spin the height target needs"
            )
        elif at_bound[i]:
            bounded = [names[j] for j in np.flatnonzero(bound[i])]
            why = "outside the style's range of " + ", ".join(bounded)
        else:
            why = "no swing of this style found that meets every target"
        reason[i] = why
    return reason.astype(str)
