"""The contact search of :func:`rallyarc.rally.meet.meet` compiled with numba, one ball at a
time in a compiled loop instead of all balls at once in numpy.

:func:`search` returns, for each ball, what the numpy search of :mod:`rallyarc.rally.meet`
finds: the time the receiver's timing names (the Illinois root of the height minus the middle
of the contact band, on the rise or on the drop, or the apex), whether the point there is
within reach, else the feasible time nearest to it on the path sampled at
:data:`~rallyarc.rally.meet.PATH_SAMPLES` points refined by bisection, whether one was found
and, where none was, why (a code of :data:`REASONS`). The ball's position at a time is the
quintic Hermite on the recorded step knots that
:meth:`rallyarc.flight.integrate.Trajectory.sample_positions` evaluates, with the same
segment choice, formulas and order of operations, so the two searches agree to rounding (the
parity tests, tests/rally/test_meet_compiled.py). The positions, velocities and spins at the
contact, the phase, the body position and the stretch stay with the caller.

The first call in a process compiles the kernel, or loads it from numba's cache beside this
module (``cache=True``) when an earlier process compiled it.
"""

from __future__ import annotations

import math

import numba
import numpy as np

from rallyarc.flight import integrate

#: The quintic Hermite position of :mod:`rallyarc.flight.integrate` (the one formula that
#: ``Trajectory.sample_positions`` evaluates), compiled for one coordinate at a time.
_hermite_position = numba.njit(cache=True)(integrate._hermite_position)

#: Why no point of a ball's path was within reach, by the kernel's reason code.
REASONS = ("", "out of height range", "too far to run", "past the deepest position")

#: The receiver's timing, by its code in the kernel.
TIMING_CODES = {"apex": 0, "rise": 1, "drop": 2}

# layout of the receiver vector handed to the kernel
_R_TIMING, _R_MID, _R_LOW, _R_HIGH, _R_DEEP, _R_REACH, _R_RUN, _R_REACT = range(8)
_N_RECEIVER = 8


@numba.njit(cache=True)
def _position(knots_t, knots_x, knots_v, knots_a, c, t, out):
    """Position [m] of ball column ``c`` at time ``t`` [s] into ``out`` (3,): ``t`` clamped to
    the ball's knots, the segment holding it (the count of knots at or before it, less one,
    kept within the knots) and the quintic Hermite at its fraction of that segment."""
    k = knots_t.shape[0]
    lo, hi = knots_t[0, c], knots_t[k - 1, c]
    tau = min(max(t, lo), hi)
    below = -1
    for i in range(k):
        if knots_t[i, c] <= tau:
            below += 1
    idx = min(max(below, 0), k - 2)
    t_a, t_b = knots_t[idx, c], knots_t[idx + 1, c]
    h = t_b - t_a
    s = (tau - t_a) / h if h > 0 else 0.0
    hh = h * h
    for d in range(3):
        x0, x1 = knots_x[idx, c, d], knots_x[idx + 1, c, d]
        hv0, hv1 = h * knots_v[idx, c, d], h * knots_v[idx + 1, c, d]
        ha0, ha1 = hh * knots_a[idx, c, d], hh * knots_a[idx + 1, c, d]
        out[d] = _hermite_position(s, x0, hv0, ha0, x1, hv1, ha1)


@numba.njit(cache=True)
def _parts(t, pos, t_b, sx, sy, rec):
    """The three conditions of reach at time ``t`` [s] and position ``pos`` [m]: within the
    height range after the bounce, no deeper than the deepest position, within the run."""
    z = pos[2]
    height = z >= rec[_R_LOW] and z <= rec[_R_HIGH] and t > t_b
    depth = pos[0] <= rec[_R_DEEP]
    dist = math.hypot(pos[0] - sx, pos[1] - sy)
    move = dist <= rec[_R_REACH] + rec[_R_RUN] * max(0.0, t - rec[_R_REACT])
    return height, depth, move


