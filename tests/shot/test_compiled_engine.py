"""The chain with its impact and flights compiled (``simulate(..., engine="compiled")``) against
the chain with numpy's.

Reference: the chain with the numpy contact and integrator (``engine="numpy"``, the default),
whose flights are checked against solve_ivp and whose contact against the published worked
values elsewhere. The compiled impact and flights run the same models (see
tests/impact/test_compiled.py and tests/flight/test_compiled.py), so every metric must agree:
floats within ``TOL`` = 1e-9 (NaN where numpy's are NaN), strings and flags equal.
"""

from dataclasses import dataclass, replace

import numpy as np
import pytest

from rallyarc import domain
from rallyarc.flight.forces import FlightParams
from rallyarc.shot import BallState, Swing, simulate, stages

TOL = 1e-9


def _shots(scattered_incoming, n, seed):
    """n incoming balls scattered around the demo's, three stroke styles with scattered face
    tilt, swing direction and head speed, a few serve flags."""
    sc, inc, rng = scattered_incoming(n, seed)
    strokes = [domain.load_stroke(s) for s in ("topspin_drive", "slice", "heavy_topspin")]
    which = rng.integers(0, 3, n)
    base = Swing.from_strokes(strokes)
    fields = {f: getattr(base, f)[which] for f in Swing.FIELDS}
    fields["face_tilt"] = fields["face_tilt"] + rng.normal(0.0, 0.15, n)
    fields["swing_direction"] = rng.normal(0.0, 0.3, n)
    fields["head_speed"] = fields["head_speed"] * rng.uniform(0.6, 1.3, n)
    serve = rng.random(n) < 0.1
    return sc.conditions, inc, Swing(**fields), serve


def _assert_same_metrics(got, want):
    assert set(got) == set(want)
    for key, b in want.items():
        a = got[key]
        if b.dtype.kind == "f":
            np.testing.assert_array_equal(np.isnan(a), np.isnan(b), err_msg=key)
            np.testing.assert_allclose(a, b, rtol=0, atol=TOL, err_msg=key)
        else:
            np.testing.assert_array_equal(a, b, err_msg=key)


@pytest.mark.parametrize("record", [True, False])
def test_compiled_chain_gives_numpys_metrics_on_thousands_of_shots(scattered_incoming, record):
    conditions, inc, swing, serve = _shots(scattered_incoming, 3000, seed=21 if record else 22)
    want = simulate(inc, swing, conditions, serve=serve, record=record)
    got = simulate(inc, swing, conditions, serve=serve, record=record, engine="compiled")
    _assert_same_metrics(got.metrics, want.metrics)
    # the draw reaches the chain's branches: every outcome, bounces, receiver reached or not
    outcome = want.metrics["outcome"]
    assert {"in", "out", "net"} <= set(outcome)
    assert want.metrics["bounce_occurred"].mean() > 0.2
    reached = want.metrics["receiver_reached"]
    assert reached.any() and not reached.all()
    if record:
        # the drawn paths: sampled at the same times, the same points
        shots = np.flatnonzero(want.metrics["bounce_occurred"])[:200]
        times = np.linspace(0.0, 3.0, 61)
        for a, b in zip(got.sample(times, shots), want.sample(times, shots), strict=True):
            if np.asarray(b).dtype.kind == "f":
                np.testing.assert_allclose(a, b, rtol=0, atol=TOL)
            else:
                np.testing.assert_array_equal(a, b)


def test_the_compiled_chain_flies_with_numpy_for_an_aero_model_without_a_compiled_form(
    scattered_incoming,
):
    class OtherAero:
        def drag(self, s):
            return np.full_like(np.asarray(s, dtype=float), 0.5)

        def lift_slope(self, s):
            return np.full_like(np.asarray(s, dtype=float), 1.0)

    params = FlightParams(aero=OtherAero())
    supported = FlightParams()
    assert stages.compiled_flight(params, "compiled") is None
    assert stages.compiled_flight(supported, "numpy") is None
    assert stages.compiled_flight(supported, "compiled") is not None
    for engine in ("fast", None):
        with pytest.raises(ValueError, match="engine"):
            stages.compiled_flight(supported, engine)
    conditions, inc, swing, serve = _shots(scattered_incoming, 3, seed=1)
    with pytest.raises(ValueError, match="engine"):
        simulate(inc, swing, conditions, engine="fast")


