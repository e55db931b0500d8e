"""Flights of many balls compiled with numba: the numpy integrator's algorithm, one ball at a
time in a compiled loop instead of all balls at once in numpy.

:func:`fly_compiled` returns what :func:`flight.integrate.fly` returns for the same arguments:
any plane events (position or velocity planes, any direction, terminal or not, an offset per
ball or one for all), a launch time per ball, and with ``record`` the step knots for dense
output. :func:`fly_net_and_ground` is its special case ``[net_plane(1),
ground_contact(params.radius)]`` without a trajectory, kept as a kernel of its own because the
general one costs more per ball (about 4 % on 5,000 balls, 45 % on one ball).

Both run the same Dormand-Prince 5(4) pair, error norm, step size rule, starting step, event
location (the endpoint sign test, the first root of the quintic Hermite of a position plane or
the cubic Hermite of a velocity plane, the earliest terminal crossing ending the flight, one
fresh sub-step to each counted root, one Taylor correction onto the plane) and forces as the
numpy integrator, operation for operation; results differ only where ``exp`` and ``pow`` of
the compiled code and of numpy round differently (about one unit in the last place), and, for
a plane whose normal is not along an axis, where numpy's matrix product sums ``n . x`` in
another order; the parity tests bound both (tests/flight/test_compiled.py).

The aerodynamic models of :mod:`flight.aero` are compiled in by type (:func:`supports`); any
other model has no compiled form and both functions refuse it, so that callers fly
such balls with :func:`flight.integrate.fly`.

The first call in a process compiles the kernels, or loads them from numba's cache beside this
module (``cache=True``) when an earlier process compiled it.

References
----------
Dormand, J. R. and Prince, P. J. (1980), A family of embedded Runge-Kutta formulae,
J. Comput. Appl. Math. 6:19-26, doi:10.1016/0771-050X(80)90013-3.
Hairer, E., Norsett, S. P. and Wanner, G. (1993), Solving Ordinary Differential Equations I,
2nd ed., Springer, section II.4 (step size control, starting step size).
"""

from __future__ import annotations

import math

import numba
import numpy as np

from .aero import ConstantAero, CrossLindseyAero, StepanekAero
from .integrate import _A, _C, _E, EventRecord, FlightResult, Trajectory, checked_launch

# the tableau as arrays; a zero coefficient is skipped, as the numpy step skips it
_A_ARR = np.zeros((7, 6))
for _i, _row in enumerate(_A):
    _A_ARR[_i, : len(_row)] = _row
_C_ARR = np.array(_C)
_E_ARR = np.array(_E)

#: Aerodynamic models with a compiled form, by exact type, and their code in the kernel.
_AERO_KIND = {StepanekAero: 0, CrossLindseyAero: 1, ConstantAero: 2}

# layout of the parameter vector handed to the kernel
_P_KIND, _P_C1, _P_C2, _P_RADIUS, _P_K, _P_DECAY, _P_WIND, _P_G, _P_STILL = (
    0,
    1,
    2,
    3,
    4,
    5,
    6,
    9,
    10,
)
_N_PARAMS = 11


def supports(params):
    """Whether the compiled flight can fly balls of ``params`` (its aero model has a compiled
    form: :class:`~flight.aero.StepanekAero`, :class:`~flight.aero.CrossLindseyAero` or
    :class:`~flight.aero.ConstantAero`, exactly, not a subclass)."""
    return type(params.aero) in _AERO_KIND


def _param_vector(params):
    aero = params.aero
    kind = _AERO_KIND[type(aero)]
    p = np.zeros(_N_PARAMS)
    p[_P_KIND] = kind
    if kind == 0:
        p[_P_C1] = aero.drag_constant
    elif kind == 1:
        p[_P_C1] = aero.drag_coefficient
    else:
        p[_P_C1], p[_P_C2] = aero.drag_coefficient, aero.lift_coefficient
    p[_P_RADIUS] = params.radius
    p[_P_K] = params.drag_factor
    p[_P_DECAY] = params.spin_decay_rate
    wind = np.asarray(params.wind, dtype=float)
    p[_P_WIND : _P_WIND + 3] = wind
    p[_P_G] = params.gravity
    p[_P_STILL] = 0.0 if np.any(wind) else 1.0
    return p


