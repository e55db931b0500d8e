"""``rallyarc plot {side,top,sweep,window}`` and ``rallyarc scene``: figures and 3D scenes.

Thin commands over :mod:`rallyarc.sweep` (the shots), :mod:`viz.plots` (2D figures) and
:mod:`viz.scene` (3D). Every file is written atomically and an existing file is kept unless
``--force`` is given.
"""

from __future__ import annotations

from pathlib import Path

import click
import numpy as np

from rallyarc import units
from rallyarc.errors import InputError

_FIGURE_SUFFIXES = (".png", ".pdf", ".svg")

#: Default half-width of a sweep or window around the stroke's own value, in display units.
_SPAN = {
    "head_speed": 30.0,
    "face_tilt": 5.0,
    "swing_path": 20.0,
    "incoming_speed": 40.0,
    "incoming_spin": 2000.0,
    "launch_speed": 30.0,
    "launch_angle": 8.0,
    "launch_spin": 2000.0,
}


def _cli():
    from rallyarc import cli

    return cli


def _scenario_options(func):
    """SCENARIO argument, --stroke and the condition overrides shared by the figure commands."""
    func = _cli()._condition_options(func)
    func = click.option(
        "--stroke",
        "stroke_names",
        multiple=True,
        help="Only these strokes of the scenario (repeat the option); default: all.",
    )(func)
    return click.argument("scenario", default="demo")(func)


def _spread_options(func):
    func = click.option("--seed", default="0", show_default=True, help="Seed of the scatter.")(func)
    return click.option(
        "--scatter",
        default="0",
        show_default=True,
        help="Shots per stroke with a player's execution scatter, 0 to 2000 (0: one each).",
    )(func)


def _output_option(default):
    def deco(func):
        func = click.option("--force", is_flag=True, help="Overwrite an existing file.")(func)
        return click.option(
            "--out", default=default, show_default=True, help="Figure file: .png, .pdf or .svg."
        )(func)

    return deco


def _figure_path(text, option="--out", suffixes=_FIGURE_SUFFIXES):
    path = Path(text)
    if path.suffix.lower() not in suffixes:
        raise InputError(f"{option}: {path} must end in {', '.join(suffixes)}")
    if path.exists() and path.is_dir():
        raise InputError(f"{option}: {path} is a folder, not a file")
    return path


def _load(scenario, stroke_names, ball, racket, air, surface_name, receiver_plane):
    from rallyarc import domain
    from rallyarc.shot import BallState

    sc = _cli()._scenario_with(scenario, ball, racket, air, surface_name, receiver_plane)
    strokes = list(sc.strokes)
    if stroke_names:
        by_name = {s.name: s for s in strokes}
        missing = [n for n in stroke_names if n not in by_name]
        if missing:
            raise InputError(
                f"--stroke: {missing[0]!r} is not a stroke of scenario {sc.name}; "
                f"choose from {', '.join(by_name)}"
            )
        strokes = [by_name[n] for n in stroke_names]
    incoming = BallState.of(*domain.incoming_state(sc.incoming)) if sc.incoming else None
    return sc, strokes, incoming


def _shots(sc, strokes, incoming, scatter, seed):
    from rallyarc import sweep
    from rallyarc.shot import play

    n = int(units.number(scatter, "--scatter", 0, 2000))
    if n != float(scatter):
        raise InputError(f"--scatter: expected a whole number from 0 to 2000, got {scatter}")
    if n == 0:
        return play(strokes, sc.conditions, incoming)
    s = int(units.number(seed, "--seed", 0, 2**32 - 1))
    return sweep.dispersion(strokes, sc.conditions, incoming, n, seed=s)


def _save(fig, path):
    from rallyarc.viz import plots

    try:
        return plots.save_figure(fig, path)
    finally:
        fig.clear()


def register(group):
    """Add ``plot`` and ``scene`` to the main command group."""
    group.add_command(plot)
    group.add_command(scene_cmd)


@click.group(cls=click.Group)
def plot():
    """2D figures: side view, top view, a sweep of one parameter, a success window."""


@plot.command("side")
@_scenario_options
@_spread_options
@_output_option("side_view.png")
def plot_side(scenario, stroke_names, ball, racket, air, surface_name, receiver_plane, scatter,
              seed, out, force):  # fmt: skip
    """Height against distance down the court for each stroke of SCENARIO (default demo)."""
    from rallyarc.output import export
    from rallyarc.viz import plots

    path = _figure_path(out)
    export.check_targets([path], force)
    sc, strokes, incoming = _load(
        scenario, stroke_names, ball, racket, air, surface_name, receiver_plane
    )
    result = _shots(sc, strokes, incoming, scatter, seed)
    click.echo(f"written: {_save(plots.side_view(result), path)}")


@plot.command("top")
@_scenario_options
@_spread_options
@_output_option("top_view.png")
def plot_top(scenario, stroke_names, ball, racket, air, surface_name, receiver_plane, scatter,
             seed, out, force):  # fmt: skip
    """The court from above with each stroke's path and landing; with --scatter, the spread of
    landings as 2-sigma ellipses."""
    from rallyarc.output import export
    from rallyarc.viz import plots

    path = _figure_path(out)
    export.check_targets([path], force)
    sc, strokes, incoming = _load(
        scenario, stroke_names, ball, racket, air, surface_name, receiver_plane
    )
    result = _shots(sc, strokes, incoming, scatter, seed)
    click.echo(f"written: {_save(plots.top_view(result), path)}")


