"""Figures of rally runs (matplotlib, headless): landing heatmaps, contact heights, spin exchange.

Every function takes the per-shot table of :func:`rallyarc.rally.play_rallies` (a pandas
DataFrame, positions in the court frame) and its summary (:func:`rallyarc.rally.summarize`)
and returns a matplotlib Figure made without pyplot. Nothing here computes physics. Colours
come from :mod:`viz.palette`. Shares are printed as the summary text prints them
(:func:`rallyarc.rally.text.with_interval`: one decimal, with the 95 % interval). The landing
heatmaps live in :mod:`viz.rally_landing`.
"""

from __future__ import annotations

from pathlib import Path

import numpy as np
from matplotlib.lines import Line2D
from matplotlib.patches import Patch

from rallyarc.output.export import atomic_write
from rallyarc.rally.text import modes_line, with_interval
from rallyarc.viz import palette
from rallyarc.viz.rally_landing import (
    CELL_M,
    LANDING_CMAP,
    landing_edges,
    landing_heatmaps,
    new_figure,
)

__all__ = [
    "CELL_M",
    "LANDING_CMAP",
    "SPIN_POINTS",
    "contact_height_histograms",
    "landing_edges",
    "landing_heatmaps",
    "save_figure",
    "serve_returns",
    "spin_exchange",
    "whatif_differences",
]

_DPI = 120
#: Most points drawn per panel of the spin exchange (a random subset beyond it, fixed seed).
SPIN_POINTS = 4000
_PHASE_COLOURS = {
    "rise": palette.VARIANT_HEX[1],
    "apex": palette.VARIANT_HEX[4],
    "drop": palette.VARIANT_HEX[0],
}


def _figure(figsize):
    return new_figure(figsize)


def _players(summary):
    return list(summary["players"])


def serve_returns(shots):
    """True for the shots that return a serve (the stroke after a serve in the same rally)."""
    after_serve = shots.groupby("rally", sort=False)["serve"].shift(1).fillna("") != ""
    return after_serve.to_numpy() & (shots["serve"] == "").to_numpy()


def _share_text(value, interval):
    """A summary share and its ``_interval`` field as the summary text prints them."""
    return with_interval({"share": value, "low": interval[0], "high": interval[1]})


def contact_height_histograms(shots, summary):
    """Contact heights of each player's rally balls (serves excluded, serve returns included
    and counted in the title, as in the summary), stacked by when the ball was met (rise,
    apex, drop), with the preferred range and the shoulder height; one x-scale for all."""
    names = _players(summary)
    fig = _figure((11.0, 5.4))
    axes = np.atleast_1d(fig.subplots(1, len(names), sharex=True, sharey=True))
    edges = np.asarray(summary["contact_height"][names[0]]["histogram"]["edges_m"], float)
    returns = serve_returns(shots)
    rb = shots[shots["serve"] == ""]
    returns = returns[(shots["serve"] == "").to_numpy()]
    peak = 0.0
    for name in names:
        mine = rb[rb["player"] == name]
        c, _ = np.histogram(mine["contact_height_m"], bins=edges)
        peak = max(peak, c.max(initial=0) / max(1, len(mine)) * 100)
    xmax = max(5.0, peak * 1.45)
    for ax, name in zip(axes, names, strict=True):
        m = (rb["player"] == name).to_numpy()
        _contact_panel(ax, name, rb[m], int(returns[m].sum()), summary, edges, xmax)
    axes[0].set_xlim(0, xmax)
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
    fig.suptitle(
        f"{summary['patterns']}: contact heights of the rally balls (serve returns included), "
        f"shares with their 95 % interval\n{source}" + modes_line(summary),
        fontsize=10,
    )
    return fig


def _contact_panel(ax, name, mine, returns, summary, edges, xmax):
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
    for y, va, text, colour in (
        (shoulder + 0.03, "bottom", f"shoulder {shoulder:.2f} m", palette.VARIANT_HEX[3]),
        (hi - 0.03, "top", f"preferred {lo:.2f}-{hi:.2f} m", palette.VARIANT_HEX[5]),
    ):
        ax.text(xmax * 0.98, y, text, ha="right", va=va, fontsize=8, color=colour)
    above, inside = "-", "-"
    if h["above_shoulder_share"] is not None:
        above = _share_text(h["above_shoulder_share"], h["above_shoulder_share_interval"])
        inside = _share_text(h["in_preferred_range_share"], h["in_preferred_range_share_interval"])
    ax.set_title(
        f"{name}: {h['contacts']} rally-ball contacts, {returns} of them serve returns\n"
        f"above the shoulder {above}\nin the preferred range {inside}",
        fontsize=9.5,
    )
    ax.set_xlabel("share of the player's contacts [%]")
    ax.grid(axis="x", color="#dddddd", lw=0.6)
    ax.set_axisbelow(True)


def spin_exchange(shots, summary):
    """Incoming topspin at contact against the topspin the player sends back, rally balls
    only (serve returns included, as in the summary), one panel per player, coloured by shot
    type."""
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
                "spin sense reversed on "
                f"{_share_text(s['reversed_share'], s['reversed_share_interval'])} of "
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
        f"{summary['patterns']}: the spin exchange of the rally balls (serve returns included)"
        + (f"\n{dom}'s balls reach the opponent with more topspin" if dom else "")
        + "\ntopspin relative to the ball's own travel; dotted: the racket adds no spin "
        "(outgoing = - incoming)" + modes_line(summary),
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
            # No interval (None) when too few rallies finished in both variants to give one.
            bounded = d["low"] is not None and d["high"] is not None
            err = [[mid - d["low"] * 100], [d["high"] * 100 - mid]] if bounded else None
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
                f"{mid:+.1f} ({d['low'] * 100:+.1f} to {d['high'] * 100:+.1f})"
                if bounded
                else f"{mid:+.1f} (no interval)",
                (mid, y),
                textcoords="offset points",
                xytext=(0, 6),
                ha="center",
                va="bottom",
                fontsize=7.5,
                color=palette.COURT_HEX["ink"],
                bbox={"fc": "white", "ec": colour, "lw": 0.6, "alpha": 0.9, "pad": 1.5},
                zorder=4,
            )
    ax.axvline(0.0, color=palette.COURT_HEX["ink"], lw=0.8)
    ax.set_yticks(range(len(keys)), [k.replace("_", " ") for k in keys])
    ax.set_ylim(len(keys) - 0.5, -0.8)
    ax.set_xlabel("difference from the base [percentage points], 95 % interval")
    ax.set_title(
        f"what-if against {comparison['base']}: {comparison['rallies']} rallies, common random "
        "numbers" + modes_line(comparison),
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