@numba.njit(cache=True)
def _acc(t, vx, vy, vz, w0x, w0y, w0z, p):
    """Acceleration [m/s^2] of a ball of velocity ``v`` [m/s] at time ``t`` [s] after launch with
    spin ``w0`` [rad/s]: drag and lift on the air velocity, and gravity."""
    if p[_P_STILL] == 1.0:
        ux, uy, uz = vx, vy, vz
    else:
        ux, uy, uz = vx - p[_P_WIND], vy - p[_P_WIND + 1], vz - p[_P_WIND + 2]
    rate = p[_P_DECAY]
    if rate == 0.0:
        wx, wy, wz = w0x, w0y, w0z
    else:
        f = math.exp(-rate * t)
        wx, wy, wz = w0x * f, w0y * f, w0z * f
    speed2 = ux * ux + uy * uy + uz * uz
    cx = wy * uz - wz * uy
    cy = wz * ux - wx * uz
    cz = wx * uy - wy * ux
    radius = p[_P_RADIUS]
    s = radius * math.sqrt(cx * cx + cy * cy + cz * cz) / max(speed2, 1e-300)
    kind = p[_P_KIND]
    if kind == 0.0:
        u = s * s * math.sqrt(s)
        cd = 0.508 + (u / (p[_P_C1] * u + 4.196)) ** 0.4
        slope = 1.0 / (2.022 * s + 0.981)
    elif kind == 1.0:
        cd = p[_P_C1]
        slope = 1.0 / (2.022 * s + 0.981)
    else:
        cd = p[_P_C1]
        slope = p[_P_C2] / max(s, 1e-9)
    k = p[_P_K]
    drag = -k * cd * math.sqrt(speed2)
    lift = k * radius * slope
    ax = drag * ux + lift * cx + 0.0
    ay = drag * uy + lift * cy + 0.0
    az = drag * uz + lift * cz + -p[_P_G]
    return ax, ay, az


@numba.njit(cache=True)
def _dp_step(t, x, v, a, h, w0, p, kv, ka, out):
    """One Dormand-Prince 5(4) step of length ``h`` [s] from ``(t, x, v, a)``; writes the
    fifth-order ``x, v, a`` and the error estimates of x and v into the rows of ``out``."""
    for c in range(3):
        kv[0, c] = v[c]
        ka[0, c] = a[c]
    for i in range(1, 7):
        for c in range(3):
            dx = 0.0
            dv = 0.0
            for j in range(i):
                coeff = _A_ARR[i, j]
                if coeff != 0.0:
                    dx = dx + coeff * kv[j, c]
                    dv = dv + coeff * ka[j, c]
            out[0, c] = x[c] + h * dx
            kv[i, c] = v[c] + h * dv
        ax, ay, az = _acc(t + _C_ARR[i] * h, kv[i, 0], kv[i, 1], kv[i, 2], w0[0], w0[1], w0[2], p)
        ka[i, 0], ka[i, 1], ka[i, 2] = ax, ay, az
    for c in range(3):
        ex = 0.0
        ev = 0.0
        for j in range(7):
            e = _E_ARR[j]
            if e != 0.0:
                ex = ex + e * kv[j, c]
                ev = ev + e * ka[j, c]
        out[1, c] = kv[6, c]
        out[2, c] = ka[6, c]
        out[3, c] = h * ex
        out[4, c] = h * ev


@numba.njit(cache=True)
def _error_norm(out, x, v, rtol, atol):
    tx = 0.0
    tv = 0.0
    for c in range(3):
        sc_x = atol + rtol * max(abs(x[c]), abs(out[0, c]))
        sc_v = atol + rtol * max(abs(v[c]), abs(out[1, c]))
        rx = out[3, c] / sc_x
        rv = out[4, c] / sc_v
        tx = tx + rx * rx if c else rx * rx
        tv = tv + rv * rv if c else rv * rv
    return math.sqrt((tx + tv) / 6.0)


