"""The stages of the whole shot, one function each: impact, first flight, net, landing, bounce,
second flight and receiver.

Each stage takes N balls (or the K of them it concerns) and returns its metrics as a dict of
``(N,)`` arrays keyed as in :mod:`rallyarc.shot.metrics`, plus what the next stage needs.
:mod:`rallyarc.shot.chain` runs them in order.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from rallyarc import court
from rallyarc.flight.integrate import PlaneEvent, apex, fly, ground_contact, net_plane
from rallyarc.impact.contact import hit
from rallyarc.impact.geometry import face_orientation, swing_velocity
from rallyarc.kinematics import topspin_sidespin
from rallyarc.shot.landing import judge_landing
from rallyarc.units import RPM

#: Longest flight of one phase [s].
T_MAX = 12.0

#: Engines of the impact and the flights: ``"numpy"`` is :func:`rallyarc.impact.contact.hit`
#: and :func:`rallyarc.flight.integrate.fly`, ``"compiled"`` :mod:`rallyarc.impact.compiled`
#: and :mod:`rallyarc.flight.compiled`, the same models compiled with numba.
ENGINES = ("numpy", "compiled")


def uses_compiled(engine):
    """Whether ``engine`` (one of :data:`ENGINES`) asks for the compiled models; a ValueError
    naming the allowed engines for any other value."""
    if engine not in ENGINES:
        raise ValueError(f"engine must be one of {', '.join(ENGINES)}, got {engine!r}")
    return engine == "compiled"


def compiled_flight(params, engine):
    """The compiled flight module when ``engine`` is ``"compiled"`` and the aero model of
    ``params`` has a compiled form; None when the flight is numpy's (``"numpy"``, or a model
    without a compiled form).

    numba loads only for the callers that ask for the compiled engine; its first use in a
    process compiles the kernels or loads them from numba's cache.
    """
    if not uses_compiled(engine):
        return None
    from rallyarc.flight import compiled

    return compiled if compiled.supports(params) else None


def compiled_impact(racket, engine):
    """The compiled impact module when ``engine`` is ``"compiled"`` and ``racket`` (a
    :class:`rallyarc.impact.racket.Racket`) has a compiled form; None when the impact is
    numpy's (``"numpy"``, or a racket without a compiled form). numba loads as for
    :func:`compiled_flight`."""
    if not uses_compiled(engine):
        return None
    from rallyarc.impact import compiled

    return compiled if compiled.supports(racket) else None


def _fly(engine, position, velocity, spin, params, events, **kw):
    """:func:`rallyarc.flight.integrate.fly`, or its compiled form (:func:`compiled_flight`)."""
    compiled = compiled_flight(params, engine)
    if compiled is None:
        return fly(position, velocity, spin, params, events, **kw)
    return compiled.fly_compiled(position, velocity, spin, params, events, **kw)


def _angle_below(velocity):
    return np.degrees(np.arctan2(-velocity[:, 2], np.linalg.norm(velocity[:, :2], axis=1)))


def _nan(n):
    return np.full(n, np.nan)


def _receiver_plane(conditions, name="receiver"):
    far_plane = court.HALF_LENGTH + conditions.receiver_plane_m
    return PlaneEvent(name, (1.0, 0.0, 0.0), far_plane, terminal=False, direction=1)


def launch_metrics(velocity, spin):
    """The ball leaving the racket or machine: speed, launch angle, heading and spin."""
    top, side = topspin_sidespin(velocity, spin)
    return {
        "impact_speed_mps": np.linalg.norm(velocity, axis=1),
        "impact_launch_deg": -_angle_below(velocity),
        "impact_azimuth_deg": np.degrees(np.arctan2(velocity[:, 1], velocity[:, 0])),
        "impact_spin_rpm": np.linalg.norm(spin, axis=1) / RPM,
        "impact_topspin_rpm": top / RPM,
        "impact_sidespin_rpm": side / RPM,
    }


def impact(incoming, swing, conditions, engine="numpy"):
    """The racket meets the ball: :func:`rallyarc.impact.contact.hit` for N swings, with the
    string bed's restitution at each ball's normal speed and its spring-back (none when
    ``conditions.friction_only``); ``engine`` one of :data:`ENGINES` (the face, the swing and
    the contact compiled where :func:`compiled_impact` gives them).

    Returns the contact result (outgoing velocity and spin, regime, whether the racket met the
    ball at all) and the impact metrics.
    """
    ball, racket = conditions.ball, conditions.racket
    kernels = compiled_impact(racket.racket, engine)
    if kernels is None:
        orient, swing_of, strike = face_orientation, swing_velocity, hit
    else:
        orient, swing_of, strike = kernels.face_orientation, kernels.swing_velocity, kernels.hit
    normal, axis = orient(swing.face_tilt, swing.face_azimuth, swing.racket_roll)
    face_v = swing_of(swing.head_speed, swing.swing_path, swing.swing_direction)
    e_n, mu, e_t = conditions.string_contact(incoming.velocity, face_v, normal)
    contact = strike(
        incoming.velocity,
        incoming.spin,
        face_v,
        normal,
        axis,
        racket.racket,
        swing.impact_from_butt,
        swing.impact_offaxis,
        ball.mass,
        ball.radius,
        ball.alpha,
        e_n,
        mu,
        e_t,
    )
    m = launch_metrics(contact.velocity, contact.spin)
    m["impact_regime"] = contact.regime
    m["impact_slip_linear_mps"] = contact.slip_linear_mps
    m["impact_slip_spin_mps"] = contact.slip_spin_mps
    m["impact_slip_ratio"] = contact.slip_ratio
    m["impact_spin_limit_reached"] = contact.spin_limit_reached
    m["impact_spin_ratio_out"] = contact.spin_ratio_out
    return contact, m


def first_flight(start, params, conditions, record, rtol, engine="numpy"):
    """From the launch to the first touch of the ground, with the net's plane, the receiver's
    plane and the flight's peak as events on the way; ``engine`` one of :data:`ENGINES`."""
    events = [
        net_plane(1),
        _receiver_plane(conditions),
        apex("peak"),
        ground_contact(params.radius),
    ]
    return _fly(
        engine,
        start.position,
        start.velocity,
        start.spin,
        params,
        events,
        t_max=T_MAX,
        rtol=rtol,
        record=record,
    )


