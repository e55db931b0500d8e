"""``rallyarc report``: one self-contained HTML page per scenario, for a coach to send a player.

The command computes (the shots, a sweep and a success window of the main stroke, the drill if
one is given) and :func:`rallyarc.viz.report.report_page` lays the page out.
"""

from __future__ import annotations

import click

from rallyarc.cli.conditions import (
    load_strokes,
    scenario_options,
)
from rallyarc.cli.options import (
    figure_path,
    loaded,
    play_shots,
    spread_options,
)
from rallyarc.errors import InputError

#: The main stroke's sweep and window: swept parameter, window axes and grid steps.
SWEPT = "launch_spin"
WINDOW_AXES = ("launch_angle", "launch_speed")
SWEEP_STEPS = 25
WINDOW_STEPS = 31


def _span(stroke, name, sc, incoming):
    """The parameter, the stroke's own value and the range around it (display units), as
    ``rallyarc plot sweep`` and ``plot window`` take them by default."""
    from rallyarc import sweep
    from rallyarc.cli.plot import SPAN

    p = sweep.PARAMETERS[name]
    nominal = float(p.from_si(sweep.own_value(stroke, p.name, sc.conditions, incoming)))
    return p, nominal, (max(nominal - SPAN[name], p.low), min(nominal + SPAN[name], p.high))


def _main_stroke(sc, strokes, incoming):
    """The sweep and the success window of the first stroke."""
    import numpy as np

    from rallyarc import sweep, window
    from rallyarc.viz.report import SweepPart

    stroke = strokes[0]
    inc = None if stroke.kind == "serve" else incoming
    p, nominal, (lo, hi) = _span(stroke, SWEPT, sc, inc)
    values = np.linspace(lo, hi, SWEEP_STEPS)
    swept = sweep.sweep(stroke, sc.conditions, inc, p.name, p.to_si(values))
    part = SweepPart(swept, values, p.axis_label, nominal if lo <= nominal <= hi else None)
    (px, _, (xlo, xhi)), (py, _, (ylo, yhi)) = (_span(stroke, a, sc, inc) for a in WINDOW_AXES)
    grid = window.window(
        stroke, sc.conditions, inc,
        px.name, px.to_si(np.linspace(xlo, xhi, WINDOW_STEPS)),
        py.name, py.to_si(np.linspace(ylo, yhi, WINDOW_STEPS)),
    )  # fmt: skip
    return part, grid


def _drill(name):
    from rallyarc.drill import SAFETY, drill_trajectories, load_drill, solve_drill
    from rallyarc.viz.report import DrillPart

    d = loaded("--drill", load_drill, name)
    sheet, results = solve_drill(d)
    _, paths = drill_trajectories(results, 0.01)
    return DrillPart(d, sheet, paths, SAFETY)


@click.command("report")
@scenario_options
@spread_options
@click.option("-o", "--out", default="report.html", show_default=True, help="The page (.html).")
@click.option(
    "--drill", "drill_name", default=None, help="Add this drill's sheet (preset or file)."
)
@click.option("--no-studies", is_flag=True, help="Leave out the main stroke's sweep and window.")
@click.option("--force", is_flag=True, help="Overwrite an existing file.")
def report(scenario, stroke_names, overrides, scatter, seed, out, drill_name, no_studies, force):
    """One self-contained HTML page for SCENARIO (default demo): the story, the comparison
    table, side and top views, the main stroke's sweep and success window, the 3D view (tap a
    path for its numbers) and, with --drill, the drill sheet. Opens offline on a phone or a
    computer, and prints on A4 or letter paper. --scatter shows scattered shots in 3D."""
    from rallyarc.feed import SAFETY
    from rallyarc.output import export
    from rallyarc.shot import play
    from rallyarc.viz.report import report_page

    path = figure_path(out, "--out", (".html",))
    export.check_targets([path], force, "--out")
    sc, strokes, incoming = load_strokes(scenario, stroke_names, overrides)
    result = play(strokes, sc.conditions, incoming)
    spread = play_shots(sc, strokes, incoming, scatter, seed) if str(scatter) != "0" else None
    try:
        sweep_part, grid = (None, None) if no_studies else _main_stroke(sc, strokes, incoming)
    except ValueError as exc:
        raise InputError(f"SCENARIO: the main stroke's sweep: {exc}") from None
    drill = _drill(drill_name) if drill_name else None
    text = report_page(
        sc, result, spread, sweep_part, grid, drill, caution=SAFETY if sc.incoming else None
    )
    written = export.write_text(path, text)
    size = path.stat().st_size
    click.echo(f"written: {written} ({size / 1e6:.2f} MB)")
