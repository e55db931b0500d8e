"""A fed ball (a coach's hand or a ball machine) through the whole chain: flight, the net (a
ball that meets it stops there, outcome ``net``), the landing and its line call, the bounce, the
flight after it to the receiver's plane and the second bounce; the metrics of ``shot``.

The chain plays balls hit from the near end toward +x. A ball fed toward -x (from the far end)
is played turned 180 degrees about z, and its record is turned back to the court frame.
"""

from __future__ import annotations

from dataclasses import dataclass, replace

import numpy as np

from rallyarc import domain, kinematics
from rallyarc.shot import BallState, launch
from rallyarc.units import KMH_PER_MPS, RPM

#: The caution printed with every feed: machines and fast feeds can injure.
SAFETY = (
    "Safety: a ball machine or a fast feed can injure. Keep everyone out of the line of fire "
    "while it is loaded, start at low feed speeds, and follow the venue's rules and qualified "
    "coaching practice."
)

#: Default conditions of a feed (the same defaults as the scenarios').
DEFAULT_BALL = "itf_type2"
DEFAULT_AIR = "sea_level"
DEFAULT_SURFACE = "hard_medium"


def feed_conditions(
    ball=DEFAULT_BALL,
    air=DEFAULT_AIR,
    surface=DEFAULT_SURFACE,
    air_density=None,
    aero=None,
    receiver_plane_m=1.0,
    singles=True,
):
    """The :class:`rallyarc.domain.Conditions` a ball is fed in: ball, air and surface by
    preset name, file or object; ``air_density`` [kg/m^3] replaces the air's density and
    ``aero`` names an aerodynamic model instead of the ball's own."""
    ball = domain.load_ball(ball) if isinstance(ball, str) else ball
    if aero:
        ball = replace(ball, aero_model=aero)
    air = domain.load_air(air) if isinstance(air, str) else air
    if air_density is not None:
        air = replace(air, name="custom", density=float(air_density))
    surface_name = surface if isinstance(surface, str) else "custom"
    surface = domain.load_surface(surface) if isinstance(surface, str) else surface
    return domain.Conditions(
        ball=ball,
        racket=domain.load_racket("standard"),  # a feed meets no racket
        air=air,
        surface=surface,
        surface_name=surface_name,
        receiver_plane_m=float(receiver_plane_m),
        singles=singles,
    )


def _mirror_field(field):
    return field in ("x_m", "y_m") or field.endswith(("_x_m", "_y_m"))


@dataclass(frozen=True)
class Feed:
    """One fed ball: the chain's :class:`rallyarc.shot.ShotResult` (played toward +x),
    whether the ball was turned 180 degrees about z to play it (``mirrored``) and the feed's
    inputs (in the units of their keys)."""

    result: object
    mirrored: bool
    inputs: dict

    @property
    def outcome(self):
        """in, net, long, wide or out."""
        return str(self.result.outcome[0])

    def record(self):
        """The fed ball as a JSON-ready dict in the court frame, with the blocks of
        ``shot --json`` (net_crossing, landing, bounce, flight, receiver, outcome); its
        ``inputs`` are the feed's, ``impact`` the ball leaving the hand or machine."""
        rec = self.result.record(0)
        rec["inputs"] = dict(self.inputs)
        if self.mirrored:
            for name, block in rec.items():
                if name == "inputs" or not isinstance(block, dict):
                    continue
                for field, value in block.items():
                    if _mirror_field(field) and value is not None:
                        block[field] = -value
            azimuth = (rec["impact"]["azimuth_deg"] + 180.0) % 360.0
            rec["impact"]["azimuth_deg"] = azimuth - 360.0 if azimuth > 180.0 else azimuth
        return rec

    def __repr__(self):
        rec = self.record()
        land = rec["landing"]
        where = f"lands x {land['x_m']:+.2f} m, y {land['y_m']:+.2f} m" if land else "no landing"
        return f"<Feed: {self.inputs['speed_kmh']:.1f} km/h, {where}, {self.outcome}>"


