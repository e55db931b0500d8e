"""Rally patterns: each shot of a rally is the project's single-shot chain, seeds reproduce,
scatter raises errors, balls stay above the net and the ground, summaries add up, and the
command's errors are one line.

There is no published reference for a whole rally; the checks here are consistency with the
project's own chain (``rallyarc.shot.simulate``, itself checked against solve_ivp and the
published bounce formulas in ``test_shot_chain.py``) and conservation-type checks (counts that
must add up, a proper rotation between the two ends).
"""

import json
import math

import numpy as np
import pandas as pd
import pytest
from click.testing import CliRunner

from rallyarc import court
from rallyarc.cli import main
from rallyarc.errors import InputError
from rallyarc.rally import (
    ENDINGS,
    incoming_of,
    load_patterns,
    play_rallies,
    scatter_factor,
    shot_weights,
    summarize,
    swing_of,
    to_other_end,
    with_scatter,
)
from rallyarc.shot import simulate

PLAYER = """
[{end}]
name = "{name}"
source = "test player"
handedness = "{hand}"
racket = "standard"
height_m = 1.80
home_behind_baseline_m = 1.0
deepest_behind_baseline_m = 3.0
reach_m = 1.6
run_speed_mps = 4.5
contact_height_m = [0.8, 1.3]
highest_contact_m = 2.3
timing = "{timing}"

[{end}.scatter]
head_speed_kmh = {sd_speed}
face_tilt_deg = {sd_tilt}
swing_path_deg = {sd_path}
aim_m = {sd_aim}

[[{end}.serves]]
label = "kick serve"
stroke = "kick_serve"
serve = "first"
probability = 1.0
target_x_m = [{sx0}, {sx1}]
target_y_m = [{sy0}, {sy1}]

[[{end}.shots]]
label = "topspin crosscourt"
stroke = "topspin_drive"
probability = 1.0
target_x_m = [{gx0}, {gx1}]
target_y_m = [{gy0}, {gy1}]
direction = "crosscourt"
"""

HEAD = """
name = "test pair"
source = "test"
description = "two test players"
club = "test club"
ball = "itf_type2"
air = "sea_level"
surface = "hard_medium"
server = "{server}"
max_shots = {max_shots}
"""


def pattern_text(
    scatter=(0.0, 0.0, 0.0, 0.0),
    zone=False,
    server="alternate",
    max_shots=8,
    extra_far="",
):
    sd = dict(zip(("sd_speed", "sd_tilt", "sd_path", "sd_aim"), scatter, strict=True))
    if zone:
        targets = {"sx0": 4.8, "sx1": 5.8, "sy0": 1.0, "sy1": 3.0}
        targets |= {"gx0": 8.0, "gx1": 10.0, "gy0": 1.0, "gy1": 2.5}
    else:
        targets = {"sx0": 5.4, "sx1": 5.4, "sy0": 2.0, "sy1": 2.0}
        targets |= {"gx0": 9.0, "gx1": 9.0, "gy0": 1.5, "gy1": 1.5}
    near = PLAYER.format(end="near", name="Ada Test", hand="right", timing="drop", **sd, **targets)
    far = PLAYER.format(end="far", name="Bo Test", hand="left", timing="rise", **sd, **targets)
    return HEAD.format(server=server, max_shots=max_shots) + near + far + extra_far


@pytest.fixture()
def write_patterns(tmp_path):
    def write(text, name="pair.toml"):
        path = tmp_path / name
        path.write_text(text, encoding="utf-8")
        return str(path)

    return write


def _replay(run):
    """Every row of the shot table played again through the single-shot chain, alone."""
    shots = run.shots
    out = {}
    for player in run.patterns.players:
        rows = shots[shots["player"] == player.name]
        res = simulate(
            incoming_of(rows),
            swing_of(rows),
            player.conditions,
            labels=rows["shot_type"].to_numpy(),
            serve=(rows["serve"] != "").to_numpy(),
        )
        out[player.name] = (rows.index.to_numpy(), res)
    return out


# ----------------------------------------------------------------------- zero scatter


def test_zero_scatter_rally_is_deterministic_and_every_shot_is_the_chain(write_patterns):
    pat = load_patterns(write_patterns(pattern_text()))
    run = play_rallies(pat, n=6, seed=1)
    again = play_rallies(pat, n=6, seed=2)  # another seed: nothing random is left to draw
    pd.testing.assert_frame_equal(run.shots, again.shots)
    assert len(run.shots) > 12  # rallies of several shots, both players hitting
    assert set(run.shots["player"]) == {"Ada Test", "Bo Test"}

    shots = run.shots
    for name, (rows, res) in _replay(run).items():
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
            m["impact_speed_mps"] * 3.6, shots.loc[rows, "outgoing_speed_kmh"], rtol=1e-9
        )


