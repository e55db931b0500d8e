"""Fixtures of the aim tests."""

import pytest


@pytest.fixture(scope="session")
def aim_cases(scattered_incoming):
    """A factory ``make(n, seed=3)``: n incoming balls scattered around the demo's
    (``scattered_incoming``), random targets (x 4-12.5 m, y -4.5 to 4.5 m) and one of three
    stroke styles for each. Returns the demo scenario, the balls, the strokes, each target's
    stroke index and the targets."""
    from rallyarc import domain

    def make(n, seed=3):
        sc, inc, rng = scattered_incoming(n, seed)
        tx, ty = rng.uniform(4.0, 12.5, n), rng.uniform(-4.5, 4.5, n)
        names = ("topspin_drive", "slice", "heavy_topspin")
        strokes = [domain.load_stroke(s) for s in names]
        return sc, inc, strokes, rng.integers(0, 3, n), tx, ty

    return make