@numba.njit(cache=True)
def _initial_step(x, v, a, w0, p, rtol, atol, t_left):
    """Starting step [s] of Hairer et al. (1993), II.4."""
    s0 = 0.0
    s1 = 0.0
    s2 = 0.0
    s3 = 0.0
    for c in range(3):
        sc_x = atol + rtol * abs(x[c])
        sc_v = atol + rtol * abs(v[c])
        r0, r1, r2, r3 = x[c] / sc_x, v[c] / sc_v, v[c] / sc_x, a[c] / sc_v
        s0 = s0 + r0 * r0 if c else r0 * r0
        s1 = s1 + r1 * r1 if c else r1 * r1
        s2 = s2 + r2 * r2 if c else r2 * r2
        s3 = s3 + r3 * r3 if c else r3 * r3
    d0 = math.sqrt((s0 + s1) / 6)
    d1 = math.sqrt((s2 + s3) / 6)
    if d0 < 1e-5 or d1 < 1e-5:
        h0 = 1e-6
    else:
        h0 = 0.01 * d0 / max(d1, 1e-300)
    a1 = _acc(
        0.0 + h0, v[0] + h0 * a[0], v[1] + h0 * a[1], v[2] + h0 * a[2], w0[0], w0[1], w0[2], p
    )
    dv = 0.0
    da = 0.0
    for c in range(3):
        sc_x = atol + rtol * abs(x[c])
        sc_v = atol + rtol * abs(v[c])
        rx = a[c] * h0 / sc_x
        ra = (a1[c] - a[c]) / sc_v
        dv = dv + rx * rx if c else rx * rx
        da = da + ra * ra if c else ra * ra
    d2 = math.sqrt((dv + da) / 6) / h0
    big = max(d1, d2)
    if big <= 1e-15:
        h1 = max(1e-6, h0 * 1e-3)
    else:
        h1 = (0.01 / big) ** 0.2
    return min(min(100 * h0, h1), t_left)


@numba.njit(cache=True)
def _horner(c, s):
    value = c[5]
    slope = 0.0
    for i in range(4, -1, -1):
        slope = slope * s + value
        value = value * s + c[i]
    return value, slope


@numba.njit(cache=True)
def _first_root(c):
    """First root in (0, 1] where the quintic ``c`` goes from > 0 to <= 0: 8 samples, then 6
    safeguarded Newton iterations. Returns ``(found, s)``."""
    n_samples = 8
    prev = _horner(c, 0.0)[0]
    first = -1
    g_lo = 0.0
    g_hi = 0.0
    for k in range(1, n_samples + 1):
        g = _horner(c, k / n_samples)[0]
        if first < 0 and prev > 0 and g <= 0:
            first = k - 1
            g_lo, g_hi = prev, g
        prev = g
    if first < 0:
        return False, 0.0
    lo = first / n_samples
    hi = (first + 1) / n_samples
    denom = g_lo - g_hi
    s = lo + (hi - lo) * g_lo / (denom if denom > 0 else 1.0)
    for _ in range(6):
        g, dg = _horner(c, s)
        if g > 0:
            lo = s
        if g <= 0:
            hi = s
        s_new = s - g / (dg if dg != 0 else 1.0)
        s = s_new if (s_new >= lo and s_new <= hi) else 0.5 * (lo + hi)
    return True, s


@numba.njit(cache=True)
def _crossing(axis, offset, sign, h, x, v, a, out, c):
    """Step fraction at which a ball crosses the plane ``x[axis] = offset`` on an accepted step
    of length ``h`` [s]; ``sign`` makes the side before the crossing positive."""
    p0 = sign * (x[axis] - offset)
    q0 = sign * h * v[axis]
    r0 = sign * (h * h) * a[axis]
    p1 = sign * (out[0, axis] - offset)
    q1 = sign * h * out[1, axis]
    r1 = sign * (h * h) * out[2, axis]
    c[0] = p0
    c[1] = q0
    c[2] = 0.5 * r0
    c[3] = -10 * p0 - 6 * q0 - 1.5 * r0 + 10 * p1 - 4 * q1 + 0.5 * r1
    c[4] = 15 * p0 + 8 * q0 + 1.5 * r0 - 15 * p1 + 7 * q1 - r1
    c[5] = -6 * p0 - 3 * q0 - 0.5 * r0 + 6 * p1 - 3 * q1 + 0.5 * r1
    return _first_root(c)


@numba.njit(cache=True)
def _place(axis, offset, t, h_sub, x, v, a, w0, p, kv, ka, sub, rec, i):
    """The state where the ball meets the plane ``x[axis] = offset``: one fresh step of length
    ``h_sub`` [s] from the step's start and one Taylor correction; written into row ``i`` of
    ``rec`` as ``t, x, v, spin``."""
    _dp_step(t, x, v, a, h_sub, w0, p, kv, ka, sub)
    dt = -(sub[0, axis] - offset) / sub[1, axis]
    t_ev = t + h_sub + dt
    rec[i, 0] = t_ev
    rate = p[_P_DECAY]
    f = math.exp(-rate * t_ev) if rate != 0.0 else 1.0
    for c in range(3):
        rec[i, 1 + c] = sub[0, c] + sub[1, c] * dt + 0.5 * sub[2, c] * dt * dt
        rec[i, 4 + c] = sub[1, c] + sub[2, c] * dt
        rec[i, 7 + c] = w0[c] * f if rate != 0.0 else w0[c]


