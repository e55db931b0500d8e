"""The ``rallyarc`` command line: parses options, calls the library, prints tables or JSON.

One module per command group; :mod:`rallyarc.cli.options` holds the options and input helpers
they share. Every command is a thin layer over a documented Python call; errors in user input
are one line on stderr with exit code 2. This package is the only place that joins the library
and :mod:`rallyarc.viz`.
"""

from __future__ import annotations

import sys

import click

from rallyarc.cli import aim, court, drill, feed, plot, presets, rally, scene, shots
from rallyarc.errors import InputError

__all__ = ["main"]


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


for _command in (
    feed.feed,
    court.surface,
    court.bounce,
    shots.shot,
    shots.compare,
    presets.presets,
    aim.aim,
    drill.drill,
    plot.plot,
    scene.scene,
    rally.rally,
):
    main.add_command(_command)
