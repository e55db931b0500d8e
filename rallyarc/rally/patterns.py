"""Pattern files: the two players of a match, their serves, their shots and their scatter.

A pattern file (TOML, ``configs/patterns/`` or a path; schema ``"patterns"`` in
:mod:`rallyarc.config`) describes the two players of a match: where each stands and how far
they reach, the contact heights they like and when they take the ball (on the rise, at the
apex, on the drop), their serves and their repertoire of shots with the probability of each
(optionally only against some incoming balls), and how much their execution scatters. A
shot or serve may set its own ``head_speed_kmh`` and ``swing_path_deg`` in place of its
stroke preset's (a player's own version of the stroke).

:func:`load_patterns` reads and checks a file into :class:`Patterns`, SI units throughout;
positions of a player are in the player's own chain frame (:mod:`rallyarc.rally.frames`).
"""

from __future__ import annotations

import math
from dataclasses import dataclass, replace

from rallyarc import config, court, domain
from rallyarc.errors import InputError
from rallyarc.rally.frames import ENDS
from rallyarc.units import KMH, RPM

#: Shoulder height as a fraction of body height when a player file gives none (common
#: practice: standing shoulder height is about 0.82 of stature for adults).
SHOULDER_FRACTION = 0.82
#: Lowest contact height [m] of the ball's centre when a player file gives none (common practice:
#: below about 0.2 m a groundstroke becomes a half-volley).
LOWEST_CONTACT_M = 0.2
#: Reaction time [s] before a player starts to move, when a player file gives none (common
#: practice: about a quarter of a second from the opponent's contact).
REACTION_S = 0.25
#: The execution scatter SDs of a player (the other scatter key is the growth outside the
#: preferred contact heights).
SCATTER_SDS = ("head_speed", "face_tilt", "swing_path", "aim")


@dataclass(frozen=True)
class PatternShot:
    """One entry of a repertoire (or a serve): stroke style, target zone [m] in the hitter's
    frame, probability, and conditions on the incoming ball (None: any)."""

    label: str
    stroke: domain.Stroke
    stroke_name: str
    probability: float
    target_x: tuple
    target_y: tuple
    direction: str = "fixed"
    aim: str = "tilt"
    clearance: float | None = None
    serve: str = ""
    when_height_above: float | None = None
    when_height_below: float | None = None
    when_side: str | None = None
    when_topspin_above: float | None = None

    @property
    def conditional(self):
        return any(
            v is not None
            for v in (
                self.when_height_above,
                self.when_height_below,
                self.when_side,
                self.when_topspin_above,
            )
        )


@dataclass(frozen=True)
class Player:
    """One player of a pattern pair, SI units; positions in the player's own chain frame."""

    name: str
    end: str
    handedness: str
    conditions: domain.Conditions
    racket_name: str
    height: float
    shoulder_height: float
    shoulder_source: str
    home_behind: float
    home_y: float
    deepest_behind: float
    reach: float
    run_speed: float
    reaction: float
    contact_band: tuple
    lowest: float
    highest: float
    timing: str
    scatter: dict
    first_serves: tuple
    second_serves: tuple
    shots: tuple
    source: str = ""

    @property
    def home(self):
        """Home position (x, y) in the player's chain frame [m]."""
        return (-(court.HALF_LENGTH + self.home_behind), self.home_y)


@dataclass(frozen=True)
class Patterns:
    name: str
    description: str
    club: str
    source: str
    server: str
    max_shots: int
    players: tuple
    where: str = ""


def _range(values, label, where):
    lo, hi = values
    if lo > hi:
        raise InputError(f"{where}: key {label!r} must list the low end first, got {values}")
    return (float(lo), float(hi))


def _entry(data, where, prefix, serve):
    label = f"{prefix}.stroke"
    try:
        stroke = domain.load_stroke(data["stroke"])
    except InputError as exc:
        raise InputError(f"{where}: key {label!r}: {exc}") from None
    if "head_speed_kmh" in data:
        stroke = replace(stroke, head_speed=data["head_speed_kmh"] * KMH)
    if "swing_path_deg" in data:
        stroke = replace(stroke, swing_path=math.radians(data["swing_path_deg"]))
    want = "serve" if serve else "groundstroke"
    if stroke.kind != want:
        raise InputError(
            f"{where}: key {label!r} must name a {want} stroke, got {data['stroke']!r}"
        )
    return PatternShot(
        label=data["label"],
        stroke=stroke,
        stroke_name=str(data["stroke"]),
        probability=data["probability"],
        target_x=_range(data["target_x_m"], f"{prefix}.target_x_m", where),
        target_y=_range(data["target_y_m"], f"{prefix}.target_y_m", where),
        direction=data.get("direction", "fixed"),
        aim=data.get("aim", "tilt"),
        clearance=data.get("clearance_m"),
        serve=data.get("serve", ""),
        when_height_above=data.get("when_height_above_m"),
        when_height_below=data.get("when_height_below_m"),
        when_side=data.get("when_side"),
        when_topspin_above=(
            data["when_incoming_topspin_above_rpm"] * RPM
            if "when_incoming_topspin_above_rpm" in data
            else None
        ),
    )


