"""The small frozen objects the shot chain is played with, in SI: ball, racket, air, toss,
stroke, the conditions of play, a scenario and a ball machine."""

from __future__ import annotations

import functools
import math
from dataclasses import dataclass, field, replace

import numpy as np

from rallyarc import config
from rallyarc.bounce.contact import Surface, bounce
from rallyarc.bounce.deform import bounce_deforming
from rallyarc.flight.aero import get_aero_model
from rallyarc.flight.forces import FlightParams, spin_decay_rate
from rallyarc.impact.racket import Racket
from rallyarc.impact.strings import DEFAULT_STRING_TANGENTIAL_RESTITUTION, string_restitution

#: Ball whose bounce on each surface the surface presets describe (their restitution).
REFERENCE_BALL = "itf_type2"


@functools.cache
def reference_restitution():
    """The drop-test restitution of :data:`REFERENCE_BALL`, read once: a packaged preset, so it
    cannot change while the program runs."""
    return config.load("balls", REFERENCE_BALL)["restitution"]


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

    def turned(self, swing_direction):
        """This stroke swung in another direction [rad] (from +x toward +y); the face turns
        with the swing, keeping its offset from the swing direction."""
        face = self.face_azimuth - self.swing_direction + swing_direction
        return replace(self, swing_direction=swing_direction, face_azimuth=face)


def bounce_model_name(deforming_ball):
    """The court bounce model in words, as the outputs name it."""
    return "deforming ball" if deforming_ball else "rigid ball"


def court_bounce(ball, surface, velocity, spin, deforming_ball=True):
    """The court bounce of N balls of ``ball`` arriving with ``velocity`` and ``spin``
    ``(N, 3)`` on ``surface`` as this ball meets it (:func:`surface_for`), as the shot chain
    bounces them: a compressing ball's bounce (:func:`rallyarc.bounce.deform.bounce_deforming`)
    unless ``deforming_ball`` is False (a rigid ball's, :func:`rallyarc.bounce.contact.bounce`)."""
    if deforming_ball:
        return bounce_deforming(velocity, spin, ball.radius, ball.alpha, surface, ball.mass)
    return bounce(velocity, spin, ball.radius, ball.alpha, surface)


def surface_for(ball, surface, reference=None):
    """``surface`` as ``ball`` meets it: its restitution, measured with the reference ball
    (drop-test restitution ``reference``, :func:`reference_restitution` unless given), scaled by
    the ratio of this ball's drop-test restitution to the reference ball's (at most 1)."""
    reference = reference_restitution() if reference is None else reference
    scale = ball.restitution / reference
    return replace(surface, restitution=min(1.0, surface.restitution * scale))


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
    #: The court bounce of a compressing ball (:func:`rallyarc.bounce.deform.bounce_deforming`,
    #: the default): the court's friction acts at the flattened contact, below the centre, so a
    #: fast sliding ball picks up less spin than a rigid one (about twice its spin in, as
    #: high-speed camera measurements of fast serves show, where a rigid ball gains three and a
    #: half times: ``tests/validation``). False: a rigid ball
    #: (:func:`rallyarc.bounce.contact.bounce`).
    deforming_ball: bool = True

    def flight_params(self):
        """Flight parameters of this ball in this air, with the spin decay of
        :func:`rallyarc.flight.forces.spin_decay_rate` (aerodynamic torque); derived once, when
        the conditions are made (they are immutable)."""
        return self._flight_params

    #: The reference ball's drop-test restitution (the surface presets' restitution was
    #: measured with it); the preset's value unless given.
    reference_restitution: float | None = None
    #: The surface as this ball meets it (derived once, see :meth:`surface_for_ball`).
    ball_surface: Surface = field(init=False, repr=False, compare=False)
    _flight_params: FlightParams = field(init=False, repr=False, compare=False)

    def __post_init__(self):
        if self.reference_restitution is None:
            object.__setattr__(self, "reference_restitution", reference_restitution())
        surface = surface_for(self.ball, self.surface, self.reference_restitution)
        object.__setattr__(self, "ball_surface", surface)
        ball = self.ball
        decay = spin_decay_rate(self.air.density, ball.radius, ball.mass, ball.alpha, ball.aero)
        params = FlightParams(
            mass=ball.mass,
            radius=ball.radius,
            air_density=self.air.density,
            aero=ball.aero,
            spin_decay_rate=decay,
            wind=self.air.wind,
        )
        object.__setattr__(self, "_flight_params", params)

    @property
    def bounce_model(self):
        """The court bounce played, in words: "deforming ball" or "rigid ball"."""
        return bounce_model_name(self.deforming_ball)

    @property
    def modes(self):
        """The physics modes played that are not the defaults, in words (empty when none)."""
        return tuple(
            text
            for on, text in (
                (self.friction_only, "friction alone at the racket"),
                (not self.deforming_ball, "rigid ball at the bounce"),
            )
            if on
        )

    @property
    def string_tangential_restitution(self):
        """Tangential restitution of the strings as played: the racket's, or 0 when
        :attr:`friction_only`."""
        return 0.0 if self.friction_only else self.racket.string_tangential_restitution

    def bounce(self, velocity, spin):
        """The court bounce of N balls arriving with ``velocity`` and ``spin`` ``(N, 3)``, on the
        surface as this ball meets it: a rigid ball's (:func:`rallyarc.bounce.contact.bounce`),
        or a compressing ball's when :attr:`deforming_ball`
        (:func:`rallyarc.bounce.deform.bounce_deforming`)."""
        return court_bounce(self.ball, self.ball_surface, velocity, spin, self.deforming_ball)

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
