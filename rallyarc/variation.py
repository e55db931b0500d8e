"""A stroke's own values and the rules for varying them: swing overrides that turn the face with
the swing, the parameter pairs a success window may vary, and a stroke's own value of any
sweepable parameter.

These are the rules the ``shot`` and ``plot`` commands apply; as Python calls they give the same
answers to a script.
"""

from __future__ import annotations

from dataclasses import replace

import numpy as np

from rallyarc import sweep

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
        changes["face_azimuth"] = (
            stroke.face_azimuth - stroke.swing_direction + changes["swing_direction"]
        )
    return replace(stroke, **changes)


def check_window_axes(x_param, y_param):
    """The two :class:`rallyarc.sweep.Parameter` of a success window, or ``ValueError``.

    A window varies two different parameters of one family: two swing parameters
    (``head_speed``, ``face_tilt``, ``swing_path``) or two launch parameters (``launch_speed``,
    ``launch_angle``, ``launch_spin``); the incoming ball is not a window axis.
    """
    px, py = (_parameter(name) for name in (x_param, y_param))
    if px.name == py.name or px.family != py.family or px.family == "incoming":
        raise ValueError(
            "a window varies two different swing parameters (head_speed, face_tilt, swing_path) "
            "or two launch parameters (launch_speed, launch_angle, launch_spin)"
        )
    return px, py


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
    p = _parameter(parameter)
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
    return sweep.Launch.from_stroke(stroke, conditions, incoming).value(p.name)


def _parameter(name):
    try:
        return sweep.PARAMETERS[name]
    except KeyError:
        raise ValueError(
            f"unknown parameter {name!r}; choose one of {', '.join(sweep.PARAMETERS)}"
        ) from None
