"""2D figures of shots in one import: side view, top view, sweeps and success windows (matplotlib).

Every function takes results (a :class:`rallyarc.shot.ShotResult` or a
:class:`rallyarc.window.Window`), draws them and returns the matplotlib Figure. Nothing here
computes physics: paths are the recorded trajectories sampled, numbers are the metrics of the
result. Figures are made without pyplot (no global figure list, no backend chosen or switched,
no display needed); in a notebook they show as usual, and :func:`save_figure` writes them to a
file.

Each figure lives in a module of its own: :mod:`viz.side` (side view), :mod:`viz.top` (top
view), :mod:`viz.sweeps` (a sweep's panels), :mod:`viz.window` (a success window); what they
share is in :mod:`viz.common` and the label placer in :mod:`viz.labels`.
"""

from __future__ import annotations

from rallyarc.viz.common import (
    OUTCOME_WORDS,
    display_label,
    draw_court_lines,
    drawn,
    save_figure,
    variant_groups,
)
from rallyarc.viz.side import side_view
from rallyarc.viz.sweeps import DEFAULT_SWEEP_METRICS, METRICS, sweep_plot
from rallyarc.viz.top import top_view
from rallyarc.viz.window import window_plot

__all__ = [
    "DEFAULT_SWEEP_METRICS",
    "METRICS",
    "OUTCOME_WORDS",
    "display_label",
    "draw_court_lines",
    "drawn",
    "save_figure",
    "side_view",
    "sweep_plot",
    "top_view",
    "variant_groups",
    "window_plot",
]