@pytest.mark.parametrize("friction_only", [False, True])
def test_compiled_impact_gives_numpys_metrics_for_every_racket_and_impact_point(
    monkeypatch, friction_only, scattered_incoming
):
    """The chain with its impact compiled as well as its flights (rallyarc.impact.compiled):
    the three racket presets, impact points scattered over the head and off the axis, with and
    without the strings' spring-back; every metric as numpy's, and the compiled contact is the
    one played."""
    from rallyarc.impact import compiled

    n = 1000
    base, inc, swing, serve = _shots(scattered_incoming, 3 * n, seed=31 + friction_only)
    rng = np.random.default_rng(5 + friction_only)
    fields = {f: getattr(swing, f) for f in Swing.FIELDS}
    fields["impact_from_butt"] = rng.uniform(0.42, 0.64, 3 * n)
    fields["impact_offaxis"] = rng.uniform(-0.05, 0.05, 3 * n)
    # a few balls run away from the face faster than it swings: the racket misses them
    velocity = inc.velocity.copy()
    velocity[rng.random(3 * n) < 0.03] = (70.0, 0.0, 0.0)
    inc = BallState(inc.position, velocity, inc.spin)
    struck = []
    kernel = compiled.hit
    monkeypatch.setattr(compiled, "hit", lambda *a: struck.append(len(a[0])) or kernel(*a))
    regimes = set()
    for k, racket in enumerate(("light", "standard", "heavy")):
        conditions = replace(base, racket=domain.load_racket(racket), friction_only=friction_only)
        part = slice(k * n, (k + 1) * n)
        balls = BallState(inc.position[part], inc.velocity[part], inc.spin[part])
        swings = Swing(**{f: v[part] for f, v in fields.items()})
        want = simulate(balls, swings, conditions, serve=serve[part], record=False)
        got = simulate(
            balls, swings, conditions, serve=serve[part], record=False, engine="compiled"
        )
        _assert_same_metrics(got.metrics, want.metrics)
        regimes |= set(want.metrics["impact_regime"])
    assert struck == [n, n, n]
    # the contact point that stops slips back only where the strings spring back
    assert regimes == {"grip", "slide", "none"} | (set() if friction_only else {"grip-slip"})
    assert "miss" in set(want.metrics["outcome"])


def test_the_compiled_chain_strikes_with_numpy_for_a_racket_without_a_compiled_form(
    scattered_incoming,
):
    @dataclass(frozen=True)
    class PerBallRacket:
        """A racket whose mass is given per ball (numpy's contact broadcasts it)."""

        mass_kg: object
        balance_m: float = 0.32
        swingweight_kgm2: float = 0.032
        twistweight_kgm2: float = 0.0015
        length_m: float = 0.686

    conditions, inc, swing, serve = _shots(scattered_incoming, 40, seed=3)
    assert stages.compiled_impact(conditions.racket.racket, "compiled") is not None
    assert stages.compiled_impact(conditions.racket.racket, "numpy") is None
    with pytest.raises(ValueError, match="engine"):
        stages.compiled_impact(conditions.racket.racket, "fast")
    per_ball = PerBallRacket(np.linspace(0.28, 0.35, 40))
    assert stages.compiled_impact(per_ball, "compiled") is None
    played = replace(conditions, racket=replace(conditions.racket, racket=per_ball))
    want = simulate(inc, swing, played, serve=serve, record=False)
    got = simulate(inc, swing, played, serve=serve, record=False, engine="compiled")
    _assert_same_metrics(got.metrics, want.metrics)