@numba.njit(cache=True)
def _feasible(knots_t, knots_x, knots_v, knots_a, c, t, t_b, sx, sy, rec, pos):
    """Whether the point of ball column ``c`` at time ``t`` [s] is within reach."""
    _position(knots_t, knots_x, knots_v, knots_a, c, t, pos)
    height, depth, move = _parts(t, pos, t_b, sx, sy, rec)
    return height and depth and move


@numba.njit(cache=True)
def _sign(x):
    """numpy's sign: -1, 0 or 1, NaN for NaN."""
    if x > 0:
        return 1.0
    if x < 0:
        return -1.0
    if x == 0:
        return 0.0
    return x


@numba.njit(cache=True)
def _root(knots_t, knots_x, knots_v, knots_a, c, level, a, b, iterations, pos):
    """Illinois iteration for the time [s] between ``a`` and ``b`` when ball column ``c``
    passes height ``level`` [m], step for step as the numpy search's root."""
    _position(knots_t, knots_x, knots_v, knots_a, c, a, pos)
    fa = pos[2] - level
    _position(knots_t, knots_x, knots_v, knots_a, c, b, pos)
    fb = pos[2] - level
    t = a if fa == 0 else b
    last = 0
    for _ in range(iterations):
        width = fb - fa
        t = (a * fb - b * fa) / width if width != 0 else a
        t = min(max(t, min(a, b)), max(a, b))
        _position(knots_t, knots_x, knots_v, knots_a, c, t, pos)
        ft = pos[2] - level
        keep_b = _sign(ft) == _sign(fa)
        if keep_b and last == 1:
            fb = 0.5 * fb
        if not keep_b and last == -1:
            fa = 0.5 * fa
        if keep_b:
            a, fa = t, ft
            last = 1
        else:
            b, fb = t, ft
            last = -1
    return t


@numba.njit(cache=True)
def _search_all(
    knots_t,
    knots_x,
    knots_v,
    knots_a,
    cols,
    t_b,
    t_e,
    start,
    apex_occurred,
    apex_t,
    apex_z,
    radius,
    rec,
    frac,
    root_iterations,
    bisect_iterations,
    target,
    t_apex,
    t_c,
    found,
    reason,
):
    """The contact search of every ball (see the module), into the output arrays ``target``,
    ``t_apex``, ``t_c`` [s], ``found`` and ``reason`` (codes of :data:`REASONS`)."""
    n = cols.size
    m = frac.size
    pos = np.empty(3)
    grid = np.empty(m)
    ok = np.empty(m, np.bool_)
    timing = rec[_R_TIMING]
    mid = rec[_R_MID]
    for i in range(n):
        c = cols[i]
        tb, te, sx, sy = t_b[i], t_e[i], start[i, 0], start[i, 1]
        ta = apex_t[i] if apex_occurred[i] else tb
        za = apex_z[i] if apex_occurred[i] else radius
        t_apex[i] = ta
        if timing == 0 or not za > mid:
            tt = ta
        elif timing == 1:
            tt = _root(knots_t, knots_x, knots_v, knots_a, c, mid, tb, ta, root_iterations, pos)
        else:
            tt = _root(knots_t, knots_x, knots_v, knots_a, c, mid, ta, te, root_iterations, pos)
        target[i] = tt
        reason[i] = 0
        if _feasible(knots_t, knots_x, knots_v, knots_a, c, tt, tb, sx, sy, rec, pos):
            t_c[i] = tt
            found[i] = True
            continue

        # the sampled path: the feasible sample nearest the target (the first of equals)
        any_hd, any_dm = False, False
        j, best = 0, np.inf
        for q in range(m):
            g = tb + frac[q] * (te - tb)
            grid[q] = g
            _position(knots_t, knots_x, knots_v, knots_a, c, g, pos)
            height, depth, move = _parts(g, pos, tb, sx, sy, rec)
            ok[q] = height and depth and move
            any_hd = any_hd or (height and depth)
            any_dm = any_dm or (depth and move)
            gap = abs(g - tt) if ok[q] else np.inf
            if gap < best:
                j, best = q, gap
        hit = best < np.inf
        found[i] = hit
        tc = grid[j]
        if not hit:
            t_c[i] = tc
            if any_dm:
                reason[i] = 1
            elif any_hd:
                reason[i] = 2
            else:
                reason[i] = 3
            continue

        # refine toward the target: bisect between the feasible sample and its neighbour
        nb = min(max(j + (1 if grid[j] < tt else -1), 0), m - 1)
        if not ok[nb] and nb != j:
            a, b = tc, grid[nb]
            fa = _feasible(knots_t, knots_x, knots_v, knots_a, c, a, tb, sx, sy, rec, pos)
            for _ in range(bisect_iterations):
                mid_t = 0.5 * (a + b)
                fm = _feasible(knots_t, knots_x, knots_v, knots_a, c, mid_t, tb, sx, sy, rec, pos)
                if fm == fa:
                    a = mid_t
                else:
                    b = mid_t
            tc = a if fa else b
        t_c[i] = tc


