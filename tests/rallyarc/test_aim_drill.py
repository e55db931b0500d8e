"""Aiming round trips, unreachable targets, drill sheets, exports and atomic writes."""

import json
import math
import os

import numpy as np
import pandas as pd
import pytest
from click.testing import CliRunner

from rallyarc import domain
from rallyarc.aim import aim_feed, aim_stroke, load_machine
from rallyarc.cli import main
from rallyarc.errors import InputError
from rallyarc.feed import simulate_feed
from rallyarc.output import export
from rallyarc.shot import BallState, Swing, simulate
from rallyarc.units import KMH


def demo():
    sc = domain.load_scenario("demo")
    return sc, BallState.of(*domain.incoming_state(sc.incoming))


def _forward(aim, incoming, conditions):
    """Replay the solved swings through the chain, separately from the solver."""
    sw = aim.result.swing
    swing = Swing(**{f: np.array(getattr(sw, f)) for f in Swing.FIELDS})
    return simulate(incoming, swing, conditions, record=False)


def test_stroke_round_trip_lands_within_5_cm():
    # Requirement: the solved swing, simulated forward, lands within 5 cm of the target.
    sc, incoming = demo()
    tx = np.array([9.0, 10.5, 8.0, 11.0, 7.0])
    ty = np.array([-2.0, 3.0, 0.0, -3.5, 2.5])
    for style in ("tilt", "speed"):
        stroke = domain.load_stroke("topspin_drive")
        res = aim_stroke(incoming, stroke, sc.conditions, tx, ty, free=style)
        assert res.reachable.all(), res.reason
        again = _forward(res, incoming, sc.conditions).metrics
        miss = np.hypot(again["land_x_m"] - tx, again["land_y_m"] - ty)
        assert miss.max() < 0.05


def test_stroke_with_clearance_and_receiver_height_targets():
    sc, incoming = demo()
    stroke = domain.load_stroke("topspin_drive")
    res = aim_stroke(
        incoming, stroke, sc.conditions, [9.5, 10.0], [1.0, -1.0], clearance=[1.2, 0.8]
    )
    assert res.reachable.all()
    m = _forward(res, incoming, sc.conditions).metrics
    assert m["net_clearance_m"] == pytest.approx([1.2, 0.8], abs=0.05)
    res = aim_stroke(incoming, stroke, sc.conditions, 9.5, 1.0, receiver_height=1.1)
    m = _forward(res, incoming, sc.conditions).metrics
    assert res.reachable[0] and m["receiver_height_m"][0] == pytest.approx(1.1, abs=0.05)


def test_unreachable_stroke_target_is_reported_with_the_nearest_landing():
    # A drop-shot swing (28 km/h) cannot send the ball 20 m past the net, whatever the face
    # tilt and direction; the solver must say so and not clip silently.
    sc, incoming = demo()
    stroke = domain.load_stroke("drop_shot")
    res = aim_stroke(incoming, stroke, sc.conditions, [20.0], [0.0], free="tilt")
    assert not res.reachable[0]
    assert res.reason[0]
    assert res.miss_distance()[0] > 0.05  # the nearest landing, not the target
    assert np.isfinite(res.landing()).all()


def test_feed_round_trip_against_the_feed_module():
    # The solved machine settings replayed through rallyarc.feed.simulate_feed (its own flight
    # set-up, launch in the court frame) land within 5 cm of the target.
    sc, _ = demo()
    cond = sc.conditions
    machine = load_machine("club_feeder")
    tx, ty = np.array([-9.8, -8.0, -10.5]), np.array([2.8, -3.0, 0.0])
    res = aim_feed(machine, (11.0, 0.0), cond, tx, ty, [2500, 1000, 0], player_height=1.2)
    assert res.reachable.all(), res.reason
    s = res.settings
    for i in range(3):
        az = s["azimuth"][i]
        horizontal = np.array([math.cos(az), math.sin(az), 0.0])
        axis = np.cross([0.0, 0.0, 1.0], horizontal)
        out = simulate_feed(
            origin=(11.0, 0.0, machine.release_height),
            speed=s["speed"][i],
            elevation=s["elevation"][i],
            azimuth=az,
            spin=s["topspin"][i],
            spin_axis=axis,
            air_density=cond.air.density,
        )
        land = out.record()["landing"]
        assert math.hypot(land["x_m"] - tx[i], land["y_m"] - ty[i]) < 0.05
    assert res.result.metrics["receiver_height_m"] == pytest.approx(1.2, abs=0.05)


