"""A sweep's figure: the metrics of a stroke against one swept parameter, one panel per metric
(matplotlib). The shots are :func:`rallyarc.sweep.sweep`'s; nothing here runs them."""

from __future__ import annotations

import textwrap

import numpy as np
from matplotlib.backends.backend_agg import FigureCanvasAgg
from matplotlib.figure import Figure
from matplotlib.lines import Line2D

from rallyarc import units
from rallyarc.viz import palette
from rallyarc.viz.common import OUTCOME_MARKERS, OUTCOME_WORDS, display_label

#: Metrics a sweep can show: label on the axis, unit, factor from the metric's SI value, and
#: the line drawn at zero (None for no line).
METRICS = {
    "net_clearance_m": ("net clearance", "m", 1.0, "top of the net"),
    "land_depth_m": ("landing depth inside the baseline", "m", 1.0, "baseline"),
    "land_side_margin_m": ("landing inside the sideline", "m", 1.0, "sideline"),
    "bounce_apex_m": ("bounce apex height", "m", 1.0, None),
    "bounce_angle_out_deg": ("kick: rebound angle", "deg", 1.0, None),
    "bounce_heading_change_deg": ("sideways jump at the bounce", "deg", 1.0, "no turn"),
    "receiver_height_m": ("height at the receiver's\nplane after the bounce", "m", 1.0, None),
    "flight_peak_m": ("highest point before the bounce", "m", 1.0, None),
    "land_x_m": ("landing point along the court", "m", 1.0, None),
    "impact_speed_mps": ("ball speed off the racket", "km/h", units.KMH_PER_MPS, None),
    "impact_launch_deg": ("launch angle", "deg", 1.0, None),
    "impact_topspin_rpm": ("topspin off the racket", "rpm", 1.0, None),
    "bounce_speed_out_mps": ("ball speed after the bounce", "km/h", units.KMH_PER_MPS, None),
}
#: Smallest span of a panel's y axis in each unit shown, so that a few centimetres of change
#: never fill a whole panel.
MIN_SPAN = {"m": 0.5, "deg": 5.0, "km/h": 10.0, "rpm": 500.0}
#: The receiver's height is taken after the bounce only: a long ball reaches the receiver's
#: plane before bouncing, a different height.
_AFTER_BOUNCE = "receiver_height_m"
DEFAULT_SWEEP_METRICS = ("net_clearance_m", "land_depth_m", "bounce_apex_m", "receiver_height_m")
#: A serve's depth and side margin are to the service box's lines.
_SERVE_METRIC = {
    "land_depth_m": ("land_box_depth_m", "landing depth inside the service line"),
    "land_side_margin_m": ("land_box_side_margin_m", "landing inside the box's side lines"),
}


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
    for a, key in zip(axes, metrics, strict=True):
        _panel(a, result, key, values, outcomes, serve, nominal)
    axes[-1].set_xlabel(parameter_label)
    ink = palette.COURT_HEX["ink"]
    handles = [
        Line2D([], [], ls="none", marker=OUTCOME_MARKERS.get(o, "o"), ms=6,
               mfc=palette.OUTCOME_HEX.get(o, "#999999"), mec=ink, label=OUTCOME_WORDS.get(o, o))
        for o in dict.fromkeys(outcomes)
    ]  # fmt: skip
    if nominal is not None:
        handles.append(Line2D([], [], color="#555555", ls=":", label="the stroke as set"))
    if ax is None:
        fig.legend(handles=handles, loc="outside lower center", ncol=len(handles), fontsize=8,
                   frameon=False)  # fmt: skip
        label = display_label(result.labels[0]) if len(result) else ""
        head = title or f"{label}: what changes with {parameter_label}"
        fixed = textwrap.fill(held_fixed(result), 110, subsequent_indent="    ")
        fig.suptitle(f"{head}\n{fixed}", fontsize=9.5, x=0.02, ha="left")
    else:
        axes[0].legend(handles=handles, fontsize=7.5)
    return fig


