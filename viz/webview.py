"""The 3D view of shots in a web page, drawn by a vendored, pinned three.js (``viz/vendor/three``).

:func:`scene_data` turns a result into the page's data: the court, each shot's path as a
quantised polyline (int16 millimetres, base64) with its colour from :mod:`viz.palette`, and the
numbers a tap on the path shows, taken from the shot's JSON record (``ShotResult.record``, the
same record ``rallyarc shot --json`` prints). :func:`viewer_html` writes the view's HTML: the
canvas, camera buttons, the legend, the data and the script, with three.js inlined so that the
page needs no network. :func:`scene_page` is a whole page holding only the view.

Nothing here computes physics: paths are the recorded trajectories sampled, numbers are the
record's values. No number that is not finite reaches the page (it is ``null``, shown ``-``).
"""

from __future__ import annotations

import base64
import html
import json
from importlib import resources

import numpy as np

from rallyarc import court
from rallyarc.output.jsonsafe import json_ready
from rallyarc.shot.metrics import metric
from rallyarc.units import KMH_PER_MPS
from rallyarc.viz import palette
from rallyarc.viz.common import display_label, variant_groups

THREE_VERSION = "0.170.0"

#: The numbers a tap on a path shows: (metric key, unit shown, format).
TAP_NUMBERS = (
    ("impact_speed_mps", "km/h", "{:.0f}"),
    ("impact_topspin_rpm", "rpm", "{:+.0f}"),
    ("impact_sidespin_rpm", "rpm", "{:+.0f}"),
    ("net_clearance_m", "m", "{:+.2f}"),
    ("land_depth_m", "m", "{:+.2f}"),
    ("bounce_apex_m", "m", "{:.2f}"),
    ("receiver_height_m", "m", "{:.2f}"),
)
#: Camera presets of the view: (position, target) in the court frame [m], z up.
CAMERAS = {
    "hitter": ((-court.HALF_LENGTH - 7.0, -1.5, 3.4), (4.0, 0.0, 0.6)),
    "side": ((1.0, -26.0, 3.2), (1.0, 0.0, 1.9)),
    "receiver": ((court.HALF_LENGTH + 7.5, 1.2, 2.8), (-4.0, 0.0, 0.9)),
    # just off the vertical, so that the far baseline is at the top of the screen
    "overhead": ((3.2, 1.35, 44.0), (3.2, 1.4, 0.0)),
}
CAMERA_WORDS = {
    "hitter": "behind the hitter",
    "side": "side-on",
    "receiver": "receiver",
    "overhead": "overhead",
}
_MM = 1000.0  # quantisation: int16 millimetres cover +-32.7 m, the court and its run-off
_MANY = 12  # more shots than this: thin paths, no event markers


def _encode(points):
    """``(M, 3)`` metres -> base64 of little-endian int16 millimetres, x y z interleaved."""
    q = np.clip(np.round(np.asarray(points, float) * _MM), -32767, 32767).astype("<i2")
    return base64.b64encode(q.tobytes()).decode("ascii")


def decode(text):
    """The inverse of the page's path encoding: base64 -> ``(M, 3)`` metres (for tests)."""
    q = np.frombuffer(base64.b64decode(text), dtype="<i2").astype(float)
    return q.reshape(-1, 3) / _MM


def _value(record, key):
    m = metric(key)
    block = record.get(m.block) if m.block != "outcome" else record
    value = None if block is None else block.get(m.field)
    return value if isinstance(value, int | float) and np.isfinite(value) else None


def tap_numbers(record):
    """The numbers a tap shows for one shot's JSON record: a list of dicts with ``key``,
    ``label``, ``value`` (the record's own value, its unit the metric's; None when missing) and
    ``text`` (shown on the page, ``-`` when missing)."""
    out = []
    for key, unit, fmt in TAP_NUMBERS:
        value = _value(record, key)
        shown = None if value is None else value * (KMH_PER_MPS if unit == "km/h" else 1.0)
        text = "-" if shown is None else f"{fmt.format(shown)} {unit}"
        out.append({"key": key, "label": metric(key).label, "value": value, "text": text})
    return out


def _court():
    """Court lines (centre lines as x0 y0 x1 y1) and the net's top along y."""
    ys = np.linspace(-court.POST_Y, court.POST_Y, 41)
    return {
        "half_length": court.HALF_LENGTH,
        "half_width": court.DOUBLES_WIDTH / 2,
        "line_width": court.LINE_WIDTH,
        "lines": [[round(float(v), 4) for v in seg] for seg in court.line_segments()],
        "net_y": [round(float(y), 3) for y in ys],
        "net_top": [round(float(z), 4) for z in court.net_height(ys, singles=True)],
        "post_y": court.POST_Y,
        "post_height": court.NET_HEIGHT_POST,
        "colours": dict(palette.COURT_HEX),
    }


