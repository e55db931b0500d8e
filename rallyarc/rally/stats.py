"""Match statistics of a rally run, each a share with its 95 % Wilson interval.

The statistics an analyst charts (:func:`match_statistics`): per player, first serves in,
second serves in, double faults and aces per service point, rally-ball errors per rally ball
and the points won; per run, the shares of points ending in winners (aces included), forced
errors, unforced errors and double faults, and the rally length in strokes.

Rally length counts strokes as match charting does: every ball struck, the serve once (a
faulted first serve is not a stroke) and the missed ball included; a double fault is a rally
of 0 strokes.

A share ``k / n`` gets the Wilson score interval at 95 % (:func:`wilson`), which stays inside
0 to 1 and behaves for shares near 0 or 1 and small ``n``. :func:`rallies_needed` inverts the
normal approximation: the rallies for a stated half-width of the interval.
"""

from __future__ import annotations

import math

import numpy as np

#: Normal quantile of a two-sided 95 % interval.
Z95 = 1.959963984540054
#: Rally-length bands [strokes], inclusive.
LENGTH_BANDS = (("0-3", 0, 3), ("0-4", 0, 4), ("5-8", 5, 8), ("9+", 9, 10**9))


def wilson(k, n, z=Z95):
    """The Wilson score interval (low, high) of a share ``k`` of ``n``; (None, None) for n = 0."""
    k, n = float(k), float(n)
    if n <= 0:
        return None, None
    p = k / n
    den = 1.0 + z * z / n
    mid = (p + z * z / (2 * n)) / den
    half = z * math.sqrt(p * (1 - p) / n + z * z / (4 * n * n)) / den
    return max(0.0, mid - half), min(1.0, mid + half)


def share(k, n):
    """A share as a dict: ``count``, ``of``, ``share`` and its 95 % interval ``low``, ``high``."""
    low, high = wilson(k, n)
    return {
        "count": int(k),
        "of": int(n),
        "share": float(k) / n if n else None,
        "low": low,
        "high": high,
    }


def rallies_needed(half_width, p=0.5, z=Z95):
    """Trials for a 95 % interval of half-width ``half_width`` on a share near ``p`` (0.5: the
    worst case), from the normal approximation ``z^2 p (1 - p) / h^2``."""
    return int(math.ceil(z * z * p * (1 - p) / half_width**2))


def strokes(shots, rallies):
    """Each rally's length in strokes (see the module), in the order of ``rallies``."""
    counted = shots[shots["result"] != "fault"].groupby("rally")["shot"].count()
    n = counted.reindex(rallies["rally"]).fillna(0).to_numpy(int)
    return np.where(rallies["ending"].to_numpy() == "double_fault", 0, n)


def player_statistics(shots, name):
    """One player's serve and rally-ball statistics, each a :func:`share`."""
    mine = shots[shots["player"] == name]
    first = mine[mine["serve"] == "first"]
    second = mine[mine["serve"] == "second"]
    balls = mine[mine["serve"] == ""]
    points = len(first)
    return {
        "first_serve_in": share((first["outcome"] == "in").sum(), len(first)),
        "second_serve_in": share((second["outcome"] == "in").sum(), len(second)),
        "double_faults_per_service_point": share(
            (second["result"] == "double_fault").sum(), points
        ),
        "aces_per_service_point": share(mine["result"].eq("ace").sum(), points),
        "rally_ball_errors": share(
            balls["result"].isin(["forced_error", "unforced_error"]).sum(), len(balls)
        ),
    }


def match_statistics(run):
    """The match statistics of a :class:`rallyarc.rally.RallyRun` (see the module)."""
    shots, rallies = run.shots, run.rallies
    names = [p.name for p in run.patterns.players]
    ending = rallies["ending"]
    played = int((ending != "unfinished").sum())
    length = strokes(shots, rallies)
    players = {}
    for name in names:
        players[name] = player_statistics(shots, name)
        players[name]["points_won"] = share((rallies["winner"] == name).sum(), played)
    return {
        "players": players,
        "points_ending_in": {
            "winners": share(ending.isin(["winner", "ace"]).sum(), played),
            "forced_errors": share((ending == "forced_error").sum(), played),
            "unforced_errors": share((ending == "unforced_error").sum(), played),
            "double_faults": share((ending == "double_fault").sum(), played),
        },
        "rally_length_strokes": {
            "mean": float(length.mean()) if length.size else None,
            **{
                band: share(((length >= lo) & (length <= hi)).sum(), length.size)
                for band, lo, hi in LENGTH_BANDS
            },
        },
    }


def precision(n, half_widths=(0.01, 0.02, 0.05)):
    """How many rallies a stated precision needs: for each half-width of a 95 % interval on a
    share near one half, the trials needed, and the half-width this run's ``n`` gives."""
    return {
        "rule": "trials for a 95 % interval of half-width h on a share near 0.5: "
        "1.96^2 x 0.25 / h^2 (a share counted once per rally, e.g. points won)",
        "needed": {f"{h * 100:g} points": rallies_needed(h) for h in half_widths},
        "this_run_half_width": Z95 * math.sqrt(0.25 / n) if n else None,
    }
