"""Parsing of user-facing quantities into SI, once, at the edge of the program."""

from __future__ import annotations

import math
import re

from rallyarc.errors import InputError

#: Kilometres per hour per metre per second; multiply a speed in m/s by it for km/h.
KMH_PER_MPS = 3.6
#: One km/h in m/s; multiply a speed in km/h by it for m/s.
KMH = 1.0 / KMH_PER_MPS
MPH = 0.44704
RPM = math.pi / 30.0

_SPEED_UNITS = {"": 1.0, "m/s": 1.0, "mps": 1.0, "km/h": KMH, "kmh": KMH, "kph": KMH, "mph": MPH}
_NUMBER = r"[-+]?(?:\d+\.?\d*|\.\d+)(?:[eE][-+]?\d+)?"


def number(text, option, low=-math.inf, high=math.inf):
    """A finite number within ``[low, high]``; the error names the option and the range."""
    try:
        value = float(text)
    except (TypeError, ValueError):
        raise InputError(f"{option}: expected a number, got {text!r}") from None
    if not math.isfinite(value) or not (low <= value <= high):
        raise InputError(f"{option}: must be a finite number from {low:g} to {high:g}, got {text}")
    return value


def speed(text, option, low=0.0, high=100.0):
    """A speed with an optional unit (``120km/h``, ``75mph``, ``30m/s``; bare = m/s) in m/s."""
    match = re.fullmatch(rf"\s*({_NUMBER})\s*([a-zA-Z/]*)\s*", str(text))
    unit = match.group(2).lower() if match else None
    if not match or unit not in _SPEED_UNITS:
        raise InputError(
            f"{option}: expected a speed such as 30, 30m/s, 108km/h or 67mph, got {text!r}"
        )
    value = float(match.group(1)) * _SPEED_UNITS[unit]
    if not math.isfinite(value) or not (low <= value <= high):
        raise InputError(
            f"{option}: must be from {low:g} to {high:g} m/s "
            f"({low * KMH_PER_MPS:g} to {high * KMH_PER_MPS:g} km/h), got {text}"
        )
    return value


def point(text, option, low=-50.0, high=50.0):
    """A point ``X,Y,Z`` in metres."""
    parts = str(text).split(",")
    if len(parts) != 3:
        raise InputError(f"{option}: expected a point X,Y,Z in metres, got {text!r}")
    return tuple(number(p.strip(), option, low, high) for p in parts)
