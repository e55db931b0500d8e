"""The whole shot as a pipeline of stages: impact -> first flight -> net -> landing -> bounce
-> second flight -> receiver, for N shots in one vectorized call.

The hitter stands at the near end and hits toward +x. The ball meets the racket at the contact
point (the incoming ball's position), flies over or into the net, bounces once on the far side,
and flies on until it reaches the receiver's contact plane (a vertical plane
``receiver_plane_m`` behind the far baseline) or bounces a second time.

Entry points by starting stage: :func:`simulate` (from the swing), :func:`launch` (from the
ball leaving the racket or a machine) and :func:`play` (named strokes against one incoming
ball, or serves from their tosses).
"""

from __future__ import annotations

import numpy as np

import rallyarc.shot.calls as calls
import rallyarc.shot.stages as stages
from rallyarc.shot.metrics import METRICS
from rallyarc.shot.result import Phase, ShotResult
from rallyarc.shot.state import BallState, Swing, serve_states


def _names(labels, n):
    labels = np.asarray(labels if labels is not None else [f"shot {i + 1}" for i in range(n)])
    return np.broadcast_to(labels, (n,)).astype(str)


def simulate(
    incoming,
    swing,
    conditions,
    labels=None,
    serve=None,
    record=True,
    rtol=1e-6,
    engine="numpy",
):
    """Play N shots through the whole chain in one vectorized call.

    Parameters
    ----------
    incoming : BallState
        The ball arriving at the contact point, N balls (a feed, an opponent's shot, a toss).
    swing : Swing
        N swings.
    conditions : rallyarc.domain.Conditions
    labels : sequence of str, optional
        Names of the shots.
    serve : array (N,) of bool, optional
        Which shots are serves (landing judged against the service box diagonally opposite
        the server: the deuce box when the contact is at y < 0, the ad box otherwise).
    record : bool
        Keep trajectories for dense output (plots, tables). Metrics need no recording.
    rtol : float
        Flight integrator tolerance.
    engine : {"numpy", "compiled"}
        Engine of the impact and the flights (:data:`rallyarc.shot.stages.ENGINES`): numpy
        (default), or the same models compiled with numba, for callers that play many small
        batches and can wait for the compile (or cache load) on first use; aero models and
        rackets without a compiled form are played with numpy whatever the choice.

    Returns
    -------
    ShotResult
    """
    n = max(len(incoming), len(swing))
    if len(incoming) != n:
        incoming = BallState.of(incoming.position, incoming.velocity, incoming.spin, n)
    if len(swing) != n:
        swing = Swing(**{f: np.broadcast_to(getattr(swing, f), (n,)) for f in Swing.FIELDS})
    contact, impact_metrics = stages.impact(incoming, swing, conditions, engine)
    start = BallState(incoming.position, contact.velocity, contact.spin)
    return _fly(
        start, conditions, labels, serve, record, rtol, contact.approaching, impact_metrics, engine
    )._with(incoming=incoming, swing=swing)


def launch(start, conditions, labels=None, serve=None, record=True, rtol=1e-6):
    """Fly N balls from their launch (just after the racket, or out of a ball machine) over
    the net, bounce them and fly them to the receiver's plane; the metrics of :func:`simulate`
    without the racket's contact block (speed, angle, heading and spin of the launch only).

    Parameters
    ----------
    start : BallState
        Launch position [m], velocity [m/s] and spin [rad/s], ``(N, 3)`` each.
    """
    m = stages.launch_metrics(start.velocity, start.spin)
    return _fly(start, conditions, labels, serve, record, rtol, np.ones(len(start), bool), m)


