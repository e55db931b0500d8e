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
from rallyarc.units import KMH_PER_MPS


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
    from rallyarc.flight.air import air_density as weather_density
    from rallyarc.flight.air import isa_density, isa_temperature_pressure

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
    from rallyarc.feed import simulate_feed
    from rallyarc.flight.aero import AERO_MODELS

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
        f"fed ball: {result['inputs']['speed_mps'] * KMH_PER_MPS:.1f} km/h, aero "
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
            f"{land['speed_mps'] * KMH_PER_MPS:.1f} km/h at {land['angle_deg']:.1f} deg"
        )
    _emit(result, as_json, lines)


def _surface(preset, friction, restitution, option_names=("--friction", "--restitution")):
    from rallyarc.bounce.contact import Surface

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
    from rallyarc.bounce.pace import rate_surface

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
    from rallyarc.bounce.contact import bounce
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
        f"in:   {v * KMH_PER_MPS:.1f} km/h at {math.degrees(theta):.1f} deg, "
        f"spin {w / units.RPM:+.0f} rpm",
        f"out:  vx {vx:.2f} m/s, vz {vz:.2f} m/s ({data['speed_mps'] * KMH_PER_MPS:.1f} km/h at "
        f"{data['angle_deg']:.1f} deg), {abs(data['spin_rpm']):.0f} rpm {word}",
        f"regime: {data['regime']}",
    ]
    _emit(data, as_json, lines)


# ----------------------------------------------------------------------------- whole shots

_SCENARIO_HELP = "Scenario preset or TOML file: conditions and incoming ball."


def _scenario_with(scenario, ball, racket, air, surface_name, receiver_plane):
    """The scenario with any condition the user overrides."""
    from dataclasses import replace

    from rallyarc import domain

    sc = domain.load_scenario(scenario)
    cond = sc.conditions
    changes = {}
    if ball is not None:
        changes["ball"] = domain.load_ball(ball)
    if racket is not None:
        changes["racket"] = domain.load_racket(racket)
    if air is not None:
        changes["air"] = domain.load_air(air)
    if surface_name is not None:
        changes["surface"] = domain.load_surface(surface_name)
        changes["surface_name"] = surface_name
    if receiver_plane is not None:
        changes["receiver_plane_m"] = units.number(receiver_plane, "--receiver-plane", 0.0, 10.0)
    return replace(sc, conditions=replace(cond, **changes)) if changes else sc


def _condition_options(func):
    for opt in reversed(
        [
            click.option("--ball", default=None, help="Ball preset or TOML file."),
            click.option("--racket", default=None, help="Racket preset or TOML file."),
            click.option("--air", default=None, help="Air preset or TOML file."),
            click.option("--surface", "surface_name", default=None, help="Surface preset or file."),
            click.option(
                "--receiver-plane",
                default=None,
                help="Receiver's contact plane behind the far baseline [m], 0 to 10.",
            ),
        ]
    ):
        func = opt(func)
    return func


