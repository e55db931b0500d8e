"""Options and input helpers shared by the commands: whole numbers and points, presets and files
loaded with one-line errors, output files and folders, and printing a table or JSON (the
scenario and its condition overrides are :mod:`rallyarc.cli.conditions`).

Everything here parses user input into library values, or prints; nothing computes physics.
Heavy imports (the library's solvers, pandas, matplotlib) stay inside the functions, so that
``rallyarc --help`` starts fast.
"""

from __future__ import annotations

import math
import re
from pathlib import Path

import click

from rallyarc import units
from rallyarc.errors import InputError

SCENARIO_HELP = "Scenario preset or TOML file: conditions and incoming ball."
FIGURE_SUFFIXES = (".png", ".pdf", ".svg")


def emit(data, as_json, lines):
    """Print ``data`` as indented strict JSON (non-finite numbers as null), or the text
    ``lines`` (any non-finite number left in them shown as ``n/a``)."""
    if as_json:
        from rallyarc.output.jsonsafe import dumps

        click.echo(dumps(data))
    else:
        for line in lines:
            click.echo(_NOT_FINITE.sub("n/a", line))


#: A number printed as nan or inf, not part of a word.
_NOT_FINITE = re.compile(r"(?<![A-Za-z])[+-]?(?:nan|inf)(?![A-Za-z])")


def number_text(value, fmt, missing="n/a"):
    """``value`` formatted with ``fmt`` (such as ``"{:+.2f}"``), or ``missing`` when it is None
    or not finite."""
    if value is None or not math.isfinite(value):
        return missing
    return fmt.format(value)


def json_option(help="Print a JSON object."):
    return click.option("--json", "as_json", is_flag=True, help=help)


def dt_option(func):
    return click.option(
        "--dt", default="0.005", show_default=True, help="Trajectory time step [s]."
    )(func)


def time_step(dt):
    """The ``--dt`` value [s]."""
    return units.number(dt, "--dt", 0.0005, 0.1)


def force_option(help="Overwrite an existing output file."):
    return click.option("--force", is_flag=True, help=help)


def whole(text, option, low, high):
    """A whole number within ``[low, high]``; the error names the option and the range."""
    try:
        value = int(str(text))
    except ValueError:
        raise InputError(f"{option}: expected a whole number, got {text!r}") from None
    if not low <= value <= high:
        raise InputError(f"{option}: must be a whole number from {low} to {high}, got {text}")
    return value


def direction(text, option, low=-1e3, high=1e3):
    """A direction ``X,Y,Z`` of any length (as given) that :func:`rallyarc.kinematics.unit`
    can normalise; the zero vector is refused naming the option."""
    from rallyarc.kinematics import unit

    vector = units.point(text, option, low, high)
    try:
        unit(vector, option)
        return vector
    except ValueError as exc:
        reason = exc.args[0].removeprefix(option + " ")
        raise InputError(f"{option}: {reason}, got {text!r}") from None


def warn(message):
    """One line on stderr for a value that is allowed but unusual."""
    click.echo(f"rallyarc: warning: {message}", err=True)


def check_ball_point(point, label, radius, singles=True):
    """Refuse a ball centre ``point`` (X, Y, Z) [m] below the court, beyond a player's reach
    (:data:`rallyarc.config.HIGHEST_CONTACT_M`) or inside the net; warn in one line above
    :data:`rallyarc.config.UNUSUAL_CONTACT_M`. ``label`` names the option or file key."""
    from rallyarc import config, court

    x, y, z = (float(c) for c in point)
    top = config.HIGHEST_CONTACT_M
    if not radius <= z <= top:
        where = "below the court" if z < radius else "beyond a player's reach"
        raise InputError(
            f"{label}: the height Z must be from the ball's radius {radius:.4g} m (resting on the "
            f"court) to {top:g} m (the highest a player reaches), got {z:g} m, {where}"
        )
    net = float(court.net_height(y, singles))
    if abs(x) < radius and z < net + radius:
        raise InputError(
            f"{label}: a ball at X {x:g} m, Z {z:g} m is inside the net; X must be at least "
            f"{radius:.3g} m from the net (either side) or Z above {net + radius:.3f} m"
        )
    if z > config.UNUSUAL_CONTACT_M:
        warn(
            f"{label}: a height of {z:g} m is above {config.UNUSUAL_CONTACT_M:g} m, which only "
            "tall players reach, jumping"
        )


def check_scenario(sc, option):
    """The scenario's incoming ball and its serves' contact points, checked against the court,
    the net and a player's reach with the scenario's own ball."""
    r = sc.conditions.ball.radius
    if sc.incoming:
        check_ball_point(
            sc.incoming["position_m"], f"{option}: {sc.where}: key 'incoming.position_m'", r
        )
    for st in sc.strokes:
        check_stroke_fits(st, sc.conditions, f"{option}: stroke {st.name!r}")
        if st.toss is not None:
            check_ball_point(
                st.toss.contact, f"{option}: stroke {st.name!r}: key 'toss.contact_m'", r
            )


