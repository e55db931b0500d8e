"""Movement between shots: the hitter recovers toward home in the time the ball gives them, the
next contact is reachable only from where they are, a ball out of reach is a winner, and a
rally ball's miss is forced or unforced by the rule of ``rallyarc.rally.endings``.

No published reference: geometry and the stated rules are checked against the tables."""

import numpy as np

from rallyarc import court
from rallyarc.rally import load_patterns, play_rallies
from rallyarc.rally.endings import FORCED_HEIGHT_MARGIN_M, FORCED_STRETCH, forced
from rallyarc.rally.meet import recover


def test_recovery_runs_toward_home_at_running_speed_and_stops_there():
    body = np.array([[-13.0, 3.0], [-13.0, 3.0], [-12.0, 0.0]])
    home = np.array([-13.0, 0.0])
    out = recover(body, home, 4.0, np.array([0.5, 2.0, 1.0]))
    np.testing.assert_allclose(out[0], [-13.0, 1.0])  # 2 m of the 3 m in 0.5 s
    np.testing.assert_allclose(out[1], home)  # there, and stays
    np.testing.assert_allclose(out[2], home)
    assert np.allclose(recover(body, home, 4.0, np.zeros(3)), body)


def test_forced_rule_is_the_stretch_or_the_height_margin():
    band = (0.8, 1.3)
    stretch = np.array([0.0, FORCED_STRETCH, 0.0, 0.0, 0.5])
    height = np.array([1.0, 1.0, 1.3 + FORCED_HEIGHT_MARGIN_M + 0.01, 0.7, 1.35])
    assert list(forced(stretch, height, band)) == [False, True, True, False, False]


def test_every_contact_is_within_reach_of_where_the_hitter_stands(write_patterns, pattern_text):
    pat = load_patterns(write_patterns(pattern_text((4.0, 1.5, 3.0, 0.8), zone=True)))
    run = play_rallies(pat, n=40, seed=5, max_shots=8)
    rb = run.shots[run.shots["serve"] == ""]
    assert len(rb) > 40
    reach = {p.name: p.reach for p in pat.players}
    gap = np.hypot(rb["contact_x_m"] - rb["hitter_x_m"], rb["contact_y_m"] - rb["hitter_y_m"])
    limit = rb["player"].map(reach).to_numpy()
    assert (gap.to_numpy() <= limit + 1e-6).all()
    assert ((rb["contact_stretch"] >= 0) & (rb["contact_stretch"] <= 1)).all()
    # the rows' error kinds follow the rule
    errors = run.shots[run.shots["result"].isin(["forced_error", "unforced_error"])]
    assert (errors["under_pressure"] == (errors["result"] == "forced_error")).all()
    assert not run.shots.loc[run.shots["serve"] != "", "under_pressure"].any()


def test_a_player_who_cannot_run_never_leaves_home_and_balls_out_of_reach_are_winners(
    write_patterns, pattern_text
):
    text = pattern_text((4.0, 1.5, 3.0, 0.8), zone=True).replace(
        "run_speed_mps = 4.5", "run_speed_mps = 0.0"
    )
    pat = load_patterns(write_patterns(text))
    run = play_rallies(pat, n=30, seed=3, max_shots=6)
    rb = run.shots[run.shots["serve"] == ""]
    # the receiver of the serve returns from home; the server stays where they served
    home_x = -(court.HALF_LENGTH + 1.0)
    returns = rb[rb["shot"] == rb.groupby("rally")["shot"].transform("min")]
    sign = np.where(returns["end"] == "near", 1.0, -1.0)
    np.testing.assert_allclose(returns["hitter_x_m"], sign * home_x)
    np.testing.assert_allclose(returns["hitter_y_m"], 0.0, atol=1e-12)
    for _, g in rb.groupby(["rally", "player"]):
        assert g["hitter_x_m"].nunique() == 1 and g["hitter_y_m"].nunique() == 1
    unreached = run.shots[run.shots["unreached_reason"] != ""]
    assert len(unreached) > 0
    assert unreached["result"].isin(["winner", "ace"]).all()
