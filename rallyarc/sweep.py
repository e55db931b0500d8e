"""Sweeps, success windows and dispersion runs: many shots of one stroke in one vectorized call.

The plots in :mod:`viz.plots` draw what these functions compute; they run no physics of their own.

Three families of parameters can be varied:

``swing``
    fields of the racket's swing (:class:`rallyarc.shot.Swing`): ``head_speed``, ``face_tilt``,
    ``swing_path``; the ball is played through the whole chain with :func:`rallyarc.shot.play`.
``incoming``
    the ball that arrives at the racket: ``incoming_speed`` (same direction of travel) and
    ``incoming_spin`` (topspin relative to its own travel, any sidespin kept).
``launch``
    the ball as it leaves the racket (:class:`Launch`): ``launch_speed``, ``launch_angle``,
    ``launch_spin``; the ball is flown with :func:`rallyarc.shot.launch`, so that for instance
    the spin changes and nothing else does.

Values are SI (m/s, rad, rad/s). :data:`PARAMETERS` converts from and to the units a coach
reads (km/h, degrees, rpm) for the command line and the axes of the plots.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, replace

import numpy as np

from rallyarc import kinematics
from rallyarc.shot import BallState, ShotResult, launch, play
from rallyarc.units import KMH, RPM

DEG = math.pi / 180.0


@dataclass(frozen=True)
class Parameter:
    """A parameter that can be swept: its name on axes, display unit, the SI value of one
    display unit, its family (``swing``, ``incoming`` or ``launch``) and the range the command
    line accepts, in display units."""

    name: str
    label: str
    unit: str
    scale: float
    family: str
    low: float
    high: float

    def to_si(self, values):
        """Display units (km/h, deg, rpm) -> SI."""
        return np.asarray(values, float) * self.scale

    def from_si(self, values):
        """SI -> display units."""
        return np.asarray(values, float) / self.scale

    @property
    def axis_label(self):
        return f"{self.label} [{self.unit}]"


PARAMETERS = {
    p.name: p
    for p in (
        Parameter("head_speed", "racket head speed", "km/h", KMH, "swing", 20.0, 220.0),
        Parameter("face_tilt", "face tilt (open +)", "deg", DEG, "swing", -40.0, 40.0),
        Parameter("swing_path", "swing path above horizontal", "deg", DEG, "swing", -40.0, 70.0),
        Parameter("incoming_speed", "incoming ball speed", "km/h", KMH, "incoming", 5.0, 200.0),
        Parameter("incoming_spin", "incoming topspin", "rpm", RPM, "incoming", -5000.0, 5000.0),
        Parameter("launch_speed", "launch speed", "km/h", KMH, "launch", 10.0, 250.0),
        Parameter(
            "launch_angle", "launch angle above horizontal", "deg", DEG, "launch", -20.0, 60.0
        ),
        Parameter("launch_spin", "topspin at launch", "rpm", RPM, "launch", -5000.0, 6000.0),
    )
}


def _parameter(name):
    try:
        return PARAMETERS[name]
    except KeyError:
        raise ValueError(
            f"unknown parameter {name!r}; choose one of {', '.join(PARAMETERS)}"
        ) from None


@dataclass(frozen=True)
class Launch:
    """One ball as it leaves the racket: position [m], speed [m/s], angle above the horizontal
    [rad], azimuth from +x toward +y [rad], topspin relative to its travel and sidespin about +z
    [rad/s]; ``serve`` judges the landing against the service box."""

    position: tuple
    speed: float
    angle: float
    azimuth: float
    topspin: float
    sidespin: float = 0.0
    serve: bool = False
    name: str = "launch"

    @classmethod
    def from_stroke(cls, stroke, conditions, incoming=None):
        """The launch that ``stroke`` gives the ball (one play through the impact).

        Spin about the ball's direction of travel, if any, is not kept.
        """
        r = play([stroke], conditions, _incoming_for(stroke, incoming), record=False)
        m = r.metrics
        return cls(
            position=tuple(float(v) for v in r.incoming.position[0]),
            speed=float(m["impact_speed_mps"][0]),
            angle=float(m["impact_launch_deg"][0]) * DEG,
            azimuth=float(m["impact_azimuth_deg"][0]) * DEG,
            topspin=float(m["impact_topspin_rpm"][0]) * RPM,
            sidespin=float(m["impact_sidespin_rpm"][0]) * RPM,
            serve=bool(r.serve[0]),
            name=stroke.name,
        )

    def states(self, speed=None, angle=None, topspin=None):
        """N launch states with any of speed, angle or topspin replaced by arrays (N,)."""
        speed, angle, topspin, azimuth, side = np.broadcast_arrays(
            np.asarray(self.speed if speed is None else speed, float),
            np.asarray(self.angle if angle is None else angle, float),
            np.asarray(self.topspin if topspin is None else topspin, float),
            np.asarray(self.azimuth, float),
            np.asarray(self.sidespin, float),
        )
        speed, angle, topspin = (np.atleast_1d(a).ravel() for a in (speed, angle, topspin))
        azimuth, side = np.atleast_1d(azimuth).ravel(), np.atleast_1d(side).ravel()
        velocity = kinematics.velocity(speed, angle, azimuth)
        spin = kinematics.spin(topspin, side, azimuth)
        return BallState.of(self.position, velocity, spin, n=speed.size)

    def value(self, parameter):
        """This launch's own value of a launch parameter (SI)."""
        values = {
            "launch_speed": self.speed,
            "launch_angle": self.angle,
            "launch_spin": self.topspin,
        }
        return values[parameter]