@numba.njit(cache=True)
def _fly_ball(
    b, pos, vel, spin, p, t_max, rtol, atol, net, ground, end, term, steps, work, x, v, a, w0
):
    """Fly ball ``b`` of :func:`_fly_all` to the ground or ``t_max`` [s]: writes its rows of
    ``net``, ``ground`` (left as they are where not met), ``end``, ``term`` (left as it is when
    the flight ends at ``t_max``) and ``steps``. ``work`` holds the scratch arrays of
    :func:`_scratch`; ``x``, ``v``, ``a`` and ``w0`` are 3-vectors of scratch space."""
    kv, ka, out, sub, coeffs = work
    radius = p[_P_RADIUS]
    rate = p[_P_DECAY]
    for c in range(3):
        x[c], v[c], w0[c] = pos[b, c], vel[b, c], spin[b, c]
    t = 0.0
    a0 = _acc(t, v[0], v[1], v[2], w0[0], w0[1], w0[2], p)
    a[0], a[1], a[2] = a0
    h = _initial_step(x, v, a, w0, p, rtol, atol, t_max)
    net_met = False
    ground_met = False
    n_steps = 0
    which = -1
    while True:
        _dp_step(t, x, v, a, h, w0, p, kv, ka, out)
        err = _error_norm(out, x, v, rtol, atol)
        ok = err <= 1.0
        factor = min(max(0.9 * max(err, 1e-10) ** -0.2, 0.2), 5.0)
        if not ok:
            factor = min(factor, 1.0)
        done = False
        if ok:
            n_steps += 1
            # the net: x = 0 crossed forwards; the ground: z = r crossed downwards
            hit_net = False
            s_net = 0.0
            if not net_met and x[0] - 0.0 <= 0 and out[0, 0] - 0.0 >= 0:
                hit_net, s_net = _crossing(0, 0.0, -1, h, x, v, a, out, coeffs)
            hit_ground = False
            s_ground = 0.0
            if not ground_met and -(x[2] - radius) <= 0 and -(out[0, 2] - radius) >= 0:
                hit_ground, s_ground = _crossing(2, radius, 1, h, x, v, a, out, coeffs)
            s_end = 1.0
            which = -1
            if hit_ground and s_ground < s_end:
                s_end = s_ground
                which = 1
            if hit_net and s_net <= s_end:
                _place(0, 0.0, t, s_net * h, x, v, a, w0, p, kv, ka, sub, net, b)
                net_met = True
            if hit_ground and s_ground <= s_end:
                _place(2, radius, t, s_ground * h, x, v, a, w0, p, kv, ka, sub, ground, b)
                ground_met = True
                if which == 1:
                    for c in range(7):
                        end[b, c] = ground[b, c]
                    term[b] = 1
                    done = True
            t += h
            for c in range(3):
                x[c], v[c], a[c] = out[0, c], out[1, c], out[2, c]
        t_left = t_max - t
        if t_left <= 1e-12 and not done:
            end[b, 0] = t
            for c in range(3):
                end[b, 1 + c], end[b, 4 + c] = x[c], v[c]
            done = True
        h = min(h * factor, max(t_left, 1e-12))
        if done:
            break
    steps[b] = n_steps
    f = math.exp(-rate * end[b, 0]) if rate != 0.0 else 1.0
    for c in range(3):
        end[b, 7 + c] = spin[b, c] * f if rate != 0.0 else spin[b, c]


@numba.njit(cache=True)
def _scratch():
    """The scratch arrays of one flight of :func:`_fly_ball`: the stages' velocities and
    accelerations, a step's outputs, a sub-step's outputs and a crossing's quintic."""
    return np.empty((7, 3)), np.empty((7, 3)), np.empty((5, 3)), np.empty((5, 3)), np.empty(6)


@numba.njit(cache=True)
def _fly_all(pos, vel, spin, p, t_max, rtol, atol, net, ground, end, term, steps):
    """Fly every ball to the ground or ``t_max``. ``net`` and ``ground`` rows are ``t, x, v,
    spin`` (NaN where not met); ``end`` rows ``t, x, v``."""
    work = _scratch()
    x = np.empty(3)
    v = np.empty(3)
    a = np.empty(3)
    w0 = np.empty(3)
    for b in range(pos.shape[0]):
        _fly_ball(
            b,
            pos,
            vel,
            spin,
            p,
            t_max,
            rtol,
            atol,
            net,
            ground,
            end,
            term,
            steps,
            work,
            x,
            v,
            a,
            w0,
        )


