"""What every 2D figure of shots shares: making and saving the figure, the shots grouped by stroke
variant, the event and outcome markers and words, and the court's lines to scale.

Figures are made without pyplot (no global figure list, no backend chosen or switched, no
display needed); in a notebook they show as usual, and :func:`save_figure` writes them to a file.
"""

from __future__ import annotations

from pathlib import Path

import numpy as np
from matplotlib.backends.backend_agg import FigureCanvasAgg
from matplotlib.figure import Figure
from matplotlib.layout_engine import ConstrainedLayoutEngine
from matplotlib.patches import Rectangle

from rallyarc import court
from rallyarc.output.export import atomic_write
from rallyarc.viz import palette

OUTCOME_WORDS = {
    "in": "lands in",
    "net": "into the net",
    "long": "lands long",
    "wide": "lands wide",
    "out": "long and wide",
    "miss": "missed the racket",
}
#: Marker of each outcome in the sweeps.
OUTCOME_MARKERS = {"in": "o", "net": "X", "long": "^", "wide": ">", "out": "D", "miss": "s"}
#: Marker of each event along a path.
EVENT_MARKERS = {
    "contact": "o",
    "net": "D",
    "land": "v",
    "apex": "^",
    "receiver": "s",
    "twice": "X",
}
#: Resolution of saved figures [dots per inch].
DPI = 110
#: More shots than this: paths thin, no number labels.
MANY = 12


def display_label(label):
    """A stroke's preset name as a reader sees it (``topspin_drive`` -> ``topspin drive``)."""
    return str(label).replace("_", " ")


def variant_groups(result):
    """Distinct labels in order of appearance, with the indices of their shots."""
    labels = np.asarray(result.labels).astype(str)
    order = list(dict.fromkeys(labels))
    return [(lab, np.flatnonzero(labels == lab), i) for i, lab in enumerate(order)]


def outcome_counts(result, idx):
    """How many of the shots ``idx`` ended in each outcome, in the order of
    :data:`OUTCOME_WORDS` (outcomes with no shot left out)."""
    outcomes = np.asarray(result.metrics["outcome"]).astype(str)[idx]
    return {o: int(np.sum(outcomes == o)) for o in OUTCOME_WORDS if np.any(outcomes == o)}


def outcome_shares_text(counts):
    """``in 85 %, net 10 %, long 5 %`` from :func:`outcome_counts`."""
    total = sum(counts.values())
    return ", ".join(f"{o} {100.0 * n / total:.0f} %" for o, n in counts.items())


def variant_legend_label(result, label, idx):
    """A variant's legend entry: its name, and how its balls ended (shares when scattered)."""
    counts = outcome_counts(result, idx)
    if len(idx) == 1:
        return f"{display_label(label)}: {next(iter(counts))}"
    return f"{display_label(label)} ({len(idx)} balls): {outcome_shares_text(counts)}"


def drawn(idx, many, limit=40):
    """The shots of a group whose paths are drawn: all of them, or the first ``limit`` when
    there are many."""
    return idx[:limit] if many else idx


def is_serve(result, idx):
    """True when every shot ``idx`` of the result is a serve."""
    return bool(np.all(np.asarray(result.serve)[idx]))


def sampled_path(result, i, dt=0.004):
    """Positions ``(M, 3)`` of shot i's recorded path every ``dt`` seconds."""
    _, pos, _ = result.path(i, dt=dt)
    return pos


# ----------------------------------------------------------------------------- figures


def figure_and_axes(ax, figsize):
    """``(figure, axes, own)``: the figure of ``ax``, or a new figure of ``figsize`` inches with
    one axes (``own`` True) laid out by a constrained layout."""
    if ax is not None:
        return ax.figure, ax, False
    fig = Figure(figsize=figsize, layout=ConstrainedLayoutEngine(h_pad=0.07, w_pad=0.07))
    FigureCanvasAgg(fig)
    return fig, fig.add_subplot(), True


def renderer(fig):
    """The renderer that measures text on the figure's canvas."""
    canvas = fig.canvas
    if hasattr(canvas, "get_renderer"):
        return canvas.get_renderer()
    return fig._get_renderer()


def freeze_layout(fig, own):
    """Run the layout once and keep it, so that labels placed after it stay where they are."""
    fig.canvas.draw()
    if own:
        fig.set_layout_engine("none")


_FORMATS = {".png": "png", ".pdf": "pdf", ".svg": "svg"}


def save_figure(fig, path, dpi=DPI):
    """Write a figure atomically (a temporary file in the same folder, then moved into place);
    the format follows the suffix: .png, .pdf or .svg. Returns the path."""
    path = Path(path)
    fmt = _FORMATS.get(path.suffix.lower())
    if fmt is None:
        raise ValueError(f"{path}: unknown figure format; use {', '.join(_FORMATS)}")
    return atomic_write(path, lambda tmp: fig.savefig(tmp, format=fmt, dpi=dpi))


# ----------------------------------------------------------------------------- the court


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
