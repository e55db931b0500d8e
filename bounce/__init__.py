"""Ball-court contact with the slide-or-grip rule, and the court pace rating of a surface.

Pure physics: depends on numpy only, works on batches of balls, SI units throughout.

- :mod:`bounce.ball`: the moment-of-inertia ratio ``alpha = I / (m r^2)`` and ball energy.
- :mod:`bounce.contact`: :class:`Surface`, :func:`bounce` (3D, any spin axis),
  :func:`bounce_2d` and :func:`critical_angle`.
- :mod:`bounce.deform`: :func:`bounce_deforming`, the slide-or-grip bounce of a ball that
  compresses (friction acts at the flattened contact, below the centre).
- :mod:`bounce.pace`: the ITF CS 01/02 court pace rating, formula and simulated test.
"""

from .ball import (
    MAX_ALPHA,
    SOLID_SPHERE_ALPHA,
    TENNIS_BALL_ALPHA,
    THIN_SHELL_ALPHA,
    alpha_from_moment_of_inertia,
    kinetic_energy_per_unit_mass,
    thick_shell_alpha,
)
from .contact import (
    DEFAULT_REFERENCE_SPEED_MPS,
    Bounce2D,
    BounceResult,
    Surface,
    bounce,
    bounce_2d,
    critical_angle,
    normal_restitution,
)
from .deform import DEFAULT_BALL_STIFFNESS_N_PER_M, bounce_deforming, lever_ratio
from .pace import (
    CATEGORY_NAMES,
    PACE_TEST_ANGLE_RAD,
    PACE_TEST_MAX_SPIN_RAD_S,
    PACE_TEST_SPEED_MPS,
    PaceRating,
    court_pace_rating,
    pace_category,
    rate_surface,
)

__all__ = [
    "MAX_ALPHA",
    "SOLID_SPHERE_ALPHA",
    "TENNIS_BALL_ALPHA",
    "THIN_SHELL_ALPHA",
    "alpha_from_moment_of_inertia",
    "kinetic_energy_per_unit_mass",
    "thick_shell_alpha",
    "DEFAULT_REFERENCE_SPEED_MPS",
    "Bounce2D",
    "BounceResult",
    "Surface",
    "bounce",
    "bounce_2d",
    "critical_angle",
    "normal_restitution",
    "DEFAULT_BALL_STIFFNESS_N_PER_M",
    "bounce_deforming",
    "lever_ratio",
    "CATEGORY_NAMES",
    "PACE_TEST_ANGLE_RAD",
    "PACE_TEST_MAX_SPIN_RAD_S",
    "PACE_TEST_SPEED_MPS",
    "PaceRating",
    "court_pace_rating",
    "pace_category",
    "rate_surface",
]
