"""Sampling some shots of a result gives those shots' columns of sampling them all."""

import numpy as np

from rallyarc import domain
from rallyarc.batch import RandomShots
from rallyarc.shot import simulate


def test_sampling_a_subset_matches_sampling_every_shot():
    cond = domain.load_scenario("demo").conditions
    inc, swing, serve = RandomShots(60, seed=7).take(0, 60)
    res = simulate(inc, swing, cond, serve=serve)
    times = np.linspace(0.0, 3.0, 200)
    every = res.sample(times)
    shots = np.array([0, 7, 8, 33, 59, 7])
    some = res.sample(times, shots)
    for a, b in zip(every, some, strict=True):
        assert np.array_equal(a[:, shots], b)
    for i in (0, 33, 59):
        t, pos, phase = res.path(i)
        _, _, _, ph = res.sample(t, [i])
        assert np.all(np.diff(t) >= 0) and np.array_equal(pos[0], res.incoming.position[i])
        assert set(np.unique(phase)) <= {0, 1} and ph.shape == (t.size, 1)
