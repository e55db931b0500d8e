"""The whole shot against independent references, physical sanity, presets and the batch API."""

import dataclasses
import math

import numpy as np
import pytest
from scipy.integrate import solve_ivp
from scipy.optimize import brentq

from rallyarc import config, court, domain
from rallyarc.bounce.pace import rate_surface
from rallyarc.flight.forces import acceleration
from rallyarc.shot import BallState, judge_landing, launch, play
from rallyarc.units import KMH, RPM


def demo():
    sc = domain.load_scenario("demo")
    return sc, BallState.of(*domain.incoming_state(sc.incoming))


def straight_demo():
    """The demo with every stroke swung straight down the court (the incoming ball travels
    along -x), so that each shot stays in one vertical plane, as the 2D reference formulas
    below assume."""
    sc, incoming = demo()
    strokes = tuple(s.turned(0.0) for s in sc.strokes)
    return dataclasses.replace(sc, strokes=strokes), incoming


def _ivp(x, v, w, params, events, t_span=(0.0, 10.0)):
    """scipy solve_ivp DOP853 at rtol 1e-10: the reference integrator, with the spin decaying
    exponentially at the parameters' rate from the start of the span."""
    k, t0 = params.spin_decay_rate, t_span[0]

    def rhs(t, y):
        spin = w * math.exp(-k * (t - t0))
        return np.concatenate([y[3:], acceleration(y[3:][None], spin[None], params)[0]])

    return solve_ivp(
        rhs, t_span, np.concatenate([x, v]), method="DOP853", rtol=1e-10, atol=1e-12, events=events
    )


def _published_bounce(v, w, r, alpha, mu, e):
    """Slide-or-grip bounce in the x-z plane (Brody 1984; Cross 2002; see REFERENCES.md):
    J_n = (1 + e)|v_z|, J_grip = alpha |u| / (1 + alpha) with u = v_x - r w_y."""
    vx, vz, wy = v[0], v[2], w[1]
    u = vx - r * wy
    jn = (1 + e) * abs(vz)
    jgrip = alpha * abs(u) / (1 + alpha)
    j = min(mu * jn, jgrip)
    vx2 = vx - math.copysign(j, u)
    wy2 = wy + math.copysign(j, u) / (alpha * r)
    return np.array([vx2, 0.0, e * abs(vz)]), np.array([0.0, wy2, 0.0])


def test_whole_shot_matches_solve_ivp_and_published_bounce():
    # References: scipy solve_ivp DOP853 rtol 1e-10 for both flights, the slide-or-grip
    # formulas of Brody (1984) / Cross (2002) for the bounce of a rigid ball (the compressing
    # ball's bounce is checked against it below). Tolerance 1 mm, 0.1 ms.
    sc, incoming = straight_demo()
    cond = dataclasses.replace(sc.conditions, deforming_ball=False)
    res = play(sc.strokes, cond, incoming)
    params = cond.flight_params()
    r, alpha = cond.ball.radius, cond.ball.alpha
    surface = cond.surface_for_ball()
    plane = court.HALF_LENGTH + cond.receiver_plane_m
    m = res.metrics
    for i in range(len(res)):
        x0 = incoming.position[0]
        # the launch state comes from the impact stage (checked in tests/impact)
        v0 = np.array(
            [
                m["impact_speed_mps"][i] * math.cos(math.radians(m["impact_launch_deg"][i])),
                0.0,
                m["impact_speed_mps"][i] * math.sin(math.radians(m["impact_launch_deg"][i])),
            ]
        )
        w0 = np.array([0.0, m["impact_topspin_rpm"][i] * RPM, 0.0])

        def ground(t, y):
            return y[2] - r

        ground.terminal, ground.direction = True, -1

        def net(t, y):
            return y[0]

        first = _ivp(x0, v0, w0, params, [ground, net])
        land = first.y_events[0][0]
        net_z = first.y_events[1][0][2]
        assert m["net_height_m"][i] == pytest.approx(net_z, abs=1e-3)
        assert m["land_x_m"][i] == pytest.approx(land[0], abs=1e-3)
        assert m["land_t_s"][i] == pytest.approx(first.t_events[0][0], abs=1e-4)
        w_land = w0 * math.exp(-params.spin_decay_rate * first.t_events[0][0])
        vb, wb = _published_bounce(
            land[3:], w_land, r, alpha, surface.friction, surface.restitution
        )
        assert m["bounce_speed_out_mps"][i] == pytest.approx(np.linalg.norm(vb), abs=1e-3)
        assert m["bounce_spin_out_rpm"][i] * RPM == pytest.approx(wb[1], abs=0.05)

        def top(t, y):
            return y[5]

        top.direction = -1

        def receiver(t, y):
            return y[0] - plane

        receiver.direction = 1
        t_b = first.t_events[0][0]
        second = _ivp(land[:3], vb, wb, params, [ground, top, receiver], (t_b, t_b + 10))
        assert m["bounce_apex_m"][i] == pytest.approx(second.y_events[1][0][2], abs=1e-3)
        if second.t_events[2].size:
            assert m["receiver_height_m"][i] == pytest.approx(second.y_events[2][0][2], abs=1e-3)
            assert m["receiver_t_s"][i] == pytest.approx(second.t_events[2][0], abs=1e-4)
        else:
            assert np.isnan(m["receiver_height_m"][i])  # bounced twice first (the drop shot)
            assert m["bounce_second_x_m"][i] == pytest.approx(second.y_events[0][0][0], abs=1e-3)


