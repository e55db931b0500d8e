"""The command line: JSON shapes, values against published checks, one-line errors."""

import json
import math

import pytest
from click.testing import CliRunner

from rallyarc.cli import main


def run(*args):
    result = CliRunner().invoke(main, list(args))
    return result


def run_json(*args):
    result = run(*args, "--json")
    assert result.exit_code == 0, result.output
    return json.loads(result.output)


def test_feed_json_has_inputs_net_and_landing():
    data = run_json("feed", "--from", "-11,0,1", "--speed", "90km/h", "--elevation", "8")
    for key in ("mass_kg", "radius_m", "air_density_kgm3", "aero_model", "speed_mps"):
        assert key in data["inputs"]
    assert data["inputs"]["speed_mps"] == pytest.approx(25.0)
    assert set(data["net_crossing"]) >= {"height_m", "clearance_m", "y_m", "t_s"}
    assert set(data["landing"]) >= {"x_m", "y_m", "t_s", "speed_mps", "angle_deg"}
    assert data["landing"]["x_m"] > 0  # crosses to the far side


def test_feed_in_vacuum_matches_the_parabola():
    # exact: no air, no spin -> range of a projectile launched from height z0 to z = r
    data = run_json(
        "feed",
        "--from",
        "-11,0,1",
        "--speed",
        "20",
        "--elevation",
        "10",
        "--spin",
        "0",
        "--air-density",
        "0",
    )
    g, v, th, r = 9.80665, 20.0, math.radians(10), data["inputs"]["radius_m"]
    vz = v * math.sin(th)
    t = (vz + math.sqrt(vz**2 + 2 * g * (1 - r))) / g
    assert data["landing"]["t_s"] == pytest.approx(t, abs=1e-6)
    assert data["landing"]["x_m"] == pytest.approx(-11 + v * math.cos(th) * t, abs=1e-5)


def test_feed_that_falls_short_has_no_net_crossing():
    data = run_json("feed", "--from", "-11,0,1", "--speed", "5", "--elevation", "0")
    assert data["net_crossing"] is None


def test_fed_ball_into_the_net_stops_there():
    # 90 km/h at 2 degrees with no spin from hip height meets the net: outcome net, no
    # landing and no bounce, and the text says so with the safety caution.
    data = run_json("feed", "--elevation", "2", "--spin", "0", "--speed", "90km/h")
    assert data["net_crossing"]["clearance_m"] < 0
    assert data["outcome"] == "net"
    assert data["landing"] is None and data["bounce"] is None
    text = run("feed", "--elevation", "2", "--spin", "0", "--speed", "90km/h").output
    assert "INTO THE NET" in text and "outcome:  net" in text
    assert "Safety" in text and "line of fire" in text


def test_fed_ball_has_the_shot_blocks_and_a_line_call():
    data = run_json("feed", "--from", "-11,0,1", "--speed", "90km/h", "--elevation", "8")
    shot = run_json("shot")
    assert set(data) == set(shot)
    for block in ("impact", "net_crossing", "landing", "bounce", "flight", "receiver"):
        assert set(data[block]) <= set(shot[block]), block
    assert data["outcome"] == "in"
    assert data["bounce"]["apex_m"] > data["inputs"]["radius_m"]
    assert data["inputs"]["air_density_kgm3"] == pytest.approx(shot["inputs"]["air_density_kgm3"])


def test_feed_from_the_far_end_is_the_near_feed_turned_about_z():
    near = run_json("feed", "--from", "-11,1,1", "--speed", "80km/h", "--elevation", "12")
    far = run_json(
        "feed", "--from", "11,-1,1", "--speed", "80km/h", "--elevation", "12", "--azimuth",
        "180", "--spin-axis", "0,-1,0",
    )  # fmt: skip
    assert far["outcome"] == near["outcome"] == "in"
    assert far["landing"]["x_m"] == pytest.approx(-near["landing"]["x_m"], abs=1e-6)
    assert far["landing"]["y_m"] == pytest.approx(-near["landing"]["y_m"], abs=1e-6)
    assert far["bounce"]["apex_m"] == pytest.approx(near["bounce"]["apex_m"], abs=1e-6)
    assert far["impact"]["azimuth_deg"] == pytest.approx(180.0)


def test_bounce_pace_test_geometry():
    # REFERENCES.md worked value for a rigid ball (sliding at 30 m/s, 16 deg, mu 0.6, e 0.8):
    # vx 19.907, vz 6.615. The default compressing ball slides with the same rebound and less
    # spin (the friction's lever arm is shorter).
    args = ("bounce", "--speed", "30", "--angle", "16", "--friction", "0.6", "--restitution", "0.8")
    rigid = run_json(*args, "--rigid-ball")
    assert rigid["bounce"]["vx_out_mps"] == pytest.approx(19.907, abs=1e-3)
    assert rigid["bounce"]["vz_out_mps"] == pytest.approx(6.615, abs=1e-3)
    assert rigid["bounce"]["regime"] == "slide"
    assert rigid["inputs"]["bounce_model"] == "rigid ball"
    soft = run_json(*args)
    assert soft["inputs"]["bounce_model"] == "deforming ball"
    assert soft["bounce"]["regime"] == "slide"
    for key in ("vx_out_mps", "vz_out_mps"):
        assert soft["bounce"][key] == pytest.approx(rigid["bounce"][key], rel=1e-12)
    assert 0.0 < soft["bounce"]["spin_out_rpm"] < rigid["bounce"]["spin_out_rpm"]


