"""Checks of the flight stage against exact solutions, the ISA and scipy's solve_ivp."""

import numpy as np
import pytest
from scipy.integrate import solve_ivp

from rallyarc import kinematics
from rallyarc.flight.aero import ConstantAero, StepanekAero, get_aero_model
from rallyarc.flight.air import air_density, isa_density
from rallyarc.flight.forces import FlightParams, acceleration
from rallyarc.flight.integrate import apex, fly, ground_contact, net_plane

RPM = np.pi / 30.0


def random_shots(n, seed):
    """Shots spread as the accuracy requirement states: 20-70 m/s, -10 to 30 deg, 0-5000 rpm."""
    rng = np.random.default_rng(seed)
    speed = rng.uniform(20, 70, n)
    elev = np.radians(rng.uniform(-10, 30, n))
    azim = np.radians(rng.uniform(-10, 10, n))
    v = kinematics.velocity(speed, elev, azim)
    axis = kinematics.unit(rng.normal(size=(n, 3)))
    w = axis * rng.uniform(0, 5000, n)[:, None] * RPM
    x = np.tile([-11.885, 0.0, 1.0], (n, 1))
    return x, v, w


def test_isa_density_sea_level_and_1000m():
    # ISO 2533 ISA: 1.225 kg/m^3 at 0 m, 1.1116 kg/m^3 at 1000 m (REFERENCES.md)
    assert isa_density(0.0) == pytest.approx(1.225, abs=5e-4)
    assert isa_density(1000.0) == pytest.approx(1.1116, abs=2e-4)


def test_dry_air_density_30c():
    # ideal gas, dry air at 101325 Pa and 30 C: 1.1644 kg/m^3 (REFERENCES.md)
    assert air_density(30.0, 101325.0, 0.0) == pytest.approx(1.1644, abs=2e-4)
    # humid air is lighter than dry air (common practice: water vapour is lighter than air)
    assert air_density(30.0, 101325.0, 0.8) < air_density(30.0, 101325.0, 0.0)


def test_stepanek_coefficients_at_s_equal_one():
    # Stepanek (1988), Am. J. Phys. 56:138: at S = 1, C_D about 0.779 and C_L 0.333
    model = StepanekAero()
    assert model.drag(1.0) == pytest.approx(0.779, abs=1e-3)
    assert model.lift_slope(1.0) * 1.0 == pytest.approx(0.333, abs=1e-3)
    assert model.drag(0.0) == pytest.approx(0.508)  # S = 0 needs no special case


def test_unknown_aero_model_lists_valid_names():
    with pytest.raises(ValueError, match="stepanek1988"):
        get_aero_model("nonsense")


def test_vacuum_flight_is_the_parabola():
    # exact: x = x0 + v0 t, z = z0 + vz t - g t^2 / 2 (Newton's laws, no air)
    params = FlightParams(air_density=0.0)
    x0 = np.array([[-11.885, 0.5, 1.0]])
    v0 = np.array([[30.0, -1.0, 8.0]])
    res = fly(x0, v0, np.zeros((1, 3)), params, [ground_contact(params.radius)])
    g = params.gravity
    t_land = (8.0 + np.sqrt(64.0 + 2 * g * (1.0 - params.radius))) / g
    assert res.t[0] == pytest.approx(t_land, abs=1e-9)
    assert res.position[0] == pytest.approx(
        x0[0] + v0[0] * t_land + [0, 0, -0.5 * g * t_land**2], abs=1e-8
    )


def test_drag_only_flight_decays_exponentially_with_distance():
    # exact: with gravity off and no lift, v = v0 exp(-k x), k = rho C_D A / (2 m)
    params = FlightParams(aero=ConstantAero(0.55, 0.0), gravity=0.0)
    k = params.air_density * 0.55 * params.area / (2 * params.mass)
    res = fly(
        [[0.0, 0.0, 1.0]],
        [[40.0, 0.0, 0.0]],
        [[0.0, 0.0, 0.0]],
        params,
        [],
        t_max=1.0,
        rtol=1e-11,
        atol=1e-11,
    )
    distance = res.position[0, 0]
    assert res.velocity[0, 0] == pytest.approx(40.0 * np.exp(-k * distance), rel=1e-9)


def test_zero_decay_keeps_spin_and_decay_is_exponential():
    # REFERENCES.md: decay is a parameter; zero decay keeps spin constant
    w0 = np.array([[0.0, 300.0, 0.0]])
    res = fly([[-11.0, 0, 1.0]], [[30.0, 0, 3.0]], w0, FlightParams(), [], t_max=0.8)
    assert res.spin == pytest.approx(w0)
    res = fly(
        [[-11.0, 0, 1.0]], [[30.0, 0, 3.0]], w0, FlightParams(spin_decay_rate=0.1), [], t_max=0.8
    )
    assert res.spin[0, 1] == pytest.approx(300.0 * np.exp(-0.08), rel=1e-12)


def _reference(x, v, w, params):
    """scipy solve_ivp DOP853 at rtol 1e-10, the reference integrator of the requirement."""

    def rhs(t, y):
        return np.concatenate([y[3:], acceleration(y[3:][None], w[None], params)[0]])

    def ground(t, y):
        return y[2] - params.radius

    ground.terminal, ground.direction = True, -1

    def net(t, y):
        return y[0]

    return solve_ivp(
        rhs,
        (0, 10),
        np.concatenate([x, v]),
        method="DOP853",
        rtol=1e-10,
        atol=1e-12,
        events=[ground, net],
    )


