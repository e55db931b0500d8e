"""Shot choice and scatter: seeds reproduce (in one process or two), conditional shots take
their probability only when the ball meets them, scatter grows outside the preferred heights
and raises errors."""

import math

import numpy as np
import pandas as pd

from rallyarc.rally import (
    load_patterns,
    play_rallies,
    scatter_factor,
    shot_weights,
    with_scatter,
)


def test_same_seed_same_table_and_another_seed_differs(write_patterns, pattern_text):
    pat = load_patterns(write_patterns(pattern_text((3.0, 1.0, 2.0, 0.5), zone=True)))
    one = play_rallies(pat, n=20, seed=7, max_shots=4)
    two = play_rallies(pat, n=20, seed=7, max_shots=4)
    pd.testing.assert_frame_equal(one.shots, two.shots)
    pd.testing.assert_frame_equal(one.rallies, two.rallies)
    other = play_rallies(pat, n=20, seed=8, max_shots=4)
    assert not np.allclose(
        one.shots["aim_x_m"].to_numpy()[:20], other.shots["aim_x_m"].to_numpy()[:20]
    )


def test_blocks_give_the_same_tables_in_one_process_or_two(write_patterns, pattern_text):
    pat = load_patterns(write_patterns(pattern_text((3.0, 1.0, 2.0, 0.5), zone=True)))
    one = play_rallies(pat, n=12, seed=4, max_shots=3, block=6)
    two = play_rallies(pat, n=12, seed=4, max_shots=3, block=6, workers=2)
    pd.testing.assert_frame_equal(one.shots, two.shots)
    pd.testing.assert_frame_equal(one.rallies, two.rallies)
    assert sorted(one.rallies["rally"]) == list(range(12))
    assert set(one.shots["rally"]) == set(range(12))


def test_conditional_shots_take_their_probability_only_when_the_ball_meets_them(
    write_patterns, pattern_text
):
    extra = """
[[far.shots]]
label = "high slice"
stroke = "slice"
probability = 1.0
target_x_m = [8.0, 8.0]
target_y_m = [0.0, 0.0]
when_height_above_m = 1.0
"""
    pat = load_patterns(write_patterns(pattern_text(server="near", extra_far=extra)))
    far = pat.players[1]
    h = np.array([0.9, 1.1, 1.5])
    w = shot_weights(far.shots, h, np.array(["forehand"] * 3), np.zeros(3))
    np.testing.assert_allclose(w, [[1.0, 0.0], [0.0, 1.0], [0.0, 1.0]])
    run = play_rallies(pat, n=6, seed=3, max_shots=6)
    assert set(run.rallies["server"]) == {"Ada Test"}
    rows = run.shots[(run.shots["player"] == "Bo Test") & (run.shots["serve"] == "")]
    assert len(rows) > 0
    high = rows["contact_height_m"] > 1.0
    assert high.any() and (~high).any()
    assert (rows.loc[high, "shot_type"] == "high slice").all()
    assert (rows.loc[~high, "shot_type"] == "topspin crosscourt").all()


def test_scatter_grows_only_outside_the_preferred_heights():
    p = load_patterns("demo_match").players[1]
    lo, hi = p.contact_band
    k = p.scatter["outside_range_per_m"]
    h = np.array([lo, 0.5 * (lo + hi), hi, hi + 0.3, lo - 0.2, hi + 0.3])
    serve = np.array([False] * 5 + [True])
    expected = [1.0, 1.0, 1.0, 1.0 + k * 0.3, 1.0 + k * 0.2, 1.0]
    np.testing.assert_allclose(scatter_factor(p, h, serve), expected)


def test_errors_rise_with_scatter(write_patterns, pattern_text):
    # Statistical check, fixed seed: the share of shots that do not land in (errors and faults)
    # with twice the scatter exceeds that with half of it; one-sided two-proportion z-test
    # (pooled), required z > 3 (p < 0.0014).
    pat = load_patterns(write_patterns(pattern_text((4.0, 1.5, 3.0, 0.6), zone=True)))
    rates = []
    for factor in (0.5, 2.0):
        run = play_rallies(with_scatter(pat, factor), n=300, seed=11, max_shots=3)
        bad = run.shots["outcome"].ne("in").to_numpy()
        rates.append((bad.sum(), bad.size))
    (k1, n1), (k2, n2) = rates
    p1, p2 = k1 / n1, k2 / n2
    pooled = (k1 + k2) / (n1 + n2)
    z = (p2 - p1) / math.sqrt(pooled * (1 - pooled) * (1 / n1 + 1 / n2))
    assert p2 > p1 and z > 3.0, (p1, p2, z)
