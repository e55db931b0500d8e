"""Figures of rally runs (matplotlib, headless): landing heatmaps, contact heights, spin exchange.

Every function takes the per-shot table of :func:`rallyarc.rally.play_rallies` (a pandas
DataFrame, positions in the court frame) and its summary (:func:`rallyarc.rally.summarize`)
and returns a matplotlib Figure made without pyplot. Nothing here computes physics. Colours
come from :mod:`viz.palette`.
"""

from __future__ import annotations

from pathlib import Path

import numpy as np
from matplotlib.backends.backend_agg import FigureCanvasAgg
from matplotlib.colors import LinearSegmentedColormap
from matplotlib.figure import Figure
from matplotlib.lines import Line2D
from matplotlib.patches import Patch, Rectangle

from rallyarc import court
from rallyarc.output.export import atomic_write
from rallyarc.viz import palette
from rallyarc.viz.common import draw_court_lines

_DPI = 120
#: Most points drawn per panel of the spin exchange (a random subset beyond it, fixed seed).
SPIN_POINTS = 4000
#: Landing heatmap cell [m].
CELL_M = 0.5

_PHASE_COLOURS = {
    "rise": palette.VARIANT_HEX[1],
    "apex": palette.VARIANT_HEX[4],
    "drop": palette.VARIANT_HEX[0],
}


def _figure(figsize):
    fig = Figure(figsize=figsize, layout="constrained")
    FigureCanvasAgg(fig)
    return fig


def _players(summary):
    return list(summary["players"])


def _court(ax, zorder=3):
    """The court's lines (5 cm, to scale), net and posts, drawn above the data."""
    hexes = palette.COURT_HEX
    draw_court_lines(ax, zorder=zorder, edge=hexes["ink"])
    ax.plot([0, 0], [-court.POST_Y, court.POST_Y], color=hexes["net"], lw=2.0, zorder=zorder + 1)


def _tint(hex_colour, amount):
    """A palette colour mixed with white (``amount`` 0: the colour, 1: white)."""
    rgb = palette.hex_to_rgb(hex_colour)
    return tuple(rgb + (1.0 - rgb) * amount)


LANDING_CMAP = LinearSegmentedColormap.from_list(
    "rallyarc_landings",
    [_tint(palette.VARIANT_HEX[2], 0.8), palette.VARIANT_HEX[2], palette.VARIANT_HEX[0]],
)


def _court_ground(ax, x_edges, y_edges):
    hl = court.HALF_LENGTH
    ax.set_facecolor(palette.COURT_HEX["surround"])
    ax.add_patch(
        Rectangle(
            (-hl, -court.DOUBLES_WIDTH / 2),
            2 * hl,
            court.DOUBLES_WIDTH,
            fc=palette.COURT_HEX["surface"],
            lw=0,
            zorder=0,
        )
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
        fontsize=8,
        color=palette.COURT_HEX["ink"],
        bbox={"fc": "white", "ec": "none", "alpha": 0.85, "pad": 2},
        zorder=6,
    )


def landing_heatmaps(shots, summary):
    """Where each player's balls land (2D histograms on the court, court frame): rally balls
    in the top row, serves in the bottom row; one column per player."""
    names = _players(summary)
    fig = _figure((12.5, 8.6))
    axes = fig.subplots(2, len(names), sharex=True, sharey=True, squeeze=False)
    hl = court.HALF_LENGTH
    x_edges = np.arange(-hl - 3.5, hl + 3.5 + 1e-9, CELL_M)
    y_edges = np.arange(-7.0, 7.0 + 1e-9, CELL_M)
    landed = shots[np.isfinite(shots["land_x_m"])]
    for row, (what, serve) in enumerate((("rally balls", False), ("serves", True))):
        counts = {}
        for name in names:
            mine = landed[(landed["player"] == name) & ((landed["serve"] != "") == serve)]
            counts[name], _, _ = np.histogram2d(
                mine["land_x_m"], mine["land_y_m"], [x_edges, y_edges]
            )
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
            ax.set_title(
                f"{name} ({end} end, hitting toward the {toward} end): "
                f"{int(counts[name].sum())} {what} landed",
                fontsize=9.5,
            )
            mine = shots[(shots["player"] == name) & ((shots["serve"] != "") == serve)]
            if serve:
                if len(mine):
                    first = mine[mine["serve"] == "first"]
                    second = mine[mine["serve"] == "second"]
                    _note(
                        ax,
                        f"in the box: first serves {first['outcome'].eq('in').mean() * 100:.0f} "
                        f"%, second serves {second['outcome'].eq('in').mean() * 100:.0f} %"
                        if len(second)
                        else f"first serves in the box {first['outcome'].eq('in').mean():.0%}",
                    )
            else:
                d = summary["depth"][name]
                if d["landed"]:
                    pct = {k: v / d["landed"] * 100 for k, v in d["zones"].items()}
                    _note(
                        ax,
                        f"landed: deep (last 2.5 m) {pct['deep']:.0f} %, middle "
                        f"{pct['middle']:.0f} %, short of the service line {pct['short']:.0f} "
                        f"%, long {pct['long']:.0f} %",
                    )
            if row == 1:
                ax.set_xlabel("x along the court [m] (net at 0)")
            if col == 0:
                ax.set_ylabel("y across [m] (+ left seen from the near end)")
        bar = fig.colorbar(mesh, ax=axes[row, :], shrink=0.9, pad=0.01)
        bar.set_label(f"{what} per {CELL_M:g} m x {CELL_M:g} m cell")
    fig.suptitle(f"{summary['patterns']}: where the balls land ({summary['rallies']} rallies)")
    return fig


