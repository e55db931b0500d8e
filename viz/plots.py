"""2D figures of shots: side view, top view, sweeps and success windows (matplotlib).

Every function takes results (a :class:`rallyarc.shot.ShotResult` or a
:class:`rallyarc.sweep.Window`), draws them and returns the matplotlib Figure. Nothing here
computes physics: paths are the recorded trajectories sampled, numbers are the metrics of the
result. Figures are made without pyplot (no global figure list, no display needed); in a
notebook they show as usual, and :func:`save_figure` writes them to a file.
"""

from __future__ import annotations

import math
from pathlib import Path

import numpy as np
from matplotlib.backends.backend_agg import FigureCanvasAgg
from matplotlib.colors import BoundaryNorm, ListedColormap
from matplotlib.figure import Figure
from matplotlib.layout_engine import ConstrainedLayoutEngine
from matplotlib.lines import Line2D
from matplotlib.patches import Ellipse, Patch, Rectangle
from matplotlib.text import Text

from rallyarc import court, units
from rallyarc.output.export import atomic_write
from rallyarc.viz import palette

#: Metrics a sweep can show: label on the axis, unit, factor from the metric's SI value, and
#: the line drawn at zero (None for no line).
METRICS = {
    "net_clearance_m": ("net clearance", "m", 1.0, "top of the net"),
    "land_depth_m": ("landing depth inside the baseline", "m", 1.0, "baseline"),
    "land_side_margin_m": ("landing inside the sideline", "m", 1.0, "sideline"),
    "bounce_apex_m": ("bounce apex height", "m", 1.0, None),
    "bounce_kick_deg": ("kick: rise minus fall angle", "deg", 1.0, None),
    "receiver_height_m": ("height at the receiver's plane", "m", 1.0, None),
    "flight_peak_m": ("highest point before the bounce", "m", 1.0, None),
    "land_x_m": ("landing point along the court", "m", 1.0, None),
    "impact_speed_mps": ("ball speed off the racket", "km/h", units.KMH_PER_MPS, None),
    "impact_launch_deg": ("launch angle", "deg", 1.0, None),
    "impact_topspin_rpm": ("topspin off the racket", "rpm", 1.0, None),
    "bounce_speed_out_mps": ("ball speed after the bounce", "km/h", units.KMH_PER_MPS, None),
}
DEFAULT_SWEEP_METRICS = ("net_clearance_m", "land_depth_m", "bounce_apex_m", "receiver_height_m")
#: A serve's depth and side margin are to the service box's lines.
_SERVE_METRIC = {
    "land_depth_m": ("land_box_depth_m", "landing depth inside the service line"),
    "land_side_margin_m": ("land_box_side_margin_m", "landing inside the box's side lines"),
}
OUTCOME_WORDS = {
    "in": "lands in",
    "net": "into the net",
    "long": "lands long",
    "wide": "lands wide",
    "out": "long and wide",
    "miss": "missed the racket",
}
_OUTCOME_MARKERS = {"in": "o", "net": "X", "long": "^", "wide": ">", "out": "D", "miss": "s"}
_EVENT_MARKERS = {
    "contact": "o",
    "net": "D",
    "land": "v",
    "apex": "^",
    "receiver": "s",
    "twice": "X",
}
_DPI = 110
_MANY = 12  # more shots than this: paths thin, no number labels


def display_label(label):
    """A stroke's preset name as a reader sees it (``topspin_drive`` -> ``topspin drive``)."""
    return str(label).replace("_", " ")


# ----------------------------------------------------------------------------- helpers


def _figure(ax, figsize):
    if ax is not None:
        return ax.figure, ax, False
    fig = Figure(figsize=figsize, layout=ConstrainedLayoutEngine(h_pad=0.07, w_pad=0.07))
    FigureCanvasAgg(fig)
    return fig, fig.add_subplot(), True


def _renderer(fig):
    canvas = fig.canvas
    if hasattr(canvas, "get_renderer"):
        return canvas.get_renderer()
    return fig._get_renderer()


def _freeze(fig, own):
    """Run the layout once and keep it, so that labels placed after it stay where they are."""
    fig.canvas.draw()
    if own:
        fig.set_layout_engine("none")


def variant_groups(result):
    """Distinct labels in order of appearance, with the indices of their shots."""
    labels = np.asarray(result.labels).astype(str)
    order = list(dict.fromkeys(labels))
    return [(lab, np.flatnonzero(labels == lab), i) for i, lab in enumerate(order)]