@main.command()
@click.option(
    "--stroke", default="topspin_drive", show_default=True, help="Stroke preset or TOML file."
)
@click.option("--scenario", default="demo", show_default=True, help=_SCENARIO_HELP)
@click.option(
    "--head-speed", default=None, help="Override: racket speed at impact (km/h, mph, m/s)."
)
@click.option("--swing-path", default=None, help="Override: swing path above horizontal [deg].")
@click.option("--face-tilt", default=None, help="Override: face tilt, open positive [deg].")
@click.option("--swing-direction", default=None, help="Override: swing direction, + left [deg].")
@click.option("--contact", default=None, help="Override: contact point X,Y,Z [m].")
@click.option("--incoming-speed", default=None, help="Override: incoming ball speed.")
@click.option("--incoming-spin", default=None, help="Override: incoming topspin [rpm].")
@_condition_options
@click.option("--json", "as_json", is_flag=True, help="Print a JSON object.")
@click.option(
    "--csv", "csv_path", default=None, help="Write the trajectory table to this CSV file."
)
@click.option("--dt", default="0.005", show_default=True, help="Trajectory time step [s].")
@click.option("--force", is_flag=True, help="Overwrite existing output files.")
def shot(
    stroke,
    scenario,
    head_speed,
    swing_path,
    face_tilt,
    swing_direction,
    contact,
    incoming_speed,
    incoming_spin,
    ball,
    racket,
    air,
    surface_name,
    receiver_plane,
    as_json,
    csv_path,
    dt,
    force,
):
    """One stroke against the scenario's incoming ball (or a serve against its toss):
    impact, net, landing, bounce and the ball at the receiver."""
    from dataclasses import replace

    from rallyarc import domain
    from rallyarc.output import export
    from rallyarc.output.tables import comparison_table
    from rallyarc.shot import BallState, play

    sc = _scenario_with(scenario, ball, racket, air, surface_name, receiver_plane)
    st = domain.load_stroke(stroke)
    changes = {}
    if head_speed is not None:
        changes["head_speed"] = units.speed(head_speed, "--head-speed", 1.0, 70.0)
    for name, value, low, high in (
        ("swing_path", swing_path, -60.0, 80.0),
        ("face_tilt", face_tilt, -60.0, 60.0),
        ("swing_direction", swing_direction, -60.0, 60.0),
    ):
        if value is not None:
            opt = "--" + name.replace("_", "-")
            changes[name] = math.radians(units.number(value, opt, low, high))
    if "swing_direction" in changes:
        changes["face_azimuth"] = st.face_azimuth - st.swing_direction + changes["swing_direction"]
    st = replace(st, **changes)
    step = units.number(dt, "--dt", 0.0005, 0.1)
    if csv_path is not None:
        export.check_targets([csv_path], force, "--csv")
    incoming = None
    if st.kind == "serve":
        if contact is not None:
            st = replace(st, toss=replace(st.toss, contact=units.point(contact, "--contact")))
        if incoming_speed is not None or incoming_spin is not None:
            raise InputError(
                "--incoming-speed/--incoming-spin: a serve's incoming ball is its toss"
            )
    else:
        if sc.incoming is None:
            raise InputError(f"--scenario: {sc.where} has no [incoming] ball for a groundstroke")
        spec = dict(sc.incoming)
        if contact is not None:
            spec["position_m"] = list(units.point(contact, "--contact", -20.0, 20.0))
        if incoming_speed is not None:
            spec["speed_kmh"] = (
                units.speed(incoming_speed, "--incoming-speed", 0.0, 70.0) * KMH_PER_MPS
            )
        if incoming_spin is not None:
            spec["spin_rpm"] = units.number(incoming_spin, "--incoming-spin", -6000.0, 6000.0)
        incoming = BallState.of(*domain.incoming_state(spec))
    if incoming is None and st.toss.contact[2] < sc.conditions.ball.radius:
        raise InputError("--contact: the contact height Z must be above the ball's radius")
    result = play([st], sc.conditions, incoming)
    data = result.record(0)
    if csv_path is not None:
        export.write_frame(csv_path, result.trajectory_frame(step))
    lines = comparison_table(
        result,
        title=f"{st.label} ({sc.conditions.surface_name}, "
        f"{sc.conditions.ball.name}, {sc.conditions.air.name})",
    )
    if csv_path is not None:
        lines.append(f"trajectory written to {csv_path}")
    _emit(data, as_json, lines)


