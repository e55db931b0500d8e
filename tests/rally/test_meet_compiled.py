"""The compiled contact search (rallyarc.rally.meet_compiled) against the numpy one.

Reference: the project's numpy contact search, ``rallyarc.rally.meet.meet`` with
``engine="numpy"`` (the target time by the Illinois root, the feasibility at the target, the
sampled search refined by bisection, the unreached reason, all balls at once in numpy). The
kernel runs the same search one ball at a time, evaluating the same quintic Hermite on the same
knots operation for operation, so every field of the :class:`~rallyarc.rally.meet.Contact` must
agree: the found flags, reasons and phases equal, and the times [s], positions [m], velocities
[m/s], spins [rad/s], body positions [m] and stretches within ``TOL`` = 1e-9 (they come out
equal to the bit on these balls).
"""

import importlib
import subprocess
import sys
from dataclasses import replace

import numpy as np
import pandas as pd
import pytest

from rallyarc import court, domain
from rallyarc.rally import load_patterns, play_rallies, rounds
from rallyarc.shot import Swing, simulate

# the module, not the function the rally package exports under the same name
meet_module = importlib.import_module("rallyarc.rally.meet")

TOL = 1e-9
FIELDS_EXACT = ("found", "reason", "phase")
FIELDS_CLOSE = ("t", "position", "velocity", "spin", "target_t", "body", "stretch")


def _shots(scattered_incoming, n, seed=3):
    """n recorded shots from incoming balls scattered around the demo's, three stroke styles and
    scattered face tilts and swing directions (so that they land all over the court)."""
    sc, inc, rng = scattered_incoming(n, seed)
    strokes = [domain.load_stroke(s) for s in ("topspin_drive", "slice", "heavy_topspin")]
    which = rng.integers(0, 3, n)
    base = Swing.from_strokes(strokes)
    swing = Swing(**{f: getattr(base, f)[which] for f in Swing.FIELDS})
    swing = Swing(
        **{
            **{f: getattr(swing, f) for f in Swing.FIELDS},
            "face_tilt": swing.face_tilt + rng.normal(0.0, 0.12, n),
            "swing_direction": rng.normal(0.0, 0.25, n),
            "head_speed": swing.head_speed * rng.uniform(0.7, 1.2, n),
        }
    )
    return simulate(inc, swing, sc.conditions, serve=np.zeros(n, bool))


@pytest.fixture(scope="module")
def shots(scattered_incoming):
    result = _shots(scattered_incoming, 2500)
    assert result.after_bounce is not None
    return result


def _receivers():
    """The demo_match players with every timing, and variants: a contact band above most
    bounces (so that the target is the apex), a low ceiling, a deepest position inside the
    court, a slow late runner."""
    out = []
    for p in load_patterns("demo_match").players:
        for timing in ("rise", "drop", "apex"):
            out.append(replace(p, timing=timing))
        out.append(replace(p, timing="rise", contact_band=(1.8, 2.1), highest=2.2))
        out.append(replace(p, timing="drop", contact_band=(0.3, 0.45), lowest=0.2, highest=0.5))
        out.append(replace(p, timing="drop", deepest_behind=-4.0, home_behind=-6.0))
        out.append(replace(p, timing="apex", run_speed=1.0, reaction=0.9, reach=0.8))
    return out


def _starts(balls, result, kind, rng):
    """Where the receiver stands (n, 2) [m]: home (None), near the bounce, far from it."""
    if kind == "home":
        return None
    bx, by = result.metrics["bounce_x_m"][balls], result.metrics["bounce_y_m"][balls]
    if kind == "near":
        return np.column_stack([bx + rng.uniform(0.5, 4.0, balls.size), by])
    x = court.HALF_LENGTH + rng.uniform(0.0, 4.0, balls.size)
    return np.column_stack([x, -by + rng.choice([-1.0, 1.0], balls.size) * 8.0])


