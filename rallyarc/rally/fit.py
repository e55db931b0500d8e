"""Calibration from observations: one player's execution scatter fitted to an analyst's
observed statistics.

An observed-statistics file (TOML, schema :data:`rallyarc.config.OBSERVED`) names the
player (``near`` or ``far`` of a pattern file) and gives counts an analyst charted: first and
second serves in, double faults and aces per service point, rally-ball errors per rally ball,
errors per shot of a named shot type, and the shares of the player's rally balls landing in
court that land deep (the last 2.5 m) or short (inside the service line). Each is a ``count``
of ``of``.

The fit (:func:`fit_scatter`) multiplies all four scatter SDs of that player by one factor
``f`` (:func:`rallyarc.rally.patterns.with_scatter`) and minimises over ``log f``

    chi2(f) = sum_i (p_obs_i - p_sim_i(f))^2 / (v_obs_i + v_sim_i(f))

with ``v = p (1 - p) / n`` of each share. Every evaluation plays the same rallies on the same
seed (common random numbers), so ``chi2`` changes with ``f`` through the plans' execution, not
through luck, and a bounded scalar search converges. The factor's standard error is
``1 / sqrt(sum_i s_i^2 / (v_obs_i + v_sim_i))`` with ``s_i`` the slope of share ``i`` in ``f``,
taken by a central difference on the same random numbers; its 95 % interval is
``f +/- 1.96 SE``. The shot choice probabilities are left as they are.
"""

from __future__ import annotations

import math

import numpy as np

from rallyarc import config
from rallyarc.errors import InputError
from rallyarc.rally.frames import ENDS
from rallyarc.rally.patterns import with_scatter
from rallyarc.rally.runner import play_rallies
from rallyarc.rally.stats import Z95, player_statistics, share
from rallyarc.units import KMH_PER_MPS

#: Serve and rally-ball statistics an observed file may give (player_statistics keys).
PLAYER_STATISTICS = (
    "first_serve_in",
    "second_serve_in",
    "double_faults_per_service_point",
    "aces_per_service_point",
    "rally_ball_errors",
)
#: Landing shares of rally balls landing in court, by distance inside the baseline [m].
DEPTH_STATISTICS = {"deep_landing": (0.0, 2.5), "short_landing": (5.485, math.inf)}
STATISTICS = PLAYER_STATISTICS + tuple(DEPTH_STATISTICS)
#: Results that count as an error of a shot type.
ERROR_RESULTS = ("forced_error", "unforced_error", "fault", "double_fault")
#: Scatter factors searched, relative to the pattern file's scatter.
FACTOR_RANGE = (0.25, 4.0)
#: Pattern-file keys of the scatter SDs (:data:`rallyarc.rally.patterns.SCATTER_SDS`).
SCATTER_KEYS = {
    "head_speed": "head_speed_kmh",
    "face_tilt": "face_tilt_deg",
    "swing_path": "swing_path_deg",
    "aim": "aim_m",
}


def load_observed(path):
    """An observed-statistics file (a ``.toml`` path), checked; counts no larger than totals."""
    data = config.load_observed(path)
    where = data["where"]
    stats = data.get("statistics", {})
    items = [(k, v) for k, v in stats.items()]
    items += [(f"shot_types[{i + 1}]", v) for i, v in enumerate(data.get("shot_types", []))]
    for key, v in items:
        if v["count"] > v["of"]:
            raise InputError(f"{where}: key {key + '.count'!r} must not exceed its 'of'")
    if not items:
        raise InputError(f"{where}: give at least one of 'statistics' or 'shot_types'")
    return data


def simulated_statistics(run, end, observed):
    """The observed file's statistics simulated in ``run`` for the player at ``end``: a dict
    name -> :func:`rallyarc.rally.stats.share`."""
    name = run.patterns.players[ENDS.index(end)].name
    shots = run.shots
    mine = shots[shots["player"] == name]
    out = {}
    given = observed.get("statistics", {})
    base = player_statistics(shots, name)
    for key in PLAYER_STATISTICS:
        if key in given:
            out[key] = base[key]
    landed = mine[(mine["serve"] == "") & (mine["outcome"] == "in")]["land_depth_m"].to_numpy()
    landed = landed[np.isfinite(landed)]
    for key, (lo, hi) in DEPTH_STATISTICS.items():
        if key in given:
            out[key] = share(int(((landed >= lo) & (landed < hi)).sum()), landed.size)
    for t in observed.get("shot_types", []):
        rows = mine[mine["shot_type"] == t["shot_type"]]
        errors = int(rows["result"].isin(ERROR_RESULTS).sum())
        out[f"errors: {t['shot_type']}"] = share(errors, len(rows))
    return out


def observed_statistics(observed):
    """The observed counts as name -> :func:`rallyarc.rally.stats.share`."""
    out = {k: share(v["count"], v["of"]) for k, v in observed.get("statistics", {}).items()}
    for t in observed.get("shot_types", []):
        out[f"errors: {t['shot_type']}"] = share(t["count"], t["of"])
    return out