def test_next_shot_starts_on_the_previous_path_rotated_to_the_other_end(write_patterns):
    # The receiver's incoming ball is the previous shot's ball at the contact time, turned by
    # 180 degrees about z: checked by sampling the previous shot's chain run alone.
    pat = load_patterns(write_patterns(pattern_text()))
    run = play_rallies(pat, n=4, seed=0)
    shots = run.shots
    replay = _replay(run)
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


# ----------------------------------------------------------------------- scatter and seeds


def test_same_seed_same_table_and_another_seed_differs(write_patterns):
    pat = load_patterns(write_patterns(pattern_text((3.0, 1.0, 2.0, 0.5), zone=True)))
    one = play_rallies(pat, n=20, seed=7, max_shots=4)
    two = play_rallies(pat, n=20, seed=7, max_shots=4)
    pd.testing.assert_frame_equal(one.shots, two.shots)
    pd.testing.assert_frame_equal(one.rallies, two.rallies)
    other = play_rallies(pat, n=20, seed=8, max_shots=4)
    assert not np.allclose(
        one.shots["aim_x_m"].to_numpy()[:20], other.shots["aim_x_m"].to_numpy()[:20]
    )


def test_blocks_give_the_same_tables_in_one_process_or_two(write_patterns):
    pat = load_patterns(write_patterns(pattern_text((3.0, 1.0, 2.0, 0.5), zone=True)))
    one = play_rallies(pat, n=12, seed=4, max_shots=3, block=6)
    two = play_rallies(pat, n=12, seed=4, max_shots=3, block=6, workers=2)
    pd.testing.assert_frame_equal(one.shots, two.shots)
    pd.testing.assert_frame_equal(one.rallies, two.rallies)
    assert sorted(one.rallies["rally"]) == list(range(12))
    assert set(one.shots["rally"]) == set(range(12))


def test_conditional_shots_take_their_probability_only_when_the_ball_meets_them(write_patterns):
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


def test_errors_rise_with_scatter(write_patterns):
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


# ----------------------------------------------------------------------- physical sanity


def test_no_ball_passes_through_the_net_or_the_ground(write_patterns):
    pat = load_patterns(write_patterns(pattern_text((4.0, 1.5, 3.0, 0.6), zone=True)))
    run = play_rallies(pat, n=24, seed=5, max_shots=6)
    shots = run.shots
    r = pat.players[0].conditions.ball.radius
    for name, (rows, res) in _replay(run).items():
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


# ----------------------------------------------------------------------- summary


def test_summary_totals_add_up_to_the_shot_table(write_patterns):
    pat = load_patterns(write_patterns(pattern_text((4.0, 1.5, 3.0, 0.6), zone=True)))
    run = play_rallies(pat, n=40, seed=2, max_shots=5)
    s = summarize(run)
    shots = run.shots
    assert sum(s["points"].values()) + s["unfinished"] == run.n
    assert sum(s["endings"].values()) == run.n
    assert set(s["endings"]) == set(ENDINGS)
    assert sum(r["shots"] for r in s["by_shot_type"]) == len(shots) == s["shots"]
    errors = shots["result"].isin(["error", "fault", "double_fault"]).sum()
    assert sum(r["errors"] for r in s["by_shot_type"]) == errors
    for r in s["by_shot_type"]:
        assert sum(r[o] for o in ("in", "net", "long", "wide", "out", "miss")) == r["shots"]
    assert run.rallies["shots"].sum() == len(shots)
    assert (shots.groupby("rally")["shot"].max() <= 5).all()
    assert (run.rallies["ending"] != "").all()
    # each rally ends exactly once, on its last row
    last = shots.groupby("rally").tail(1)
    assert not last["result"].isin(["continues", "fault"]).any()
    assert (
        shots.groupby("rally")["result"]
        .apply(lambda r: (~r.isin(["continues", "fault"])).sum())
        .eq(1)
        .all()
    )
    for name in s["players"]:
        h = s["contact_height"][name]
        hist = h["histogram"]
        assert sum(hist["counts"]) + hist["below"] + hist["above"] == h["contacts"]
        rally_balls = shots[(shots["player"] == name) & (shots["serve"] == "")]
        assert h["contacts"] == len(rally_balls)
        assert h["above_shoulder"] == int(
            (rally_balls["contact_height_m"] > s["players"][name]["shoulder_height_m"]).sum()
        )
        d = s["depth"][name]
        assert sum(d["zones"].values()) == d["landed"]
        assert sum(s["width"][name]["zones"].values()) == d["landed"]
    json.dumps(s)  # JSON-ready


# ----------------------------------------------------------------------- configs and CLI


def test_demo_patterns_load_with_shoulder_heights_stated():
    pat = load_patterns("demo_match")
    for p in pat.players:
        assert 0.7 * p.height < p.shoulder_height < 0.9 * p.height
        assert "common practice" in p.shoulder_source or "given" in p.shoulder_source