@dataclass(frozen=True)
class NetCrossing:
    """Which balls crossed the net's plane (going away, after a real hit) and which of them
    passed above the net's top."""

    crossed: np.ndarray
    over: np.ndarray


def net(first, start, approaching, conditions):
    """The net: clearance of the ball's bottom over the net top where it crosses the plane, and
    the flight's peak. A ball that meets the net stops there."""
    r = conditions.ball.radius
    ev = first.events["net"]
    crossed = ev.occurred & approaching
    net_y = np.where(crossed, ev.position[:, 1], np.nan)
    net_top = court.net_height(np.nan_to_num(net_y), conditions.singles)
    clearance = np.where(crossed, ev.position[:, 2] - r - net_top, np.nan)
    peak = first.events["peak"]
    m = {
        "net_crossed_plane": crossed,
        "net_height_m": np.where(crossed, ev.position[:, 2], np.nan),
        "net_top_m": np.where(crossed, net_top, np.nan),
        "net_clearance_m": clearance,
        "net_y_m": net_y,
        "net_t_s": np.where(crossed, ev.t, np.nan),
        "flight_peak_m": np.where(peak.occurred, peak.position[:, 2], start.position[:, 2]),
        "flight_peak_x_m": np.where(peak.occurred, peak.position[:, 0], start.position[:, 0]),
    }
    return NetCrossing(crossed, crossed & (clearance >= 0.0)), m


def landing(first, start, crossing, approaching, serve, conditions):
    """The first touch of the ground, its line call and the shot's outcome.

    Returns the metrics, the balls that bounce past the net (``(N,)`` bool) and when each
    ball's first phase ends [s] (at the net for a ball that meets it).
    """
    stopped = crossing.crossed & ~crossing.over
    ground = first.ended_by("ground")
    landed = ground & ~stopped
    land = first.position
    m = {
        # where the free flight meets the ground, through the net if need be: a smooth function
        # of the launch for the aiming solvers, not a landing
        "flight_ground_x_m": np.where(ground, land[:, 0], np.nan),
        "flight_ground_y_m": np.where(ground, land[:, 1], np.nan),
        "land_x_m": np.where(landed, land[:, 0], np.nan),
        "land_y_m": np.where(landed, land[:, 1], np.nan),
        "land_t_s": np.where(landed, first.t, np.nan),
    }
    m.update(
        judge_landing(m["land_x_m"], m["land_y_m"], start.position[:, 1], serve, conditions.singles)
    )
    own_side = landed & (land[:, 0] <= 0)  # short of the net: margins to the far lines mean nothing
    for key in ("land_depth_m", "land_side_margin_m", "land_box_depth_m", "land_box_side_margin_m"):
        m[key] = np.where(own_side, np.nan, m[key])
    past_net = landed & crossing.over & (land[:, 0] > 0)
    outcome = np.where(past_net, m.pop("land_call"), "net").astype("<U4")
    outcome[~approaching] = "miss"
    m["outcome"] = outcome
    m["land_speed_mps"] = np.where(landed, np.linalg.norm(first.velocity, axis=1), np.nan)
    m["land_angle_deg"] = np.where(landed, _angle_below(first.velocity), np.nan)
    end0 = np.where(stopped, first.events["net"].t, first.t)
    return m, past_net, end0


_BOUNCE_NUMBERS = (
    "speed_in_mps",
    "angle_in_deg",
    "speed_out_mps",
    "angle_out_deg",
    "heading_change_deg",
    "spin_in_rpm",
    "spin_out_rpm",
    "sidespin_in_rpm",
    "sidespin_out_rpm",
    "apex_m",
    "apex_x_m",
    "t_s",
    "x_m",
    "y_m",
    "second_x_m",
    "second_y_m",
)


