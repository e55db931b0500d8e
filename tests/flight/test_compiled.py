"""The compiled first flight (rallyarc.flight.compiled) against the numpy integrator.

Reference: the project's numpy batch integrator, ``rallyarc.flight.integrate.fly`` with the
events ``[net_plane(1), ground_contact(radius)]``, itself checked against scipy's
``solve_ivp`` (DOP853) in tests/flight/test_flight.py. The compiled kernel runs the same
algorithm operation for operation, so the two must agree far inside the integrator's own error:
the same event flags, terminal events and step counts, and times [s], positions [m],
velocities [m/s] and spins [rad/s] within ``TOL`` = 1e-9 (about 4e-13 is seen; what is left
comes from ``exp`` and ``pow`` rounding differently in numpy and in compiled code).
"""

from dataclasses import dataclass

import numpy as np
import pytest

from rallyarc.flight import compiled
from rallyarc.flight.aero import ConstantAero, CrossLindseyAero, StepanekAero
from rallyarc.flight.forces import FlightParams
from rallyarc.flight.integrate import PlaneEvent, apex, fly, ground_contact, net_plane

RPM = np.pi / 30.0
TOL = 1e-9
T_MAX = 12.0


def _balls(n, seed):
    """Random launches: 5-60 m/s, -25 to 55 deg, any spin axis up to 6000 rpm, from behind the
    baseline to near the net; a tenth aimed low into the net plane close by, a tenth flying
    away from the net, a tenth launched from beyond it, a few from the ground plane itself."""
    rng = np.random.default_rng(seed)
    speed = rng.uniform(5.0, 60.0, n)
    elev = np.radians(rng.uniform(-25.0, 55.0, n))
    azim = np.radians(rng.uniform(-20.0, 20.0, n))
    v = np.stack(
        [
            speed * np.cos(elev) * np.cos(azim),
            speed * np.cos(elev) * np.sin(azim),
            speed * np.sin(elev),
        ],
        axis=1,
    )
    axis = rng.normal(size=(n, 3))
    axis /= np.linalg.norm(axis, axis=1)[:, None]
    w = axis * rng.uniform(0.0, 6000.0, n)[:, None] * RPM
    x = np.column_stack(
        [rng.uniform(-12.5, -0.5, n), rng.uniform(-5.0, 5.0, n), rng.uniform(0.1, 3.0, n)]
    )
    group = rng.integers(0, 10, n)
    into_net = group == 0  # low and close: crosses the net plane near the ground
    x[into_net, 0] = rng.uniform(-3.0, -0.5, into_net.sum())
    v[into_net, 2] = -np.abs(v[into_net, 2]) * 0.3
    away = group == 1
    v[away, 0] *= -1.0
    beyond = group == 2
    x[beyond, 0] = rng.uniform(0.5, 10.0, beyond.sum())
    on_ground = group == 3
    x[on_ground, 2] = 0.0335
    v[on_ground, 2] = np.abs(v[on_ground, 2])
    return x, v, w


@dataclass(frozen=True)
class _OtherAero:
    """An aero model without a compiled form."""

    def drag(self, s):
        return np.full_like(np.asarray(s, dtype=float), 0.5)

    def lift_slope(self, s):
        return np.full_like(np.asarray(s, dtype=float), 1.0)


AEROS = [StepanekAero(), CrossLindseyAero(), ConstantAero(0.6, 0.25), ConstantAero(0.45, 0.0)]
CASES = [
    (aero, decay, wind)
    for aero in AEROS
    for decay in (0.0, 0.4)
    for wind in ((0.0, 0.0, 0.0), (3.0, -2.0, 0.5))
]


def _assert_same(got, want):
    assert got.event_names == want.event_names == ("net", "ground")
    assert got.trajectory is None
    np.testing.assert_array_equal(got.terminated_by, want.terminated_by)
    np.testing.assert_array_equal(got.n_steps, want.n_steps)
    for name in want.event_names:
        g, w = got.events[name], want.events[name]
        np.testing.assert_array_equal(g.occurred, w.occurred, err_msg=name)
        for field in ("t", "position", "velocity", "spin"):
            a, b = getattr(g, field), getattr(w, field)
            # NaN exactly where the event was not met, then TOL
            np.testing.assert_array_equal(np.isnan(a), np.isnan(b), err_msg=f"{name} {field}")
            np.testing.assert_allclose(a, b, rtol=0, atol=TOL, err_msg=f"{name} {field}")
    for field in ("t", "position", "velocity", "spin"):
        np.testing.assert_allclose(
            getattr(got, field), getattr(want, field), rtol=0, atol=TOL, err_msg=field
        )