# layout of an event's flags handed to the kernel
_F_TERMINAL, _F_DIRECTION, _F_VELOCITY = 0, 1, 2

# columns of an event row and of an end row: t, x, v, spin
_ROW = 10
# columns of a knot row: t, x, v, a
_KNOT = 10


@numba.njit(cache=True)
def _dot(n, j, vec):
    """``n[j] . vec``, summed in the order of the numpy integrator."""
    return n[j, 0] * vec[0] + n[j, 1] * vec[1] + n[j, 2] * vec[2]


@numba.njit(cache=True)
def _dot_row(n, j, out, r):
    return n[j, 0] * out[r, 0] + n[j, 1] * out[r, 1] + n[j, 2] * out[r, 2]


@numba.njit(cache=True)
def _plane_crossing(n, j, offset, sign, on_velocity, h, x, v, a, out, c):
    """Step fraction at which a ball crosses event plane ``j`` on an accepted step of length
    ``h`` [s]: the quintic Hermite of ``n . x`` (a position plane) or the cubic Hermite of
    ``n . v`` (a velocity plane); ``sign`` makes the side before the crossing positive."""
    if on_velocity:
        p0 = sign * (_dot(n, j, v) - offset)
        p1 = sign * (_dot_row(n, j, out, 1) - offset)
        q0 = sign * h * _dot(n, j, a)
        q1 = sign * h * _dot_row(n, j, out, 2)
        c[0] = p0
        c[1] = q0
        c[2] = -3 * p0 - 2 * q0 + 3 * p1 - q1
        c[3] = 2 * p0 + q0 - 2 * p1 + q1
        c[4] = 0.0
        c[5] = 0.0
        return _first_root(c)
    p0 = sign * (_dot(n, j, x) - offset)
    q0 = sign * h * _dot(n, j, v)
    r0 = sign * (h * h) * _dot(n, j, a)
    p1 = sign * (_dot_row(n, j, out, 0) - offset)
    q1 = sign * h * _dot_row(n, j, out, 1)
    r1 = sign * (h * h) * _dot_row(n, j, out, 2)
    c[0] = p0
    c[1] = q0
    c[2] = 0.5 * r0
    c[3] = -10 * p0 - 6 * q0 - 1.5 * r0 + 10 * p1 - 4 * q1 + 0.5 * r1
    c[4] = 15 * p0 + 8 * q0 + 1.5 * r0 - 15 * p1 + 7 * q1 - r1
    c[5] = -6 * p0 - 3 * q0 - 0.5 * r0 + 6 * p1 - 3 * q1 + 0.5 * r1
    return _first_root(c)


@numba.njit(cache=True)
def _place_on(n, j, offset, on_velocity, t, h_sub, x, v, a, w0, p, kv, ka, sub, row):
    """The state where the ball meets event plane ``j``: one fresh step of length ``h_sub`` [s]
    from the step's start (at ``t`` [s] after launch) and one Taylor correction; written into
    ``row`` as ``t`` (after launch), ``x``, ``v``, spin."""
    _dp_step(t, x, v, a, h_sub, w0, p, kv, ka, sub)
    if on_velocity:
        slope = _dot_row(n, j, sub, 2)
        dt = -(_dot_row(n, j, sub, 1) - offset) / (slope if slope != 0 else 1.0)
    else:
        dt = -(_dot_row(n, j, sub, 0) - offset) / _dot_row(n, j, sub, 1)
    t_ev = t + h_sub + dt
    row[0] = t_ev
    rate = p[_P_DECAY]
    f = math.exp(-rate * t_ev) if rate != 0.0 else 1.0
    for c in range(3):
        row[1 + c] = sub[0, c] + sub[1, c] * dt + 0.5 * sub[2, c] * dt * dt
        row[4 + c] = sub[1, c] + sub[2, c] * dt
        row[7 + c] = w0[c] * f if rate != 0.0 else w0[c]


@numba.njit(cache=True)
def _knot(knots, k, t, x, v, a):
    if k >= knots.shape[0]:
        grown = np.empty((2 * knots.shape[0], _KNOT))
        grown[: knots.shape[0]] = knots
        knots = grown
    knots[k, 0] = t
    for c in range(3):
        knots[k, 1 + c] = x[c]
        knots[k, 4 + c] = v[c]
        knots[k, 7 + c] = a[c]
    return knots


