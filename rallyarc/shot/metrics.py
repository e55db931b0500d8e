"""The shot metrics registry: every number the chain reports, with its unit, its output block,
its label and what it means.

The registry is the one source for the text tables, the JSON records (``ShotResult.record``),
the figures' axis labels, the batch columns and the contributor guide's glossary. A metric's key
is its block's prefix and its field (``net_`` + ``clearance_m``); the key carries the unit.
The order of :data:`METRICS` is the order of the columns of ``ShotResult.to_frame()`` and of the
fields within each JSON block.
"""

from __future__ import annotations

from dataclasses import dataclass

__all__ = [
    "BLOCKS",
    "METRICS",
    "MISSING",
    "Metric",
    "block_fields",
    "glossary_markdown",
    "metric",
    "missing_reason",
]

#: JSON block of a record -> prefix of its metrics' keys. ``outcome`` has a block of its own
#: with no prefix (the record's top-level ``outcome``).
BLOCKS = {
    "impact": "impact_",
    "net_crossing": "net_",
    "flight": "flight_",
    "landing": "land_",
    "bounce": "bounce_",
    "receiver": "receiver_",
    "outcome": "",
}


@dataclass(frozen=True)
class Metric:
    """One metric: ``key`` (prefix + field), ``unit`` (``-`` for pure numbers, ``text`` or
    ``yes/no`` for labels and flags), JSON ``block`` and ``field``, a short ``label`` for
    tables and axes, and a one-line ``meaning``."""

    key: str
    unit: str
    block: str
    field: str
    label: str
    meaning: str
    #: The row name in a table whose section already says the stage ("speed in" under
    #: BOUNCE); the label when not given.
    short: str = ""

    @property
    def row(self):
        return self.short or self.label

    @property
    def numeric(self):
        return self.unit not in ("text", "yes/no")


def _m(block, field, unit, label, meaning):
    return Metric(
        BLOCKS[block] + field,
        unit,
        block,
        field,
        label,
        meaning,
        _SHORT.get(field_key(block, field), ""),
    )


def field_key(block, field):
    return BLOCKS[block] + field


#: Table row names (see :attr:`Metric.short`).
_SHORT = {
    "impact_speed_mps": "ball speed",
    "impact_topspin_rpm": "topspin",
    "impact_sidespin_rpm": "sidespin",
    "net_height_m": "height at net",
    "land_x_m": "x",
    "land_y_m": "y",
    "land_depth_m": "inside baseline",
    "land_side_margin_m": "inside sideline",
    "land_box_depth_m": "inside service line",
    "land_box_side_margin_m": "inside box sides",
    "bounce_speed_in_mps": "speed in",
    "bounce_speed_out_mps": "speed out",
    "bounce_angle_in_deg": "angle in",
    "bounce_angle_out_deg": "angle out",
    "bounce_spin_in_rpm": "topspin in",
    "bounce_spin_out_rpm": "topspin out",
    "bounce_apex_m": "apex after bounce",
    "bounce_heading_change_deg": "sideways jump",
    "receiver_height_m": "at receiver plane",
}


