"""Rallies play their shots with the chain's compiled flights (``engine="compiled"`` in
rallyarc.rally.rounds); with numpy's flights they must come out the same: the rallies table
identical, the shot table's strings and flags equal and its numbers within 1e-6 (plus 1e-8 of
their size, for spins in rpm).

Reference: the same rallies with ``rallyarc.shot.simulate``'s numpy flights (its default).

The flights differ by about 1e-14 m; the meeting search and the aim solve of the following
shots magnify that along a rally: about 1e-10 m from the third shot on and up to about 1e-7 m
(6e-6 rpm, 5e-9 of the spin) in the longest rallies of this draw.
"""

import numpy as np
import pandas as pd

from rallyarc.rally import load_patterns, play_rallies, rounds


def test_rallies_with_compiled_flights_are_the_rallies_with_numpys(monkeypatch):
    patterns = load_patterns("demo_match")
    engines = []
    chain = rounds.simulate

    def spy(*args, **kw):
        engines.append(kw.get("engine", "numpy"))
        return chain(*args, **kw)

    monkeypatch.setattr(rounds, "simulate", spy)
    got = play_rallies(patterns, n=300, seed=1)
    assert set(engines) == {"compiled"}

    def numpy_chain(*args, **kw):
        kw["engine"] = "numpy"
        return chain(*args, **kw)

    monkeypatch.setattr(rounds, "simulate", numpy_chain)
    want = play_rallies(patterns, n=300, seed=1)

    pd.testing.assert_frame_equal(got.rallies, want.rallies)
    assert list(got.shots.columns) == list(want.shots.columns)
    assert len(got.shots) == len(want.shots) > 600
    for col in want.shots.columns:
        a, b = got.shots[col].to_numpy(), want.shots[col].to_numpy()
        if b.dtype.kind == "f":
            np.testing.assert_array_equal(np.isnan(a), np.isnan(b), err_msg=col)
            np.testing.assert_allclose(a, b, rtol=1e-8, atol=1e-6, err_msg=col)
        else:
            np.testing.assert_array_equal(a, b, err_msg=col)