def _launch_from_baseline(speed_kmh, angle_deg, topspin_rpm, cond):
    """Balls launched toward +x from 1 m above the near baseline."""
    n = np.size(topspin_rpm)
    a = math.radians(angle_deg)
    v = speed_kmh * KMH * np.array([math.cos(a), 0.0, math.sin(a)])
    w = np.zeros((n, 3))
    w[:, 1] = np.atleast_1d(topspin_rpm) * RPM
    return launch(BallState.of([-court.HALF_LENGTH, 0.0, 1.0], v, w, n), cond)


def test_flat_drive_at_125_kmh_with_half_a_metre_over_the_net_lands_in():
    # Common practice: a flat drive at 120-130 km/h from the baseline that clears the net by
    # about half a metre lands in. The launch angle is solved for 0.5 m of clearance.
    cond = demo()[0].conditions
    for speed in (120.0, 125.0, 130.0):

        def clearance(angle, speed=speed):
            return _launch_from_baseline(speed, angle, 300.0, cond).metrics["net_clearance_m"][0]

        angle = brentq(lambda a: clearance(a) - 0.5, 1.0, 10.0)
        res = _launch_from_baseline(speed, angle, 300.0, cond)
        assert res.outcome[0] == "in", (speed, res.metrics["land_x_m"][0])


def test_more_topspin_at_the_same_launch_lands_shorter_and_bounces_higher():
    # Magnus lift along w x v points down for topspin, so at the same launch speed and angle
    # the ball dips sooner (lands shorter) and arrives steeper; a steeper arrival keeps more
    # vertical speed through the bounce, so the ball leaves the court faster upward (common
    # practice). The apex height itself is not monotonic at one launch: after the bounce the
    # gripping ball keeps a forward spin whose Magnus force pushes it down, and the shorter
    # ball has lost less speed; so the apex is compared at equal depth below.
    cond = demo()[0].conditions
    # 110 km/h at 9 degrees with 1500-3000 rpm lands in under the free-flight drag model (a flat
    # ball at that launch flies far beyond the baseline and falls from higher, so it is left out)
    res = _launch_from_baseline(110.0, 9.0, [1500.0, 2250.0, 3000.0], cond)
    m = res.metrics
    up = m["bounce_speed_out_mps"] * np.sin(np.radians(m["bounce_angle_out_deg"]))
    assert np.all(np.diff(m["land_x_m"]) < -0.5)
    assert np.all(np.diff(m["bounce_angle_in_deg"]) > 0)
    assert np.all(np.diff(up) > 0)


def test_more_topspin_to_the_same_depth_bounces_higher():
    # Common practice: to land at the same depth a topspin ball is launched higher, clears
    # the net by more, arrives steeper and kicks higher.
    cond = demo()[0].conditions
    apex, clearance = [], []
    for spin in (0.0, 1500.0, 3000.0):

        def land(angle, spin=spin):  # where the flight meets the ground, even through the net
            m = _launch_from_baseline(110.0, angle, spin, cond).metrics
            return m["flight_ground_x_m"][0] - 9.5

        angle = brentq(land, 0.0, 30.0)
        m = _launch_from_baseline(110.0, angle, spin, cond).metrics
        apex.append(m["bounce_apex_m"][0])
        clearance.append(m["net_clearance_m"][0])
    assert np.all(np.diff(apex) > 0.1)
    # 0.1 m per 1500 rpm: a regression bound of the free-flight drag model (constant C_D; the
    # wind-tunnel fit's drag rose with spin and gave over 0.2 m), not a published value
    assert np.all(np.diff(clearance) > 0.1)