def no_bounce(n, bounced):
    """Bounce metrics before any ball is bounced: NaN numbers, no regime."""
    m = {f"bounce_{key}": _nan(n) for key in _BOUNCE_NUMBERS}
    m["bounce_occurred"] = bounced
    m["bounce_apex_beyond_receiver"] = np.zeros(n, bool)
    m["bounce_regime"] = np.full(n, "", dtype="<U9")
    return m


def _heading_change(v_in, v_out):
    """Change of the horizontal heading at the bounce [deg], + toward the left of the ball's
    travel (the sideways jump of a serve's sidespin)."""
    turn = np.arctan2(v_out[:, 1], v_out[:, 0]) - np.arctan2(v_in[:, 1], v_in[:, 0])
    return np.degrees((turn + np.pi) % (2.0 * np.pi) - np.pi)


def bounce(first, idx, conditions, m):
    """The bounce of the balls ``idx`` (those past the net) on the court, under the same
    slide-or-grip rule as the racket (a compressing ball when ``conditions.deforming_ball``);
    fills their bounce metrics in ``m``. Returns the balls' velocity and spin leaving the court
    ``(K, 3)``."""
    vin, win = first.velocity[idx], first.spin[idx]
    res = conditions.bounce(vin, win)
    top_in, side_in = topspin_sidespin(vin, win)
    top_out, side_out = topspin_sidespin(vin, res.spin)
    angle_in = _angle_below(vin)
    angle_out = -_angle_below(res.velocity)
    values = {
        "t_s": first.t[idx],
        "x_m": first.position[idx, 0],
        "y_m": first.position[idx, 1],
        "speed_in_mps": np.linalg.norm(vin, axis=1),
        "angle_in_deg": angle_in,
        "speed_out_mps": np.linalg.norm(res.velocity, axis=1),
        "angle_out_deg": angle_out,
        "heading_change_deg": _heading_change(vin, res.velocity),
        "spin_in_rpm": top_in / RPM,
        "spin_out_rpm": top_out / RPM,
        "sidespin_in_rpm": side_in / RPM,
        "sidespin_out_rpm": side_out / RPM,
    }
    for key, value in values.items():
        m[f"bounce_{key}"][idx] = value
    m["bounce_regime"][idx] = res.regime
    return res.velocity, res.spin


def second_flight(first, idx, velocity, spin, params, conditions, record, rtol, engine="numpy"):
    """The free flight after the bounce to the second bounce, so that the apex is found even
    where it lies beyond the receiver's plane (the shot's drawn path ends at that plane);
    ``engine`` one of :data:`ENGINES`."""
    events = [_receiver_plane(conditions), apex(), ground_contact(params.radius)]
    return _fly(
        engine,
        first.position[idx],
        velocity,
        spin,
        params,
        events,
        t0=first.t[idx],
        t_max=T_MAX,
        rtol=rtol,
        record=record,
    )


def receiver_before_bounce(first, conditions):
    """The ball at the receiver's plane during the first flight (a long ball reaches it before
    bouncing): height, time, position across and whether that happened before the bounce."""
    far_plane = court.HALF_LENGTH + conditions.receiver_plane_m
    ev = first.events["receiver"]
    return {
        "receiver_height_m": np.where(ev.occurred, ev.position[:, 2], np.nan),
        "receiver_t_s": np.where(ev.occurred, ev.t, np.nan),
        "receiver_y_m": np.where(ev.occurred, ev.position[:, 1], np.nan),
        "receiver_before_bounce": ev.occurred & ~(first.position[:, 0] < far_plane),
    }


def after_bounce(after, idx, first, radius, m):
    """Apex, second bounce and the receiver's plane from the flight after the bounce; fills
    ``m`` for the balls ``idx``. Returns when each of their drawn paths ends ``(K,)`` [s]."""
    top = after.events["apex"]
    land = first.position
    m["bounce_apex_m"][idx] = np.where(top.occurred, top.position[:, 2], radius)
    m["bounce_apex_x_m"][idx] = np.where(top.occurred, top.position[:, 0], land[idx, 0])
    rec = after.events["receiver"]
    late = ~m["receiver_before_bounce"][idx] & rec.occurred
    j = idx[late]
    m["receiver_height_m"][j] = rec.position[late, 2]
    m["receiver_y_m"][j] = rec.position[late, 1]
    m["receiver_t_s"][j] = rec.t[late]
    twice = after.ended_by("ground")
    m["bounce_second_x_m"][idx[twice]] = after.position[twice, 0]
    m["bounce_second_y_m"][idx[twice]] = after.position[twice, 1]
    m["bounce_apex_beyond_receiver"][idx] = top.occurred & rec.occurred & (top.t > rec.t)
    return np.where(rec.occurred, rec.t, after.t)
