"""The summary of a rally run: points, endings, errors and winners by shot type, landing depth
and width, contact heights, replies by incoming shot, and the spin exchange.

:func:`summarize` gives a JSON-ready dict in which every count adds up to the shot table;
:func:`summary_lines` (:mod:`rallyarc.rally.text`) gives its text for the terminal.
"""

from __future__ import annotations

import numpy as np

from rallyarc.output.jsonsafe import json_ready
from rallyarc.rally.endings import ENDINGS
from rallyarc.rally.stats import match_statistics, precision, wilson
from rallyarc.rally.text import summary_lines

__all__ = ["summarize", "summary_lines"]

#: Quantiles reported for distributions.
QUANTILES = (0.1, 0.25, 0.5, 0.75, 0.9)
#: Edges of the contact-height histogram [m].
HEIGHT_EDGES_M = tuple(float(v) for v in np.round(np.arange(0.0, 3.001, 0.1), 2))
#: Depth zones of a rally ball's landing, by distance inside the baseline [m] (common practice:
#: "deep" is the last 2.5 m before the baseline; "short" is inside the service line).
DEPTH_ZONES = (("long", -np.inf, 0.0), ("deep", 0.0, 2.5), ("middle", 2.5, 5.485))
#: Width zones by distance inside the nearest singles sideline [m].
WIDTH_ZONES = (("wide", -np.inf, 0.0), ("near the line", 0.0, 1.0), ("off centre", 1.0, 2.0))
ERROR_RESULTS = ("forced_error", "unforced_error", "fault", "double_fault")
WINNING_RESULTS = ("winner", "ace")
#: Shot outcomes counted by shot type.
OUTCOME_COUNTS = ("in", "net", "long", "wide", "out", "miss")
#: The rule that names the player dominating the spin exchange.
SPIN_EXCHANGE_RULE = (
    "the player whose rally balls carry more topspin (mean, rpm) at the opponent's "
    "contact; reversed_share: shots whose outgoing spin sense (topspin or backspin, "
    "relative to the ball's travel) is opposite to the incoming ball's"
)


def _finite(values):
    values = np.asarray(values, float)
    return values[np.isfinite(values)]


def _quantiles(values):
    values = _finite(values)
    if values.size == 0:
        return {f"p{int(q * 100)}": None for q in QUANTILES}
    return {f"p{int(q * 100)}": float(np.quantile(values, q)) for q in QUANTILES}


def _zones(values, zones, last):
    values = _finite(values)
    out = {}
    for name, lo, hi in zones:
        out[name] = (
            int(((values >= lo) & (values < hi)).sum())
            if lo > -np.inf
            else int((values < hi).sum())
        )
    out[last] = int((values >= zones[-1][2]).sum())
    return out


def _interval(k, n):
    """The 95 % Wilson interval of a share k of n as a list [low, high]."""
    return list(wilson(k, n))


def _mean(values):
    values = _finite(values)
    return float(values.mean()) if values.size else None


# ------------------------------------------------------------------------- sections


def _player_facts(p):
    return {
        "end": p.end,
        "handedness": p.handedness,
        "height_m": p.height,
        "shoulder_height_m": p.shoulder_height,
        "shoulder_height_source": p.shoulder_source,
        "preferred_contact_height_m": list(p.contact_band),
        "timing": p.timing,
        "home_behind_baseline_m": p.home_behind,
        "deepest_behind_baseline_m": p.deepest_behind,
    }


def _points(run, names):
    """Points won, unfinished rallies, endings, rally length and each player's share."""
    rallies = run.rallies
    won = rallies["winner"].value_counts()
    points = {name: int(won.get(name, 0)) for name in names}
    unfinished = int((rallies["ending"] == "unfinished").sum())
    return {
        "points": points,
        "unfinished": unfinished,
        "endings": {k: int((rallies["ending"] == k).sum()) for k in ENDINGS},
        "rally_length_shots": {
            "mean": float(rallies["shots"].mean()),
            **_quantiles(rallies["shots"]),
            "max": int(rallies["shots"].max()),
        },
        "points_share": {name: points[name] / max(1, run.n - unfinished) for name in names},
        "points_share_interval": {
            name: _interval(points[name], run.n - unfinished) for name in names
        },
    }


def _by_shot_type(shots, names):
    """Outcomes, errors and winners of each player's shot types, serves first."""
    rows = []
    for (player, label), g in shots.groupby(["player", "shot_type"], sort=False):
        outcome = g["outcome"]
        errors = int(g["result"].isin(ERROR_RESULTS).sum())
        rows.append(
            {
                "player": player,
                "shot_type": label,
                "serve": str(g["serve"].iloc[0]),
                "shots": int(len(g)),
                **{o: int((outcome == o).sum()) for o in OUTCOME_COUNTS},
                "errors": errors,
                "error_rate": errors / len(g),
                "error_rate_interval": _interval(errors, len(g)),
                "winners": int(g["result"].isin(WINNING_RESULTS).sum()),
            }
        )
    rows.sort(key=lambda r: (names.index(r["player"]), r["serve"] == "", r["shot_type"]))
    return rows


