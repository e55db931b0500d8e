"""``rallyarc aim stroke`` and ``rallyarc aim feed``: the swing, or the ball-machine setting, that
lands the ball on a target. Both exit with status 1 when the target cannot be reached."""

from __future__ import annotations

import math
import sys

import click

from rallyarc import units
from rallyarc.cli.conditions import (
    ball_state,
    condition_options,
    incoming_table,
    scenario_with,
)
from rallyarc.cli.options import (
    SCENARIO_HELP,
    check_file,
    court_point,
    dt_option,
    emit,
    force_option,
    json_option,
    number_text,
    time_step,
)
from rallyarc.errors import InputError
from rallyarc.units import KMH_PER_MPS

SAFETY = (
    "Safety: nobody in the machine's line of fire; start with slow feeds; follow the venue's "
    "rules and qualified coaching practice."
)


def _output_options(func):
    """--json, --csv, --dt and --force of both aim commands."""
    func = force_option()(func)
    func = dt_option(func)
    func = click.option(
        "--csv", "csv_path", default=None, help="Write the trajectory (.csv or .parquet)."
    )(func)
    return json_option()(func)


def _write_trajectory(aim, csv_path, dt):
    from rallyarc.output import export

    if csv_path is not None:
        export.write_frame(csv_path, aim.trajectory_frame(dt))


@click.group(cls=click.Group)
def aim():
    """Solve the swing (aim stroke) or the ball-machine setting (aim feed) for a target."""


@aim.command("stroke")
@click.option("--stroke", default="topspin_drive", show_default=True, help="Stroke style preset.")
@click.option("--scenario", default="demo", show_default=True, help=SCENARIO_HELP)
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
@condition_options
@_output_options
def aim_stroke_cmd(stroke, scenario, target, free, clearance, receiver_height, overrides,
                   as_json, csv_path, dt, force):  # fmt: skip
    """The swing of a stroke style that lands the ball on --target."""
    from rallyarc import domain
    from rallyarc.aim import aim_stroke

    sc = scenario_with(scenario, overrides)
    st = domain.load_stroke(stroke)
    tx, ty = court_point(target)
    if clearance is not None and receiver_height is not None:
        raise InputError("--clearance/--receiver-height: give one of them, not both")
    clr = units.number(clearance, "--clearance", 0.0, 10.0) if clearance is not None else None
    rh = (
        units.number(receiver_height, "--receiver-height", 0.05, 5.0)
        if receiver_height is not None
        else None
    )
    step = time_step(dt)
    check_file(csv_path, force)
    incoming = None if st.kind == "serve" else ball_state(incoming_table(sc))
    res = aim_stroke(
        incoming, st, sc.conditions, tx, ty, free=free, clearance=clr, receiver_height=rh
    )
    _write_trajectory(res, csv_path, step)
    sw = res.result.swing
    swing = {
        "head_speed_mps": float(sw.head_speed[0]),
        "head_speed_kmh": float(sw.head_speed[0] * KMH_PER_MPS),
        "face_tilt_deg": math.degrees(sw.face_tilt[0]),
        "swing_direction_deg": math.degrees(sw.swing_direction[0]),
        "face_azimuth_deg": math.degrees(sw.face_azimuth[0]),
        "swing_path_deg": math.degrees(sw.swing_path[0]),
    }
    data = {
        "target_m": [tx, ty],
        "reachable": bool(res.reachable[0]),
        "reason": str(res.reason[0]),
        "solved": sorted(res.settings),
        "swing": swing,
        "miss_m": float(res.miss_distance()[0]),
        "shot": res.result.record(0),
    }
    lines = _stroke_lines(st, data, res.result.metrics)
    if csv_path is not None:
        lines.append(f"trajectory written to {csv_path}")
    emit(data, as_json, lines)
    if not data["reachable"]:
        sys.exit(1)


