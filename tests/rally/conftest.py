"""Shared pieces of the rally tests: a pattern pair written from a template, and every row of
a shot table replayed through the single-shot chain alone."""

import pytest

from rallyarc.rally import incoming_of, swing_of
from rallyarc.shot import simulate

PLAYER = """
[{end}]
name = "{name}"
source = "test player"
handedness = "{hand}"
racket = "standard"
height_m = 1.80
home_behind_baseline_m = 1.0
deepest_behind_baseline_m = 3.0
reach_m = 1.6
run_speed_mps = 4.5
contact_height_m = [0.8, 1.3]
highest_contact_m = 2.3
timing = "{timing}"

[{end}.scatter]
head_speed_kmh = {sd_speed}
face_tilt_deg = {sd_tilt}
swing_path_deg = {sd_path}
aim_m = {sd_aim}

[[{end}.serves]]
label = "kick serve"
stroke = "kick_serve"
serve = "first"
probability = 1.0
target_x_m = [{sx0}, {sx1}]
target_y_m = [{sy0}, {sy1}]

[[{end}.shots]]
label = "topspin crosscourt"
stroke = "topspin_drive"
probability = 1.0
target_x_m = [{gx0}, {gx1}]
target_y_m = [{gy0}, {gy1}]
direction = "crosscourt"
"""

HEAD = """
name = "test pair"
source = "test"
description = "two test players"
club = "test club"
ball = "itf_type2"
air = "sea_level"
surface = "hard_medium"
server = "{server}"
max_shots = {max_shots}
"""


def _pattern_text(
    scatter=(0.0, 0.0, 0.0, 0.0),
    zone=False,
    server="alternate",
    max_shots=8,
    extra_far="",
):
    sd = dict(zip(("sd_speed", "sd_tilt", "sd_path", "sd_aim"), scatter, strict=True))
    if zone:
        targets = {"sx0": 4.8, "sx1": 5.8, "sy0": 1.0, "sy1": 3.0}
        targets |= {"gx0": 8.0, "gx1": 10.0, "gy0": 1.0, "gy1": 2.5}
    else:
        targets = {"sx0": 5.4, "sx1": 5.4, "sy0": 2.0, "sy1": 2.0}
        targets |= {"gx0": 9.0, "gx1": 9.0, "gy0": 1.5, "gy1": 1.5}
    near = PLAYER.format(end="near", name="Ada Test", hand="right", timing="drop", **sd, **targets)
    far = PLAYER.format(end="far", name="Bo Test", hand="left", timing="rise", **sd, **targets)
    return HEAD.format(server=server, max_shots=max_shots) + near + far + extra_far


@pytest.fixture()
def pattern_text():
    """The template pattern pair as TOML text (see ``_pattern_text`` for the options)."""
    return _pattern_text


@pytest.fixture()
def write_patterns(tmp_path):
    def write(text, name="pair.toml"):
        path = tmp_path / name
        path.write_text(text, encoding="utf-8")
        return str(path)

    return write


@pytest.fixture()
def replay():
    def _replay(run):
        """Every row of the shot table played again through the single-shot chain, alone."""
        shots = run.shots
        out = {}
        for player in run.patterns.players:
            rows = shots[shots["player"] == player.name]
            res = simulate(
                incoming_of(rows),
                swing_of(rows),
                player.conditions,
                labels=rows["shot_type"].to_numpy(),
                serve=(rows["serve"] != "").to_numpy(),
            )
            out[player.name] = (rows.index.to_numpy(), res)
        return out

    return _replay