@main.command()
@click.argument("scenario", default="demo")
@_condition_options
@click.option(
    "--out", "out_dir", default=None, help="Write the table, trajectories and figures here."
)
@click.option("--dt", default="0.005", show_default=True, help="Trajectory time step [s].")
@click.option("--force", is_flag=True, help="Overwrite existing files in --out.")
@click.option("--json", "as_json", is_flag=True, help="Print the shots as a JSON list.")
def compare(scenario, ball, racket, air, surface_name, receiver_plane, out_dir, dt, force, as_json):
    """Every stroke variant of a scenario side by side (default: the demo scenario)."""
    from pathlib import Path

    from rallyarc import domain
    from rallyarc.output import export
    from rallyarc.output.tables import comparison_table
    from rallyarc.shot import BallState, play

    sc = _scenario_with(scenario, ball, racket, air, surface_name, receiver_plane)
    step = units.number(dt, "--dt", 0.0005, 0.1)
    names = (
        "shots.csv",
        "shots.json",
        "trajectories.csv",
        "trajectories.parquet",
        "side_view.png",
        "top_view.png",
        "scene.png",
    )
    if out_dir is not None:
        folder = Path(out_dir)
        if folder.exists() and not folder.is_dir():
            raise InputError(f"--out: {folder} is a file, not a folder")
        export.check_targets([folder / n for n in names], force)
    incoming = BallState.of(*domain.incoming_state(sc.incoming)) if sc.incoming else None
    result = play(sc.strokes, sc.conditions, incoming)
    records = [result.record(i) for i in range(len(result))]
    c = sc.conditions
    title = (
        f"{sc.name}: {sc.player}, {sc.club}\n{sc.description}\n"
        f"ball {c.ball.name}, racket {c.racket.name}, air {c.air.name} "
        f"({c.air.density:.3f} kg/m^3), surface {c.surface_name}"
    )
    lines = comparison_table(result, title=title)
    if out_dir is not None:
        written = _write_compare(result, records, folder, step)
        lines.append("written: " + ", ".join(str(p) for p in written))
    _emit(
        {"scenario": sc.name, "player": sc.player, "club": sc.club, "shots": records},
        as_json,
        lines,
    )


def _write_compare(result, records, folder, step):
    from rallyarc.output import export

    written = [
        export.write_frame(folder / "shots.csv", result.to_frame()),
        export.write_json(folder / "shots.json", records),
    ]
    table = result.trajectory_frame(step)
    written.append(export.write_frame(folder / "trajectories.csv", table))
    written.append(export.write_frame(folder / "trajectories.parquet", table))
    try:
        from rallyarc.viz import plots, scene
    except ImportError:  # the figures need the viz package
        return written
    written.append(plots.save_figure(plots.side_view(result), folder / "side_view.png"))
    written.append(plots.save_figure(plots.top_view(result), folder / "top_view.png"))
    written.append(scene.render_scene(result, png_path=folder / "scene.png"))
    return written


_PRESET_FIGURES = {
    "balls": lambda d: (
        f"{d['mass_kg'] * 1000:.1f} g, {d['diameter_m'] * 100:.2f} cm, "
        f"alpha {d['alpha']:.2f}, rebound {d['rebound_cm']:.0f} cm, e {d['restitution']:.3f}"
    ),
    "surfaces": lambda d: (
        f"mu {d['friction']:.2f}, e {d['restitution']:.2f}, "
        f"pace category {d.get('pace_category', '-')}"
    ),
    "rackets": lambda d: (
        f"{d['mass_kg'] * 1000:.0f} g, balance {d['balance_m'] * 100:.1f} cm, "
        f"swingweight {d['swingweight_kgm2'] * 1e4:.0f} kg cm^2, "
        f"strings e {d['string_restitution']:.2f} mu {d['string_friction']:.2f}"
    ),
    "air": lambda d: (
        f"{d['altitude_m']:.0f} m, {d['temperature_c']:.0f} C, "
        f"humidity {d['relative_humidity'] * 100:.0f} %"
    ),
    "strokes": lambda d: (
        f"{d['kind']}, {d['head_speed_kmh']:.0f} km/h, path "
        f"{d['swing_path_deg']:+.0f} deg, face {d['face_tilt_deg']:+.1f} deg"
    ),
    "scenarios": lambda d: f"{d['player']} at {d['club']}: " + ", ".join(d["strokes"]),
    "machines": lambda d: (
        f"{d['speed_min_kmh']:.0f}-{d['speed_max_kmh']:.0f} km/h, spin up to "
        f"{d['spin_max_rpm']:.0f} rpm, elevation {d['elevation_min_deg']:+.0f} to "
        f"{d['elevation_max_deg']:+.0f} deg, release {d['release_height_m']:.2f} m"
    ),
    "drills": lambda d: f"{d['coach']} at {d['club']}: {len(d['balls'])} ball(s), {d['machine']}",
    "patterns": lambda d: f"{d['near']['name']} against {d['far']['name']} at {d['club']}",
}


