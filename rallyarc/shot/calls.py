"""Python calls that say their units: the swing keywords of :func:`rallyarc.shot.play` with
their unit in the name and the command line's ranges, and names accepted wherever an object is
(strokes, scenarios).

A keyword names its unit (``head_speed_kmh=95``, ``face_tilt_deg=2``); a bare field name
(``head_speed=``, ``face_tilt=``) is SI (m/s, rad) and is checked against the same range in SI,
so that degrees given as radians or km/h given as m/s are refused instead of played.
"""

from __future__ import annotations

import math

import numpy as np

from rallyarc.errors import InputError
from rallyarc.units import KMH, MPH

_DEG = math.radians(1.0)

#: keyword -> (swing field, factor from the keyword's unit to SI, low, high, unit), the ranges
#: of the command line's options (``shot --head-speed``, ``--swing-path``, ...).
SWING_KEYWORDS = {
    "head_speed_mps": ("head_speed", 1.0, 1.0, 70.0, "m/s"),
    "head_speed_kmh": ("head_speed", KMH, 1.0 / KMH, 70.0 / KMH, "km/h"),
    "head_speed_mph": ("head_speed", MPH, 1.0 / MPH, 70.0 / MPH, "mph"),
    "swing_path_deg": ("swing_path", _DEG, -60.0, 80.0, "deg"),
    "swing_direction_deg": ("swing_direction", _DEG, -60.0, 60.0, "deg"),
    "face_tilt_deg": ("face_tilt", _DEG, -60.0, 60.0, "deg"),
    "face_azimuth_deg": ("face_azimuth", _DEG, -180.0, 180.0, "deg"),
    "racket_roll_deg": ("racket_roll", _DEG, -180.0, 180.0, "deg"),
    "impact_from_butt_m": ("impact_from_butt", 1.0, 0.0, 1.0, "m"),
    "impact_offaxis_m": ("impact_offaxis", 1.0, -0.2, 0.2, "m"),
}
#: The SI field names: range in SI, SI unit, and the keyword that says a coach's unit.
_SI = {
    "head_speed": (1.0, 70.0, "m/s", "head_speed_kmh"),
    "swing_path": (-60.0 * _DEG, 80.0 * _DEG, "rad", "swing_path_deg"),
    "swing_direction": (-60.0 * _DEG, 60.0 * _DEG, "rad", "swing_direction_deg"),
    "face_tilt": (-60.0 * _DEG, 60.0 * _DEG, "rad", "face_tilt_deg"),
    "face_azimuth": (-math.pi, math.pi, "rad", "face_azimuth_deg"),
    "racket_roll": (-math.pi, math.pi, "rad", "racket_roll_deg"),
    "impact_from_butt": (0.0, 1.0, "m", "impact_from_butt_m"),
    "impact_offaxis": (-0.2, 0.2, "m", "impact_offaxis_m"),
}


def _checked(name, value, low, high, unit):
    arr = np.asarray(value, float)
    bad = ~np.isfinite(arr) | (arr < low - 1e-12) | (arr > high + 1e-12)
    if np.any(bad):
        got = np.atleast_1d(arr)[np.atleast_1d(bad)][0]
        raise InputError(f"{name}: must lie within {low:g} to {high:g} {unit}, got {got:g}")
    return arr


def swing_overrides(keywords):
    """SI swing fields from unit-suffixed keywords (or SI field names), each range-checked.

    An SI name out of its range names the keyword with the unit, e.g. ``face_tilt: must lie
    within -1.0472 to 1.0472 rad, SI (or say the unit: face_tilt_deg=), got 2``.
    """
    fields = {}
    for name, value in keywords.items():
        if name in SWING_KEYWORDS:
            field, factor, low, high, unit = SWING_KEYWORDS[name]
            si = _checked(name, value, low, high, unit) * factor
        elif name in _SI:
            field, (low, high, unit, hint) = name, _SI[name]
            si = _checked(name, value, low, high, f"{unit}, SI (or say the unit: {hint}=)")
        else:
            known = ", ".join(SWING_KEYWORDS)
            raise InputError(f"{name}: not a swing keyword; choose one of {known}")
        if field in fields:
            raise InputError(f"{name}: {field} is given twice")
        fields[field] = si
    return fields


def strokes_of(strokes):
    """A list of :class:`rallyarc.domain.Stroke` from a stroke, a preset name or file, or a
    sequence of them."""
    from rallyarc import domain

    if isinstance(strokes, str) or hasattr(strokes, "head_speed"):
        strokes = [strokes]
    return [domain.load_stroke(s) if isinstance(s, str) else s for s in strokes]


def conditions_of(conditions):
    """``(conditions, scenario)`` from a :class:`rallyarc.domain.Conditions`, a
    :class:`rallyarc.domain.Scenario` or a scenario's preset name or file (scenario None for
    plain conditions)."""
    from rallyarc import domain

    if isinstance(conditions, str):
        conditions = domain.load_scenario(conditions)
    if isinstance(conditions, domain.Scenario):
        return conditions.conditions, conditions
    return conditions, None
