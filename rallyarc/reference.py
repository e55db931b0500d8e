"""One shot at a time with scipy's ``solve_ivp``: the straightforward implementation of the chain.

The same physics as :func:`rallyarc.shot.simulate` (the project's impact and bounce functions
called with one ball, :func:`flight.forces.acceleration` as the right-hand side), but each flight
is a separate ``solve_ivp`` call with its events as functions: the net plane, the receiver's
plane, the apex and the ground. With ``method="RK45", rtol=1e-6`` it is the per-shot baseline of
``benchmarks/throughput.py``; with ``method="DOP853", rtol=1e-10, atol=1e-12`` it is the
accuracy reference of the batch engine (tests/rallyarc/test_batch.py).

References
----------
Virtanen, P. et al. (2020), SciPy 1.0: fundamental algorithms for scientific computing in
Python, Nature Methods 17:261-272, doi:10.1038/s41592-019-0686-2 (``scipy.integrate.solve_ivp``).
"""

from __future__ import annotations

import math

import numpy as np
from scipy.integrate import solve_ivp

from rallyarc import court
from rallyarc.flight.forces import acceleration
from rallyarc.impact.contact import hit
from rallyarc.impact.geometry import face_orientation, swing_velocity
from rallyarc.shot import T_MAX, judge_landing

#: The reference integrator's settings (tight enough that its own error is far below 1 µm).
REFERENCE = {"method": "DOP853", "rtol": 1e-10, "atol": 1e-12}
#: The per-shot baseline: solve_ivp's default method at the batch engine's tolerance.
BASELINE = {"method": "RK45", "rtol": 1e-6, "atol": 1e-6}
#: The same baseline with a plain-float right-hand side, as a careful per-shot script is written
#: (the fair per-shot comparison for the batch engine's throughput).
BASELINE_PLAIN = {**BASELINE, "rhs": "plain"}


def _event(fun, terminal=False, direction=0):
    fun.terminal, fun.direction = terminal, direction
    return fun


def _numpy_rhs(w0, t0, params):
    """The right-hand side through the project's force function (numpy, one ball)."""
    k = params.spin_decay_rate

    def rhs(t, y):
        spin = w0 * np.exp(-k * (t - t0))
        return np.concatenate([y[3:], acceleration(y[3:][None], spin[None], params)[0]])

    return rhs


def _plain_coefficients(aero):
    """``C_D(S)`` and ``C_L(S) / S`` as plain-float functions of the registered models (the
    formulas of :mod:`rallyarc.flight.aero`); any other model through its own methods."""
    name = getattr(aero, "name", "")
    if name == "cross_lindsey2014":
        cd = float(aero.drag_coefficient)
        return (lambda s: cd), (lambda s: 1.0 / (2.022 * s + 0.981))
    if name == "stepanek1988":
        dc = float(aero.drag_constant)

        def drag(s):
            u = s * s * math.sqrt(s)
            return 0.508 + (u / (dc * u + 4.196)) ** 0.4

        return drag, (lambda s: 1.0 / (2.022 * s + 0.981))
    if name == "constant":
        cd, cl = float(aero.drag_coefficient), float(aero.lift_coefficient)
        return (lambda s: cd), (lambda s: cl / max(s, 1e-9))
    return (lambda s: float(aero.drag(s))), (lambda s: float(aero.lift_slope(s)))


