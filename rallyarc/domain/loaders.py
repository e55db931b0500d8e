"""Loaders: a preset by name or a TOML file by path (:mod:`rallyarc.config`) to the objects of
:mod:`rallyarc.domain.objects`, with user units (km/h, rpm, degrees) converted to SI once. This
is the one path from presets and files to physics parameters; every command and Python call
uses it."""

from __future__ import annotations

import functools
import math
from dataclasses import replace

import numpy as np

from rallyarc import config, kinematics
from rallyarc.bounce.contact import Surface
from rallyarc.domain.objects import (
    REFERENCE_BALL,
    Air,
    Ball,
    Conditions,
    Machine,
    RacketSetup,
    Scenario,
    Stroke,
    Toss,
)
from rallyarc.errors import InputError
from rallyarc.flight.air import air_density, isa_temperature_pressure
from rallyarc.impact.racket import Racket
from rallyarc.impact.strings import DEFAULT_STRING_TANGENTIAL_RESTITUTION
from rallyarc.units import KMH, RPM


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
    """A stroke (:class:`Stroke`, SI) from a preset name (``"topspin_drive"``) or a TOML file
    of the same keys."""
    data = config.load("strokes", name)
    if data["kind"] == "serve" and "toss" not in data:
        raise config.InputError(f"{data['where']}: a serve needs a [toss] table")
    return stroke_from_dict(data, name)


def load_scenario(name):
    """A scenario (:class:`Scenario`: conditions, strokes, incoming ball) from a preset name
    (``"demo"``, ``"serve_demo"``) or a TOML file of the same keys."""
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
    strokes = _directed(strokes, data.get("directions", ()), where)
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


def _directed(strokes, directions, where):
    """The scenario's strokes with each ``[[directions]]`` entry applied: the stroke swung in
    that direction (the face turning with it) and labelled with where it goes."""
    names = [s.name for s in strokes]
    for k, entry in enumerate(directions):
        if entry["stroke"] not in names:
            raise InputError(
                f"{where}: key 'directions[{k}].stroke': {entry['stroke']!r} is not one of the "
                f"scenario's strokes ({', '.join(names)})"
            )
        i = names.index(entry["stroke"])
        turned = strokes[i].turned(math.radians(entry["swing_direction_deg"]))
        strokes[i] = replace(turned, label=f"{strokes[i].label}, {entry['where']}")
    return strokes


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
