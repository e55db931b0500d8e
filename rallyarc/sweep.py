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
from rallyarc.shot import BallState, launch, play
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


def get_parameter(name):
    """The sweepable :class:`Parameter` named ``name``; a ``ValueError`` listing the valid
    names otherwise."""
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
        r = play([stroke], conditions, incoming_for(stroke, incoming), record=False)
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


def incoming_for(stroke, incoming):
    if stroke.kind == "serve":
        return None
    if incoming is None:
        raise ValueError(f"stroke {stroke.name!r} needs an incoming ball")
    return incoming


LAUNCH_KEYS = {"launch_speed": "speed", "launch_angle": "angle", "launch_spin": "topspin"}


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
    p = get_parameter(parameter)
    values = np.atleast_1d(np.asarray(values, float))
    incoming = incoming_for(stroke, incoming)
    if p.family == "swing":
        return play([stroke], conditions, incoming, record=record, **{parameter: values})
    if p.family == "incoming":
        if incoming is None:
            raise ValueError(f"{parameter}: a serve's incoming ball is its toss")
        state = _vary_incoming(incoming, parameter, values)
        full = np.full(values.size, stroke.head_speed)
        return play([stroke], conditions, state, record=record, head_speed=full)
    spec = Launch.from_stroke(stroke, conditions, incoming)
    return fly_launch(spec, conditions, record, **{LAUNCH_KEYS[parameter]: values})


def fly_launch(spec, conditions, record, **values):
    states = spec.states(**values)
    return launch(states, conditions, labels=spec.name, serve=spec.serve, record=record)


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
    if get_parameter(parameter).family != "swing":
        raise ValueError(f"{parameter} is not a swing parameter")
    return replace(stroke, **{parameter: float(value)})


#: Swing fields that :func:`with_swing` may replace (SI: m/s, rad).
SWING_FIELDS = ("head_speed", "swing_path", "face_tilt", "swing_direction")


def with_swing(stroke, **changes):
    """The stroke with some of its swing values replaced (SI: head speed [m/s], angles [rad]).

    A new ``swing_direction`` turns the face with the swing: the face azimuth keeps its offset
    from the swing direction, as in aiming. The other values are set as given.

    Parameters
    ----------
    stroke : rallyarc.domain.Stroke
    **changes : float
        Any of ``head_speed``, ``swing_path``, ``face_tilt``, ``swing_direction``.

    Returns
    -------
    rallyarc.domain.Stroke
    """
    unknown = [k for k in changes if k not in SWING_FIELDS]
    if unknown:
        raise ValueError(
            f"unknown swing field {unknown[0]!r}; choose from {', '.join(SWING_FIELDS)}"
        )
    if "swing_direction" in changes:
        stroke = stroke.turned(changes.pop("swing_direction"))
    return replace(stroke, **changes)


def own_value(stroke, parameter, conditions, incoming=None):
    """The stroke's own value of a sweepable parameter, SI.

    Swing parameters are the stroke's fields; ``incoming_speed`` and ``incoming_spin`` the
    incoming ball's speed and its topspin about its horizontal travel; launch parameters those
    of the ball leaving the racket (one play through the impact).

    Parameters
    ----------
    stroke : rallyarc.domain.Stroke
    parameter : str
        A key of :data:`rallyarc.sweep.PARAMETERS`.
    conditions : rallyarc.domain.Conditions
    incoming : rallyarc.shot.BallState or None
        The incoming ball; None for a serve.

    Returns
    -------
    float or numpy.float64
    """
    p = get_parameter(parameter)
    if p.family == "swing":
        return getattr(stroke, p.name)
    if p.family == "incoming":
        if incoming is None:
            raise ValueError(f"{p.name} needs a groundstroke; a serve has no incoming ball")
        vel, spin = incoming.velocity[0], incoming.spin[0]
        if p.name == "incoming_speed":
            return np.linalg.norm(vel)
        h = vel[:2] / max(np.linalg.norm(vel[:2]), 1e-12)
        return spin @ np.array([-h[1], h[0], 0.0])
    return Launch.from_stroke(stroke, conditions, incoming).value(p.name)
