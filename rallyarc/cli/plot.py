"""``rallyarc plot {side,top,sweep,window}``: 2D figures of a scenario's shots.

Thin commands over :mod:`rallyarc.sweep` (the shots) and :mod:`rallyarc.viz.plots` (the
figures). Every file is written atomically and an existing file is kept unless ``--force``.
"""

from __future__ import annotations

import click

from rallyarc import units
from rallyarc.cli.conditions import (
    condition_options,
    load_strokes,
    scenario_options,
)
from rallyarc.cli.options import (
    MOST_SCATTER,
    figure_output_option,
    figure_path,
    play_shots,
    save_figure,
    spread_options,
    spread_options_up_to,
    whole,
)
from rallyarc.errors import InputError

#: Default half-width of a sweep or window around the stroke's own value, in display units.
SPAN = {
    "head_speed": 30.0,
    "face_tilt": 5.0,
    "swing_path": 20.0,
    "incoming_speed": 40.0,
    "incoming_spin": 2000.0,
    "launch_speed": 30.0,
    "launch_angle": 8.0,
    "launch_spin": 2000.0,
}


@click.group(cls=click.Group)
def plot():
    """2D figures: side view, top view, a sweep of one parameter, a success window."""


#: Most scattered shots per stroke in a side view, as in the other figures: the paths are
#: sampled shot by shot (linear in N); 2000 per stroke took 2.4 s and 140 MB on two cores.
MOST_SIDE_SCATTER = 2000


def _view(draw, scenario, stroke_names, overrides, scatter, seed, out, force, most=MOST_SCATTER):
    from rallyarc.output import export

    path = figure_path(out)
    export.check_targets([path], force)
    sc, strokes, incoming = load_strokes(scenario, stroke_names, overrides)
    result = play_shots(sc, strokes, incoming, scatter, seed, most)
    click.echo(f"written: {save_figure(draw(result), path)}")


@plot.command("side")
@scenario_options
@spread_options_up_to(MOST_SIDE_SCATTER)
@figure_output_option("side_view.png")
def plot_side(**options):
    """Height against distance down the court for each stroke of SCENARIO (default demo)."""
    from rallyarc.viz import plots

    _view(plots.side_view, **options, most=MOST_SIDE_SCATTER)


@plot.command("top")
@scenario_options
@spread_options
@figure_output_option("top_view.png")
def plot_top(**options):
    """The court from above with each stroke's path and landing; with --scatter, the spread of
    landings as 2-sigma ellipses."""
    from rallyarc.viz import plots

    _view(plots.top_view, **options)


def _parameter(name, option):
    from rallyarc import sweep

    if name not in sweep.PARAMETERS:
        raise InputError(f"{option}: unknown parameter {name!r}; choose one of "
                         + ", ".join(sweep.PARAMETERS))  # fmt: skip
    return sweep.PARAMETERS[name]


def _nominal(stroke, parameter, sc, incoming):
    """The stroke's own value of a parameter, in display units."""
    from rallyarc.sweep import own_value

    p = parameter
    if p.family == "incoming" and incoming is None:
        raise InputError(f"--param: {p.name} needs a groundstroke; a serve has no incoming ball")
    return float(p.from_si(own_value(stroke, p.name, sc.conditions, incoming)))


def _range(text, option, parameter, nominal):
    """``LO,HI`` in display units, or the default span around the nominal value, clipped to the
    parameter's allowed range."""
    p = parameter
    if text is None:
        lo, hi = nominal - SPAN[p.name], nominal + SPAN[p.name]
        return max(lo, p.low), min(hi, p.high)
    parts = str(text).split(",")
    if len(parts) != 2:
        raise InputError(f"{option}: expected LO,HI in {p.unit}, got {text!r}")
    lo, hi = (units.number(v.strip(), option, p.low, p.high) for v in parts)
    if not lo < hi:
        raise InputError(f"{option}: LO must be below HI, got {text}")
    return lo, hi


