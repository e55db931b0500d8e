"""Reading and checking config files: presets by name or TOML files by path, decoded as UTF-8,
validated against :mod:`rallyarc.config.schemas`, with one-line errors naming the file, the
key and the allowed range."""

from __future__ import annotations

import difflib
import math
import tomllib
from importlib import resources
from pathlib import Path

from rallyarc.config.schemas import (
    HIGHEST_CONTACT_M,
    OBSERVED,
    SCHEMAS,
    SMALLEST_RADIUS_M,
    reach_m,
)
from rallyarc.errors import InputError


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
