"""Every shot of a rally is the project's single-shot chain: the rows replay through
``rallyarc.shot.simulate`` alone, the next shot starts on the previous path turned to the other
end, and no ball passes through the net or the ground.

There is no published reference for a whole rally; the checks here are consistency with the
project's own chain (itself checked against solve_ivp and the published bounce formulas in
``test_shot_chain.py``) and conservation-type checks (a proper rotation between the two ends).
"""

import numpy as np
import pandas as pd
import pytest

from rallyarc import court
from rallyarc.rally import (
    incoming_of,
    load_patterns,
    play_rallies,
    to_other_end,
)
from rallyarc.units import KMH_PER_MPS


def test_zero_scatter_rally_is_deterministic_and_every_shot_is_the_chain(
    write_patterns, pattern_text, replay
):
    pat = load_patterns(write_patterns(pattern_text()))
    run = play_rallies(pat, n=6, seed=1)
    again = play_rallies(pat, n=6, seed=2)  # another seed: nothing random is left to draw
    pd.testing.assert_frame_equal(run.shots, again.shots)
    assert len(run.shots) > 12  # rallies of several shots, both players hitting
    assert set(run.shots["player"]) == {"Ada Test", "Bo Test"}

    shots = run.shots
    for name, (rows, res) in replay(run).items():
        m = res.metrics
        far = shots.loc[rows, "end"].eq("far").to_numpy()
        sign = np.where(far, -1.0, 1.0)
        assert list(m["outcome"]) == list(shots.loc[rows, "outcome"]), name
        # the table reports landings in the court frame: the far player's are rotated; a ball
        # stopped by the net has none
        land_x = shots.loc[rows, "land_x_m"].to_numpy()
        land_y = shots.loc[rows, "land_y_m"].to_numpy()
        net = m["outcome"] == "net"
        assert np.isnan(land_x[net]).all()
        np.testing.assert_allclose(sign[~net] * m["land_x_m"][~net], land_x[~net], atol=1e-6)
        np.testing.assert_allclose(sign[~net] * m["land_y_m"][~net], land_y[~net], atol=1e-6)
        for key, col in (
            ("net_clearance_m", "net_clearance_m"),
            ("impact_topspin_rpm", "outgoing_topspin_rpm"),
            ("bounce_apex_m", "bounce_apex_m"),
        ):
            np.testing.assert_allclose(
                m[key], shots.loc[rows, col].to_numpy(), atol=1e-6, equal_nan=True
            )
        np.testing.assert_allclose(
            m["impact_speed_mps"] * KMH_PER_MPS, shots.loc[rows, "outgoing_speed_kmh"], rtol=1e-9
        )


def test_next_shot_starts_on_the_previous_path_rotated_to_the_other_end(
    write_patterns, pattern_text, replay
):
    # The receiver's incoming ball is the previous shot's ball at the contact time, turned by
    # 180 degrees about z: checked by sampling the previous shot's chain run alone.
    pat = load_patterns(write_patterns(pattern_text()))
    run = play_rallies(pat, n=4, seed=0)
    shots = run.shots
    replay = replay(run)
    checked = 0
    for _name, (rows, res) in replay.items():
        # the flight after the bounce, to the second bounce
        idx, after = res.after_bounce.shots, res.after_bounce.flight
        for j, i in enumerate(rows):
            row = shots.loc[i]
            if row["result"] != "continues":
                continue
            nxt = shots[(shots["rally"] == row["rally"]) & (shots["shot"] == row["shot"] + 1)]
            assert len(nxt) == 1
            t = row["reply_t_s"]
            k = int(np.flatnonzero(idx == j)[0])
            assert res.metrics["bounce_t_s"][j] < t <= after.t[k]
            pos, vel, spin = after.trajectory.sample(np.array([t]))
            state = incoming_of(nxt)
            np.testing.assert_allclose(to_other_end(pos[:, k]), state.position, atol=1e-9)
            np.testing.assert_allclose(to_other_end(vel[:, k]), state.velocity, atol=1e-9)
            np.testing.assert_allclose(to_other_end(spin[:, k]), state.spin, atol=1e-9)
            assert nxt["contact_height_m"].iloc[0] == pytest.approx(row["reply_height_m"])
            checked += 1
    assert checked >= 8


def test_the_end_to_end_rotation_is_proper():
    # A rotation (det +1) carries cross products along, so spin (an axial vector) turns like
    # any vector; the rotation is its own inverse.
    rng = np.random.default_rng(3)
    a, b = rng.normal(size=(2, 50, 3))
    np.testing.assert_allclose(
        to_other_end(np.cross(a, b)), np.cross(to_other_end(a), to_other_end(b))
    )
    np.testing.assert_array_equal(to_other_end(to_other_end(a)), a)
    assert np.linalg.det(np.diag(to_other_end(np.ones((1, 3)))[0])) == 1.0


def test_no_ball_passes_through_the_net_or_the_ground(write_patterns, pattern_text, replay):
    pat = load_patterns(write_patterns(pattern_text((4.0, 1.5, 3.0, 0.6), zone=True)))
    run = play_rallies(pat, n=24, seed=5, max_shots=6)
    shots = run.shots
    r = pat.players[0].conditions.ball.radius
    for name, (rows, res) in replay(run).items():
        m = res.metrics
        end0, end1 = res.phase_ends()
        t_end = np.where(np.isfinite(end1), end1, end0)
        times = np.linspace(0.0, float(t_end.max()), 1500)
        pos, _, _, phase = res.sample(times)
        live = phase >= 0
        # the ground: the centre never below one radius (tolerance 1 mm for interpolation)
        assert (pos[..., 2][live] >= r - 1e-3).all(), name
        # the net: a ball that crossed the plane without being called "net" passed above the
        # cord; the sampled path agrees (linear interpolation between samples, 5 mm)
        x, z = pos[..., 0], pos[..., 2]
        for j in range(len(rows)):
            out = m["outcome"][j]
            cross = np.flatnonzero((x[:-1, j] < 0) & (x[1:, j] >= 0) & live[1:, j])
            if out == "net":
                assert not (m["net_clearance_m"][j] >= 0) or m["land_x_m"][j] <= 0
                continue
            assert m["net_clearance_m"][j] >= 0
            assert cross.size == 1
            k = cross[0]
            f = -x[k, j] / (x[k + 1, j] - x[k, j])
            zc = z[k, j] + f * (z[k + 1, j] - z[k, j])
            top = court.net_height(pos[k, j, 1])
            assert zc - r >= top - 5e-3
        # the receiver meets the ball after its bounce and before a second one
        cont = shots.loc[rows, "result"].eq("continues").to_numpy()
        reply = shots.loc[rows, "reply_t_s"].to_numpy()
        assert (reply[cont] > m["bounce_t_s"][cont]).all()
        idx, after = res.after_bounce.shots, res.after_bounce.flight
        second = np.full(len(rows), np.nan)
        second[idx] = after.t
        assert (reply[cont] <= second[cont] + 1e-12).all()
        assert (shots.loc[rows, "reply_height_m"].to_numpy()[cont] > r).all()
