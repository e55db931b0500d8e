"""The schemas of every config kind: the keys each TOML file may give, with their unit in the
name, type, range and whether they must be given; and the bounds of reach they are checked
against."""

from __future__ import annotations

from dataclasses import dataclass

from rallyarc.flight.aero import AERO_MODELS


@dataclass(frozen=True)
class Key:
    """One allowed key: its type, range and whether it must be given.

    ``kind`` is ``float``, ``int``, ``str`` or ``bool``; ``"vector"`` for a list of three numbers
    each within ``[low, high]``; ``"names"`` for a non-empty list of strings; ``"table"`` for a
    TOML table checked against the schema in ``table``.
    """

    kind: object
    low: float | None = None
    high: float | None = None
    required: bool = True
    choices: tuple = ()
    table: dict | None = None
    length: int = 3

    def describe(self):
        if self.choices:
            return "one of " + ", ".join(self.choices)
        if self.kind is str:
            return "a string"
        if self.kind is bool:
            return "true or false"
        if self.kind == "vector":
            return f"a list of {self.length} numbers, each from {self.low:g} to {self.high:g}"
        if self.kind == "names":
            return "a non-empty list of names"
        if self.kind == "table":
            return "a table with keys " + ", ".join(self.table)
        if self.kind == "tables":
            return "a non-empty array of tables with keys " + ", ".join(self.table)
        if self.kind is int:
            return f"a whole number from {self.low:g} to {self.high:g}"
        return f"a number from {self.low:g} to {self.high:g}"


#: Highest ball centre a player meets with the racket [m]. A tall player (2.1 m) reaches about
#: 1.33 times body height with the arm up (2.8 m); the racket adds about 0.55 m to the middle of
#: the strings and a serve's jump about 0.4 m: about 3.75 m, rounded up to 4 m (common practice;
#: no published bound).
HIGHEST_CONTACT_M = 4.0
#: Contacts above this only tall players reach, jumping; the command line warns [m].
UNUSUAL_CONTACT_M = 3.0
#: The smallest ball radius a ball file may give (half the least ``diameter_m``) [m]: a ball
#: centre below it is under the court whatever the ball.
SMALLEST_RADIUS_M = 0.02


def reach_m(height_m):
    """Highest contact [m] a player ``height_m`` tall reaches: 1.33 x height with the arm up,
    0.55 m of racket and a 0.4 m jump (common practice, as :data:`HIGHEST_CONTACT_M`)."""
    return 1.33 * height_m + 0.95


#: Aerodynamic model names a ball preset may give: the keys of the model registry.
AERO_CHOICES = tuple(AERO_MODELS)

_TOSS = {
    "contact_m": Key("vector", -15.0, 15.0),
    "apex_above_contact_m": Key(float, 0.0, 3.0),
    "spin_rpm": Key(float, -1000.0, 1000.0, required=False),
}

_INCOMING = {
    "position_m": Key("vector", -20.0, 20.0),
    "speed_kmh": Key(float, 0.0, 250.0),
    "descent_deg": Key(float, -80.0, 89.0),
    "azimuth_deg": Key(float, 90.0, 270.0, required=False),
    "spin_rpm": Key(float, -6000.0, 6000.0, required=False),
    "sidespin_rpm": Key(float, -6000.0, 6000.0, required=False),
}

#: Where a scenario's stroke is sent: ``[[directions]]`` turns a stroke's swing (the face turns
#: with it) to a direction [deg] from straight down the court (+ toward +y, the hitter's left),
#: and names it as coaches do.
DIRECTION_WORDS = ("crosscourt", "down the line", "down the middle", "inside-out", "inside-in")
_DIRECTION = {
    "stroke": Key(str),
    "where": Key(str, choices=DIRECTION_WORDS),
    "swing_direction_deg": Key(float, -45.0, 45.0),
}

_DRILL_BALL = {
    "label": Key(str),
    "target_m": Key("vector", -15.0, 15.0, length=2),
    "spin_rpm": Key(float, -5000.0, 5000.0),
    "speed_kmh": Key(float, 5.0, 200.0, required=False),
    "height_at_player_m": Key(float, 0.1, 4.0, required=False),
    "repeat": Key(int, 1, 50, required=False),
}

#: A rally pattern's shot or serve may override its stroke's head speed and swing path.
_SWING_OVERRIDES = {
    "head_speed_kmh": Key(float, 5.0, 250.0, required=False),
    "swing_path_deg": Key(float, -60.0, 80.0, required=False),
}

#: An observed statistic: a count of a total (observed-statistics files).
_COUNT = {"count": Key(int, 0, 10**7), "of": Key(int, 1, 10**7)}