def contact_height_histograms(shots, summary):
    """Contact heights of each player's rally balls (serves excluded), stacked by when the ball
    was met (rise, apex, drop), with the preferred range and the shoulder height."""
    names = _players(summary)
    fig = _figure((11.0, 5.2))
    axes = np.atleast_1d(fig.subplots(1, len(names), sharey=True))
    edges = np.asarray(summary["contact_height"][names[0]]["histogram"]["edges_m"], float)
    rb = shots[shots["serve"] == ""]
    for ax, name in zip(axes, names, strict=True):
        _contact_panel(ax, name, rb[rb["player"] == name], summary, edges)
    axes[0].set_ylabel("ball centre height at contact [m]")
    top = max(
        max(summary["players"][n]["shoulder_height_m"] for n in names) + 0.6,
        float(np.nanmax(rb["contact_height_m"])) + 0.15 if len(rb) else 0.0,
    )
    axes[0].set_ylim(0, min(edges[-1], top))
    axes[-1].legend(
        handles=[
            Patch(color=c, label=f"met {'at the' if p == 'apex' else 'on the'} {p}")
            for p, c in _PHASE_COLOURS.items()
        ]
        + [
            Patch(color=palette.VARIANT_HEX[5], alpha=0.3, label="preferred range"),
            Line2D([], [], color=palette.VARIANT_HEX[3], ls="--", label="shoulder"),
        ],
        loc="upper right",
        fontsize=8,
        framealpha=0.9,
    )
    source = "; ".join(
        f"{n}: shoulder {summary['players'][n]['shoulder_height_source']}" for n in names
    )
    fig.suptitle(f"{summary['patterns']}: contact heights\n{source}", fontsize=10)
    return fig


def _contact_panel(ax, name, mine, summary, edges):
    """One player's contact heights: shares of the contacts per height bin, stacked by phase,
    with the preferred range and the shoulder height marked."""
    info = summary["players"][name]
    h = summary["contact_height"][name]
    total = max(1, len(mine))
    left = np.zeros(edges.size - 1)
    for phase, colour in _PHASE_COLOURS.items():
        part = mine[mine["contact_phase"] == phase]["contact_height_m"]
        c, _ = np.histogram(part, bins=edges)
        share = c / total * 100
        ax.barh(
            edges[:-1],
            share,
            height=np.diff(edges),
            left=left,
            align="edge",
            color=colour,
            ec="white",
            lw=0.5,
            label=f"met on the {phase}" if phase != "apex" else "met at the apex",
        )
        left += share
    lo, hi = info["preferred_contact_height_m"]
    ax.axhspan(lo, hi, color=palette.VARIANT_HEX[5], alpha=0.15, lw=0, zorder=0)
    shoulder = info["shoulder_height_m"]
    ax.axhline(shoulder, color=palette.VARIANT_HEX[3], lw=1.6, ls="--")
    xmax = max(5.0, left.max() * 1.45)
    ax.set_xlim(0, xmax)
    ax.text(
        xmax * 0.98,
        shoulder + 0.03,
        f"shoulder {shoulder:.2f} m",
        ha="right",
        va="bottom",
        fontsize=8,
        color=palette.VARIANT_HEX[3],
    )
    ax.text(
        xmax * 0.98,
        hi - 0.03,
        f"preferred {lo:.2f}-{hi:.2f} m",
        ha="right",
        va="top",
        fontsize=8,
        color=palette.VARIANT_HEX[5],
    )
    share = h["above_shoulder_share"]
    above = "-" if share is None else f"{share * 100:.1f} %"
    ax.set_title(
        f"{name}: {len(mine)} rally-ball contacts, above the shoulder {above}",
        fontsize=10,
    )
    ax.set_xlabel("share of the player's contacts [%]")
    ax.grid(axis="x", color="#dddddd", lw=0.6)
    ax.set_axisbelow(True)


