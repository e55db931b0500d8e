"""Tables for people: the metrics of shots in the units a coach reads (km/h, rpm, degrees).

Row names and units come from the metrics registry (:mod:`rallyarc.shot.metrics`); this module
only chooses which metrics a table shows, in which unit, and with how many digits.
"""

from __future__ import annotations

import numpy as np

from rallyarc.shot.metrics import metric
from rallyarc.units import KMH_PER_MPS

#: Factor from a metric's unit to the unit a table shows it in ("deg": radians to degrees).
_CONVERT = {("m/s", "km/h"): KMH_PER_MPS, ("rad", "deg"): "deg"}
#: Units the table does not write after a row name.
_NO_UNIT = ("-", "text", "yes/no")
#: The swing's fields (not metrics): SI unit of each.
_SWING_UNITS = {"head_speed": "m/s", "swing_path": "rad", "face_tilt": "rad"}

#: Sections of the comparison table: (heading, rows); a row is (metric key, or an (in, out) pair
#: of keys, or ``swing:FIELD``; the unit shown, None for the metric's own; format).
SECTIONS = (
    (
        "swing",
        (
            ("swing:head_speed", "km/h", "{:.0f}"),
            ("swing:swing_path", "deg", "{:+.0f}"),
            ("swing:face_tilt", "deg", "{:+.1f}"),
        ),
    ),
    (
        "impact",
        (
            ("impact_speed_mps", "km/h", "{:.0f}"),
            ("impact_launch_deg", None, "{:+.1f}"),
            ("impact_topspin_rpm", None, "{:+.0f}"),
            ("impact_sidespin_rpm", None, "{:+.0f}"),
            ("impact_regime", None, "{}"),
            ("impact_slip_linear_mps", None, "{:.1f}"),
            ("impact_slip_spin_mps", None, "{:.1f}"),
            ("impact_slip_ratio", None, "{:+.2f}"),
            ("impact_spin_limit_reached", None, "{}"),
        ),
    ),
    ("net", (("net_height_m", None, "{:.2f}"), ("net_clearance_m", None, "{:+.2f}"))),
    (
        "landing",
        (
            ("land_x_m", None, "{:+.2f}"),
            ("land_y_m", None, "{:+.2f}"),
            ("land_depth_m", None, "{:+.2f}"),
            ("land_side_margin_m", None, "{:+.2f}"),
            ("land_box_depth_m", None, "{:+.2f}"),
            ("land_box_side_margin_m", None, "{:+.2f}"),
            ("outcome", None, "{}"),
        ),
    ),
    (
        "bounce",
        (
            (("bounce_speed_in_mps", "bounce_speed_out_mps"), "km/h", "{:.0f}"),
            (("bounce_angle_in_deg", "bounce_angle_out_deg"), None, "{:.1f}"),
            ("bounce_heading_change_deg", None, "{:+.1f}"),
            (("bounce_spin_in_rpm", "bounce_spin_out_rpm"), None, "{:+.0f}"),
            ("bounce_regime", None, "{}"),
            ("bounce_apex_m", None, "{:.2f}"),
            ("receiver_height_m", None, "{:.2f}"),
            ("bounce_t_s", None, "{:.2f}"),
            ("receiver_t_s", None, "{:.2f}"),
        ),
    ),
)


def _name_and_unit(key):
    """Row name and SI unit of a metric or a ``swing:`` field."""
    if key.startswith("swing:"):
        field = key[6:]
        return field.replace("_", " "), _SWING_UNITS[field]
    m = metric(key)
    return m.row, m.unit


def row_label(key, unit=None):
    """The row name of a metric (or an (in, out) pair of metrics, "speed in/out") with the
    unit it is shown in, e.g. ``ball speed [km/h]``."""
    if isinstance(key, tuple):
        (first, own), (second, _) = (_name_and_unit(k) for k in key)
        stem, end = first.rsplit(" ", 1)
        name = f"{stem} {end}/{second.rsplit(' ', 1)[1]}"
    else:
        name, own = _name_and_unit(key)
    shown = unit or own
    return name if shown in _NO_UNIT else f"{name} [{shown}]"


def display_scale(key, unit):
    """The factor (or "deg") from a row's metric unit to ``unit``; None for labels and flags."""
    own = _name_and_unit(key[0] if isinstance(key, tuple) else key)[1]
    if own in ("text", "yes/no"):
        return None
    return 1.0 if unit is None or unit == own else _CONVERT[own, unit]


def _value(result, key, i):
    if key.startswith("swing:"):
        return float(getattr(result.swing, key[6:])[i])
    return result.metrics[key][i]


def _format(value, scale, fmt):
    if isinstance(value, str | np.str_):
        return str(value) or "-"
    if isinstance(value, bool | np.bool_):
        return "yes" if value else "no"
    value = float(value)
    if not np.isfinite(value):
        return "-"
    if scale == "deg":
        value = np.degrees(value)
    elif scale is not None:
        value *= scale
    return fmt.format(value)


def cell(result, key, i, scale, fmt):
    """One cell: shot ``i``'s value of ``key`` (a pair: "in/out"), scaled and formatted."""
    if isinstance(key, tuple):
        return "/".join(_format(_value(result, k, i), scale, fmt) for k in key)
    if key.startswith("swing:") and result.swing is None:
        return "-"
    return _format(_value(result, key, i), scale, fmt)


def comparison_table(result, title=None):
    """Every shot side by side: one column per shot, one row per quantity."""
    n = len(result)
    header = ["", *[str(label) for label in result.labels]]
    body = []
    for heading, rows in SECTIONS:
        body.append([heading.upper()] + [""] * n)
        for key, unit, fmt in rows:
            scale = display_scale(key, unit)
            body.append(
                [row_label(key, unit)] + [cell(result, key, i, scale, fmt) for i in range(n)]
            )
    widths = [max(len(row[c]) for row in [header, *body]) for c in range(n + 1)]
    lines = [title] if title else []
    lines.append(
        "  ".join(
            h.ljust(widths[0]) if c == 0 else h.rjust(widths[c]) for c, h in enumerate(header)
        )
    )
    for row in body:
        lines.append(
            "  ".join(
                v.ljust(widths[0]) if c == 0 else v.rjust(widths[c]) for c, v in enumerate(row)
            ).rstrip()
        )
    return lines