def drawn(idx, many, limit=40):
    """The shots of a group whose paths are drawn: all of them, or the first ``limit`` when
    there are many."""
    return idx[:limit] if many else idx


def _path(result, i, dt=0.004):
    _, pos, _ = result.path(i, dt=dt)
    return pos


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
    pos, _, _ = after.trajectory.sample(times)
    return pos[:, k]


def _fmt(value, digits=2):
    return f"{value:.{digits}f}"


def _is_serve(result, idx):
    return bool(np.all(np.asarray(result.serve)[idx]))


class _Placer:
    """Greedy placement of text labels: each label takes the first free spot around its anchor
    (nearest first, preferred directions first), clear of earlier labels, markers and the edges
    of the axes; a thin leader line joins a label placed away from its anchor."""

    RINGS = (7, 12, 18, 26, 35, 46, 58, 72, 88, 106, 126, 150)

    def __init__(self, ax, fontsize=7.5):
        self.ax = ax
        self.fig = ax.figure
        self.renderer = _renderer(self.fig)
        self.fontsize = fontsize
        self.taken = []
        self.texts = []
        self.area = ax.get_window_extent(self.renderer)

    def block(self, x, y, size_px=9.0):
        """Keep labels off a marker at data point (x, y)."""
        px, py = self.ax.transData.transform((x, y))
        h = size_px / 2
        self.taken.append((px - h, py - h, px + h, py + h))

    def block_box(self, x0, y0, x1, y1):
        """Keep labels off a rectangle in data coordinates."""
        (a, b), (c, d) = self.ax.transData.transform([(x0, y0), (x1, y1)])
        self.taken.append((min(a, c), min(b, d), max(a, c), max(b, d)))

    def _free(self, box):
        pad = 2.0
        x0, y0, x1, y1 = box
        a = self.area
        if x0 < a.x0 + pad or x1 > a.x1 - pad or y0 < a.y0 + pad or y1 > a.y1 - pad:
            return False
        for u0, v0, u1, v1 in self.taken:
            if x0 < u1 + pad and x1 > u0 - pad and y0 < v1 + pad and y1 > v0 - pad:
                return False
        return True

    def place(self, x, y, text, edge, directions=(45, 135, -45, -135, 90, -90, 0, 180)):
        """Place ``text`` near data point (x, y); ``directions`` in degrees, preferred first."""
        if not (np.isfinite(x) and np.isfinite(y)):
            return None
        ann = self.ax.annotate(
            text,
            (x, y),
            xytext=(0, 0),
            textcoords="offset points",
            fontsize=self.fontsize,
            color=palette.COURT_HEX["ink"],
            bbox={
                "boxstyle": "round,pad=0.2",
                "fc": "white",
                "ec": edge,
                "lw": 1.1,
                "alpha": 0.92,
            },
            arrowprops={"arrowstyle": "-", "color": edge, "lw": 0.8, "shrinkA": 0, "shrinkB": 3},
            zorder=8,
            annotation_clip=False,
        )
        scale = self.fig.dpi / 72.0
        pad_px = 0.2 * self.fontsize * scale + 1.5
        directions = list(directions) + [a for a in range(-165, 181, 15) if a not in directions]
        for ring in self.RINGS:
            for angle in directions:
                c, s = math.cos(math.radians(angle)), math.sin(math.radians(angle))
                ha = "left" if c > 0.3 else "right" if c < -0.3 else "center"
                va = "bottom" if s > 0.3 else "top" if s < -0.3 else "center"
                ann.set_ha(ha)
                ann.set_va(va)
                ann.xyann = (ring * c, ring * s)
                ann.update_positions(self.renderer)
                tb = Text.get_window_extent(ann, self.renderer)
                box = (tb.x0 - pad_px, tb.y0 - pad_px, tb.x1 + pad_px, tb.y1 + pad_px)
                if self._free(box):
                    self.taken.append(box)
                    ann.arrow_patch.set_visible(ring > self.RINGS[1])
                    self.texts.append(ann)
                    return ann
        ann.remove()
        return None


