"""The ``rallyarc`` command line: parses options, calls the library, prints tables or JSON.

Every command is a thin layer over a documented Python call; errors in user input are one line
on stderr with exit code 2.
"""

from __future__ import annotations

import json
import math
import sys

import click
import numpy as np

from rallyarc import config, units
from rallyarc.errors import InputError


class _Group(click.Group):
    """A group that turns every usage or input error into one line and exit code 2."""

    def main(self, args=None, prog_name=None, **kwargs):
        try:
            return super().main(args=args, prog_name=prog_name, standalone_mode=False, **kwargs)
        except click.exceptions.Exit as exc:
            sys.exit(exc.exit_code)
        except click.Abort:
            click.echo("rallyarc: aborted", err=True)
            sys.exit(130)
        except click.ClickException as exc:
            click.echo(f"rallyarc: error: {exc.format_message()}", err=True)
            sys.exit(2)
        except InputError as exc:
            click.echo(f"rallyarc: error: {exc}", err=True)
            sys.exit(2)


@click.group(cls=_Group)
@click.version_option(package_name="rallyarc")
def main():
    """rallyarc: what a tennis stroke does, from racket to receiver, simulated from physics."""


def _emit(data, as_json, lines):
    if as_json:
        click.echo(json.dumps(data, indent=2))
    else:
        for line in lines:
            click.echo(line)


def _air_density(air_density, altitude, temperature, pressure, humidity):
    from flight.air import air_density as weather_density
    from flight.air import isa_density, isa_temperature_pressure

    if air_density is not None:
        return units.number(air_density, "--air-density", 0.0, 5.0)
    if altitude is None and temperature is None and pressure is None and humidity is None:
        return float(isa_density(0.0))
    alt = units.number(altitude, "--altitude", -500.0, 11000.0) if altitude is not None else 0.0
    t_isa, p_isa = isa_temperature_pressure(alt)
    temp = (
        units.number(temperature, "--temperature", -40.0, 60.0)
        if temperature is not None
        else float(t_isa) - 273.15
    )
    pres = (
        units.number(pressure, "--pressure", 30000.0, 110000.0)
        if pressure is not None
        else float(p_isa)
    )
    hum = units.number(humidity, "--humidity", 0.0, 1.0) if humidity is not None else 0.0
    return float(weather_density(temp, pres, hum))


@main.command()
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
@click.option("--json", "as_json", is_flag=True, help="Print a JSON object.")
def feed(
    origin,
    speed,
    elevation,
    azimuth,
    spin,
    spin_axis,
    ball,
    aero,
    air_density,
    altitude,
    temperature,
    pressure,
    humidity,
    as_json,
):
    """Launch a ball from a point (a coach's hand, a ball machine) and fly it to its first bounce.

    Ball machines can injure: keep everyone out of the machine's line of fire, start at low feed
    speeds, and follow the venue's rules and qualified coaching practice.
    """
    from flight.aero import AERO_MODELS
    from rallyarc.feed import simulate_feed

    if aero is not None and aero not in AERO_MODELS:
        raise InputError(
            f"--aero: unknown model {aero!r}; choose one of " + ", ".join(sorted(AERO_MODELS))
        )
    axis = units.point(spin_axis, "--spin-axis", -1e3, 1e3)
    if math.hypot(*axis) == 0:
        raise InputError("--spin-axis: must not be the zero vector")
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
    net, land = result["net_crossing"], result["landing"]
    lines = [
        f"fed ball: {result['inputs']['speed_mps'] * 3.6:.1f} km/h, aero "
        f"{result['inputs']['aero_model']}, air {result['inputs']['air_density_kgm3']:.4f} kg/m^3"
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
            f"{land['speed_mps'] * 3.6:.1f} km/h at {land['angle_deg']:.1f} deg"
        )
    _emit(result, as_json, lines)


def _surface(preset, friction, restitution, option_names=("--friction", "--restitution")):
    from bounce.contact import Surface

    if preset is not None:
        if friction is not None or restitution is not None:
            raise InputError("--preset: give either --preset or --friction and --restitution")
        data = config.load("surfaces", preset)
        return Surface(friction=data["friction"], restitution=data["restitution"]), preset
    if friction is None or restitution is None:
        raise InputError(f"{option_names[0]}/{option_names[1]}: give both, or a preset")
    mu = units.number(friction, option_names[0], 0.0, 2.0)
    e = units.number(restitution, option_names[1], 0.0, 1.0)
    return Surface(friction=mu, restitution=e), None


