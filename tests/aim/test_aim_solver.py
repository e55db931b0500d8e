"""The aim solver's rules: the residual's part of the chain computes what the whole chain does,
the Broyden rule agrees with the finite-difference (Newton) rule on a few thousand targets, and
targets with and without a clearance goal solve together as they do apart."""

import numpy as np
import pytest

from rallyarc import domain
from rallyarc.aim import LAND_TOL_M, aim_stroke
from rallyarc.aim.first import struck
from rallyarc.shot import BallState, Swing, simulate


def test_the_first_flight_gives_the_whole_chains_numbers(aim_cases):
    # the aim's residual flies only to the first bounce, with two events: its numbers must be
    # the whole chain's, bit for bit, so the solutions are the same as with the whole chain
    sc, inc, strokes, which, _, _ = aim_cases(3000)
    rng = np.random.default_rng(5)
    base = Swing.from_strokes(strokes)
    swing = Swing(**{f: getattr(base, f)[which] for f in Swing.FIELDS})
    swing = Swing(
        **{
            **{f: getattr(swing, f) for f in Swing.FIELDS},
            "face_tilt": swing.face_tilt + rng.normal(0.0, 0.15, which.size),
            "swing_direction": rng.normal(0.0, 0.3, which.size),
        }
    )
    serve = np.zeros(which.size, bool)
    whole = simulate(inc, swing, sc.conditions, serve=serve, record=False).metrics
    first = struck(inc, swing, sc.conditions, serve)
    assert set(first) < set(whole)
    assert "flight_peak_m" not in first and "bounce_x_m" not in first
    for key, value in first.items():
        nan = value.dtype.kind == "f"
        assert np.array_equal(value, whole[key], equal_nan=nan), key


@pytest.mark.parametrize("clearance", [None, 1.2])
def test_broyden_and_newton_agree_on_thousands_of_targets(clearance, aim_cases):
    n = 2000 if clearance is None else 1000
    sc, inc, strokes, which, tx, ty = aim_cases(n)
    kw = {"which": which, "clearance": clearance, "play": False}
    newton = aim_stroke(inc, strokes, sc.conditions, tx, ty, method="newton", **kw)
    broyden = aim_stroke(inc, strokes, sc.conditions, tx, ty, method="broyden", **kw)
    # the same verdict for (nearly) every target; every solved target lands within the
    # tolerance under both rules
    assert np.mean(newton.reachable == broyden.reachable) >= 0.99
    for res in (newton, broyden):
        assert res.miss_distance()[res.reachable].max() <= LAND_TOL_M + 1e-9
    both = newton.reachable & broyden.reachable
    apart = np.hypot(*(newton.landing()[both] - broyden.landing()[both]).T)
    assert apart.max() <= 2 * LAND_TOL_M
    if clearance is not None:
        for res in (newton, broyden):
            got = res.metrics["net_clearance_m"][res.reachable]
            assert np.abs(got - clearance).max() <= 0.02 + 1e-9


def test_targets_with_and_without_a_clearance_solve_together_as_apart(aim_cases):
    sc, inc, strokes, which, tx, ty = aim_cases(60, seed=8)
    goal = np.where(np.arange(60) % 3 == 0, 1.3, np.nan)
    has = np.isfinite(goal)
    for method in ("newton", "broyden"):
        both = aim_stroke(
            inc, strokes, sc.conditions, tx, ty, which=which, clearance=goal, method=method
        )
        for part, clearance in ((has, 1.3), (~has, None)):
            sub = BallState(inc.position[part], inc.velocity[part], inc.spin[part])
            alone = aim_stroke(
                sub,
                strokes,
                sc.conditions,
                tx[part],
                ty[part],
                which=which[part],
                clearance=clearance,
                method=method,
            )
            for f in Swing.FIELDS:
                assert np.array_equal(getattr(both.swing, f)[part], getattr(alone.swing, f)), f
            assert np.array_equal(both.reachable[part], alone.reachable)
            assert np.array_equal(both.reason[part], alone.reason)
        # without a goal the stroke's head speed is kept
        assert np.array_equal(
            both.swing.head_speed[~has], Swing.from_strokes(strokes).head_speed[which[~has]]
        )


def test_an_unplayed_aim_gives_the_played_aims_swings_and_verdicts(aim_cases):
    sc, inc, strokes, which, tx, ty = aim_cases(40, seed=11)
    played = aim_stroke(inc, strokes, sc.conditions, tx, ty, which=which)
    bare = aim_stroke(inc, strokes, sc.conditions, tx, ty, which=which, play=False)
    assert bare.result is None and played.result is not None
    for f in Swing.FIELDS:
        assert np.array_equal(getattr(bare.swing, f), getattr(played.result.swing, f))
    assert np.array_equal(bare.reachable, played.reachable)
    assert np.array_equal(bare.reason, played.reason)
    assert np.array_equal(bare.landing(), played.landing(), equal_nan=True)


