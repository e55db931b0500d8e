"""A ball launched from a point (a coach's hand or a ball machine) flown to its first bounce."""

from __future__ import annotations

from dataclasses import replace

import numpy as np

from rallyarc import domain, kinematics
from rallyarc.court import net_height
from rallyarc.flight.forces import FlightParams
from rallyarc.flight.integrate import PlaneEvent, fly, ground_contact


def flight_params(ball, air_density, aero=None, spin_decay_rate=0.0, wind=(0.0, 0.0, 0.0)):
    """Flight parameters of a ball (a :class:`rallyarc.domain.Ball`) in air of ``air_density``
    [kg/m^3], with its own aerodynamic model or the model named ``aero``; as
    :meth:`rallyarc.domain.Conditions.flight_params` builds them for the chain."""
    if aero:
        ball = replace(ball, aero_model=aero)
    return FlightParams(
        mass=ball.mass,
        radius=ball.radius,
        air_density=air_density,
        aero=ball.aero,
        spin_decay_rate=spin_decay_rate,
        wind=wind,
    )


def launch_velocity(speed, elevation, azimuth):
    """Velocity vectors (N, 3) [m/s] from speed [m/s], elevation and azimuth [rad] (toward +x)."""
    return kinematics.velocity(speed, elevation, azimuth)


def simulate_feed(
    origin,
    speed,
    elevation,
    azimuth,
    spin,
    spin_axis=(0.0, 1.0, 0.0),
    ball="itf_type2",
    aero=None,
    air_density=1.225,
    spin_decay_rate=0.0,
    wind=(0.0, 0.0, 0.0),
    singles=True,
):
    """Fly one fed ball to its first bounce and report the net crossing and the landing.

    Parameters
    ----------
    origin : (3,) release point of the ball centre [m].
    speed : launch speed [m/s]; elevation, azimuth : [rad]; spin : [rad/s] about ``spin_axis``
        (court frame, normalised here; the default +y is topspin for a ball toward +x).
    ball : ball preset or TOML file (read by :func:`rallyarc.domain.load_ball`).
    aero : name of an aerodynamic model instead of the ball's own; air_density : [kg/m^3].

    Returns
    -------
    dict
        ``inputs`` (every parameter used, SI), ``net_crossing`` (or None) and ``landing``.
    """
    params = flight_params(domain.load_ball(ball), air_density, aero, spin_decay_rate, wind)
    axis = np.asarray(spin_axis, dtype=float)
    axis = axis / np.linalg.norm(axis)
    v0 = launch_velocity(speed, elevation, azimuth)
    direction = 1 if v0[0, 0] >= 0 else -1
    events = [
        PlaneEvent("net", (1.0, 0.0, 0.0), 0.0, terminal=False, direction=direction),
        ground_contact(params.radius),
    ]
    res = fly(np.asarray(origin, float)[None], v0, (spin * axis)[None], params, events, t_max=20.0)
    net = res.events["net"]
    net_out = None
    if net.occurred[0]:
        y, z = net.position[0, 1], net.position[0, 2]
        net_out = {
            "height_m": float(z),
            "clearance_m": float(z - params.radius - net_height(y, singles)),
            "y_m": float(y),
            "t_s": float(net.t[0]),
        }
    vel = res.velocity[0]
    landing = None
    if res.ended_by("ground")[0]:
        horizontal = float(np.hypot(vel[0], vel[1]))
        landing = {
            "x_m": float(res.position[0, 0]),
            "y_m": float(res.position[0, 1]),
            "t_s": float(res.t[0]),
            "speed_mps": float(np.linalg.norm(vel)),
            "angle_deg": float(np.degrees(np.arctan2(-vel[2], horizontal))),
            "velocity_mps": [float(c) for c in vel],
            "spin_rads": [float(c) for c in res.spin[0]],
        }
    inputs = {
        "origin_m": [float(c) for c in origin],
        "speed_mps": float(speed),
        "elevation_rad": float(elevation),
        "azimuth_rad": float(azimuth),
        "spin_rads": float(spin),
        "spin_axis": [float(c) for c in axis],
        "ball": ball,
        "mass_kg": params.mass,
        "radius_m": params.radius,
        "air_density_kgm3": float(air_density),
        "aero_model": params.aero.name,
        "spin_decay_rate_per_s": spin_decay_rate,
        "wind_mps": list(params.wind),
        "gravity_mps2": params.gravity,
    }
    return {"inputs": inputs, "net_crossing": net_out, "landing": landing}
