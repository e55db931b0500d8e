"""Helpers of the command-line tests: TOML text from Python values, and the packaged presets as
plain dicts to start bad files from."""

import math
import tomllib

import pytest

from rallyarc import config


def _string(text):
    """A TOML basic string: quotes, backslashes and control characters escaped."""
    out = []
    for ch in text:
        if ch in '"\\':
            out.append("\\" + ch)
        elif ord(ch) < 0x20 or ord(ch) == 0x7F:
            out.append(f"\\u{ord(ch):04x}")
        elif 0xD800 <= ord(ch) <= 0xDFFF:  # a lone surrogate cannot be written as UTF-8
            out.append("\\ufffd")
        else:
            out.append(ch)
    return '"' + "".join(out) + '"'


def _value(v):
    if isinstance(v, bool):
        return "true" if v else "false"
    if isinstance(v, int):
        return str(v)
    if isinstance(v, float):
        if math.isnan(v):
            return "nan"
        if math.isinf(v):
            return "inf" if v > 0 else "-inf"
        return repr(v)
    if isinstance(v, str):
        return _string(v)
    if isinstance(v, list):
        return "[" + ", ".join(_value(x) for x in v) + "]"
    if isinstance(v, dict):
        return "{" + ", ".join(f"{_key(k)} = {_value(x)}" for k, x in v.items()) + "}"
    raise TypeError(f"no TOML for {v!r}")


def _key(k):
    bare = k and all(c.isalnum() or c in "-_" for c in k) and k.isascii()
    return k if bare else _string(k)


def _is_tables(v):
    return isinstance(v, list) and v and all(isinstance(x, dict) for x in v)


def toml_text(data, prefix=""):
    """TOML text of ``data``: scalars and arrays first, then tables, then arrays of tables."""
    lines, later = [], []
    for k, v in data.items():
        name = f"{prefix}.{_key(k)}" if prefix else _key(k)
        if isinstance(v, dict):
            later.append(f"\n[{name}]\n" + toml_text(v, name))
        elif _is_tables(v):
            for item in v:
                later.append(f"\n[[{name}]]\n" + toml_text(item, name))
        else:
            lines.append(f"{_key(k)} = {_value(v)}")
    return "\n".join(lines) + "\n" + "".join(later)


def preset_data(kind, name):
    """A packaged preset as the dict its TOML file holds."""
    _, text = config._read(kind, name)
    return tomllib.loads(text)


@pytest.fixture(scope="session")
def toml():
    return toml_text


@pytest.fixture(scope="session")
def preset():
    return preset_data