def _against(rally_balls):
    """Each player's replies by the shot type they answer."""
    rows = []
    for (player, label), g in rally_balls.groupby(["player", "replying_to"], sort=True):
        above, errors = int(g["above_shoulder"].sum()), int(g["result"].isin(ERROR_RESULTS).sum())
        rows.append(
            {
                "player": player,
                "replying_to": label,
                "shots": int(len(g)),
                "contact_height_median_m": float(g["contact_height_m"].median()),
                "above_shoulder_share": above / len(g),
                "above_shoulder_share_interval": _interval(above, len(g)),
                "error_rate": errors / len(g),
                "error_rate_interval": _interval(errors, len(g)),
            }
        )
    return rows


def _depth(landed):
    return {
        "landed": int(len(landed)),
        "quantiles_m": _quantiles(landed["land_depth_m"]),
        "zones": _zones(landed["land_depth_m"], DEPTH_ZONES, "short"),
    }


def _width(landed):
    return {
        "landed": int(len(landed)),
        "side_margin_quantiles_m": _quantiles(landed["land_side_margin_m"]),
        "zones": _zones(landed["land_side_margin_m"], WIDTH_ZONES, "centre"),
    }


def _contact_height(mine, p):
    """Contact heights of a player's rally balls: shoulder, preferred range, phase, histogram."""
    h = mine["contact_height_m"].to_numpy()
    counts, _ = np.histogram(h, bins=HEIGHT_EDGES_M)
    return {
        "contacts": int(len(mine)),
        "shoulder_height_m": p.shoulder_height,
        "above_shoulder": int(mine["above_shoulder"].sum()),
        "above_shoulder_share": float(mine["above_shoulder"].mean()) if len(mine) else None,
        "above_shoulder_share_interval": _interval(mine["above_shoulder"].sum(), len(mine)),
        "in_preferred_range_share": (
            float(mine["in_preferred_band"].mean()) if len(mine) else None
        ),
        "in_preferred_range_share_interval": _interval(mine["in_preferred_band"].sum(), len(mine)),
        "quantiles_m": _quantiles(h),
        "phase": {ph: int((mine["contact_phase"] == ph).sum()) for ph in ("rise", "apex", "drop")},
        "histogram": {
            "edges_m": list(HEIGHT_EDGES_M),
            "counts": [int(c) for c in counts],
            "below": int((h < HEIGHT_EDGES_M[0]).sum()),
            "above": int((h >= HEIGHT_EDGES_M[-1]).sum()),
        },
    }


def _spin(mine, opp):
    """Topspin in and out of a player's rally balls, and what reaches the opponent."""
    t_in = mine["incoming_topspin_rpm"].to_numpy()
    t_out = mine["outgoing_topspin_rpm"].to_numpy()
    reversed_n = int(np.sum(np.sign(t_out) != np.sign(t_in)))
    return {
        "shots": int(len(mine)),
        "incoming_topspin_rpm": _quantiles(t_in) | {"mean": _mean(t_in)},
        "outgoing_topspin_rpm": _quantiles(t_out) | {"mean": _mean(t_out)},
        "reversed_share": reversed_n / t_in.size if t_in.size else None,
        "reversed_share_interval": _interval(reversed_n, t_in.size),
        "topspin_at_opponent_contact_rpm": _mean(opp["incoming_topspin_rpm"]),
    }


def _spin_exchange(spin):
    carried = {n: s["topspin_at_opponent_contact_rpm"] for n, s in spin.items()}
    finite = {n: v for n, v in carried.items() if v is not None}
    return {
        "players": spin,
        "dominant": max(finite, key=finite.get) if finite else None,
        "rule": SPIN_EXCHANGE_RULE,
    }


def summarize(run):
    """The summary of a :class:`RallyRun` as a JSON-ready dict: points, endings, errors and
    winners by shot type, landing depth and width, contact heights (above the shoulder, in the
    preferred range), the spin exchange, and the match statistics with their 95 % intervals
    (:func:`rallyarc.rally.stats.match_statistics`) and the rallies a stated precision needs.
    Every share comes with its 95 % Wilson interval (``..._interval``: [low, high]). Every count
    adds up to the shot table."""
    shots = run.shots
    players = run.patterns.players
    names = [p.name for p in players]
    summary = {
        "patterns": run.patterns.name,
        "club": run.patterns.club,
        "rallies": run.n,
        "seed": run.seed,
        "max_shots": run.max_shots,
        "friction_only": players[0].conditions.friction_only,
        "bounce_model": players[0].conditions.bounce_model,
        "modes": list(players[0].conditions.modes),
        "shots": int(len(shots)),
        "players": {p.name: _player_facts(p) for p in players},
        **_points(run, names),
        "by_shot_type": _by_shot_type(shots, names),
        "statistics": match_statistics(run),
        "precision": precision(run.n),
    }
    rally_balls = shots[shots["serve"] == ""]
    mine = {p.name: rally_balls[rally_balls["player"] == p.name] for p in players}
    landed = {n: m[np.isfinite(m["land_depth_m"])] for n, m in mine.items()}
    summary["against"] = _against(rally_balls)
    summary["depth"] = {n: _depth(landed[n]) for n in names}
    summary["width"] = {n: _width(landed[n]) for n in names}
    summary["contact_height"] = {p.name: _contact_height(mine[p.name], p) for p in players}
    spin = {n: _spin(mine[n], rally_balls[rally_balls["player"] != n]) for n in names}
    summary["spin_exchange"] = _spin_exchange(spin)
    return json_ready(summary)
