"""A success window's figure: the outcome over a grid of two parameters, margin contours inside
the window and the stroke's own setting with its room to each edge (matplotlib). The grid is
:func:`rallyarc.window.window`'s; nothing here runs the shots."""

from __future__ import annotations

import numpy as np
from matplotlib.colors import BoundaryNorm, ListedColormap
from matplotlib.lines import Line2D
from matplotlib.patches import Patch

from rallyarc.viz import palette
from rallyarc.viz.common import OUTCOME_WORDS, display_label, figure_and_axes

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
    window_result : rallyarc.window.Window

    Returns
    -------
    matplotlib.figure.Figure
    """
    from rallyarc.sweep import PARAMETERS

    w = window_result
    fig, ax, own = figure_and_axes(ax, (9.0, 6.8))
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
        handles += _margin_contours(ax, w, xs, ys, inside)
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


def _margin_contours(ax, w, xs, ys, inside):
    """Labelled contours of each margin (net clearance, depth, side margin) inside the window, at
    the levels of :data:`_MARGIN_STYLES` that the margin reaches; returns their legend handles."""
    handles = []
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
    return handles


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
