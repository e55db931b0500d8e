"""Presets and user configs in TOML: loading by name or path, with strict validation.

Every key carries its unit (``mass_kg``, ``diameter_m``); unknown keys, missing keys and values out
of range are :class:`InputError` messages naming the file, the key and the allowed range.

Modules: :mod:`.schemas` (the keys of every kind) and :mod:`.files` (reading, decoding and
validating files and presets).
"""

from rallyarc.config.files import (
    _read,
    decode,
    load,
    load_observed,
    preset_names,
    referenced,
    validate,
)
from rallyarc.config.schemas import (
    AERO_CHOICES,
    HIGHEST_CONTACT_M,
    OBSERVED,
    SCHEMAS,
    SMALLEST_RADIUS_M,
    UNUSUAL_CONTACT_M,
    Key,
    reach_m,
)
from rallyarc.errors import InputError

__all__ = [
    "AERO_CHOICES",
    "HIGHEST_CONTACT_M",
    "OBSERVED",
    "SCHEMAS",
    "SMALLEST_RADIUS_M",
    "UNUSUAL_CONTACT_M",
    "InputError",
    "Key",
    "_read",
    "decode",
    "load",
    "load_observed",
    "preset_names",
    "reach_m",
    "referenced",
    "validate",
]
