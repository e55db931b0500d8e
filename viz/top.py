"""The top view: the court from above, to scale, with each shot's path and landing point and,
for scattered shots, each stroke's landing ellipse (matplotlib)."""

from __future__ import annotations

import math

import numpy as np
from matplotlib.lines import Line2D
from matplotlib.patches import Ellipse, Patch, Rectangle

from rallyarc import court
from rallyarc.viz import palette
from rallyarc.viz.common import (
    EVENT_MARKERS,
    MANY,
    display_label,
    draw_court_lines,
    drawn,
    figure_and_axes,
    sampled_path,
    variant_groups,
    variant_legend_label,
)


def top_view(result, ax=None, dt=0.004, min_shots=10):
    """The court from above, to scale, with each variant's path and landing point.

    Every ball counts: the legend gives each variant's shares of in, net, long, wide and out;
    a ball stopped by the net is drawn to the net and marked there. A variant with at least
    ``min_shots`` balls that landed in the opponent's court gets the 2-sigma dispersion ellipse
    of those landings only (the covariance ellipse; for normally scattered landings it holds
    about 86 % of them) and their mean landing point; the legend says so.

    Returns
    -------
    matplotlib.figure.Figure
    """
    fig, ax, own = figure_and_axes(ax, (12.0, 6.6))
    m = result.metrics
    c = result.conditions
    many = len(result) > MANY
    plane_x = court.HALF_LENGTH + c.receiver_plane_m
    groups = variant_groups(result)
    hw = court.DOUBLES_WIDTH / 2
    ys = np.concatenate([m["land_y_m"], m["receiver_y_m"], result.incoming.position[:, 1]])
    y_ext = max(hw + 1.2, float(np.nanmax(np.abs(ys))) + 0.8)
    x_lo = min(-court.HALF_LENGTH - 1.5, float(np.min(result.incoming.position[:, 0])) - 0.8)
    x_hi = max(plane_x + 1.5, float(np.nanmax(np.append(m["land_x_m"], 0.0))) + 1.5)
    ax.set_xlim(x_lo, min(x_hi, court.HALF_LENGTH + 12.0))
    ax.set_ylim(-y_ext, y_ext)
    ax.set_aspect("equal")
    _court_lines(ax, c.singles)
    ax.axvline(plane_x, color="#6d6d6d", lw=1.0, ls=(0, (5, 3)), zorder=2)

    ellipses = stopped = False
    for label, idx, k in groups:
        # overlapping paths show as nested stripes: earlier variants drawn wider
        lw = 0.8 if many else 1.4 + 2.4 * (len(groups) - 1 - k) / max(1, len(groups) - 1)
        for j, i in enumerate(drawn(idx, many)):
            p = sampled_path(result, i, dt)
            ax.plot(p[:, 0], p[:, 1], color=palette.variant_colour(k), ls=palette.variant_style(k),
                    lw=lw, alpha=0.5 if many else 1.0, zorder=3 + k * 0.01,
                    label=display_label(label) if j == 0 else None,
                    solid_capstyle="butt")  # fmt: skip
        ellipses |= _landings(ax, m, idx, k, many, min_shots)
        stopped |= _net_stops(ax, m, idx, k, many)

    _top_legend(fig if own else ax, own, result, groups, c, (ellipses, stopped), min_shots)
    ax.set_xlabel("distance along the court from the net x [m] (hitter's side negative)")
    ax.set_ylabel("across the court y [m] (+ left of the hitter)")
    ax.set_title(
        f"Top view: paths and landings ({'singles' if c.singles else 'doubles'} court, "
        f"{len(result)} shot{'s' if len(result) != 1 else ''}"
        f"{''.join(f'; {m}' for m in c.modes)})",
        fontsize=10,
        loc="left",
    )
    if own:  # room for the court to scale: the figure's height follows the court's aspect
        (x0, x1), (y0, y1) = ax.get_xlim(), ax.get_ylim()
        rows = math.ceil((len(groups) + 5) / 2)  # the legend's rows below the court
        fig.set_size_inches(12.0, min(9.5, 1.3 + 0.2 * rows + 10.6 * (y1 - y0) / (x1 - x0)))
    return fig