def _numpy(x, v, w, params, t_max=T_MAX, rtol=1e-6, atol=1e-6):
    events = [net_plane(1), ground_contact(params.radius)]
    return fly(x, v, w, params, events, t_max=t_max, rtol=rtol, atol=atol)


@pytest.mark.parametrize(("aero", "decay", "wind"), CASES)
def test_compiled_flight_matches_numpy_on_random_balls(aero, decay, wind):
    x, v, w = _balls(1000, seed=len(CASES) * 7 + CASES.index((aero, decay, wind)))
    params = FlightParams(aero=aero, spin_decay_rate=decay, wind=wind)
    got = compiled.fly_net_and_ground(x, v, w, params, t_max=T_MAX)
    want = _numpy(x, v, w, params)
    _assert_same(got, want)
    # the draw reaches every branch: net met and missed, ground met (and so terminal)
    net, ground = want.events["net"].occurred, want.events["ground"].occurred
    assert net.any() and not net.all() and ground.mean() > 0.9
    np.testing.assert_array_equal(want.terminated_by == 1, ground)


def test_compiled_flight_matches_numpy_on_timeouts_and_other_tolerances():
    # a short t_max: most balls stop in the air (terminated_by -1); and a looser and a tighter
    # tolerance than the default
    x, v, w = _balls(1500, seed=99)
    params = FlightParams(aero=StepanekAero(), spin_decay_rate=0.1)
    got = compiled.fly_net_and_ground(x, v, w, params, t_max=0.4)
    want = _numpy(x, v, w, params, t_max=0.4)
    assert (want.terminated_by == -1).mean() > 0.5
    _assert_same(got, want)
    for rtol, atol in ((1e-4, 1e-5), (1e-9, 1e-9)):
        got = compiled.fly_net_and_ground(x, v, w, params, T_MAX, rtol, atol)
        _assert_same(got, _numpy(x, v, w, params, rtol=rtol, atol=atol))


def test_one_ball_and_list_input_fly_as_in_the_batch():
    x, v, w = _balls(20, seed=4)
    params = FlightParams()
    batch = compiled.fly_net_and_ground(x, v, w, params)
    one = compiled.fly_net_and_ground(x[7].tolist(), v[7].tolist(), w[7].tolist(), params)
    assert one.t.shape == (1,)
    assert one.t[0] == batch.t[7] and one.n_steps[0] == batch.n_steps[7]
    np.testing.assert_array_equal(
        one.events["ground"].position[0], batch.events["ground"].position[7]
    )


def test_models_without_a_compiled_form_are_refused():
    params = FlightParams(aero=_OtherAero())
    assert not compiled.supports(params)

    class Subclass(CrossLindseyAero):  # may override drag or lift: not the compiled model
        pass

    assert not compiled.supports(FlightParams(aero=Subclass()))
    assert all(compiled.supports(FlightParams(aero=a)) for a in AEROS)
    with pytest.raises(TypeError, match="_OtherAero"):
        compiled.fly_net_and_ground(np.zeros((1, 3)), np.ones((1, 3)), np.zeros((1, 3)), params)


def test_bad_input_is_rejected_as_numpy_rejects_it():
    params = FlightParams()
    bad = np.array([[np.nan, 0.0, 1.0]])
    for args in ((bad, np.ones((1, 3)), np.zeros((1, 3))), (np.zeros((2, 2)), 1.0, 0.0)):
        with pytest.raises(ValueError, match="finite and shaped"):
            compiled.fly_net_and_ground(*args, params)
        with pytest.raises(ValueError, match="finite and shaped"):
            _numpy(*args, params)
    with pytest.raises(ValueError, match="t_max"):
        compiled.fly_net_and_ground(np.zeros((1, 3)), np.ones((1, 3)), 0.0, params, t_max=0.0)


# ---- the general kernel (compiled.fly_compiled) against fly, trajectories recorded ----------

RECEIVER_X = 11.885 + 2.0


