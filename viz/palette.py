"""rallyarc's colours: one colour per stroke variant, one per outcome, and the court's.

The variant colours are our own choice, made to stay apart for readers with the common forms of
colour-vision deficiency. Under a red-green deficiency (protanopia, deuteranopia) hue along the
red-green axis is lost, and what is left is lightness and the blue-yellow axis; so the six colours
are spread over both: two dark ones (navy, wine), two light ones (marigold, cornflower), and two
in between (orchid, moss), with blue and yellow on opposite sides at each lightness.

=========  =========  =====  ===========================================
name       hex        L*     role
=========  =========  =====  ===========================================
navy       #1d3f73    27     dark, blue
marigold   #f3b13a    77     light, yellow
cornflower #6ba2dc    64     light, blue
wine       #6e1f3a    24     dark, red (reads dark grey-olive to deutans)
orchid     #c8559c    53     middle, purple (reads blue-grey to deutans)
moss       #5f6b00    43     middle-dark, yellow-green
=========  =========  =====  ===========================================

The check (:func:`min_difference`, run in the tests): each colour is simulated as seen with
protanopia, deuteranopia and tritanopia (the full-severity matrices of Machado, Oliveira and
Fernandes 2009) and the CIE 1976 colour difference Delta E*ab of every pair is computed in each
vision. With normal vision the closest pair differs by 37; under each simulated deficiency by at
least 20 (a difference of about 10 is readily told apart on lines and markers). Beyond six
variants the colours repeat with a dashed line, so the line style tells them apart.

References
----------
G. M. Machado, M. M. Oliveira, L. A. F. Fernandes, "A Physiologically-based Model for Simulation
of Color Vision Deficiency", IEEE Trans. Visualization and Computer Graphics 15(6), 1291-1298,
2009. DOI 10.1109/TVCG.2009.113 (Table 1, severity 1.0).
"""

from __future__ import annotations

import numpy as np

VARIANTS = (
    ("navy", "#1d3f73"),
    ("marigold", "#f3b13a"),
    ("cornflower", "#6ba2dc"),
    ("wine", "#6e1f3a"),
    ("orchid", "#c8559c"),
    ("moss", "#5f6b00"),
)
VARIANT_HEX = tuple(h for _, h in VARIANTS)

#: Line styles that repeat the colours for the 7th variant on.
LINE_STYLES = ("-", (0, (6, 2.5)), (0, (1.5, 1.5)), (0, (6, 2, 1.5, 2)))

#: Outcome of a shot, for success windows: ordered dark to light apart from "in", which is a
#: saturated blue so that the target area stands out in every vision.
OUTCOME_HEX = {
    "in": "#2f7fc0",
    "net": "#33303d",
    "long": "#f1d08e",
    "wide": "#d99ac0",
    "out": "#9a7440",
    "miss": "#d8d8d8",
}

#: The court in plots and scenes: playing surface, surround, lines, net.
COURT_HEX = {
    "surface": "#c9cfc2",
    "surround": "#dde2d6",
    "ground": "#eef0ea",
    "line": "#ffffff",
    "net": "#2b2b2b",
    "net_band": "#f4f4f4",
    "ink": "#222222",
}

#: Simulation matrices in linear RGB (Machado et al. 2009, Table 1, severity 1.0).
CVD_MATRICES = {
    "normal": np.eye(3),
    "protanopia": np.array(
        [
            [0.152286, 1.052583, -0.204868],
            [0.114503, 0.786281, 0.099216],
            [-0.003882, -0.048116, 1.051998],
        ]
    ),
    "deuteranopia": np.array(
        [
            [0.367322, 0.860646, -0.227968],
            [0.280085, 0.672501, 0.047413],
            [-0.011820, 0.042940, 0.968881],
        ]
    ),
    "tritanopia": np.array(
        [
            [1.255528, -0.076749, -0.178779],
            [-0.078411, 0.930809, 0.147602],
            [0.004733, 0.691367, 0.303900],
        ]
    ),
}


def variant_colour(i):
    """Hex colour of the i-th variant (0-based); colours repeat after six."""
    return VARIANT_HEX[i % len(VARIANT_HEX)]


def variant_style(i):
    """Line style of the i-th variant: solid for the first six, then dashed patterns."""
    return LINE_STYLES[(i // len(VARIANT_HEX)) % len(LINE_STYLES)]


def variant_colours(labels):
    """A colour for each distinct label, in order of first appearance: ``{label: hex}``."""
    order = list(dict.fromkeys(str(x) for x in labels))
    return {label: variant_colour(i) for i, label in enumerate(order)}


def hex_to_rgb(hex_colour):
    """``"#rrggbb"`` -> (3,) floats in 0..1."""
    h = hex_colour.lstrip("#")
    return np.array([int(h[k : k + 2], 16) / 255.0 for k in (0, 2, 4)])


def hex_to_rgb255(hex_colour):
    """``"#rrggbb"`` -> (3,) ints in 0..255."""
    return np.round(hex_to_rgb(hex_colour) * 255).astype(int)


def _linear(rgb):
    rgb = np.asarray(rgb, float)
    return np.where(rgb <= 0.04045, rgb / 12.92, ((rgb + 0.055) / 1.055) ** 2.4)


def lab(rgb, vision="normal"):
    """CIE L*a*b* (D65) of sRGB colours ``(..., 3)`` in 0..1 as seen in ``vision``."""
    lin = np.clip(_linear(rgb) @ CVD_MATRICES[vision].T, 0.0, 1.0)
    to_xyz = np.array(
        [[0.4124, 0.3576, 0.1805], [0.2126, 0.7152, 0.0722], [0.0193, 0.1192, 0.9505]]
    )
    xyz = lin @ to_xyz.T / np.array([0.95047, 1.0, 1.08883])
    f = np.where(xyz > 0.008856, np.cbrt(xyz), 7.787 * xyz + 16.0 / 116.0)
    return np.stack(
        [
            116.0 * f[..., 1] - 16.0,
            500.0 * (f[..., 0] - f[..., 1]),
            200.0 * (f[..., 1] - f[..., 2]),
        ],
        axis=-1,
    )


def min_difference(hex_colours, vision="normal"):
    """Smallest Delta E*ab (CIE 1976) between any two of the colours as seen in ``vision``."""
    points = lab(np.array([hex_to_rgb(h) for h in hex_colours]), vision)
    d = np.linalg.norm(points[:, None] - points[None], axis=-1)
    d[np.eye(len(points), dtype=bool)] = np.inf
    return float(d.min())