def _landings(ax, m, idx, k, many, min_shots):
    """Variant k's landing points (short of the net too) and, from ``min_shots`` balls that
    landed in on, the 2-sigma ellipse and mean of those; True when the ellipse is drawn."""
    colour = palette.variant_colour(k)
    lx, ly = m["land_x_m"][idx], m["land_y_m"][idx]
    ok = np.isfinite(lx) & np.isfinite(ly)
    ax.plot(lx[ok], ly[ok], ls="none", marker=EVENT_MARKERS["land"], ms=3.5 if many else 7,
            mfc=colour, mec=palette.COURT_HEX["ink"], mew=0.6, zorder=6)  # fmt: skip
    landed_in = ok & (np.asarray(m["outcome"][idx]).astype(str) == "in")
    if landed_in.sum() < min_shots:
        return False
    centre, width, height, angle = _ellipse(np.column_stack([lx[landed_in], ly[landed_in]]))
    ax.add_patch(Ellipse(centre, width, height, angle=angle, fill=False, ec=colour, lw=2.2,
                         zorder=7))  # fmt: skip
    ax.plot(*centre, marker="P", ms=9, mfc=colour, mec="white", mew=1.0, zorder=8)
    return True


def _net_stops(ax, m, idx, k, many):
    """Where variant k's balls that met the net stopped (on the net's line); True if any."""
    net_y = m["net_y_m"][idx]
    hit_net = (np.asarray(m["outcome"][idx]).astype(str) == "net") & np.isfinite(net_y)
    if not hit_net.any():
        return False
    ax.plot(np.zeros(int(hit_net.sum())), net_y[hit_net], ls="none", marker=EVENT_MARKERS["twice"],
            ms=4.5 if many else 8, mfc=palette.variant_colour(k), mec=palette.COURT_HEX["ink"],
            mew=0.6, zorder=6)  # fmt: skip
    return True


def _top_legend(target, own, result, groups, c, drawn_marks, min_shots):
    """One legend below the figure (or in the given axes): the variants with their outcome
    shares, then the markers."""
    ellipses, stopped = drawn_marks
    ink = palette.COURT_HEX["ink"]
    handles = [
        Line2D([], [], color=palette.variant_colour(k), ls=palette.variant_style(k), lw=2.5)
        for _, _, k in groups
    ]
    labels = [variant_legend_label(result, label, idx) for label, idx, _ in groups]
    extra = [
        (Line2D([], [], ls="none", marker=EVENT_MARKERS["land"], mfc="white", mec=ink, ms=7),
         "landing point"),
        (Line2D([], [], color="#6d6d6d", lw=1, ls=(0, (5, 3))),
         f"receiver's contact plane ({c.receiver_plane_m:.1f} m behind the baseline)"),
    ]  # fmt: skip
    if stopped:
        extra.append(
            (Line2D([], [], ls="none", marker=EVENT_MARKERS["twice"], mfc="white", mec=ink, ms=8),
             "stopped by the net")
        )  # fmt: skip
    if ellipses:
        extra.append(
            (Patch(fill=False, ec=ink, lw=2),
             f"2-sigma ellipse of the balls that landed in only (>= {min_shots} of them)")
        )  # fmt: skip
        extra.append(
            (Line2D([], [], ls="none", marker="P", mfc=ink, mec="white", ms=9),
             "mean landing of the balls in")
        )  # fmt: skip
    target.legend(
        handles + [h for h, _ in extra],
        labels + [t for _, t in extra],
        loc="outside lower center" if own else "upper left",
        ncol=2,
        fontsize=8.5,
        frameon=False,
    )


def _court_lines(ax, singles):
    """The court's lines to scale (5 cm wide), net, posts and singles sticks."""
    hexes = palette.COURT_HEX
    hl, hw = court.HALF_LENGTH, court.DOUBLES_WIDTH / 2
    x0, x1 = ax.get_xlim()
    y0, y1 = ax.get_ylim()
    ax.add_patch(Rectangle((x0, y0), x1 - x0, y1 - y0, fc=hexes["surround"], lw=0, zorder=0))
    ax.add_patch(Rectangle((-hl, -hw), 2 * hl, 2 * hw, fc=hexes["surface"], lw=0, zorder=0))
    draw_court_lines(ax, zorder=1)
    ax.plot([0, 0], [-court.POST_Y, court.POST_Y], color=hexes["net"], lw=2.0, zorder=2)
    for y in (-court.POST_Y, court.POST_Y):
        ax.plot(0, y, marker="o", ms=5, color=hexes["net"], zorder=2)
    if singles:
        for y in (-court.SINGLES_STICK_Y, court.SINGLES_STICK_Y):
            ax.plot(0, y, marker="o", ms=3, mfc="white", mec=hexes["net"], zorder=2)


def _ellipse(points, n_sigma=2.0):
    """Centre, width, height and angle [deg] of the n-sigma covariance ellipse of points."""
    mean = points.mean(axis=0)
    cov = np.cov(points, rowvar=False)
    vals, vecs = np.linalg.eigh(cov)
    vals = np.clip(vals, 0.0, None)
    angle = math.degrees(math.atan2(vecs[1, 1], vecs[0, 1]))
    return mean, 2 * n_sigma * math.sqrt(vals[1]), 2 * n_sigma * math.sqrt(vals[0]), angle
