"""Presets and user configs in TOML: loading by name or path, with strict validation.

Every key carries its unit (``mass_kg``, ``diameter_m``); unknown keys, missing keys and values out
of range are :class:`InputError` messages naming the file, the key and the allowed range.
"""

from __future__ import annotations

import difflib
import math
import tomllib
from dataclasses import dataclass
from importlib import resources
from pathlib import Path

from rallyarc.errors import InputError
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


def _package_dir(kind):
    return resources.files("rallyarc.configs") / kind


def preset_names(kind):
    """Names of the built-in presets of one kind, sorted."""
    folder = _package_dir(kind)
    return sorted(p.name[:-5] for p in folder.iterdir() if p.name.endswith(".toml"))


def _read(kind, name_or_path):
    text_path = str(name_or_path)
    if text_path.endswith(".toml") or "/" in text_path:
        return str(text_path), decode(Path(text_path))
    names = preset_names(kind)
    if text_path not in names:
        singular = {"air": "air", "studies": "study"}.get(kind, kind[:-1])
        raise InputError(f"unknown {singular} preset {text_path!r}; " + _choices(text_path, names))
    item = _package_dir(kind) / f"{text_path}.toml"
    return f"configs/{kind}/{text_path}.toml", item.read_text(encoding="utf-8")


def decode(path):
    """The text of a config file: UTF-8, with or without a byte-order mark. A missing or
    unreadable file, a folder, or bytes that are not UTF-8 text are one line naming the file."""
    path = Path(path)
    if path.is_dir():
        raise InputError(f"{path}: is a folder, not a TOML file")
    if not path.is_file():
        raise InputError(f"{path}: no such file")
    try:
        data = path.read_bytes()
    except OSError as exc:
        raise InputError(f"{path}: cannot read the file: {exc.strerror}") from None
    try:
        text = data.decode("utf-8-sig")
    except UnicodeDecodeError as exc:
        raise InputError(
            f"{path}: not UTF-8 text (byte 0x{data[exc.start]:02x} at offset {exc.start}); "
            "save the file as UTF-8"
        ) from None
    if "\x00" in text:
        raise InputError(f"{path}: a binary file, not TOML text (it holds NUL bytes)")
    return text


def _choices(name, names):
    """``choose one of ...``, led by the names closest to ``name``."""
    close = difflib.get_close_matches(name, names, n=3, cutoff=0.6)
    hint = f"did you mean {', '.join(close)}? " if close else ""
    return hint + "choose one of " + ", ".join(names)


def _number(value, spec, label):
    if isinstance(value, bool) or not isinstance(value, int | float):
        raise InputError(f"{label} must be {spec.describe()}, got {value!r}")
    if not math.isfinite(value) or (spec.kind is int and value != int(value)):
        raise InputError(f"{label} must be {spec.describe()}, got {value!r}")
    if not spec.low <= value <= spec.high:
        raise InputError(f"{label} must be {spec.describe()}, got {value!r}")
    return int(value) if spec.kind is int else float(value)


def _check(schema, data, where, prefix=""):
    for key in data:
        if key not in schema:
            raise InputError(
                f"{where}: unknown key {prefix + key!r}; allowed keys: "
                + ", ".join(prefix + k for k in schema)
            )
    out = {}
    for key, spec in schema.items():
        label = f"{where}: key {prefix + key!r}"
        if key not in data:
            if spec.required:
                raise InputError(f"{where}: missing key {prefix + key!r} ({spec.describe()})")
            continue
        value = data[key]
        if spec.kind is str:
            if not isinstance(value, str) or (spec.choices and value not in spec.choices):
                raise InputError(f"{label} must be {spec.describe()}, got {value!r}")
        elif spec.kind is bool:
            if not isinstance(value, bool):
                raise InputError(f"{label} must be {spec.describe()}, got {value!r}")
        elif spec.kind == "vector":
            if not isinstance(value, list) or len(value) != spec.length:
                raise InputError(f"{label} must be {spec.describe()}, got {value!r}")
            value = [_number(v, spec, label) for v in value]
        elif spec.kind == "names":
            if not (value and isinstance(value, list) and all(isinstance(v, str) for v in value)):
                raise InputError(f"{label} must be {spec.describe()}, got {value!r}")
        elif spec.kind == "table":
            if not isinstance(value, dict):
                raise InputError(f"{label} must be {spec.describe()}, got {value!r}")
            value = _check(spec.table, value, where, prefix + key + ".")
        elif spec.kind == "tables":
            if not (value and isinstance(value, list) and all(isinstance(v, dict) for v in value)):
                raise InputError(f"{label} must be {spec.describe()}, got {value!r}")
            value = [
                _check(spec.table, v, where, f"{prefix}{key}[{i + 1}].")
                for i, v in enumerate(value)
            ]
        else:
            value = _number(value, spec, label)
        out[key] = value
    return out


