"""``rallyarc study``: large parameter studies and rally-pattern studies in chunks, on a Dask
cluster or the local cores, streamed to a partitioned Parquet dataset.

``study run`` plays a study file into a dataset folder (resuming the same study's folder);
``study summary`` reads a dataset's per-parameter summaries and draws its main effects. The
command only parses options and calls :func:`rallyarc.study.run_study` and
:func:`rallyarc.study.summary.summarize_study`.
"""

from __future__ import annotations

import re
import sys

import click

from rallyarc.cli.options import figure_path, force_option, json_option, loaded, whole
from rallyarc.errors import InputError

#: A scheduler address: ``HOST:PORT`` with an optional ``tcp://``, ``tls://`` or ``ws://``.
ADDRESS = re.compile(r"^((tcp|tls|ws|wss)://)?[A-Za-z0-9_.\-\[\]:]+:\d{1,5}$")


def scheduler_address(text, option="--scheduler"):
    """A Dask scheduler address, or a one-line error naming ``option``."""
    if text is None:
        return None
    if not ADDRESS.match(text):
        raise InputError(f"{option}: expected an address such as tcp://HOST:8786, got {text!r}")
    return text


@click.group("study")
def study():
    """Large studies: a stroke's parameters or a pattern pair's variants over ranges, in chunks
    on a Dask cluster or every local core, written to a Parquet dataset."""


@study.command("run")
@click.argument("study_file")
@click.option(
    "--out", "out_dir", required=True, help="Dataset folder (resumed if it holds this study)."
)
@click.option(
    "--scheduler",
    default=None,
    help="Address of a running Dask scheduler (default: the file's key, else local processes).",
)
@click.option(
    "--workers",
    default="auto",
    show_default=True,
    help="Local processes (1 to 256, or auto: one per core); results do not depend on it.",
)
@force_option("Replace another study's results (or other files) in --out.")
@click.option("--quiet", is_flag=True, help="No progress bar.")
def run(study_file, out_dir, scheduler, workers, force, quiet):
    """Play STUDY_FILE (a preset name or a TOML file) into the dataset folder --out."""
    from rallyarc.study import load_study, run_study

    procs = None if workers == "auto" else whole(workers, "--workers", 1, 256)
    spec = loaded("STUDY_FILE", load_study, study_file)
    address = scheduler_address(scheduler) or scheduler_address(spec.scheduler, "key 'scheduler'")
    result = run_study(
        spec,
        out_dir,
        scheduler=address,
        workers=procs,
        force=force,
        progress=not quiet and sys.stderr.isatty(),
        announce=lambda line: click.echo(line, err=True),
    )
    rate = result.rows / result.seconds if result.seconds > 0 else 0.0
    click.echo(
        f"{spec.name}: {len(result.played)} chunks played, {result.skipped} already done, "
        f"{spec.n_chunks} in all; {result.rows} rows in {result.seconds:.1f} s "
        f"({rate:,.0f} rows/s); dataset {out_dir}"
    )


@study.command("summary")
@click.argument("folder")
@click.option("--figure", default=None, help="Main-effects figure (.png, .pdf or .svg).")
@force_option("Overwrite an existing figure.")
@json_option("Print the summaries as JSON.")
def summary(folder, figure, force, as_json):
    """Per-parameter summaries of a study dataset FOLDER: outcome shares, depth and apex."""
    from rallyarc.output.export import check_targets
    from rallyarc.study.summary import summarize_study, summary_lines

    target = None
    if figure is not None:
        target = figure_path(figure, "--figure")
        check_targets([target], force, "--figure")
    result = summarize_study(folder)
    if as_json:
        from rallyarc.output.jsonsafe import dumps

        click.echo(dumps(result))
    else:
        click.echo("\n".join(summary_lines(result)))
    if target is not None:
        from rallyarc.cli.options import save_figure
        from rallyarc.viz.study_plots import main_effects

        save_figure(main_effects(result), target)
        if not as_json:
            click.echo(f"written: {target}")
