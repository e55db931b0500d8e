"""Aiming a ball machine: the speed, elevation and sweep (azimuth) that put its balls on a
target, at a given spin, and optionally at a given height at the player."""

from __future__ import annotations

import math
from dataclasses import replace

import numpy as np

from rallyarc import kinematics, units
from rallyarc.aim.first import launched
from rallyarc.aim.solver import (
    HEIGHT_TOL_M,
    LAND_TOL_M,
    AimResult,
    finite,
    height_value,
    solve,
)
from rallyarc.domain import Machine, load_machine
from rallyarc.shot import BallState, launch
from rallyarc.units import RPM

__all__ = ["Machine", "aim_feed", "load_machine"]


def _feed_state(origin, speed, elevation, azimuth, topspin):
    """Launch states toward +x (chain frame) from speed, elevation, azimuth and topspin."""
    velocity = kinematics.velocity(speed, elevation, azimuth)
    spin = kinematics.spin(topspin, 0.0, azimuth)
    pos = np.broadcast_to(origin, velocity.shape)
    return BallState(np.array(pos), velocity, spin)


def aim_feed(
    machine,
    position,
    conditions,
    target_x,
    target_y,
    topspin_rpm,
    speed=None,
    player_height=None,
    method="newton",
):
    """Solve a ball machine's speed, elevation and azimuth for target balls.

    Parameters
    ----------
    machine : Machine
    position : (x, y) of the machine on the court [m]; it releases at its ``release_height``
        and feeds toward the other end (a machine at x > 0 feeds toward -x).
    target_x, target_y : float or array (N,)
        Landing points [m], court frame.
    topspin_rpm : float or array (N,)
        The spin setting (negative: backspin) [rpm]; must lie within the machine's range.
    speed : float or array (N,), optional
        Launch speed [m/s]; then elevation and azimuth are solved.
    player_height : float or array (N,), optional
        Ball height at the player's contact plane [m] instead of a speed; then speed,
        elevation and azimuth are solved.
    method : {"newton", "broyden"}
        The solver's Jacobian rule (:func:`rallyarc.aim.solver.solve`).

    Returns
    -------
    AimResult
        ``settings``: speed [m/s], elevation [rad], azimuth [rad] (court frame, from +x toward
        +y), topspin [rad/s].
    """
    if (speed is None) == (player_height is None):
        raise ValueError("give exactly one of speed and player_height")
    tx, ty = np.broadcast_arrays(
        np.atleast_1d(np.asarray(target_x, float)), np.atleast_1d(np.asarray(target_y, float))
    )
    n = tx.size
    mirrored = float(position[0]) > 0
    sign = -1.0 if mirrored else 1.0
    ctx, cty = sign * tx, sign * ty  # chain frame: feed toward +x
    origin = np.array([sign * position[0], sign * position[1], machine.release_height])
    spin, fixed_speed, reason_pre = _within_limits(machine, topspin_rpm, speed, n)
    names = ["elevation", "azimuth"]
    lo = [machine.elevation_min, -machine.azimuth_max]
    hi = [machine.elevation_max, machine.azimuth_max]
    scale = [math.radians(1.0), math.radians(1.0)]
    if fixed_speed is None:
        names.append("speed")
        lo.append(machine.speed_min)
        hi.append(machine.speed_max)
        scale.append(0.5)
        heights = np.broadcast_to(np.asarray(player_height, float), (n,))
    lo, hi, scale = np.array(lo), np.array(hi), np.array(scale)
    far = replace(conditions)

    def run(p, idx, record=False):
        reps = p.shape[0] // len(idx)
        sp = np.tile(fixed_speed[idx], reps) if fixed_speed is not None else p[:, 2]
        st = _feed_state(origin, sp, p[:, 0], p[:, 1], np.tile(spin[idx], reps))
        return launch(st, far, record=record)

    def evaluate(p, idx):
        reps = p.shape[0] // len(idx)
        if fixed_speed is None:  # the height at the player needs the bounce
            m = run(p, idx).metrics
        else:
            sp = np.tile(fixed_speed[idx], reps)
            m = launched(_feed_state(origin, sp, p[:, 0], p[:, 1], np.tile(spin[idx], reps)), far)
        out = [
            (finite(m["flight_ground_x_m"], -30.0) - np.tile(ctx[idx], reps)) / LAND_TOL_M,
            (finite(m["flight_ground_y_m"], 0.0) - np.tile(cty[idx], reps)) / LAND_TOL_M,
        ]
        if fixed_speed is None:
            target = np.tile(heights[idx], reps)
            out.append((height_value(m, "receiver_height_m") - target) / HEIGHT_TOL_M)
        return np.stack(out, axis=1)

    dist = np.hypot(ctx - origin[0], cty - origin[1])
    p0 = np.stack(
        [np.full(n, math.radians(8.0)), np.arctan2(cty - origin[1], ctx - origin[0])]
        + ([] if fixed_speed is not None else [np.clip(2.0 * dist, lo[2], hi[2])]),
        axis=1,
    )
    p0 = np.clip(p0, lo, hi)
    p, ok, iters = solve(evaluate, p0, lo, hi, scale, method=method)
    result = run(p, np.arange(n), record=True)
    ok = ok & (reason_pre == "") & (result.metrics["outcome"] != "net")
    reason = _reasons(result.metrics, ok, reason_pre, p, lo, hi, names)
    settings = {
        "speed": fixed_speed if fixed_speed is not None else p[:, 2],
        "elevation": p[:, 0],
        "azimuth": p[:, 1] + (math.pi if mirrored else 0.0),
        "topspin": spin,
    }
    settings["azimuth"] = (settings["azimuth"] + math.pi) % (2 * math.pi) - math.pi
    return AimResult(
        settings, ok, reason.astype(str), result, tx, ty, iters, mirrored, metrics=result.metrics
    )