def _variance(s):
    if not s["of"]:
        return math.inf
    p = min(max(s["share"], 0.5 / s["of"]), 1 - 0.5 / s["of"])
    return p * (1 - p) / s["of"]


def chi2(obs, sim):
    """The fit's objective (see the module) over the statistics both sides have."""
    total = 0.0
    for k, o in obs.items():
        s = sim[k]
        if s["share"] is None:
            total += 25.0
            continue
        total += (o["share"] - s["share"]) ** 2 / (_variance(o) + _variance(s))
    return total


def _check_shot_types(patterns, end, observed):
    player = patterns.players[ENDS.index(end)]
    labels = {s.label for s in (*player.first_serves, *player.second_serves, *player.shots)}
    for t in observed.get("shot_types", []):
        if t["shot_type"] not in labels:
            raise InputError(
                f"{observed['where']}: shot type {t['shot_type']!r} is not one of "
                f"{player.name}'s: " + ", ".join(sorted(labels))
            )


def _factor_limit(patterns, end):
    """The largest factor that keeps every scatter SD inside the pattern schema."""
    schema = config.SCHEMAS["patterns"][end].table["scatter"].table
    sd = patterns.players[ENDS.index(end)].scatter
    raw = {"head_speed": sd["head_speed"] * KMH_PER_MPS, "face_tilt": math.degrees(sd["face_tilt"])}
    raw |= {"swing_path": math.degrees(sd["swing_path"]), "aim": sd["aim"]}
    limits = [schema[SCATTER_KEYS[k]].high / v for k, v in raw.items() if v > 0]
    return min([FACTOR_RANGE[1], *limits])


def fit_scatter(
    patterns, observed, n=400, seed=0, workers=1, max_shots=None, xatol=0.02, bounds=FACTOR_RANGE
):
    """Fit the scatter factor of the observed player (see the module).

    ``xatol`` is the search's tolerance on ``log f`` (about the relative tolerance on ``f``)
    and ``bounds`` the factors searched. Returns a JSON-ready dict: the player, the factor with
    its standard error and 95 % interval, chi2, the evaluations made, and each statistic
    observed against simulated at the fitted factor with their Wilson intervals and whether
    the intervals overlap.
    """
    from scipy.optimize import minimize_scalar

    end = observed["player"]
    _check_shot_types(patterns, end, observed)
    obs = observed_statistics(observed)
    cache = {}

    def simulate(f):
        key = round(float(f), 12)
        if key not in cache:
            run = play_rallies(
                with_scatter(patterns, f, ends=(end,)),
                n=n,
                seed=seed,
                workers=workers,
                max_shots=max_shots,
            )
            cache[key] = simulated_statistics(run, end, observed)
        return cache[key]

    lo = math.log(bounds[0])
    hi = math.log(min(bounds[1], _factor_limit(patterns, end)))
    best = minimize_scalar(
        lambda u: chi2(obs, simulate(math.exp(u))),
        bounds=(lo, hi),
        method="bounded",
        options={"xatol": xatol},
    )
    factor = float(math.exp(best.x))
    se = _standard_error(obs, simulate, factor)
    sim = simulate(factor)
    return {
        "player": patterns.players[ENDS.index(end)].name,
        "end": end,
        "rallies": int(n),
        "seed": int(seed),
        "scatter_factor": factor,
        "standard_error": se,
        "low": None if se is None else max(0.0, factor - Z95 * se),
        "high": None if se is None else factor + Z95 * se,
        "chi2": float(best.fun),
        "evaluations": len(cache),
        "statistics": {
            k: {"observed": o, "simulated": sim[k], "overlap": _overlap(o, sim[k])}
            for k, o in obs.items()
        },
    }


def _standard_error(obs, simulate, factor, step=0.1):
    """The factor's standard error from the slopes of the shares (central difference)."""
    up, down, mid = simulate(factor * (1 + step)), simulate(factor * (1 - step)), simulate(factor)
    info = 0.0
    for k, o in obs.items():
        if up[k]["share"] is None or down[k]["share"] is None or mid[k]["share"] is None:
            continue
        slope = (up[k]["share"] - down[k]["share"]) / (2 * step * factor)
        info += slope**2 / (_variance(o) + _variance(mid[k]))
    return 1.0 / math.sqrt(info) if info > 0 else None


def _overlap(a, b):
    if a["low"] is None or b["low"] is None:
        return False
    return a["low"] <= b["high"] and b["low"] <= a["high"]


def fitted_sds(patterns, end, factor):
    """The fitted scatter SDs in pattern-file units: key -> value."""
    sd = patterns.players[ENDS.index(end)].scatter
    return {
        "head_speed_kmh": sd["head_speed"] * factor * KMH_PER_MPS,
        "face_tilt_deg": math.degrees(sd["face_tilt"]) * factor,
        "swing_path_deg": math.degrees(sd["swing_path"]) * factor,
        "aim_m": sd["aim"] * factor,
    }
