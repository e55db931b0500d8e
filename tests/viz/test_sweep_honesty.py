"""Sweep figures say what they hold fixed, keep a minimum span on each axis and take the
receiver's height after the bounce only."""

import numpy as np

from rallyarc import domain, sweep
from rallyarc.cli.conditions import ball_state
from rallyarc.viz import sweeps


def _launch_spin_sweep():
    sc = domain.load_scenario("demo")
    stroke = domain.load_stroke("topspin_drive")
    p = sweep.get_parameter("launch_spin")
    values = np.linspace(0.0, 4000.0, 9)
    result = sweep.sweep(stroke, sc.conditions, ball_state(sc.incoming), p.name, p.to_si(values))
    return result, values


def test_a_sweep_says_what_it_holds_fixed_and_keeps_a_minimum_span():
    result, values = _launch_spin_sweep()
    fig = sweeps.sweep_plot(result, values, "topspin at launch [rpm]")
    title = fig._suptitle.get_text()
    assert "held fixed: launch speed" in title and "hard_medium" in title
    apex_axes = fig.axes[2]
    lo, hi = apex_axes.get_ylim()
    assert hi - lo >= sweeps.MIN_SPAN["m"]
    apex = result.metrics["bounce_apex_m"]
    assert np.ptp(apex) < 0.1  # a few centimetres of change: no longer full panel height


def test_the_receiver_panel_is_after_the_bounce_only():
    result, values = _launch_spin_sweep()
    fig = sweeps.sweep_plot(result, values, "topspin at launch [rpm]")
    ax = fig.axes[3]
    assert "after the bounce" in ax.get_ylabel()
    y = np.asarray(ax.lines[0].get_ydata(), float)
    before = result.metrics["receiver_before_bounce"]
    assert before.any()  # the low-spin balls fly long and reach the plane before bouncing
    assert np.isnan(y[before]).all() and np.isfinite(y[~before]).all()