def _stroke_lines(st, data, m):
    (tx, ty), swing = data["target_m"], data["swing"]
    head = "solved" if data["reachable"] else "NOT REACHABLE: " + data["reason"]
    h = m["receiver_height_m"][0]
    receiver = (
        f"height at the receiver's plane {h:.2f} m"
        if math.isfinite(h)
        else "bounces twice before the receiver's plane"
    )
    return [
        f"{st.label} to x {tx:+.2f}, y {ty:+.2f}: {head}",
        f"swing:   head speed {swing['head_speed_kmh']:.1f} km/h, path "
        f"{swing['swing_path_deg']:+.1f} deg, face tilt {swing['face_tilt_deg']:+.2f} deg, "
        f"direction {swing['swing_direction_deg']:+.2f} deg",
        f"ball:    {m['impact_speed_mps'][0] * KMH_PER_MPS:.0f} km/h at "
        f"{m['impact_launch_deg'][0]:+.1f} deg, {m['impact_topspin_rpm'][0]:+.0f} rpm topspin",
        f"lands:   x {m['land_x_m'][0]:+.2f}, y {m['land_y_m'][0]:+.2f} "
        f"({data['miss_m'] * 100:.1f} cm from the target), {m['outcome'][0]}",
        f"net:     clearance {m['net_clearance_m'][0]:+.2f} m; " + receiver,
    ]


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
@click.option("--scenario", default="demo", show_default=True, help=SCENARIO_HELP)
@condition_options
@_output_options
def aim_feed_cmd(machine, position, target, spin, speed, height, scenario, overrides, as_json,
                 csv_path, dt, force):  # fmt: skip
    """The machine speed, elevation and aim that land a fed ball on --target.

    Ball machines can injure: nobody in the machine's line of fire, start at low feed speeds,
    and follow the venue's rules and qualified coaching practice.
    """
    from rallyarc.aim import aim_feed, load_machine

    if overrides.friction_only:
        raise InputError("--friction-only: a fed ball meets no racket, so there is no spring-back "
                         "to leave out; drop the option")  # fmt: skip
    sc = scenario_with(scenario, overrides)
    mach = load_machine(machine)
    mx, my = court_point(position, "--at")
    if abs(mx) < 1.0:
        raise InputError("--at: the machine must stand at least 1 m from the net (|X| >= 1)")
    tx, ty = court_point(target)
    if tx * mx >= 0:
        raise InputError("--target: must lie on the other side of the net from the machine")
    if (speed is None) == (height is None):
        raise InputError("--speed/--height: give exactly one of them")
    w = units.number(spin, "--spin", -8000.0, 8000.0)
    step = time_step(dt)
    check_file(csv_path, force)
    kwargs = (
        {"speed": units.speed(speed, "--speed", 1.0, 80.0)}
        if speed is not None
        else {"player_height": units.number(height, "--height", 0.1, 4.0)}
    )
    res = aim_feed(mach, (mx, my), sc.conditions, tx, ty, w, **kwargs)
    _write_trajectory(res, csv_path, step)
    data = _feed_record(machine, (mx, my), (tx, ty), res)
    land = data["landing_m"]
    head = "solved" if data["reachable"] else "NOT REACHABLE: " + data["reason"]
    lines = [
        f"feed to x {tx:+.2f}, y {ty:+.2f} from {machine} at x {mx:+.1f}, y {my:+.1f}: {head}",
        f"set:     speed {data['speed_kmh']:.1f} km/h ({data['speed_mph']:.1f} mph), elevation "
        f"{data['elevation_deg']:.1f} deg, aim {data['aim_left_deg']:+.1f} deg (+ left), spin "
        f"{data['spin_rpm']:+.0f} rpm",
        f"lands:   x {number_text(land[0], '{:+.2f}')}, y {number_text(land[1], '{:+.2f}')} "
        f"({number_text(_cm(data['miss_m']), '{:.1f}')} cm from target), "
        f"{data['outcome']}",
        _player_line(data),
        SAFETY,
    ]
    emit(data, as_json, lines)
    if not data["reachable"]:
        sys.exit(1)


def _cm(metres):
    """Metres in centimetres, None kept."""
    return None if metres is None else metres * 100


def _player_line(data):
    """The height the fed ball reaches at the player's contact plane, and when."""
    height = data["height_at_player_m"]
    if height is None:
        return "player:  the ball bounces twice before the player's contact plane"
    when = "before the bounce" if data["player_before_bounce"] else "after the bounce"
    return (
        f"player:  {height:.2f} m at the player's contact plane ({when}), "
        f"{data['time_to_player_s']:.2f} s after release"
    )


def _feed_record(machine, position, target, res):
    """The machine setting of the first target, JSON-safe (non-finite numbers are None)."""
    s, m = res.settings, res.result.metrics
    land = res.landing()[0]
    aim_left = math.degrees(s["azimuth"][0] - (math.pi if res.mirrored else 0.0))
    data = {
        "machine": machine,
        "position_m": list(position),
        "target_m": list(target),
        "reachable": bool(res.reachable[0]),
        "reason": str(res.reason[0]),
        "speed_mps": float(s["speed"][0]),
        "speed_kmh": float(s["speed"][0] * KMH_PER_MPS),
        "speed_mph": float(s["speed"][0] / units.MPH),
        "elevation_deg": math.degrees(s["elevation"][0]),
        "aim_left_deg": (aim_left + 180.0) % 360.0 - 180.0,
        "spin_rpm": float(s["topspin"][0] / units.RPM),
        "landing_m": [float(land[0]), float(land[1])],
        "miss_m": float(res.miss_distance()[0]),
        "net_clearance_m": float(m["net_clearance_m"][0]),
        "bounce_apex_m": float(m["bounce_apex_m"][0]),
        "height_at_player_m": float(m["receiver_height_m"][0]),
        "time_to_player_s": float(m["receiver_t_s"][0]),
        "player_before_bounce": bool(m["receiver_before_bounce"][0]),
        "outcome": str(m["outcome"][0]),
    }
    return {
        k: (None if isinstance(v, float) and not math.isfinite(v) else v) for k, v in data.items()
    }