# ----------------------------------------------------------------------------- side view


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
    fig, ax, own = _figure(ax, (12.0, 5.6))
    m = result.metrics
    c = result.conditions
    r = c.ball.radius
    n = len(result)
    many = n > _MANY
    plane_x = court.HALF_LENGTH + c.receiver_plane_m
    groups = variant_groups(result)

    paths, beyond = {}, {}
    for _, idx, _ in groups:
        for i in drawn(idx, many):
            paths[i] = _path(result, i, dt)
            beyond[i] = _beyond_receiver(result, i, dt)

    x_lo = min(-court.HALF_LENGTH - 1.0, min(p[0, 0] for p in paths.values()) - 0.8)
    apex_x = np.nanmax(np.append(m["bounce_apex_x_m"], plane_x))
    x_hi = min(max(plane_x + 1.5, apex_x + 2.4), court.HALF_LENGTH + 9.0)
    z_top = max(float(np.nanmax(p[:, 2])) for p in paths.values())
    z_top = max(z_top, float(np.nanmax(np.append(m["bounce_apex_m"], 1.2))))
    top = 1.15 * z_top + 0.5
    bottom = -0.27 * top
    ax.set_xlim(x_lo, x_hi)
    ax.set_ylim(bottom, top)

    _side_court(ax, c, plane_x, bottom)

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

    placer = _Placer(ax)
    placer.block_box(-0.15, 0.0, 0.15, court.NET_HEIGHT_CENTRE)
    events = []
    for _label, idx, k in groups:
        colour = palette.variant_colour(k)
        for i in drawn(idx, many):
            marks = _side_events(m, i, r, plane_x, _is_serve(result, [i]), colour)
            events.extend(e for e in marks if not (many and e[0] in ("apex", "twice")))
    for kind, x, z, _, colour in events:
        ax.plot(
            x,
            z,
            marker=_EVENT_MARKERS[kind],
            ms=4.5 if many else 6.5,
            mfc=colour,
            mec=palette.COURT_HEX["ink"],
            mew=0.7,
            ls="none",
            zorder=6,
        )
        placer.block(x, z)

    _side_legends(fig, ax, own, result, many)
    ax.set_title(_side_title(result), fontsize=10, loc="left", pad=18)
    _freeze(fig, own)
    if not many:
        prefer = {
            "net": (60, 120, 30, 150, 90, -60, -120, 0, 180),
            "apex": (90, 60, 120, 30, 150, 0, 180, -60, -120),
            "receiver": (0, 30, -30, 60, -60, 90, -90, 180),
            "land": (-90, -60, -120, -30, -150, 180, 0, 90),
            "twice": (-90, -60, -120, -30, -150, 90),
        }
        order = {"net": 0, "land": 1, "receiver": 2, "apex": 3, "twice": 4}
        for kind, x, z, text, colour in sorted(events, key=lambda e: order.get(e[0], 9)):
            if text:
                placer.place(x, z, text, colour, prefer[kind])
    return fig


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
    labels = [display_label(label) for label, _, _ in groups]
    ink = palette.COURT_HEX["ink"]

    def key(marker):
        return Line2D([], [], marker=marker, ls="none", mfc="white", mec=ink, ms=6.5)

    serves = bool(np.any(result.serve))
    depth_word = "from the baseline (serves: the service line)" if serves else "from the baseline"
    marks = [
        (Line2D([], [], color=palette.COURT_HEX["net"], lw=3), "net: 0.914 m at the centre, "
         f"{court.NET_HEIGHT_POST:.2f} m at the {'singles sticks' if c.singles else 'posts'}"),
        (key(_EVENT_MARKERS["net"]), "net crossing: clearance over the net"),
        (key(_EVENT_MARKERS["land"]), f"landing: depth {depth_word}"),
        (key(_EVENT_MARKERS["apex"]), "apex after the bounce"),
        (Line2D([], [], color="#6d6d6d", lw=1, ls=(0, (5, 3)), marker=_EVENT_MARKERS["receiver"],
                mfc="white", mec=ink), f"height at the receiver's contact plane, "
         f"{c.receiver_plane_m:.1f} m behind the baseline"),
        (Line2D([], [], color="#555555", ls=":", lw=1.4), "ball flying on past the receiver"),
    ]  # fmt: skip
    if np.any(~np.isfinite(result.metrics["receiver_height_m"])):
        marks.append((key(_EVENT_MARKERS["twice"]), "second bounce before the receiver's plane"))
    target = fig if own else ax
    kw = {"loc": "outside lower left"} if own else {"loc": "upper left"}
    leg1 = target.legend(
        handles,
        labels,
        title="stroke variant" if not many else f"stroke variant ({len(result)} shots)",
        ncol=min(3, max(1, len(labels))),
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
            ncol=2,
            fontsize=8,
            frameon=False,
        )
    else:
        ax.add_artist(leg1)


