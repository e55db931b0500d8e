"""Domain objects built from presets: ball, racket, air, surface, stroke and the conditions of play.

Each loader reads a preset by name or a TOML file by path (:mod:`rallyarc.config`), converts its
user units (km/h, rpm, degrees) to SI once, and returns a small frozen object the shot chain uses.

Modules: :mod:`.objects` (the frozen objects), :mod:`.loaders` (presets and files to objects,
the one path from user input to physics parameters) and :mod:`.droptest` (the ITF drop test
simulated with drag).
"""

from rallyarc.domain.droptest import DROP_HEIGHT_M, drop_test_rebound
from rallyarc.domain.loaders import (
    incoming_state,
    load_air,
    load_ball,
    load_machine,
    load_racket,
    load_scenario,
    load_stroke,
    load_surface,
    make_air,
    reference_ball,
    stroke_from_dict,
)
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
    bounce_model_name,
    court_bounce,
    reference_restitution,
    surface_for,
)

__all__ = [
    "DROP_HEIGHT_M",
    "REFERENCE_BALL",
    "Air",
    "Ball",
    "Conditions",
    "Machine",
    "RacketSetup",
    "Scenario",
    "Stroke",
    "Toss",
    "drop_test_rebound",
    "incoming_state",
    "bounce_model_name",
    "court_bounce",
    "load_air",
    "load_ball",
    "load_machine",
    "load_racket",
    "load_scenario",
    "load_stroke",
    "load_surface",
    "make_air",
    "reference_ball",
    "reference_restitution",
    "stroke_from_dict",
    "surface_for",
]