@numba.njit(cache=True)
def _fly_events(
    pos,
    vel,
    spin,
    t0,
    p,
    normals,
    offsets,
    flags,
    t_max,
    rtol,
    atol,
    record,
    met,
    rows,
    end,
    term,
    steps,
    knots,
    first_knot,
    n_knots,
):
    """Fly every ball to its first terminal event or ``t_max`` after its launch ``t0`` [s].

    ``met[j, b]`` and ``rows[j, b]`` (``t, x, v, spin``) receive ball b's first crossing of
    event j, ``end[b]`` its end (``t, x, v, spin``); times are on the clock of ``t0``. With
    ``record`` the step knots (``t, x, v, a``) of ball b are rows ``first_knot[b]`` to
    ``first_knot[b] + n_knots[b] - 1`` of the returned knot array (``knots`` grown as needed).
    """
    n_events = normals.shape[0]
    rate = p[_P_DECAY]
    kv = np.empty((7, 3))
    ka = np.empty((7, 3))
    out = np.empty((5, 3))
    sub = np.empty((5, 3))
    coeffs = np.empty(6)
    x = np.empty(3)
    v = np.empty(3)
    a = np.empty(3)
    w0 = np.empty(3)
    hit = np.zeros(n_events, dtype=np.bool_)
    s_hit = np.zeros(n_events)
    seen = np.zeros(n_events, dtype=np.bool_)
    k = 0
    for b in range(pos.shape[0]):
        for c in range(3):
            x[c], v[c], w0[c] = pos[b, c], vel[b, c], spin[b, c]
        tb = t0[b]
        t = 0.0
        a0 = _acc(t, v[0], v[1], v[2], w0[0], w0[1], w0[2], p)
        a[0], a[1], a[2] = a0
        h = _initial_step(x, v, a, w0, p, rtol, atol, t_max)
        for j in range(n_events):
            seen[j] = False
        n_steps = 0
        if record:
            first_knot[b] = k
            knots = _knot(knots, k, tb, x, v, a)
            k += 1
        while True:
            _dp_step(t, x, v, a, h, w0, p, kv, ka, out)
            err = _error_norm(out, x, v, rtol, atol)
            ok = err <= 1.0
            factor = min(max(0.9 * max(err, 1e-10) ** -0.2, 0.2), 5.0)
            if not ok:
                factor = min(factor, 1.0)
            done = False
            if ok:
                n_steps += 1
                # every event's crossing on this step, from the sign test at its ends
                for j in range(n_events):
                    hit[j] = False
                    if seen[j]:
                        continue
                    off = offsets[j, b]
                    on_velocity = flags[j, _F_VELOCITY] == 1
                    if on_velocity:
                        g_old = _dot(normals, j, v) - off
                        g_new = _dot_row(normals, j, out, 1) - off
                    else:
                        g_old = _dot(normals, j, x) - off
                        g_new = _dot_row(normals, j, out, 0) - off
                    sense = float(flags[j, _F_DIRECTION])
                    if sense == 0.0:
                        d = g_new - g_old
                        sense = 1.0 if d > 0 else (-1.0 if d < 0 else 0.0)
                    if sense != 0.0 and sense * g_old <= 0 and sense * g_new >= 0:
                        found, s = _plane_crossing(
                            normals, j, off, -sense, on_velocity, h, x, v, a, out, coeffs
                        )
                        hit[j] = found
                        s_hit[j] = s
                # the earliest terminal event ends the flight; crossings after it do not count
                s_end = 1.0
                which = -1
                for j in range(n_events):
                    if hit[j] and flags[j, _F_TERMINAL] == 1 and s_hit[j] < s_end:
                        s_end = s_hit[j]
                        which = j
                for j in range(n_events):
                    if hit[j] and s_hit[j] <= s_end:
                        _place_on(
                            normals,
                            j,
                            offsets[j, b],
                            flags[j, _F_VELOCITY] == 1,
                            t,
                            s_hit[j] * h,
                            x,
                            v,
                            a,
                            w0,
                            p,
                            kv,
                            ka,
                            sub,
                            rows[j, b],
                        )
                        rows[j, b, 0] = tb + rows[j, b, 0]
                        met[j, b] = True
                        seen[j] = True
                t += h
                for c in range(3):
                    x[c], v[c], a[c] = out[0, c], out[1, c], out[2, c]
                if which >= 0:
                    for c in range(7):
                        end[b, c] = rows[which, b, c]
                    term[b] = which
                    done = True
                    if record:
                        ae = _acc(
                            end[b, 0] - tb,
                            end[b, 4],
                            end[b, 5],
                            end[b, 6],
                            w0[0],
                            w0[1],
                            w0[2],
                            p,
                        )
                        for c in range(3):
                            out[0, c], out[1, c], out[2, c] = end[b, 1 + c], end[b, 4 + c], ae[c]
                        knots = _knot(knots, k, end[b, 0], out[0], out[1], out[2])
                        k += 1
                elif record:
                    knots = _knot(knots, k, tb + t, x, v, a)
                    k += 1
            t_left = t_max - t
            if t_left <= 1e-12 and not done:
                end[b, 0] = tb + t
                for c in range(3):
                    end[b, 1 + c], end[b, 4 + c] = x[c], v[c]
                done = True
            h = min(h * factor, max(t_left, 1e-12))
            if done:
                break
        steps[b] = n_steps
        if record:
            n_knots[b] = k - first_knot[b]
        f = math.exp(-rate * (end[b, 0] - tb)) if rate != 0.0 else 1.0
        for c in range(3):
            end[b, 7 + c] = spin[b, c] * f if rate != 0.0 else spin[b, c]
    return knots


