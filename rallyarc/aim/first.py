"""The part of the chain an aim's residual needs: the racket (or the launch), the first flight
to the ground with no trajectory recorded and only the net's plane and the ground as events,
the net and the landing. The flight's peak, the receiver's plane, the bounce and the flight after
it are left out; their metrics are absent from what these functions return.

Events do not change the integrator's steps, so the net and the ground come out as the whole
chain computes them.

``engine`` chooses the impact and the integrator of that flight: ``"numpy"`` (default) is
:func:`rallyarc.impact.contact.hit` and :func:`rallyarc.flight.integrate.fly`; ``"compiled"``
is :func:`rallyarc.impact.compiled.hit` (the same contact model, outputs within about 1e-12)
and :func:`rallyarc.flight.compiled.fly_net_and_ground`, the same algorithm compiled with numba
(the same events and step counts, positions within about 1e-12 m), for callers that strike and
fly many small batches and can pay for the compile (or cache load) on first use. Rackets and
balls whose models have no compiled form are played with numpy whatever the choice."""

from __future__ import annotations

import numpy as np

import rallyarc.shot.stages as stages
from rallyarc.flight.integrate import EventRecord, fly, ground_contact, net_plane
from rallyarc.shot import BallState

#: Metrics of the events this flight leaves out (not returned).
_LEFT_OUT = ("flight_peak_m", "flight_peak_x_m")


def _flight(start, params, rtol, engine="numpy"):
    """The first flight with the net and the ground only; the events left out are recorded as
    never met, so that the chain's stage functions can read the result."""
    compiled = stages.compiled_flight(params, engine)
    if compiled is not None:
        first = compiled.fly_net_and_ground(
            start.position, start.velocity, start.spin, params, t_max=stages.T_MAX, rtol=rtol
        )
    else:
        first = fly(
            start.position,
            start.velocity,
            start.spin,
            params,
            [net_plane(1), ground_contact(params.radius)],
            t_max=stages.T_MAX,
            rtol=rtol,
        )
    n = len(start)
    for name in ("peak", "receiver"):
        first.events[name] = EventRecord(
            np.zeros(n, bool), *(np.full(shape, np.nan) for shape in (n, (n, 3), (n, 3), (n, 3)))
        )
    return first


def _first(start, approaching, serve, conditions, m, rtol, engine):
    first = _flight(start, conditions.flight_params(), rtol, engine)
    crossing, net_metrics = stages.net(first, start, approaching, conditions)
    for key in _LEFT_OUT:
        net_metrics.pop(key)
    m.update(net_metrics)
    land_metrics, _, _ = stages.landing(first, start, crossing, approaching, serve, conditions)
    m.update(land_metrics)
    return m


def struck(incoming, swing, conditions, serve, rtol=1e-6, engine="numpy"):
    """Impact, net and landing metrics of N swings against N incoming balls (as
    :func:`rallyarc.shot.simulate` computes them); ``engine`` as in the module's notes."""
    contact, m = stages.impact(incoming, swing, conditions, engine)
    start = BallState(incoming.position, contact.velocity, contact.spin)
    return _first(start, contact.approaching, serve, conditions, m, rtol, engine)


def launched(start, conditions, rtol=1e-6, engine="numpy"):
    """Launch, net and landing metrics of N launched balls (as :func:`rallyarc.shot.launch`
    computes them); ``engine`` as in the module's notes."""
    n = len(start)
    m = stages.launch_metrics(start.velocity, start.spin)
    return _first(start, np.ones(n, bool), np.zeros(n, bool), conditions, m, rtol, engine)
