"""The side view: height of each shot against distance down the court (matplotlib).

Paths are the recorded trajectories sampled; the markers and their numbers are the result's
metrics (net clearance, landing depth, bounce apex, height at the receiver's plane).
"""

from __future__ import annotations

import numpy as np
from matplotlib.lines import Line2D
from matplotlib.patches import Rectangle

from rallyarc import court
from rallyarc.viz import palette
from rallyarc.viz.common import (
    EVENT_MARKERS,
    MANY,
    display_label,
    drawn,
    figure_and_axes,
    freeze_layout,
    is_serve,
    sampled_path,
    variant_groups,
    variant_legend_label,
)
from rallyarc.viz.labels import LabelPlacer

#: Directions [deg] in which each kind of number is tried around its marker, preferred first.
_LABEL_DIRECTIONS = {
    "net": (60, 120, 30, 150, 90, -60, -120, 0, 180),
    "apex": (90, 60, 120, 30, 150, 0, 180, -60, -120),
    "receiver": (0, 30, -30, 60, -60, 90, -90, 180),
    "land": (-90, -60, -120, -30, -150, 180, 0, 90),
    "twice": (-90, -60, -120, -30, -150, 90),
}
#: The order in which the kinds of number take their places.
_LABEL_ORDER = {"net": 0, "land": 1, "receiver": 2, "apex": 3, "twice": 4}


def side_view(result, ax=None, dt=0.004):
    """Height against distance down the court for each shot.

    Draws the court surface, both baselines and service lines, the net at its centre height,
    and the receiver's contact plane; each variant's path in its colour (dotted where the ball
    flies on past the receiver's plane); markers at the net crossing (labelled with the net
    clearance), the landing (depth inside the baseline, or for a serve the service line), the
    bounce apex and the height at the receiver's plane. With more than 12 shots the paths are
    drawn thin and the numbers are left off.

    Parameters
    ----------
    result : rallyarc.shot.ShotResult
        Recorded shots (``record=True``).
    ax : matplotlib Axes, optional

    Returns
    -------
    matplotlib.figure.Figure
    """
    fig, ax, own = figure_and_axes(ax, (12.0, 5.6))
    c = result.conditions
    many = len(result) > MANY
    plane_x = court.HALF_LENGTH + c.receiver_plane_m
    groups = variant_groups(result)
    paths, beyond = {}, {}
    for _, idx, _ in groups:
        for i in drawn(idx, many):
            paths[i] = sampled_path(result, i, dt)
            beyond[i] = _beyond_receiver(result, i, dt)
    bottom = _set_limits(ax, result.metrics, paths, plane_x)
    _side_court(ax, c, plane_x, bottom)
    _draw_paths(ax, groups, paths, beyond, many)
    placer = LabelPlacer(ax)
    placer.block_box(-0.15, 0.0, 0.15, court.NET_HEIGHT_CENTRE)
    events = _draw_events(ax, placer, result, groups, many, plane_x)
    _side_legends(fig, ax, own, result, many)
    ax.set_title(_side_title(result), fontsize=10, loc="left", pad=18)
    freeze_layout(fig, own)
    if not many:
        for kind, x, z, text, colour in sorted(events, key=lambda e: _LABEL_ORDER.get(e[0], 9)):
            if text:
                placer.place(x, z, text, colour, _LABEL_DIRECTIONS[kind])
    return fig


def _set_limits(ax, m, paths, plane_x):
    """Axes limits that hold the drawn paths, the bounce apexes and the receiver's plane, with
    room below the ground for the court band; returns the bottom."""
    x_lo = min(-court.HALF_LENGTH - 1.0, min(p[0, 0] for p in paths.values()) - 0.8)
    apex_x = np.nanmax(np.append(m["bounce_apex_x_m"], plane_x))
    x_hi = min(max(plane_x + 1.5, apex_x + 2.4), court.HALF_LENGTH + 9.0)
    z_top = max(float(np.nanmax(p[:, 2])) for p in paths.values())
    z_top = max(z_top, float(np.nanmax(np.append(m["bounce_apex_m"], 1.2))))
    top = 1.15 * z_top + 0.5
    bottom = -0.27 * top
    ax.set_xlim(x_lo, x_hi)
    ax.set_ylim(bottom, top)
    return bottom