def _side_title(result):
    c = result.conditions
    return (
        f"Side view: height of the ball down the court ({c.surface_name}, ball {c.ball.name}, "
        f"air {c.air.density:.3f} kg/m³)"
    )


# ----------------------------------------------------------------------------- top view


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


def draw_court_lines(ax, zorder=1, edge=None):
    """The court's lines as filled strips of their real width (:func:`rallyarc.court.
    line_segments`), optionally with a thin ``edge`` colour so that they show on light data."""
    w = court.LINE_WIDTH
    for xa, ya, xb, yb in court.line_segments():
        if xa == xb:
            rect = Rectangle((xa - w / 2, ya), w, yb - ya)
        else:
            rect = Rectangle((xa, ya - w / 2), xb - xa, w)
        rect.set(fc=palette.COURT_HEX["line"], ec=edge or "none", lw=0.3 if edge else 0,
                 zorder=zorder)  # fmt: skip
        ax.add_patch(rect)


def _ellipse(points, n_sigma=2.0):
    """Centre, width, height and angle [deg] of the n-sigma covariance ellipse of points."""
    mean = points.mean(axis=0)
    cov = np.cov(points, rowvar=False)
    vals, vecs = np.linalg.eigh(cov)
    vals = np.clip(vals, 0.0, None)
    angle = math.degrees(math.atan2(vecs[1, 1], vecs[0, 1]))
    return mean, 2 * n_sigma * math.sqrt(vals[1]), 2 * n_sigma * math.sqrt(vals[0]), angle


def top_view(result, ax=None, dt=0.004, min_shots=10):
    """The court from above, to scale, with each variant's path and landing point.

    A variant with at least ``min_shots`` landings gets its 2-sigma dispersion ellipse (the
    covariance ellipse of its landing points; for normally scattered landings it holds about
    86 % of them) and its mean landing point.

    Returns
    -------
    matplotlib.figure.Figure
    """
    fig, ax, own = _figure(ax, (12.0, 6.6))
    m = result.metrics
    c = result.conditions
    n = len(result)
    many = n > _MANY
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

    n_groups = len(groups)
    ellipses = False
    for label, idx, k in groups:
        colour, style = palette.variant_colour(k), palette.variant_style(k)
        # overlapping paths show as nested stripes: earlier variants drawn wider
        lw = 0.8 if many else 1.4 + 2.4 * (n_groups - 1 - k) / max(1, n_groups - 1)
        for j, i in enumerate(drawn(idx, many)):
            p = _path(result, i, dt)
            ax.plot(p[:, 0], p[:, 1], color=colour, ls=style, lw=lw, alpha=0.5 if many else 1.0,
                    zorder=3 + k * 0.01, label=display_label(label) if j == 0 else None,
                    solid_capstyle="butt")  # fmt: skip
        lx, ly = m["land_x_m"][idx], m["land_y_m"][idx]
        ok = np.isfinite(lx) & np.isfinite(ly)
        ax.plot(lx[ok], ly[ok], ls="none", marker=_EVENT_MARKERS["land"], ms=3.5 if many else 7,
                mfc=colour, mec=palette.COURT_HEX["ink"], mew=0.6, zorder=6)  # fmt: skip
        if ok.sum() >= min_shots:
            ellipses = True
            centre, width, height, angle = _ellipse(np.column_stack([lx[ok], ly[ok]]))
            ax.add_patch(Ellipse(centre, width, height, angle=angle, fill=False, ec=colour,
                                 lw=2.2, zorder=7))  # fmt: skip
            ax.plot(*centre, marker="P", ms=9, mfc=colour, mec="white", mew=1.0, zorder=8)

    ink = palette.COURT_HEX["ink"]
    handles = [
        Line2D([], [], color=palette.variant_colour(k), ls=palette.variant_style(k), lw=2.5)
        for _, _, k in groups
    ]
    labels = [display_label(label) for label, _, _ in groups]
    extra = [
        (Line2D([], [], ls="none", marker=_EVENT_MARKERS["land"], mfc="white", mec=ink, ms=7),
         "landing point"),
        (Line2D([], [], color="#6d6d6d", lw=1, ls=(0, (5, 3))),
         f"receiver's contact plane ({c.receiver_plane_m:.1f} m behind the baseline)"),
    ]  # fmt: skip
    if ellipses:
        extra.append(
            (Patch(fill=False, ec=ink, lw=2), f"2-sigma landing ellipse (>= {min_shots} shots)")
        )
        extra.append(
            (Line2D([], [], ls="none", marker="P", mfc=ink, mec="white", ms=9), "mean landing")
        )
    target = fig if own else ax
    target.legend(
        handles + [h for h, _ in extra],
        labels + [t for _, t in extra],
        loc="outside lower center" if own else "upper left",
        ncol=4,
        fontsize=8.5,
        frameon=False,
    )
    ax.set_xlabel("distance along the court from the net x [m] (hitter's side negative)")
    ax.set_ylabel("across the court y [m] (+ left of the hitter)")
    ax.set_title(
        f"Top view: paths and landings ({'singles' if c.singles else 'doubles'} court, "
        f"{len(result)} shot{'s' if len(result) != 1 else ''})",
        fontsize=10,
        loc="left",
    )
    if own:  # room for the court to scale: the figure's height follows the court's aspect
        (x0, x1), (y0, y1) = ax.get_xlim(), ax.get_ylim()
        fig.set_size_inches(12.0, min(9.0, 1.9 + 10.6 * (y1 - y0) / (x1 - x0)))
    return fig