def _fly(start, conditions, labels, serve, record, rtol, approaching, m, engine="numpy"):
    """The stages after the racket, for balls launched from ``start``; ``m`` holds the launch
    metrics and receives the rest; ``engine`` integrates the flights (as in :func:`simulate`)."""
    n = len(start)
    labels = _names(labels, n)
    serve = np.broadcast_to(np.asarray(False if serve is None else serve, bool), (n,))
    params = conditions.flight_params()
    stages.compiled_flight(params, engine)  # an unknown engine fails before any flight
    first = stages.first_flight(start, params, conditions, record, rtol, engine)
    crossing, net_metrics = stages.net(first, start, approaching, conditions)
    m.update(net_metrics)
    land_metrics, bounced, end0 = stages.landing(
        first, start, crossing, approaching, serve, conditions
    )
    m.update(land_metrics)
    m.update(stages.no_bounce(n, bounced))
    m.update(stages.receiver_before_bounce(first, conditions))
    idx = np.flatnonzero(bounced)
    second = None
    if idx.size:
        velocity, spin = stages.bounce(first, idx, conditions, m)
        after = stages.second_flight(
            first, idx, velocity, spin, params, conditions, record, rtol, engine
        )
        end1 = stages.after_bounce(after, idx, first, conditions.ball.radius, m)
        second = Phase(idx, after, end1)
    m["receiver_reached"] = np.isfinite(m["receiver_height_m"])
    return ShotResult(
        labels=labels,
        serve=np.array(serve),
        metrics={key: m[key] for key in METRICS if key in m},
        before_bounce=Phase(np.arange(n), first, end0),
        after_bounce=second,
        conditions=conditions,
        incoming=start,
        swing=None,
    )


def play(strokes, conditions, incoming=None, record=True, **swing):
    """Play strokes against one incoming ball, or each serve against its own toss.

    Parameters
    ----------
    strokes : a :class:`rallyarc.domain.Stroke`, a stroke preset name or file, or a list of them.
    conditions : a :class:`rallyarc.domain.Conditions`, a :class:`rallyarc.domain.Scenario` or
        a scenario's preset name or file (whose incoming ball is played when ``incoming`` is
        None).
    incoming : BallState, optional
        One ball, or one per stroke.
    record : bool
        Keep trajectories for figures and tables.
    **swing
        Swing changes with their unit in the name, each a number or an array (a sweep), range
        checked as on the command line: ``head_speed_kmh``, ``head_speed_mps``,
        ``head_speed_mph``, ``swing_path_deg``, ``swing_direction_deg``, ``face_tilt_deg``,
        ``face_azimuth_deg``, ``racket_roll_deg``, ``impact_from_butt_m``, ``impact_offaxis_m``;
        or the SI field names (``head_speed`` [m/s], ``face_tilt`` [rad], ...), checked
        against the same ranges in SI.

    Returns
    -------
    ShotResult

    Example: ``play("topspin_drive", "demo", head_speed_kmh=95, face_tilt_deg=2)``.
    """
    strokes = calls.strokes_of(strokes)
    conditions, scenario = calls.conditions_of(conditions)
    if incoming is None and scenario is not None and scenario.incoming:
        from rallyarc import domain

        incoming = BallState.of(*domain.incoming_state(scenario.incoming))
    swing = Swing.from_strokes(strokes, **calls.swing_overrides(swing))
    n = len(swing)
    if len(strokes) == 1 and n > 1:
        strokes = strokes * n
    serve = np.array([s.kind == "serve" for s in strokes])
    toss = serve_states([s for s in strokes if s.toss is not None]) if serve.any() else None
    if incoming is None and not serve.all():
        raise ValueError("groundstrokes need an incoming ball")
    if incoming is not None:
        state = BallState.of(incoming.position, incoming.velocity, incoming.spin, n)
    else:
        state = BallState(np.zeros((n, 3)), np.zeros((n, 3)), np.zeros((n, 3)))
    if toss is not None:
        k = np.flatnonzero(serve)
        state.position[k], state.velocity[k], state.spin[k] = (
            toss.position,
            toss.velocity,
            toss.spin,
        )
    return simulate(
        state, swing, conditions, labels=[s.name for s in strokes], serve=serve, record=record
    )
