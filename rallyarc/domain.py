"""Domain objects built from presets: ball, racket, air, surface, stroke and the conditions of play.

Each loader reads a preset by name or a TOML file by path (:mod:`rallyarc.config`), converts its
user units (km/h, rpm, degrees) to SI once, and returns a small frozen object the shot chain uses.
"""

from __future__ import annotations

import functools
import math
from dataclasses import dataclass, field, replace

import numpy as np

from rallyarc import config, kinematics
from rallyarc.bounce.contact import Surface
from rallyarc.flight.aero import get_aero_model
from rallyarc.flight.air import air_density, isa_temperature_pressure
from rallyarc.flight.forces import FlightParams, spin_decay_rate
from rallyarc.flight.integrate import apex, fly, ground_contact
from rallyarc.impact.racket import Racket
from rallyarc.impact.strings import DEFAULT_STRING_TANGENTIAL_RESTITUTION, string_restitution
from rallyarc.units import KMH, RPM

#: Drop height of the ITF rebound test, to the bottom of the ball [m] (ITF Rules, Appendix I).
DROP_HEIGHT_M = 2.54
#: Ball whose bounce on each surface the surface presets describe (their restitution).
REFERENCE_BALL = "itf_type2"


@dataclass(frozen=True)
class Ball:
    """A ball: mass [kg], radius [m], alpha = I/(m r^2) [-], normal restitution on a rigid
    surface [-] (from its drop test), and its aerodynamic model."""

    name: str
    mass: float
    radius: float
    alpha: float
    restitution: float
    aero_model: str
    source: str = ""
    rebound_cm: float = float("nan")
    rebound_band_cm: tuple = (float("nan"), float("nan"))

    @property
    def aero(self):
        return get_aero_model(self.aero_model)


@dataclass(frozen=True)
class RacketSetup:
    """A strung racket: mass properties; the string bed's normal restitution (at the reference
    speed of :func:`rallyarc.impact.strings.string_restitution`, and its change per m/s of
    normal impact speed), friction, and tangential restitution (spring-back)."""

    name: str
    racket: Racket
    string_restitution: float
    string_friction: float
    source: str = ""
    string_tangential_restitution: float = DEFAULT_STRING_TANGENTIAL_RESTITUTION
    string_restitution_slope_s_per_m: float = 0.0

    def normal_restitution(self, normal_speed):
        """String-bed normal restitution at a normal impact speed [m/s] (``(N,)`` array)."""
        return string_restitution(
            self.string_restitution, normal_speed, self.string_restitution_slope_s_per_m
        )


@dataclass(frozen=True)
class Air:
    """Air at the venue: density [kg/m^3] and wind [m/s] (court frame)."""

    name: str
    density: float
    wind: tuple = (0.0, 0.0, 0.0)
    altitude_m: float = 0.0
    temperature_c: float = 15.0
    relative_humidity: float = 0.0
    source: str = ""


@dataclass(frozen=True)
class Toss:
    """A serve toss at the moment of contact: ball centre, and its velocity from falling
    ``apex_above_contact_m`` from the toss's top."""

    contact: tuple
    apex_above_contact_m: float
    spin_rpm: float = 0.0

    def velocity(self, gravity=9.80665):
        return (0.0, 0.0, -math.sqrt(2.0 * gravity * self.apex_above_contact_m))


@dataclass(frozen=True)
class Stroke:
    """A swing, in SI: head speed [m/s] at the impact point; swing path above the horizontal,
    swing direction and face azimuth from +x toward +y, face tilt (open positive), racket roll
    [rad]; impact point from the butt and off the axis [m]; a serve's toss."""

    name: str
    kind: str
    head_speed: float
    swing_path: float
    swing_direction: float
    face_tilt: float
    face_azimuth: float
    racket_roll: float
    impact_from_butt: float
    impact_offaxis: float
    toss: Toss | None = None
    label: str = ""
    source: str = ""