SCHEMAS = {
    "surfaces": {
        "name": Key(str),
        "source": Key(str),
        "friction": Key(float, 0.0, 2.0),
        "restitution": Key(float, 0.0, 1.0),
        "restitution_slope_s_per_m": Key(float, -0.2, 0.2, required=False),
        "tangential_restitution": Key(float, 0.0, 1.0, required=False),
        "pace_category": Key(int, 1, 5, required=False),
    },
    "balls": {
        "name": Key(str),
        "source": Key(str),
        "mass_kg": Key(float, 0.01, 0.2),
        "diameter_m": Key(float, 0.04, 0.12),
        "alpha": Key(float, 0.3, 2.0 / 3.0),
        "rebound_cm": Key(float, 50.0, 254.0),
        "rebound_min_cm": Key(float, 50.0, 254.0),
        "rebound_max_cm": Key(float, 50.0, 254.0),
        "restitution": Key(float, 0.3, 1.0),
        "aero_model": Key(str, choices=AERO_CHOICES),
    },
    "rackets": {
        "name": Key(str),
        "source": Key(str),
        "length_m": Key(float, 0.45, 0.737),
        "mass_kg": Key(float, 0.15, 0.5),
        "balance_m": Key(float, 0.15, 0.45),
        "swingweight_kgm2": Key(float, 0.01, 0.06),
        "twistweight_kgm2": Key(float, 0.0005, 0.004, required=False),
        "string_restitution": Key(float, 0.0, 1.0),
        "string_friction": Key(float, 0.0, 2.0),
        "string_tangential_restitution": Key(float, 0.0, 1.0, required=False),
        "string_restitution_slope_s_per_m": Key(float, -0.05, 0.05, required=False),
    },
    "air": {
        "name": Key(str),
        "source": Key(str),
        "altitude_m": Key(float, -500.0, 5000.0),
        "temperature_c": Key(float, -20.0, 50.0),
        "relative_humidity": Key(float, 0.0, 1.0),
        "pressure_pa": Key(float, 50000.0, 110000.0, required=False),
        "wind_mps": Key("vector", -30.0, 30.0, required=False),
    },
    "strokes": {
        "name": Key(str),
        "source": Key(str),
        "kind": Key(str, choices=("groundstroke", "serve")),
        "head_speed_kmh": Key(float, 5.0, 250.0),
        "swing_path_deg": Key(float, -60.0, 80.0),
        "swing_direction_deg": Key(float, -60.0, 60.0, required=False),
        "face_tilt_deg": Key(float, -60.0, 60.0),
        "face_azimuth_deg": Key(float, -60.0, 60.0, required=False),
        "racket_roll_deg": Key(float, -180.0, 180.0, required=False),
        "impact_from_butt_m": Key(float, 0.3, 0.7, required=False),
        "impact_offaxis_m": Key(float, -0.12, 0.12, required=False),
        "toss": Key("table", table=_TOSS, required=False),
    },
    "machines": {
        "name": Key(str),
        "source": Key(str),
        "speed_min_kmh": Key(float, 5.0, 250.0),
        "speed_max_kmh": Key(float, 5.0, 250.0),
        "spin_max_rpm": Key(float, 0.0, 8000.0),
        "elevation_min_deg": Key(float, -30.0, 60.0),
        "elevation_max_deg": Key(float, -30.0, 80.0),
        "azimuth_max_deg": Key(float, 0.0, 60.0),
        "release_height_m": Key(float, 0.2, 3.0),
    },
    "drills": {
        "name": Key(str),
        "source": Key(str),
        "description": Key(str),
        "coach": Key(str),
        "club": Key(str),
        "machine": Key(str),
        "machine_position_m": Key("vector", -20.0, 20.0, length=2),
        "ball": Key(str),
        "air": Key(str),
        "surface": Key(str),
        "player_plane_m": Key(float, 0.0, 10.0, required=False),
        "balls": Key("tables", table=_DRILL_BALL),
    },
    "scenarios": {
        "name": Key(str),
        "source": Key(str),
        "description": Key(str),
        "player": Key(str),
        "club": Key(str),
        "ball": Key(str),
        "racket": Key(str),
        "air": Key(str),
        "surface": Key(str),
        "singles": Key(bool, required=False),
        "receiver_plane_m": Key(float, 0.0, 10.0, required=False),
        "strokes": Key("names"),
        "incoming": Key("table", table=_INCOMING, required=False),
        "directions": Key("tables", table=_DIRECTION, required=False),
    },
    # studies (rallyarc.study): a base stroke or pattern pair and parameters over ranges; names
    # and ranges of the parameters are checked against the study kind in rallyarc.study.spec
    "studies": {
        "name": Key(str),
        "source": Key(str),
        "description": Key(str),
        "kind": Key(str, choices=("shots", "rallies")),
        "scenario": Key(str, required=False),
        "stroke": Key(str, required=False),
        "patterns": Key(str, required=False),
        "design": Key(str, choices=("grid", "random", "latin")),
        "samples": Key(int, 1, 1e9, required=False),
        "rallies": Key(int, 1, 1e7, required=False),
        "max_shots": Key(int, 1, 200, required=False),
        "seed": Key(int, 0, 2**63 - 1),
        "chunk": Key(int, 1, 1e6, required=False),
        "scheduler": Key(str, required=False),
        # physics modes of every point (rallyarc.domain.Conditions): friction alone at the
        # racket, and the court bounce of a compressing (default) or rigid ball
        "friction_only": Key(bool, required=False),
        "deforming_ball": Key(bool, required=False),
        "parameters": Key(
            "tables",
            table={
                "name": Key(str),
                "low": Key(float, -1e4, 1e4),
                "high": Key(float, -1e4, 1e4),
                "steps": Key(int, 1, 10000, required=False),
                "distribution": Key(str, choices=("uniform", "normal"), required=False),
            },
        ),
    },
    # rally patterns (rallyarc.rally): two players, each with serves, a repertoire of shots and
    # execution scatter; targets are in the hitter's own frame (hitting toward +x)
    "patterns": {
        "name": Key(str),
        "source": Key(str),
        "description": Key(str),
        "club": Key(str),
        "ball": Key(str),
        "air": Key(str),
        "surface": Key(str),
        "server": Key(str, choices=("near", "far", "alternate"), required=False),
        "max_shots": Key(int, 1, 200, required=False),
        **{
            end: Key(
                "table",
                table={
                    "name": Key(str),
                    "source": Key(str),
                    "handedness": Key(str, choices=("right", "left")),
                    "racket": Key(str),
                    "height_m": Key(float, 1.0, 2.3),
                    "shoulder_height_m": Key(float, 0.8, 2.0, required=False),
                    "home_behind_baseline_m": Key(float, -2.0, 6.0),
                    "home_y_m": Key(float, -4.0, 4.0, required=False),
                    "deepest_behind_baseline_m": Key(float, -2.0, 8.0),
                    "reach_m": Key(float, 0.3, 3.0),
                    "run_speed_mps": Key(float, 0.0, 10.0),
                    "reaction_s": Key(float, 0.0, 1.5, required=False),
                    "contact_height_m": Key("vector", 0.1, 3.5, length=2),
                    "lowest_contact_m": Key(float, 0.05, 1.5, required=False),
                    "highest_contact_m": Key(float, 0.5, 3.5),
                    "timing": Key(str, choices=("rise", "apex", "drop")),
                    "scatter": Key(
                        "table",
                        table={
                            "head_speed_kmh": Key(float, 0.0, 40.0),
                            "face_tilt_deg": Key(float, 0.0, 15.0),
                            "swing_path_deg": Key(float, 0.0, 20.0),
                            "aim_m": Key(float, 0.0, 5.0),
                            "outside_range_per_m": Key(float, 0.0, 20.0, required=False),
                        },
                    ),
                    "serves": Key(
                        "tables",
                        table={
                            "label": Key(str),
                            "stroke": Key(str),
                            "serve": Key(str, choices=("first", "second")),
                            "probability": Key(float, 0.0, 1.0),
                            "target_x_m": Key("vector", 0.5, 6.4, length=2),
                            "target_y_m": Key("vector", 0.0, 4.115, length=2),
                            **_SWING_OVERRIDES,
                        },
                    ),
                    "shots": Key(
                        "tables",
                        table={
                            "label": Key(str),
                            "stroke": Key(str),
                            "probability": Key(float, 0.0, 1.0),
                            "target_x_m": Key("vector", 0.5, 11.885, length=2),
                            "target_y_m": Key("vector", -5.5, 5.5, length=2),
                            "direction": Key(
                                str,
                                choices=("fixed", "crosscourt", "line", "backhand", "forehand"),
                                required=False,
                            ),
                            "aim": Key(str, choices=("tilt", "speed"), required=False),
                            "clearance_m": Key(float, 0.0, 5.0, required=False),
                            "when_height_above_m": Key(float, 0.0, 4.0, required=False),
                            "when_height_below_m": Key(float, 0.0, 4.0, required=False),
                            "when_side": Key(str, choices=("forehand", "backhand"), required=False),
                            "when_incoming_topspin_above_rpm": Key(
                                float, -8000.0, 8000.0, required=False
                            ),
                            **_SWING_OVERRIDES,
                        },
                    ),
                },
            )
            for end in ("near", "far")
        },
    },
}


#: Observed statistics of one player of a pattern file (rallyarc.rally.fit): counts an
#: analyst charted, each a count of a total. Read from a path only (no presets).
OBSERVED = {
    "name": Key(str),
    "source": Key(str),
    "player": Key(str, choices=("near", "far")),
    "statistics": Key(
        "table",
        required=False,
        table={
            k: Key("table", required=False, table=_COUNT)
            for k in (
                "first_serve_in",
                "second_serve_in",
                "double_faults_per_service_point",
                "aces_per_service_point",
                "rally_ball_errors",
                "deep_landing",
                "short_landing",
            )
        },
    ),
    "shot_types": Key("tables", required=False, table={"shot_type": Key(str), **_COUNT}),
}
