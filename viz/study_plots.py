"""The main effects of a study: for each parameter, how the outcome shares and the depth move.

:func:`main_effects` draws a summary of :func:`rallyarc.study.summary.summarize_study` (it reads
no dataset itself): one panel per parameter with the in, net and long shares against the
parameter's values, and the median depth inside the baseline of the balls in on a second axis.
Made without pyplot; :func:`rallyarc.viz.common.save_figure` writes it.
"""

from __future__ import annotations

import numpy as np
from matplotlib.backends.backend_agg import FigureCanvasAgg
from matplotlib.figure import Figure

from rallyarc.viz import palette

#: The outcome shares drawn, with their line styles.
SHARES = (("in_share", "in", "-"), ("net_share", "net", "--"), ("long_share", "long", ":"))


def _values(items):
    return np.array([np.nan if v is None else v for v in items], float)


def main_effects(summary, figsize=None):
    """One panel per parameter: outcome shares [%] (left axis) and median depth [m] of the
    balls in (right axis) against the parameter's values. Returns the Figure."""
    params = summary["parameters"]
    cols = min(3, max(1, len(params)))
    rows = -(-len(params) // cols)
    fig = Figure(figsize=figsize or (4.2 * cols, 3.2 * rows + 0.5), layout="constrained")
    FigureCanvasAgg(fig)
    axes = np.atleast_1d(fig.subplots(rows, cols, squeeze=False)).ravel()
    colours = palette.OUTCOME_HEX
    for ax, p in zip(axes, params, strict=False):
        x = np.array(p["values"], float)
        for key, word, style in SHARES:
            ax.plot(x, 100 * _values(p[key]), style, color=colours.get(word), label=word)
        ax.set_xlabel(f"{p['name'].replace('_', ' ')} [{p['unit']}]")
        ax.set_ylabel("share of shots [%]")
        ax.set_ylim(0, 100)
        depth = ax.twinx()
        depth.plot(x, _values(p["depth_m"]["q50"]), "o-", color="0.35", ms=3, label="depth q50")
        depth.set_ylabel("median depth of balls in [m]")
        ax.grid(alpha=0.3)
    for ax in axes[len(params) :]:
        ax.set_visible(False)
    handles, labels = axes[0].get_legend_handles_labels()
    fig.legend(handles, labels, loc="outside upper right", ncols=3)
    fig.suptitle(f"{summary['study']}: main effects ({summary['shots']} shots)")
    return fig