def test_batch_matches_solve_ivp_dop853():
    # Requirement: landing within 1 mm and event times within 0.1 ms of solve_ivp DOP853 rtol 1e-10
    x, v, w = random_shots(400, seed=7)
    params = FlightParams()
    res = fly(x, v, w, params, [net_plane(), ground_contact(params.radius)])
    assert np.all(res.ended_by("ground"))
    for i in range(0, 400, 5):
        ref = _reference(x[i], v[i], w[i], params)
        landing = ref.y_events[0][0]
        assert np.linalg.norm(res.position[i] - landing[:3]) < 1e-3
        assert abs(res.t[i] - ref.t_events[0][0]) < 1e-4
        assert np.linalg.norm(res.velocity[i] - landing[3:]) < 1e-3
        if len(ref.t_events[1]):
            net = res.events["net"]
            assert net.occurred[i]
            assert abs(net.t[i] - ref.t_events[1][0]) < 1e-4
            assert np.linalg.norm(net.position[i] - ref.y_events[1][0][:3]) < 1e-3


def test_apex_matches_solve_ivp_dop853_event():
    # Reference: scipy solve_ivp DOP853 rtol 1e-10 with an event on the vertical velocity.
    params = FlightParams()
    x, v, w = random_shots(40, seed=13)
    v[:, 2] = np.abs(v[:, 2]) + 2.0  # every ball rises first
    res = fly(x, v, w, params, [apex(), ground_contact(params.radius)])
    top = res.events["apex"]
    assert np.all(top.occurred)
    assert np.all(np.abs(top.velocity[:, 2]) < 1e-6)
    for i in range(40):
        wi = w[i]

        def rhs(t, y, wi=wi):
            return np.concatenate([y[3:], acceleration(y[3:][None], wi[None], params)[0]])

        def rising(t, y):
            return y[5]

        rising.direction = -1
        ref = solve_ivp(
            rhs,
            (0, 10),
            np.concatenate([x[i], v[i]]),
            method="DOP853",
            rtol=1e-10,
            atol=1e-12,
            events=[rising],
        )
        assert abs(top.t[i] - ref.t_events[0][0]) < 1e-4
        assert np.linalg.norm(top.position[i] - ref.y_events[0][0][:3]) < 1e-3


def test_wind_matches_solve_ivp():
    params = FlightParams(wind=(-4.0, 2.0, 0.0))
    x, v, w = random_shots(10, seed=3)
    res = fly(x, v, w, params, [ground_contact(params.radius)])
    for i in range(10):
        ref = _reference(x[i], v[i], w[i], params)
        assert np.linalg.norm(res.position[i] - ref.y_events[0][0][:3]) < 1e-3


def test_ball_starting_on_the_ground_lands_again():
    # a ball leaving the court (just after a bounce) must find its next contact, even a short hop
    params = FlightParams()
    res = fly(
        [[5.0, 0, params.radius]] * 2,
        [[10.0, 0, 0.3], [20.0, 0, 6.0]],
        np.zeros((2, 3)),
        params,
        [ground_contact(params.radius)],
    )
    assert np.all(res.ended_by("ground"))
    assert res.t[0] == pytest.approx(2 * 0.3 / params.gravity, rel=0.02)


def test_scalar_list_and_chunked_batches_agree():
    x, v, w = random_shots(300, seed=11)
    params = FlightParams()
    events = [net_plane(), ground_contact(params.radius)]
    whole = fly(x, v, w, params, events)
    chunked = fly(x, v, w, params, events, chunk=64)
    single = fly(x[0].tolist(), v[0].tolist(), w[0].tolist(), params, events)
    assert chunked.position == pytest.approx(whole.position, abs=1e-12)
    assert single.position[0] == pytest.approx(whole.position[0], abs=1e-9)


def test_dense_output_passes_through_events():
    params = FlightParams()
    x, v, w = random_shots(5, seed=5)
    res = fly(x, v, w, params, [ground_contact(params.radius)], record=True)
    pos, vel, _ = res.trajectory.sample(np.array([0.0, 100.0]))
    assert pos[0] == pytest.approx(x, abs=1e-12)
    assert pos[1] == pytest.approx(res.position, abs=1e-9)


def test_bad_input_is_rejected():
    with pytest.raises(ValueError, match="velocity"):
        fly([[0, 0, 1]], [[np.nan, 0, 0]], [[0, 0, 0]], FlightParams())
    with pytest.raises(ValueError, match="air_density"):
        FlightParams(air_density=-1.0)


def test_physics_packages_import_no_application_code():
    # ARCHITECTURE.md: impact, flight and bounce never import rallyarc, viz, click or plotting
    import subprocess
    import sys

    code = (
        "import sys, rallyarc.flight.integrate, rallyarc.flight.air, rallyarc.flight.aero; "
        "bad = [m for m in sys.modules if m.split('.')[0] in ('click', 'matplotlib', 'pyvista') "
        "or (m.startswith('rallyarc') and m != 'rallyarc' "
        "and not m.startswith('rallyarc.flight'))]; "
        "print(bad); sys.exit(1 if bad else 0)"
    )
    assert subprocess.run([sys.executable, "-P", "-c", code]).returncode == 0