def _heights(data, p, where):
    """The preferred contact band and the lowest and highest contact [m], checked in order."""
    band = _range(data["contact_height_m"], f"{p}.contact_height_m", where)
    lowest = data.get("lowest_contact_m", LOWEST_CONTACT_M)
    highest = data["highest_contact_m"]
    if not lowest < highest:
        raise InputError(f"{where}: key '{p}.highest_contact_m' must exceed the lowest contact")
    if not (lowest <= band[0] and band[1] <= highest):
        raise InputError(
            f"{where}: key '{p}.contact_height_m' must lie from the lowest contact "
            f"{lowest:g} m to highest_contact_m {highest:g} m, got {list(band)}"
        )
    return band, lowest, highest


def _repertoire(data, p, where):
    """First serves, second serves (the first when none is marked second) and shots; every
    ball must have a reply, and each serve kind a probability above zero."""
    serves = [_entry(s, where, f"{p}.serves[{i + 1}]", True) for i, s in enumerate(data["serves"])]
    shots = [_entry(s, where, f"{p}.shots[{i + 1}]", False) for i, s in enumerate(data["shots"])]
    first = tuple(s for s in serves if s.serve == "first")
    second = tuple(s for s in serves if s.serve == "second") or first
    if not first or sum(s.probability for s in first) <= 0:
        raise InputError(f"{where}: key '{p}.serves' needs a first serve with probability > 0")
    if sum(s.probability for s in second) <= 0:
        raise InputError(f"{where}: key '{p}.serves' needs a second serve with probability > 0")
    if not any(not s.conditional and s.probability > 0 for s in shots):
        raise InputError(
            f"{where}: key '{p}.shots' needs at least one shot without a 'when_' condition and "
            "with probability > 0, so that every ball has a reply"
        )
    return first, second, tuple(shots)


def _shoulder(data):
    """Shoulder height [m] and where it comes from."""
    if "shoulder_height_m" in data:
        return data["shoulder_height_m"], "given in the pattern file"
    shoulder = SHOULDER_FRACTION * data["height_m"]
    return shoulder, f"{SHOULDER_FRACTION:g} x body height {data['height_m']:g} m (common practice)"


def _scatter(sd):
    """The scatter table in SI: SDs of head speed [m/s], face tilt and swing path [rad] and aim
    [m], and the growth per metre outside the preferred contact heights."""
    return {
        "head_speed": sd["head_speed_kmh"] * KMH,
        "face_tilt": math.radians(sd["face_tilt_deg"]),
        "swing_path": math.radians(sd["swing_path_deg"]),
        "aim": sd["aim_m"],
        "outside_range_per_m": sd.get("outside_range_per_m", 0.0),
    }


def _player(data, end, base, where):
    p = end
    band, lowest, highest = _heights(data, p, where)
    if data["deepest_behind_baseline_m"] < data["home_behind_baseline_m"]:
        raise InputError(
            f"{where}: key '{p}.deepest_behind_baseline_m' must not be less than "
            "home_behind_baseline_m"
        )
    first, second, shots = _repertoire(data, p, where)
    shoulder, shoulder_source = _shoulder(data)
    racket = config.referenced(data, "racket", domain.load_racket, where, f"{p}.racket")
    return Player(
        name=data["name"],
        end=end,
        handedness=data["handedness"],
        conditions=replace(base, racket=racket),
        racket_name=data["racket"],
        height=data["height_m"],
        shoulder_height=shoulder,
        shoulder_source=shoulder_source,
        home_behind=data["home_behind_baseline_m"],
        home_y=data.get("home_y_m", 0.0),
        deepest_behind=data["deepest_behind_baseline_m"],
        reach=data["reach_m"],
        run_speed=data["run_speed_mps"],
        reaction=data.get("reaction_s", REACTION_S),
        contact_band=band,
        lowest=lowest,
        highest=highest,
        timing=data["timing"],
        scatter=_scatter(data["scatter"]),
        first_serves=first,
        second_serves=second,
        shots=shots,
        source=data["source"],
    )


def load_patterns(name_or_path):
    """A pattern pair by preset name (``configs/patterns/``) or TOML path."""
    data = config.load("patterns", name_or_path)
    where = data["where"]

    def sub(loader, key):
        return config.referenced(data, key, loader)

    base = domain.Conditions(
        ball=sub(domain.load_ball, "ball"),
        racket=domain.load_racket("standard"),
        air=sub(domain.load_air, "air"),
        surface=sub(domain.load_surface, "surface"),
        surface_name=data["surface"],
    )
    players = tuple(_player(data[end], end, base, where) for end in ENDS)
    if players[0].name == players[1].name:
        raise InputError(f"{where}: keys 'near.name' and 'far.name' must differ")
    return Patterns(
        name=data["name"],
        description=data["description"],
        club=data["club"],
        source=data["source"],
        server=data.get("server", "alternate"),
        max_shots=data.get("max_shots", 40),
        players=players,
        where=where,
    )


def with_modes(patterns, friction_only=False, deforming_ball=True):
    """The same patterns played in the given physics modes (:class:`rallyarc.domain.Conditions`
    ``friction_only`` and ``deforming_ball``) by both players."""
    players = tuple(
        replace(
            p,
            conditions=replace(
                p.conditions, friction_only=friction_only, deforming_ball=deforming_ball
            ),
        )
        for p in patterns.players
    )
    return replace(patterns, players=players)


def with_scatter(patterns, factor, ends=ENDS):
    """The same patterns with every execution scatter SD of the players at ``ends`` (both by
    default) multiplied by ``factor``."""
    players = tuple(
        replace(p, scatter={k: v * factor if k in SCATTER_SDS else v for k, v in p.scatter.items()})
        if p.end in ends
        else p
        for p in patterns.players
    )
    return replace(patterns, players=players)