def test_an_unknown_method_is_refused(aim_cases):
    sc, inc, strokes, which, tx, ty = aim_cases(2)
    with pytest.raises(ValueError, match="method"):
        aim_stroke(inc, strokes, sc.conditions, tx, ty, which=which, method="guess")


def test_the_compiled_first_flight_gives_the_numpy_aims_verdicts_and_landings(aim_cases):
    # the rally's engine: the residual's first flight compiled (rallyarc.flight.compiled), the
    # same algorithm as numpy's to about 1e-12; the solves must end with the same verdicts
    # and land within 1e-6 m of each other on thousands of targets
    sc, inc, strokes, which, tx, ty = aim_cases(2000)
    kw = {"which": which, "play": False}
    ref = aim_stroke(inc, strokes, sc.conditions, tx, ty, engine="numpy", **kw)
    got = aim_stroke(inc, strokes, sc.conditions, tx, ty, engine="compiled", **kw)
    assert 0.2 < ref.reachable.mean() < 1.0  # both verdicts occur
    assert np.array_equal(got.reachable, ref.reachable)
    assert np.array_equal(got.reason, ref.reason)
    land_ref, land_got = ref.landing(), got.landing()
    assert np.array_equal(np.isnan(land_got), np.isnan(land_ref))
    apart = np.hypot(*(land_got - land_ref).T)
    assert np.nanmax(apart) <= 1e-6


def test_the_compiled_engine_flies_with_numpy_when_the_aero_model_has_no_compiled_form(
    monkeypatch, aim_cases
):
    from rallyarc.aim.first import _flight
    from rallyarc.flight import compiled
    from rallyarc.flight.forces import FlightParams

    class OtherAero:
        def drag(self, s):
            return np.full_like(np.asarray(s, dtype=float), 0.5)

        def lift_slope(self, s):
            return np.full_like(np.asarray(s, dtype=float), 1.0)

    _, inc, _, _, _, _ = aim_cases(50)
    calls = []
    kernel = compiled.fly_net_and_ground
    monkeypatch.setattr(
        compiled, "fly_net_and_ground", lambda *a, **k: calls.append(1) or kernel(*a, **k)
    )
    supported = domain.load_scenario("demo").conditions.flight_params()
    _flight(inc, supported, 1e-6, engine="compiled")
    assert calls == [1]  # a supported model flies compiled
    other = FlightParams(mass=supported.mass, radius=supported.radius, aero=OtherAero())
    got = _flight(inc, other, 1e-6, engine="compiled")
    want = _flight(inc, other, 1e-6, engine="numpy")
    assert calls == [1]  # the other model did not reach the kernel
    assert np.array_equal(got.events["ground"].position, want.events["ground"].position)
    assert np.array_equal(got.n_steps, want.n_steps)
    with pytest.raises(ValueError, match="engine"):
        _flight(inc, supported, 1e-6, engine="fast")
    sc, inc2, strokes, which, tx, ty = aim_cases(2)
    with pytest.raises(ValueError, match="engine"):
        aim_stroke(inc2, strokes, sc.conditions, tx, ty, which=which, engine="fast")


def test_the_residual_strikes_compiled_with_the_compiled_engine(monkeypatch, aim_cases):
    # struck(..., engine="compiled") plays the impact with rallyarc.impact.compiled.hit: the
    # same impact, net and landing metrics as numpy's on thousands of swings (floats within
    # 1e-9, NaN alike, strings and flags equal)
    from rallyarc.impact import compiled

    sc, inc, strokes, which, _, _ = aim_cases(3000, seed=8)
    rng = np.random.default_rng(9)
    base = Swing.from_strokes(strokes)
    fields = {f: getattr(base, f)[which] for f in Swing.FIELDS}
    fields["face_tilt"] = fields["face_tilt"] + rng.normal(0.0, 0.15, which.size)
    fields["impact_offaxis"] = rng.uniform(-0.05, 0.05, which.size)
    swing = Swing(**fields)
    serve = np.zeros(which.size, bool)
    calls = []
    kernel = compiled.hit
    monkeypatch.setattr(compiled, "hit", lambda *a: calls.append(len(a[0])) or kernel(*a))
    want = struck(inc, swing, sc.conditions, serve, engine="numpy")
    assert calls == []
    got = struck(inc, swing, sc.conditions, serve, engine="compiled")
    assert calls == [which.size]
    assert set(got) == set(want)
    assert {"grip", "slide"} <= set(want["impact_regime"])
    for key, b in want.items():
        a = got[key]
        if b.dtype.kind == "f":
            np.testing.assert_array_equal(np.isnan(a), np.isnan(b), err_msg=key)
            np.testing.assert_allclose(a, b, rtol=0, atol=1e-9, err_msg=key)
        else:
            np.testing.assert_array_equal(a, b, err_msg=key)