@dataclass(frozen=True)
class Conditions:
    """Everything a shot is played in: ball, racket, air, surface and the receiver's plane."""

    ball: Ball
    racket: RacketSetup
    air: Air
    surface: Surface
    surface_name: str = "custom"
    receiver_plane_m: float = 1.0
    singles: bool = True
    #: Friction alone at the racket: the strings give no spring-back (tangential restitution
    #: 0), so the outgoing spin is what friction makes by itself.
    friction_only: bool = False

    def flight_params(self):
        """Flight parameters of this ball in this air, with the spin decay of
        :func:`rallyarc.flight.forces.spin_decay_rate` (aerodynamic torque)."""
        ball = self.ball
        decay = spin_decay_rate(self.air.density, ball.radius, ball.mass, ball.alpha, ball.aero)
        return FlightParams(
            mass=ball.mass,
            radius=ball.radius,
            air_density=self.air.density,
            aero=ball.aero,
            spin_decay_rate=decay,
            wind=self.air.wind,
        )

    #: The reference ball's drop-test restitution (the surface presets' restitution was
    #: measured with it); the preset's value unless given.
    reference_restitution: float | None = None
    #: The surface as this ball meets it (derived once, see :meth:`surface_for_ball`).
    ball_surface: Surface = field(init=False, repr=False, compare=False)

    def __post_init__(self):
        if self.reference_restitution is None:
            object.__setattr__(self, "reference_restitution", reference_ball().restitution)
        scale = self.ball.restitution / self.reference_restitution
        surface = replace(self.surface, restitution=min(1.0, self.surface.restitution * scale))
        object.__setattr__(self, "ball_surface", surface)

    @property
    def string_tangential_restitution(self):
        """Tangential restitution of the strings as played: the racket's, or 0 when
        :attr:`friction_only`."""
        return 0.0 if self.friction_only else self.racket.string_tangential_restitution

    def string_contact(self, ball_velocity, face_velocity, face_normal):
        """The string bed's contact coefficients for N impacts: normal restitution at each
        ball's normal speed into the face, friction and tangential restitution, as the
        ``e_n, mu, e_t`` arguments of :func:`rallyarc.impact.contact.hit`."""
        v_rel = np.atleast_2d(ball_velocity) - np.atleast_2d(face_velocity)
        normal_speed = np.einsum("ij,ij->i", v_rel, np.broadcast_to(face_normal, v_rel.shape))
        racket = self.racket
        e_n = racket.normal_restitution(normal_speed)
        return e_n, racket.string_friction, self.string_tangential_restitution

    def surface_for_ball(self):
        """The surface as this ball meets it: the surface's restitution (measured with the
        reference ball) scaled by the ratio of the ball's drop-test restitution to the
        reference ball's."""
        return self.ball_surface


@dataclass(frozen=True)
class Scenario:
    """A named comparison: one player, one set of conditions, several strokes, one incoming ball
    (or each serve's own toss)."""

    name: str
    description: str
    player: str
    club: str
    conditions: Conditions
    strokes: tuple
    incoming: dict | None = None
    source: str = ""
    where: str = ""
    meta: dict = field(default_factory=dict)


@functools.cache
def reference_ball():
    """The reference ball of the surface presets (:data:`REFERENCE_BALL`), loaded once: a
    packaged preset, so it cannot change while the program runs."""
    return load_ball(REFERENCE_BALL)


def load_ball(name):
    data = config.load("balls", name)
    return Ball(
        name=str(name),
        mass=data["mass_kg"],
        radius=data["diameter_m"] / 2.0,
        alpha=data["alpha"],
        restitution=data["restitution"],
        aero_model=data["aero_model"],
        source=data["source"],
        rebound_cm=data["rebound_cm"],
        rebound_band_cm=(data["rebound_min_cm"], data["rebound_max_cm"]),
    )