@main.command()
@click.option("--friction", default=None, help="Surface friction mu, 0 to 2.")
@click.option("--restitution", default=None, help="Surface restitution e, 0 to 1.")
@click.option("--preset", default=None, help="A surface preset or TOML file instead.")
@click.option("--temperature", default="23", show_default=True, help="Test temperature [C].")
@click.option("--json", "as_json", is_flag=True, help="Print a JSON object.")
def surface(friction, restitution, preset, temperature, as_json):
    """Court pace rating of a surface, by simulating the ITF CS 01/02 test impact."""
    from bounce.pace import rate_surface

    if preset is None and friction is None and restitution is None:
        preset = "hard_medium"
    surf, name = _surface(preset, friction, restitution)
    temp = units.number(temperature, "--temperature", -10.0, 50.0)
    rating = rate_surface(surf, temperature_c=temp)
    data = {
        "surface": name,
        "surface_friction": surf.friction,
        "surface_restitution": surf.restitution,
        "court_pace_rating": float(rating.court_pace_rating),
        "category": int(rating.category),
        "category_name": rating.category_name,
        "measured_friction": float(rating.measured_friction),
        "measured_restitution": float(rating.measured_restitution),
        "temperature_corrected_restitution": float(rating.temperature_corrected_restitution),
        "temperature_c": temp,
        "ball_gripped": bool(rating.ball_gripped),
        "note": rating.note,
    }
    lines = [
        f"surface:            {name or 'custom'} "
        f"(mu {surf.friction:.3f}, e {surf.restitution:.3f})",
        f"court pace rating:  {data['court_pace_rating']:.1f}, category {data['category']} "
        f"({data['category_name']})",
        f"measured in test:   mu {data['measured_friction']:.3f}, "
        f"e {data['measured_restitution']:.3f}"
        f" (e at {temp:g} C corrected to {data['temperature_corrected_restitution']:.3f})",
    ]
    if rating.ball_gripped:
        lines.append(f"note:               {rating.note}")
    _emit(data, as_json, lines)


@main.command("bounce")
@click.option("--speed", required=True, help="Incoming speed: 20, 72km/h, 45mph.")
@click.option("--angle", required=True, help="Incoming angle below horizontal [deg], 0 to 90.")
@click.option(
    "--spin",
    default="0",
    show_default=True,
    help="Incoming spin [rpm], topspin positive, backspin negative.",
)
@click.option("--surface", "surface_name", default=None, help="Surface preset or TOML file.")
@click.option("--friction", default=None, help="Surface friction mu, 0 to 2.")
@click.option("--restitution", default=None, help="Surface restitution e, 0 to 1.")
@click.option("--ball", default="itf_type2", show_default=True, help="Ball preset or TOML file.")
@click.option("--json", "as_json", is_flag=True, help="Print a JSON object.")
def bounce_cmd(speed, angle, spin, surface_name, friction, restitution, ball, as_json):
    """The ball after one bounce, in the bounce's frame (x along the ball's horizontal travel)."""
    from bounce.contact import bounce
    from rallyarc.feed import ball_params

    if surface_name is None and friction is None and restitution is None:
        surface_name = "hard_medium"
    surf, name = _surface(surface_name, friction, restitution)
    v = units.speed(speed, "--speed", 0.1, 80.0)
    theta = math.radians(units.number(angle, "--angle", 0.1, 90.0))
    w = units.number(spin, "--spin", -8000.0, 8000.0) * units.RPM
    preset = ball_params(ball)
    res = bounce(
        np.array([[v * math.cos(theta), 0.0, -v * math.sin(theta)]]),
        np.array([[0.0, w, 0.0]]),
        preset["radius_m"],
        preset["alpha"],
        surf,
    )
    vx, vz = float(res.velocity[0, 0]), float(res.velocity[0, 2])
    spin_out = float(res.spin[0, 1])
    data = {
        "inputs": {
            "speed_mps": v,
            "angle_deg": math.degrees(theta),
            "spin_rpm": w / units.RPM,
            "surface": name,
            "friction": surf.friction,
            "restitution": surf.restitution,
            "ball": ball,
            "radius_m": preset["radius_m"],
            "alpha": preset["alpha"],
        },
        "vx_mps": vx,
        "vz_mps": vz,
        "speed_mps": math.hypot(vx, vz),
        "angle_deg": math.degrees(math.atan2(vz, vx)),
        "spin_rpm": spin_out / units.RPM,
        "regime": "grip" if bool(res.grip[0]) else "slide",
    }
    word = "topspin" if spin_out >= 0 else "backspin"
    lines = [
        f"in:   {v * 3.6:.1f} km/h at {math.degrees(theta):.1f} deg, spin {w / units.RPM:+.0f} rpm",
        f"out:  vx {vx:.2f} m/s, vz {vz:.2f} m/s ({data['speed_mps'] * 3.6:.1f} km/h at "
        f"{data['angle_deg']:.1f} deg), {abs(data['spin_rpm']):.0f} rpm {word}",
        f"regime: {data['regime']}",
    ]
    _emit(data, as_json, lines)


if __name__ == "__main__":
    main()