def validate(kind, data, where):
    """Check ``data`` against the schema of ``kind``; return it with numbers as floats."""
    out = _check(SCHEMAS[kind], data, where)
    if kind == "balls":
        low, high = out["rebound_min_cm"], out["rebound_max_cm"]
        if not low <= out["rebound_cm"] <= high:
            raise InputError(
                f"{where}: key 'rebound_cm' must lie from rebound_min_cm {low:g} "
                f"to rebound_max_cm {high:g}, got {out['rebound_cm']:g}"
            )
    if kind == "machines":
        for low, high in (
            ("speed_min_kmh", "speed_max_kmh"),
            ("elevation_min_deg", "elevation_max_deg"),
        ):
            if out[low] > out[high]:
                raise InputError(f"{where}: key {low!r} must not exceed {high!r}")
    if kind == "drills":
        for i, ball in enumerate(out["balls"]):
            if ("speed_kmh" in ball) == ("height_at_player_m" in ball):
                raise InputError(
                    f"{where}: balls[{i + 1}]: give exactly one of 'speed_kmh' and "
                    "'height_at_player_m'"
                )
    if kind == "rackets" and out["balance_m"] >= out["length_m"]:
        raise InputError(f"{where}: key 'balance_m' must be less than length_m")
    _cross_check(kind, out, where)
    out["where"] = where
    return out


def _cross_check(kind, out, where):
    """Keys that are each in range but must fit together: a racket's mass, balance and
    swingweight; contact heights within reach; a toss or incoming ball above the court."""
    if kind == "rackets":
        _racket_inertia(out, where)
    if kind == "strokes" and "toss" in out:
        _height(out["toss"]["contact_m"][2], "toss.contact_m", where)
    if kind == "scenarios" and "incoming" in out:
        _height(out["incoming"]["position_m"][2], "incoming.position_m", where)
    if kind == "patterns":
        for end in ("near", "far"):
            p = out[end]
            if p["highest_contact_m"] > reach_m(p["height_m"]):
                raise InputError(
                    f"{where}: keys '{end}.highest_contact_m' and '{end}.height_m' do not fit: a "
                    f"player {p['height_m']:g} m tall reaches at most "
                    f"{reach_m(p['height_m']):.2f} m (1.33 x height + 0.95 m), got "
                    f"{p['highest_contact_m']:g} m"
                )


def _racket_inertia(out, where):
    """The swingweight (about an axis 0.10 m from the butt) must exceed what the mass alone
    gives at the balance point, mass x (balance - 0.10)^2, or the racket's moment of inertia
    about its centre of mass would not be positive."""
    m, b, sw = out["mass_kg"], out["balance_m"], out["swingweight_kgm2"]
    least = m * (b - 0.10) ** 2
    if sw > least:
        return
    half = math.sqrt(sw / m)
    raise InputError(
        f"{where}: keys 'swingweight_kgm2', 'mass_kg' and 'balance_m' do not fit: with mass "
        f"{m:g} kg and balance {b:g} m the swingweight must exceed {least:.4g} kg m^2 "
        f"(mass x (balance - 0.10)^2), got {sw:g}; or give balance_m from "
        f"{max(0.10 - half, 0.0):.3f} to {0.10 + half:.3f} m, or mass_kg below "
        f"{sw / (b - 0.10) ** 2:.3g} kg"
    )


def _height(z, key, where):
    """A ball centre's height: above the court and within a player's reach."""
    if not SMALLEST_RADIUS_M <= z <= HIGHEST_CONTACT_M:
        raise InputError(
            f"{where}: key {key!r}: the height Z must be from {SMALLEST_RADIUS_M:g} m (the ball "
            f"on the court) to {HIGHEST_CONTACT_M:g} m (the highest a player reaches), got {z:g}"
        )


def referenced(data, key, loader, where=None, name=None):
    """The preset that a loaded config names under ``key``, loaded with ``loader``; an error
    names this file (``where``, default the config's own) and the key (``name``, default
    ``key``)."""
    try:
        return loader(data[key])
    except InputError as exc:
        raise InputError(f"{where or data['where']}: key {name or key!r}: {exc}") from None


def load_observed(path):
    """An observed-statistics file (a TOML path) checked against :data:`OBSERVED`."""
    where = str(path)
    try:
        data = tomllib.loads(decode(Path(where)))
    except tomllib.TOMLDecodeError as exc:
        raise InputError(f"{where}: TOML syntax error: {exc}") from None
    out = _check(OBSERVED, data, where)
    out["where"] = where
    return out


def load(kind, name_or_path):
    """Load and validate a preset by name (``"clay"``) or a TOML file by path."""
    if kind not in SCHEMAS:
        raise InputError(f"unknown config kind {kind!r}; choose one of " + ", ".join(SCHEMAS))
    where, text = _read(kind, name_or_path)
    try:
        data = tomllib.loads(text)
    except tomllib.TOMLDecodeError as exc:
        raise InputError(f"{where}: TOML syntax error: {exc}") from None
    return validate(kind, data, where)
