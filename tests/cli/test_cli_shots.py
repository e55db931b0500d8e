"""The shot, compare and presets commands: JSON shapes, written files, and one-line errors."""

import dataclasses
import json
import subprocess
import sys

import pandas as pd
import pytest
from click.testing import CliRunner

from rallyarc.cli import main

BALL = """name = "test ball"
source = "test"
mass_kg = 0.0577
diameter_m = 0.067
alpha = 0.55
rebound_cm = 141.0
rebound_min_cm = 135.0
rebound_max_cm = 147.0
restitution = 0.773
aero_model = "stepanek1988"
"""
SURFACE = 'name = "s"\nsource = "test"\nfriction = 0.6\nrestitution = 0.8\n'


def run(*args):
    return CliRunner().invoke(main, [str(a) for a in args])


def test_shot_json_has_the_feed_shape_plus_impact_and_bounce():
    result = run("shot", "--stroke", "topspin_drive", "--json")
    assert result.exit_code == 0, result.output
    data = json.loads(result.output)
    assert {"inputs", "net_crossing", "landing", "impact", "bounce", "receiver", "outcome"} <= set(
        data
    )
    assert data["outcome"] in {"in", "out", "net", "long", "wide"}
    assert {"clearance_m", "height_m", "y_m", "t_s"} <= set(data["net_crossing"])
    assert {"x_m", "y_m", "depth_m", "side_margin_m"} <= set(data["landing"])
    assert {"speed_mps", "launch_deg", "topspin_rpm", "slip_ratio", "spin_limit_reached"} <= set(
        data["impact"]
    )
    assert {"apex_m", "regime", "speed_in_mps", "angle_out_deg", "t_s"} <= set(data["bounce"])
    assert {"height_m", "t_s"} <= set(data["receiver"])


def test_shot_overrides_change_the_swing():
    slow = json.loads(run("shot", "--head-speed", "60km/h", "--json").output)
    fast = json.loads(run("shot", "--head-speed", "90km/h", "--json").output)
    assert fast["impact"]["speed_mps"] > slow["impact"]["speed_mps"]
    assert slow["inputs"]["head_speed_mps"] == pytest.approx(60 / 3.6)


def test_shot_csv_is_written_and_not_overwritten_without_force(tmp_path):
    out = tmp_path / "traj.csv"
    assert run("shot", "--csv", out).exit_code == 0
    table = pd.read_csv(out)
    assert {"t_s", "x_m", "y_m", "z_m", "vx_mps", "spin_rpm", "phase"} <= set(table.columns)
    before = out.read_bytes()
    again = run("shot", "--stroke", "slice", "--csv", out)
    assert again.exit_code == 2 and "--force" in again.output
    assert out.read_bytes() == before
    assert run("shot", "--stroke", "slice", "--csv", out, "--force").exit_code == 0
    assert out.read_bytes() != before


def test_compare_prints_every_variant_and_writes_its_files(tmp_path):
    result = run("compare")
    assert result.exit_code == 0, result.output
    for name in ("flat_drive", "topspin_drive", "heavy_topspin", "slice", "lob", "drop_shot"):
        assert name in result.output
    out = tmp_path / "demo"
    assert run("compare", "--out", out).exit_code == 0
    shots = pd.read_csv(out / "shots.csv")
    assert len(shots) == 6
    records = json.loads((out / "shots.json").read_text())
    assert [r["inputs"]["label"] for r in records] == list(shots["label"])
    traj = pd.read_parquet(out / "trajectories.parquet")
    csv = pd.read_csv(out / "trajectories.csv")
    assert len(traj) == len(csv) and traj["z_m"].to_numpy() == pytest.approx(csv["z_m"])
    for figure in ("side_view.png", "top_view.png", "scene.png"):
        assert (out / figure).stat().st_size > 10_000, figure
    second = run("compare", "--out", out)
    assert second.exit_code == 2 and "exists" in second.output


def test_compare_serve_scenario_judges_the_service_box():
    data = json.loads(run("compare", "serve_demo", "--json").output)
    for shot in data["shots"]:
        assert shot["landing"]["service_box"] == "deuce"
        assert shot["outcome"] == "in"


def test_presets_list_every_kind_with_sources():
    result = run("presets")
    assert result.exit_code == 0
    from rallyarc import config

    assert set(config.SCHEMAS) == {"balls", "surfaces", "rackets", "air", "strokes", "scenarios",
                                   "machines", "drills", "patterns", "studies"}  # fmt: skip
    for kind in config.SCHEMAS:  # every kind of preset the program reads is listed
        assert f"{kind}:" in result.output
    data = json.loads(run("presets", "rackets", "--json").output)
    assert set(data["rackets"]) == {"light", "standard", "heavy"}
    assert all(item["source"] for item in data["rackets"].values())


def _bad(tmp_path, name, text):
    path = tmp_path / name
    path.write_text(text)
    return path


