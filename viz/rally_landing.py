"""The landing heatmaps of a rally run (matplotlib, headless): where each player's rally balls
and serves land on a singles court, with the summary's shares and their 95 % intervals.

Part of :mod:`viz.rally_plots` (which re-exports :func:`landing_heatmaps`); made without
pyplot, colours from :mod:`viz.palette`.
"""

from __future__ import annotations

import numpy as np
from matplotlib.backends.backend_agg import FigureCanvasAgg
from matplotlib.colors import LinearSegmentedColormap
from matplotlib.figure import Figure
from matplotlib.patches import Rectangle
from matplotlib.ticker import MaxNLocator

from rallyarc import court
from rallyarc.rally.stats import wilson
from rallyarc.rally.text import modes_line, with_interval
from rallyarc.viz import palette

#: Landing heatmap cell [m] (about: the cells' edges fall on the baselines and sidelines).
CELL_M = 0.5


def new_figure(figsize):
    """A figure with its own Agg canvas and a constrained layout (no pyplot)."""
    fig = Figure(figsize=figsize, layout="constrained")
    FigureCanvasAgg(fig)
    return fig


def _court(ax, zorder=3):
    """A singles court: its lines (5 cm, to scale) in ink and the doubles sidelines faint, so
    that one sideline reads as the boundary (the alleys keep the surround's colour, as out);
    net and posts on top."""
    hexes = palette.COURT_HEX
    w, hl = court.LINE_WIDTH, court.HALF_LENGTH
    hw, sw = court.DOUBLES_WIDTH / 2, court.SINGLES_WIDTH / 2
    faint = {"fc": tint(hexes["ink"], 0.55), "lw": 0, "zorder": zorder}
    for y in (-hw, hw):
        ax.add_patch(Rectangle((-hl, y - w / 2), 2 * hl, w, **faint))
    for xa, ya, xb, yb in court.line_segments():
        if ya == yb and abs(ya) > sw:
            continue  # the doubles sidelines: drawn faint above
        ya, yb = (max(ya, -sw), min(yb, sw)) if xa == xb else (ya, yb)
        if xa == xb:
            rect = Rectangle((xa - w / 2, ya), w, yb - ya)
        else:
            rect = Rectangle((xa, ya - w / 2), xb - xa, w)
        rect.set(fc=hexes["line"], ec=hexes["ink"], lw=0.3, zorder=zorder + 1)
        ax.add_patch(rect)
    ax.plot([0, 0], [-court.POST_Y, court.POST_Y], color=hexes["net"], lw=2.0, zorder=zorder + 2)


def tint(hex_colour, amount):
    """A palette colour mixed with white (``amount`` 0: the colour, 1: white)."""
    rgb = palette.hex_to_rgb(hex_colour)
    return tuple(rgb + (1.0 - rgb) * amount)


LANDING_CMAP = LinearSegmentedColormap.from_list(
    "rallyarc_landings",
    [tint(palette.VARIANT_HEX[2], 0.8), palette.VARIANT_HEX[2], palette.VARIANT_HEX[0]],
)


def landing_edges():
    """Cell edges (x, y) of the landing heatmaps [m]: cells of about :data:`CELL_M` whose edges
    fall on both baselines and both singles sidelines, so that no cell holds balls both in and
    out; the grid reaches about 3.5 m beyond the baselines and 3 m beyond the sidelines."""
    hl, sw = court.HALF_LENGTH, court.SINGLES_WIDTH / 2
    nx, ny = round(2 * hl / CELL_M), round(2 * sw / CELL_M)
    dx, dy = 2 * hl / nx, 2 * sw / ny
    ex, ey = round(3.5 / dx), round(3.0 / dy)
    return -hl + dx * np.arange(-ex, nx + ex + 1), -sw + dy * np.arange(-ey, ny + ey + 1)


def _court_ground(ax, x_edges, y_edges):
    hl, sw = court.HALF_LENGTH, court.SINGLES_WIDTH / 2
    ax.set_facecolor(palette.COURT_HEX["surround"])
    ax.add_patch(
        Rectangle((-hl, -sw), 2 * hl, 2 * sw, fc=palette.COURT_HEX["surface"], lw=0, zorder=0)
    )
    ax.set_xlim(x_edges[0], x_edges[-1])
    ax.set_ylim(y_edges[0], y_edges[-1])
    ax.set_aspect("equal")


