"""The fitted pattern file and the fit report: the pattern file's own text with the fitted
player's scatter SDs replaced and a commented header of the fit, and the report as text
lines (each statistic observed against simulated, with its 95 % Wilson interval)."""

from __future__ import annotations

import re
from pathlib import Path

from rallyarc import config
from rallyarc.errors import InputError
from rallyarc.rally.text import with_interval


def pattern_text(name_or_path):
    """The text of a pattern file: a preset name (``configs/patterns/``) or a TOML path."""
    text = str(name_or_path)
    if text.endswith(".toml") or "/" in text:
        return config.decode(Path(text))
    from importlib import resources

    return resources.files("rallyarc.configs").joinpath("patterns", f"{text}.toml").read_text()


def with_fitted_scatter(text, end, sds):
    """``text`` with the ``[end.scatter]`` table's SDs replaced by ``sds`` (key -> value)."""
    lines = text.splitlines(keepends=True)
    header = re.compile(rf"^\s*\[\s*{end}\.scatter\s*\]")
    try:
        start = next(i for i, line in enumerate(lines) if header.match(line))
    except StopIteration:
        raise InputError(f"pattern file: no [{end}.scatter] table to replace") from None
    done = set()
    for i in range(start + 1, len(lines)):
        if lines[i].lstrip().startswith("["):
            break
        m = re.match(r"^(\s*)([A-Za-z_]+)(\s*=\s*)[^#\n]*?(\s*#.*)?(\r?\n)?$", lines[i])
        if m and m.group(2) in sds:
            key = m.group(2)
            lines[i] = (
                f"{m.group(1)}{key}{m.group(3)}{sds[key]:.4g}{m.group(4) or ''}{m.group(5) or ''}"
            )
            done.add(key)
    missing = set(sds) - done
    if missing:
        raise InputError(f"pattern file: [{end}.scatter] lacks " + ", ".join(sorted(missing)))
    return "".join(lines)


def fit_lines(fit):
    """The fit report as text lines."""
    if fit["standard_error"] is None:
        interval = "interval unknown: the statistics do not change with the scatter"
    else:
        interval = f"95 % interval {fit['low']:.2f}-{fit['high']:.2f}"
    lines = [
        f"fitted scatter of {fit['player']} ({fit['end']}): x{fit['scatter_factor']:.2f} the "
        f"pattern file's ({interval}); {fit['rallies']} rallies, seed {fit['seed']}, "
        f"chi2 {fit['chi2']:.2f} over {len(fit['statistics'])} statistics, "
        f"{fit['evaluations']} runs on common random numbers",
        f"{'statistic':<36} {'observed (95 % interval)':>26} {'simulated (95 % interval)':>26}",
    ]
    for key, s in fit["statistics"].items():
        mark = "" if s["overlap"] else "  intervals apart"
        lines.append(
            f"{key.replace('_', ' '):<36} {with_interval(s['observed']):>26} "
            f"{with_interval(s['simulated']):>26}{mark}"
        )
    return lines


def fitted_text(text, fit, sds, observed_where, patterns_where):
    """The fitted pattern file: a commented header with the fit report, then ``text`` with
    the fitted player's scatter SDs replaced."""
    head = [
        f"# Fitted by `rallyarc scout fit` from {patterns_where} and the observed statistics in",
        f"# {observed_where}: the scatter SDs of [{fit['end']}.scatter] are the fitted ones.",
        *("# " + line for line in fit_lines(fit)),
        "",
    ]
    return "\n".join(head) + "\n" + with_fitted_scatter(text, fit["end"], sds)