def test_kick_serve_bounces_higher_than_flat_serve():
    # Common practice: the kick serve's topspin makes it dip steeply into the box and kick up;
    # the flat serve arrives flatter and stays lower.
    sc = domain.load_scenario("serve_demo")
    res = play(sc.strokes, sc.conditions)
    by = dict(zip(res.labels, range(len(res)), strict=True))
    m = res.metrics
    assert set(res.outcome) == {"in"}
    assert m["bounce_apex_m"][by["kick_serve"]] > m["bounce_apex_m"][by["flat_serve"]] + 0.15
    assert m["bounce_angle_in_deg"][by["kick_serve"]] > m["bounce_angle_in_deg"][by["flat_serve"]]
    assert m["impact_sidespin_rpm"][by["slice_serve"]] > 1000  # curves to the server's left


def test_slice_stays_lower_after_the_bounce_than_topspin():
    # Common practice: backspin makes the ball skid and stay low; topspin kicks it up.
    sc, incoming = demo()
    res = play(sc.strokes, sc.conditions, incoming)
    by = dict(zip(res.labels, range(len(res)), strict=True))
    m = res.metrics
    assert m["impact_topspin_rpm"][by["slice"]] < 0 < m["impact_topspin_rpm"][by["topspin_drive"]]
    for key in ("bounce_apex_m", "receiver_height_m"):
        assert m[key][by["slice"]] < m[key][by["topspin_drive"]]


def test_altitude_carries_the_same_shot_deeper():
    # Thinner air (ISA: about 16 % less dense at 1600 m) means less drag and lift: the same
    # launch flies further (common practice at altitude venues).
    sc, _ = demo()
    from dataclasses import replace

    low = _launch_from_baseline(110.0, 8.0, 1500.0, sc.conditions)
    high = _launch_from_baseline(
        110.0, 8.0, 1500.0, replace(sc.conditions, air=domain.load_air("altitude"))
    )
    assert domain.load_air("altitude").density < 0.88 * sc.conditions.air.density
    assert high.metrics["land_x_m"][0] > low.metrics["land_x_m"][0] + 0.3


def test_demo_scenario_variants_all_land_in():
    sc, incoming = demo()
    res = play(sc.strokes, sc.conditions, incoming)
    assert list(res.outcome) == ["in"] * len(sc.strokes)
    flat = list(res.labels).index("flat_drive")
    assert 120 <= res.metrics["impact_speed_mps"][flat] * 3.6 <= 130
    assert 0.3 <= res.metrics["net_clearance_m"][flat] <= 0.7


@pytest.mark.parametrize("name", config.preset_names("balls"))
def test_ball_restitution_reproduces_its_drop_test_with_drag(name):
    # ITF Rules of Tennis, Appendix I (and the ITF stage-ball specifications): rebound band
    # from 254 cm onto a rigid surface. The drop is simulated with air drag; without air the
    # same rebound needs only e = sqrt(h/H) (REFERENCES.md), so e must exceed that.
    ball = domain.load_ball(name)
    low, high = ball.rebound_band_cm
    rebound = domain.drop_test_rebound(ball)[0] * 100
    assert low <= rebound <= high
    assert rebound == pytest.approx(ball.rebound_cm, abs=0.5)
    assert ball.restitution > math.sqrt(ball.rebound_cm / 254.0)


@pytest.mark.parametrize("name", config.preset_names("surfaces"))
def test_surface_preset_rating_lands_in_its_category(name):
    # ITF CS 01/02 categories, simulated test impact (bounce.pace).
    data = config.load("surfaces", name)
    assert rate_surface(domain.load_surface(name)).category == data["pace_category"]


@pytest.mark.parametrize("kind", ["balls", "surfaces", "rackets", "air", "strokes", "scenarios"])
def test_every_preset_loads_and_names_a_source(kind):
    names = config.preset_names(kind)
    assert names
    for name in names:
        data = config.load(kind, name)
        assert data["source"].strip()


def test_air_presets_follow_the_isa():
    # ISA (ISO 2533): 1.225 kg/m^3 at sea level for dry air at 15 C; humid and hot air is
    # lighter. 1600 m ISA pressure 83,528 Pa (from the ISA formula, flight/air.py tests).
    sea, hot, alt = (domain.load_air(n) for n in ("sea_level", "hot_day", "altitude"))
    assert sea.density == pytest.approx(1.225, abs=0.006)
    assert hot.density < sea.density
    assert alt.density == pytest.approx(0.99, abs=0.01)