def _note(ax, text):
    ax.text(
        0.5,
        0.015,
        text,
        transform=ax.transAxes,
        ha="center",
        va="bottom",
        fontsize=7.5,
        linespacing=1.3,
        color=palette.COURT_HEX["ink"],
        bbox={"fc": "white", "ec": "none", "alpha": 0.85, "pad": 2},
        zorder=6,
    )


def _zone_text(zone, k, n):
    """A landing zone's share with its 95 % interval, as the summary text prints shares."""
    low, high = wilson(k, n)
    return f"{zone} {with_interval({'share': k / n, 'low': low, 'high': high})}"


def _landing_note(summary, name, serve):
    """The note under a heatmap: serve percentages, or the rally balls' depth zones, each share
    with its 95 % interval (the summary's numbers and rounding)."""
    if serve:
        p = summary["statistics"]["players"][name]
        return (
            "in the box: first serves "
            + with_interval(p["first_serve_in"])
            + (", second serves " + with_interval(p["second_serve_in"]))
            * bool(p["second_serve_in"]["of"])
        )
    d = summary["depth"][name]
    n, z = d["landed"], d["zones"]
    if not n:
        return ""
    return (
        f"{_zone_text('deep (last 2.5 m)', z['deep'], n)}, {_zone_text('middle', z['middle'], n)}"
        f"\n{_zone_text('short of the service line', z['short'], n)}, "
        f"{_zone_text('long', z['long'], n)}"
    )


def landing_heatmaps(shots, summary):
    """Where each player's balls land (2D histograms on the court, court frame): rally balls
    in the top row, serves in the bottom row; one column per player. The notes give the
    summary's shares with their 95 % intervals."""
    names = list(summary["players"])
    fig = new_figure((12.5, 8.4))
    axes = fig.subplots(2, len(names), sharex=True, sharey=True, squeeze=False)
    x_edges, y_edges = landing_edges()
    landed = shots[np.isfinite(shots["land_x_m"])]
    for row, (what, serve) in enumerate((("rally balls", False), ("serves", True))):
        mine = {
            n: landed[(landed["player"] == n) & ((landed["serve"] != "") == serve)] for n in names
        }
        counts = {
            n: np.histogram2d(m["land_x_m"], m["land_y_m"], [x_edges, y_edges])[0]
            for n, m in mine.items()
        }
        vmax = max(1.0, max(c.max() for c in counts.values()))
        mesh = None
        for col, name in enumerate(names):
            ax = axes[row, col]
            _court_ground(ax, x_edges, y_edges)
            c = np.ma.masked_equal(counts[name], 0.0)
            mesh = ax.pcolormesh(
                x_edges, y_edges, c.T, cmap=LANDING_CMAP, vmin=0, vmax=vmax, zorder=1
            )
            _court(ax)
            end = summary["players"][name]["end"]
            toward = "far" if end == "near" else "near"
            outside = len(mine[name]) - int(counts[name].sum())
            ax.set_title(
                f"{name} ({end} end, hitting toward the {toward} end)\n"
                f"{len(mine[name])} {what} landed"
                + (f" ({outside} beyond the area shown)" if outside else ""),
                fontsize=9.5,
            )
            _note(ax, _landing_note(summary, name, serve))
            if row == 1:
                ax.set_xlabel("x along the court [m] (net at 0)")
            if col == 0:
                ax.set_ylabel("y across [m] (+ left seen from the near end)")
        bar = fig.colorbar(
            mesh, ax=axes[row, :], shrink=0.9, pad=0.01, ticks=MaxNLocator(integer=True)
        )
        bar.set_label(f"{what} per cell (about {CELL_M:g} m x {CELL_M:g} m)")
    fig.suptitle(
        f"{summary['patterns']}: where the balls land ({summary['rallies']} rallies)\n"
        "singles court (doubles sidelines faint); shares with their 95 % interval"
        + modes_line(summary),
        fontsize=11,
    )
    return fig
