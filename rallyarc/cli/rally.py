"""``rallyarc rally``: a pattern pair played out over many rallies.

The command only parses options and calls :func:`rallyarc.rally.play_rallies` and
:func:`rallyarc.rally.summarize`; the tables, summary and figures go into ``--out``.
"""

from __future__ import annotations

import os
import sys

import click

from rallyarc.cli.conditions import (
    DEFORMING_BALL,
    FRICTION_ONLY,
)
from rallyarc.cli.options import (
    force_option,
    json_option,
    loaded,
    output_folder,
    whole,
    write_folder,
)

#: Files the command writes into --out.
OUTPUTS = (
    "shots.csv",
    "shots.parquet",
    "rallies.csv",
    "summary.json",
    "landing_heatmaps.png",
    "contact_heights.png",
    "spin_exchange.png",
)
MAX_RALLIES = 200_000
#: Rallies a worker plays per second, about (the demo patterns on the two-core machine:
#: benchmarks/rally.py played 10,000 in 2.6 s in one process and 1.6 s on two, with the
#: compiled kernels loaded); runs of at least LONG_RUN rallies start with an estimate of their
#: duration.
RALLIES_PER_WORKER_S = 3500.0
LONG_RUN = 20_000


@click.command("rally")
@click.argument("patterns", default="demo_match")
@click.option(
    "--rallies", default="10000", show_default=True, help="Rallies to play (1 to 200000)."
)
@click.option("--seed", default="0", show_default=True, help="Random seed (0 to 2^32 - 1).")
@click.option(
    "--max-shots", default=None, help="Longest rally in shots (1 to 200; default: the file's)."
)
@click.option("--out", "out_dir", default=None, help="Write tables, summary and figures here.")
@force_option("Overwrite existing files in --out.")
@click.option(
    "--workers",
    default="auto",
    show_default=True,
    help="Processes (1 to 64, or auto: one per core); the tables do not depend on it.",
)
@click.option("--quiet", is_flag=True, help="No progress bar.")
@FRICTION_ONLY
@DEFORMING_BALL
@json_option("Print the summary as JSON.")
def rally(
    patterns,
    rallies,
    seed,
    max_shots,
    out_dir,
    force,
    workers,
    quiet,
    friction_only,
    deforming_ball,
    as_json,
):
    """Play a pattern pair (a preset name or a TOML file) over many rallies with execution
    scatter: per-shot table, summary and figures."""
    from rallyarc.rally import load_patterns, play_rallies, summarize, summary_lines, with_modes

    n = whole(rallies, "--rallies", 1, MAX_RALLIES)
    s = whole(seed, "--seed", 0, 2**32 - 1)
    limit = None if max_shots is None else whole(max_shots, "--max-shots", 1, 200)
    procs = (os.cpu_count() or 1) if workers == "auto" else whole(workers, "--workers", 1, 64)
    pat = with_modes(loaded("PATTERNS", load_patterns, patterns), friction_only, deforming_ball)
    folder = output_folder(out_dir, OUTPUTS, force)
    progress = not quiet and not as_json and sys.stderr.isatty()
    if n >= LONG_RUN and not quiet:
        click.echo(_estimate(n, procs), err=True)
    run = play_rallies(pat, n=n, seed=s, max_shots=limit, progress=progress, workers=procs)
    summary = summarize(run)
    lines = summary_lines(summary)
    if folder is not None:
        written = write_folder(folder, lambda f: write_outputs(run, summary, f))
        lines.append("written: " + ", ".join(str(p) for p in written))
    if as_json:
        from rallyarc.output.jsonsafe import dumps

        click.echo(dumps(summary))
    else:
        click.echo("\n".join(lines))


def _estimate(n, procs):
    """One line: about how long ``n`` rallies take on ``procs`` workers."""
    workers = max(1, min(procs, os.cpu_count() or 1))
    seconds = n / (RALLIES_PER_WORKER_S * workers)
    took = f"{seconds / 60.0:.0f} min" if seconds >= 120 else f"{max(seconds, 1.0):.0f} s"
    return (
        f"rallyarc: {n} rallies on {workers} worker(s): about {took} at about "
        f"{RALLIES_PER_WORKER_S:.0f} rallies/s per worker (the first run after an install "
        "compiles the rally kernels first, about 25 s); the progress bar (on a terminal) "
        "shows the time remaining"
    )


def write_outputs(run, summary, folder):
    """Write the tables, the summary and the figures of a run into ``folder`` (atomic writes);
    returns the paths written."""
    from rallyarc.output import export
    from rallyarc.viz import rally_plots

    figures = {
        "landing_heatmaps.png": rally_plots.landing_heatmaps(run.shots, summary),
        "contact_heights.png": rally_plots.contact_height_histograms(run.shots, summary),
        "spin_exchange.png": rally_plots.spin_exchange(run.shots, summary),
    }
    written = [
        export.write_frame(folder / "shots.csv", run.shots),
        export.write_frame(folder / "shots.parquet", run.shots),
        export.write_frame(folder / "rallies.csv", run.rallies),
        export.write_json(folder / "summary.json", summary),
    ]
    for name, fig in figures.items():
        written.append(rally_plots.save_figure(fig, folder / name))
    return written
