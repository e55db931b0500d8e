"""``rallyarc feed``: a ball launched from a point (a hand, a ball machine) to its first bounce."""

from __future__ import annotations

import math

import click

from rallyarc import units
from rallyarc.cli.options import direction, emit, json_option
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
@click.option("--aero", default=None, help="Aerodynamic model (default: the ball's).")
@click.option("--air-density", default=None, help="Air density [kg/m^3].")
@click.option("--altitude", default=None, help="Venue altitude [m] (ISA).")
@click.option("--temperature", default=None, help="Air temperature [C].")
@click.option("--pressure", default=None, help="Air pressure [Pa].")
@click.option("--humidity", default=None, help="Relative humidity, 0 to 1.")
@json_option()
def feed(origin, speed, elevation, azimuth, spin, spin_axis, ball, aero, air_density, altitude,
         temperature, pressure, humidity, as_json):  # fmt: skip
    """Launch a ball from a point (a coach's hand, a ball machine) and fly it to its first bounce.

    Ball machines can injure: keep everyone out of the machine's line of fire, start at low feed
    speeds, and follow the venue's rules and qualified coaching practice.
    """
    from rallyarc.feed import simulate_feed
    from rallyarc.flight.aero import AERO_MODELS

    if aero is not None and aero not in AERO_MODELS:
        raise InputError(
            f"--aero: unknown model {aero!r}; choose one of " + ", ".join(sorted(AERO_MODELS))
        )
    axis = direction(spin_axis, "--spin-axis", -1e3, 1e3)
    result = simulate_feed(
        origin=units.point(origin, "--from", -30.0, 30.0),
        speed=units.speed(speed, "--speed", 0.1, 80.0),
        elevation=math.radians(units.number(elevation, "--elevation", -60.0, 85.0)),
        azimuth=math.radians(units.number(azimuth, "--azimuth", -180.0, 180.0)),
        spin=units.number(spin, "--spin", -8000.0, 8000.0) * units.RPM,
        spin_axis=axis,
        ball=ball,
        aero=aero,
        air_density=_air_density(air_density, altitude, temperature, pressure, humidity),
    )
    if result["inputs"]["origin_m"][2] < result["inputs"]["radius_m"]:
        raise InputError("--from: the release height Z must be above the ball's radius")
    emit(result, as_json, _lines(result))


def _air_density(air_density, altitude, temperature, pressure, humidity):
    """--air-density, or the density of the air the weather options describe (ISA at sea level
    when none is given)."""
    from rallyarc.domain import make_air

    if air_density is not None:
        return units.number(air_density, "--air-density", 0.0, 5.0)
    alt = _number(altitude, "--altitude", -500.0, 11000.0, 0.0)
    temp = _number(temperature, "--temperature", -40.0, 60.0)
    pres = _number(pressure, "--pressure", 30000.0, 110000.0)
    hum = _number(humidity, "--humidity", 0.0, 1.0, 0.0)
    return make_air(alt, temperature_c=temp, relative_humidity=hum, pressure_pa=pres).density


def _number(text, option, low, high, default=None):
    return default if text is None else units.number(text, option, low, high)


def _lines(result):
    inputs, net, land = result["inputs"], result["net_crossing"], result["landing"]
    lines = [
        f"fed ball: {inputs['speed_mps'] * KMH_PER_MPS:.1f} km/h, aero "
        f"{inputs['aero_model']}, air {inputs['air_density_kgm3']:.4f} kg/m^3"
    ]
    if net:
        lines.append(
            f"net:      crosses at {net['height_m']:.2f} m, clearance "
            f"{net['clearance_m']:+.2f} m, y {net['y_m']:+.2f} m, t {net['t_s']:.3f} s"
        )
    else:
        lines.append("net:      the ball does not reach the net")
    if land:
        lines.append(
            f"landing:  x {land['x_m']:+.2f} m, y {land['y_m']:+.2f} m, t {land['t_s']:.3f} s, "
            f"{land['speed_mps'] * KMH_PER_MPS:.1f} km/h at {land['angle_deg']:.1f} deg"
        )
    return lines