def spin_exchange(shots, summary):
    """Incoming topspin at contact against the topspin the player sends back, rally balls
    only, one panel per player, coloured by shot type."""
    names = _players(summary)
    fig = _figure((11.5, 5.4))
    axes = np.atleast_1d(fig.subplots(1, len(names), sharex=True, sharey=True))
    rb = shots[shots["serve"] == ""]
    rng = np.random.default_rng(0)
    lim_in = np.nanquantile(np.abs(rb["incoming_topspin_rpm"]), 0.995) if len(rb) else 1000.0
    lim_out = np.nanquantile(np.abs(rb["outgoing_topspin_rpm"]), 0.995) if len(rb) else 1000.0
    lim = float(max(lim_in, lim_out, 500.0)) * 1.08
    colours = palette.variant_colours(rb["shot_type"])
    for ax, name in zip(axes, names, strict=True):
        mine = rb[rb["player"] == name]
        shown = mine
        if len(mine) > SPIN_POINTS:
            shown = mine.iloc[np.sort(rng.choice(len(mine), SPIN_POINTS, replace=False))]
        # all shot types in one shuffled layer, so that no type hides another
        order = rng.permutation(len(shown))
        shown = shown.iloc[order]
        ax.scatter(
            shown["incoming_topspin_rpm"],
            shown["outgoing_topspin_rpm"],
            s=5,
            alpha=0.45,
            lw=0,
            c=[colours[t] for t in shown["shot_type"]],
            rasterized=True,
        )
        handles = [
            Line2D([], [], ls="", marker="o", ms=5, color=colours[t], label=t)
            for t in dict.fromkeys(mine["shot_type"])
        ]
        ink = palette.COURT_HEX["ink"]
        ax.axhline(0, color=ink, lw=0.7)
        ax.axvline(0, color=ink, lw=0.7)
        (diag,) = ax.plot([-lim, lim], [lim, -lim], color=ink, lw=1.0, ls=":")
        diag.set_label("no spin added")
        handles.append(diag)
        s = summary["spin_exchange"]["players"][name]
        if s["shots"]:
            ax.set_title(
                f"{name}: mean in {s['incoming_topspin_rpm']['mean']:+.0f} rpm, out "
                f"{s['outgoing_topspin_rpm']['mean']:+.0f} rpm\n"
                f"spin sense reversed on {s['reversed_share'] * 100:.0f} % of "
                f"{s['shots']} shots"
                + (f" ({len(shown)} shown)" if len(shown) < len(mine) else ""),
                fontsize=9.5,
            )
        ax.set_xlim(-lim, lim)
        ax.set_ylim(-lim, lim)
        ax.set_xlabel("incoming topspin at contact [rpm] (- backspin)")
        ax.legend(handles=handles, loc="lower left", fontsize=8, framealpha=0.9)
        ax.grid(color="#e4e4e4", lw=0.6)
        ax.set_axisbelow(True)
    axes[0].set_ylabel("outgoing topspin off the racket [rpm] (- backspin)")
    dom = summary["spin_exchange"]["dominant"]
    fig.suptitle(
        f"{summary['patterns']}: the spin exchange"
        + (f" ({dom}'s balls reach the opponent with more topspin)" if dom else "")
        + "\ntopspin relative to the ball's own travel; dotted: the racket adds no spin "
        "(outgoing = - incoming)",
        fontsize=10,
    )
    return fig


def whatif_differences(comparison):
    """Each variant's difference from the base (percentage points) in points won and point
    endings, with its 95 % interval, from :func:`rallyarc.rally.whatif.compare`."""
    others = [v for v in comparison["variants"] if "difference_from_base" in v]
    keys = list(others[0]["difference_from_base"]) if others else []
    fig = _figure((7.5, 1.2 + 0.55 * max(1, len(keys))))
    ax = fig.add_subplot()
    step = 0.8 / max(1, len(others))
    for i, v in enumerate(others):
        colour = palette.variant_colour(i + 1)
        label = v["label"]
        for j, k in enumerate(keys):
            d = v["difference_from_base"][k]
            if d["difference"] is None:
                continue
            y = j + (i - (len(others) - 1) / 2) * step
            mid = d["difference"] * 100
            err = [[mid - d["low"] * 100], [d["high"] * 100 - mid]]
            ax.errorbar(
                mid,
                y,
                xerr=err,
                fmt="o",
                color=colour,
                capsize=3,
                label=label,
            )
            label = None
            ax.annotate(
                f"{mid:+.1f}",
                (mid, y),
                textcoords="offset points",
                xytext=(0, 5),
                ha="center",
                fontsize=7,
                color=colour,
            )
    ax.axvline(0.0, color=palette.COURT_HEX["ink"], lw=0.8)
    ax.set_yticks(range(len(keys)), [k.replace("_", " ") for k in keys])
    ax.invert_yaxis()
    ax.set_xlabel("difference from the base [percentage points], 95 % interval")
    ax.set_title(
        f"what-if against {comparison['base']}: {comparison['rallies']} rallies, common random "
        "numbers",
        fontsize=9,
    )
    if ax.get_legend_handles_labels()[0]:
        ax.legend(fontsize=8, loc="best")
    return fig


def save_figure(fig, path, dpi=_DPI):
    """Write a figure (format from the suffix) atomically; returns the path."""
    path = Path(path)
    fmt = path.suffix.lstrip(".").lower() or "png"
    return atomic_write(path, lambda tmp: fig.savefig(tmp, format=fmt, dpi=dpi))
