"""Success windows: the outcome and the margins of a grid of shots over two parameters of one
family (two swing parameters, or two launch parameters), with the room to each edge."""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from rallyarc.shot import ShotResult, play
from rallyarc.sweep import LAUNCH_KEYS, Launch, fly_launch, get_parameter, incoming_for

__all__ = ["Window", "check_window_axes", "window"]


def check_window_axes(x_param, y_param):
    """The two :class:`rallyarc.sweep.Parameter` of a success window, or ``ValueError``.

    A window varies two different parameters of one family: two swing parameters
    (``head_speed``, ``face_tilt``, ``swing_path``) or two launch parameters (``launch_speed``,
    ``launch_angle``, ``launch_spin``); the incoming ball is not a window axis.
    """
    px, py = (get_parameter(name) for name in (x_param, y_param))
    if px.name == py.name or px.family != py.family or px.family == "incoming":
        raise ValueError(
            "a window varies two different swing parameters (head_speed, face_tilt, swing_path) "
            "or two launch parameters (launch_speed, launch_angle, launch_spin)"
        )
    return px, py


@dataclass
class Window:
    """A success window: the outcome and margins of a grid of shots over two parameters.

    Arrays are ``(ny, nx)``: rows follow ``y_values``, columns ``x_values`` (SI).
    ``depth_m`` and ``side_margin_m`` are measured to the baseline and the sideline, or for a
    serve to the service line and the box's lines; positive inside. ``nominal`` is the
    stroke's (or the launch's) own value of each parameter, and ``nominal_margins`` the
    outcome, net clearance, depth and side margin of that shot. ``result`` holds the grid's
    shots row by row and then the nominal shot.
    """

    x_param: str
    y_param: str
    x_values: np.ndarray
    y_values: np.ndarray
    outcome: np.ndarray
    net_clearance_m: np.ndarray
    depth_m: np.ndarray
    side_margin_m: np.ndarray
    nominal: tuple
    label: str
    serve: bool
    result: ShotResult
    nominal_margins: dict

    def room(self):
        """How far each parameter can move from the nominal setting, the other held, before
        the shot leaves the window; and what it does beyond that edge.

        Measured along the grid row and column nearest the nominal setting, with each edge
        half-way between the last cell in and the first cell out (so to within half a grid
        step). Returns ``{param: (below, above)}``, each ``(distance [SI], outcome beyond)``
        or ``(None, None)`` where the window reaches the grid's end; an empty dict when the
        nominal setting's cell is not in.
        """
        i = int(np.argmin(np.abs(self.x_values - self.nominal[0])))
        j = int(np.argmin(np.abs(self.y_values - self.nominal[1])))
        if self.outcome[j, i] != "in":
            return {}
        return {
            self.x_param: _edges(self.x_values, self.outcome[j, :], i, self.nominal[0]),
            self.y_param: _edges(self.y_values, self.outcome[:, i], j, self.nominal[1]),
        }

    @property
    def shape(self):
        return self.outcome.shape

    def edge_margin(self):
        """The smallest of the three margins of each cell [m] (NaN where no landing)."""
        return np.fmin(np.fmin(self.net_clearance_m, self.depth_m), self.side_margin_m)

    def fraction_in(self):
        return float(np.mean(self.outcome == "in"))


def _edges(values, outcomes, k, nominal):
    out = []
    for step in (-1, 1):
        m = k
        while 0 <= m + step < len(values) and outcomes[m + step] == "in":
            m += step
        if not 0 <= m + step < len(values):
            out.append((None, None))
            continue
        edge = 0.5 * (values[m] + values[m + step])
        out.append((float(abs(edge - nominal)), str(outcomes[m + step])))
    return tuple(out)


def window(spec, conditions, incoming, x_param, x_values, y_param, y_values):
    """Outcome and margins over a grid of two parameters, in one vectorized call.

    Parameters
    ----------
    spec : rallyarc.domain.Stroke or Launch
        A stroke, or a launch; a stroke's launch is found by one play for launch parameters.
    conditions : rallyarc.domain.Conditions
    incoming : rallyarc.shot.BallState or None
        The incoming ball for a groundstroke; None for a serve or a launch.
    x_param, y_param : str
        Two parameters of the same family: ``swing`` (``head_speed``, ``face_tilt``,
        ``swing_path``) or ``launch`` (``launch_speed``, ``launch_angle``, ``launch_spin``).
    x_values, y_values : array
        Grid values, SI.

    Returns
    -------
    Window
    """
    px, py = check_window_axes(x_param, y_param)
    xs = np.atleast_1d(np.asarray(x_values, float))
    ys = np.atleast_1d(np.asarray(y_values, float))
    gx, gy = np.meshgrid(xs, ys)
    if px.family == "swing":
        if isinstance(spec, Launch):
            raise ValueError("swing parameters need a stroke, not a launch")
        nominal = (getattr(spec, x_param), getattr(spec, y_param))
        result = play(
            [spec],
            conditions,
            incoming_for(spec, incoming),
            record=False,
            **{x_param: np.append(gx, nominal[0]), y_param: np.append(gy, nominal[1])},
        )
        label, serve = spec.name, spec.kind == "serve"
    else:
        if not isinstance(spec, Launch):
            spec = Launch.from_stroke(spec, conditions, incoming)
        nominal = (spec.value(x_param), spec.value(y_param))
        keys = {
            LAUNCH_KEYS[x_param]: np.append(gx, nominal[0]),
            LAUNCH_KEYS[y_param]: np.append(gy, nominal[1]),
        }
        result = fly_launch(spec, conditions, False, **keys)
        label, serve = spec.name, spec.serve
    m = result.metrics
    depth = np.asarray(m["land_box_depth_m"] if serve else m["land_depth_m"], float)
    side = np.asarray(m["land_box_side_margin_m"] if serve else m["land_side_margin_m"], float)
    clearance = np.asarray(m["net_clearance_m"], float)
    outcome = np.asarray(m["outcome"])
    shape = gx.shape
    return Window(
        x_param=x_param,
        y_param=y_param,
        x_values=xs,
        y_values=ys,
        outcome=outcome[:-1].reshape(shape),
        net_clearance_m=clearance[:-1].reshape(shape),
        depth_m=depth[:-1].reshape(shape),
        side_margin_m=side[:-1].reshape(shape),
        nominal=(float(nominal[0]), float(nominal[1])),
        label=label,
        serve=serve,
        result=result,
        nominal_margins={
            "outcome": str(outcome[-1]),
            "net_clearance_m": float(clearance[-1]),
            "depth_m": float(depth[-1]),
            "side_margin_m": float(side[-1]),
        },
    )