def _first_events(radius):
    """The chain's first flight: net, receiver plane, peak, ground."""
    return [
        net_plane(1),
        PlaneEvent("receiver", (1.0, 0.0, 0.0), RECEIVER_X, terminal=False, direction=1),
        apex("peak"),
        ground_contact(radius),
    ]


def _second_events(radius):
    """The chain's flight after the bounce: receiver plane, apex, ground."""
    return [
        PlaneEvent("receiver", (1.0, 0.0, 0.0), RECEIVER_X, terminal=False, direction=1),
        apex(),
        ground_contact(radius),
    ]


def _sample_times(res, n_grid=40):
    """Sample times ``(M, N)`` [s] for every ball: a grid from before the launch to after the
    end (clamped by sampling), every event time met, the launch and the end."""
    t0 = res.trajectory.t[0]
    grid = t0[None, :] + np.linspace(-0.05, 1.05, n_grid)[:, None] * (res.t - t0)[None, :]
    at_events = [np.where(r.occurred, r.t, res.t) for r in res.events.values()]
    return np.vstack([grid, *at_events, t0[None, :], res.t[None, :]])


def _assert_same_flight(got, want, tol=TOL):
    """Events, ends, terminal events and step counts as in _assert_same, for any events, and
    the recorded trajectories sampled at many times."""
    assert got.event_names == want.event_names
    np.testing.assert_array_equal(got.terminated_by, want.terminated_by)
    np.testing.assert_array_equal(got.n_steps, want.n_steps)
    for name in want.event_names:
        g, w = got.events[name], want.events[name]
        np.testing.assert_array_equal(g.occurred, w.occurred, err_msg=name)
        for field in ("t", "position", "velocity", "spin"):
            a, b = getattr(g, field), getattr(w, field)
            np.testing.assert_array_equal(np.isnan(a), np.isnan(b), err_msg=f"{name} {field}")
            np.testing.assert_allclose(a, b, rtol=0, atol=tol, err_msg=f"{name} {field}")
    for field in ("t", "position", "velocity", "spin"):
        np.testing.assert_allclose(
            getattr(got, field), getattr(want, field), rtol=0, atol=tol, err_msg=field
        )
    if want.trajectory is None:
        assert got.trajectory is None
        return
    times = _sample_times(want)
    for a, b, what in zip(
        got.trajectory.sample(times),
        want.trajectory.sample(times),
        ("position", "velocity", "spin"),
        strict=True,
    ):
        np.testing.assert_allclose(a, b, rtol=0, atol=tol, err_msg=f"sampled {what}")
    np.testing.assert_allclose(
        got.trajectory.sample_positions(times),
        want.trajectory.sample_positions(times),
        rtol=0,
        atol=tol,
        err_msg="sample_positions",
    )
    # the trajectory's ends are the flight's: its first knot the launch, its last the end
    np.testing.assert_array_equal(got.trajectory.t[0], want.trajectory.t[0])
    np.testing.assert_allclose(got.trajectory.t[-1], want.t, rtol=0, atol=tol)
    np.testing.assert_allclose(got.trajectory.position[-1], want.position, rtol=0, atol=tol)


def _both(x, v, w, params, events, **kw):
    got = compiled.fly_compiled(x, v, w, params, events, **kw)
    want = fly(x, v, w, params, events, **kw)
    return got, want


@pytest.mark.parametrize(("aero", "decay", "wind"), CASES[::3])
def test_general_kernel_matches_numpy_on_the_chains_two_flights(aero, decay, wind):
    params = FlightParams(aero=aero, spin_decay_rate=decay, wind=wind)
    x, v, w = _balls(600, seed=500 + CASES.index((aero, decay, wind)))
    got, want = _both(x, v, w, params, _first_events(params.radius), t_max=T_MAX, record=True)
    _assert_same_flight(got, want)
    # every event both met and missed; the ground ends most flights
    for name in ("net", "receiver", "peak"):
        met = want.events[name].occurred
        assert met.any() and not met.all(), name
    assert want.ended_by("ground").mean() > 0.9
    # the second flight: from where the first ended, at its end time, with a bounce-like
    # velocity (upward, slower)
    down = want.ended_by("ground")
    v2 = want.velocity[down] * np.array([0.7, 0.7, -0.6])
    w2 = want.spin[down] * 0.5
    t0 = want.t[down]
    events = _second_events(params.radius)
    got2, want2 = _both(
        want.position[down], v2, w2, params, events, t0=t0, t_max=T_MAX, record=True
    )
    _assert_same_flight(got2, want2)
    assert want2.events["apex"].occurred.mean() > 0.9
    assert np.all(want2.events["apex"].t[want2.events["apex"].occurred] > t0.min())


