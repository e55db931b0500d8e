"""``rallyarc presets``: the built-in presets of each kind, their key figures and sources."""

from __future__ import annotations

import click

from rallyarc import config
from rallyarc.cli.options import emit, json_option
from rallyarc.errors import InputError
from rallyarc.flight.aero import AERO_MODELS

#: One line of key figures per kind of preset.
_PRESET_FIGURES = {
    "balls": lambda d: (
        f"{d['mass_kg'] * 1000:.1f} g, {d['diameter_m'] * 100:.2f} cm, "
        f"alpha {d['alpha']:.2f}, rebound {d['rebound_cm']:.0f} cm, e {d['restitution']:.3f}"
    ),
    "surfaces": lambda d: (
        f"mu {d['friction']:.2f}, e {d['restitution']:.2f}, "
        f"pace category {d.get('pace_category', '-')}"
    ),
    "rackets": lambda d: (
        f"{d['mass_kg'] * 1000:.0f} g, balance {d['balance_m'] * 100:.1f} cm, "
        f"swingweight {d['swingweight_kgm2'] * 1e4:.0f} kg cm^2, "
        f"strings e {d['string_restitution']:.2f} mu {d['string_friction']:.2f}"
    ),
    "air": lambda d: (
        f"{d['altitude_m']:.0f} m, {d['temperature_c']:.0f} C, "
        f"humidity {d['relative_humidity'] * 100:.0f} %"
    ),
    "strokes": lambda d: (
        f"{d['kind']}, {d['head_speed_kmh']:.0f} km/h, path "
        f"{d['swing_path_deg']:+.0f} deg, face {d['face_tilt_deg']:+.1f} deg"
    ),
    "scenarios": lambda d: f"{d['player']} at {d['club']}: " + ", ".join(d["strokes"]),
    "machines": lambda d: (
        f"{d['speed_min_kmh']:.0f}-{d['speed_max_kmh']:.0f} km/h, spin up to "
        f"{d['spin_max_rpm']:.0f} rpm, elevation {d['elevation_min_deg']:+.0f} to "
        f"{d['elevation_max_deg']:+.0f} deg, release {d['release_height_m']:.2f} m"
    ),
    "drills": lambda d: f"{d['coach']} at {d['club']}: {len(d['balls'])} ball(s), {d['machine']}",
    "patterns": lambda d: f"{d['near']['name']} against {d['far']['name']} at {d['club']}",
    "studies": lambda d: (
        f"{d['kind']}, {d['design']}: " + ", ".join(p["name"] for p in d["parameters"])
    ),
}


#: The aerodynamic models a ball preset's ``aero`` key may name, listed as a kind of its own.
_AERO = "aero"


def _aero_models(data, lines):
    """Each aerodynamic model: where it comes from and where it holds."""
    data[_AERO] = {}
    lines.append(f"{_AERO}:")
    for name, model in AERO_MODELS.items():
        data[_AERO][name] = {"name": name, "source": model.source, "validity": model.validity}
        lines.append(f"  {name:17s} source: {model.source}")
        lines.append(f"  {'':17s} range of validity: {model.validity}")


@click.command()
@click.argument("kind", required=False)
@json_option()
def presets(kind, as_json):
    """The built-in presets of each KIND (balls, surfaces, rackets, air, strokes, scenarios,
    machines, drills, patterns) with their key figures and sources, and the aerodynamic models
    (aero) with their sources and ranges of validity."""
    kinds = [*_PRESET_FIGURES, _AERO]
    if kind is not None and kind not in kinds:
        raise InputError(f"KIND: unknown preset kind {kind!r}; choose one of " + ", ".join(kinds))
    data, lines = {}, []
    for k in [kind] if kind else kinds:
        if k == _AERO:
            _aero_models(data, lines)
            continue
        data[k] = {}
        lines.append(f"{k}:")
        for name in config.preset_names(k):
            item = config.load(k, name)
            item.pop("where", None)
            data[k][name] = item
            lines.append(f"  {name:15s} {item['name']}: {_PRESET_FIGURES[k](item)}")
            lines.append(f"  {'':15s} source: {item['source']}")
    emit(data, as_json, lines)
