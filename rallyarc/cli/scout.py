"""``rallyarc scout``: what-if comparisons of rally pattern variants.

``rallyarc scout compare BASE VARIANT...`` plays the pattern files on common random numbers
(:func:`rallyarc.rally.whatif.compare`) and prints each variant's difference from the base in
points won and point endings, with its 95 % interval; ``--out`` writes the comparison as JSON
and a figure.
"""

from __future__ import annotations

import os

import click

from rallyarc.cli.options import (
    force_option,
    json_option,
    loaded,
    output_folder,
    whole,
    write_folder,
)

#: Files ``scout compare`` writes into --out.
COMPARE_OUTPUTS = ("comparison.json", "comparison.png")


@click.group("scout")
def scout():
    """Scouting with rally patterns: what-if comparisons of pattern variants."""


@scout.command("compare")
@click.argument("base")
@click.argument("variants", nargs=-1, required=True)
@click.option("--rallies", default="2000", show_default=True, help="Rallies (1 to 200000).")
@click.option("--seed", default="0", show_default=True, help="Random seed (0 to 2^32 - 1).")
@click.option("--workers", default="auto", show_default=True, help="Processes (1 to 64, or auto).")
@click.option("--out", "out_dir", default=None, help="Write comparison.json and the figure here.")
@force_option("Overwrite existing files in --out.")
@json_option("Print the comparison as JSON.")
def compare(base, variants, rallies, seed, workers, out_dir, force, as_json):
    """Play BASE and each VARIANT (preset names or TOML files) on common random numbers and
    report the differences from BASE with 95 % intervals."""
    from rallyarc.rally import load_patterns
    from rallyarc.rally.whatif import compare as run_compare
    from rallyarc.rally.whatif import comparison_lines

    n = whole(rallies, "--rallies", 1, 200_000)
    s = whole(seed, "--seed", 0, 2**32 - 1)
    procs = (os.cpu_count() or 1) if workers == "auto" else whole(workers, "--workers", 1, 64)
    pats = [loaded("BASE", load_patterns, base)]
    pats += [loaded("VARIANTS", load_patterns, v) for v in variants]
    labels = [base, *variants]
    folder = output_folder(out_dir, COMPARE_OUTPUTS, force)
    out = run_compare(pats, n=n, seed=s, workers=procs, labels=labels)
    lines = comparison_lines(out)
    if folder is not None:
        written = write_folder(folder, lambda f: _write(out, f))
        lines.append("written: " + ", ".join(str(p) for p in written))
    if as_json:
        from rallyarc.output.jsonsafe import dumps

        click.echo(dumps(out))
    else:
        click.echo("\n".join(lines))


def _write(comparison, folder):
    from rallyarc.output import export
    from rallyarc.viz import rally_plots

    fig = rally_plots.whatif_differences(comparison)
    return [
        export.write_json(folder / "comparison.json", comparison),
        rally_plots.save_figure(fig, folder / "comparison.png"),
    ]