def check_stroke_fits(stroke, conditions, label):
    """A stroke's impact point must lie on the racket it is played with."""
    length = conditions.racket.racket.length_m
    if not stroke.impact_from_butt < length:
        raise InputError(
            f"{label}: key 'impact_from_butt_m' must be less than the racket's length_m "
            f"{length:g} m ({conditions.racket.name}), got {stroke.impact_from_butt:g} m"
        )


def court_point(text, option="--target"):
    """A point ``X,Y`` on the court [m]."""
    parts = str(text).split(",")
    if len(parts) != 2:
        raise InputError(f"{option}: expected a landing point X,Y in metres, got {text!r}")
    return tuple(units.number(p.strip(), option, -15.0, 15.0) for p in parts)


def figure_path(text, option="--out", suffixes=FIGURE_SUFFIXES):
    """An output file path with one of ``suffixes`` that is not a folder."""
    path = Path(text)
    if path.suffix.lower() not in suffixes:
        raise InputError(f"{option}: {path} must end in {', '.join(suffixes)}")
    if path.is_dir():
        raise InputError(f"{option}: {path} is a folder, not a file")
    return path


def output_folder(out_dir, names, force):
    """The ``--out`` folder (or None), refused before any work if it is a file, cannot be
    written, or would overwrite any of ``names`` without ``force``. Write it with
    :func:`write_folder`, which replaces it as a whole."""
    from rallyarc.output import export

    if out_dir is None:
        return None
    folder = Path(out_dir)
    if folder.exists() and not folder.is_dir():
        raise InputError(f"--out: {folder} is a file, not a folder")
    export.check_writable(folder.parent if str(folder.parent) else Path("."), "--out")
    export.check_targets([folder / n for n in names], force)
    return folder


def write_folder(folder, write):
    """Write the whole ``--out`` folder with ``write(staging)``; see
    :func:`rallyarc.output.export.write_folder`."""
    from rallyarc.output import export

    return export.write_folder(folder, write)


TABLE_SUFFIXES = (".csv", ".parquet")


def check_file(path, force, option="--csv", suffixes=TABLE_SUFFIXES):
    """Refuse, before any work, an output table file with another suffix, one that cannot be
    written, or an existing one without ``force``."""
    from rallyarc.output import export

    if path is not None:
        if Path(path).suffix.lower() not in suffixes:
            raise InputError(f"{option}: {path} must end in {', '.join(suffixes)}")
        export.check_targets([path], force, option)


# ----------------------------------------------------------------------------- conditions


def loaded(option, loader, value):
    """``loader(value)``; an error in the preset or file is prefixed with ``option``, the
    option (or argument) the user gave it with."""
    try:
        return loader(value)
    except InputError as exc:
        raise InputError(f"{option}: {exc}") from None


# ----------------------------------------------------------------------------- figures and scenes


#: Most scattered shots per stroke a figure takes (each finishes within seconds on two cores).
MOST_SCATTER = 2000


def spread_options_up_to(most):
    """--scatter (0 to ``most``) and --seed: shots with a player's execution scatter."""

    def deco(func):
        func = click.option("--seed", default="0", show_default=True, help="Seed of the scatter.")(
            func
        )
        return click.option(
            "--scatter",
            default="0",
            show_default=True,
            help=f"Shots per stroke with a player's execution scatter, 0 to {most} (0: one each).",
        )(func)

    return deco


spread_options = spread_options_up_to(MOST_SCATTER)


def figure_output_option(default):
    """--out (a figure file) and --force."""

    def deco(func):
        func = click.option("--force", is_flag=True, help="Overwrite an existing file.")(func)
        return click.option(
            "--out", default=default, show_default=True, help="Figure file: .png, .pdf or .svg."
        )(func)

    return deco


def play_shots(sc, strokes, incoming, scatter, seed, most=MOST_SCATTER):
    """One shot per stroke, or ``--scatter`` scattered shots per stroke (at most ``most``)."""
    from rallyarc import sweep
    from rallyarc.shot import play

    n = int(units.number(scatter, "--scatter", 0, most))
    if n != float(scatter):
        raise InputError(f"--scatter: expected a whole number from 0 to {most}, got {scatter}")
    if n == 0:
        return play(strokes, sc.conditions, incoming)
    s = int(units.number(seed, "--seed", 0, 2**32 - 1))
    return sweep.dispersion(strokes, sc.conditions, incoming, n, seed=s)


def save_figure(fig, path):
    """Write a matplotlib figure atomically, then free it."""
    from rallyarc.viz import plots

    try:
        return plots.save_figure(fig, path)
    finally:
        fig.clear()
