"""``rallyarc surface`` and ``rallyarc bounce``: a court surface's pace rating, and one bounce.

A surface preset or TOML file reaches the physics through :func:`rallyarc.domain.load_surface`,
the path the shot chain takes, so every key of the file counts (friction, restitution, its
speed dependence and the tangential restitution).
"""

from __future__ import annotations

import math

import click

from rallyarc import units
from rallyarc.cli.conditions import (
    DEFORMING_BALL,
)
from rallyarc.cli.options import (
    emit,
    json_option,
    loaded,
)
from rallyarc.errors import InputError
from rallyarc.units import KMH_PER_MPS


def _surface(preset, friction, restitution, option):
    """The surface of a preset or file (given with ``option``), or of --friction and
    --restitution, and its name."""
    from rallyarc.bounce.contact import Surface
    from rallyarc.domain import load_surface

    if preset is not None:
        if friction is not None or restitution is not None:
            raise InputError(f"{option}: give either {option} or --friction and --restitution")
        return loaded(option, load_surface, preset), preset
    if friction is None or restitution is None:
        raise InputError("--friction/--restitution: give both, or a preset")
    mu = units.number(friction, "--friction", 0.0, 2.0)
    e = units.number(restitution, "--restitution", 0.0, 1.0)
    return Surface(friction=mu, restitution=e), None


@click.command()
@click.option("--friction", default=None, help="Surface friction mu, 0 to 2.")
@click.option("--restitution", default=None, help="Surface restitution e, 0 to 1.")
@click.option("--preset", default=None, help="A surface preset or TOML file instead.")
@click.option("--temperature", default="23", show_default=True, help="Test temperature [C].")
@json_option()
def surface(friction, restitution, preset, temperature, as_json):
    """Court pace rating of a surface, by simulating the ITF CS 01/02 test impact."""
    from rallyarc.bounce.pace import rate_surface

    if preset is None and friction is None and restitution is None:
        preset = "hard_medium"
    surf, name = _surface(preset, friction, restitution, "--preset")
    temp = units.number(temperature, "--temperature", -10.0, 50.0)
    rating = rate_surface(surf, temperature_c=temp)
    data = {
        "surface": name,
        "surface_friction": surf.friction,
        "surface_restitution": surf.restitution,
        "court_pace_rating": float(rating.court_pace_rating),
        "category": int(rating.category),
        "category_name": rating.category_name,
        "measured_friction": float(rating.measured_friction),
        "measured_restitution": float(rating.measured_restitution),
        "temperature_corrected_restitution": float(rating.temperature_corrected_restitution),
        "temperature_c": temp,
        "ball_gripped": bool(rating.ball_gripped),
        "note": rating.note,
    }
    lines = [
        f"surface:            {name or 'custom'} "
        f"(mu {surf.friction:.3f}, e {surf.restitution:.3f})",
        f"court pace rating:  {data['court_pace_rating']:.1f}, category {data['category']} "
        f"({data['category_name']})",
        f"measured in test:   mu {data['measured_friction']:.3f}, "
        f"e {data['measured_restitution']:.3f}"
        f" (e at {temp:g} C corrected to {data['temperature_corrected_restitution']:.3f})",
    ]
    if rating.ball_gripped:
        lines.append(f"note:               {rating.note}")
    emit(data, as_json, lines)


def _one_bounce(v, theta, w, ball, surface, deforming_ball):
    """One ball arriving at speed ``v`` [m/s], ``theta`` below the horizontal [rad] with topspin
    ``w`` [rad/s], bounced as the shot chain bounces it: on the surface as this ball meets it,
    a compressing ball unless ``deforming_ball`` is False."""
    import numpy as np

    from rallyarc.domain import court_bounce, surface_for

    velocity = np.array([[v * math.cos(theta), 0.0, -v * math.sin(theta)]])
    spin = np.array([[0.0, w, 0.0]])
    return court_bounce(ball, surface_for(ball, surface), velocity, spin, deforming_ball)


def _bounce_lines(data):
    """The text of ``rallyarc bounce``'s answer."""
    inp, out = data["inputs"], data["bounce"]
    word = "topspin" if out["spin_out_rpm"] >= 0 else "backspin"
    return [
        f"in:   {inp['speed_kmh']:.1f} km/h at {inp['angle_deg']:.1f} deg, "
        f"spin {inp['spin_rpm']:+.0f} rpm",
        f"out:  vx {out['vx_out_mps']:.2f} m/s, vz {out['vz_out_mps']:.2f} m/s "
        f"({out['speed_out_mps'] * KMH_PER_MPS:.1f} km/h at {out['angle_out_deg']:.1f} deg), "
        f"{abs(out['spin_out_rpm']):.0f} rpm {word}",
        f"regime: {out['regime']} ({inp['bounce_model']})",
    ]


@click.command("bounce")
@click.option("--speed", required=True, help="Incoming speed: 20, 72km/h, 45mph.")
@click.option("--angle", required=True, help="Incoming angle below horizontal [deg], 0 to 90.")
@click.option(
    "--spin",
    default="0",
    show_default=True,
    help="Incoming spin [rpm], topspin positive, backspin negative.",
)
@click.option("--surface", "surface_name", default=None, help="Surface preset or TOML file.")
@click.option("--friction", default=None, help="Surface friction mu, 0 to 2.")
@click.option("--restitution", default=None, help="Surface restitution e, 0 to 1.")
@click.option("--ball", default="itf_type2", show_default=True, help="Ball preset or TOML file.")
@DEFORMING_BALL
@json_option()
def bounce(speed, angle, spin, surface_name, friction, restitution, ball, deforming_ball, as_json):
    """The ball after one bounce, in the bounce's frame (x along the ball's horizontal travel),
    with the shot chain's bounce: a compressing ball unless --rigid-ball."""
    from rallyarc.domain import bounce_model_name, load_ball

    if surface_name is None and friction is None and restitution is None:
        surface_name = "hard_medium"
    surf, name = _surface(surface_name, friction, restitution, "--surface")
    v = units.speed(speed, "--speed", 0.1, 80.0)
    theta = math.radians(units.number(angle, "--angle", 0.1, 90.0))
    w = units.number(spin, "--spin", -8000.0, 8000.0) * units.RPM
    preset = loaded("--ball", load_ball, ball)
    res = _one_bounce(v, theta, w, preset, surf, deforming_ball)
    vx, vz = float(res.velocity[0, 0]), float(res.velocity[0, 2])
    spin_out = float(res.spin[0, 1])
    data = {
        "inputs": {
            "speed_mps": v,
            "speed_kmh": v * KMH_PER_MPS,
            "angle_deg": math.degrees(theta),
            "spin_rpm": w / units.RPM,
            "surface": name,
            "surface_friction": surf.friction,
            "surface_restitution": surf.restitution,
            "restitution_for_ball": float(res.restitution[0]),
            "ball": ball,
            "radius_m": preset.radius,
            "alpha": preset.alpha,
            "bounce_model": bounce_model_name(deforming_ball),
        },
        # the fields of a shot's bounce block (rallyarc.shot.metrics), in the bounce's frame
        "bounce": {
            "speed_in_mps": v,
            "angle_in_deg": math.degrees(theta),
            "speed_out_mps": math.hypot(vx, vz),
            "angle_out_deg": math.degrees(math.atan2(vz, vx)),
            "spin_in_rpm": w / units.RPM,
            "spin_out_rpm": spin_out / units.RPM,
            "vx_out_mps": vx,
            "vz_out_mps": vz,
            "regime": str(res.regime[0]),
        },
    }
    emit(data, as_json, _bounce_lines(data))