def _within_limits(machine, topspin_rpm, speed, n):
    """The spin [rad/s] and the fixed speed [m/s] (None when solved for), both clipped into
    the machine's range, and the reason for each target whose setting is outside it."""
    spin = np.broadcast_to(np.asarray(topspin_rpm, float) * RPM, (n,)).copy()
    reason = np.full(n, "", dtype=object)
    over_spin = np.abs(spin) > machine.spin_max + 1e-9
    reason[over_spin] = (
        f"spin outside the machine's range (up to {machine.spin_max / RPM:.0f} rpm either way)"
    )
    spin = np.clip(spin, -machine.spin_max, machine.spin_max)
    if speed is None:
        return spin, None, reason
    fixed = np.broadcast_to(np.asarray(speed, float), (n,)).copy()
    bad = (fixed < machine.speed_min - 1e-9) | (fixed > machine.speed_max + 1e-9)
    reason[bad & (reason == "")] = (
        f"speed outside the machine's range ({machine.speed_min * units.KMH_PER_MPS:.0f}-"
        f"{machine.speed_max * units.KMH_PER_MPS:.0f} km/h)"
    )
    return spin, np.clip(fixed, machine.speed_min, machine.speed_max), reason


def _reasons(m, ok, reason_pre, p, lo, hi, names):
    reason = reason_pre.copy()
    at_lo, at_hi = p <= lo + 1e-9, p >= hi - 1e-9
    labels = {"elevation": "elevation", "azimuth": "sweep (azimuth)", "speed": "speed"}
    for i in np.flatnonzero(~ok & (reason == "")):
        bounded = [labels[names[j]] for j in np.flatnonzero(at_lo[i] | at_hi[i])]
        if bounded:
            reason[i] = "outside the machine's " + ", ".join(bounded) + " range"
        elif m["outcome"][i] == "net":
            reason[i] = (
                "net: the setting that meets the targets sends the ball into the net; "
                "no setting in range both clears it and lands there"
            )
        else:
            reason[i] = "no machine setting found that meets every target"
    return reason