# ----------------------------------------------------------------------------- sweeps


def sweep_plot(
    result,
    values,
    parameter_label,
    metrics=DEFAULT_SWEEP_METRICS,
    ax=None,
    nominal=None,
    title=None,
):
    """Metrics of a sweep against the swept parameter, one panel per metric.

    Parameters
    ----------
    result : rallyarc.shot.ShotResult
        The sweep's shots, in the order of ``values`` (:func:`rallyarc.sweep.sweep`).
    values : array (N,)
        The swept values in the units to show (km/h, deg, rpm).
    parameter_label : str
        The x axis label with its unit, e.g. ``"topspin at launch [rpm]"``.
    metrics : sequence of str
        Keys of :data:`METRICS`; for serves depth and side margin are to the service box.
    ax : Axes or sequence of Axes, optional
        One axes per metric.
    nominal : float, optional
        The stroke's own value, marked with a vertical line.

    Returns
    -------
    matplotlib.figure.Figure
    """
    metrics = tuple(metrics)
    unknown = [k for k in metrics if k not in METRICS]
    if unknown:
        raise ValueError(f"unknown metric {unknown[0]!r}; choose from {', '.join(METRICS)}")
    values = np.asarray(values, float)
    if values.shape != (len(result),):
        raise ValueError("values must have one entry per shot of the result")
    if ax is None:
        fig = Figure(figsize=(8.0, 1.2 + 2.0 * len(metrics)), layout="constrained")
        FigureCanvasAgg(fig)
        axes = fig.subplots(len(metrics), 1, sharex=True, squeeze=False)[:, 0]
    else:
        axes = np.atleast_1d(ax)
        if axes.size != len(metrics):
            raise ValueError("give one axes per metric")
        fig = axes[0].figure
    serve = bool(np.all(result.serve))
    outcomes = np.asarray(result.metrics["outcome"]).astype(str)
    ink = palette.COURT_HEX["ink"]
    for a, key in zip(axes, metrics, strict=True):
        name, unit, factor, zero = METRICS[key]
        if serve and key in _SERVE_METRIC:
            key, name = _SERVE_METRIC[key]
            zero = "service line" if "depth" in key else "box line"
        y = np.asarray(result.metrics[key], float) * factor
        a.plot(values, y, color=palette.variant_colour(0), lw=1.8, zorder=3)
        for outcome in dict.fromkeys(outcomes):
            sel = outcomes == outcome
            a.plot(values[sel], y[sel], ls="none", marker=_OUTCOME_MARKERS.get(outcome, "o"),
                   ms=6, mfc=palette.OUTCOME_HEX.get(outcome, "#999999"), mec=ink, mew=0.6,
                   zorder=4)  # fmt: skip
        if zero is not None:
            a.axhline(0.0, color="#777777", lw=1.0, ls=(0, (4, 2)), zorder=2)
            a.annotate(zero, (1.0, 0.0), xycoords=("axes fraction", "data"), xytext=(-3, 3),
                       textcoords="offset points", ha="right", va="bottom", fontsize=7.5,
                       color="#555555")  # fmt: skip
        if nominal is not None:
            a.axvline(nominal, color="#555555", lw=1.0, ls=":", zorder=2)
        a.set_ylabel(f"{name}\n[{unit}]", fontsize=8.5)
        a.grid(True, color="#e6e6e6", lw=0.6)
        a.tick_params(labelsize=8)
    axes[-1].set_xlabel(parameter_label)
    handles = [
        Line2D([], [], ls="none", marker=_OUTCOME_MARKERS.get(o, "o"), ms=6,
               mfc=palette.OUTCOME_HEX.get(o, "#999999"), mec=ink, label=OUTCOME_WORDS.get(o, o))
        for o in dict.fromkeys(outcomes)
    ]  # fmt: skip
    if nominal is not None:
        handles.append(Line2D([], [], color="#555555", ls=":", label="the stroke as set"))
    if ax is None:
        fig.legend(handles=handles, loc="outside upper right", ncol=len(handles), fontsize=8,
                   frameon=False)  # fmt: skip
        label = display_label(result.labels[0]) if len(result) else ""
        fig.suptitle(title or f"{label}: what changes with {parameter_label}", fontsize=10,
                     x=0.02, ha="left")  # fmt: skip
    else:
        axes[0].legend(handles=handles, fontsize=7.5)
    return fig


