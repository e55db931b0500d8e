"""A sweep's figure: the metrics of a stroke against one swept parameter, one panel per metric
(matplotlib). The shots are :func:`rallyarc.sweep.sweep`'s; nothing here runs them."""

from __future__ import annotations

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
        fig.legend(handles=handles, loc="outside upper right", ncol=len(handles), fontsize=8,
                   frameon=False)  # fmt: skip
        label = display_label(result.labels[0]) if len(result) else ""
        fig.suptitle(title or f"{label}: what changes with {parameter_label}", fontsize=10,
                     x=0.02, ha="left")  # fmt: skip
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
    a.set_ylabel(f"{name}\n[{unit}]", fontsize=8.5)
    a.grid(True, color="#e6e6e6", lw=0.6)
    a.tick_params(labelsize=8)
