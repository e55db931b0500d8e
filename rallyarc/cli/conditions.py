"""The scenario a command plays and what the user changes of it: the condition options
(presets, the receiver's plane, the physics modes) as one :class:`Overrides` value, the scenario
with them, its strokes and its incoming ball.

Everything here parses user input into library values; nothing computes physics. Heavy imports
stay inside the functions, so that ``rallyarc --help`` starts fast.
"""

from __future__ import annotations

import functools
from dataclasses import dataclass, fields

import click

from rallyarc import units
from rallyarc.cli.options import check_scenario, loaded
from rallyarc.errors import InputError

#: The court bounce of every command that bounces a ball: the compressing ball by default.
DEFORMING_BALL = click.option(
    "--deforming-ball/--rigid-ball",
    "deforming_ball",
    default=True,
    help="The court bounce: a compressing ball (the default), whose friction acts at the "
    "flattened contact below the centre, so a fast sliding ball picks up about half the "
    "spin of a rigid one, as measured on fast serves; or --rigid-ball, friction at the full "
    "radius.",
)


FRICTION_ONLY = click.option(
    "--friction-only",
    is_flag=True,
    help="Friction alone at the racket: no spring-back of the strings (tangential restitution "
    "0), to see how much of the spin friction makes by itself.",
)


@dataclass(frozen=True)
class Overrides:
    """What the user changed of a scenario's conditions: presets or files by name (None: the
    scenario's own), the receiver's plane as typed, and the physics modes."""

    ball: str | None = None
    racket: str | None = None
    air: str | None = None
    surface_name: str | None = None
    receiver_plane: str | None = None
    friction_only: bool = False
    deforming_ball: bool = True


_OVERRIDE_KEYS = tuple(f.name for f in fields(Overrides))


def condition_options(func):
    """--ball, --racket, --air, --surface, --receiver-plane, --friction-only and
    --deforming-ball/--rigid-ball: overrides of a scenario, given to the command as one
    ``overrides`` argument (:class:`Overrides`)."""

    @functools.wraps(func)
    def command(*args, **kwargs):
        overrides = Overrides(**{key: kwargs.pop(key) for key in _OVERRIDE_KEYS})
        return func(*args, overrides=overrides, **kwargs)

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
            FRICTION_ONLY,
            DEFORMING_BALL,
        ]
    ):
        command = opt(command)
    return command


def scenario_with(scenario, overrides=None, option="--scenario"):
    """The scenario with any condition the user overrides (:class:`Overrides`); errors name
    the option."""
    from dataclasses import replace

    from rallyarc import domain

    o = Overrides() if overrides is None else overrides
    sc = loaded(option, domain.load_scenario, scenario)
    changes = {}
    if o.ball is not None:
        changes["ball"] = loaded("--ball", domain.load_ball, o.ball)
    if o.racket is not None:
        changes["racket"] = loaded("--racket", domain.load_racket, o.racket)
    if o.air is not None:
        changes["air"] = loaded("--air", domain.load_air, o.air)
    if o.surface_name is not None:
        changes["surface"] = loaded("--surface", domain.load_surface, o.surface_name)
        changes["surface_name"] = o.surface_name
    if o.receiver_plane is not None:
        changes["receiver_plane_m"] = units.number(o.receiver_plane, "--receiver-plane", 0.0, 10.0)
    c = sc.conditions
    if o.friction_only != c.friction_only:
        changes["friction_only"] = o.friction_only
    if o.deforming_ball != c.deforming_ball:
        changes["deforming_ball"] = o.deforming_ball
    sc = replace(sc, conditions=replace(c, **changes)) if changes else sc
    check_scenario(sc, option)
    return sc


def ball_state(incoming):
    """The BallState of an ``[incoming]`` table (user units)."""
    from rallyarc import domain
    from rallyarc.shot import BallState

    return BallState.of(*domain.incoming_state(incoming))


def incoming_ball(sc):
    """The scenario's incoming ball, or None (serves only)."""
    return ball_state(sc.incoming) if sc.incoming else None


def incoming_table(sc):
    """A copy of the scenario's ``[incoming]`` table, which a groundstroke needs."""
    if sc.incoming is None:
        raise InputError(f"--scenario: {sc.where} has no [incoming] ball for a groundstroke")
    return dict(sc.incoming)


def scenario_options(func):
    """SCENARIO argument, --stroke and the condition overrides shared by the figure commands."""
    func = condition_options(func)
    func = click.option(
        "--stroke",
        "stroke_names",
        multiple=True,
        help="Only these strokes of the scenario (repeat the option); default: all.",
    )(func)
    return click.argument("scenario", default="demo")(func)


def load_strokes(scenario, stroke_names, overrides):
    """The scenario with its overrides, the strokes chosen by name (default: all) and the
    incoming ball."""
    sc = scenario_with(scenario, overrides, "SCENARIO")
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
    return sc, strokes, incoming_ball(sc)