def _range(text, option, parameter, nominal):
    """``LO,HI`` in display units, or the default span around the nominal value, clipped to the
    parameter's allowed range."""
    p = parameter
    if text is None:
        lo, hi = nominal - _SPAN[p.name], nominal + _SPAN[p.name]
        return max(lo, p.low), min(hi, p.high)
    parts = str(text).split(",")
    if len(parts) != 2:
        raise InputError(f"{option}: expected LO,HI in {p.unit}, got {text!r}")
    lo, hi = (units.number(v.strip(), option, p.low, p.high) for v in parts)
    if not lo < hi:
        raise InputError(f"{option}: LO must be below HI, got {text}")
    return lo, hi


def _nominal(stroke, parameter, sc, incoming):
    """The stroke's own value of a parameter, in display units."""
    from rallyarc import sweep

    p = parameter
    if p.family == "swing":
        return float(p.from_si(getattr(stroke, p.name)))
    if p.family == "incoming":
        if incoming is None:
            raise InputError(
                f"--param: {p.name} needs a groundstroke; a serve has no incoming ball"
            )
        vel, spin = incoming.velocity[0], incoming.spin[0]
        if p.name == "incoming_speed":
            return float(p.from_si(np.linalg.norm(vel)))
        h = vel[:2] / max(np.linalg.norm(vel[:2]), 1e-12)
        return float(p.from_si(spin @ np.array([-h[1], h[0], 0.0])))
    spec = sweep.Launch.from_stroke(stroke, sc.conditions, incoming)
    return float(p.from_si(spec.value(p.name)))


def _parameter(name, option):
    from rallyarc import sweep

    if name not in sweep.PARAMETERS:
        raise InputError(f"{option}: unknown parameter {name!r}; choose one of "
                         + ", ".join(sweep.PARAMETERS))  # fmt: skip
    return sweep.PARAMETERS[name]


@plot.command("sweep")
@click.argument("scenario", default="demo")
@click.option("--stroke", "stroke_name", default=None, help="The stroke (default: the first).")
@click.option(
    "--param",
    "param",
    default="launch_spin",
    show_default=True,
    help="Swept: head_speed, face_tilt, swing_path, incoming_speed, incoming_spin, "
    "launch_speed, launch_angle, launch_spin.",
)
@click.option("--range", "span", default=None, help="LO,HI in km/h, deg or rpm (default: around "
              "the stroke's own value).")  # fmt: skip
@click.option("--steps", default="25", show_default=True, help="Values swept, 2 to 500.")
@click.option(
    "--metrics",
    default="net_clearance_m,land_depth_m,bounce_apex_m,receiver_height_m",
    show_default=True,
    help="Comma-separated metrics, one panel each.",
)
@click.option("--csv", "csv_path", default=None, help="Also write the sweep's numbers (.csv).")
@_cli()._condition_options
@_output_option("sweep.png")
def plot_sweep(scenario, stroke_name, param, span, steps, metrics, csv_path, ball, racket, air,
               surface_name, receiver_plane, out, force):  # fmt: skip
    """What one parameter changes: net clearance, depth, bounce apex and height at the
    receiver's plane against the swept value, for one stroke of SCENARIO."""
    from rallyarc import sweep
    from rallyarc.output import export
    from rallyarc.viz import plots

    path = _figure_path(out)
    keys = tuple(k.strip() for k in metrics.split(",") if k.strip())
    unknown = [k for k in keys if k not in plots.METRICS]
    if not keys or unknown:
        raise InputError(f"--metrics: unknown metric {(unknown or [''])[0]!r}; choose from "
                         + ", ".join(plots.METRICS))  # fmt: skip
    targets = [path]
    if csv_path is not None:
        csv_path = _figure_path(csv_path, "--csv", (".csv",))
        targets.append(csv_path)
    export.check_targets(targets, force)
    n = int(units.number(steps, "--steps", 2, 500))
    p = _parameter(param, "--param")
    chosen = (stroke_name,) if stroke_name else ()
    sc, strokes, incoming = _load(scenario, chosen, ball, racket, air, surface_name, receiver_plane)
    stroke = strokes[0]
    if stroke.kind == "serve":
        incoming = None
    nominal = _nominal(stroke, p, sc, incoming)
    lo, hi = _range(span, "--range", p, nominal)
    values = np.linspace(lo, hi, n)
    result = sweep.sweep(stroke, sc.conditions, incoming, p.name, p.to_si(values))
    fig = plots.sweep_plot(
        result, values, p.axis_label, metrics=keys, nominal=nominal if lo <= nominal <= hi else None
    )
    written = [_save(fig, path)]
    if csv_path is not None:
        table = result.to_frame()
        table.insert(0, f"{p.name}_{p.unit.replace('/', '')}", values)
        written.append(export.write_frame(csv_path, table))
    click.echo("written: " + ", ".join(str(w) for w in written))