@main.command()
@click.argument("kind", required=False)
@click.option("--json", "as_json", is_flag=True, help="Print a JSON object.")
def presets(kind, as_json):
    """The built-in presets of each KIND (balls, surfaces, rackets, air, strokes, scenarios,
    machines, drills, patterns) with their key figures and sources."""
    kinds = list(_PRESET_FIGURES)
    if kind is not None and kind not in kinds:
        raise InputError(f"KIND: unknown preset kind {kind!r}; choose one of " + ", ".join(kinds))
    data, lines = {}, []
    for k in [kind] if kind else kinds:
        data[k] = {}
        lines.append(f"{k}:")
        for name in config.preset_names(k):
            item = config.load(k, name)
            item.pop("where", None)
            data[k][name] = item
            lines.append(f"  {name:15s} {item['name']}: {_PRESET_FIGURES[k](item)}")
            lines.append(f"  {'':15s} source: {item['source']}")
    _emit(data, as_json, lines)


# ----------------------------------------------------------------------------- aiming, drills


def _target(text, option="--target"):
    parts = str(text).split(",")
    if len(parts) != 2:
        raise InputError(f"{option}: expected a landing point X,Y in metres, got {text!r}")
    return tuple(units.number(p.strip(), option, -15.0, 15.0) for p in parts)


def _aim_outputs(aim, csv_path, dt):
    from rallyarc.output import export

    if csv_path is not None:
        export.write_frame(csv_path, aim.trajectory_frame(dt))


@main.group(cls=click.Group)
def aim():
    """Solve the swing (aim stroke) or the ball-machine setting (aim feed) for a target."""