_ALL = (
    # impact: the ball leaving the racket (or the machine)
    _m(
        "impact",
        "speed_mps",
        "m/s",
        "ball speed off the racket",
        "speed of the ball leaving the racket",
    ),
    _m("impact", "launch_deg", "deg", "launch angle", "launch angle above the horizontal"),
    _m(
        "impact",
        "azimuth_deg",
        "deg",
        "launch direction",
        "launch heading from +x toward +y (left)",
    ),
    _m(
        "impact",
        "spin_rpm",
        "rpm",
        "spin off the racket",
        "magnitude of the ball's spin leaving the racket",
    ),
    _m(
        "impact",
        "topspin_rpm",
        "rpm",
        "topspin off the racket",
        "spin about z x (horizontal travel direction); negative is backspin",
    ),
    _m(
        "impact",
        "sidespin_rpm",
        "rpm",
        "sidespin off the racket",
        "spin about +z; positive curves a ball toward +x to the left (+y)",
    ),
    _m(
        "impact",
        "regime",
        "text",
        "contact",
        "slide: the contact point slid throughout; grip: it stopped on the strings and sprang "
        "back in full; grip-slip: it stopped, then slipped back before the spring-back was done",
    ),
    _m(
        "impact",
        "slip_linear_mps",
        "m/s",
        "slip: linear",
        "linear part of the contact point's slip across the strings at first touch",
    ),
    _m(
        "impact",
        "slip_spin_mps",
        "m/s",
        "slip: spin",
        "spin part of the contact point's slip (r times the spin across the face)",
    ),
    _m("impact", "slip_ratio", "-", "slip ratio", "spin part of the slip over its linear part"),
    _m(
        "impact",
        "spin_limit_reached",
        "yes/no",
        "spin limit reached",
        "grip: more friction could give no more spin (slide and grip-slip used all of it)",
    ),
    _m(
        "impact",
        "spin_ratio_out",
        "-",
        "spin ratio out",
        "outgoing r w over the ball's speed along the face (1: rolling)",
    ),
    # the net
    _m(
        "net_crossing",
        "crossed_plane",
        "yes/no",
        "crossed the net plane",
        "the ball reached the net's plane going away from the hitter",
    ),
    _m("net_crossing", "height_m", "m", "height at net", "ball centre height at the net's plane"),
    _m("net_crossing", "top_m", "m", "net top", "height of the net's top at the crossing point"),
    _m(
        "net_crossing",
        "clearance_m",
        "m",
        "net clearance",
        "bottom of the ball above the net top at the crossing point",
    ),
    _m(
        "net_crossing",
        "y_m",
        "m",
        "net crossing y",
        "where the ball crosses the net's plane, across the court",
    ),
    _m("net_crossing", "t_s", "s", "time to net", "time from contact to the net's plane"),
    # the flight before the bounce
    _m(
        "flight",
        "peak_m",
        "m",
        "highest point before the bounce",
        "highest point of the ball's centre before the bounce",
    ),
    _m("flight", "peak_x_m", "m", "peak position", "where along the court the flight peaks"),
    _m(
        "flight",
        "ground_x_m",
        "m",
        "free-flight ground x",
        "where the free flight meets the ground, through the net if need be "
        "(for solvers, not a landing)",
    ),
    _m(
        "flight",
        "ground_y_m",
        "m",
        "free-flight ground y",
        "as flight_ground_x_m, across the court",
    ),
    # the landing
    _m(
        "landing",
        "x_m",
        "m",
        "landing point along the court",
        "landing point of a ball past the net, along the court",
    ),
    _m(
        "landing",
        "y_m",
        "m",
        "landing point across the court",
        "landing point across the court (+ left)",
    ),
    _m("landing", "t_s", "s", "time to landing", "time from contact to the landing"),
    _m(
        "landing",
        "depth_m",
        "m",
        "landing depth inside the baseline",
        "landing point inside the baseline (negative: long); "
        "none for a ball stopped by the net or short of it",
    ),
    _m(
        "landing",
        "side_margin_m",
        "m",
        "landing inside the sideline",
        "landing point inside the nearest sideline (negative: wide)",
    ),
    _m(
        "landing",
        "service_box",
        "text",
        "service box",
        "the box a serve must land in (deuce or ad); empty for rally balls",
    ),
    _m(
        "landing",
        "box_depth_m",
        "m",
        "landing depth inside the service line",
        "a serve's landing inside the service line (negative: long)",
    ),
    _m(
        "landing",
        "box_side_margin_m",
        "m",
        "landing inside the box's side lines",
        "a serve's landing inside the box's side lines (negative: wide)",
    ),
    _m(
        "outcome",
        "outcome",
        "text",
        "outcome",
        "in, net (into the net or short of it), long, wide, out (long and wide), miss",
    ),
    _m("landing", "speed_mps", "m/s", "landing speed", "ball speed at the landing"),
    _m(
        "landing",
        "angle_deg",
        "deg",
        "landing angle",
        "angle of descent below the horizontal at the landing",
    ),
    # the bounce
    _m(
        "bounce", "speed_in_mps", "m/s", "speed into the bounce", "ball speed arriving at the court"
    ),
    _m(
        "bounce",
        "angle_in_deg",
        "deg",
        "angle into the bounce",
        "arrival angle below the horizontal",
    ),
    _m(
        "bounce",
        "speed_out_mps",
        "m/s",
        "ball speed after the bounce",
        "ball speed leaving the court",
    ),
    _m(
        "bounce",
        "angle_out_deg",
        "deg",
        "kick: rebound angle",
        "rebound angle above the horizontal: how steeply the ball kicks up after the bounce "
        "(with bounce_apex_m, how high)",
    ),
    _m(
        "bounce",
        "heading_change_deg",
        "deg",
        "sideways jump at the bounce",
        "change of the ball's horizontal heading at the bounce, + to the left of its travel "
        "(a serve's sideways kick)",
    ),
    _m("bounce", "spin_in_rpm", "rpm", "topspin into the bounce", "topspin arriving at the court"),
    _m(
        "bounce",
        "spin_out_rpm",
        "rpm",
        "topspin after the bounce",
        "topspin leaving the court (about the arrival's travel direction)",
    ),
    _m(
        "bounce",
        "sidespin_in_rpm",
        "rpm",
        "sidespin into the bounce",
        "sidespin arriving at the court",
    ),
    _m(
        "bounce",
        "sidespin_out_rpm",
        "rpm",
        "sidespin after the bounce",
        "sidespin leaving the court",
    ),
    _m(
        "bounce",
        "apex_m",
        "m",
        "kick: bounce apex height",
        "highest point of the ball's centre after the bounce "
        "(free flight, even if beyond the receiver's plane)",
    ),
    _m(
        "bounce",
        "apex_x_m",
        "m",
        "bounce apex position",
        "where along the court the ball peaks after the bounce",
    ),
    _m("bounce", "t_s", "s", "time to bounce", "time from contact to the bounce"),
    _m("bounce", "x_m", "m", "bounce point along the court", "bounce point along the court"),
    _m("bounce", "y_m", "m", "bounce point across the court", "bounce point across the court"),
    _m(
        "bounce",
        "second_x_m",
        "m",
        "second bounce along the court",
        "where the free flight after the bounce meets the ground again",
    ),
    _m(
        "bounce",
        "second_y_m",
        "m",
        "second bounce across the court",
        "as bounce_second_x_m, across the court",
    ),
    _m("bounce", "occurred", "yes/no", "bounced", "the ball bounced past the net"),
    _m(
        "bounce",
        "apex_beyond_receiver",
        "yes/no",
        "apex beyond the receiver",
        "the apex after the bounce lies beyond the receiver's plane",
    ),
    _m(
        "bounce",
        "regime",
        "text",
        "grip or slide",
        "slide: the contact point slid throughout; grip: it stopped and sprang back in full; "
        "grip-slip: it stopped, then slipped back",
    ),
    # the receiver
    _m(
        "receiver",
        "height_m",
        "m",
        "height at the receiver's plane",
        "ball centre height where it crosses the receiver's plane, "
        "receiver_plane_m behind the far baseline",
    ),
    _m("receiver", "t_s", "s", "time to receiver", "time from contact to the receiver's plane"),
    _m(
        "receiver",
        "y_m",
        "m",
        "receiver plane y",
        "where the ball crosses the receiver's plane, across the court",
    ),
    _m(
        "receiver",
        "before_bounce",
        "yes/no",
        "receiver before bounce",
        "the ball reached the receiver's plane before bouncing (a long ball)",
    ),
    _m(
        "receiver", "reached", "yes/no", "receiver reached", "the ball reached the receiver's plane"
    ),
)