@pytest.mark.parametrize(
    "kind,option,text,expected",
    [
        ("ball", "--ball", BALL.replace("mass_kg", "mass_kgg"), "mass_kgg"),  # typo in a key
        ("ball", "--ball", BALL.replace("mass_kg = 0.0577", "mass_g = 57.7"), "mass_g"),  # unit
        ("ball", "--ball", BALL.replace("0.0577", "-0.0577"), "mass_kg"),  # negative mass
        ("surface", "--surface", SURFACE.replace("0.6", "2.5"), "friction"),  # friction > 2
        ("surface", "--surface", SURFACE.replace("0.8", "1.2"), "restitution"),  # e > 1
        ("surface", "--surface", 'name = "s\n', "TOML syntax"),  # syntax error
        ("racket", "--racket", 'name = "r"\n', "missing key"),
    ],
)
def test_invalid_configs_give_one_named_line_and_exit_2(tmp_path, kind, option, text, expected):
    path = _bad(tmp_path, f"bad_{kind}.toml", text)
    result = run("shot", option, path)
    assert result.exit_code == 2
    lines = result.output.strip().splitlines()
    assert len(lines) == 1, result.output
    assert str(path) in lines[0] and expected in lines[0]
    assert "Traceback" not in result.output


def test_missing_file_and_unknown_preset(tmp_path):
    missing = run("shot", "--ball", tmp_path / "nope.toml")
    assert missing.exit_code == 2 and "no such file" in missing.output
    unknown = run("compare", "no_such_scenario")
    assert unknown.exit_code == 2 and "demo" in unknown.output  # lists the valid names


def test_allowed_range_is_named():
    result = run("shot", "--receiver-plane", "20")
    assert result.exit_code == 2 and "0 to 10" in result.output
    kinds = run("presets", "nonsense")
    assert kinds.exit_code == 2 and "choose one of balls, surfaces" in kinds.output


def test_real_process_prints_one_line_on_stderr(tmp_path):
    path = _bad(tmp_path, "bad.toml", SURFACE.replace("0.8", "1.2"))
    proc = subprocess.run(
        [sys.executable, "-P", "-m", "rallyarc.cli", "shot", "--surface", str(path)],
        capture_output=True,
        text=True,
    )
    assert proc.returncode == 2
    assert proc.stdout == ""
    assert proc.stderr.count("\n") == 1 and "restitution" in proc.stderr
    assert "0 to 1" in proc.stderr


def test_rigid_ball_flag_changes_only_the_bounce():
    # The default bounce is the compressing ball's; --rigid-ball swaps it for the rigid ball's.
    # Impact and first flight are the same, and the sliding flat serve picks up more spin at the
    # bounce on the rigid ball (friction at the full radius). --deforming-ball names the default.
    soft = json.loads(run("compare", "serve_demo", "--json").output)["shots"]
    rigid_run = run("compare", "serve_demo", "--rigid-ball", "--json")
    assert rigid_run.exit_code == 0, rigid_run.output
    rigid = json.loads(rigid_run.output)["shots"]
    named = json.loads(run("compare", "serve_demo", "--deforming-ball", "--json").output)
    assert named["shots"] == soft
    for a, b in zip(soft, rigid, strict=True):
        assert a["impact"] == b["impact"] and a["landing"] == b["landing"]
    assert {s["inputs"]["bounce_model"] for s in soft} == {"deforming ball"}
    assert {s["inputs"]["bounce_model"] for s in rigid} == {"rigid ball"}
    flat_soft = next(s for s in soft if s["inputs"]["label"] == "flat_serve")
    flat_rigid = next(s for s in rigid if s["inputs"]["label"] == "flat_serve")
    assert flat_soft["bounce"]["spin_out_rpm"] < flat_rigid["bounce"]["spin_out_rpm"] - 500.0
    table = run("shot", "--stroke", "kick_serve", "--scenario", "serve_demo", "--rigid-ball")
    assert table.exit_code == 0 and "rigid ball at the bounce" in table.output
    assert "rigid ball" not in run("compare", "serve_demo").output


def test_figure_and_page_commands_take_the_physics_modes(tmp_path):
    # every command that plays a scenario takes --friction-only and --rigid-ball, and names the
    # modes that are on where it names the conditions
    from rallyarc import domain
    from rallyarc.shot import play
    from rallyarc.viz.side import _side_title

    modes = ["--friction-only", "--rigid-ball"]
    for args in (
        ["plot", "side", "serve_demo", "--out", tmp_path / "side.png"],
        ["plot", "top", "--out", tmp_path / "top.png"],
        ["plot", "sweep", "--steps", "3", "--out", tmp_path / "sweep.png"],
        ["plot", "window", "--steps", "3", "--out", tmp_path / "window.png"],
        ["aim", "stroke", "--target", "10,2"],
    ):
        result = run(*args, *modes)
        assert result.exit_code == 0, (args, result.output)
    page = tmp_path / "page.html"
    assert run("report", "--no-studies", "-o", page, *modes).exit_code == 0
    text = page.read_text(encoding="utf-8")
    assert "rigid ball" in text and "friction alone" in text
    sc = domain.load_scenario("serve_demo")
    plain = play(sc.strokes, sc.conditions, None, record=False)
    assert "rigid ball" not in _side_title(plain)
    rigid = dataclasses.replace(sc.conditions, deforming_ball=False, friction_only=True)
    title = _side_title(play(sc.strokes, rigid, None, record=False))
    assert "friction alone at the racket; rigid ball at the bounce" in title