@aim.command("stroke")
@click.option("--stroke", default="topspin_drive", show_default=True, help="Stroke style preset.")
@click.option("--scenario", default="demo", show_default=True, help=_SCENARIO_HELP)
@click.option("--target", required=True, help="Landing point X,Y [m], court frame.")
@click.option(
    "--solve",
    "free",
    type=click.Choice(["tilt", "speed"]),
    default="tilt",
    show_default=True,
    help="Free swing values: face tilt and direction, or head speed and direction.",
)
@click.option("--clearance", default=None, help="Also clear the net by this much [m].")
@click.option(
    "--receiver-height", default=None, help="Also reach the receiver's plane at this height [m]."
)
@_condition_options
@click.option("--json", "as_json", is_flag=True, help="Print a JSON object.")
@click.option("--csv", "csv_path", default=None, help="Write the trajectory (.csv or .parquet).")
@click.option("--dt", default="0.005", show_default=True, help="Trajectory time step [s].")
@click.option("--force", is_flag=True, help="Overwrite an existing output file.")
def aim_stroke_cmd(
    stroke,
    scenario,
    target,
    free,
    clearance,
    receiver_height,
    ball,
    racket,
    air,
    surface_name,
    receiver_plane,
    as_json,
    csv_path,
    dt,
    force,
):
    """The swing of a stroke style that lands the ball on --target."""
    from rallyarc import domain
    from rallyarc.aim import aim_stroke
    from rallyarc.output import export
    from rallyarc.shot import BallState

    sc = _scenario_with(scenario, ball, racket, air, surface_name, receiver_plane)
    st = domain.load_stroke(stroke)
    tx, ty = _target(target)
    if clearance is not None and receiver_height is not None:
        raise InputError("--clearance/--receiver-height: give one of them, not both")
    clr = units.number(clearance, "--clearance", 0.0, 10.0) if clearance is not None else None
    rh = (
        units.number(receiver_height, "--receiver-height", 0.05, 5.0)
        if receiver_height is not None
        else None
    )
    step = units.number(dt, "--dt", 0.0005, 0.1)
    if csv_path is not None:
        export.check_targets([csv_path], force, "--csv")
    if st.kind == "serve":
        incoming = None
    else:
        if sc.incoming is None:
            raise InputError(f"--scenario: {sc.where} has no [incoming] ball for a groundstroke")
        incoming = BallState.of(*domain.incoming_state(sc.incoming))
    res = aim_stroke(
        incoming, st, sc.conditions, tx, ty, free=free, clearance=clr, receiver_height=rh
    )
    _aim_outputs(res, csv_path, step)
    record = res.result.record(0)
    s = res.settings
    swing = {
        "head_speed_kmh": float(res.result.swing.head_speed[0] * KMH_PER_MPS),
        "face_tilt_deg": math.degrees(res.result.swing.face_tilt[0]),
        "swing_direction_deg": math.degrees(res.result.swing.swing_direction[0]),
        "face_azimuth_deg": math.degrees(res.result.swing.face_azimuth[0]),
        "swing_path_deg": math.degrees(res.result.swing.swing_path[0]),
    }
    data = {
        "target_m": [tx, ty],
        "reachable": bool(res.reachable[0]),
        "reason": str(res.reason[0]),
        "solved": sorted(s),
        "swing": swing,
        "miss_m": float(res.miss_distance()[0]),
        "shot": record,
    }
    m = res.result.metrics
    head = "solved" if data["reachable"] else "NOT REACHABLE: " + data["reason"]
    lines = [
        f"{st.label} to x {tx:+.2f}, y {ty:+.2f}: {head}",
        f"swing:   head speed {swing['head_speed_kmh']:.1f} km/h, path "
        f"{swing['swing_path_deg']:+.1f} deg, face tilt {swing['face_tilt_deg']:+.2f} deg, "
        f"direction {swing['swing_direction_deg']:+.2f} deg",
        f"ball:    {m['impact_speed_mps'][0] * KMH_PER_MPS:.0f} km/h at "
        f"{m['impact_launch_deg'][0]:+.1f} deg, {m['impact_topspin_rpm'][0]:+.0f} rpm topspin",
        f"lands:   x {m['land_x_m'][0]:+.2f}, y {m['land_y_m'][0]:+.2f} "
        f"({data['miss_m'] * 100:.1f} cm from the target), {m['outcome'][0]}",
        f"net:     clearance {m['net_clearance_m'][0]:+.2f} m; " + _receiver_words(m),
    ]
    if csv_path is not None:
        lines.append(f"trajectory written to {csv_path}")
    _emit(data, as_json, lines)
    if not data["reachable"]:
        sys.exit(1)


def _receiver_words(m):
    h = m["receiver_height_m"][0]
    if math.isfinite(h):
        return f"height at the receiver's plane {h:.2f} m"
    return "bounces twice before the receiver's plane"


