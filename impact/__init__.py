"""Racket-ball contact: racket effective mass and the slide-or-grip impulse model.

Pure physics on numbers and arrays (numpy only), batch-native over N balls, SI units.
"""

from .contact import ContactResult, collide, hit
from .geometry import face_orientation, swing_velocity
from .racket import (
    SWINGWEIGHT_AXIS_M,
    Racket,
    apparent_cor,
    effective_mass,
    inertia_about_cm,
    normal_inverse_mass,
    racket_inverse_masses,
    tangential_inverse_mass,
)
from .strings import (
    DEFAULT_STRING_TANGENTIAL_RESTITUTION,
    STRING_RESTITUTION_REFERENCE_SPEED_MPS,
    string_restitution,
)

__all__ = [
    "DEFAULT_STRING_TANGENTIAL_RESTITUTION",
    "STRING_RESTITUTION_REFERENCE_SPEED_MPS",
    "string_restitution",
    "SWINGWEIGHT_AXIS_M",
    "ContactResult",
    "Racket",
    "apparent_cor",
    "collide",
    "effective_mass",
    "face_orientation",
    "hit",
    "inertia_about_cm",
    "normal_inverse_mass",
    "racket_inverse_masses",
    "swing_velocity",
    "tangential_inverse_mass",
]