def _draw_paths(ax, groups, paths, beyond, many):
    """Each variant's paths in its colour and line style, dotted past the receiver's plane."""
    for label, idx, k in groups:
        colour, style = palette.variant_colour(k), palette.variant_style(k)
        lw, alpha = (0.9, 0.45) if many else (2.0, 1.0)
        for j, i in enumerate(drawn(idx, many)):
            p = paths[i]
            ax.plot(
                p[:, 0],
                p[:, 2],
                color=colour,
                ls=style,
                lw=lw,
                alpha=alpha,
                zorder=4,
                label=display_label(label) if j == 0 else None,
                solid_capstyle="round",
            )
            if beyond[i] is not None:
                q = beyond[i]
                ax.plot(q[:, 0], q[:, 2], color=colour, ls=":", lw=lw * 0.8, alpha=alpha, zorder=3)


def _draw_events(ax, placer, result, groups, many, plane_x):
    """The event markers of the drawn shots, kept free of labels; returns the events (kind, x,
    z, text, colour) whose numbers are placed once the layout is fixed."""
    m = result.metrics
    r = result.conditions.ball.radius
    events = []
    for _label, idx, k in groups:
        colour = palette.variant_colour(k)
        for i in drawn(idx, many):
            marks = _side_events(m, i, r, plane_x, is_serve(result, [i]), colour)
            events.extend(e for e in marks if not (many and e[0] in ("apex", "twice")))
    for kind, x, z, _, colour in events:
        ax.plot(
            x,
            z,
            marker=EVENT_MARKERS[kind],
            ms=4.5 if many else 6.5,
            mfc=colour,
            mec=palette.COURT_HEX["ink"],
            mew=0.7,
            ls="none",
            zorder=6,
        )
        placer.block(x, z)
    return events


def _beyond_receiver(result, i, dt=0.004):
    """The recorded flight after the receiver's plane (to the second bounce), or None."""
    second = result.after_bounce
    if second is None or i not in second.shots:
        return None
    k = int(second.columns([i])[0])
    end1 = float(second.end_t[k])
    after = second.flight
    if not np.isfinite(end1) or after.trajectory is None:
        return None
    t_stop = float(after.t[k])
    if t_stop <= end1 + 1e-9:
        return None
    times = np.append(np.arange(end1, t_stop, dt), t_stop)
    pos, _, _ = second.trajectory_of([i]).sample(times)
    return pos[:, 0]


def _side_events(m, i, r, plane_x, serve, colour):
    """(kind, x, z, text, colour) of the marks of shot i."""
    out = []
    if m["net_crossed_plane"][i]:
        clr = m["net_clearance_m"][i]
        out.append(("net", 0.0, m["net_height_m"][i], f"net {clr:+.2f} m", colour))
    if np.isfinite(m["land_x_m"][i]) and m["outcome"][i] != "net":
        depth = m["land_box_depth_m"][i] if serve else m["land_depth_m"][i]
        side = m["land_box_side_margin_m"][i] if serve else m["land_side_margin_m"][i]
        if depth >= 0 and side >= 0:
            text = f"depth {depth:.2f} m"
        elif depth < 0 and side >= 0:
            text = f"long by {-depth:.2f} m"
        elif side < 0 <= depth:
            text = f"wide by {-side:.2f} m"
        else:
            text = f"long {-depth:.2f}, wide {-side:.2f} m"
        out.append(("land", m["land_x_m"][i], 0.0, text, colour))
    if m["bounce_occurred"][i] and np.isfinite(m["bounce_apex_m"][i]):
        out.append(
            ("apex", m["bounce_apex_x_m"][i], m["bounce_apex_m"][i],
             f"apex {m['bounce_apex_m'][i]:.2f} m", colour)
        )  # fmt: skip
    if np.isfinite(m["receiver_height_m"][i]):
        h = m["receiver_height_m"][i]
        out.append(("receiver", plane_x, h, f"{h:.2f} m", colour))
    elif np.isfinite(m["bounce_second_x_m"][i]):
        out.append(("twice", m["bounce_second_x_m"][i], 0.0, "2nd bounce", colour))
    return out