def _checked_balls(position, velocity, spin, t0, t_max):
    """:func:`flight.integrate.checked_launch`, each array C-contiguous for the kernels."""
    return tuple(
        np.ascontiguousarray(a) for a in checked_launch(position, velocity, spin, t0, t_max)
    )


def _refuse_unsupported(params):
    if not supports(params):
        raise TypeError(
            f"no compiled flight for aero model {type(params.aero).__name__}; "
            "use flight.integrate.fly"
        )


def fly_compiled(
    position,
    velocity,
    spin,
    params,
    events=(),
    t0=0.0,
    t_max=10.0,
    rtol=1e-6,
    atol=1e-6,
    record=False,
):
    """Fly N balls until a terminal event or ``t_max``, compiled: what
    :func:`flight.integrate.fly` returns for the same arguments.

    Parameters
    ----------
    position, velocity, spin : array (N, 3)
        Initial ball centre [m], velocity [m/s] and spin [rad/s] in the court frame.
    params : flight.forces.FlightParams
        Its aero model must have a compiled form (:func:`supports`).
    events : sequence of flight.integrate.PlaneEvent
        Position or velocity planes, any direction, terminal or not, scalar or per-ball
        offset [m] or [m/s]; names must differ.
    t0 : float or array (N,)
        Launch time of each ball [s]; event and end times are on the same clock.
    t_max : float
        Longest flight [s] after each ball's launch; balls still flying then stop with
        ``terminated_by == -1``.
    rtol, atol : float
        Relative and absolute tolerances of the local error (position [m], velocity [m/s]).
    record : bool
        Keep the step knots for dense output (:class:`flight.integrate.Trajectory`).

    Returns
    -------
    FlightResult
        The events, ends, terminal events and step counts of :func:`flight.integrate.fly`.
        The recorded trajectory holds each ball's accepted steps in order, one column per
        ball, padded with the ball's last knot: its rows are not those of
        :func:`flight.integrate.fly` (one per iteration of the whole batch), but
        :meth:`~flight.integrate.Trajectory.sample` and
        :meth:`~flight.integrate.Trajectory.sample_positions` give the same values from the
        same step knots.

    Raises
    ------
    TypeError
        For an aero model without a compiled form (fly such balls with
        :func:`flight.integrate.fly`).
    ValueError
        For input that :func:`flight.integrate.fly` rejects, or two events of one name.
    """
    _refuse_unsupported(params)
    x, v, w, t0 = _checked_balls(position, velocity, spin, t0, t_max)
    n = x.shape[0]
    events = tuple(events)
    names = tuple(ev.name for ev in events)
    if len(set(names)) != len(names):
        raise ValueError("event names must differ")
    n_ev = len(events)
    normals = np.array([ev.normal for ev in events], dtype=float).reshape(n_ev, 3)
    offsets = np.empty((n_ev, n))
    flags = np.zeros((n_ev, 3), dtype=np.int64)
    for j, ev in enumerate(events):
        offsets[j] = np.broadcast_to(np.asarray(ev.offset, dtype=float), (n,))
        flags[j] = (int(ev.terminal), ev.direction, int(ev.on == "velocity"))
    met = np.zeros((n_ev, n), dtype=np.bool_)
    rows = np.full((n_ev, n, _ROW), np.nan)
    end = np.empty((n, _ROW))
    term = np.full(n, -1, dtype=np.int64)
    steps = np.zeros(n, dtype=np.int64)
    first_knot = np.zeros(n, dtype=np.int64)
    n_knots = np.zeros(n, dtype=np.int64)
    knots = np.empty((max(32 * n, 1) if record else 1, _KNOT))
    knots = _fly_events(
        x,
        v,
        w,
        t0,
        _param_vector(params),
        normals,
        offsets,
        flags,
        float(t_max),
        float(rtol),
        float(atol),
        bool(record),
        met,
        rows,
        end,
        term,
        steps,
        knots,
        first_knot,
        n_knots,
    )
    records = {
        name: EventRecord(
            met[j],
            rows[j, :, 0].copy(),
            rows[j, :, 1:4].copy(),
            rows[j, :, 4:7].copy(),
            rows[j, :, 7:10].copy(),
        )
        for j, name in enumerate(names)
    }
    trajectory = None
    if record:
        last = int(n_knots.max()) if n else 1
        # knot k of ball b, or its last knot once it has stopped
        at = first_knot[None, :] + np.minimum(np.arange(last)[:, None], n_knots[None, :] - 1)
        grid = knots[at]  # (K, N, 10)
        trajectory = Trajectory(
            np.ascontiguousarray(grid[:, :, 0]),
            np.ascontiguousarray(grid[:, :, 1:4]),
            np.ascontiguousarray(grid[:, :, 4:7]),
            np.ascontiguousarray(grid[:, :, 7:10]),
            np.array(w),
            np.array(t0),
            params.spin_decay_rate,
        )
    return FlightResult(
        t=end[:, 0].copy(),
        position=end[:, 1:4].copy(),
        velocity=end[:, 4:7].copy(),
        spin=end[:, 7:10].copy(),
        terminated_by=term,
        events=records,
        n_steps=steps,
        trajectory=trajectory,
        event_names=names,
    )


