"""What-if comparison: pattern variants played on common random numbers, their differences
from the base with 95 % intervals.

Every variant is played with the same seed and block size as the base, so rally ``i`` of each
variant meets the same random numbers round by round (:class:`rallyarc.rally.state.Draws`):
the differences between variants come from the plans, not from luck. For each rally-level
indicator (the near or far player wins the point; the point ends in a winner, a forced error,
an unforced error or a double fault) the difference is the paired mean difference over
rallies, with the 95 % interval ``mean +/- 1.96 sd / sqrt(n)`` of the paired differences
(rallies unfinished in either run left out). Pairing removes the variance the variants share,
so the interval is narrower than the two runs' separate intervals suggest, and it shrinks as
``1 / sqrt(n)``. Each variant's own match statistics come with their Wilson intervals too.
"""

from __future__ import annotations

import math

import numpy as np

from rallyarc.output.jsonsafe import json_ready
from rallyarc.rally.runner import play_rallies
from rallyarc.rally.stats import Z95, match_statistics, share
from rallyarc.rally.text import modes_text, with_interval

#: Rally-level indicators compared between variants.
INDICATORS = ("near_wins", "far_wins", "winners", "forced_errors", "unforced_errors")


def _indicators(run):
    """Rally-level 0/1 indicators (n,) of a run, and which rallies finished."""
    r = run.rallies
    names = [p.name for p in run.patterns.players]
    ending = r["ending"].to_numpy()
    return {
        "near_wins": (r["winner"] == names[0]).to_numpy(float),
        "far_wins": (r["winner"] == names[1]).to_numpy(float),
        "winners": np.isin(ending, ("winner", "ace")).astype(float),
        "forced_errors": (ending == "forced_error").astype(float),
        "unforced_errors": (ending == "unforced_error").astype(float),
    }, ending != "unfinished"


def paired_difference(a, b):
    """Mean of the paired differences ``b - a`` (n,) with its 95 % interval."""
    d = np.asarray(b, float) - np.asarray(a, float)
    n = d.size
    if n == 0:
        return {"difference": None, "low": None, "high": None, "rallies": 0}
    mean = float(d.mean())
    half = Z95 * float(d.std(ddof=1)) / math.sqrt(n) if n > 1 else math.inf
    return {"difference": mean, "low": mean - half, "high": mean + half, "rallies": int(n)}


def compare(variants, n=2000, seed=0, max_shots=None, workers=1, labels=None):
    """Play pattern variants (the first is the base) on common random numbers.

    Returns a JSON-ready dict: each variant's label, points won and match statistics, and each
    later variant's paired differences from the base (:data:`INDICATORS`) with intervals.
    """
    labels = list(labels or [v.name for v in variants])
    runs = [play_rallies(v, n=n, seed=seed, max_shots=max_shots, workers=workers) for v in variants]
    base_ind, base_done = _indicators(runs[0])
    modes = list(variants[0].players[0].conditions.modes)
    out = {"rallies": int(n), "seed": int(seed), "base": labels[0], "modes": modes, "variants": []}
    for label, run in zip(labels, runs, strict=True):
        ind, done = _indicators(run)
        both = base_done & done
        row = {
            "label": label,
            "patterns": run.patterns.name,
            "points_won": {
                end: share(ind[f"{end}_wins"][done].sum(), int(done.sum()))
                for end in ("near", "far")
            },
            "statistics": match_statistics(run),
        }
        if run is not runs[0]:
            row["difference_from_base"] = {
                k: paired_difference(base_ind[k][both], ind[k][both]) for k in INDICATORS
            }
        out["variants"].append(row)
    return json_ready(out)


def comparison_lines(comparison):
    """The comparison as text lines: each variant's difference from the base, in percentage
    points with its 95 % interval."""
    lines = [
        f"what-if against {comparison['base']}: {comparison['rallies']} rallies on common random "
        f"numbers, seed {comparison['seed']}; differences in percentage points (95 % interval)"
        + modes_text(comparison)
    ]
    for v in comparison["variants"]:
        lines.append(f"{v['label']}: near player wins {with_interval(v['points_won']['near'])}")
        for k, d in v.get("difference_from_base", {}).items():
            if d["difference"] is None or d["low"] is None:
                lines.append(f"  {k.replace('_', ' ')}: -")
                continue
            lines.append(
                f"  {k.replace('_', ' ')}: {d['difference'] * 100:+.1f} "
                f"({d['low'] * 100:+.1f} to {d['high'] * 100:+.1f})"
            )
    return lines