def _assert_same(a, b):
    worst = 0.0
    for f in FIELDS_EXACT:
        x, y = getattr(a, f), getattr(b, f)
        assert x.dtype == y.dtype, f
        np.testing.assert_array_equal(x, y, err_msg=f)
    for f in FIELDS_CLOSE:
        x, y = getattr(a, f), getattr(b, f)
        assert x.shape == y.shape, f
        np.testing.assert_allclose(x, y, rtol=0.0, atol=TOL, err_msg=f)
        worst = max(worst, float(np.max(np.abs(x - y), initial=0.0)))
    return worst


def test_compiled_meet_gives_numpys_contacts(shots):
    balls = shots.after_bounce.shots
    assert balls.size > 1000
    rng = np.random.default_rng(11)
    seen_reasons, seen_phases, found = set(), set(), []
    worst = 0.0
    for receiver in _receivers():
        for kind in ("home", "near", "far"):
            start = _starts(balls, shots, kind, rng)
            want = meet_module.meet(shots, balls, receiver, start, engine="numpy")
            got = meet_module.meet(shots, balls, receiver, start, engine="compiled")
            worst = max(worst, _assert_same(got, want))
            seen_reasons.update(want.reason)
            seen_phases.update(want.phase)
            found.append(want.found)
    found = np.concatenate(found)
    # the cases reach every branch of the search
    assert seen_reasons == {
        "",
        "out of height range",
        "too far to run",
        "past the deepest position",
    }
    assert seen_phases == {"rise", "apex", "drop"}
    assert 0.1 < found.mean() < 0.9
    assert worst <= TOL


def test_compiled_meet_on_subsets_and_no_balls(shots):
    receiver = load_patterns("demo_match").players[0]
    balls = shots.after_bounce.shots
    for part in (balls[:1], balls[::7], balls[-3:]):
        want = meet_module.meet(shots, part, receiver, engine="numpy")
        got = meet_module.meet(shots, part, receiver, engine="compiled")
        _assert_same(got, want)
    empty = meet_module.meet(shots, balls[:0], receiver, engine="compiled")
    assert empty.found.shape == (0,) and empty.t.shape == (0,)


def test_unknown_engine_is_refused(shots):
    receiver = load_patterns("demo_match").players[0]
    with pytest.raises(ValueError, match="numpy, compiled.*'numba'"):
        meet_module.meet(shots, shots.after_bounce.shots[:2], receiver, engine="numba")


def test_rallies_with_compiled_meet_are_the_rallies_with_numpys(monkeypatch):
    patterns = load_patterns("demo_match")
    engines = []
    chain_meet = rounds.meet

    def spy(*args, **kw):
        engines.append(kw.get("engine", "numpy"))
        return chain_meet(*args, **kw)

    monkeypatch.setattr(rounds, "meet", spy)
    got = play_rallies(patterns, n=300, seed=1, workers=1)
    assert set(engines) == {"compiled"}

    def numpy_meet(*args, **kw):
        kw["engine"] = "numpy"
        return chain_meet(*args, **kw)

    monkeypatch.setattr(rounds, "meet", numpy_meet)
    want = play_rallies(patterns, n=300, seed=1, workers=1)

    pd.testing.assert_frame_equal(got.rallies, want.rallies)
    assert len(got.shots) == len(want.shots) > 600
    pd.testing.assert_frame_equal(got.shots, want.shots, check_exact=False, rtol=0.0, atol=TOL)


def test_importing_the_rally_package_leaves_numba_unloaded():
    code = (
        "import sys, rallyarc.rally, rallyarc.rally.meet; print('numba' in sys.modules); "
        "import rallyarc.rally.meet_compiled; print('numba' in sys.modules)"
    )
    out = subprocess.run(
        [sys.executable, "-P", "-c", code], capture_output=True, text=True, check=True
    )
    assert out.stdout.split() == ["False", "True"]