def _incoming_for(stroke, incoming):
    if stroke.kind == "serve":
        return None
    if incoming is None:
        raise ValueError(f"stroke {stroke.name!r} needs an incoming ball")
    return incoming


_LAUNCH_KEYS = {"launch_speed": "speed", "launch_angle": "angle", "launch_spin": "topspin"}


def _vary_incoming(incoming, parameter, values):
    """N copies of one incoming ball with its speed or its topspin replaced."""
    values = np.atleast_1d(np.asarray(values, float))
    n = values.size
    pos = np.repeat(incoming.position[:1], n, axis=0)
    vel = np.repeat(incoming.velocity[:1], n, axis=0)
    spin = np.repeat(incoming.spin[:1], n, axis=0)
    if parameter == "incoming_speed":
        speed = np.linalg.norm(vel[0])
        if speed == 0:
            raise ValueError("the incoming ball has no direction of travel to keep")
        vel = vel / speed * values[:, None]
    else:
        horizontal = vel[0, :2]
        norm = np.linalg.norm(horizontal)
        dx, dy = (horizontal / norm) if norm > 0 else (1.0, 0.0)
        axis = np.array([-dy, dx, 0.0])  # z x travel: topspin
        spin = spin - (spin @ axis)[:, None] * axis + values[:, None] * axis
    return BallState(pos, vel, spin)


def sweep(stroke, conditions, incoming, parameter, values, record=True):
    """One stroke played once for each value of one parameter, in one vectorized call.

    Parameters
    ----------
    stroke : rallyarc.domain.Stroke
    conditions : rallyarc.domain.Conditions
    incoming : rallyarc.shot.BallState or None
        The ball arriving at the racket (one ball); None for a serve (its own toss).
    parameter : str
        A key of :data:`PARAMETERS`: ``head_speed``, ``face_tilt``, ``swing_path`` (the swing),
        ``incoming_speed``, ``incoming_spin`` (the incoming ball), ``launch_speed``,
        ``launch_angle`` or ``launch_spin`` (the ball leaving the racket as the stroke launches
        it, with only this value changed).
    values : array (N,)
        The parameter's values, SI: m/s, rad or rad/s.
    record : bool
        Keep trajectories (for plots of paths).

    Returns
    -------
    rallyarc.shot.ShotResult
        N shots, all labelled with the stroke's name, in the order of ``values``.
    """
    p = _parameter(parameter)
    values = np.atleast_1d(np.asarray(values, float))
    incoming = _incoming_for(stroke, incoming)
    if p.family == "swing":
        return play([stroke], conditions, incoming, record=record, **{parameter: values})
    if p.family == "incoming":
        if incoming is None:
            raise ValueError(f"{parameter}: a serve's incoming ball is its toss")
        state = _vary_incoming(incoming, parameter, values)
        full = np.full(values.size, stroke.head_speed)
        return play([stroke], conditions, state, record=record, head_speed=full)
    spec = Launch.from_stroke(stroke, conditions, incoming)
    return _fly(spec, conditions, record, **{_LAUNCH_KEYS[parameter]: values})