def _plain_rhs(w0, t0, params):
    """The same forces written with plain floats for one ball, as a careful per-shot script
    would: gravity, drag ``-k C_D |u| u`` and lift ``k r (C_L/S) (w x u)`` with ``u`` the
    velocity through the air and ``k = rho A / (2 m)`` (see
    :func:`rallyarc.flight.forces.aerodynamic_acceleration`)."""
    decay = params.spin_decay_rate
    kd, r, g = params.drag_factor, params.radius, params.gravity
    wx0, wy0, wz0 = (float(c) for c in w0)
    ax_wind, ay_wind, az_wind = (float(c) for c in params.wind)
    drag, slope = _plain_coefficients(params.aero)

    def rhs(t, y):
        f = math.exp(-decay * (t - t0)) if decay else 1.0
        wx, wy, wz = wx0 * f, wy0 * f, wz0 * f
        ux, uy, uz = y[3] - ax_wind, y[4] - ay_wind, y[5] - az_wind
        speed = math.sqrt(ux * ux + uy * uy + uz * uz)
        cx, cy, cz = wy * uz - wz * uy, wz * ux - wx * uz, wx * uy - wy * ux
        if speed > 0.0:
            s = r * math.sqrt(cx * cx + cy * cy + cz * cz) / (speed * speed)
            cd_v = kd * drag(s) * speed
            lift = kd * r * slope(s)
        else:
            cd_v = lift = 0.0
        return [
            y[3],
            y[4],
            y[5],
            -cd_v * ux + lift * cx,
            -cd_v * uy + lift * cy,
            -g - cd_v * uz + lift * cz,
        ]

    return rhs


#: Right-hand sides of the per-shot flights by name.
RHS = {"numpy": _numpy_rhs, "plain": _plain_rhs}


def _fly_one(x0, v0, w0, t0, params, events, method, rtol, atol, rhs="numpy"):
    """One ball from ``t0`` until the ground (or ``T_MAX``); returns the solve_ivp solution."""
    return solve_ivp(
        RHS[rhs](w0, t0, params),
        (t0, t0 + T_MAX),
        np.concatenate([x0, v0]),
        method=method,
        rtol=rtol,
        atol=atol,
        events=events,
    )


def _first(sol, j):
    """Time and state ``(t, y)`` of the first occurrence of event ``j``, or None."""
    if sol.t_events[j].size:
        return sol.t_events[j][0], sol.y_events[j][0]
    return None


def play_shot(position, velocity, spin, swing, conditions, serve=False, **solver):
    """Play one shot: impact, flight, bounce, flight to the receiver's plane.

    Parameters
    ----------
    position, velocity, spin : array of 3
        The incoming ball at the contact point [m], [m/s], [rad/s].
    swing : mapping
        One swing: the fields of :class:`rallyarc.shot.Swing` as numbers (SI).
    conditions : rallyarc.domain.Conditions
    serve : bool
        Whether the landing is judged against the service box.
    **solver
        ``method``, ``rtol`` and ``atol`` of ``solve_ivp`` (default :data:`BASELINE`).

    Returns
    -------
    dict
        ``outcome``, ``land_x_m``, ``land_y_m``, ``land_t_s``, ``net_height_m``,
        ``net_clearance_m``, ``bounce_apex_m``, ``receiver_height_m``, ``receiver_t_s`` and
        ``bounce_second_x_m``, named and defined as in :attr:`rallyarc.shot.ShotResult.metrics`
        (NaN where the shot has none).
    """
    opts = {**BASELINE, **solver}
    ball = conditions.ball
    r = ball.radius
    params = conditions.flight_params()
    v0, w0, approaching = _impact_one(velocity, spin, swing, conditions)
    x0 = np.asarray(position, float)
    far_plane = court.HALF_LENGTH + conditions.receiver_plane_m
    nan = float("nan")
    out = dict.fromkeys(
        (
            "land_x_m",
            "land_y_m",
            "land_t_s",
            "net_height_m",
            "net_clearance_m",
            "bounce_apex_m",
            "receiver_height_m",
            "receiver_t_s",
            "bounce_second_x_m",
        ),
        nan,
    )

    net = _event(lambda t, y: y[0], direction=1)
    receiver = _event(lambda t, y: y[0] - far_plane, direction=1)
    top = _event(lambda t, y: y[5], direction=-1)
    ground = _event(lambda t, y: y[2] - r, terminal=True, direction=-1)

    first = _fly_one(x0, v0, w0, 0.0, params, [net, receiver, top, ground], **_solver(opts))
    crossing = _first(first, 0) if approaching else None
    over = False
    if crossing is not None:
        y_net = crossing[1]
        clearance = y_net[2] - r - float(court.net_height(y_net[1], conditions.singles))
        out["net_height_m"], out["net_clearance_m"] = y_net[2], clearance
        over = clearance >= 0.0
    rec = _first(first, 1)
    if rec is not None:
        out["receiver_t_s"], out["receiver_height_m"] = rec[0], rec[1][2]
    landing = _first(first, 3)
    if landing is None:
        out["outcome"] = "miss" if not approaching else "net"
        return out
    t_land, y_land = landing
    if crossing is not None and not over:  # stopped by the net: no landing
        out["outcome"] = "net"
        return out
    out["land_x_m"], out["land_y_m"], out["land_t_s"] = y_land[0], y_land[1], t_land
    call = judge_landing([y_land[0]], [y_land[1]], [x0[1]], [serve], conditions.singles)[
        "land_call"
    ][0]
    past_net = over and y_land[0] > 0.0
    out["outcome"] = "miss" if not approaching else (str(call) if past_net else "net")
    if not past_net:
        return out

    # the bounce and the free flight to the second bounce
    w_land = w0 * np.exp(-params.spin_decay_rate * t_land)
    res = conditions.bounce(y_land[3:][None], w_land[None])
    events = [receiver, top, ground]
    second = _fly_one(
        y_land[:3], res.velocity[0], res.spin[0], t_land, params, events, **_solver(opts)
    )
    _after_bounce(second, rec is None, r, out)
    return out


