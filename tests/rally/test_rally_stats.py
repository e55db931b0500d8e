"""Shares and their 95 % intervals: the Wilson interval solves its defining equation, the
rallies a precision needs follow the normal approximation, and the summary's statistics add up
to the tables (no published reference: the interval's definition is the check)."""

import math

import numpy as np

from rallyarc.rally import load_patterns, play_rallies, summarize, summary_lines
from rallyarc.rally.stats import Z95, rallies_needed, strokes, wilson


def test_wilson_endpoints_solve_the_score_equation():
    for k, n in ((0, 10), (3, 10), (50, 100), (99, 100), (7, 2000)):
        p_hat = k / n
        for p in wilson(k, n):
            if 0.0 < p < 1.0:
                assert math.isclose(
                    abs(p_hat - p), Z95 * math.sqrt(p * (1 - p) / n), rel_tol=1e-9, abs_tol=1e-12
                )
        lo, hi = wilson(k, n)
        assert 0.0 <= lo <= p_hat <= hi <= 1.0
    assert wilson(0, 0) == (None, None)


def test_rallies_needed_is_the_normal_approximation():
    # 1.96^2 x 0.25 / 0.01^2 = 9604 (z rounded to 1.96 gives the familiar figure)
    assert rallies_needed(0.01) in (9604, 9605)
    assert rallies_needed(0.02) == math.ceil(Z95**2 * 0.25 / 0.02**2)


def test_summary_statistics_carry_intervals_and_add_up(write_patterns, pattern_text):
    pat = load_patterns(write_patterns(pattern_text((4.0, 1.5, 3.0, 0.6), zone=True)))
    run = play_rallies(pat, n=40, seed=4, max_shots=6)
    s = summarize(run)
    st = s["statistics"]
    ends = st["points_ending_in"]
    played = int((run.rallies["ending"] != "unfinished").sum())
    assert all(v["of"] == played for v in ends.values())
    assert sum(v["count"] for v in ends.values()) == played
    for p in st["players"].values():
        for v in p.values():
            if v["of"]:
                assert v["low"] <= v["share"] <= v["high"]
    length = strokes(run.shots, run.rallies)
    assert (length[run.rallies["ending"].to_numpy() == "double_fault"] == 0).all()
    assert st["rally_length_strokes"]["0-4"]["count"] + st["rally_length_strokes"]["5-8"][
        "count"
    ] + st["rally_length_strokes"]["9+"]["count"] == len(length)
    for r in s["by_shot_type"]:
        lo, hi = r["error_rate_interval"]
        assert lo <= r["error_rate"] <= hi
    assert s["precision"]["this_run_half_width"] == Z95 * math.sqrt(0.25 / 40)
    text = "\n".join(summary_lines(s))
    assert "95 % interval" in text and "rallies needed" in text
    name = run.patterns.players[0].name
    share = s["points_share"][name]
    assert f"{share * 100:.1f} %" in text
    assert np.isfinite(s["precision"]["this_run_half_width"])
