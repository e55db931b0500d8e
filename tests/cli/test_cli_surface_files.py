"""Surface files reach the physics of ``bounce`` and ``surface`` by the chain's own path
(``domain.load_surface``): every key of the file counts, not only friction and restitution."""

import json
import math

import numpy as np
import pytest
from click.testing import CliRunner

from rallyarc import domain
from rallyarc.bounce.deform import bounce_deforming
from rallyarc.bounce.pace import rate_surface
from rallyarc.cli import main
from rallyarc.units import RPM

# a clay-like court whose contact point springs back (e_t) and whose restitution falls with the
# impact speed; values illustrative, not measured
WET_CLAY = """name = "wet clay"
source = "test"
friction = 0.8
restitution = 0.85
tangential_restitution = 0.6
restitution_slope_s_per_m = -0.01
"""


def run_json(*args):
    result = CliRunner().invoke(main, [*map(str, args), "--json"])
    assert result.exit_code == 0, result.output
    return json.loads(result.output)


@pytest.fixture
def wet_clay(tmp_path):
    path = tmp_path / "wet_clay.toml"
    path.write_text(WET_CLAY)
    return path


@pytest.mark.parametrize("angle", [16.0, 24.0])
def test_bounce_with_a_surface_file_gives_the_library_answer(wet_clay, angle):
    data = run_json("bounce", "--speed", 35, "--angle", angle, "--surface", wet_clay)
    ball = domain.load_ball("itf_type2")
    theta = math.radians(angle)
    res = bounce_deforming(
        np.array([[35.0 * math.cos(theta), 0.0, -35.0 * math.sin(theta)]]),
        np.zeros((1, 3)),
        ball.radius,
        ball.alpha,
        domain.load_surface(wet_clay),
        ball.mass,
    )
    assert data["bounce"]["vx_out_mps"] == float(res.velocity[0, 0])
    assert data["bounce"]["vz_out_mps"] == float(res.velocity[0, 2])
    assert data["bounce"]["spin_out_rpm"] == float(res.spin[0, 1]) / RPM
    assert data["bounce"]["regime"] == res.regime[0]
    # the file's extra keys change the answer: friction and restitution alone give another one
    # (at 35 m/s the normal speed is off the restitution's reference speed, so its slope counts)
    plain = run_json("bounce", "--speed", 35, "--angle", angle, "--friction", 0.8,
                     "--restitution", 0.85)  # fmt: skip
    assert (plain["bounce"]["vx_out_mps"], plain["bounce"]["spin_out_rpm"]) != (
        data["bounce"]["vx_out_mps"],
        data["bounce"]["spin_out_rpm"],
    )


def test_surface_rating_of_a_file_follows_every_key(wet_clay):
    data = run_json("surface", "--preset", wet_clay)
    rating = rate_surface(domain.load_surface(wet_clay), temperature_c=23.0)
    assert data["court_pace_rating"] == float(rating.court_pace_rating)
    assert data["category"] == int(rating.category)
    assert data["measured_friction"] == float(rating.measured_friction)
    assert data["measured_restitution"] == float(rating.measured_restitution)
    assert data["ball_gripped"] is bool(rating.ball_gripped)
    plain = run_json("surface", "--friction", 0.8, "--restitution", 0.85)
    assert plain["court_pace_rating"] != data["court_pace_rating"]


@pytest.mark.parametrize("ball", ["itf_type2", "stage_red"])
@pytest.mark.parametrize("flag", [[], ["--rigid-ball"]])
def test_bounce_command_bounces_as_the_shot_chain_does(ball, flag):
    # one bounce from the command equals the chain's bounce for the same ball and surface: the
    # surface's restitution scaled to the ball (a stage ball bounces lower), the same model
    import dataclasses

    data = run_json("bounce", "--speed", 20, "--angle", 30, "--ball", ball, *flag)
    sc = domain.load_scenario("demo")
    conditions = dataclasses.replace(
        sc.conditions, ball=domain.load_ball(ball), deforming_ball=not flag
    )
    theta = math.radians(30.0)
    res = conditions.bounce(
        np.array([[20.0 * math.cos(theta), 0.0, -20.0 * math.sin(theta)]]), np.zeros((1, 3))
    )
    assert data["bounce"]["vx_out_mps"] == float(res.velocity[0, 0])
    assert data["bounce"]["vz_out_mps"] == float(res.velocity[0, 2])
    assert data["bounce"]["spin_out_rpm"] == float(res.spin[0, 1]) / RPM
    assert data["inputs"]["restitution_for_ball"] == float(res.restitution[0])
    if ball == "stage_red":
        assert data["inputs"]["restitution_for_ball"] < data["inputs"]["surface_restitution"]
