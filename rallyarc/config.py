"""Presets and user configs in TOML: loading by name or path, with strict validation.

Every key carries its unit (``mass_kg``, ``diameter_m``); unknown keys, missing keys and values out
of range are :class:`InputError` messages naming the file, the key and the allowed range.
"""

from __future__ import annotations

import math
import tomllib
from dataclasses import dataclass
from importlib import resources
from pathlib import Path

from rallyarc.errors import InputError


@dataclass(frozen=True)
class Key:
    """One allowed key: its type, range and whether it must be given."""

    kind: type
    low: float | None = None
    high: float | None = None
    required: bool = True
    choices: tuple = ()

    def describe(self):
        if self.choices:
            return "one of " + ", ".join(self.choices)
        if self.kind is str:
            return "a string"
        return f"a number from {self.low} to {self.high}"


AERO_CHOICES = ("stepanek1988", "cross_lindsey2014", "constant")

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
        "aero_model": Key(str, choices=AERO_CHOICES),
    },
}


def _package_dir(kind):
    return resources.files("configs") / kind


def preset_names(kind):
    """Names of the built-in presets of one kind, sorted."""
    folder = _package_dir(kind)
    return sorted(p.name[:-5] for p in folder.iterdir() if p.name.endswith(".toml"))


def _read(kind, name_or_path):
    text_path = str(name_or_path)
    if text_path.endswith(".toml") or "/" in text_path:
        path = Path(text_path)
        if not path.is_file():
            raise InputError(f"{path}: no such file")
        return str(path), path.read_bytes().decode("utf-8")
    names = preset_names(kind)
    if text_path not in names:
        raise InputError(
            f"unknown {kind[:-1]} preset {text_path!r}; choose one of " + ", ".join(names)
        )
    item = _package_dir(kind) / f"{text_path}.toml"
    return f"configs/{kind}/{text_path}.toml", item.read_text(encoding="utf-8")


def validate(kind, data, where):
    """Check ``data`` against the schema of ``kind``; return it with numbers as floats."""
    schema = SCHEMAS[kind]
    for key in data:
        if key not in schema:
            raise InputError(f"{where}: unknown key {key!r}; allowed keys: " + ", ".join(schema))
    out = {}
    for key, spec in schema.items():
        if key not in data:
            if spec.required:
                raise InputError(f"{where}: missing key {key!r} ({spec.describe()})")
            continue
        value = data[key]
        if spec.kind is str:
            if not isinstance(value, str) or (spec.choices and value not in spec.choices):
                raise InputError(f"{where}: key {key!r} must be {spec.describe()}, got {value!r}")
        else:
            if isinstance(value, bool) or not isinstance(value, int | float):
                raise InputError(f"{where}: key {key!r} must be {spec.describe()}, got {value!r}")
            if not (math.isfinite(value) and spec.low <= value <= spec.high):
                raise InputError(f"{where}: key {key!r} must be {spec.describe()}, got {value!r}")
            value = int(value) if spec.kind is int else float(value)
        out[key] = value
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