def test_general_kernel_without_recording_matches_numpy():
    params = FlightParams(aero=StepanekAero(), spin_decay_rate=0.2)
    x, v, w = _balls(1500, seed=41)
    got, want = _both(x, v, w, params, _first_events(params.radius), t_max=T_MAX)
    assert got.trajectory is None
    _assert_same_flight(got, want)


def test_general_kernel_other_planes_directions_and_per_ball_offsets():
    # a slanted position plane crossed either way (direction 0) with an offset per ball, a
    # terminal velocity plane with a non-zero offset and a slanted normal, a plane crossed
    # only downwards (direction -1), and a timeout for the balls that meet none
    params = FlightParams(aero=CrossLindseyAero(), spin_decay_rate=0.3, wind=(2.0, 1.0, 0.0))
    x, v, w = _balls(1500, seed=77)
    rng = np.random.default_rng(77)
    events = [
        PlaneEvent("slant", (1.0, 0.5, 0.25), rng.uniform(-6.0, 6.0, 1500), direction=0),
        PlaneEvent("high", (0.0, 0.0, 1.0), 2.0, direction=-1),
        PlaneEvent("sinking", (0.1, 0.0, 1.0), -6.0, terminal=True, direction=-1, on="velocity"),
        PlaneEvent("side", (0.0, 1.0, 0.0), rng.uniform(-1.0, 1.0, 1500), direction=0),
    ]
    got, want = _both(x, v, w, params, events, t_max=1.5, record=True)
    _assert_same_flight(got, want)
    ends = np.bincount(want.terminated_by + 1, minlength=4)
    assert ends[0] > 0 and ends[3] > 0  # timeouts and the velocity plane both end flights
    for name in ("slant", "high", "side"):
        met = want.events[name].occurred
        assert met.any() and not met.all(), name
    # direction 0 counts crossings both ways
    slant = want.events["slant"]
    g_launch = x @ np.array([1.0, 0.5, 0.25]) - events[0].offset
    assert (slant.occurred & (g_launch > 0)).any() and (slant.occurred & (g_launch < 0)).any()


def test_general_kernel_with_no_events_and_a_tight_tolerance():
    params = FlightParams(spin_decay_rate=0.1)
    x, v, w = _balls(400, seed=5)
    got, want = _both(x, v, w, params, (), t_max=0.8, rtol=1e-9, atol=1e-9, record=True)
    assert np.all(want.terminated_by == -1)
    _assert_same_flight(got, want)


def test_general_kernel_one_ball_flies_as_in_the_batch():
    params = FlightParams()
    x, v, w = _balls(30, seed=6)
    t0 = np.linspace(0.0, 3.0, 30)
    events = _first_events(params.radius)
    batch = compiled.fly_compiled(x, v, w, params, events, t0=t0, t_max=T_MAX, record=True)
    one = compiled.fly_compiled(
        x[11].tolist(), v[11].tolist(), w[11].tolist(), params, events, t0=t0[11], record=True
    )
    assert one.t[0] == batch.t[11] and one.n_steps[0] == batch.n_steps[11]
    times = np.linspace(t0[11], batch.t[11], 17)
    np.testing.assert_array_equal(
        one.trajectory.sample_positions(times)[:, 0],
        batch.trajectory.take([11]).sample_positions(times)[:, 0],
    )


def test_general_kernel_refuses_what_it_cannot_fly():
    params = FlightParams()
    one = (np.zeros((1, 3)), np.ones((1, 3)), np.zeros((1, 3)))
    with pytest.raises(TypeError, match="_OtherAero"):
        compiled.fly_compiled(*one, FlightParams(aero=_OtherAero()))
    with pytest.raises(ValueError, match="names"):
        compiled.fly_compiled(*one, params, [net_plane(1), net_plane(-1)])
    with pytest.raises(ValueError, match="t0"):
        compiled.fly_compiled(*one, params, t0=np.nan)
    with pytest.raises(ValueError, match="finite and shaped"):
        compiled.fly_compiled(np.full((1, 3), np.inf), np.ones((1, 3)), 0.0, params)
