"""rallyarc: tennis shot physics - racket impact, flight with drag and lift, court bounce - and
what they mean on court.

The main entry points, loaded on first use (importing ``rallyarc`` itself stays light):

- :func:`play` - strokes (objects or preset names) against an incoming ball, or serves from
  their tosses: ``rallyarc.play("topspin_drive", "demo", head_speed_kmh=95)``.
- :func:`simulate` and :func:`launch` - the chain from a swing, or from the ball leaving the
  racket or a machine.
- :func:`feed_ball` - a fed ball (hand or machine) through the whole chain, inputs in km/h,
  degrees and rpm.
- :func:`load_scenario`, :func:`load_stroke` - presets and your own TOML files.
- :func:`play_rallies` - rallies between two players of a pattern file.

Every result has a short ``repr``, converts to pandas (``.to_frame()``) and gives JSON records
(``.record(i)``) in the units of their keys.
"""

from __future__ import annotations

import importlib

#: name -> (module, attribute) of the lazily loaded entry points.
_ENTRY_POINTS = {
    "play": ("rallyarc.shot", "play"),
    "simulate": ("rallyarc.shot", "simulate"),
    "launch": ("rallyarc.shot", "launch"),
    "BallState": ("rallyarc.shot", "BallState"),
    "feed_ball": ("rallyarc.feed", "feed_ball"),
    "play_rallies": ("rallyarc.rally", "play_rallies"),
    "load_scenario": ("rallyarc.domain", "load_scenario"),
    "load_stroke": ("rallyarc.domain", "load_stroke"),
}

__all__ = sorted(_ENTRY_POINTS)


def __getattr__(name):
    try:
        module, attribute = _ENTRY_POINTS[name]
    except KeyError:
        raise AttributeError(f"module 'rallyarc' has no attribute {name!r}") from None
    return getattr(importlib.import_module(module), attribute)


def __dir__():
    return sorted(set(globals()) | set(_ENTRY_POINTS))
