"""``rallyarc scout``: what-if comparisons of rally pattern variants, and patterns fitted to
observed statistics.

``rallyarc scout compare BASE VARIANT...`` plays the pattern files on common random numbers
(:func:`rallyarc.rally.whatif.compare`) and prints each variant's difference from the base in
points won and point endings, with its 95 % interval; ``--out`` writes the comparison as JSON
and a figure.

``rallyarc scout fit PATTERNS OBSERVED.toml -o FITTED.toml`` fits the observed player's
execution scatter (:func:`rallyarc.rally.fit.fit_scatter`) and writes the fitted pattern file
with the fit report in its header; the report is printed too.
"""

from __future__ import annotations

import os

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

#: Files ``scout compare`` writes into --out.
COMPARE_OUTPUTS = ("comparison.json", "comparison.png")


@click.group("scout")
def scout():
    """Scouting with rally patterns: what-if comparisons of pattern variants, and a player's
    scatter fitted to observed statistics."""


@scout.command("compare")
@click.argument("base")
@click.argument("variants", nargs=-1, required=True)
@click.option("--rallies", default="2000", show_default=True, help="Rallies (1 to 200000).")
@click.option("--seed", default="0", show_default=True, help="Random seed (0 to 2^32 - 1).")
@click.option("--workers", default="auto", show_default=True, help="Processes (1 to 64, or auto).")
@click.option("--out", "out_dir", default=None, help="Write comparison.json and the figure here.")
@force_option("Overwrite existing files in --out.")
@FRICTION_ONLY
@DEFORMING_BALL
@json_option("Print the comparison as JSON.")
def compare(
    base, variants, rallies, seed, workers, out_dir, force, friction_only, deforming_ball, as_json
):
    """Play BASE and each VARIANT (preset names or TOML files) on common random numbers and
    report the differences from BASE with 95 % intervals (every one in the same physics
    modes)."""
    from rallyarc.rally import load_patterns, with_modes
    from rallyarc.rally.whatif import compare as run_compare
    from rallyarc.rally.whatif import comparison_lines

    n = whole(rallies, "--rallies", 1, 200_000)
    s = whole(seed, "--seed", 0, 2**32 - 1)
    procs = (os.cpu_count() or 1) if workers == "auto" else whole(workers, "--workers", 1, 64)
    pats = [loaded("BASE", load_patterns, base)]
    pats += [loaded("VARIANTS", load_patterns, v) for v in variants]
    pats = [with_modes(p, friction_only, deforming_ball) for p in pats]
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


@scout.command("fit")
@click.argument("patterns")
@click.argument("observed")
@click.option("-o", "--out", "out_path", required=True, help="The fitted pattern file (.toml).")
@click.option("--rallies", default="400", show_default=True, help="Rallies a run (1 to 20000).")
@click.option("--seed", default="0", show_default=True, help="Random seed (0 to 2^32 - 1).")
@click.option("--workers", default="1", show_default=True, help="Processes (1 to 64, or auto).")
@click.option(
    "--tolerance",
    default="0.02",
    show_default=True,
    help="Relative tolerance of the search on the scatter factor (0.001 to 0.5).",
)
@force_option("Overwrite an existing --out file.")
@json_option("Print the fit as JSON.")
def fit(patterns, observed, out_path, rallies, seed, workers, tolerance, force, as_json):
    """Fit the execution scatter of the player that OBSERVED (a TOML file of counts) describes,
    in PATTERNS (a preset name or TOML file), and write the fitted pattern file."""
    from pathlib import Path

    from rallyarc.errors import InputError
    from rallyarc.output import export
    from rallyarc.rally import load_patterns
    from rallyarc.rally.fit import fit_scatter, fitted_sds, load_observed
    from rallyarc.rally.fitfile import fit_lines, fitted_text, pattern_text
    from rallyarc.units import number

    n = whole(rallies, "--rallies", 1, 20_000)
    s = whole(seed, "--seed", 0, 2**32 - 1)
    procs = (os.cpu_count() or 1) if workers == "auto" else whole(workers, "--workers", 1, 64)
    tol = number(tolerance, "--tolerance", 0.001, 0.5)
    target = Path(out_path)
    if target.suffix.lower() != ".toml":
        raise InputError(f"--out: {target} must end in .toml")
    export.check_targets([target], force, "--out")
    pats = loaded("PATTERNS", load_patterns, patterns)
    obs = loaded("OBSERVED", load_observed, observed)
    out = fit_scatter(pats, obs, n=n, seed=s, workers=procs, xatol=tol)
    sds = fitted_sds(pats, out["end"], out["scatter_factor"])
    text = fitted_text(pattern_text(patterns), out, sds, obs["where"], pats.where)
    loaded("--out", lambda t: _check_loads(t, target), text)
    export.write_text(target, text)
    if as_json:
        from rallyarc.output.jsonsafe import dumps

        click.echo(dumps(out | {"fitted_scatter": sds, "written": str(target)}))
    else:
        click.echo("\n".join([*fit_lines(out), f"written: {target}"]))


def _check_loads(text, target):
    """The fitted text loads as a pattern file (checked in a scratch copy next to ``target``)."""
    import tempfile

    from rallyarc.rally import load_patterns

    with tempfile.TemporaryDirectory() as tmp:
        path = f"{tmp}/{target.name}"
        with open(path, "w", encoding="utf-8") as f:
            f.write(text)
        return load_patterns(path)
