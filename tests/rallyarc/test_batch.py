"""Batch runs: processes and chunks change nothing; the chain against per-shot solve_ivp."""

import numpy as np
import pytest

from rallyarc import domain
from rallyarc.batch import COMPACT_COLUMNS, RandomShots, ShotArrays, run_batch
from rallyarc.reference import BASELINE, REFERENCE, play_shot, play_shots
from rallyarc.shot import BallState, Swing, play, simulate


@pytest.fixture(scope="module")
def cond():
    return domain.load_scenario("demo").conditions


@pytest.fixture(scope="module")
def shots():
    return RandomShots(700, seed=11)


def _assert_same(got, want):
    assert set(got) == set(want)
    for key, value in want.items():
        np.testing.assert_array_equal(got[key], value, err_msg=key)


def test_two_processes_give_exactly_the_metrics_of_one_simulate_call(cond, shots):
    incoming, swing, serve = shots.take(0, len(shots))
    want = simulate(incoming, swing, cond, serve=serve, record=False).metrics
    # 700 shots in chunks of 50: 14 chunks over 2 processes, finishing in any order
    got = run_batch(ShotArrays(incoming, swing, serve), cond, workers=2, chunk=50).metrics
    _assert_same(got, want)
    # the source drawn chunk by chunk gives the same shots
    _assert_same(run_batch(shots, cond, workers=2, chunk=64).metrics, want)
    # a mixture of outcomes, so that every branch of the chain is compared
    assert {"in", "net", "long"} <= set(want["outcome"])
    assert want["bounce_occurred"].sum() > 100


def test_order_follows_the_shots(cond, shots):
    incoming, swing, serve = shots.take(0, 300)
    order = np.random.default_rng(3).permutation(300)
    shuffled = ShotArrays(
        BallState(incoming.position[order], incoming.velocity[order], incoming.spin[order]),
        Swing(**{f: getattr(swing, f)[order] for f in Swing.FIELDS}),
        serve[order],
    )
    base = run_batch(ShotArrays(incoming, swing, serve), cond, workers=1).metrics
    got = run_batch(shuffled, cond, workers=2, chunk=37).metrics
    _assert_same(got, {k: v[order] for k, v in base.items()})


def test_chunked_run_equals_unchunked(cond, shots):
    whole = run_batch(shots, cond, workers=1, chunk=len(shots)).metrics
    for chunk in (1000, 123, 40):
        _assert_same(run_batch(shots, cond, workers=1, chunk=chunk).metrics, whole)


def test_run_batch_equals_play_with_a_swing_sweep(cond):
    sc = domain.load_scenario("demo")
    incoming = BallState.of(*domain.incoming_state(sc.incoming))
    stroke = domain.load_stroke("topspin_drive")
    speeds = np.linspace(60.0, 100.0, 41) / 3.6
    want = play([stroke], cond, incoming, record=False, head_speed=speeds).metrics
    swing = Swing.from_strokes([stroke], head_speed=speeds)
    source = ShotArrays(
        BallState.of(incoming.position, incoming.velocity, incoming.spin, 41), swing
    )
    _assert_same(run_batch(source, cond, workers=2, chunk=10).metrics, want)


def test_random_shots_can_be_drawn_in_any_pieces():
    a = RandomShots(10_000, seed=5)
    whole = a.take(0, 10_000)
    piece = a.take(4000, 4200)  # across a block boundary
    np.testing.assert_array_equal(piece[0].velocity, whole[0].velocity[4000:4200])
    np.testing.assert_array_equal(piece[1].face_tilt, whole[1].face_tilt[4000:4200])
    np.testing.assert_array_equal(piece[2], whole[2][4000:4200])
    # a shorter run holds the same first shots
    np.testing.assert_array_equal(RandomShots(50, seed=5).take(0, 50)[0].spin, whole[0].spin[:50])
    assert not np.array_equal(RandomShots(50, seed=6).take(0, 50)[0].spin, whole[0].spin[:50])