@aim.command("feed")
@click.option("--machine", default="club_feeder", show_default=True, help="Machine preset.")
@click.option(
    "--at",
    "position",
    default="11,0",
    show_default=True,
    help="Machine position X,Y on the court [m].",
)
@click.option("--target", required=True, help="Landing point X,Y [m], court frame.")
@click.option("--spin", default="0", show_default=True, help="Topspin setting [rpm], - backspin.")
@click.option("--speed", default=None, help="Feed speed (km/h, mph, m/s); else give --height.")
@click.option("--height", default=None, help="Ball height at the player's contact plane [m].")
@click.option("--scenario", default="demo", show_default=True, help=_SCENARIO_HELP)
@_condition_options
@click.option("--json", "as_json", is_flag=True, help="Print a JSON object.")
@click.option("--csv", "csv_path", default=None, help="Write the trajectory (.csv or .parquet).")
@click.option("--dt", default="0.005", show_default=True, help="Trajectory time step [s].")
@click.option("--force", is_flag=True, help="Overwrite an existing output file.")
def aim_feed_cmd(
    machine,
    position,
    target,
    spin,
    speed,
    height,
    scenario,
    ball,
    racket,
    air,
    surface_name,
    receiver_plane,
    as_json,
    csv_path,
    dt,
    force,
):
    """The machine speed, elevation and aim that land a fed ball on --target.

    Ball machines can injure: nobody in the machine's line of fire, start at low feed speeds,
    and follow the venue's rules and qualified coaching practice.
    """
    from rallyarc.aim import aim_feed, load_machine
    from rallyarc.output import export

    sc = _scenario_with(scenario, ball, racket, air, surface_name, receiver_plane)
    mach = load_machine(machine)
    mx, my = _target(position, "--at")
    if abs(mx) < 1.0:
        raise InputError("--at: the machine must stand at least 1 m from the net (|X| >= 1)")
    tx, ty = _target(target)
    if tx * mx >= 0:
        raise InputError("--target: must lie on the other side of the net from the machine")
    if (speed is None) == (height is None):
        raise InputError("--speed/--height: give exactly one of them")
    w = units.number(spin, "--spin", -8000.0, 8000.0)
    step = units.number(dt, "--dt", 0.0005, 0.1)
    if csv_path is not None:
        export.check_targets([csv_path], force, "--csv")
    kwargs = (
        {"speed": units.speed(speed, "--speed", 1.0, 80.0)}
        if speed is not None
        else {"player_height": units.number(height, "--height", 0.1, 4.0)}
    )
    res = aim_feed(mach, (mx, my), sc.conditions, tx, ty, w, **kwargs)
    _aim_outputs(res, csv_path, step)
    s, m = res.settings, res.result.metrics
    land = res.landing()[0]
    aim_left = math.degrees(s["azimuth"][0] - (math.pi if res.mirrored else 0.0))
    aim_left = (aim_left + 180.0) % 360.0 - 180.0
    data = {
        "machine": machine,
        "position_m": [mx, my],
        "target_m": [tx, ty],
        "reachable": bool(res.reachable[0]),
        "reason": str(res.reason[0]),
        "speed_kmh": float(s["speed"][0] * KMH_PER_MPS),
        "speed_mph": float(s["speed"][0] / units.MPH),
        "elevation_deg": math.degrees(s["elevation"][0]),
        "aim_left_deg": aim_left,
        "spin_rpm": float(s["topspin"][0] / units.RPM),
        "landing_m": [float(land[0]), float(land[1])],
        "miss_m": float(res.miss_distance()[0]),
        "net_clearance_m": float(m["net_clearance_m"][0]),
        "bounce_apex_m": float(m["bounce_apex_m"][0]),
        "height_at_player_m": float(m["receiver_height_m"][0]),
        "time_to_player_s": float(m["receiver_t_s"][0]),
    }
    data = {
        k: (None if isinstance(v, float) and not math.isfinite(v) else v) for k, v in data.items()
    }
    head = "solved" if data["reachable"] else "NOT REACHABLE: " + data["reason"]
    lines = [
        f"feed to x {tx:+.2f}, y {ty:+.2f} from {machine} at x {mx:+.1f}, y {my:+.1f}: {head}",
        f"set:     speed {data['speed_kmh']:.1f} km/h ({data['speed_mph']:.1f} mph), elevation "
        f"{data['elevation_deg']:.1f} deg, aim {aim_left:+.1f} deg (+ left), spin "
        f"{data['spin_rpm']:+.0f} rpm",
        f"lands:   x {land[0]:+.2f}, y {land[1]:+.2f} ({data['miss_m'] * 100:.1f} cm from target)",
        "Safety: nobody in the machine's line of fire; start with slow feeds; follow the venue's "
        "rules and qualified coaching practice.",
    ]
    _emit(data, as_json, lines)
    if not data["reachable"]:
        sys.exit(1)