def test_batch_equals_separate_runs_and_converts_to_frames():
    sc, incoming = demo()
    together = play(sc.strokes, sc.conditions, incoming)
    frame = together.to_frame()
    assert list(frame["label"]) == [s.name for s in sc.strokes]
    for i, stroke in enumerate(sc.strokes):
        alone = play([stroke], sc.conditions, incoming)
        for key in ("land_x_m", "bounce_apex_m", "net_clearance_m"):
            assert alone.metrics[key][0] == pytest.approx(together.metrics[key][i], abs=1e-9)
    table = together.trajectory_frame(0.005)
    assert {"t_s", "x_m", "y_m", "z_m", "spin_rpm", "phase"} <= set(table.columns)
    first = table[table["shot"] == 0]
    assert first["t_s"].iloc[0] == 0.0
    assert np.allclose(np.diff(first["t_s"]), 0.005)
    assert first["z_m"].min() >= sc.conditions.ball.radius - 1e-6  # never below the court
    assert set(first["phase"]) == {"before_bounce", "after_bounce"}


def test_sweep_over_head_speed_runs_in_one_call():
    sc, incoming = demo()
    stroke = domain.load_stroke("topspin_drive")
    speeds = np.linspace(60, 100, 9) * KMH
    res = play([stroke], sc.conditions, incoming, head_speed=speeds)
    assert len(res) == 9
    assert np.all(np.diff(res.metrics["impact_speed_mps"]) > 0)


def test_ball_into_the_net_is_a_net_outcome_and_stops_there():
    sc, incoming = demo()
    res = _launch_from_baseline(100.0, 2.0, 0.0, sc.conditions)
    assert res.outcome[0] == "net"
    assert res.metrics["net_clearance_m"][0] < 0
    assert not res.metrics["bounce_occurred"][0]
    _, pos, _ = res.path(0)
    assert pos[:, 0].max() <= 1e-6  # the path ends at the net


def test_long_and_wide_outcomes():
    sc, _ = demo()
    cond = sc.conditions
    long_ball = _launch_from_baseline(140.0, 10.0, 0.0, cond)
    assert long_ball.outcome[0] == "long" and long_ball.metrics["land_depth_m"][0] < 0
    v = 110 * KMH * np.array([math.cos(0.3), math.sin(0.3), 0.0]) + [0, 0, 4.0]
    wide = launch(BallState.of([-court.HALF_LENGTH, 0.0, 1.0], v, [0, 0, 0]), cond)
    assert wide.outcome[0] == "wide" and wide.metrics["land_side_margin_m"][0] < 0


def test_ball_touching_the_line_is_in():
    # ITF Rules of Tennis, Rule 1: the lines belong to the court and their outer edges are its
    # boundary (baseline at 11.885 m, singles sideline at 4.115 m, service line at 6.40 m).
    x = [11.885, 11.886, 5.0, 5.0, 11.0, 6.40, 6.41, 3.0, 3.0]
    y = [0.0, 0.0, 4.115, 4.116, -4.2, 2.0, 2.0, -0.01, 4.116]
    serve = [False] * 5 + [True] * 4
    call = judge_landing(x, y, -0.3, serve)["land_call"]
    assert list(call) == ["in", "long", "in", "wide", "wide", "in", "long", "wide", "wide"]
    assert judge_landing([12.0], [4.2], 0.0, False)["land_call"][0] == "out"
    ad = judge_landing([3.0], [-2.0], 0.5, True)  # from the ad side, into the ad box
    assert ad["land_call"][0] == "in" and ad["land_service_box"][0] == "ad"


def test_a_ball_stopped_by_the_net_has_no_landing():
    # ITF Rules of Tennis: a ball that does not pass over the net is not a good return; the
    # ball stops at the net, so no landing or margins are reported for it.
    sc, incoming = demo()
    flat = next(s for s in sc.strokes if s.name == "flat_drive")
    res = play([flat], sc.conditions, incoming, face_tilt=np.radians([2.0, 5.6]))
    m = res.metrics
    assert list(res.outcome) == ["net", "in"]
    assert m["net_clearance_m"][0] < 0 and m["net_crossed_plane"][0]
    for key in ("land_x_m", "land_y_m", "land_depth_m", "land_side_margin_m", "bounce_apex_m"):
        assert np.isnan(m[key][0]) and np.isfinite(m[key][1]), key
    # the free flight is still followed to the ground for solvers, beyond the net
    assert m["flight_ground_x_m"][0] > 0
    t, pos, _ = res.path(0, dt=0.005)
    assert pos[:, 0].max() <= 1e-6  # the drawn path ends at the net