@plot.command("window")
@click.argument("scenario", default="demo")
@click.option("--stroke", "stroke_name", default=None, help="The stroke (default: the first).")
@click.option(
    "--axes",
    "axes",
    default="launch_angle,launch_speed",
    show_default=True,
    help="X,Y parameters: two of head_speed, face_tilt, swing_path, or two of launch_speed, "
    "launch_angle, launch_spin.",
)
@click.option("--x-range", default=None, help="LO,HI of the x parameter (display units).")
@click.option("--y-range", default=None, help="LO,HI of the y parameter (display units).")
@click.option("--steps", default="41", show_default=True, help="Grid cells per axis, 3 to 201.")
@_cli()._condition_options
@_output_option("window.png")
def plot_window(scenario, stroke_name, axes, x_range, y_range, steps, ball, racket, air,
                surface_name, receiver_plane, out, force):  # fmt: skip
    """A success window: outcome (in, net, long, wide) over a grid of two parameters, with the
    margins to each edge, for one stroke of SCENARIO."""
    from rallyarc import sweep
    from rallyarc.output import export
    from rallyarc.viz import plots

    path = _figure_path(out)
    export.check_targets([path], force)
    parts = [a.strip() for a in axes.split(",")]
    if len(parts) != 2:
        raise InputError(f"--axes: expected two parameters X,Y, got {axes!r}")
    px, py = (_parameter(a, "--axes") for a in parts)
    if px.name == py.name or px.family != py.family or px.family == "incoming":
        raise InputError(
            "--axes: two different swing parameters (head_speed, face_tilt, swing_path) or two "
            "launch parameters (launch_speed, launch_angle, launch_spin)"
        )
    n = int(units.number(steps, "--steps", 3, 201))
    chosen = (stroke_name,) if stroke_name else ()
    sc, strokes, incoming = _load(scenario, chosen, ball, racket, air, surface_name, receiver_plane)
    stroke = strokes[0]
    if stroke.kind == "serve":
        incoming = None
    xlo, xhi = _range(x_range, "--x-range", px, _nominal(stroke, px, sc, incoming))
    ylo, yhi = _range(y_range, "--y-range", py, _nominal(stroke, py, sc, incoming))
    w = sweep.window(
        stroke,
        sc.conditions,
        incoming,
        px.name,
        px.to_si(np.linspace(xlo, xhi, n)),
        py.name,
        py.to_si(np.linspace(ylo, yhi, n)),
    )
    click.echo(f"written: {_save(plots.window_plot(w), path)}")
    click.echo(f"{100 * w.fraction_in():.0f} % of the grid lands in")


@click.command("scene")
@_scenario_options
@_spread_options
@click.option(
    "--camera",
    type=click.Choice(["hitter", "side", "receiver", "overhead", "all"]),
    default="hitter",
    show_default=True,
    help="Camera preset; 'all' writes one PNG per preset (NAME_hitter.png, ...).",
)
@click.option("--out", default="scene.png", show_default=True, help="PNG rendered off screen.")
@click.option(
    "--export",
    "export_path",
    default=None,
    help="Also export the scene: .html (opens in a web browser) or .gltf.",
)
@click.option("--show", is_flag=True, help="Open an interactive window (needs a display).")
@click.option("--force", is_flag=True, help="Overwrite existing files.")
def scene_cmd(scenario, stroke_names, ball, racket, air, surface_name, receiver_plane, scatter,
              seed, camera, out, export_path, show, force):  # fmt: skip
    """The shots of SCENARIO in 3D: court, net, paths as tubes, markers at contact, net crossing,
    bounce and apex. Rendered off screen to PNG; --export writes a self-contained HTML page (any
    web browser, no Python) or a glTF file; --show opens a window."""
    from rallyarc.output import export
    from rallyarc.viz import scene

    png = _figure_path(out, "--out", (".png",))
    cameras = list(scene.CAMERAS) if camera == "all" else [camera]
    pngs = (
        [png.with_name(f"{png.stem}_{c}{png.suffix}") for c in cameras]
        if camera == "all"
        else [png]
    )
    targets = list(pngs)
    if export_path is not None:
        export_path = _figure_path(export_path, "--export", (".html", ".gltf"))
        targets.append(export_path)
    export.check_targets(targets, force)
    if show and not scene.has_display():
        raise InputError("--show: no display found (DISPLAY is not set); the PNG is still written "
                         "without --show")  # fmt: skip
    sc, strokes, incoming = _load(
        scenario, stroke_names, ball, racket, air, surface_name, receiver_plane
    )
    result = _shots(sc, strokes, incoming, scatter, seed)
    written = []
    for c, p in zip(cameras, pngs, strict=True):
        written.append(scene.render_scene(result, png_path=p, camera=c))
    if export_path is not None:
        written.append(scene.render_scene(result, export_path=export_path, camera=cameras[0]))
    click.echo("written: " + ", ".join(str(w) for w in written))
    if show:
        scene.render_scene(result, camera=cameras[0], show=True)
