"""The rally's warm start (rallyarc.rally.warm): the fit reproduces a relation it can represent,
a solve that starts from a guess reaches the verdicts and landings of the default start, and a
block played with warm starts has the statistics of one played without.

References: the aim solver's own default start (the stroke's swing, the swing direction toward
the target) on the same targets, and the same rallies played without warm starts; the fit is
checked against values built from known coefficients (exact algebra, no outside source needed).
"""

import importlib

import numpy as np
import pytest

from rallyarc import domain
from rallyarc.aim import LAND_TOL_M, aim_stroke
from rallyarc.rally import load_patterns, play_rallies, rounds
from rallyarc.rally.warm import FITTED, MIN_SHOTS, WarmStart, features
from rallyarc.shot import BallState, Swing

warm_module = importlib.import_module("rallyarc.rally.warm")


def _balls(n, seed):
    rng = np.random.default_rng(seed)
    return BallState(
        rng.normal([-12.5, 0.0, 1.0], [0.5, 2.0, 0.2], (n, 3)),
        rng.normal([22.0, 0.0, 2.0], [4.0, 2.0, 2.0], (n, 3)),
        rng.normal([0.0, 150.0, 0.0], [20.0, 80.0, 20.0], (n, 3)),
    )


@pytest.mark.parametrize("ridge, tol", [(0.0, 1e-9), (None, 1e-5)])
def test_the_fit_reproduces_values_linear_in_its_features(ridge, tol, monkeypatch):
    # exact without the ridge; the default ridge biases the fit by a few parts in a million
    if ridge is not None:
        monkeypatch.setattr(warm_module, "RIDGE", ridge)
    rng = np.random.default_rng(4)
    coef = rng.normal(0.0, 0.1, (17, 3))
    warm = WarmStart()
    names = list(FITTED)
    for seed in range(3):
        ball = _balls(400, seed)
        tx, ty = rng.uniform(5.0, 11.0, 400), rng.uniform(-4.0, 4.0, 400)
        tilt, offset, speed = (features(ball, tx, ty) @ coef).T
        heading = np.arctan2(ty - ball.position[:, 1], tx - ball.position[:, 0])
        swing = Swing(
            head_speed=speed + 25.0,
            swing_path=np.zeros(400),
            swing_direction=heading + offset,
            face_tilt=tilt,
            face_azimuth=np.zeros(400),
            racket_roll=np.zeros(400),
            impact_from_butt=np.full(400, 0.52),
            impact_offaxis=np.zeros(400),
        )
        if seed < 2:
            warm.learn("style", ball, tx, ty, swing, np.ones(400, bool))
    guess = warm.guess("style", ball, tx, ty, names)
    want = np.column_stack([swing.face_tilt, swing.swing_direction, swing.head_speed])
    assert np.abs(guess - want).max() < tol


def test_no_guess_before_enough_shots_are_solved():
    warm = WarmStart()
    ball = _balls(MIN_SHOTS - 1, 1)
    tx, ty = np.full(len(ball), 8.0), np.zeros(len(ball))
    assert np.isnan(warm.guess("style", ball, tx, ty, ["face_tilt"])).all()
    swing = Swing.from_strokes([domain.load_stroke("topspin_drive")] * len(ball))
    warm.learn("style", ball, tx, ty, swing, np.ones(len(ball), bool))
    assert np.isnan(warm.guess("style", ball, tx, ty, ["face_tilt"])).all()
    assert np.isnan(warm.guess("other", ball, tx, ty, ["face_tilt"])).all()


def _targets(scattered_incoming, n, seed=9):
    sc, inc, rng = scattered_incoming(n, seed)
    tx, ty = rng.uniform(4.0, 12.5, n), rng.uniform(-4.5, 4.5, n)
    strokes = [domain.load_stroke(s) for s in ("topspin_drive", "slice", "heavy_topspin")]
    return sc, inc, strokes, rng.integers(0, 3, n), tx, ty


@pytest.mark.parametrize("clearance", [None, 1.2])
def test_a_solve_from_a_guess_reaches_the_default_starts_verdicts(clearance, scattered_incoming):
    # a guess a degree or two from the solution (as the warm start gives) changes where the
    # solver starts, not what it finds: the same verdicts, landings within the tolerance
    n = 2000
    sc, inc, strokes, which, tx, ty = _targets(scattered_incoming, n)
    kw = {"which": which, "clearance": clearance, "play": False}
    plain = aim_stroke(inc, strokes, sc.conditions, tx, ty, **kw)
    names = list(plain.settings)
    solved = np.stack([plain.settings[k] for k in names], axis=1)
    rng = np.random.default_rng(2)
    step = np.array([1.0 if k == "head_speed" else np.radians(1.0) for k in names])
    guess = solved + rng.normal(0.0, 1.5, solved.shape) * step
    warm = aim_stroke(inc, strokes, sc.conditions, tx, ty, start=guess, **kw)
    assert np.mean(warm.reachable == plain.reachable) >= 0.995
    for res in (plain, warm):
        assert res.miss_distance()[res.reachable].max() <= LAND_TOL_M + 1e-9
    both = warm.reachable & plain.reachable
    apart = np.hypot(*(warm.landing()[both] - plain.landing()[both]).T)
    assert apart.max() <= 2 * LAND_TOL_M


def test_a_start_of_the_wrong_shape_is_refused(scattered_incoming):
    sc, inc, strokes, which, tx, ty = _targets(scattered_incoming, 10)
    with pytest.raises(ValueError, match="start must be shaped"):
        aim_stroke(inc, strokes, sc.conditions, tx, ty, which=which, start=np.zeros((10, 3)))


def test_warm_started_rallies_have_the_statistics_of_cold_started_ones(monkeypatch):
    patterns = load_patterns("demo_match")
    warm = play_rallies(patterns, n=1000, seed=3)

    class Cold(WarmStart):
        def guess(self, key, ball, target_x, target_y, names):
            return np.full((len(target_x), len(names)), np.nan)

    monkeypatch.setattr(rounds, "WarmStart", Cold)
    cold = play_rallies(patterns, n=1000, seed=3)
    # the same draws; only where the solver starts differs, so a few marginal shots change
    assert abs(len(warm.shots) - len(cold.shots)) <= 0.01 * len(cold.shots)
    for col, share in (("ending", 0.02), ("winner", 0.02)):
        a = warm.rallies[col].value_counts(normalize=True)
        b = cold.rallies[col].value_counts(normalize=True)
        assert (a.reindex(b.index, fill_value=0) - b).abs().max() <= share, col
    assert abs(warm.shots["aim_solved"].mean() - cold.shots["aim_solved"].mean()) <= 0.005
    # and the warm start did start the solver elsewhere: the solved swings are not identical
    assert not np.array_equal(warm.shots["face_tilt_deg"], cold.shots["face_tilt_deg"])