def test_feed_outside_the_machine_limits_is_reported():
    sc, _ = demo()
    machine = load_machine("club_feeder")
    fast = aim_feed(machine, (11.0, 0.0), sc.conditions, -9.0, 0.0, 0.0, speed=150 * KMH)
    assert not fast.reachable[0] and "speed" in fast.reason[0]
    spin = aim_feed(machine, (11.0, 0.0), sc.conditions, -9.0, 0.0, 4000.0, speed=80 * KMH)
    assert not spin.reachable[0] and "spin" in spin.reason[0]
    assert spin.settings["topspin"][0] == pytest.approx(machine.spin_max)  # what it can do
    # a target that needs a higher lob than the 45 degree limit at a slow speed
    lob = aim_feed(machine, (11.0, 0.0), sc.conditions, -3.0, 0.0, 0.0, player_height=3.5)
    assert not lob.reachable[0] and lob.reason[0]


def test_exports_reload_with_identical_values(tmp_path):
    sc, incoming = demo()
    from rallyarc.shot import play

    table = play(sc.strokes, sc.conditions, incoming).trajectory_frame(0.005)
    export.write_frame(tmp_path / "t.csv", table)
    export.write_frame(tmp_path / "t.parquet", table)
    pd.testing.assert_frame_equal(pd.read_parquet(tmp_path / "t.parquet"), table)
    back = pd.read_csv(tmp_path / "t.csv")
    for col in ("t_s", "x_m", "z_m", "spin_rpm"):
        assert np.array_equal(back[col].to_numpy(), table[col].to_numpy())  # exact round trip
    assert list(back["phase"]) == list(table["phase"])


def test_atomic_write_leaves_nothing_after_an_interrupt(tmp_path, monkeypatch):
    target = tmp_path / "sheet.csv"
    target.write_text("the coach's own file\n")

    def half_then_interrupt(tmp):
        with open(tmp, "w") as fh:
            fh.write("half a ta")
        raise KeyboardInterrupt

    with pytest.raises(KeyboardInterrupt):
        export.atomic_write(target, half_then_interrupt)
    assert target.read_text() == "the coach's own file\n"
    assert os.listdir(tmp_path) == ["sheet.csv"]  # no partial file left behind
    with pytest.raises(InputError, match="--force"):
        export.check_targets([target], force=False)


def test_drill_command_writes_every_format_and_refuses_to_overwrite(tmp_path):
    out = tmp_path / "drill"
    run = CliRunner().invoke(main, ["drill", "--out", str(out)])
    assert run.exit_code == 0, run.output
    assert "Safety" in run.output and "qualified coaching practice" in run.output
    sheet = pd.read_csv(out / "drill_sheet.csv")
    sheet["note"] = ["" if pd.isna(v) else v for v in sheet["note"]]  # CSV reads "" as missing
    pd.testing.assert_frame_equal(
        pd.read_parquet(out / "drill_sheet.parquet"), sheet, check_dtype=False
    )
    data = json.loads((out / "drill_sheet.json").read_text())
    assert "line of fire" in data["safety"]
    assert len(sheet) == 2 and sheet["reachable"].all()
    assert (sheet["miss_m"] < 0.05).all()
    traj = pd.read_parquet(out / "trajectories.parquet")
    assert set(traj["ball"]) == {1, 2} and {"t_s", "x_m", "spin_rpm", "phase"} <= set(traj)
    from PIL import Image

    img = np.asarray(Image.open(out / "drill_sheet.png").convert("L"), float)
    assert img.shape[0] > img.shape[1] > 800  # a portrait page
    assert img.std() > 10  # not blank
    assert (out / "drill_sheet.pdf").read_bytes()[:4] == b"%PDF"
    before = (out / "drill_sheet.csv").read_bytes()
    again = CliRunner().invoke(main, ["drill", "--out", str(out)])
    assert again.exit_code == 2 and "--force" in again.output
    assert (out / "drill_sheet.csv").read_bytes() == before


