"""A printable one-page drill sheet: court diagram, feed settings table and safety cautions."""

from __future__ import annotations

import numpy as np
from matplotlib.backends.backend_agg import FigureCanvasAgg
from matplotlib.figure import Figure
from matplotlib.patches import Rectangle

from rallyarc import court

#: Colours of the sheet (our own choice; dark blue ink, an orange for targets that is told apart
#: from the blue by lightness as well as hue).
INK = "#1d3557"
TARGET = "#d9822b"
COURT = "#e9efe6"
LINE = "#ffffff"


def _court(ax):
    half_l, half_w = court.HALF_LENGTH, court.DOUBLES_WIDTH / 2
    ax.add_patch(
        Rectangle(
            (-half_l - 3, -half_w - 2), 2 * half_l + 6, 2 * half_w + 4, color="#c9d8c5", zorder=0
        )
    )
    ax.add_patch(Rectangle((-half_l, -half_w), 2 * half_l, 2 * half_w, color=COURT, zorder=0))
    sw = court.SINGLES_WIDTH / 2
    kw = {"color": INK, "lw": 1.0, "zorder": 1}
    for y in (-half_w, half_w, -sw, sw):
        ax.plot([-half_l, half_l], [y, y], **kw)
    for x in (-half_l, half_l):
        ax.plot([x, x], [-half_w, half_w], **kw)
    for x in (-court.SERVICE_LINE, court.SERVICE_LINE):
        ax.plot([x, x], [-sw, sw], **kw)
    ax.plot([-court.SERVICE_LINE, court.SERVICE_LINE], [0, 0], **kw)
    ax.plot([0, 0], [-court.POST_Y, court.POST_Y], color=INK, lw=2.5, zorder=2)
    ax.set_aspect("equal")
    ax.set_xlim(-half_l - 2.5, half_l + 2.5)
    ax.set_ylim(-half_w - 1.5, half_w + 1.5)
    ax.set_xlabel("along the court x [m]")
    ax.set_ylabel("across y [m]")


def drill_sheet(drill, sheet, paths, safety, units="kmh"):
    """Draw the sheet. ``paths`` maps a ball number to its (x, y) path points (court frame).

    Returns a matplotlib Figure made without pyplot: no backend is chosen or switched, and the
    figure is in no global figure list (save it with ``fig.savefig``).
    """
    fig = Figure(figsize=(8.27, 11.69))  # A4 portrait
    FigureCanvasAgg(fig)
    fig.text(0.06, 0.965, drill.name, fontsize=16, weight="bold", color=INK)
    fig.text(0.06, 0.948, f"{drill.coach}, {drill.club}", fontsize=10, color=INK)
    fig.text(0.06, 0.932, drill.description, fontsize=9, wrap=True, va="top")
    _court_map(fig.add_axes([0.08, 0.57, 0.86, 0.31]), drill, sheet, paths)
    _settings_table(fig.add_axes([0.06, 0.36, 0.88, 0.15]), sheet, units)
    notes = [
        f"{r.ball}. {r.label}" + ("" if r.reachable else f"  NOT REACHABLE: {r.note}")
        for r in sheet.itertuples()
    ]
    notes.append(
        "at player: ball height at the player's contact plane; time: from release to that plane;"
        " - : the ball bounces twice before it gets there;\ncall: where the ball landed"
        " (in, net, long, wide, out)"
    )
    fig.text(0.06, 0.36, "\n".join(notes), fontsize=8, va="top", wrap=True)
    fig.text(
        0.06,
        0.30,
        safety,
        fontsize=8.5,
        va="top",
        wrap=True,
        color="#7a1f1f",
        bbox={"boxstyle": "round", "fc": "#fbeeee", "ec": "#7a1f1f"},
    )
    fig.text(
        0.06,
        0.025,
        "rallyarc drill sheet: settings from a physics model; test them with slow feeds first.",
        fontsize=7,
        color="#555555",
    )
    return fig


def _court_map(ax, drill, sheet, paths):
    """The court with the machine, each ball's path, its target (circle) and landing (cross)."""
    _court(ax)
    mx, my = drill.position
    ax.plot(mx, my, marker="s", ms=10, color=INK, zorder=4)
    ax.annotate(
        "machine",
        (mx, my),
        xytext=(0, 10),
        textcoords="offset points",
        ha="center",
        fontsize=8,
        color=INK,
    )
    for row in sheet.itertuples():
        if row.ball in paths:
            xy = paths[row.ball]
            ax.plot(xy[:, 0], xy[:, 1], color=INK, lw=0.8, alpha=0.6, zorder=3)
        ax.plot(
            row.target_x_m,
            row.target_y_m,
            marker="o",
            ms=13,
            mfc="none",
            mec=TARGET,
            mew=2,
            zorder=5,
        )
        ax.plot(row.land_x_m, row.land_y_m, marker="x", ms=7, color=INK, zorder=6)
        ax.annotate(
            str(row.ball),
            (row.target_x_m, row.target_y_m),
            xytext=(9, 6),
            textcoords="offset points",
            fontsize=10,
            weight="bold",
            color=TARGET,
        )
    ax.set_title(
        "targets (circles), simulated landings (crosses), machine and ball paths", fontsize=9
    )


def _settings_table(ax, sheet, units):
    """The machine's settings and what each ball does, one row per ball."""
    speed_col, unit = ("speed_kmh", "km/h") if units == "kmh" else ("speed_mph", "mph")

    def f(v, fmt):
        return fmt.format(v) if np.isfinite(v) else "-"

    cols = [
        "#",
        "reps",
        f"speed\n[{unit}]",
        "elevation\n[deg]",
        "aim, + left\n[deg]",
        "spin\n[rpm]",
        "lands at\nx, y [m]",
        "apex\n[m]",
        "at player\n[m]",
        "time\n[s]",
        "call",
    ]
    cells = [
        [
            str(r.ball),
            str(r.repeat),
            f(getattr(r, speed_col), "{:.0f}"),
            f(r.elevation_deg, "{:.1f}"),
            f(r.aim_left_deg, "{:+.1f}"),
            f(r.spin_rpm, "{:+.0f}"),
            f"{r.land_x_m:+.1f}, {r.land_y_m:+.1f}",
            f(r.bounce_apex_m, "{:.2f}"),
            f(r.height_at_player_m, "{:.2f}"),
            f(r.time_to_player_s, "{:.2f}"),
            r.outcome,
        ]
        for r in sheet.itertuples()
    ]
    ax.axis("off")
    table = ax.table(cellText=cells, colLabels=cols, loc="upper center", cellLoc="center")
    table.auto_set_font_size(False)
    table.set_fontsize(8)
    table.scale(1.0, 2.0)
    for (r, _c), cell in table.get_celld().items():
        if r == 0:
            cell.set_facecolor("#dde4ee")
            cell.set_height(cell.get_height() * 1.4)
