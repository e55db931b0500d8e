"""The compiled stroke solve (rallyarc.aim.compiled, taken by ``aim_stroke(engine="compiled")``)
against the numpy solver (rallyarc.aim.solver.solve) of the same method, "newton" or "broyden",
on the same residual, the compiled one of the numpy path: the same verdicts, the same iteration
count and the same parameters on thousands of targets, with and without a net clearance, with
NaN clearances mixed in, with and without a start; and 300 demo_match rallies with the same
tables.

On the machine these tests were written on the parameters are bit for bit the numpy solver's
(the compiled sums follow the order of numpy's BLAS); the tests bound them at 1e-9.
"""

import numpy as np
import pytest

from rallyarc.aim import aim_stroke, stroke
from rallyarc.aim import compiled as aim_compiled
from rallyarc.aim.solver import solve


@pytest.fixture
def compiled_calls(monkeypatch):
    """Counts the compiled solves that ran (returned a solution)."""
    calls = []
    solve_stroke = aim_compiled.solve_stroke

    def counted(*args, **kw):
        out = solve_stroke(*args, **kw)
        calls.append(out is not None)
        return out

    monkeypatch.setattr(aim_compiled, "solve_stroke", counted)
    return calls


def _numpy_solver(monkeypatch):
    """From here on, aim_stroke solves with the numpy solver whatever the engine."""
    monkeypatch.setattr(stroke, "_compiled_solve", lambda *args: None)


def _goal(kind, n, rng):
    if kind == "none":
        return None
    if kind == "all":
        return rng.uniform(0.6, 1.8, n)
    return np.where(rng.random(n) < 0.4, rng.uniform(0.6, 1.8, n), np.nan)


@pytest.mark.parametrize("method", ["newton", "broyden"])
@pytest.mark.parametrize("start", [False, True])
@pytest.mark.parametrize("kind", ["none", "all", "mixed"])
def test_the_compiled_solve_is_the_numpy_solvers(
    kind, start, method, compiled_calls, monkeypatch, aim_cases
):
    n = 3000 if kind == "none" else 1500
    sc, inc, strokes, which, tx, ty = aim_cases(n, seed=11)
    rng = np.random.default_rng(12)
    clearance = _goal(kind, n, rng)
    kw = {"which": which, "clearance": clearance, "play": False, "engine": "compiled"}
    kw["method"] = method
    guess = None
    if start:
        # face tilt, swing direction [rad] and, with a clearance, head speed [m/s]
        lo, hi = (
            [np.radians(-10.0), np.radians(-20.0), 15.0],
            [np.radians(30.0), np.radians(20.0), 40.0],
        )
        k = 2 if clearance is None else 3
        guess = rng.uniform(lo[:k], hi[:k], (n, k))
        # some start face down, into the ground short of the net (no clearance there)
        guess[rng.random(n) < 0.2, 0] = np.radians(-38.0)
        guess[rng.random((n, k)) < 0.15] = np.nan  # the default start for these
    got = aim_stroke(inc, strokes, sc.conditions, tx, ty, start=guess, **kw)
    assert compiled_calls == [True]
    _numpy_solver(monkeypatch)
    want = aim_stroke(inc, strokes, sc.conditions, tx, ty, start=guess, **kw)
    assert compiled_calls == [True]  # the reference did not run the compiled solve
    assert list(got.settings) == list(want.settings)
    for name in want.settings:
        np.testing.assert_allclose(got.settings[name], want.settings[name], rtol=0, atol=1e-9)
    np.testing.assert_array_equal(got.reachable, want.reachable)
    np.testing.assert_array_equal(got.reason, want.reason)
    assert got.iterations == want.iterations <= 30
    # a real solve: most targets are reached, some are not, and some need many iterations
    assert 0.5 < want.reachable.mean() < 1.0
    assert want.iterations >= 5