def test_bounce_grip_worked_value():
    # REFERENCES.md, rigid ball: v = (15, -15) m/s, no spin, mu 0.6, e 0.8 -> grip, vx 9.6774,
    # vz 12.0
    data = run_json(
        "bounce",
        "--speed",
        str(15 * math.sqrt(2)),
        "--angle",
        "45",
        "--friction",
        "0.6",
        "--restitution",
        "0.8",
        "--rigid-ball",
    )
    assert data["bounce"]["regime"] == "grip"
    assert data["bounce"]["vx_out_mps"] == pytest.approx(9.6774, abs=1e-3)
    assert data["bounce"]["vz_out_mps"] == pytest.approx(12.0, abs=1e-6)


def test_surface_worked_values():
    # REFERENCES.md (ITF CS 01/02): mu 0.6, e 0.80 -> CPR 41.5 (category 4); mu 0.5 -> 51.5 (5)
    data = run_json("surface", "--friction", "0.6", "--restitution", "0.8")
    assert data["court_pace_rating"] == pytest.approx(41.5, abs=0.05)
    assert data["category"] == 4
    assert data["measured_friction"] == pytest.approx(0.6, abs=1e-9)
    data = run_json("surface", "--friction", "0.5", "--restitution", "0.8")
    assert data["court_pace_rating"] == pytest.approx(51.5, abs=0.05)
    assert data["category"] == 5


@pytest.mark.parametrize(
    "name", ["clay", "hard_slow", "hard_medium", "hard_fast", "grass", "carpet"]
)
def test_surface_presets_land_in_their_category(name):
    from rallyarc import config

    data = run_json("surface", "--preset", name)
    assert data["category"] == config.load("surfaces", name)["pace_category"]


def test_clay_grips_in_the_pace_test_and_says_so():
    data = run_json("surface", "--preset", "clay")
    assert data["ball_gripped"] is True
    assert data["measured_friction"] < data["surface_friction"]
    assert data["note"]


@pytest.mark.parametrize(
    "args, option",
    [
        (["feed", "--speed", "-5"], "--speed"),
        (["feed", "--speed", "fast"], "--speed"),
        (["feed", "--elevation", "nan"], "--elevation"),
        (["feed", "--from", "1,2"], "--from"),
        (["feed", "--ball", "nosuchball"], "ball preset"),
        (["feed", "--aero", "magic"], "--aero"),
        (
            [
                "bounce",
                "--speed",
                "20",
                "--angle",
                "20",
                "--friction",
                "0.5",
                "--restitution",
                "1.5",
            ],
            "--restitution",
        ),
        (["bounce", "--speed", "20", "--angle", "20", "--surface", "ice"], "surface preset"),
        (["surface", "--friction", "2.5", "--restitution", "0.8"], "--friction"),
        (
            ["surface", "--friction", "0.5", "--restitution", "0.8", "--temperature", "90"],
            "--temperature",
        ),
        (["feed", "--nonsense"], "--nonsense"),
    ],
)
def test_bad_input_is_one_line_with_exit_code_2(args, option):
    result = run(*args)
    assert result.exit_code == 2
    lines = result.output.strip().splitlines()
    assert len(lines) == 1 and option in lines[0]
    assert "Traceback" not in result.output


def test_bad_surface_file_names_file_and_key(tmp_path):
    bad = tmp_path / "wet.toml"
    bad.write_text('name = "x"\nsource = "y"\nfriction = 0.5\nrestitution = 1.4\n')
    result = run("surface", "--preset", str(bad))
    assert result.exit_code == 2
    assert "wet.toml" in result.output and "restitution" in result.output
    bad.write_text('name = "x"\nsource = "y"\nfriction = 0.5\nrestitutoin = 0.8\n')
    assert "restitutoin" in run("surface", "--preset", str(bad)).output
    bad.write_text('name = "x\n')
    assert "TOML syntax" in run("surface", "--preset", str(bad)).output


def test_aim_feed_reports_the_height_and_outcome_it_achieved():
    args = ["aim", "feed", "--at", "11,0", "--target", "-9,2", "--spin", "1500", "--height", "1.2"]
    text = run(*args).output
    assert "1.20 m at the player's contact plane (after the bounce)" in text
    assert "cm from target), in" in text
    data = run_json(*args)
    assert data["outcome"] == "in" and data["player_before_bounce"] is False


def test_template_writes_a_commented_pattern_file_that_plays(tmp_path):
    target = tmp_path / "my_match.toml"
    out = run("template", str(target))
    assert out.exit_code == 0, out.output
    text = target.read_text()
    assert text.startswith("# A rally pattern pair to start from")
    assert f"rallyarc rally {target}" in text
    played = run("rally", str(target), "--rallies", "4", "--max-shots", "6", "--quiet", "--json")
    assert played.exit_code == 0, played.output
    assert json.loads(played.output)["rallies"] == 4
    again = run("template", str(target))
    assert again.exit_code == 2 and "--force" in again.output
    scenario = tmp_path / "my_scenario.toml"
    assert run("template", str(scenario), "--kind", "scenario").exit_code == 0
    assert run("compare", str(scenario), "--json").exit_code == 0