def _panel(a, result, key, values, outcomes, serve, nominal):
    """One metric against the swept values: a line, a marker per shot by outcome, the zero line
    (net, baseline, sideline) and the stroke's own value."""
    name, unit, factor, zero = METRICS[key]
    if serve and key in _SERVE_METRIC:
        key, name = _SERVE_METRIC[key]
        zero = "service line" if "depth" in key else "box line"
    y = np.asarray(result.metrics[key], float) * factor
    if key == _AFTER_BOUNCE:
        y = np.where(result.metrics["receiver_before_bounce"], np.nan, y)
    ink = palette.COURT_HEX["ink"]
    a.plot(values, y, color=palette.variant_colour(0), lw=1.8, zorder=3)
    for outcome in dict.fromkeys(outcomes):
        sel = outcomes == outcome
        a.plot(values[sel], y[sel], ls="none", marker=OUTCOME_MARKERS.get(outcome, "o"), ms=6,
               mfc=palette.OUTCOME_HEX.get(outcome, "#999999"), mec=ink, mew=0.6,
               zorder=4)  # fmt: skip
    if zero is not None:
        a.axhline(0.0, color="#777777", lw=1.0, ls=(0, (4, 2)), zorder=2)
        a.annotate(zero, (1.0, 0.0), xycoords=("axes fraction", "data"), xytext=(-3, 3),
                   textcoords="offset points", ha="right", va="bottom", fontsize=7.5,
                   color="#555555")  # fmt: skip
    if nominal is not None:
        a.axvline(nominal, color="#555555", lw=1.0, ls=":", zorder=2)
    _honest_limits(a, y, MIN_SPAN.get(unit, 0.0), zero is not None)
    a.set_ylabel(f"{name}\n[{unit}]", fontsize=8.5)
    a.grid(True, color="#e6e6e6", lw=0.6)
    a.tick_params(labelsize=8)


def _honest_limits(a, y, min_span, with_zero):
    """At least ``min_span`` of the y axis (centred on the data), the zero line in view."""
    finite = y[np.isfinite(y)]
    if not finite.size:
        return
    lo, hi = float(finite.min()), float(finite.max())
    if with_zero:
        lo, hi = min(lo, 0.0), max(hi, 0.0)
    if hi - lo < min_span:
        mid = 0.5 * (lo + hi)
        lo, hi = mid - 0.5 * min_span, mid + 0.5 * min_span
    pad = 0.06 * (hi - lo)
    a.set_ylim(lo - pad, hi + pad)


def _constant(values):
    values = np.asarray(values, float)
    return values.size > 0 and np.allclose(values, values[0])


def held_fixed(result):
    """What a sweep holds fixed, as one line: the swing's (or the launch's) values that do not
    change, the incoming ball and the conditions."""
    parts = []
    sw, m = result.swing, result.metrics
    if sw is not None:
        for field, name, scale, fmt in (
            ("head_speed", "head speed", units.KMH_PER_MPS, "{:.0f} km/h"),
            ("swing_path", "swing path", np.degrees(1.0), "{:+.1f} deg"),
            ("face_tilt", "face tilt", np.degrees(1.0), "{:+.2f} deg"),
            ("swing_direction", "swing direction", np.degrees(1.0), "{:+.1f} deg"),
        ):
            values = getattr(sw, field)
            if _constant(values):
                parts.append(f"{name} {fmt.format(values[0] * scale)}")
        speed = np.linalg.norm(result.incoming.velocity, axis=1)
        if _constant(speed) and not np.all(result.serve):
            parts.append(f"incoming ball {speed[0] * units.KMH_PER_MPS:.0f} km/h")
    else:
        for key, name, scale, fmt in (
            ("impact_speed_mps", "launch speed", units.KMH_PER_MPS, "{:.0f} km/h"),
            ("impact_launch_deg", "launch angle", 1.0, "{:+.1f} deg"),
            ("impact_azimuth_deg", "direction", 1.0, "{:+.1f} deg"),
            ("impact_spin_rpm", "spin", 1.0, "{:.0f} rpm"),
        ):
            if _constant(m[key]):
                parts.append(f"{name} {fmt.format(m[key][0] * scale)}")
    c = result.conditions
    parts.append(f"ball {c.ball.name}, surface {c.surface_name}, air {c.air.name}")
    parts.extend(c.modes)
    return "held fixed: " + ", ".join(parts)
