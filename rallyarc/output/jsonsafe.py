"""Values that strict JSON can hold: NaN and infinities become ``None``, numpy values plain."""

from __future__ import annotations

import math

import numpy as np


def json_ready(value):
    """``value`` (nested dicts, lists, tuples, numpy scalars and arrays) made JSON-safe.

    NaN and infinities become ``None``; numpy scalars become Python numbers, booleans and
    strings; arrays become lists. Tuples become lists.
    """
    if isinstance(value, dict):
        return {k: json_ready(v) for k, v in value.items()}
    if isinstance(value, list | tuple):
        return [json_ready(v) for v in value]
    if isinstance(value, np.ndarray):
        return [json_ready(v) for v in value.tolist()]
    if isinstance(value, np.generic):
        value = value.item()
    if isinstance(value, float) and not math.isfinite(value):
        return None
    return value


def dumps(value, indent=2):
    """Strict JSON text of ``value`` (made :func:`json_ready` first): never NaN or Infinity."""
    import json

    return json.dumps(json_ready(value), indent=indent, allow_nan=False)
