"""``rallyarc template``: write a commented file to start from (a rally pattern pair, or a
scenario), a copy of the demo preset with a header saying what to change."""

from __future__ import annotations

import click

from rallyarc.cli.options import force_option
from rallyarc.errors import InputError

#: kind -> (preset folder, demo preset, what the file is, the command that plays it)
KINDS = {
    "pattern": ("patterns", "demo_match", "a rally pattern pair", "rallyarc rally {path}"),
    "scenario": ("scenarios", "demo", "a scenario", "rallyarc compare {path}"),
}

_HEADER = """\
# {what} to start from: a copy of the demo preset {demo!r}, written by `rallyarc template`.
# Change the names, the players or strokes and the numbers below, then play it with:
#     {command}
# Every key is explained in the comments of the file and in README.md; preset names (balls,
# rackets, air, surfaces, strokes) are those `rallyarc presets` lists, or your own TOML files.
# The players, club and values of the demo are invented.

"""


def template_text(kind):
    """The commented starting file of ``kind`` (``pattern`` or ``scenario``); the command that
    plays it shows ``{path}``."""
    from importlib import resources

    folder, demo, what, command = KINDS[kind]
    body = resources.files("rallyarc.configs").joinpath(folder, f"{demo}.toml").read_text()
    return _HEADER.format(what=what.capitalize(), demo=demo, command=command) + body


@click.command()
@click.argument("path")
@click.option(
    "--kind",
    type=click.Choice(sorted(KINDS)),
    default="pattern",
    show_default=True,
    help="pattern: two players for `rallyarc rally`; scenario: strokes for `rallyarc compare`.",
)
@force_option()
def template(path, kind, force):
    """Write a commented TOML file to start from (default: a rally pattern pair), e.g.
    `rallyarc template my_match.toml` and then `rallyarc rally my_match.toml`."""
    from pathlib import Path

    from rallyarc.output import export

    target = Path(path)
    if target.suffix.lower() != ".toml":
        raise InputError(f"PATH: {target} must end in .toml")
    export.check_targets([target], force, "PATH")
    text = template_text(kind).replace("{path}", str(target))
    export.write_text(target, text)
    click.echo(
        f"written: {target} ({KINDS[kind][2]}); play it with: " + KINDS[kind][3].format(path=target)
    )
