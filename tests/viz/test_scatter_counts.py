"""Scattered figures count every ball: the top view's legend gives each stroke's outcome shares,
balls stopped by the net are marked on it, and the ellipse is fitted to the balls that landed in
only."""

import numpy as np
import pytest
from matplotlib.patches import Ellipse

from rallyarc import domain, sweep
from rallyarc.cli.conditions import ball_state
from rallyarc.viz import top
from rallyarc.viz.common import outcome_counts, outcome_shares_text


@pytest.fixture(scope="module")
def scattered():
    sc = domain.load_scenario("demo")
    strokes = [s for s in sc.strokes if s.name in ("drop_shot", "topspin_drive")]
    return sweep.dispersion(strokes, sc.conditions, ball_state(sc.incoming), 40, seed=0)


def test_the_legend_gives_every_ball_of_each_stroke(scattered):
    fig = top.top_view(scattered)
    texts = [t.get_text() for t in fig.legends[0].get_texts()]
    outcomes = np.asarray(scattered.metrics["outcome"]).astype(str)
    for label in ("drop_shot", "topspin_drive"):
        idx = np.flatnonzero(scattered.labels == label)
        counts = outcome_counts(scattered, idx)
        assert sum(counts.values()) == len(idx) == 40
        assert counts == {o: int(np.sum(outcomes[idx] == o)) for o in counts}
        entry = next(t for t in texts if t.startswith(label.replace("_", " ")))
        assert entry.endswith(outcome_shares_text(counts)), entry
    assert any("landed in only" in t for t in texts)


def test_net_balls_are_drawn_at_the_net_and_ellipses_fit_the_balls_in(scattered):
    m = scattered.metrics
    fig = top.top_view(scattered)
    ax = fig.axes[0]
    outcomes = np.asarray(m["outcome"]).astype(str)
    at_net = (outcomes == "net") & np.isfinite(m["net_y_m"])
    assert at_net.any()  # the drop shot sends some balls into the net
    marked = [
        line for line in ax.lines if line.get_marker() == "X" and np.allclose(line.get_xdata(), 0.0)
    ]
    assert sum(len(line.get_xdata()) for line in marked) == int(at_net.sum())
    centres = sorted(tuple(np.round(p.center, 6)) for p in ax.patches if isinstance(p, Ellipse))
    expected = []
    for label in ("topspin_drive", "drop_shot"):
        sel = (scattered.labels == label) & (outcomes == "in")
        pts = np.column_stack([m["land_x_m"][sel], m["land_y_m"][sel]])
        expected.append(tuple(np.round(pts.mean(axis=0), 6)))
    assert centres == sorted(expected)


def test_the_side_view_legend_gives_the_shares_too(scattered):
    from rallyarc.viz import side

    fig = side.side_view(scattered)
    texts = [t.get_text() for legend in fig.legends for t in legend.get_texts()]
    idx = np.flatnonzero(scattered.labels == "drop_shot")
    assert any(t.endswith(outcome_shares_text(outcome_counts(scattered, idx))) for t in texts)
