"""``rallyarc shot`` and ``rallyarc compare``: whole shots, one stroke or a scenario's variants."""

from __future__ import annotations

import math

import click

from rallyarc import units
from rallyarc.cli.conditions import (
    condition_options,
    incoming_ball,
    incoming_table,
    scenario_with,
)
from rallyarc.cli.options import (
    SCENARIO_HELP,
    check_ball_point,
    check_file,
    check_stroke_fits,
    dt_option,
    emit,
    force_option,
    json_option,
    loaded,
    output_folder,
    time_step,
    write_folder,
)
from rallyarc.errors import InputError
from rallyarc.units import KMH_PER_MPS

#: Files ``compare --out`` writes.
COMPARE_OUTPUTS = (
    "shots.csv",
    "shots.json",
    "trajectories.csv",
    "trajectories.parquet",
    "side_view.png",
    "top_view.png",
    "scene.png",
)


def _modes(conditions):
    """The non-default physics modes of played conditions, for a table's title ("" if none)."""
    return "; " + "; ".join(conditions.modes) if conditions.modes else ""


@click.command()
@click.option(
    "--stroke", default="topspin_drive", show_default=True, help="Stroke preset or TOML file."
)
@click.option("--scenario", default="demo", show_default=True, help=SCENARIO_HELP)
@click.option(
    "--head-speed", default=None, help="Override: racket speed at impact (km/h, mph, m/s)."
)
@click.option("--swing-path", default=None, help="Override: swing path above horizontal [deg].")
@click.option("--face-tilt", default=None, help="Override: face tilt, open positive [deg].")
@click.option("--swing-direction", default=None, help="Override: swing direction, + left [deg].")
@click.option("--contact", default=None, help="Override: contact point X,Y,Z [m].")
@click.option("--incoming-speed", default=None, help="Override: incoming ball speed.")
@click.option("--incoming-spin", default=None, help="Override: incoming topspin [rpm].")
@condition_options
@json_option()
@click.option(
    "--csv", "csv_path", default=None, help="Write the trajectory table to this CSV file."
)
@dt_option
@force_option("Overwrite existing output files.")
def shot(stroke, scenario, head_speed, swing_path, face_tilt, swing_direction, contact,
         incoming_speed, incoming_spin, overrides, as_json, csv_path, dt, force):  # fmt: skip
    """One stroke against the scenario's incoming ball (or a serve against its toss):
    impact, net, landing, bounce and the ball at the receiver."""
    from rallyarc import domain
    from rallyarc.output import export
    from rallyarc.output.tables import comparison_table
    from rallyarc.shot import play

    sc = scenario_with(scenario, overrides)
    st = loaded("--stroke", domain.load_stroke, stroke)
    st = _swing(st, head_speed, swing_path, face_tilt, swing_direction)
    step = time_step(dt)
    check_file(csv_path, force)
    st, incoming = _incoming(sc, st, contact, incoming_speed, incoming_spin)
    check_stroke_fits(st, sc.conditions, f"--stroke {stroke}")
    r = sc.conditions.ball.radius
    if incoming is None:
        check_ball_point(st.toss.contact, "--contact" if contact else f"--stroke {stroke}", r)
    elif contact is not None:
        check_ball_point(incoming.position[0], "--contact", r)
    c = sc.conditions
    result = play([st], c, incoming)
    if csv_path is not None:
        export.write_frame(csv_path, result.trajectory_frame(step))
    lines = comparison_table(
        result, title=f"{st.label} ({c.surface_name}, {c.ball.name}, {c.air.name}{_modes(c)})"
    )
    if csv_path is not None:
        lines.append(f"trajectory written to {csv_path}")
    emit(result.record(0), as_json, lines)


def _swing(stroke, head_speed, swing_path, face_tilt, swing_direction):
    """The stroke with the swing overrides of the options."""
    from rallyarc.sweep import with_swing

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
    return with_swing(stroke, **changes)


def _incoming(sc, st, contact, incoming_speed, incoming_spin):
    """The stroke (a serve's toss moved to --contact) and the incoming ball with the overrides
    (None for a serve)."""
    from dataclasses import replace

    from rallyarc.cli.conditions import (
        ball_state,
    )

    if st.kind == "serve":
        if contact is not None:
            st = replace(st, toss=replace(st.toss, contact=units.point(contact, "--contact")))
        if incoming_speed is not None or incoming_spin is not None:
            raise InputError(
                "--incoming-speed/--incoming-spin: a serve's incoming ball is its toss"
            )
        return st, None
    spec = incoming_table(sc)
    if contact is not None:
        spec["position_m"] = list(units.point(contact, "--contact", -20.0, 20.0))
    if incoming_speed is not None:
        spec["speed_kmh"] = units.speed(incoming_speed, "--incoming-speed", 0.0, 70.0) * KMH_PER_MPS
    if incoming_spin is not None:
        spec["spin_rpm"] = units.number(incoming_spin, "--incoming-spin", -6000.0, 6000.0)
    return st, ball_state(spec)


@click.command()
@click.argument("scenario", default="demo")
@condition_options
@click.option(
    "--out", "out_dir", default=None, help="Write the table, trajectories and figures here."
)
@dt_option
@force_option("Overwrite existing files in --out.")
@json_option("Print the shots as a JSON list.")
def compare(scenario, overrides, out_dir, dt, force, as_json):
    """Every stroke variant of a scenario side by side (default: the demo scenario)."""
    from rallyarc.output.tables import comparison_table
    from rallyarc.shot import play

    sc = scenario_with(scenario, overrides, "SCENARIO")
    step = time_step(dt)
    folder = output_folder(out_dir, COMPARE_OUTPUTS, force)
    c = sc.conditions
    result = play(sc.strokes, c, incoming_ball(sc))
    records = [result.record(i) for i in range(len(result))]
    title = (
        f"{sc.name}: {sc.player}, {sc.club}\n{sc.description}\n"
        f"ball {c.ball.name}, racket {c.racket.name}, air {c.air.name} "
        f"({c.air.density:.3f} kg/m^3), surface {c.surface_name}{_modes(c)}"
    )
    lines = comparison_table(result, title=title)
    if folder is not None:
        written = write_folder(folder, lambda d: _write_compare(result, records, d, step))
        lines.append("written: " + ", ".join(str(p) for p in written))
    emit(
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