# ----------------------------------------------------------------------------- windows

_OUTCOME_ORDER = ("in", "net", "long", "wide", "out", "miss")
_MARGIN_STYLES = {
    "net_clearance_m": ("net clearance", "net", "-", (0.5, 1.0)),
    "depth_m": ("depth", "depth", (0, (5, 2)), (1.0, 2.0, 3.0)),
    "side_margin_m": ("side margin", "side", (0, (1.2, 1.5)), (0.5, 1.0)),
}


def window_plot(window_result, ax=None):
    """A success window: the grid's cells shaded by outcome (in, net, long, wide, ...), with
    contours of the margin to each edge inside the window (net clearance, depth and side
    margin [m]) and the stroke's own setting marked with its margins.

    Parameters
    ----------
    window_result : rallyarc.sweep.Window

    Returns
    -------
    matplotlib.figure.Figure
    """
    from rallyarc.sweep import PARAMETERS

    w = window_result
    fig, ax, own = _figure(ax, (9.0, 6.8))
    px, py = PARAMETERS[w.x_param], PARAMETERS[w.y_param]
    xs, ys = px.from_si(w.x_values), py.from_si(w.y_values)
    codes = np.vectorize(lambda o: _OUTCOME_ORDER.index(o) if o in _OUTCOME_ORDER else 5)(w.outcome)
    cmap = ListedColormap([palette.OUTCOME_HEX[o] for o in _OUTCOME_ORDER])
    norm = BoundaryNorm(np.arange(len(_OUTCOME_ORDER) + 1) - 0.5, cmap.N)
    ax.pcolormesh(xs, ys, codes, cmap=cmap, norm=norm, shading="nearest", zorder=1,
                  rasterized=True)  # fmt: skip
    inside = w.outcome == "in"
    handles = [
        Patch(fc=palette.OUTCOME_HEX[o], ec="#555555", lw=0.5, label=OUTCOME_WORDS[o])
        for o in _OUTCOME_ORDER
        if np.any(w.outcome == o)
    ]
    if inside.sum() >= 4 and len(xs) > 1 and len(ys) > 1:
        for band, (key, (name, short, style, levels)) in enumerate(_MARGIN_STYLES.items()):
            field = np.where(inside, getattr(w, key), np.nan)
            if not np.any(np.isfinite(field)):
                continue
            lo, hi = np.nanmin(field), np.nanmax(field)
            lv = [v for v in levels if lo < v < hi]
            if not lv:
                continue
            cs = ax.contour(xs, ys, field, levels=lv, colors="white", linestyles=[style],
                            linewidths=1.3, zorder=3)  # fmt: skip
            ax.clabel(cs, fmt=lambda v, s=short: f"{s} {v:g} m", fontsize=7.5, colors="white",
                      manual=_label_spots(cs, xs, ys, band))  # fmt: skip
            handles.append(Line2D([], [], color="#333333", ls=style, lw=1.3,
                                  label=f"{name} inside the window [m]"))  # fmt: skip
    nx, ny = px.from_si(w.nominal[0]), py.from_si(w.nominal[1])
    if xs.min() <= nx <= xs.max() and ys.min() <= ny <= ys.max():
        ax.plot(nx, ny, marker="*", ms=15, mfc="white", mec=palette.COURT_HEX["ink"], mew=1.2,
                zorder=5)  # fmt: skip
        nm = w.nominal_margins
        text = f"the {'stroke' if w.result.swing is not None else 'launch'} as set: " + (
            f"{OUTCOME_WORDS[nm['outcome']]}\nnet {nm['net_clearance_m']:+.2f} m, depth "
            f"{nm['depth_m']:.2f} m,\nside {nm['side_margin_m']:.2f} m"
        )
        handles.append(Line2D([], [], ls="none", marker="*", ms=12, mfc="white",
                              mec=palette.COURT_HEX["ink"], label=text))  # fmt: skip
        _room_arrows(ax, w, px, py, nx, ny)
    ax.set_xlabel(px.axis_label)
    ax.set_ylabel(py.axis_label)
    what = "service box" if w.serve else "court"
    ax.set_title(
        f"Success window of {display_label(w.label)}: {100 * w.fraction_in():.0f} % of the grid "
        f"lands in the {what}",
        fontsize=10,
        loc="left",
    )
    (fig if own else ax).legend(
        handles=handles,
        loc="outside right upper" if own else "best",
        fontsize=8,
        frameon=False,
        title="outcome and margins",
        title_fontsize=8,
        alignment="left",
    )
    return fig