def load_racket(name):
    data = config.load("rackets", name)
    racket = Racket(
        mass_kg=data["mass_kg"],
        balance_m=data["balance_m"],
        swingweight_kgm2=data["swingweight_kgm2"],
        twistweight_kgm2=data.get("twistweight_kgm2", 0.0015),
        length_m=data["length_m"],
    )
    return RacketSetup(
        str(name),
        racket,
        data["string_restitution"],
        data["string_friction"],
        data["source"],
        data.get("string_tangential_restitution", DEFAULT_STRING_TANGENTIAL_RESTITUTION),
        data.get("string_restitution_slope_s_per_m", 0.0),
    )


def make_air(
    altitude_m=0.0,
    temperature_c=None,
    relative_humidity=0.0,
    pressure_pa=None,
    wind=(0.0, 0.0, 0.0),
    name="custom",
    source="",
):
    """Air from the venue's altitude and weather; missing temperature or pressure come from the
    International Standard Atmosphere at that altitude."""
    t_isa, p_isa = isa_temperature_pressure(altitude_m)
    temp = float(t_isa) - 273.15 if temperature_c is None else float(temperature_c)
    pres = float(p_isa) if pressure_pa is None else float(pressure_pa)
    density = float(air_density(temp, pres, relative_humidity))
    return Air(
        name,
        density,
        tuple(float(w) for w in wind),
        float(altitude_m),
        temp,
        float(relative_humidity),
        source,
    )


def load_air(name):
    data = config.load("air", name)
    return make_air(
        data["altitude_m"],
        data["temperature_c"],
        data["relative_humidity"],
        data.get("pressure_pa"),
        data.get("wind_mps", (0.0, 0.0, 0.0)),
        str(name),
        data["source"],
    )


def load_surface(name):
    data = config.load("surfaces", name)
    kwargs = {"friction": data["friction"], "restitution": data["restitution"]}
    if "restitution_slope_s_per_m" in data:
        kwargs["restitution_slope_s_per_m"] = data["restitution_slope_s_per_m"]
    if "tangential_restitution" in data:
        kwargs["tangential_restitution"] = data["tangential_restitution"]
    return Surface(**kwargs)


def stroke_from_dict(data, name="custom"):
    """A :class:`Stroke` from validated stroke keys (user units)."""
    serve = data["kind"] == "serve"
    direction = data.get("swing_direction_deg", 0.0)
    toss = None
    if "toss" in data:
        t = data["toss"]
        toss = Toss(tuple(t["contact_m"]), t["apex_above_contact_m"], t.get("spin_rpm", 0.0))
    return Stroke(
        name=str(name),
        kind=data["kind"],
        head_speed=data["head_speed_kmh"] * KMH,
        swing_path=math.radians(data["swing_path_deg"]),
        swing_direction=math.radians(direction),
        face_tilt=math.radians(data["face_tilt_deg"]),
        face_azimuth=math.radians(data.get("face_azimuth_deg", direction)),
        racket_roll=math.radians(data.get("racket_roll_deg", 90.0 if serve else 180.0)),
        impact_from_butt=data.get("impact_from_butt_m", 0.52),
        impact_offaxis=data.get("impact_offaxis_m", 0.0),
        toss=toss,
        label=data["name"],
        source=data["source"],
    )


def load_stroke(name):
    data = config.load("strokes", name)
    if data["kind"] == "serve" and "toss" not in data:
        raise config.InputError(f"{data['where']}: a serve needs a [toss] table")
    return stroke_from_dict(data, name)


def load_scenario(name):
    from rallyarc.errors import InputError

    data = config.load("scenarios", name)
    where = data["where"]

    def sub(loader, key):
        return config.referenced(data, key, loader)

    conditions = Conditions(
        ball=sub(load_ball, "ball"),
        racket=sub(load_racket, "racket"),
        air=sub(load_air, "air"),
        surface=sub(load_surface, "surface"),
        surface_name=data["surface"],
        receiver_plane_m=data.get("receiver_plane_m", 1.0),
        singles=data.get("singles", True),
    )
    strokes = []
    for stroke_name in data["strokes"]:
        try:
            stroke = load_stroke(stroke_name)
        except InputError as exc:
            raise InputError(f"{where}: key 'strokes': {exc}") from None
        if stroke.toss is None and "incoming" not in data:
            raise InputError(
                f"{where}: stroke {stroke_name!r} needs an incoming ball: add an [incoming] table"
            )
        strokes.append(stroke)
    return Scenario(
        name=data["name"],
        description=data["description"],
        player=data["player"],
        club=data["club"],
        conditions=conditions,
        strokes=tuple(strokes),
        incoming=data.get("incoming"),
        source=data["source"],
        where=where,
    )


