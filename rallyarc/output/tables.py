"""Tables for people: the metrics of shots in the units a coach reads (km/h, rpm, degrees)."""

from __future__ import annotations

import numpy as np

from rallyarc.units import KMH_PER_MPS

#: (row label, metric key, scale, format). Rows with a None key are section headings.
ROWS = (
    ("swing", None, None, None),
    ("head speed [km/h]", "swing:head_speed", KMH_PER_MPS, "{:.0f}"),
    ("swing path [deg]", "swing:swing_path", "deg", "{:+.0f}"),
    ("face tilt [deg]", "swing:face_tilt", "deg", "{:+.1f}"),
    ("impact", None, None, None),
    ("ball speed [km/h]", "impact_speed_mps", KMH_PER_MPS, "{:.0f}"),
    ("launch angle [deg]", "impact_launch_deg", 1.0, "{:+.1f}"),
    ("topspin [rpm]", "impact_topspin_rpm", 1.0, "{:+.0f}"),
    ("sidespin [rpm]", "impact_sidespin_rpm", 1.0, "{:+.0f}"),
    ("contact", "impact_regime", None, "{}"),
    ("slip: linear [m/s]", "impact_slip_linear_mps", 1.0, "{:.1f}"),
    ("slip: spin [m/s]", "impact_slip_spin_mps", 1.0, "{:.1f}"),
    ("slip ratio", "impact_slip_ratio", 1.0, "{:+.2f}"),
    ("spin limit reached", "impact_spin_limit_reached", None, "{}"),
    ("net", None, None, None),
    ("height at net [m]", "net_height_m", 1.0, "{:.2f}"),
    ("net clearance [m]", "net_clearance_m", 1.0, "{:+.2f}"),
    ("landing", None, None, None),
    ("x [m]", "land_x_m", 1.0, "{:+.2f}"),
    ("y [m]", "land_y_m", 1.0, "{:+.2f}"),
    ("inside baseline [m]", "land_depth_m", 1.0, "{:+.2f}"),
    ("inside sideline [m]", "land_side_margin_m", 1.0, "{:+.2f}"),
    ("inside service line [m]", "land_box_depth_m", 1.0, "{:+.2f}"),
    ("inside box sides [m]", "land_box_side_margin_m", 1.0, "{:+.2f}"),
    ("outcome", "outcome", None, "{}"),
    ("bounce", None, None, None),
    ("speed in/out [km/h]", ("bounce_speed_in_mps", "bounce_speed_out_mps"), KMH_PER_MPS, "{:.0f}"),
    ("angle in/out [deg]", ("bounce_angle_in_deg", "bounce_angle_out_deg"), 1.0, "{:.1f}"),
    ("topspin in/out [rpm]", ("bounce_spin_in_rpm", "bounce_spin_out_rpm"), 1.0, "{:+.0f}"),
    ("grip or slide", "bounce_regime", None, "{}"),
    ("apex after bounce [m]", "bounce_apex_m", 1.0, "{:.2f}"),
    ("at receiver plane [m]", "receiver_height_m", 1.0, "{:.2f}"),
    ("time to bounce [s]", "bounce_t_s", 1.0, "{:.2f}"),
    ("time to receiver [s]", "receiver_t_s", 1.0, "{:.2f}"),
)


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
    for label, key, scale, fmt in ROWS:
        if key is None:
            body.append([label.upper()] + [""] * n)
            continue
        body.append([label] + [cell(result, key, i, scale, fmt) for i in range(n)])
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
