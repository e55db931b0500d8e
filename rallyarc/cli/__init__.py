"""The ``rallyarc`` command line: parses options, calls the library, prints tables or JSON.

One module per command group; :mod:`rallyarc.cli.options` holds the options and input helpers
they share. Every command is a thin layer over a documented Python call; errors in user input
are one line on stderr with exit code 2. This package is the only place that joins the library
and :mod:`rallyarc.viz`.
"""

from __future__ import annotations

import contextlib
import os
import signal
import sys
import threading

import click

from rallyarc.cli import (
    aim,
    court,
    drill,
    feed,
    plot,
    presets,
    rally,
    report,
    scene,
    scout,
    shots,
    study,
    template,
)
from rallyarc.errors import InputError

__all__ = ["main"]


class _Group(click.Group):
    """A group that turns every usage or input error into one line and exit code 2, and stops
    on SIGTERM as on Ctrl-C (temporary files removed, nothing half-written)."""

    def main(self, args=None, prog_name=None, **kwargs):
        with _sigterm_as_interrupt() as stopped:
            try:
                return super().main(args=args, prog_name=prog_name, standalone_mode=False, **kwargs)
            except click.exceptions.Exit as exc:
                sys.exit(exc.exit_code)
            except click.Abort:
                click.echo("rallyarc: " + ("terminated" if stopped else "aborted"), err=True)
                sys.exit(143 if stopped else 130)
            except click.ClickException as exc:
                click.echo(f"rallyarc: error: {exc.format_message()}", err=True)
                sys.exit(2)
            except InputError as exc:
                click.echo(f"rallyarc: error: {exc}", err=True)
                sys.exit(2)
            except OSError as exc:  # a file system refusing a write that the checks allowed
                where = f"{exc.filename}: " if exc.filename else ""
                click.echo(f"rallyarc: error: {where}{exc.strerror or exc}", err=True)
                sys.exit(2)


@contextlib.contextmanager
def _sigterm_as_interrupt():
    """While a command runs, SIGTERM raises KeyboardInterrupt as Ctrl-C does; the yielded list
    is non-empty once it came. The previous handler is put back afterwards."""
    stopped = []
    command_pid = os.getpid()

    def handler(signum, frame):
        if os.getpid() != command_pid:  # a worker process forked by the command: stop at once
            signal.signal(signum, signal.SIG_DFL)
            os.kill(os.getpid(), signum)
            return
        stopped.append(signum)
        raise KeyboardInterrupt

    if threading.current_thread() is not threading.main_thread():
        yield stopped
        return
    previous = signal.signal(signal.SIGTERM, handler)
    try:
        yield stopped
    finally:
        signal.signal(signal.SIGTERM, previous)


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
main.add_command(study.study)
main.add_command(report.report)
main.add_command(template.template)
main.add_command(scout.scout)