def _impact_one(velocity, spin, swing, conditions):
    """One racket-ball contact: outgoing velocity [m/s], spin [rad/s] and whether the racket
    met the ball."""
    ball, racket = conditions.ball, conditions.racket
    sw = {k: np.atleast_1d(float(v)) for k, v in swing.items()}
    normal, axis = face_orientation(sw["face_tilt"], sw["face_azimuth"], sw["racket_roll"])
    face_v = swing_velocity(sw["head_speed"], sw["swing_path"], sw["swing_direction"])
    e_n, mu, e_t = conditions.string_contact(np.asarray(velocity, float)[None], face_v, normal)
    contact = hit(
        np.asarray(velocity, float)[None],
        np.asarray(spin, float)[None],
        face_v,
        normal,
        axis,
        racket.racket,
        sw["impact_from_butt"],
        sw["impact_offaxis"],
        ball.mass,
        ball.radius,
        ball.alpha,
        e_n,
        mu,
        e_t,
    )
    return contact.velocity[0], contact.spin[0], bool(contact.approaching[0])


def _after_bounce(second, receiver_open, radius, out):
    """Apex, receiver's plane (if the first flight did not reach it) and second bounce from
    the reference flight after the bounce."""
    apex = _first(second, 1)
    out["bounce_apex_m"] = apex[1][2] if apex is not None else radius
    rec2 = _first(second, 0)
    if receiver_open and rec2 is not None:
        out["receiver_t_s"], out["receiver_height_m"] = rec2[0], rec2[1][2]
    twice = _first(second, 2)
    if twice is not None:
        out["bounce_second_x_m"] = twice[1][0]


def _solver(opts):
    keys = ("method", "rtol", "atol", "rhs")
    return {k: opts[k] for k in keys if k in opts}


def play_shots(incoming, swing, conditions, serve=None, **solver):
    """:func:`play_shot` for each of N shots in turn (a :class:`rallyarc.shot.BallState` and a
    :class:`rallyarc.shot.Swing`); returns a dict of ``(N,)`` arrays."""
    n = len(incoming)
    serve = np.zeros(n, bool) if serve is None else np.broadcast_to(serve, (n,))
    rows = []
    for i in range(n):
        values = {f: getattr(swing, f)[i] for f in type(swing).FIELDS}
        rows.append(
            play_shot(
                incoming.position[i],
                incoming.velocity[i],
                incoming.spin[i],
                values,
                conditions,
                serve=bool(serve[i]),
                **solver,
            )
        )
    keys = rows[0].keys() if rows else ()
    return {k: np.array([row[k] for row in rows]) for k in keys}