@main.command()
@click.argument("drill_file", default="demo_drill")
@click.option("--out", "out_dir", default=None, help="Write the drill sheet and trajectories here.")
@click.option(
    "--units",
    "speed_units",
    type=click.Choice(["kmh", "mph"]),
    default="kmh",
    show_default=True,
    help="Speed units on the sheet.",
)
@click.option("--dt", default="0.005", show_default=True, help="Trajectory time step [s].")
@click.option("--force", is_flag=True, help="Overwrite existing files in --out.")
@click.option("--json", "as_json", is_flag=True, help="Print the sheet as JSON.")
def drill(drill_file, out_dir, speed_units, dt, force, as_json):
    """Solve every ball of a drill file and print (or write) its drill sheet."""
    from pathlib import Path

    from rallyarc.drill import SAFETY, load_drill, sheet_lines, solve_drill
    from rallyarc.output import export

    d = load_drill(drill_file)
    step = units.number(dt, "--dt", 0.0005, 0.1)
    names = (
        "drill_sheet.csv",
        "drill_sheet.json",
        "drill_sheet.parquet",
        "drill_sheet.png",
        "drill_sheet.pdf",
        "trajectories.csv",
        "trajectories.parquet",
    )
    if out_dir is not None:
        folder = Path(out_dir)
        if folder.exists() and not folder.is_dir():
            raise InputError(f"--out: {folder} is a file, not a folder")
        export.check_targets([folder / n for n in names], force)
    sheet, results = solve_drill(d)
    lines = sheet_lines(d, sheet, speed_units)
    records = sheet.astype(object).where(sheet.notna(), None).to_dict(orient="records")
    data = {"drill": d.name, "coach": d.coach, "club": d.club, "safety": SAFETY, "balls": records}
    if out_dir is not None:
        written = _write_drill(d, sheet, results, data, folder, step, speed_units)
        lines.append("written: " + ", ".join(str(p) for p in written))
    _emit(data, as_json, lines)


def _write_drill(d, sheet, results, data, folder, step, speed_units):
    import pandas as pd

    from rallyarc.drill import SAFETY
    from rallyarc.output import export
    from rallyarc.viz.drill_sheet import drill_sheet

    frames, paths = [], {}
    for idx, aim_result in results:
        frame = aim_result.trajectory_frame(step)
        frame["ball"] = np.asarray(idx)[frame["shot"].to_numpy()] + 1
        frames.append(frame.drop(columns=["shot", "label"]))
        for i in idx:
            part = frame[frame["ball"] == i + 1]
            paths[i + 1] = part[["x_m", "y_m"]].to_numpy()
    table = pd.concat(frames).sort_values(["ball", "t_s"], kind="stable")
    table = table[["ball"] + [c for c in table.columns if c != "ball"]].reset_index(drop=True)
    fig = drill_sheet(d, sheet, paths, SAFETY, speed_units)
    written = [
        export.write_frame(folder / "drill_sheet.csv", sheet),
        export.write_json(folder / "drill_sheet.json", data),
        export.write_frame(folder / "drill_sheet.parquet", sheet),
        export.atomic_write(
            folder / "drill_sheet.png", lambda tmp: fig.savefig(tmp, format="png", dpi=110)
        ),
        export.atomic_write(folder / "drill_sheet.pdf", lambda tmp: fig.savefig(tmp, format="pdf")),
        export.write_frame(folder / "trajectories.csv", table),
        export.write_frame(folder / "trajectories.parquet", table),
    ]
    import matplotlib.pyplot as plt

    plt.close(fig)
    return written


def _register_extensions():
    """Commands that live in their own modules (plots and scenes, rallies) join the group here,
    after the helpers above that they use."""
    from rallyarc import cli_rally, cli_viz

    cli_viz.register(main)
    cli_rally.register(main)


if __name__ == "__main__":  # python -m rallyarc.cli: run the importable module's group
    from rallyarc.cli import main as _main

    _main()
else:
    _register_extensions()