def _shot(result, i, colour, dt):
    _, pos, _ = result.path(i, dt=dt)
    pos = pos[np.all(np.isfinite(pos), axis=1)]
    record = result.record(i)
    landing = record.get("landing")
    return {
        "index": int(i),
        "label": display_label(result.labels[i]),
        "colour": colour,
        "path": _encode(pos),
        "outcome": str(record.get("outcome") or "-"),
        "numbers": tap_numbers(record),
        "land": None if landing is None else [landing.get("x_m"), landing.get("y_m")],
    }


def scene_data(result, camera="hitter", dt=0.005):
    """The data of the view of ``result`` (a JSON-ready dict, every number finite or None)."""
    groups = variant_groups(result)
    shots = []
    for _, idx, k in groups:
        for i in idx:
            shots.append(_shot(result, i, palette.variant_colour(k), dt))
    shots.sort(key=lambda s: s["index"])
    data = {
        "three": THREE_VERSION,
        "start": camera if camera in CAMERAS else "hitter",
        "cameras": {
            name: {"position": list(p), "target": list(t), "words": CAMERA_WORDS[name]}
            for name, (p, t) in CAMERAS.items()
        },
        "fov": 38.0,
        "ball_radius": float(result.conditions.ball.radius),
        "many": len(result) > _MANY,
        "court": _court(),
        "legend": [[display_label(lab), palette.variant_colour(k)] for lab, _, k in groups],
        "shots": shots,
    }
    return json_ready(data)


def asset(*parts):
    return resources.files("rallyarc.viz").joinpath(*parts).read_text(encoding="utf-8")


def _script_text(text):
    """Text safe inside a ``<script>`` element (no closing tag can appear in it)."""
    if "</script" in text.lower():
        raise ValueError("a script text holds a closing script tag")
    return text


def viewer_html(data, element_id="scene"):
    """The view's HTML: a figure with the canvas, camera buttons, legend, the panel a tap
    fills, the data and the scripts (three.js inlined)."""
    text = json.dumps(data, separators=(",", ":"), allow_nan=False).replace("</", "<\\/")
    buttons = "".join(
        f'<button type="button" data-camera="{html.escape(n)}">{html.escape(c["words"])}</button>'
        for n, c in data["cameras"].items()
    )
    legend = "".join(
        f'<li><span class="swatch" style="background:{html.escape(c)}"></span>'
        f"{html.escape(label)}</li>"
        for label, c in data["legend"]
    )
    return f"""<figure class="view3d" id="{html.escape(element_id)}">
<div class="view3d-bar"><span class="view3d-cams">camera: {buttons}</span></div>
<div class="view3d-stage"><canvas class="view3d-canvas" aria-label="3D view of the shots"></canvas>
<div class="view3d-panel" hidden></div></div>
<ul class="legend">{legend}</ul>
<figcaption>Drag (one finger) to turn, scroll or pinch to zoom, right-drag or two fingers to
move. Tap or hover a path for its numbers. Colours as in the figures.</figcaption>
</figure>
<script type="application/json" class="view3d-data">{text}</script>
<script type="text/plain" id="three-module">{_script_text(asset("vendor", "three", "three.module.min.js"))}</script>
<script type="text/plain" id="three-orbit">{_script_text(asset("vendor", "three", "OrbitControls.js"))}</script>
<script type="module">{_script_text(asset("web", "viewer.js"))}</script>
"""  # noqa: E501


def viewer_css():
    """The view's stylesheet."""
    return asset("web", "viewer.css")


def scene_page(result, title, camera="hitter"):
    """A whole HTML page with the 3D view of ``result`` only (``scene --export .html``)."""
    body = viewer_html(scene_data(result, camera))
    return f"""<!DOCTYPE html>
<html lang="en">
<head>
<meta charset="utf-8">
<meta name="viewport" content="width=device-width, initial-scale=1">
<title>{html.escape(title)}</title>
<style>
body {{ margin: 0 auto; max-width: 1100px; padding: 8px 12px; font: 15px/1.45 system-ui,
  sans-serif; color: {palette.COURT_HEX["ink"]}; background: #fff; }}
h1 {{ font-size: 1.2rem; margin: 0.3rem 0; }}
{viewer_css()}
</style>
</head>
<body>
<h1>{html.escape(title)}</h1>
{body}
</body>
</html>
"""
