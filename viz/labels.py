"""Text labels placed clear of each other: a greedy placer for the numbers beside a figure's
markers (net clearance, landing depth, apex height, ...)."""

from __future__ import annotations

import math

import numpy as np
from matplotlib.text import Text

from rallyarc.viz import palette
from rallyarc.viz.common import renderer


class LabelPlacer:
    """Greedy placement of text labels: each label takes the first free spot around its anchor
    (nearest first, preferred directions first), clear of earlier labels, markers and the edges
    of the axes; a thin leader line joins a label placed away from its anchor."""

    RINGS = (7, 12, 18, 26, 35, 46, 58, 72, 88, 106, 126, 150)

    def __init__(self, ax, fontsize=7.5):
        self.ax = ax
        self.fig = ax.figure
        self.renderer = renderer(self.fig)
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