def _side_court(ax, c, plane_x, bottom):
    hexes = palette.COURT_HEX
    band = -bottom * 0.28
    x0, x1 = ax.get_xlim()
    ax.add_patch(Rectangle((x0, bottom), x1 - x0, -bottom, fc=hexes["surround"], lw=0, zorder=1))
    ax.add_patch(
        Rectangle(
            (-court.HALF_LENGTH, -band), court.LENGTH, band, fc=hexes["surface"], lw=0, zorder=1
        )
    )
    ax.axhline(0.0, color=hexes["ink"], lw=0.8, zorder=2)
    for x in (-court.HALF_LENGTH, -court.SERVICE_LINE, court.SERVICE_LINE, court.HALF_LENGTH):
        ax.plot([x, x], [-band, 0.0], color=hexes["line"], lw=2.5, zorder=2, solid_capstyle="butt")
        ax.axvline(x, color="#b5b5b5", lw=0.6, ls=(0, (2, 3)), zorder=0)
    # the net: to its centre height, with the cord's rise to the posts shown faintly
    ax.plot([0, 0], [0, court.NET_HEIGHT_CENTRE], color=hexes["net"], lw=3.2, zorder=5,
            solid_capstyle="butt")  # fmt: skip
    ax.plot([0, 0], [court.NET_HEIGHT_CENTRE, court.NET_HEIGHT_POST], color="#8c8c8c", lw=1.6,
            zorder=5, solid_capstyle="butt")  # fmt: skip
    ax.axvline(plane_x, color="#6d6d6d", lw=1.0, ls=(0, (5, 3)), zorder=2)
    sec = ax.secondary_xaxis("top")
    sec.set_xticks(
        [-court.HALF_LENGTH, -court.SERVICE_LINE, 0.0, court.SERVICE_LINE, court.HALF_LENGTH]
    )
    sec.set_xticklabels(["baseline", "service line", "net", "service line", "baseline"])
    sec.tick_params(labelsize=8, length=3)
    ax.set_xlabel("distance along the court from the net x [m] (hitter's side negative)")
    ax.set_ylabel("height above the court z [m]")
    ax.set_yticks([t for t in ax.get_yticks() if 0 <= t <= ax.get_ylim()[1]])
    ax.grid(True, axis="y", color="#e2e2e2", lw=0.6, zorder=0)
    ax.set_axisbelow(True)


def _side_legends(fig, ax, own, result, many):
    c = result.conditions
    groups = variant_groups(result)
    handles = [
        Line2D([], [], color=palette.variant_colour(k), ls=palette.variant_style(k), lw=2.2)
        for _, _, k in groups
    ]
    labels = [
        variant_legend_label(result, label, idx) if len(idx) > 1 else display_label(label)
        for label, idx, _ in groups
    ]
    scattered = any(len(idx) > 1 for _, idx, _ in groups)
    ink = palette.COURT_HEX["ink"]

    def key(marker):
        return Line2D([], [], marker=marker, ls="none", mfc="white", mec=ink, ms=6.5)

    serves = bool(np.any(result.serve))
    depth_word = "from the baseline (serves: the service line)" if serves else "from the baseline"
    marks = [
        (Line2D([], [], color=palette.COURT_HEX["net"], lw=3), "net: 0.914 m at the centre, "
         f"{court.NET_HEIGHT_POST:.2f} m at the {'singles sticks' if c.singles else 'posts'}"),
        (key(EVENT_MARKERS["net"]), "net crossing: clearance over the net"),
        (key(EVENT_MARKERS["land"]), f"landing: depth {depth_word}"),
        (key(EVENT_MARKERS["apex"]), "apex after the bounce"),
        (Line2D([], [], color="#6d6d6d", lw=1, ls=(0, (5, 3)), marker=EVENT_MARKERS["receiver"],
                mfc="white", mec=ink), f"height at the receiver's contact plane, "
         f"{c.receiver_plane_m:.1f} m behind the baseline"),
        (Line2D([], [], color="#555555", ls=":", lw=1.4), "ball flying on past the receiver"),
    ]  # fmt: skip
    if np.any(~np.isfinite(result.metrics["receiver_height_m"])):
        marks.append((key(EVENT_MARKERS["twice"]), "second bounce before the receiver's plane"))
    target = fig if own else ax
    kw = {"loc": "outside lower left"} if own else {"loc": "upper left"}
    leg1 = target.legend(
        handles,
        labels,
        title="stroke variant" if not many else f"stroke variant ({len(result)} shots)",
        ncol=min(2 if scattered else 3, max(1, len(labels))),
        fontsize=8.5,
        title_fontsize=8.5,
        frameon=False,
        alignment="left",
        **kw,
    )
    if own:
        fig.legend(
            [h for h, _ in marks],
            [t for _, t in marks],
            loc="outside lower right",
            ncol=1 if scattered else 2,
            fontsize=8,
            frameon=False,
        )
    else:
        ax.add_artist(leg1)


def _side_title(result):
    c = result.conditions
    modes = "".join(f"; {m}" for m in c.modes)
    return (
        f"Side view: height of the ball down the court ({c.surface_name}, ball {c.ball.name}, "
        f"air {c.air.density:.3f} kg/m³{modes})"
    )