def _fly(spec, conditions, record, **values):
    states = spec.states(**values)
    return launch(states, conditions, labels=spec.name, serve=spec.serve, record=record)


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
    px, py = _parameter(x_param), _parameter(y_param)
    if x_param == y_param:
        raise ValueError("the two window parameters must differ")
    if px.family != py.family or px.family == "incoming":
        raise ValueError(
            "a window varies two swing parameters (head_speed, face_tilt, swing_path) or two "
            "launch parameters (launch_speed, launch_angle, launch_spin)"
        )
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
            _incoming_for(spec, incoming),
            record=False,
            **{x_param: np.append(gx, nominal[0]), y_param: np.append(gy, nominal[1])},
        )
        label, serve = spec.name, spec.kind == "serve"
    else:
        if not isinstance(spec, Launch):
            spec = Launch.from_stroke(spec, conditions, incoming)
        nominal = (spec.value(x_param), spec.value(y_param))
        keys = {
            _LAUNCH_KEYS[x_param]: np.append(gx, nominal[0]),
            _LAUNCH_KEYS[y_param]: np.append(gy, nominal[1]),
        }
        result = _fly(spec, conditions, False, **keys)
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


def dispersion(
    strokes,
    conditions,
    incoming,
    n,
    head_speed_sd=1.0,
    face_tilt_sd=1.0 * DEG,
    face_azimuth_sd=1.0 * DEG,
    swing_path_sd=1.5 * DEG,
    seed=0,
    record=True,
):
    """Each stroke repeated ``n`` times with its swing scattered, as a player's swings vary.

    Head speed [m/s], face tilt, face azimuth and swing path [rad] are drawn independently from
    normal distributions about the stroke's own values with the given standard deviations
    (illustrative defaults, not measured). The same ``seed`` gives the same shots.

    Returns
    -------
    rallyarc.shot.ShotResult
        ``len(strokes) * n`` shots, stroke by stroke, labelled with the strokes' names.
    """
    strokes = [s for s in strokes for _ in range(int(n))]
    if not strokes:
        raise ValueError("no shots: give at least one stroke and n >= 1")
    rng = np.random.default_rng(seed)
    size = len(strokes)
    base = {f: np.array([getattr(s, f) for s in strokes]) for f in _SCATTERED}
    sds = dict(
        zip(_SCATTERED, (head_speed_sd, face_tilt_sd, face_azimuth_sd, swing_path_sd), strict=True)
    )
    overrides = {f: base[f] + sds[f] * rng.standard_normal(size) for f in _SCATTERED}
    overrides["head_speed"] = np.maximum(overrides["head_speed"], 0.1)
    has_groundstroke = any(s.kind != "serve" for s in strokes)
    if has_groundstroke and incoming is None:
        raise ValueError("groundstrokes need an incoming ball")
    return play(strokes, conditions, incoming, record=record, **overrides)


_SCATTERED = ("head_speed", "face_tilt", "face_azimuth", "swing_path")


def with_value(stroke, parameter, value):
    """The stroke with one swing field set (SI): the single-shot counterpart of a sweep."""
    if _parameter(parameter).family != "swing":
        raise ValueError(f"{parameter} is not a swing parameter")
    return replace(stroke, **{parameter: float(value)})