def test_bad_drill_files_name_the_key(tmp_path):
    from importlib import resources

    text = (resources.files("rallyarc.configs") / "drills" / "demo_drill.toml").read_text()
    both = tmp_path / "both.toml"
    both.write_text(text.replace("speed_kmh = 55.0", "speed_kmh = 55.0\nheight_at_player_m = 1.0"))
    run = CliRunner().invoke(main, ["drill", str(both)])
    assert run.exit_code == 2 and "both.toml" in run.output and "exactly one" in run.output
    same = tmp_path / "same.toml"
    same.write_text(text.replace("target_m = [-4.5, -2.0]", "target_m = [4.5, -2.0]"))
    run = CliRunner().invoke(main, ["drill", str(same)])
    assert run.exit_code == 2 and "balls[2].target_m" in run.output


def test_aim_commands_print_and_write(tmp_path):
    run = CliRunner().invoke(main, ["aim", "stroke", "--target", "10,2", "--json"])
    data = json.loads(run.output)
    assert data["reachable"] and data["miss_m"] < 0.05
    out = tmp_path / "feed.parquet"
    run = CliRunner().invoke(
        main,
        ["aim", "feed", "--target", "-9,2", "--spin", "1500", "--height", "1.2", "--csv", str(out)],
    )
    assert run.exit_code == 0 and "Safety" in run.output
    traj = pd.read_parquet(out)
    assert traj["x_m"].iloc[0] == pytest.approx(11.0)  # court frame: starts at the machine
    bad = CliRunner().invoke(main, ["aim", "feed", "--target", "9,2", "--speed", "80km/h"])
    assert bad.exit_code == 2 and "--target" in bad.output


def test_an_unreachable_target_exits_with_status_1_after_saying_why():
    """A 40 km/h feed cannot carry 22 m to the far baseline: reported, and the exit status says
    so for scripts (0 solved, 1 not reachable, 2 bad input)."""
    args = ["aim", "feed", "--target", "-11,4", "--spin", "3000", "--speed", "40km/h"]
    run = CliRunner().invoke(main, args)
    assert run.exit_code == 1
    assert "NOT REACHABLE" in run.output and "Safety" in run.output
    stroke = CliRunner().invoke(main, ["aim", "stroke", "--target", "4,0", "--solve", "speed"])
    assert stroke.exit_code in (0, 1)
    assert ("solved" in stroke.output) == (stroke.exit_code == 0)


def test_targets_of_different_strokes_solve_together_as_they_do_apart():
    # The solver's systems are independent: a batch of mixed stroke styles gives each target
    # the swing that a call with its own style alone gives (consistency of the batch design).
    sc, incoming = demo()
    drive, slice_ = domain.load_stroke("topspin_drive"), domain.load_stroke("slice")
    tx, ty = np.array([10.0, 9.0, 8.5]), np.array([2.0, -3.0, 1.0])
    mixed = aim_stroke(incoming, [drive, slice_, drive], sc.conditions, tx, ty)
    for i, stroke in enumerate([drive, slice_, drive]):
        alone = aim_stroke(incoming, stroke, sc.conditions, tx[i], ty[i])
        for name in mixed.settings:
            assert mixed.settings[name][i] == pytest.approx(alone.settings[name][0], abs=1e-12)
        assert mixed.result.swing.swing_path[i] == pytest.approx(stroke.swing_path)
    assert mixed.reachable.all() and mixed.miss_distance().max() < 0.05
    with pytest.raises(ValueError, match="one per target"):
        aim_stroke(incoming, [drive, slice_], sc.conditions, tx, ty)