def simulate_feed(
    origin,
    speed,
    elevation,
    azimuth,
    spin,
    spin_axis=(0.0, 1.0, 0.0),
    ball=DEFAULT_BALL,
    aero=None,
    air_density=None,
    conditions=None,
    air=DEFAULT_AIR,
    surface=DEFAULT_SURFACE,
):
    """Feed one ball and play it through the whole chain.

    Parameters
    ----------
    origin : (3,) release point of the ball centre [m], court frame.
    speed : launch speed [m/s]; elevation, azimuth : [rad] (azimuth from +x toward +y);
        spin : [rad/s] about ``spin_axis`` (court frame, normalised here; the default +y is
        topspin for a ball toward +x).
    ball, air, surface : presets, files or objects (see :func:`feed_conditions`);
        aero : an aerodynamic model instead of the ball's own; air_density : [kg/m^3] instead
        of the air's. ``conditions`` (a :class:`rallyarc.domain.Conditions`) replaces them all.

    Returns
    -------
    Feed
        Its :meth:`Feed.record` is the JSON of ``rallyarc feed --json``.
    """
    if conditions is None:
        conditions = feed_conditions(ball, air, surface, air_density, aero)
    given = conditions
    origin = np.asarray(origin, float)
    axis = np.asarray(spin_axis, float)
    axis = kinematics.unit(axis, "spin_axis")[0]
    v0 = kinematics.velocity(speed, elevation, azimuth)[0]
    w0 = spin * axis
    mirrored = bool(v0[0] < 0)
    turn = np.array([-1.0, -1.0, 1.0]) if mirrored else np.ones(3)
    if mirrored:  # the wind turns with the court
        wind = tuple(float(v) for v in np.asarray(conditions.air.wind) * turn)
        conditions = replace(conditions, air=replace(conditions.air, wind=wind))
    start = BallState.of(origin * turn, v0 * turn, w0 * turn)
    result = launch(start, conditions, labels=["feed"])
    return Feed(result, mirrored, _inputs(origin, speed, elevation, azimuth, spin, axis, given))


def _inputs(origin, speed, elevation, azimuth, spin, axis, c):
    params = c.flight_params()
    return {
        "label": "feed",
        "origin_m": [float(v) for v in origin],
        "speed_mps": float(speed),
        "speed_kmh": float(speed * KMH_PER_MPS),
        "elevation_deg": float(np.degrees(elevation)),
        "azimuth_deg": float(np.degrees(azimuth)),
        "spin_rpm": float(spin / RPM),
        "spin_axis": [float(v) for v in axis],
        "ball": c.ball.name,
        "mass_kg": c.ball.mass,
        "radius_m": c.ball.radius,
        "aero_model": c.ball.aero_model,
        "air": c.air.name,
        "air_density_kgm3": float(c.air.density),
        "wind_mps": [float(v) for v in c.air.wind],
        "spin_decay_rate_per_s": float(params.spin_decay_rate),
        "gravity_mps2": float(params.gravity),
        "surface": c.surface_name,
        "receiver_plane_m": c.receiver_plane_m,
        "singles": c.singles,
    }


def feed_ball(
    origin_m=(-11.0, 0.0, 1.0),
    speed_kmh=90.0,
    elevation_deg=8.0,
    azimuth_deg=0.0,
    spin_rpm=1500.0,
    spin_axis=(0.0, 1.0, 0.0),
    ball=DEFAULT_BALL,
    air=DEFAULT_AIR,
    surface=DEFAULT_SURFACE,
):
    """:func:`simulate_feed` in the units a coach sets a machine in, with the ranges of
    ``rallyarc feed``: speed 0.36 to 288 km/h, elevation -60 to 85 deg, azimuth -180 to 180
    deg (from +x toward +y), spin -8000 to 8000 rpm about ``spin_axis``; presets by name.

    Example: ``feed_ball(speed_kmh=70, elevation_deg=5).outcome``.
    """
    from rallyarc.errors import InputError

    for name, value, low, high, unit in (
        ("speed_kmh", speed_kmh, 0.1 * KMH_PER_MPS, 80.0 * KMH_PER_MPS, "km/h"),
        ("elevation_deg", elevation_deg, -60.0, 85.0, "deg"),
        ("azimuth_deg", azimuth_deg, -180.0, 180.0, "deg"),
        ("spin_rpm", spin_rpm, -8000.0, 8000.0, "rpm"),
    ):
        if not (np.isfinite(value) and low <= value <= high):
            raise InputError(f"{name}: must lie within {low:g} to {high:g} {unit}, got {value}")
    return simulate_feed(
        origin_m,
        speed_kmh / KMH_PER_MPS,
        np.radians(elevation_deg),
        np.radians(azimuth_deg),
        spin_rpm * RPM,
        spin_axis,
        ball=ball,
        air=air,
        surface=surface,
    )