#: key -> :class:`Metric`, in output order.
METRICS = {m.key: m for m in _ALL}


def metric(key):
    """The :class:`Metric` of ``key``; a ``KeyError`` naming the valid keys otherwise."""
    try:
        return METRICS[key]
    except KeyError:
        raise KeyError(f"unknown metric {key!r}; choose one of {', '.join(METRICS)}") from None


def block_fields(block, keys=None):
    """The metrics of one JSON block, in output order (only those in ``keys`` if given)."""
    return [m for m in _ALL if m.block == block and (keys is None or m.key in keys)]


#: Why a metric can be missing (``null`` in JSON): the reason a record gives beside a null
#: field (``ShotResult.record``'s ``missing``). A block that is missing as a whole (no net
#: crossing, no landing, no bounce) takes its reason from the shot's outcome.
MISSING = {
    "net_crossing": "the ball did not reach the net's plane (the racket missed it)",
    "landing": "no landing: the ball was stopped by the net, or the racket missed it",
    "bounce": "no bounce past the net: the ball was stopped by the net or landed short of it",
    "flight_ground_x_m": "the flight did not reach the ground within the longest flight time",
    "flight_ground_y_m": "the flight did not reach the ground within the longest flight time",
    "land_depth_m": "the ball landed on the hitter's own side, short of the net",
    "land_side_margin_m": "the ball landed on the hitter's own side, short of the net",
    "land_box_depth_m": "not a serve: only a serve is judged against a service box",
    "land_box_side_margin_m": "not a serve: only a serve is judged against a service box",
    "bounce_second_x_m": "no second bounce within the longest flight time",
    "bounce_second_y_m": "no second bounce within the longest flight time",
    "receiver_height_m": "the ball did not reach the receiver's plane (net, or two bounces first)",
    "receiver_t_s": "the ball did not reach the receiver's plane (net, or two bounces first)",
    "receiver_y_m": "the ball did not reach the receiver's plane (net, or two bounces first)",
}


def missing_reason(key):
    """Why the metric (or block) ``key`` may be missing; a generic reason when none is set."""
    return MISSING.get(key, "not defined for this shot")


def glossary_markdown():
    """The metrics as a Markdown table (name, meaning, unit): the contributor guide's glossary
    of shot metrics is this text."""
    lines = ["| metric | JSON | meaning | unit |", "|---|---|---|---|"]
    for m in _ALL:
        where = "outcome" if m.block == "outcome" else f"{m.block}.{m.field}"
        lines.append(f"| `{m.key}` | `{where}` | {m.meaning} | {m.unit} |")
    return "\n".join(lines) + "\n"