def test_compact_float32_columns_stay_within_a_millimetre(cond, shots):
    full = run_batch(shots, cond, workers=1).metrics
    compact = run_batch(shots, cond, workers=2, columns=COMPACT_COLUMNS, float_dtype=np.float32)
    assert list(compact.metrics) == list(COMPACT_COLUMNS)
    for key in COMPACT_COLUMNS:
        value = compact.metrics[key]
        if key == "outcome":
            np.testing.assert_array_equal(value, full[key])
            continue
        assert value.dtype == np.float32
        np.testing.assert_allclose(value, full[key], atol=1e-3, rtol=0, equal_nan=True)
    frame = compact.to_frame()
    assert len(frame) == len(shots) and "land_x_m" in frame


def test_bad_settings_are_refused(cond, shots):
    with pytest.raises(ValueError, match="workers"):
        run_batch(shots, cond, workers=0)
    with pytest.raises(ValueError, match="chunk"):
        run_batch(shots, cond, chunk=0)
    assert len(run_batch(RandomShots(0), cond)) == 0


CHECKED = (
    "land_x_m",
    "land_y_m",
    "net_height_m",
    "bounce_apex_m",
    "receiver_height_m",
    "bounce_second_x_m",
)


@pytest.mark.parametrize("solver", [BASELINE], ids=["rk45"])
def test_batch_engine_and_per_shot_rk45_match_solve_ivp_dop853(cond, shots, solver):
    # Reference: scipy solve_ivp DOP853 rtol 1e-10, atol 1e-12, one shot at a time through the
    # same impact and bounce functions (rallyarc.reference). Tolerance 1 mm on every length,
    # 0.1 ms on times; outcomes identical.
    idx = np.arange(0, len(shots), 35)  # 20 shots
    incoming, swing, serve = shots.take(0, len(shots))
    batch = run_batch(shots, cond, workers=1).metrics
    sub_in = BallState(incoming.position[idx], incoming.velocity[idx], incoming.spin[idx])
    sub_sw = Swing(**{f: getattr(swing, f)[idx] for f in Swing.FIELDS})
    ref = play_shots(sub_in, sub_sw, cond, serve[idx], **REFERENCE)
    per_shot = play_shots(sub_in, sub_sw, cond, serve[idx], **solver)
    assert np.isfinite(ref["land_x_m"]).sum() >= 12  # a ball stopped by the net has no landing
    assert np.isfinite(ref["bounce_apex_m"]).sum() >= 5
    for got in ({k: v[idx] for k, v in batch.items()}, per_shot):
        np.testing.assert_array_equal(got["outcome"], ref["outcome"])
        for key in CHECKED:
            np.testing.assert_allclose(got[key], ref[key], atol=1e-3, rtol=0, equal_nan=True)
        np.testing.assert_allclose(got["land_t_s"], ref["land_t_s"], atol=1e-4, equal_nan=True)


def test_demo_strokes_match_solve_ivp_dop853(cond):
    # Reference: scipy solve_ivp DOP853 rtol 1e-10 (rallyarc.reference.play_shot) for each of
    # the demo's six strokes, including the drop shot that bounces twice before the receiver.
    sc = domain.load_scenario("demo")
    incoming = BallState.of(*domain.incoming_state(sc.incoming))
    res = play(sc.strokes, cond, incoming, record=False)
    for i, stroke in enumerate(sc.strokes):
        swing = {f: getattr(stroke, f) for f in Swing.FIELDS}
        ref = play_shot(
            incoming.position[0], incoming.velocity[0], incoming.spin[0], swing, cond, **REFERENCE
        )
        assert res.outcome[i] == ref["outcome"], stroke.name
        for key in CHECKED:
            assert res.metrics[key][i] == pytest.approx(ref[key], abs=1e-3, nan_ok=True), key
