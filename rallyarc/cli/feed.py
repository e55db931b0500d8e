"""``rallyarc feed``: a ball launched from a point (a hand, a ball machine) through the whole
chain: net, landing and line call, bounce, receiver."""

from __future__ import annotations

import math

import click

from rallyarc import units
from rallyarc.cli.options import check_ball_point, direction, emit, json_option, loaded
from rallyarc.errors import InputError
from rallyarc.units import KMH_PER_MPS


@click.command()
@click.option(
    "--from",
    "origin",
    default="-11.0,0,1.0",
    show_default=True,
    help="Release point X,Y,Z of the ball centre [m], court frame.",
)
@click.option(
    "--speed",
    default="25m/s",
    show_default=True,
    help="Launch speed: 30, 30m/s, 108km/h or 67mph (bare number = m/s).",
)
@click.option(
    "--elevation", default="8", show_default=True, help="Launch angle above horizontal [deg]."
)
@click.option(
    "--azimuth", default="0", show_default=True, help="Horizontal angle, + to the left [deg]."
)
@click.option("--spin", default="1500", show_default=True, help="Spin [rpm].")
@click.option(
    "--spin-axis",
    default="0,1,0",
    show_default=True,
    help="Spin axis X,Y,Z in the court frame; 0,1,0 is topspin toward +x.",
)
@click.option("--ball", default="itf_type2", show_default=True, help="Ball preset or TOML file.")
@click.option(
    "--surface",
    "surface_name",
    default="hard_medium",
    show_default=True,
    help="Surface preset or TOML file.",
)
@click.option("--aero", default=None, help="Aerodynamic model (default: the ball's).")
@click.option(
    "--air",
    default="sea_level",
    show_default=True,
    help="Air preset or TOML file (the weather options below replace it).",
)
@click.option("--air-density", default=None, help="Air density [kg/m^3].")
@click.option("--altitude", default=None, help="Venue altitude [m] (ISA).")
@click.option("--temperature", default=None, help="Air temperature [C].")
@click.option("--pressure", default=None, help="Air pressure [Pa].")
@click.option("--humidity", default=None, help="Relative humidity, 0 to 1.")
@json_option("Print the fed ball as JSON, with the blocks of shot --json.")
def feed(origin, speed, elevation, azimuth, spin, spin_axis, ball, surface_name, aero, air,
         air_density, altitude, temperature, pressure, humidity, as_json):  # fmt: skip
    """Launch a ball from a point (a coach's hand, a ball machine) and play it through the
    whole chain: the net (a ball that meets it stops there), the landing and its line call,
    the bounce and the ball at the receiver.

    Ball machines can injure: keep everyone out of the machine's line of fire, start at low feed
    speeds, and follow the venue's rules and qualified coaching practice.
    """
    from rallyarc.feed import SAFETY, feed_conditions, simulate_feed
    from rallyarc.flight.aero import AERO_MODELS

    if aero is not None and aero not in AERO_MODELS:
        raise InputError(
            f"--aero: unknown model {aero!r}; choose one of " + ", ".join(sorted(AERO_MODELS))
        )
    axis = direction(spin_axis, "--spin-axis", -1e3, 1e3)
    origin = units.point(origin, "--from", -30.0, 30.0)
    from rallyarc import domain

    loaded("--ball", domain.load_ball, ball)  # errors in the file name the option
    if surface_name is not None:
        loaded("--surface", domain.load_surface, surface_name)
    conditions = feed_conditions(
        ball,
        _air(air, altitude, temperature, pressure, humidity),
        surface_name,
        air_density=_number(air_density, "--air-density", 0.0, 5.0),
        aero=aero,
    )
    check_ball_point(origin, "--from", conditions.ball.radius)
    fed = simulate_feed(
        origin=origin,
        speed=units.speed(speed, "--speed", 0.1, 80.0),
        elevation=math.radians(units.number(elevation, "--elevation", -60.0, 85.0)),
        azimuth=math.radians(units.number(azimuth, "--azimuth", -180.0, 180.0)),
        spin=units.number(spin, "--spin", -8000.0, 8000.0) * units.RPM,
        spin_axis=axis,
        conditions=conditions,
    )
    record = fed.record()
    emit(record, as_json, [*feed_lines(record), SAFETY] if not as_json else [])


def _air(air, altitude, temperature, pressure, humidity):
    """The --air preset, or the air the weather options describe (ISA at sea level for any
    of them not given)."""
    from rallyarc.domain import load_air, make_air

    if all(v is None for v in (altitude, temperature, pressure, humidity)):
        return loaded("--air", load_air, air)
    alt = _number(altitude, "--altitude", -500.0, 11000.0, 0.0)
    temp = _number(temperature, "--temperature", -40.0, 60.0)
    pres = _number(pressure, "--pressure", 30000.0, 110000.0)
    hum = _number(humidity, "--humidity", 0.0, 1.0, 0.0)
    return make_air(alt, temperature_c=temp, relative_humidity=hum, pressure_pa=pres)


def _number(text, option, low, high, default=None):
    return default if text is None else units.number(text, option, low, high)


def feed_lines(record):
    """The fed ball for people: launch, net, landing and line call, bounce, receiver."""
    inputs, net, land = record["inputs"], record["net_crossing"], record["landing"]
    lines = [
        f"fed ball: {inputs['speed_kmh']:.1f} km/h at {inputs['elevation_deg']:+.1f} deg, "
        f"{inputs['spin_rpm']:.0f} rpm; aero {inputs['aero_model']}, air {inputs['air']} "
        f"({inputs['air_density_kgm3']:.4f} kg/m^3), surface {inputs['surface']}"
    ]
    if net is None:
        lines.append("net:      the ball does not reach the net")
    elif net["clearance_m"] < 0:
        lines.append(
            f"net:      INTO THE NET at {net['height_m']:.2f} m (clearance "
            f"{net['clearance_m']:+.2f} m), y {net['y_m']:+.2f} m; the ball stops there"
        )
    else:
        lines.append(
            f"net:      crosses at {net['height_m']:.2f} m, clearance "
            f"{net['clearance_m']:+.2f} m, y {net['y_m']:+.2f} m, t {net['t_s']:.3f} s"
        )
    if land:
        lines.append(
            f"landing:  x {land['x_m']:+.2f} m, y {land['y_m']:+.2f} m, t {land['t_s']:.3f} s, "
            f"{land['speed_mps'] * KMH_PER_MPS:.1f} km/h at {land['angle_deg']:.1f} deg"
        )
    lines.extend(_after_lines(record))
    lines.append(f"outcome:  {record['outcome']}")
    return lines


def _after_lines(record):
    bounce, rec = record["bounce"], record["receiver"]
    lines = []
    if bounce:
        lines.append(
            f"bounce:   rebound {bounce['angle_out_deg']:.1f} deg, apex {bounce['apex_m']:.2f} m, "
            f"{bounce['speed_out_mps'] * KMH_PER_MPS:.1f} km/h out ({bounce['regime']})"
        )
    if rec["height_m"] is not None:
        when = "before the bounce" if rec["before_bounce"] else "after the bounce"
        lines.append(f"receiver: {rec['height_m']:.2f} m at the receiver's plane ({when})")
    return lines