def _one_stroke(scenario, stroke_name, overrides):
    """The scenario, its stroke named ``stroke_name`` (default: the first) and the incoming ball
    (None for a serve)."""
    chosen = (stroke_name,) if stroke_name else ()
    sc, strokes, incoming = load_strokes(scenario, chosen, overrides)
    stroke = strokes[0]
    return sc, stroke, None if stroke.kind == "serve" else incoming


def _metric_keys(metrics):
    from rallyarc.viz import plots

    keys = tuple(k.strip() for k in metrics.split(",") if k.strip())
    unknown = [k for k in keys if k not in plots.METRICS]
    if not keys or unknown:
        raise InputError(f"--metrics: unknown metric {(unknown or [''])[0]!r}; choose from "
                         + ", ".join(plots.METRICS))  # fmt: skip
    return keys


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
@condition_options
@figure_output_option("sweep.png")
def plot_sweep(scenario, stroke_name, param, span, steps, metrics, csv_path, overrides, out,
               force):  # fmt: skip
    """What one parameter changes: net clearance, depth, bounce apex and height at the
    receiver's plane against the swept value, for one stroke of SCENARIO."""
    import numpy as np

    from rallyarc import sweep
    from rallyarc.output import export
    from rallyarc.viz import plots

    path = figure_path(out)
    keys = _metric_keys(metrics)
    export.check_targets([path], force, "--out")
    if csv_path is not None:
        csv_path = figure_path(csv_path, "--csv", (".csv",))
        export.check_targets([csv_path], force, "--csv")
    n = whole(steps, "--steps", 2, 500)
    p = _parameter(param, "--param")
    sc, stroke, incoming = _one_stroke(scenario, stroke_name, overrides)
    nominal = _nominal(stroke, p, sc, incoming)
    lo, hi = _range(span, "--range", p, nominal)
    values = np.linspace(lo, hi, n)
    result = sweep.sweep(stroke, sc.conditions, incoming, p.name, p.to_si(values))
    fig = plots.sweep_plot(
        result, values, p.axis_label, metrics=keys, nominal=nominal if lo <= nominal <= hi else None
    )
    written = [save_figure(fig, path)]
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
@condition_options
@figure_output_option("window.png")
def plot_window(scenario, stroke_name, axes, x_range, y_range, steps, overrides, out, force):
    """A success window: outcome (in, net, long, wide) over a grid of two parameters, with the
    margins to each edge, for one stroke of SCENARIO."""
    import numpy as np

    from rallyarc import window
    from rallyarc.output import export
    from rallyarc.viz import plots
    from rallyarc.window import check_window_axes

    path = figure_path(out)
    export.check_targets([path], force)
    parts = [a.strip() for a in axes.split(",")]
    if len(parts) != 2:
        raise InputError(f"--axes: expected two parameters X,Y, got {axes!r}")
    px, py = (_parameter(a, "--axes") for a in parts)
    try:
        check_window_axes(px.name, py.name)
    except ValueError:
        raise InputError(
            "--axes: two different swing parameters (head_speed, face_tilt, swing_path) or two "
            "launch parameters (launch_speed, launch_angle, launch_spin)"
        ) from None
    n = whole(steps, "--steps", 3, 201)
    sc, stroke, incoming = _one_stroke(scenario, stroke_name, overrides)
    xlo, xhi = _range(x_range, "--x-range", px, _nominal(stroke, px, sc, incoming))
    ylo, yhi = _range(y_range, "--y-range", py, _nominal(stroke, py, sc, incoming))
    w = window.window(
        stroke,
        sc.conditions,
        incoming,
        px.name,
        px.to_si(np.linspace(xlo, xhi, n)),
        py.name,
        py.to_si(np.linspace(ylo, yhi, n)),
    )
    click.echo(f"written: {save_figure(plots.window_plot(w), path)}")
    click.echo(f"{100 * w.fraction_in():.0f} % of the grid lands in")