@pytest.mark.parametrize(
    ("old", "new", "words"),
    [
        ('timing = "drop"', 'timing = "late"', ["near.timing", "rise, apex, drop"]),
        ("target_x_m = [9.0, 9.0]", "target_x_m = [9.0, 8.0]", ["target_x_m", "low end first"]),
        ("reach_m = 1.6", "reach_m = 9.0", ["reach_m", "0.3 to 3"]),
        ("reach_m = 1.6", "reach_mm = 1.6", ["unknown key", "near.reach_mm"]),
        ('stroke = "topspin_drive"', 'stroke = "kick_serve"', ["shots[1].stroke", "groundstroke"]),
        ('stroke = "topspin_drive"', 'stroke = "no_such"', ["shots[1].stroke", "unknown stroke"]),
    ],
)
def test_bad_pattern_files_give_one_line_naming_file_and_key(write_patterns, old, new, words):
    text = pattern_text().replace(old, new, 1)
    path = write_patterns(text)
    with pytest.raises(InputError) as exc:
        load_patterns(path)
    msg = str(exc.value)
    assert "\n" not in msg and path in msg
    for w in words:
        assert w in msg


def test_a_repertoire_needs_a_shot_without_conditions(write_patterns):
    text = pattern_text().replace(
        'direction = "crosscourt"\n', 'direction = "crosscourt"\nwhen_height_above_m = 1.0\n'
    )
    with pytest.raises(InputError, match="without a 'when_' condition"):
        load_patterns(write_patterns(text))


def run_cli(*args):
    return CliRunner().invoke(main, list(args))


def test_cli_writes_outputs_and_refuses_to_overwrite(write_patterns, tmp_path):
    path = write_patterns(pattern_text((3.0, 1.0, 2.0, 0.5), zone=True, max_shots=3))
    out = tmp_path / "out"
    res = run_cli("rally", path, "--rallies", "6", "--seed", "3", "--out", str(out), "--quiet")
    assert res.exit_code == 0, res.output
    for name in ("shots.csv", "shots.parquet", "rallies.csv", "summary.json"):
        assert (out / name).is_file()
    for name in ("landing_heatmaps.png", "contact_heights.png", "spin_exchange.png"):
        assert (out / name).stat().st_size > 10_000
    table = pd.read_parquet(out / "shots.parquet")
    csv = pd.read_csv(out / "shots.csv", dtype=str, keep_default_na=False)
    assert list(csv.columns) == list(table.columns) and len(csv) == len(table)
    for col in table.columns:
        kind = table[col].dtype
        if pd.api.types.is_bool_dtype(kind) or not pd.api.types.is_numeric_dtype(kind):
            assert (csv[col] == table[col].astype(str)).all(), col
        else:
            np.testing.assert_allclose(
                csv[col].replace("", "nan").astype(float),
                table[col].astype(float),
                rtol=1e-12,
                equal_nan=True,
            )
    summary = json.loads((out / "summary.json").read_text())
    assert summary["shots"] == len(table) and summary["rallies"] == 6
    before = (out / "summary.json").read_bytes()
    res = run_cli("rally", path, "--rallies", "6", "--seed", "4", "--out", str(out), "--quiet")
    assert res.exit_code == 2
    assert "exists; add --force" in res.output and "Traceback" not in res.output
    assert (out / "summary.json").read_bytes() == before
    res = run_cli(
        "rally", path, "--rallies", "6", "--seed", "4", "--out", str(out), "--force", "--json"
    )
    assert res.exit_code == 0, res.output
    assert json.loads(res.output)["seed"] == 4


@pytest.mark.parametrize(
    ("args", "words"),
    [
        (["--rallies", "0"], ["--rallies", "1 to 200000"]),
        (["--rallies", "many"], ["--rallies", "whole number"]),
        (["--seed", "-1"], ["--seed", "0 to"]),
        (["--max-shots", "500"], ["--max-shots", "1 to 200"]),
        (["--workers", "0"], ["--workers", "1 to 64"]),
    ],
)
def test_cli_option_errors_are_one_line(args, words):
    res = run_cli("rally", "demo_match", *args)
    assert res.exit_code == 2
    lines = res.output.strip().splitlines()
    assert len(lines) == 1 and lines[0].startswith("rallyarc: error: ")
    for w in words:
        assert w in lines[0]


def test_cli_bad_pattern_names(tmp_path):
    res = run_cli("rally", "no_such_pattern")
    assert res.exit_code == 2 and "demo_match" in res.output
    res = run_cli("rally", str(tmp_path / "missing.toml"))
    assert res.exit_code == 2 and "no such file" in res.output
    target = tmp_path / "a_file"
    target.write_text("x")
    res = run_cli("rally", "demo_match", "--rallies", "2", "--out", str(target))
    assert res.exit_code == 2 and "is a file" in res.output