def incoming_state(incoming):
    """Position [m], velocity [m/s] and spin [rad/s] of an ``[incoming]`` table (user units).

    The ball travels at ``speed_kmh`` with horizontal heading ``azimuth_deg`` (180: straight at
    the near baseline), descending at ``descent_deg`` below the horizontal (negative: rising);
    ``spin_rpm`` is topspin relative to its own travel (negative: backspin), ``sidespin_rpm``
    spin about +z.
    """
    speed = incoming["speed_kmh"] * KMH
    heading = math.radians(incoming.get("azimuth_deg", 180.0))
    descent = math.radians(incoming["descent_deg"])
    velocity = kinematics.velocity(speed, -descent, heading)[0]
    spin = kinematics.spin(
        incoming.get("spin_rpm", 0.0), incoming.get("sidespin_rpm", 0.0), heading
    )
    spin = spin[0] * RPM
    return np.asarray(incoming["position_m"], float), velocity, spin


def drop_test_rebound(ball, restitution=None, air_density_kgm3=1.204):
    """Rebound height [m] of the ITF drop test, simulated with air drag.

    The ball falls from rest with its bottom at 2.54 m onto a rigid surface, leaves it with
    ``restitution`` times its arrival speed (its own restitution by default), and rises to its
    apex; the rebound is the apex height of the ball's bottom. Air: 20 C dry air at sea level
    (1.204 kg/m^3), the test's temperature.

    Parameters
    ----------
    ball : Ball
    restitution : float or array (N,), optional

    Returns
    -------
    numpy.ndarray
        ``(N,)`` rebound heights [m].
    """
    e = np.atleast_1d(np.asarray(ball.restitution if restitution is None else restitution, float))
    params = FlightParams(
        mass=ball.mass, radius=ball.radius, air_density=air_density_kgm3, aero=ball.aero
    )
    start = np.tile([0.0, 0.0, DROP_HEIGHT_M + ball.radius], (1, 1))
    down = fly(
        start,
        np.zeros((1, 3)),
        np.zeros((1, 3)),
        params,
        [ground_contact(ball.radius)],
        rtol=1e-9,
        atol=1e-10,
    )
    v_in = -down.velocity[0, 2]
    n = e.size
    up = fly(
        np.tile([0.0, 0.0, ball.radius], (n, 1)),
        np.stack([np.zeros(n), np.zeros(n), e * v_in], axis=1),
        np.zeros((n, 3)),
        params,
        [apex(), ground_contact(ball.radius)],
        rtol=1e-9,
        atol=1e-10,
    )
    return up.events["apex"].position[:, 2] - ball.radius


@dataclass(frozen=True)
class Machine:
    """A ball machine's limits, SI: speeds [m/s], spin [rad/s], angles [rad], height [m]."""

    name: str
    speed_min: float
    speed_max: float
    spin_max: float
    elevation_min: float
    elevation_max: float
    azimuth_max: float
    release_height: float
    source: str = ""


def load_machine(name):
    d = config.load("machines", name)
    return Machine(
        str(name),
        d["speed_min_kmh"] * KMH,
        d["speed_max_kmh"] * KMH,
        d["spin_max_rpm"] * RPM,
        math.radians(d["elevation_min_deg"]),
        math.radians(d["elevation_max_deg"]),
        math.radians(d["azimuth_max_deg"]),
        d["release_height_m"],
        d["source"],
    )