def _label_spots(cs, xs, ys, band):
    """One label position per contour line, at a height of the map kept for this family of
    margins (net clearance high, depth low, side margin in between), so that the labels of
    lines that run close together do not fall on each other."""
    # away from the middle, where the stroke's own setting and its arrows usually are
    target = ys.min() + (0.86, 0.14, 0.7)[band % 3] * (ys.max() - ys.min())
    spots = []
    for segments in cs.allsegs:
        points = [seg for seg in segments if len(seg)]
        if not points:
            continue
        points = np.concatenate(points)
        # keep the label off the map's left and right edges, where it would be cut
        span = xs.max() - xs.min()
        inner = (points[:, 0] > xs.min() + 0.1 * span) & (points[:, 0] < xs.max() - 0.1 * span)
        points = points[inner] if inner.any() else points
        k = int(np.argmin(np.abs(points[:, 1] - target)))
        spots.append(tuple(points[k]))
    return spots


def _room_arrows(ax, w, px, py, nx, ny):
    """Arrows from the nominal setting to the window's edges, labelled with the room."""
    room = w.room()
    ink = palette.COURT_HEX["ink"]
    for param, axis in ((px, 0), (py, 1)):
        for sign, (dist, beyond) in zip((-1, 1), room.get(param.name, ()), strict=False):
            if dist is None:
                continue
            d = param.from_si(dist)
            end = (nx + sign * d, ny) if axis == 0 else (nx, ny + sign * d)
            ax.annotate("", end, (nx, ny), arrowprops={"arrowstyle": "-|>", "color": ink,
                        "lw": 1.2, "shrinkA": 7, "shrinkB": 0}, zorder=6)  # fmt: skip
            offset = (sign * 4, 8) if axis == 0 else (6, sign * 4)
            ha = ("left" if sign > 0 else "right") if axis == 0 else "left"
            va = "bottom" if axis == 0 else ("bottom" if sign > 0 else "top")
            ax.annotate(
                f"{sign * d:+.1f} {param.unit}: {OUTCOME_WORDS.get(beyond, beyond)}",
                end,
                xytext=offset,
                textcoords="offset points",
                ha=ha,
                va=va,
                fontsize=7.5,
                color=ink,
                bbox={"boxstyle": "round,pad=0.2", "fc": "white", "ec": "none", "alpha": 0.85},
                zorder=7,
            )


# ----------------------------------------------------------------------------- files

_FORMATS = {".png": "png", ".pdf": "pdf", ".svg": "svg"}


def save_figure(fig, path, dpi=_DPI):
    """Write a figure atomically (a temporary file in the same folder, then moved into place);
    the format follows the suffix: .png, .pdf or .svg. Returns the path."""
    path = Path(path)
    fmt = _FORMATS.get(path.suffix.lower())
    if fmt is None:
        raise ValueError(f"{path}: unknown figure format; use {', '.join(_FORMATS)}")
    return atomic_write(path, lambda tmp: fig.savefig(tmp, format=fmt, dpi=dpi))