@pytest.mark.parametrize("method", ["newton", "broyden"])
def test_each_targets_iterations_and_the_cap(method, compiled_calls, monkeypatch, aim_cases):
    # the batch's count is the largest of the targets' counts, as numpy counts for the batch;
    # a lower cap stops both solvers at the same parameters. Broyden's batch has clearances
    # for some targets: without them it refreshes no differences
    sc, inc, strokes, which, tx, ty = aim_cases(400, seed=13)
    clearance = None
    if method == "broyden":
        clearance = _goal("mixed", 400, np.random.default_rng(5))
    system_of = {}
    solve_stroke = aim_compiled.solve_stroke

    def kept(system, p0, lo, hi, scale, active=None, iterations=30, method="newton"):
        system_of["args"] = (system, p0.copy(), lo, hi, scale, active)
        return solve_stroke(system, p0, lo, hi, scale, active, iterations, method)

    monkeypatch.setattr(aim_compiled, "solve_stroke", kept)
    res = aim_stroke(
        inc, strokes, sc.conditions, tx, ty, which=which, clearance=clearance, play=False,
        engine="compiled", method=method,
    )  # fmt: skip
    system, p0, lo, hi, scale, active = system_of["args"]
    p, solved, iters, each = solve_stroke(system, p0, lo, hi, scale, active, method=method)
    assert iters == res.iterations == each.max()
    assert len(set(each.tolist())) >= 3  # targets stop after different counts

    # numpy's count for a target: the iterations whose one call of the residual holds its
    # points (every iteration after the start evaluates each open target's trial, or the
    # perturbations of those taking differences, which hold a target more than once)
    counted, calls, refreshed = np.zeros(len(p0), int), [], []

    def evaluate(q, idx):
        if calls:
            rows, times = np.unique(idx, return_counts=True)
            counted[rows] += 1
            refreshed.append(np.sum(times > 1))
        calls.append(idx.size)
        return system.evaluate(q, idx)

    _, _, it_n = solve(evaluate, p0, lo, hi, scale, method=method, active=active)
    assert it_n == iters == len(calls) - 1
    np.testing.assert_array_equal(each, counted)
    if method == "broyden":
        assert sum(refreshed) > 50  # targets that refresh their differences on the way

    caps = (1, 3) if method == "newton" else (1, 2, 3, 4, 5, 8, 13)
    assert iters > max(caps)
    for cap in caps:
        p_c, ok_c, it_c, each_c = solve_stroke(system, p0, lo, hi, scale, active, cap, method)
        p_n, ok_n, it_n = solve(
            system.evaluate, p0, lo, hi, scale, iterations=cap, method=method, active=active
        )
        assert it_c == it_n == cap
        assert (each_c <= cap).all()
        np.testing.assert_array_equal(ok_c, ok_n)
        np.testing.assert_allclose(p_c, p_n, rtol=0, atol=1e-9)


def test_what_the_compiled_solve_does_not_take_goes_to_numpy(compiled_calls, aim_cases):
    sc, inc, strokes, which, tx, ty = aim_cases(20, seed=14)
    kw = {"which": which, "play": False}
    aim_stroke(inc, strokes, sc.conditions, tx, ty, engine="numpy", **kw)
    aim_stroke(inc, strokes, sc.conditions, tx, ty, engine="compiled", receiver_height=1.0, **kw)
    assert compiled_calls == []
    aim_stroke(inc, strokes, sc.conditions, tx, ty, engine="compiled", free="speed", **kw)
    aim_stroke(inc, strokes, sc.conditions, tx, ty, engine="compiled", method="broyden", **kw)
    assert compiled_calls == [True, True]
    with pytest.raises(ValueError, match="method must be one of"):
        aim_stroke(inc, strokes, sc.conditions, tx, ty, engine="compiled", method="bfgs", **kw)


def test_rallies_with_the_compiled_solve_are_the_numpy_solvers(
    compiled_calls, monkeypatch, same_rallies
):
    from rallyarc.rally import load_patterns, play_rallies

    patterns = load_patterns("demo_match")
    got = play_rallies(patterns, n=300, seed=1, workers=1)
    assert len(compiled_calls) > 20 and all(compiled_calls)
    _numpy_solver(monkeypatch)
    n_calls = len(compiled_calls)
    want = play_rallies(patterns, n=300, seed=1, workers=1)
    assert len(compiled_calls) == n_calls
    same_rallies(got, want, rtol=1e-9, atol=1e-9)