def fly_net_and_ground(position, velocity, spin, params, t_max=10.0, rtol=1e-6, atol=1e-6):
    """Fly N balls from launch to the ground (or ``t_max``), with the net plane and the ground
    as events, compiled.

    Parameters
    ----------
    position, velocity, spin : array (N, 3)
        Initial ball centre [m], velocity [m/s] and spin [rad/s] in the court frame.
    params : flight.forces.FlightParams
        Its aero model must have a compiled form (:func:`supports`).
    t_max : float
        Longest flight [s]; balls still flying then stop with ``terminated_by == -1``.
    rtol, atol : float
        Relative and absolute tolerances of the local error (position [m], velocity [m/s]).

    Returns
    -------
    FlightResult
        As ``fly(position, velocity, spin, params, [net_plane(1),
        ground_contact(params.radius)], t_max=t_max, rtol=rtol, atol=atol)`` returns it: events
        ``"net"`` and ``"ground"``, launch at t = 0, no trajectory.

    Raises
    ------
    TypeError
        For an aero model without a compiled form (fly such balls with
        :func:`flight.integrate.fly`).
    ValueError
        For input that :func:`flight.integrate.fly` rejects.
    """
    if not supports(params):
        raise TypeError(
            f"no compiled flight for aero model {type(params.aero).__name__}; "
            "use flight.integrate.fly"
        )
    x, v, w, _ = _checked_balls(position, velocity, spin, 0.0, t_max)
    n = x.shape[0]
    net = np.full((n, 10), np.nan)
    ground = np.full((n, 10), np.nan)
    end = np.empty((n, 10))
    term = np.full(n, -1, dtype=int)
    steps = np.zeros(n, dtype=int)
    _fly_all(
        x,
        v,
        w,
        _param_vector(params),
        float(t_max),
        float(rtol),
        float(atol),
        net,
        ground,
        end,
        term,
        steps,
    )

    def record(rows):
        return EventRecord(
            ~np.isnan(rows[:, 0]),
            rows[:, 0].copy(),
            rows[:, 1:4].copy(),
            rows[:, 4:7].copy(),
            rows[:, 7:10].copy(),
        )

    return FlightResult(
        t=end[:, 0].copy(),
        position=end[:, 1:4].copy(),
        velocity=end[:, 4:7].copy(),
        spin=end[:, 7:10].copy(),
        terminated_by=term,
        events={"net": record(net), "ground": record(ground)},
        n_steps=steps,
        event_names=("net", "ground"),
    )