def receiver_vector(receiver, deepest):
    """The receiver's timing, contact band middle, lowest and highest contact [m], deepest
    position [m] (x in the hitter's frame), reach [m], run speed [m/s] and reaction [s] as the
    kernel's vector (a timing other than apex and rise searches on the drop, as numpy's does)."""
    rec = np.zeros(_N_RECEIVER)
    timing = receiver.timing
    rec[_R_TIMING] = TIMING_CODES[
        "apex" if timing == "apex" else "rise" if timing == "rise" else "drop"
    ]
    rec[_R_MID] = 0.5 * (receiver.contact_band[0] + receiver.contact_band[1])
    rec[_R_LOW], rec[_R_HIGH], rec[_R_DEEP] = receiver.lowest, receiver.highest, deepest
    rec[_R_REACH], rec[_R_RUN], rec[_R_REACT] = (
        receiver.reach,
        receiver.run_speed,
        receiver.reaction,
    )
    return rec


def search(
    trajectory,
    cols,
    t_b,
    t_e,
    start,
    apex,
    radius,
    receiver,
    deepest,
    frac,
    root_iterations,
    bisect_iterations,
):
    """The contact search of the balls in columns ``cols`` (n,) of ``trajectory`` (a
    :class:`rallyarc.flight.integrate.Trajectory` of the flight after the bounce): bounce times
    ``t_b`` and second-bounce times ``t_e`` (n,) [s], start positions ``start`` (n, 2) [m], the
    flight's apex event record ``apex`` (its columns ``cols``), the ball's ``radius`` [m] (the
    apex height of a ball without one), the ``receiver`` (a player), the deepest position
    ``deepest`` [m], the sample fractions ``frac`` (M,) of the path and the iteration counts.

    Returns ``target``, ``t_apex``, ``t_c`` (n,) [s], ``found`` (n,) bool and ``reason`` (n,)
    int8 codes of :data:`REASONS`.
    """
    cols = np.ascontiguousarray(cols, dtype=np.int64)
    n = cols.size
    f64 = np.float64
    target, t_apex, t_c = np.empty(n), np.empty(n), np.empty(n)
    found = np.zeros(n, np.bool_)
    reason = np.zeros(n, np.int8)
    _search_all(
        np.ascontiguousarray(trajectory.t, dtype=f64),
        np.ascontiguousarray(trajectory.position, dtype=f64),
        np.ascontiguousarray(trajectory.velocity, dtype=f64),
        np.ascontiguousarray(trajectory.acceleration, dtype=f64),
        cols,
        np.ascontiguousarray(t_b, dtype=f64),
        np.ascontiguousarray(t_e, dtype=f64),
        np.ascontiguousarray(start, dtype=f64),
        np.ascontiguousarray(apex.occurred[cols], dtype=np.bool_),
        np.ascontiguousarray(apex.t[cols], dtype=f64),
        np.ascontiguousarray(apex.position[cols, 2], dtype=f64),
        float(radius),
        receiver_vector(receiver, deepest),
        np.ascontiguousarray(frac, dtype=f64),
        int(root_iterations),
        int(bisect_iterations),
        target,
        t_apex,
        t_c,
        found,
        reason,
    )
    return target, t_apex, t_c, found, reason