def test_friction_only_mode_removes_the_strings_spring_back():
    # Cross (2003, Sports Eng. 6:235): after gripping, the bottom of the ball slides backward on
    # the strings as the grip releases, so the ball leaves spinning faster than friction alone
    # makes it. Friction-only mode (tangential restitution 0) keeps the friction model, so every
    # gripping topspin stroke leaves with less topspin in it; the spin-limit report stays.
    sc, incoming = demo()
    with_spring = play(sc.strokes, sc.conditions, incoming, record=False).metrics
    alone = dataclasses.replace(sc.conditions, friction_only=True)
    assert alone.string_tangential_restitution == 0.0
    assert sc.conditions.string_tangential_restitution == pytest.approx(0.15)
    friction = play(sc.strokes, alone, incoming, record=False).metrics
    names = [s.name for s in sc.strokes]
    for name in ("topspin_drive", "heavy_topspin", "lob"):
        i = names.index(name)
        assert with_spring["impact_topspin_rpm"][i] > friction["impact_topspin_rpm"][i] + 100.0
    assert friction["impact_spin_limit_reached"].dtype == bool
    np.testing.assert_array_equal(
        friction["impact_spin_limit_reached"], with_spring["impact_spin_limit_reached"]
    )


def test_racket_presets_give_the_string_bed_keys():
    for name in config.preset_names("rackets"):
        setup = domain.load_racket(name)
        assert 0.0 <= setup.string_tangential_restitution <= 1.0
        assert "Cross (2005" in setup.source
        e = setup.normal_restitution(np.array([10.0, 30.0, 50.0]))
        assert np.all((e >= 0.0) & (e <= 1.0))


def test_cli_friction_only_option_on_shot_and_compare():
    import json

    from click.testing import CliRunner

    from rallyarc.cli import main

    runner = CliRunner()
    spins = []
    for extra in ([], ["--friction-only"]):
        out = runner.invoke(main, ["shot", "--json", *extra])
        assert out.exit_code == 0, out.output
        spins.append(json.loads(out.output)["impact"]["topspin_rpm"])
    assert spins[0] > spins[1] + 100.0
    out = runner.invoke(main, ["compare", "serve_demo", "--friction-only", "--json"])
    assert out.exit_code == 0, out.output


def test_deforming_ball_mode_bounces_through_the_compressing_ball_model():
    # With conditions.deforming_ball (the default) the court friction acts at the flattened
    # contact, a lever
    # arm q r below the centre instead of r. A ball that slides through the bounce keeps the
    # rigid ball's rebound (normal restitution and the friction impulse mu J_n are unchanged) and
    # gains q times the rigid ball's spin. q is computed here from the ITF ball deformation test
    # (ITF Rules of Tennis, Appendix I: 8.165 kg load, 0.65 cm mid-range forward deformation) as
    # a linear spring compressed by v_n sqrt(m / k), mean lever r - (pi / 4) d.
    sc = domain.load_scenario("serve_demo")
    names = [s.name for s in sc.strokes]
    assert sc.conditions.deforming_ball
    soft = play(sc.strokes, sc.conditions, None, record=False).metrics
    rigid_conditions = dataclasses.replace(sc.conditions, deforming_ball=False)
    rigid = play(sc.strokes, rigid_conditions, None, record=False).metrics
    i = names.index("flat_serve")
    assert rigid["bounce_regime"][i] == "slide" and soft["bounce_regime"][i] == "slide"
    for key in ("bounce_speed_in_mps", "bounce_speed_out_mps", "bounce_angle_out_deg"):
        assert soft[key][i] == pytest.approx(rigid[key][i], rel=1e-9), key
    ball = sc.conditions.ball
    v_n = rigid["bounce_speed_in_mps"][i] * math.sin(math.radians(rigid["bounce_angle_in_deg"][i]))
    k = 8.165 * 9.80665 / 0.0065
    q = 1.0 - 0.25 * math.pi * v_n * math.sqrt(ball.mass / k) / ball.radius
    gain_rigid = rigid["bounce_spin_out_rpm"][i] - rigid["bounce_spin_in_rpm"][i]
    gain_soft = soft["bounce_spin_out_rpm"][i] - soft["bounce_spin_in_rpm"][i]
    assert gain_rigid > 1000.0
    assert gain_soft == pytest.approx(q * gain_rigid, rel=1e-6)
    assert 0.3 < q < 0.9
